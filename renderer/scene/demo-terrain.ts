/**
 * INVENTED demo terrain: a synthetic landscape (a tilted plain, a crater with a raised rim, a few
 * smooth hills) at an invented site. It stands in until core/terrain supplies the demo grid, and it
 * is what the browser tests draw. Deterministic: the same call gives the same heights.
 */
import type { ElevationGrid } from './elevation-grid.ts';

export function inventedDemoTerrain(size = 161, pixelSize_m = 50): ElevationGrid {
  const half = ((size - 1) / 2) * pixelSize_m;
  const heights = new Float32Array(size * size);
  const hills = [
    { e: 1800, n: 1500, r: 700, h: 140 },
    { e: -2200, n: 2100, r: 900, h: 210 },
    { e: 2500, n: -2300, r: 600, h: 90 },
  ];
  const crater = { e: -900, n: -1200, r: 850 };
  for (let row = 0; row < size; row++) {
    for (let col = 0; col < size; col++) {
      const e = -half + col * pixelSize_m;
      const n = half - row * pixelSize_m;
      let h = 0.012 * e + 0.02 * n; // gentle regional tilt
      for (const hill of hills) h += hill.h * Math.exp(-((e - hill.e) ** 2 + (n - hill.n) ** 2) / (2 * hill.r ** 2));
      const d = Math.hypot(e - crater.e, n - crater.n) / crater.r;
      h += d < 1 ? -120 * (1 - d * d) + 35 * d ** 6 : 35 * Math.exp(-((d - 1) ** 2) / 0.08);
      h += 6 * Math.sin(e / 230) * Math.cos(n / 310); // low rolling texture
      heights[row * size + col] = h;
    }
  }
  return { width: size, height: size, pixelSize_m, west_m: -half, north_m: half, heights };
}
