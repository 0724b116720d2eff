import { describe, expect, it } from 'vitest';
import { describeRun, formatDuration, RunProgress } from '../../../renderer/state/run-progress.ts';

function clocked(window_ms = 5000) {
  let t = 0;
  const progress = new RunProgress(() => t, window_ms);
  return { progress, at: (ms: number) => (t = ms) };
}

describe('run progress', () => {
  it('reports count, rate and time left: 300 of 1000 in 3 s → 100 /s, 7 s left', () => {
    const { progress, at } = clocked();
    at(0);
    progress.start(1000);
    at(1000);
    progress.update(100);
    at(3000);
    progress.update(300);
    const s = progress.snapshot();
    expect(s).toMatchObject({ status: 'running', done: 300, total: 1000, fraction: 0.3 });
    expect(s.rate_per_s).toBeCloseTo(100, 10);
    expect(s.remaining_s).toBeCloseTo(7, 10);
    expect(describeRun(s)).toBe('300 / 1,000 targets · 100.0 /s · about 7 s left');
  });

  it('follows a slowdown through its window instead of the whole-run average', () => {
    const { progress, at } = clocked(2000);
    at(0);
    progress.start(10000);
    at(1000);
    progress.update(1000); // 1000 /s at first
    at(2000);
    progress.update(2000);
    at(6000);
    progress.update(2400); // then 100 /s
    at(10000);
    progress.update(2800);
    // Window of the last updates: from t = 6 s (2400) to 10 s (2800) → 100 /s; the run average would be 280 /s.
    expect(progress.snapshot().rate_per_s).toBeCloseTo(100, 10);
  });

  it('finishes on the last target, keeps the count on cancel, and carries a failure reason', () => {
    const a = clocked();
    a.at(0);
    a.progress.start(2);
    a.at(4000);
    a.progress.update(2);
    expect(describeRun(a.progress.snapshot())).toBe('2 / 2 targets in 4 s');

    const b = clocked();
    b.progress.start(50);
    b.progress.update(20);
    b.progress.cancel();
    b.progress.update(30); // late rows after cancel are not counted
    expect(describeRun(b.progress.snapshot())).toBe('Cancelled: 20 / 50 targets kept');

    const c = clocked();
    c.progress.start(5);
    c.progress.update(1);
    c.progress.fail('worker crashed');
    expect(describeRun(c.progress.snapshot())).toBe('Stopped after 1 / 5 targets: worker crashed');
  });

  it('ignores counts that go backwards and rejects a bad total', () => {
    const { progress } = clocked();
    progress.start(10);
    progress.update(5);
    progress.update(3);
    expect(progress.snapshot().done).toBe(5);
    expect(() => progress.start(-1)).toThrow(/invalid total: -1/);
  });

  it('formats durations', () => {
    expect([0, 44.6, 60, 185, 3600, 3725].map(formatDuration)).toEqual(['0 s', '45 s', '1 min 00 s', '3 min 05 s', '1 h 00 min', '1 h 02 min']);
  });
});
