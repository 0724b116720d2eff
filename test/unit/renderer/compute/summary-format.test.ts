import { describe, expect, it } from 'vitest';
import { footprintFigureList, trajectoryFigureList } from '../../../../renderer/compute/summary-format.ts';
import { chartSeries } from '../../../../renderer/compute/trajectory-session.ts';
import { coreStudy } from '../../../../renderer/study/core-study.ts';
import type { FootprintSummary } from '../../../../core/export/footprintExport.ts';
import type { PickedTrajectory } from '../../../../core/footprint/pickedTrajectory.ts';

const summary: FootprintSummary = {
  targets: 49, reachable: 30, unreachable: 5, failed: 0, pending: 14, overBudget: 0, relaxationGap: 0, betweenNodesMissed: 0,
  usablePropellant_kg: 500, reserve_kg: 20, budget_kg: 480,
  reachableArea_m2: 12_345_678, guaranteedDivertRadius_m: 1234.6, divertRadiusLimitedByGrid: true,
  minPropellant_kg: 201.319, maxPropellant_kg: 282.921, solves: 300, cancelled: true,
};

describe('result figures carry their units', () => {
  it('footprint: km² to three decimals, metres, kg, and says what is partial', () => {
    const byLabel = Object.fromEntries(footprintFigureList(summary).map((f) => [f.label, f]));
    expect(byLabel['Reachable area'].value).toBe('12.346 km²');
    // 14 targets pending: area and radius are lower bounds, and say so.
    expect(byLabel['Guaranteed divert radius']).toEqual({ label: 'Guaranteed divert radius', value: '1235 m', note: 'at least (rows not computed)' });
    expect(byLabel['Reachable area'].note).toMatch(/at least/);
    const complete = Object.fromEntries(footprintFigureList({ ...summary, pending: 0, cancelled: false }).map((f) => [f.label, f]));
    expect(complete['Guaranteed divert radius'].note).toBe('limited by the grid: widen it');
    expect(complete['Reachable area'].note).toBe('with the reserve kept');
    expect(byLabel['Budget']).toMatchObject({ value: '480.0 kg', note: 'usable 500.0 kg − reserve 20.0 kg' });
    expect(byLabel['Propellant'].value).toBe('201.3 … 282.9 kg');
    expect(byLabel['Targets']).toEqual({ label: 'Targets', value: '30 reachable / 35 computed', note: '14 not computed (cancelled)' });
  });

  it('footprint with nothing reachable shows a dash, not NaN', () => {
    const list = footprintFigureList({ ...summary, reachable: 0, minPropellant_kg: NaN, maxPropellant_kg: NaN });
    expect(list.find((f) => f.label === 'Propellant')!.value).toBe('—');
    expect(JSON.stringify(list)).not.toMatch(/NaN/);
  });

  const picked: PickedTrajectory = { status: 'solved', target_m: [500, -302.4, 0], propellant_kg: 218.694, propellantLowerBound_kg: 218.69, timeOfFlight_s: 36.617, miss_m: 0, nodes: 50, series: null, warnings: [], baseline: null };

  // Issue 15 bug 1: with the dry mass above the wet mass a pick read "ABOVE the −420.0 kg budget".
  it('trajectory: no negative budget printed, and no verdict at all for a stale pick', () => {
    const none = trajectoryFigureList(picked, -420).find((f) => f.label === 'Propellant')!;
    expect(none.note).toBe('no propellant budget: dry mass plus reserve reach the wet mass');
    expect(trajectoryFigureList(picked, 0).find((f) => f.label === 'Propellant')!.note).toBe(none.note);
    expect(trajectoryFigureList(picked, null).find((f) => f.label === 'Propellant')!.note).toBeUndefined();
  });

  it('trajectory: propellant in kg, t_f in s with N', () => {
    const list = trajectoryFigureList(picked, 480);
    expect(list).toEqual([
      { label: 'Target', value: '500 m E, −302 m N' },
      { label: 'Propellant', value: '218.69 kg', note: 'within the 480.0 kg budget' },
      { label: 'Time of flight t_f', value: '36.62 s', note: 'N = 50' },
    ]);
  });

  it('trajectory with a baseline: its propellant and what the optimum saves over it', () => {
    const baseline = { method: 'polynomial guidance' as const, propellant_kg: 240.5, timeOfFlight_s: 40.04, miss_m: 0.4, velocityError_mps: 0.1, saturatedFraction: 0, time_s: new Float64Array(2), position_m: new Float64Array(6) };
    const list = trajectoryFigureList({ ...picked, baseline }, 480);
    expect(list[3]).toEqual({ label: 'Polynomial guidance', value: '240.50 kg', note: '+21.81 kg (+10.0 %) over the optimum, t_f 40.0 s' });
    const missing = trajectoryFigureList({ ...picked, baseline: { ...baseline, miss_m: 35.2 } }, 480);
    expect(missing[3].note).toBe('misses the target by 35 m');
  });

  it('unreachable trajectory says so with the closest-approach miss', () => {
    const list = trajectoryFigureList({ ...picked, status: 'unreachable', miss_m: 812.4 }, 480);
    expect(list[1]).toEqual({ label: 'Status', value: 'unreachable', note: 'closest landing 812 m away' });
  });
});

describe('core series → chart series', () => {
  it('interleaves east, north, up per sample', () => {
    const f = (...v: number[]) => Float64Array.from(v);
    const s = chartSeries({
      t: f(0, 1), x: f(1, 2), y: f(3, 4), z: f(5, 6), vx: f(7, 8), vy: f(9, 10), vz: f(11, 12), mass: f(100, 99),
      thrustX: f(13, 14), thrustY: f(15, 16), thrustZ: f(17, 18), throttle: f(0.5, 0.5), tilt: f(0, 0), massFlow: f(1, 1),
    });
    expect(Array.from(s.position_m)).toEqual([1, 3, 5, 2, 4, 6]);
    expect(Array.from(s.velocity_mps)).toEqual([7, 9, 11, 8, 10, 12]);
    expect(Array.from(s.thrust_N)).toEqual([13, 15, 17, 14, 16, 18]);
    expect(Array.from(s.mass_kg)).toEqual([100, 99]);
  });
});

describe('workspace study → core study', () => {
  it('passes field problems on, renamed for a computation', () => {
    expect(coreStudy({ ok: false, message: 'Not saved: 1 input needs fixing first (Dry mass). Your edits are kept.' })).toEqual({
      ok: false, message: 'Not computed: 1 input needs fixing first (Dry mass). Your edits are kept.',
    });
  });

  it('names the field, value and fix when core/study refuses the document', () => {
    const doc = { format: 'landreach-study', version: 1, name: 'x', planet: { body: 'jupiter' }, site: { name: 's', latitude_deg: 0 } };
    const r = coreStudy({ ok: true, text: JSON.stringify(doc) });
    expect(r.ok).toBe(false);
    expect(!r.ok && r.message).toMatch(/^Not computed: .*planet\.body = "jupiter": must be "mars", "moon" or "custom"/);
  });
});

describe('relaxation-gap targets are shown apart', () => {
  it('the footprint figures list them when there are any', () => {
    const base: FootprintSummary = { targets: 9, reachable: 7, unreachable: 0, failed: 0, pending: 0, overBudget: 0, relaxationGap: 2, betweenNodesMissed: 0, usablePropellant_kg: 480, reserve_kg: 20, budget_kg: 460, reachableArea_m2: 1e6, guaranteedDivertRadius_m: 500, divertRadiusLimitedByGrid: false, minPropellant_kg: 200, maxPropellant_kg: 260, solves: 30, cancelled: false };
    expect(footprintFigureList(base).find((f) => f.label === 'Relaxation gap')?.value).toBe('2 targets');
    expect(footprintFigureList({ ...base, relaxationGap: 0 }).find((f) => f.label === 'Relaxation gap')).toBeUndefined();
  });
});

describe('a picked trajectory shows its warnings', () => {
  it('a between-nodes miss reaches the figure list', () => {
    const pick: PickedTrajectory = { status: 'solved', target_m: [0, 0, 0], propellant_kg: 200, propellantLowerBound_kg: 200, timeOfFlight_s: 30, miss_m: 0, nodes: 50, series: null, warnings: ['re-simulation: minimum thrust missed by 1.20 % of full thrust between nodes (tolerance 0.10 % of full thrust)'], baseline: null };
    const list = trajectoryFigureList(pick, 480);
    expect(list.find((f) => f.label === 'Warning')?.value).toMatch(/minimum thrust missed/);
    expect(trajectoryFigureList({ ...pick, warnings: [] }, 480).some((f) => f.label.startsWith('Warning'))).toBe(false);
  });
});
