import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { DEFAULT_HAZARD_LIMITS, resolveLimits } from '../../../../core/terrain/index.ts';
import { checkTerrainSettings, DEFAULT_TERRAIN_SETTINGS, type TerrainSettingsText } from '../../../../renderer/terrain/terrain-settings.ts';

// An example extent: a local-frame DEM of 512 × 512 cells of 2 m, north-west corner at (0, 0).
const EXTENT = { west_m: 0, east_m: 1024, south_m: -1024, north_m: 0, centreEast_m: 512, centreNorth_m: -512 };
const withText = (over: Partial<TerrainSettingsText>) => ({ ...DEFAULT_TERRAIN_SETTINGS, ...over });

describe('terrain settings', () => {
  it('defaults to the DEM centre and the CLI’s hazard limits (core/terrain DEFAULT_HAZARD_LIMITS)', () => {
    const check = checkTerrainSettings(DEFAULT_TERRAIN_SETTINGS, EXTENT);
    expect(check).toEqual({
      ok: true,
      target: { east_m: 512, north_m: -512 },
      limits: { maxSlope_deg: DEFAULT_HAZARD_LIMITS.maxSlope_deg, maxRoughness_m: DEFAULT_HAZARD_LIMITS.maxRoughness_m, landerDiameter_m: DEFAULT_HAZARD_LIMITS.landerDiameter_m, safetyMargin_m: DEFAULT_HAZARD_LIMITS.safetyMargin_m },
      png: { pixelSize_m: null, heightScale_m: null },
    });
  });

  it('takes a target on the DEM and refuses one off it, naming the field, the value and the range', () => {
    expect(checkTerrainSettings(withText({ targetEast_m: '100', targetNorth_m: '-900.5' }), EXTENT)).toMatchObject({ ok: true, target: { east_m: 100, north_m: -900.5 } });
    const off = checkTerrainSettings(withText({ targetEast_m: '2000', targetNorth_m: 'abc' }), EXTENT);
    expect(off.ok).toBe(false);
    if (off.ok) return;
    expect(off.problems.targetEast_m).toBe('Target east on the DEM (m) “2000”: the target must be on the DEM, from 0 to 1024 m (blank = its centre, 512 m).');
    expect(off.problems.targetNorth_m).toMatch(/^Target north on the DEM \(m\) “abc”: enter a number of metres, or leave it blank for the DEM’s centre \(−512 m\)\.$/);
  });

  it('names bad limits and PNG numbers with the fix', () => {
    const bad = checkTerrainSettings(withText({ maxSlope_deg: '95', landerDiameter_m: '0', pngPixelSize_m: '-1' }), EXTENT);
    expect(bad.ok).toBe(false);
    if (bad.ok) return;
    expect(bad.problems.maxSlope_deg).toBe('Max slope (°) “95”: enter a number from 0 to 89° (blank = 10).');
    expect(bad.problems.landerDiameter_m).toMatch(/^Lander footprint diameter \(m\) “0”: enter a number above 0/);
    expect(bad.problems.pngPixelSize_m).toMatch(/^PNG pixel size \(m\) “-1”: enter a number of metres above 0/);
  });

  it('accepts exactly the slope limits core/terrain accepts (property, either side of the range)', () => {
    fc.assert(
      fc.property(fc.double({ min: -20, max: 120, noNaN: true }), (v) => {
        const text = String(v);
        const ours = checkTerrainSettings(withText({ maxSlope_deg: text }), EXTENT).ok;
        let core = true;
        try {
          resolveLimits({ maxSlope_deg: Number(text) });
        } catch {
          core = false;
        }
        expect(ours).toBe(core);
      }),
    );
  });
});
