/**
 * The derived input checks of core/descent/setup.ts, each at a boundary derived here by hand, and their
 * study-file form (core/study names the file's field and value; the app reads studies the same way).
 */
import { describe, expect, it } from 'vitest';
import { G0 } from '../../../core/descent/constants.ts';
import type { DescentSetup, IgnitionState } from '../../../core/descent/setup.ts';
import { validateIgnition, validateLanding, validateSetup } from '../../../core/descent/setup.ts';
import { burnTimeBound, landingPlaneWindow } from '../../../core/descent/landingWindow.ts';
import { DescentInputError } from '../../../core/descent/inputError.ts';
import { parseStudy, StudyError } from '../../../core/study/index.ts';
import { coreStudy } from '../../../renderer/study/core-study.ts';

// An invented vehicle on an invented non-rotating body (g = 2 m/s²), one engine, no cant.
const g = 2;
function setupWith(v: Partial<DescentSetup['vehicle']> = {}, c: Partial<DescentSetup['constraints']> = {}): DescentSetup {
  return {
    planet: { name: 'test body', gravity: [0, 0, -g], rotationRate: [0, 0, 0] },
    vehicle: { wetMass: 1100, dryMass: 1000, isp: 200, engineCount: 1, thrustPerEngine: 10000, cantAngle: 0, throttleMin: 0.5, throttleMax: 1, pointingLimit: Math.PI, ...v },
    constraints: { glideSlope: null, maxSpeed: null, gateHeight: 0, gateDescentRate: 0, minAltitude: null, ...c },
    nodes: 20,
    hold: 'foh',
  };
}
const hover = (z: number, mass: number): IgnitionState => ({ position: [0, 0, z], velocity: [0, 0, 0], mass });

function fieldOf(f: () => void): string | null {
  try {
    f();
    return null;
  } catch (err) {
    expect(err).toBeInstanceOf(DescentInputError);
    return (err as DescentInputError).field;
  }
}

describe('thrust-to-weight', () => {
  // Full net thrust n·T·cos φ·throttleMax against the dry weight m_dry·g = 1000 × 2 = 2000 N: below it the
  // vertical acceleration T/m − g stays negative at every mass, so a descent can never be stopped.
  it('refuses full thrust at or below the dry weight, accepts it just above', () => {
    expect(fieldOf(() => validateSetup(setupWith({ thrustPerEngine: 1999, throttleMin: 0 })))).toBe('vehicle.thrustPerEngine');
    expect(fieldOf(() => validateSetup(setupWith({ thrustPerEngine: 2000, throttleMin: 0 })))).toBe('vehicle.thrustPerEngine');
    expect(fieldOf(() => validateSetup(setupWith({ thrustPerEngine: 2001, throttleMin: 0 })))).toBeNull();
  });
});

describe('burn time against the landing plane', () => {
  // From rest at height h over the plane (gate 0, landing at rest), |u| ≤ a = ρ2/m_dry = 10 m/s²: the height
  // condition |−h + g t²/2| ≤ a t²/2 first holds at t* = √(2h/(a + g)); the speed condition |g t| ≤ a t
  // always holds. The lowest thrust ρ1 = 5000 N burns m0 − m_dry in T = (m0 − m_dry)·Isp·g0/ρ1.
  const h = 100;
  const a = 10000 / 1000;
  const tStar = Math.sqrt((2 * h) / (a + g));
  const usableFor = (t: number) => (t * 5000) / (200 * G0);

  it('finds the analytic earliest landing time t* = √(2h/(a + g))', () => {
    const s = setupWith();
    const w = landingPlaneWindow(s, hover(h, 1100), 0, Infinity);
    expect(w.earliest).not.toBeNull();
    expect(w.earliest!).toBeCloseTo(tStar, 9);
    expect(burnTimeBound(s, hover(h, 1100))).toBeCloseTo((100 * 200 * G0) / 5000, 9);
  });

  it('refuses a burn shorter than t*, accepts one longer', () => {
    for (const [factor, refused] of [[0.9, true], [1.1, false]] as const) {
      const mass = 1000 + usableFor(factor * tStar);
      const s = setupWith({ wetMass: mass });
      const state = hover(h, mass);
      validateSetup(s);
      validateIgnition(state, s);
      const field = fieldOf(() => validateLanding(s, state, 0));
      expect(field).toBe(refused ? 'vehicle.throttleMin' : null);
    }
  });

  it('leaves engines that may idle (throttleMin 0) unbounded', () => {
    const s = setupWith({ throttleMin: 0, wetMass: 1000.001 });
    expect(burnTimeBound(s, hover(h, 1000.001))).toBe(Infinity);
    expect(fieldOf(() => validateLanding(s, hover(h, 1000.001), 0))).toBeNull();
  });
});

describe('constraints the descent could not meet from its start or at its end', () => {
  it('an ignition speed above maxSpeed is refused; equal to it is accepted', () => {
    const s = setupWith({}, { maxSpeed: 50 });
    expect(fieldOf(() => validateLanding(s, { position: [0, 0, 500], velocity: [30, 0, -40.0001], mass: 1100 }, 0))).toBe('ignition.velocity');
    expect(fieldOf(() => validateLanding(s, { position: [0, 0, 500], velocity: [30, 0, -40], mass: 1100 }, 0))).toBeNull(); // |(30, 40)| = 50
  });

  it('a gate above the ignition altitude is refused, at it is accepted', () => {
    const s = setupWith({}, { gateHeight: 30 });
    expect(fieldOf(() => validateLanding(s, hover(129.9, 1100), 100))).toBe('constraints.gateHeight');
    expect(fieldOf(() => validateLanding(s, hover(130, 1100), 100))).toBeNull();
  });

  it('a lowest altitude above the gate is refused', () => {
    expect(fieldOf(() => validateSetup(setupWith({}, { gateHeight: 30, minAltitude: 31 })))).toBe('constraints.minAltitude');
    expect(fieldOf(() => validateSetup(setupWith({}, { gateHeight: 30, minAltitude: 30 })))).toBeNull();
  });
});

describe('in the study file and the app', () => {
  const study = {
    format: 'landreach-study', version: 1, name: 'Invented test study',
    planet: { body: 'custom', gravity_mps2: g, siderealPeriod_h: null },
    site: { name: 'Invented site', latitude_deg: 0 },
    vehicle: { name: 'Invented vehicle', wetMass_kg: 1100, dryMass_kg: 990, propellantReserve_kg: 10, isp_s: 200, engineCount: 1, thrustPerEngine_N: 10000, throttleMin: 0.5, throttleMax: 1 },
    ignition: { position_m: [0, 0, 100], velocity_mps: [0, 0, 0] },
  };

  it('names the study field and shows its value from the file', () => {
    const weak = { ...study, vehicle: { ...study.vehicle, thrustPerEngine_N: 1000 } };
    try {
      parseStudy(weak);
      throw new Error('expected a StudyError');
    } catch (err) {
      expect(err).toBeInstanceOf(StudyError);
      expect((err as StudyError).problems[0]).toMatchObject({ field: 'vehicle.thrustPerEngine_N', value: '1000' });
    }
  });

  it('names the reserve when giving it up alone would make the burn long enough', () => {
    // Usable 100 kg less a 99.9 kg reserve: 0.1 kg lasts 0.04 s at 5000 N; without the reserve, 39 s.
    const s = { ...study, vehicle: { ...study.vehicle, dryMass_kg: 1000, propellantReserve_kg: 99.9 } };
    expect(() => parseStudy(s)).toThrow(/vehicle\.propellantReserve_kg: 99\.9 — at the lowest thrust/);
  });

  it('the app refuses to compute with the same message', () => {
    const r = coreStudy({ ok: true, text: JSON.stringify({ ...study, vehicle: { ...study.vehicle, thrustPerEngine_N: 1000 } }) });
    expect(r.ok).toBe(false);
    expect(!r.ok && r.message).toMatch(/^Not computed: vehicle\.thrustPerEngine_N = 1000: full thrust, 1000 N .* not above the weight/);
  });
});
