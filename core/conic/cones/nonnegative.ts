import type { Cone } from './cone.ts';

/** The non-negative orthant R₊^l, as one cone of degree l. */
export class NonnegativeCone implements Cone {
  readonly degree: number;
  readonly blockEntries: number;
  /** NT scaling W = diag(w), w = √(s/z). */
  private readonly w: Float64Array;

  constructor(
    readonly offset: number,
    readonly dim: number,
  ) {
    this.degree = dim;
    this.blockEntries = dim;
    this.w = new Float64Array(dim).fill(1);
  }

  blockPattern(): Array<[number, number]> {
    return Array.from({ length: this.dim }, (_, i) => [i, i] as [number, number]);
  }

  violation(v: Float64Array): number {
    let worst = -Infinity;
    for (let i = this.offset; i < this.offset + this.dim; i++) if (-v[i] > worst) worst = -v[i];
    return worst;
  }

  addIdentity(v: Float64Array, t: number): void {
    for (let i = this.offset; i < this.offset + this.dim; i++) v[i] += t;
  }

  updateScaling(s: Float64Array, z: Float64Array, lambda: Float64Array): boolean {
    const o = this.offset;
    for (let i = 0; i < this.dim; i++) {
      const si = s[o + i];
      const zi = z[o + i];
      if (!(si > 0) || !(zi > 0)) return false;
      this.w[i] = Math.sqrt(si / zi);
      lambda[o + i] = Math.sqrt(si * zi);
    }
    return true;
  }

  setIdentityScaling(): void {
    this.w.fill(1);
  }

  mulW(v: Float64Array, out: Float64Array): void {
    const o = this.offset;
    for (let i = 0; i < this.dim; i++) out[o + i] = this.w[i] * v[o + i];
  }

  mulWinv(v: Float64Array, out: Float64Array): void {
    const o = this.offset;
    for (let i = 0; i < this.dim; i++) out[o + i] = v[o + i] / this.w[i];
  }

  writeKktBlock(values: Float64Array, positions: Int32Array, delta: number): void {
    for (let i = 0; i < this.dim; i++) values[positions[i]] = -(this.w[i] * this.w[i] + delta);
  }

  jordanProduct(u: Float64Array, v: Float64Array, out: Float64Array): void {
    for (let i = this.offset; i < this.offset + this.dim; i++) out[i] = u[i] * v[i];
  }

  jordanDivide(lambda: Float64Array, v: Float64Array, out: Float64Array): void {
    for (let i = this.offset; i < this.offset + this.dim; i++) out[i] = v[i] / lambda[i];
  }

  stepLength(x: Float64Array, d: Float64Array): number {
    let alpha = Infinity;
    for (let i = this.offset; i < this.offset + this.dim; i++) {
      if (d[i] < 0) {
        const a = -x[i] / d[i];
        if (a < alpha) alpha = a;
      }
    }
    return alpha;
  }
}
