/**
 * One interface for every cone of K. A cone owns rows offset .. offset+dim−1 of s, z and of every
 * vector indexed like them; methods read and write those rows of full-length arrays.
 *
 * Scaling is Nesterov–Todd (Nesterov & Todd 1997, 1998): a symmetric W with W z = W⁻¹ s = λ.
 */
export interface Cone {
  readonly offset: number;
  readonly dim: number;
  /** Barrier degree ν (contribution to the complementarity normalisation). */
  readonly degree: number;
  /** Number of stored upper-triangle entries of this cone's W² block in the KKT matrix. */
  readonly blockEntries: number;
  /** Local (row, col) pairs of the block's upper triangle, in the order writeKktBlock writes them. */
  blockPattern(): Array<[number, number]>;
  /** The smallest t with v + t·e on the cone boundary, negated: v + t e ∈ int K ⇔ t > violation(v). */
  violation(v: Float64Array): number;
  /** v += t·e (e the cone's identity element). */
  addIdentity(v: Float64Array, t: number): void;
  /** Computes the NT scaling at (s, z) and writes λ = W z. False when s or z is not interior. */
  updateScaling(s: Float64Array, z: Float64Array, lambda: Float64Array): boolean;
  /** Sets the scaling to the identity (W = I), writing λ = z. */
  setIdentityScaling(): void;
  /** out = W v (rows of this cone). */
  mulW(v: Float64Array, out: Float64Array): void;
  /** out = W⁻¹ v. */
  mulWinv(v: Float64Array, out: Float64Array): void;
  /** values[positions[k]] = −(W² + δI) entries, in blockPattern order. */
  writeKktBlock(values: Float64Array, positions: Int32Array, delta: number): void;
  /** out = u ∘ v (Jordan product). */
  jordanProduct(u: Float64Array, v: Float64Array, out: Float64Array): void;
  /** out = λ \ v, the solution u of λ ∘ u = v. */
  jordanDivide(lambda: Float64Array, v: Float64Array, out: Float64Array): void;
  /** Largest α (possibly Infinity) with x + α·d ∈ K, for x in the interior. */
  stepLength(x: Float64Array, d: Float64Array): number;
}
