/**
 * A trajectory as scene geometry: the flight path as a line strip and the thrust vector drawn at
 * intervals as short segments from the vehicle position along the thrust direction.
 */
import { BufferAttribute, BufferGeometry } from 'three';

export interface TrajectorySamples {
  time_s: ArrayLike<number>;
  /** east, north, up (m) per sample, flattened; relative to the target, up measured from it. */
  position_m: ArrayLike<number>;
  /** Thrust vector (N) per sample, flattened, same frame. */
  thrust_N: ArrayLike<number>;
}

export interface TrajectoryLineOptions {
  /** Scene height of the target's ground (metres, before exaggeration). Default 0. */
  baseHeight_m?: number;
  exaggeration?: number;
  /** Draw a thrust vector every this many samples (and at the last one). Default 5. */
  vectorEvery?: number;
  /** Scene length of a vector at `thrustMax_N`. */
  vectorLength_m: number;
  thrustMax_N: number;
}

export function validateSamples(s: TrajectorySamples): number {
  const n = s.time_s.length;
  if (n < 2) throw new Error(`invalid trajectory: ${n} samples (need at least 2)`);
  if (s.position_m.length !== 3 * n) throw new Error(`invalid trajectory: ${s.position_m.length} position values for ${n} samples (need ${3 * n})`);
  if (s.thrust_N.length !== 3 * n) throw new Error(`invalid trajectory: ${s.thrust_N.length} thrust values for ${n} samples (need ${3 * n})`);
  for (let i = 1; i < n; i++) if (!(s.time_s[i] > s.time_s[i - 1])) throw new Error(`invalid trajectory: time_s not increasing at sample ${i}`);
  return n;
}

export function buildTrajectoryGeometry(s: TrajectorySamples, options: TrajectoryLineOptions): { path: BufferGeometry; vectors: BufferGeometry } {
  const n = validateSamples(s);
  const base = options.baseHeight_m ?? 0;
  const ex = options.exaggeration ?? 1;
  const every = options.vectorEvery ?? 5;
  if (!Number.isInteger(every) || every < 1) throw new Error(`invalid vectorEvery: ${every} (must be a positive integer)`);
  if (!(options.thrustMax_N > 0)) throw new Error(`invalid thrustMax_N: ${options.thrustMax_N} (must be positive)`);
  const path = new Float32Array(3 * n);
  for (let i = 0; i < n; i++) {
    path[3 * i] = s.position_m[3 * i];
    path[3 * i + 1] = s.position_m[3 * i + 1];
    path[3 * i + 2] = (base + s.position_m[3 * i + 2]) * ex;
  }
  const picks: number[] = [];
  for (let i = 0; i < n; i += every) picks.push(i);
  if (picks[picks.length - 1] !== n - 1) picks.push(n - 1);
  const vectors = new Float32Array(picks.length * 6);
  picks.forEach((i, k) => {
    const tx = s.thrust_N[3 * i];
    const ty = s.thrust_N[3 * i + 1];
    const tz = s.thrust_N[3 * i + 2];
    const scale = options.vectorLength_m / options.thrustMax_N;
    vectors.set([path[3 * i], path[3 * i + 1], path[3 * i + 2]], 6 * k);
    // The vector is drawn in true proportions: exaggeration would tilt it, so it is not applied.
    vectors.set([path[3 * i] + tx * scale, path[3 * i + 1] + ty * scale, path[3 * i + 2] + tz * scale], 6 * k + 3);
  });
  const pathGeometry = new BufferGeometry();
  pathGeometry.setAttribute('position', new BufferAttribute(path, 3));
  const vectorGeometry = new BufferGeometry();
  vectorGeometry.setAttribute('position', new BufferAttribute(vectors, 3));
  return { path: pathGeometry, vectors: vectorGeometry };
}
