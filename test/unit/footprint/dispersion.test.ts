/**
 * The dispersion study against linear-Gaussian propagation (closed form): on a non-rotating planet, with
 * only ignition position and velocity errors, the open-loop nominal thrust gives the same acceleration
 * history, so the landing point moves by δr₀ + t_f δv₀ exactly: each horizontal axis has variance
 * σ_r² + t_f² σ_v², and the p-ellipse is a circle of radius k σ with k = √(−2 ln(1 − p)).
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { landreachConicBackend } from '../../../core/descent/conicBackend.ts';
import { searchFreeFinalTime } from '../../../core/descent/search.ts';
import { DescentSolver } from '../../../core/descent/solver.ts';
import { dispersionStudy, openLoopLanding } from '../../../core/footprint/dispersion.ts';
import { ellipseRadiusForProbability } from '../../../core/footprint/ellipse.ts';
import { parseStudyText, studyToDescent } from '../../../core/study/index.ts';

const d = studyToDescent(parseStudyText(readFileSync(fileURLToPath(new URL('../../../assets/demo/demo-lander.study.json', import.meta.url)), 'utf8')));
const setup = { ...d.setup, planet: { ...d.setup.planet, rotationRate: [0, 0, 0] as const } };
const solver = new DescentSolver(setup, landreachConicBackend(), d.ignition);
const nominal = searchFreeFinalTime(solver, [0, 0, 0], d.ignition);
const series = nominal.trajectory!.series;
const tf = nominal.timeOfFlight;

describe('dispersion study', () => {
  it('the nominal thrust flown open loop from the nominal state lands on the target', () => {
    const [e, n] = openLoopLanding(setup, series, d.ignition);
    expect(Math.hypot(e, n)).toBeLessThan(0.5);
  });

  it('position and velocity errors alone: the ellipse matches the closed form within sampling error', () => {
    const sigR = 30;
    const sigV = 1.5;
    const p = 0.997;
    const r = dispersionStudy(setup, d.ignition, series, { position_m: sigR, velocity_mps: sigV, mass_kg: 0, thrustFraction: 0, ispFraction: 0 }, { samples: 1500, seed: 7, probability: p, step_s: 0.1 });
    const radius = ellipseRadiusForProbability(p) * Math.sqrt(sigR ** 2 + (tf * sigV) ** 2);
    // The sample standard deviation of n = 1500 normals is within ±5.5 % at 3σ (σ_s/σ ≈ 1/√(2n)).
    expect(r.ellipse.semiMajor_m / radius).toBeGreaterThan(0.945);
    expect(r.ellipse.semiMajor_m / radius).toBeLessThan(1.055);
    expect(r.ellipse.semiMinor_m / radius).toBeGreaterThan(0.945);
    // The sample mean is off by σ/√n per axis: beyond 4σ/√n with probability e⁻⁸ (Rayleigh tail).
    const sigma = Math.sqrt(sigR ** 2 + (tf * sigV) ** 2);
    expect(Math.hypot(r.ellipse.centreEast_m, r.ellipse.centreNorth_m)).toBeLessThan((4 * sigma) / Math.sqrt(1500));
  });

  it('a thrust shortfall moves the landing point (the ellipse grows), and bad settings are named', () => {
    const base = { position_m: 10, velocity_mps: 0.5, mass_kg: 0, thrustFraction: 0, ispFraction: 0 };
    const a = dispersionStudy(setup, d.ignition, series, base, { samples: 200, seed: 3, probability: 0.99, step_s: 0.2 });
    const b = dispersionStudy(setup, d.ignition, series, { ...base, thrustFraction: 0.01, mass_kg: 10 }, { samples: 200, seed: 3, probability: 0.99, step_s: 0.2 });
    expect(b.ellipse.semiMajor_m).toBeGreaterThan(a.ellipse.semiMajor_m);
    expect(() => dispersionStudy(setup, d.ignition, series, { ...base, mass_kg: -1 }, { samples: 200, seed: 3, probability: 0.99 })).toThrow(/sigma mass_kg: -1/);
    expect(() => dispersionStudy(setup, d.ignition, series, base, { samples: 5, seed: 3, probability: 0.99 })).toThrow(/samples: 5/);
  });
});
