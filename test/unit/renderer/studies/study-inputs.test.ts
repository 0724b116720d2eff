/** Study inputs as typed: defaults from the study (the CLI's), and checks that name the field, the value and the fix. */
import { describe, expect, it } from 'vitest';
import { checkAltitudeInputs, checkDispersionInputs, checkReserveInputs, defaultStudyInputs } from '../../../../renderer/studies/study-inputs.ts';

// The invented demo study's figures (assets/demo): usable 2100 − 1600 = 500 kg, ignition 1800 m up, descending.
const study = {
  vehicle: { wetMass_kg: 2100, dryMass_kg: 1600, propellantReserve_kg: 20 },
  ignition: { position_m: [-2500, 400, 1800], velocity_mps: [90, -10, -70] },
} as unknown as Parameters<typeof defaultStudyInputs>[0];
const defaults = defaultStudyInputs(study);

describe('study inputs', () => {
  it('defaults pass their own checks', () => {
    expect(checkReserveInputs(defaults.reserve, study)).toMatchObject({ ok: true, value: { reserves_kg: [0, 50, 100, 150, 200, 250] } });
    const a = checkAltitudeInputs(defaults['ignition-altitude'], study);
    expect(a).toMatchObject({ ok: true, value: { altitudes_m: [1080, 1440, 1800, 2160, 2520], reserve_kg: 20, requiredRadius_m: null, directions: 24, rule: { kind: 'fixed-velocity' } } });
    expect(checkDispersionInputs(defaults.dispersion)).toMatchObject({ ok: true, value: { samples: 1000, seed: 1, probability: 0.997, reachSamples: 0, sigmas: { position_m: 50 } } });
  });

  it('reserve list: not numbers, and a reserve at the usable propellant, are named with the fix', () => {
    expect(checkReserveInputs({ reserves_kg: '0, ten' }, study)).toEqual({ ok: false, problems: { reserves_kg: 'Reserves “0, ten”: enter numbers in kg separated by commas, e.g. 0, 50, 100.' } });
    const r = checkReserveInputs({ reserves_kg: '0, 500' }, study);
    expect(r.ok ? '' : r.problems.reserves_kg).toMatch(/Reserve 500 kg: .*below the usable propellant, 500 kg/);
  });

  // Issue 15 bug 9: duplicates were silently dropped, and the altitude limits differed from the main input's.
  it('a value listed twice is refused, naming it; altitudes keep the main input\'s limits (1 … 100000 m)', () => {
    const r = checkReserveInputs({ reserves_kg: '0, 50, 50' }, study);
    expect(r.ok ? '' : r.problems.reserves_kg).toBe('Reserve 50 kg is listed twice: give each reserve once.');
    const a = checkAltitudeInputs({ ...defaults['ignition-altitude'], altitudes_m: '1800, 900,900 ,1200' }, study);
    expect(a.ok ? '' : a.problems.altitudes_m).toBe('Altitude 900 m is listed twice: give each altitude once.');
    // Ignition › Altitude accepts 1 … 100000 m (renderer/study/field-table.ts): 200000 m is refused here too, 100000 m is not.
    const high = checkAltitudeInputs({ ...defaults['ignition-altitude'], altitudes_m: '1800, 200000' }, study);
    expect(high.ok ? '' : high.problems.altitudes_m).toMatch(/^Altitude 200000 m: .*from 1 to 100000 m/);
    expect(checkAltitudeInputs({ ...defaults['ignition-altitude'], altitudes_m: '1, 100000' }, study).ok).toBe(true);
  });

  it('altitudes sorted; an empty requirement is none; bad fields each get a message', () => {
    const ok = checkAltitudeInputs({ ...defaults['ignition-altitude'], altitudes_m: '1800, 900 ,1200', requiredRadius_m: ' 700 ' }, study);
    expect(ok).toMatchObject({ ok: true, value: { altitudes_m: [900, 1200, 1800], requiredRadius_m: 700 } });
    const bad = checkAltitudeInputs({ ...defaults['ignition-altitude'], altitudes_m: '0', reserve_kg: '600', requiredRadius_m: '-1', directions: '2.5' }, study);
    expect(bad.ok).toBe(false);
    if (bad.ok) return;
    expect(Object.keys(bad.problems).sort()).toEqual(['altitudes_m', 'directions', 'requiredRadius_m', 'reserve_kg']);
    expect(bad.problems.altitudes_m).toMatch(/^Altitude 0 m: .*above the target/);
    expect(bad.problems.directions).toMatch(/^Directions “2.5”: enter a whole number from 3 to 720/);
  });

  it('directions are not checked for the grid method; the path-angle rule needs a descending ignition', () => {
    expect(checkAltitudeInputs({ ...defaults['ignition-altitude'], method: 'grid', directions: 'x' }, study).ok).toBe(true);
    const climbing = { ...study, ignition: { position_m: [0, 0, 1800], velocity_mps: [90, 0, 5] } } as typeof study;
    const r = checkAltitudeInputs({ ...defaults['ignition-altitude'], rule: 'fixed-flight-path-angle' }, climbing);
    expect(r.ok ? '' : r.problems.rule).toMatch(/descending ignition velocity/);
  });

  it('dispersion: whole numbers, fractions and non-negative sigmas, each named', () => {
    const r = checkDispersionInputs({ ...defaults.dispersion, samples: '5', probability: '1', sigmaMass_kg: '-3', reachSamples: '1.5' });
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.problems).toEqual({
      samples: 'Samples “5”: enter a whole number from 10 to 100000.',
      probability: 'Ellipse probability “1”: enter a fraction between 0 and 1, e.g. 0.997.',
      sigmaMass_kg: 'Mass 1σ “-3”: enter zero or a positive mass in kg.',
      reachSamples: 'Reach-map samples “1.5”: enter a whole number from 0 (no map) to 200.',
    });
  });
});
