import { describe, expect, it } from 'vitest';
import { legendEntries, SCENE_COLOURS } from '../../../../renderer/scene/scene-colours.ts';
import { TRAJECTORY_COLOURS } from '../../../../renderer/plots/palette.ts';

describe('scene legend', () => {
  const all = legendEntries({ ignition: true, hazards: true, reserve_kg: 480, contours: true, safeReachable: { area_m2: 912000, sites: 5 }, ellipse: true, trajectory: TRAJECTORY_COLOURS[0] });

  it('has an entry for everything drawn over the terrain, each named by its own colour and shape', () => {
    expect(all.map((e) => e.id)).toEqual(['legend-target', 'legend-ignition', 'legend-hazard', 'reserve-legend', 'legend-contours', 'safe-reachable-legend', 'legend-sites', 'ellipse-legend', 'legend-trajectories']);
    // No two features described by the same colour name (the reserve outline and the ellipse were both "white").
    const names = Object.values(SCENE_COLOURS).map((c) => c.name.split(/[ ,]/)[0]);
    expect(new Set(names).size).toBe(names.length);
    expect(all.find((e) => e.id === 'reserve-legend')!.text).toMatch(/≤ 480 kg/);
    expect(all.find((e) => e.id === 'safe-reachable-legend')!.text).toMatch(/safe ∩ reachable, 0\.912 km²/);
  });

  it('keeps the colours apart: at least 60 of 255 (max channel) between any two features and from the trajectory colours', () => {
    // 60 of 255 is a common-practice floor for line colours told apart at a glance on a dark background (not
    // from a standard); shape tells them apart as well.
    const rgb = (hex: string) => [1, 3, 5].map((k) => parseInt(hex.slice(k, k + 2), 16));
    const distance = (a: string, b: string) => Math.max(...rgb(a).map((v, k) => Math.abs(v - rgb(b)[k])));
    // Hazards are a stripe pattern, not a colour (hazard-overlay.ts): left out.
    const features = Object.entries(SCENE_COLOURS).filter(([k]) => k !== 'hazard').map(([, c]) => c.hex);
    for (let i = 0; i < features.length; i++) {
      for (let j = i + 1; j < features.length; j++) expect(distance(features[i], features[j]), `${features[i]} ~ ${features[j]}`).toBeGreaterThanOrEqual(60);
      for (const t of TRAJECTORY_COLOURS) expect(distance(features[i], t), `${features[i]} ~ ${t}`).toBeGreaterThanOrEqual(60);
    }
  });

  it('lists only what is drawn', () => {
    expect(legendEntries({ ignition: false, hazards: false, reserve_kg: null, contours: false, safeReachable: null, ellipse: false, trajectory: null }).map((e) => e.id)).toEqual(['legend-target']);
  });
});
