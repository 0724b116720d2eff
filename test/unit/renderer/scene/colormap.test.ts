import { describe, expect, it } from 'vitest';
import { colorizeLinear, legendGradient, sampleColormap, srgbToLinear, VIRIDIS } from '../../../../core/study/colormap.ts';

/** CIE L* of an sRGB colour (IEC 61966-2-1 linearisation, Rec. 709 luminance weights, CIE 1976 L*). */
function lightness(r: number, g: number, b: number): number {
  const y = 0.2126 * srgbToLinear(r) + 0.7152 * srgbToLinear(g) + 0.0722 * srgbToLinear(b);
  return y > 216 / 24389 ? 116 * Math.cbrt(y) - 16 : (24389 / 27) * y;
}

describe('viridis', () => {
  it('has 256 entries and the published end colours #440154 and #fde725 (van der Walt & Smith 2015)', () => {
    expect(VIRIDIS.size).toBe(256);
    const hex = (i: number) => [0, 1, 2].map((k) => Math.round(VIRIDIS.srgb[3 * i + k] * 255).toString(16).padStart(2, '0')).join('');
    expect(hex(0)).toBe('440154');
    expect(hex(255)).toBe('fde725');
  });

  it('rises monotonically in CIE L* across the table (the perceptual-uniformity design goal)', () => {
    let previous = -Infinity;
    for (let i = 0; i < VIRIDIS.size; i++) {
      const L = lightness(VIRIDIS.srgb[3 * i], VIRIDIS.srgb[3 * i + 1], VIRIDIS.srgb[3 * i + 2]);
      expect(L, `entry ${i}`).toBeGreaterThan(previous);
      previous = L;
    }
  });

  it('interpolates between entries and clamps outside [0, 1]', () => {
    const mid = sampleColormap(VIRIDIS, 0.5 / 255);
    for (let k = 0; k < 3; k++) expect(mid[k]).toBeCloseTo((VIRIDIS.srgb[k] + VIRIDIS.srgb[3 + k]) / 2, 6);
    expect(sampleColormap(VIRIDIS, -3)).toEqual(sampleColormap(VIRIDIS, 0));
    expect(sampleColormap(VIRIDIS, 7)).toEqual(sampleColormap(VIRIDIS, 1));
  });

  it('linearises with the IEC 61966-2-1 curve: 0.5 → 0.21404, 0.04 → 0.04/12.92', () => {
    expect(srgbToLinear(0.5)).toBeCloseTo(0.214041, 6);
    expect(srgbToLinear(0.04)).toBeCloseTo(0.04 / 12.92, 10);
    expect(srgbToLinear(1)).toBe(1);
  });

  it('colours NaN as no-data grey and refuses an empty range', () => {
    const c = colorizeLinear([NaN, 0, 1], 0, 1);
    expect(c[0]).toBeCloseTo(c[1], 6);
    expect(c[0]).toBeCloseTo(c[2], 6);
    expect(() => colorizeLinear([1], 2, 2)).toThrow(/invalid colour range: \[2, 2\]/);
  });

  it('builds a legend gradient from the first to the last colour', () => {
    const css = legendGradient(VIRIDIS, 3);
    // The middle stop (t = 0.5) falls halfway between entries 127 and 128.
    const mid = [0, 1, 2].map((k) => Math.round(((VIRIDIS.srgb[3 * 127 + k] + VIRIDIS.srgb[3 * 128 + k]) / 2) * 255));
    expect(css).toBe(`linear-gradient(to right, rgb(68 1 84) 0%, rgb(${mid.join(' ')}) 50%, rgb(253 231 37) 100%)`);
  });
});
