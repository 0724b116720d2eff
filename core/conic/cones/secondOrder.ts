import type { Cone } from './cone.ts';

/**
 * The second-order cone Q^q = {(t, u) : ‖u‖₂ ≤ t}, degree 1.
 *
 * NT scaling as in Vandenberghe, "The CVXOPT linear and quadratic cone program solvers" (2010), §4:
 * s̄ = s/√(sᵀJs), z̄ = z/√(zᵀJz), γ = √((1 + s̄ᵀz̄)/2), w̄ = (s̄ + J z̄)/(2γ), η = (sᵀJs / zᵀJz)^{1/4},
 * W = η [[w̄₀, w̄₁ᵀ], [w̄₁, I + w̄₁w̄₁ᵀ/(1 + w̄₀)]], W² = η²(2w̄w̄ᵀ − J), with J = diag(1, −I).
 */
export class SecondOrderCone implements Cone {
  readonly degree = 1;
  readonly blockEntries: number;
  private eta = 1;
  /** w̄ (unit hyperbolic norm: w̄₀² − ‖w̄₁‖² = 1). */
  private readonly w: Float64Array;

  constructor(
    readonly offset: number,
    readonly dim: number,
  ) {
    this.blockEntries = (dim * (dim + 1)) / 2;
    this.w = new Float64Array(dim);
    this.w[0] = 1;
  }

  blockPattern(): Array<[number, number]> {
    const out: Array<[number, number]> = [];
    for (let j = 0; j < this.dim; j++) for (let i = 0; i <= j; i++) out.push([i, j]);
    return out;
  }

  violation(v: Float64Array): number {
    const o = this.offset;
    let nrm = 0;
    for (let i = 1; i < this.dim; i++) nrm += v[o + i] * v[o + i];
    return Math.sqrt(nrm) - v[o];
  }

  addIdentity(v: Float64Array, t: number): void {
    v[this.offset] += t;
  }

  updateScaling(s: Float64Array, z: Float64Array, lambda: Float64Array): boolean {
    const o = this.offset;
    const q = this.dim;
    const s0 = s[o];
    const z0 = z[o];
    let s1n = 0;
    let z1n = 0;
    let sz1 = 0;
    for (let i = 1; i < q; i++) {
      s1n += s[o + i] * s[o + i];
      z1n += z[o + i] * z[o + i];
      sz1 += s[o + i] * z[o + i];
    }
    // (t − ‖u‖)(t + ‖u‖) is more accurate near the boundary than t² − ‖u‖².
    const sRes = (s0 - Math.sqrt(s1n)) * (s0 + Math.sqrt(s1n));
    const zRes = (z0 - Math.sqrt(z1n)) * (z0 + Math.sqrt(z1n));
    if (!(s0 > 0) || !(z0 > 0) || !(sRes > 0) || !(zRes > 0)) return false;
    const sn = Math.sqrt(sRes);
    const zn = Math.sqrt(zRes);
    const dot = (s0 * z0 + sz1) / (sn * zn);
    const gamma = Math.sqrt((1 + dot) / 2);
    const w = this.w;
    w[0] = (s0 / sn + z0 / zn) / (2 * gamma);
    for (let i = 1; i < q; i++) w[i] = (s[o + i] / sn - z[o + i] / zn) / (2 * gamma);
    this.eta = Math.sqrt(sn / zn);
    this.mulW(z, lambda);
    return true;
  }

  setIdentityScaling(): void {
    this.w.fill(0);
    this.w[0] = 1;
    this.eta = 1;
  }

  mulW(v: Float64Array, out: Float64Array): void {
    this.applyScaling(v, out, this.eta, 1);
  }

  mulWinv(v: Float64Array, out: Float64Array): void {
    this.applyScaling(v, out, 1 / this.eta, -1);
  }

  /** out = factor · [[w₀, σw₁ᵀ], [σw₁, I + w₁w₁ᵀ/(1+w₀)]] v, σ = ±1 (−1 gives W⁻¹ up to the factor). */
  private applyScaling(v: Float64Array, out: Float64Array, factor: number, sgn: number): void {
    const o = this.offset;
    const q = this.dim;
    const w = this.w;
    const v0 = v[o];
    let w1v1 = 0;
    for (let i = 1; i < q; i++) w1v1 += w[i] * v[o + i];
    const c = sgn * v0 + w1v1 / (1 + w[0]);
    out[o] = factor * (w[0] * v0 + sgn * w1v1);
    for (let i = 1; i < q; i++) out[o + i] = factor * (v[o + i] + c * w[i]);
  }

  writeKktBlock(values: Float64Array, positions: Int32Array, delta: number): void {
    const q = this.dim;
    const w = this.w;
    const e2 = this.eta * this.eta;
    let k = 0;
    for (let j = 0; j < q; j++) {
      for (let i = 0; i <= j; i++) {
        let v = 2 * w[i] * w[j];
        if (i === j) v += i === 0 ? -1 : 1;
        values[positions[k++]] = -(e2 * v + (i === j ? delta : 0));
      }
    }
  }

  jordanProduct(u: Float64Array, v: Float64Array, out: Float64Array): void {
    const o = this.offset;
    const q = this.dim;
    const u0 = u[o];
    const v0 = v[o];
    let dot = u0 * v0;
    for (let i = 1; i < q; i++) dot += u[o + i] * v[o + i];
    for (let i = 1; i < q; i++) out[o + i] = u0 * v[o + i] + v0 * u[o + i];
    out[o] = dot;
  }

  jordanDivide(lambda: Float64Array, v: Float64Array, out: Float64Array): void {
    const o = this.offset;
    const q = this.dim;
    const l0 = lambda[o];
    let l1n = 0;
    let l1v1 = 0;
    for (let i = 1; i < q; i++) {
      l1n += lambda[o + i] * lambda[o + i];
      l1v1 += lambda[o + i] * v[o + i];
    }
    const det = (l0 - Math.sqrt(l1n)) * (l0 + Math.sqrt(l1n));
    const u0 = (l0 * v[o] - l1v1) / det;
    for (let i = 1; i < q; i++) out[o + i] = (v[o + i] - u0 * lambda[o + i]) / l0;
    out[o] = u0;
  }

  stepLength(x: Float64Array, d: Float64Array): number {
    // Smallest α > 0 with (x₀ + α d₀)² − ‖x₁ + α d₁‖² = 0, i.e. aα² + 2bα + c = 0 with c > 0;
    // written as c / (−b + √(b² − ac)) to avoid cancellation.
    const o = this.offset;
    const q = this.dim;
    let a = d[o] * d[o];
    let b = x[o] * d[o];
    let x1n = 0;
    for (let i = 1; i < q; i++) {
      a -= d[o + i] * d[o + i];
      b -= x[o + i] * d[o + i];
      x1n += x[o + i] * x[o + i];
    }
    const c = (x[o] - Math.sqrt(x1n)) * (x[o] + Math.sqrt(x1n));
    if (!(c > 0)) return 0;
    // The t-entry must stay non-negative too; this also covers the apex, where the quadratic only touches 0.
    const tLimit = d[o] < 0 ? -x[o] / d[o] : Infinity;
    if (a > 0 && b >= 0) return tLimit;
    const disc = b * b - a * c;
    if (disc < 0) return tLimit;
    const denom = -b + Math.sqrt(disc);
    return Math.min(tLimit, denom > 0 ? c / denom : Infinity);
  }
}
