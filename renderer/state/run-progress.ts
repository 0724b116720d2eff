/**
 * Progress of a long computation (a footprint grid, a sweep) as the UI shows it: targets done of
 * total, the current rate, and the time left. The rate is measured over a sliding window so it
 * follows speed changes (easy targets first, hard ones later) instead of averaging them away.
 */

export type RunStatus = 'idle' | 'running' | 'finished' | 'cancelled' | 'failed';

export interface RunSnapshot {
  status: RunStatus;
  done: number;
  total: number;
  /** done / total, 0 when total is 0. */
  fraction: number;
  /** Targets per second over the recent window; null until two updates are apart in time. */
  rate_per_s: number | null;
  /** Estimated seconds left at the current rate; null when unknown. */
  remaining_s: number | null;
  elapsed_s: number;
  /** Failure reason, for status 'failed'. */
  message: string | null;
}

export class RunProgress {
  private status: RunStatus = 'idle';
  private total = 0;
  private done = 0;
  private startedAt = 0;
  private endedAt: number | null = null;
  private samples: { t: number; done: number }[] = [];
  private message: string | null = null;

  constructor(
    private readonly now: () => number = () => performance.now(),
    /** Width of the rate window, milliseconds. */
    private readonly window_ms = 5000,
  ) {
    if (!(window_ms > 0)) throw new Error(`invalid window_ms: ${window_ms} (must be positive)`);
  }

  start(total: number): void {
    if (!Number.isInteger(total) || total < 0) throw new Error(`invalid total: ${total} (must be a whole number ≥ 0)`);
    this.status = 'running';
    this.total = total;
    this.done = 0;
    this.startedAt = this.now();
    this.endedAt = null;
    this.samples = [{ t: this.startedAt, done: 0 }];
    this.message = null;
  }

  /** Record that `done` targets are finished (monotone; smaller values are ignored). */
  update(done: number): void {
    if (this.status !== 'running' || done <= this.done) return;
    this.done = Math.min(done, this.total);
    const t = this.now();
    this.samples.push({ t, done: this.done });
    while (this.samples.length > 2 && t - this.samples[1].t >= this.window_ms) this.samples.shift();
    if (this.done === this.total) this.end('finished');
  }

  cancel(): void {
    if (this.status === 'running') this.end('cancelled');
  }

  fail(message: string): void {
    if (this.status !== 'running') return;
    this.message = message;
    this.end('failed');
  }

  private end(status: RunStatus): void {
    this.status = status;
    this.endedAt = this.now();
  }

  snapshot(): RunSnapshot {
    const t = this.endedAt ?? this.now();
    const first = this.samples[0];
    const last = this.samples[this.samples.length - 1];
    const span_s = last && first ? (last.t - first.t) / 1000 : 0;
    const rate = span_s > 0 ? (last.done - first.done) / span_s : null;
    const remaining = this.status === 'running' && rate && rate > 0 ? (this.total - this.done) / rate : this.status === 'finished' ? 0 : null;
    return {
      status: this.status,
      done: this.done,
      total: this.total,
      fraction: this.total > 0 ? this.done / this.total : 0,
      rate_per_s: rate,
      remaining_s: remaining,
      elapsed_s: this.status === 'idle' ? 0 : (t - this.startedAt) / 1000,
      message: this.message,
    };
  }
}

/** "45 s", "3 min 05 s", "1 h 02 min". */
export function formatDuration(seconds: number): string {
  const s = Math.max(0, Math.round(seconds));
  if (s < 60) return `${s} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min ${String(s % 60).padStart(2, '0')} s`;
  return `${Math.floor(s / 3600)} h ${String(Math.floor((s % 3600) / 60)).padStart(2, '0')} min`;
}

/** One line for the status bar, e.g. "1,200 / 4,000 targets · 85.0 /s · about 33 s left"; `unit` names what is counted. */
export function describeRun(p: RunSnapshot, unit = 'targets'): string {
  const count = `${p.done.toLocaleString('en')} / ${p.total.toLocaleString('en')} ${unit}`;
  switch (p.status) {
    case 'idle':
      return 'No computation yet';
    case 'running': {
      const rate = p.rate_per_s !== null ? ` · ${p.rate_per_s.toFixed(1)} /s` : '';
      const left = p.remaining_s !== null ? ` · about ${formatDuration(p.remaining_s)} left` : '';
      return `${count}${rate}${left}`;
    }
    case 'finished':
      return `${count} in ${formatDuration(p.elapsed_s)}`;
    case 'cancelled':
      return `Cancelled: ${count} kept`;
    case 'failed':
      return `Stopped after ${count}: ${p.message}`;
  }
}
