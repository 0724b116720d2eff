import { describe, expect, it } from 'vitest';
import { emptyField, TARGET } from '../../../core/footprint/field.ts';
import { makeTargetGrid } from '../../../core/footprint/grid.ts';
import { ignitionAtAltitude, minimumAltitude, reserveStudy } from '../../../core/footprint/studies.ts';

/** Propellant 300 + r/10 kg at distance r: with budget B the reachable set is the disc r ≤ 10 (B − 300). */
function radialField() {
  const grid = makeTargetGrid({ halfWidthEast_m: 2000, halfWidthNorth_m: 2000, nx: 161, ny: 161 });
  const f = emptyField(grid);
  for (let j = 0; j < 161; j++) {
    for (let i = 0; i < 161; i++) {
      const k = j * 161 + i;
      f.status[k] = TARGET.reachable;
      f.propellant_kg[k] = 300 + Math.hypot(grid.east[i], grid.north[j]) / 10;
    }
  }
  return f;
}

describe('reserve study', () => {
  it('matches the disc of the analytic field: radius 10 (B − 300) m, area π r²', () => {
    const rows = reserveStudy(radialField(), 450, [0, 50, 100]);
    for (const r of rows) {
      const radius = 10 * (450 - r.reserve_kg - 300);
      expect(r.divertRadius_m).toBeGreaterThan(radius - 15);
      expect(r.divertRadius_m).toBeLessThan(radius + 15);
      expect(Math.abs(r.area_m2 - Math.PI * radius * radius) / (Math.PI * radius * radius)).toBeLessThan(0.01);
      expect(r.limitedByGrid).toBe(false);
    }
    expect(rows[0].area_m2).toBeGreaterThan(rows[1].area_m2);
    expect(() => reserveStudy(radialField(), 450, [500])).toThrow(/reserve 500 kg: must be from 0 up to below the usable propellant, 450 kg/);
  });
});

describe('ignition-altitude rules and the minimum altitude', () => {
  it('places the ignition point by the rule', () => {
    const p: [number, number, number] = [-2500, 400, 1800];
    const v: [number, number, number] = [90, -10, -70];
    expect(ignitionAtAltitude(p, v, 1000, { kind: 'fixed-velocity' })).toEqual({ position: [-2500, 400, 1000], velocity: v });
    // Along the velocity: 800 m lower takes 800/70 s, moving 90·800/70 m east and −10·800/70 m north.
    const a = ignitionAtAltitude(p, v, 1000, { kind: 'fixed-flight-path-angle' });
    expect(a.position[0]).toBeCloseTo(-2500 + (90 * 800) / 70, 9);
    expect(a.position[1]).toBeCloseTo(400 - (10 * 800) / 70, 9);
    const t = ignitionAtAltitude(p, v, 1500, { kind: 'table', altitudes_m: [1000, 2000], velocities_mps: [[50, 0, -40], [100, 0, -80]] });
    expect(t.velocity).toEqual([75, 0, -60]);
    expect(() => ignitionAtAltitude(p, v, -5, { kind: 'fixed-velocity' })).toThrow(/must be above the target/);
  });

  it('interpolates the lowest altitude meeting a radius, or says none does', () => {
    const rows = [1000, 1500, 2000].map((h, i) => ({ altitude_m: h, divertRadius_m: [300, 500, 900][i], limitedByGrid: false, nominalPropellant_kg: 200, area_m2: 0 }));
    expect(minimumAltitude(rows, 700)).toEqual({ altitude_m: 1750, bracketed: true });
    expect(minimumAltitude(rows, 200)).toEqual({ altitude_m: 1000, bracketed: false });
    expect(minimumAltitude(rows, 1000)).toBeNull();
  });
});
