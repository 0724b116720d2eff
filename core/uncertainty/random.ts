/**
 * Random streams for Monte Carlo studies that give the same bits whatever the worker count: every sample
 * draws from its own stream, keyed by (study number, sample index), so no sample depends on which worker ran
 * it or on the samples before it. The key is mixed into a 32-bit state by the MurmurHash3 finaliser (fmix32,
 * Appleby 2011; common practice for hashing integers) and the stream is mulberry32 (a common-practice
 * 32-bit generator, the same one `core/footprint/dispersion.ts` uses). Normals by the Box–Muller transform
 * (Box & Muller 1958), both values of each pair used.
 */

/** MurmurHash3's 32-bit finaliser: a bijection on 32-bit integers with full avalanche. */
function fmix32(h: number): number {
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** A sample's random stream: uniforms in [0, 1) and standard normals. */
export interface SampleStream {
  uniform(): number;
  normal(): number;
}

/** The stream of sample `index` of a study numbered `studySeed` (both whole numbers ≥ 0, below 2³²). */
export function sampleStream(studySeed: number, index: number): SampleStream {
  if (!Number.isInteger(studySeed) || studySeed < 0 || studySeed >= 2 ** 32) throw new RangeError(`seed: ${studySeed} (must be a whole number from 0 to 4294967295)`);
  if (!Number.isInteger(index) || index < 0 || index >= 2 ** 32) throw new RangeError(`sample index: ${index} (must be a whole number from 0 to 4294967295)`);
  // Two rounds so that neighbouring (seed, index) pairs land on unrelated states.
  let state = fmix32(fmix32(studySeed ^ 0x9e3779b9) ^ fmix32(index + 0x632be5ab));
  const uniform = () => {
    let t = (state = (state + 0x6d2b79f5) >>> 0);
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  let spare = NaN;
  const normal = () => {
    if (!Number.isNaN(spare)) {
      const z = spare;
      spare = NaN;
      return z;
    }
    // 1 − u lies in (0, 1]: the logarithm is finite.
    const r = Math.sqrt(-2 * Math.log(1 - uniform()));
    const a = 2 * Math.PI * uniform();
    spare = r * Math.sin(a);
    return r * Math.cos(a);
  };
  return { uniform, normal };
}
