import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { distanceToNearest } from '../../../core/terrain/index.ts';

describe('Euclidean distance transform (Felzenszwalb & Huttenlocher 2012)', () => {
  it('equals brute-force nearest-source distance on random masks, rectangular pixels (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 17 }),
        fc.integer({ min: 1, max: 13 }),
        fc.double({ min: 0.3, max: 4, noNaN: true }),
        fc.double({ min: 0.3, max: 4, noNaN: true }),
        fc.array(fc.boolean(), { minLength: 17 * 13, maxLength: 17 * 13 }),
        (w, h, dx, dy, bits) => {
          const src = Uint8Array.from(bits.slice(0, w * h), (b, k) => (b && k % 3 === 0 ? 1 : 0));
          const d = distanceToNearest(src, w, h, dx, dy);
          for (let r = 0; r < h; r++) for (let c = 0; c < w; c++) {
            let best = Infinity;
            for (let rr = 0; rr < h; rr++) for (let cc = 0; cc < w; cc++) {
              if (src[rr * w + cc]) best = Math.min(best, Math.hypot((c - cc) * dx, (r - rr) * dy));
            }
            if (best === Infinity) expect(d[r * w + c]).toBe(Infinity);
            else expect(d[r * w + c]).toBeCloseTo(best, 4);
          }
        },
      ),
      { numRuns: 60, seed: 11 },
    );
  });
});
