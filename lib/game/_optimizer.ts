/**
 * Gradient steps with SGD, momentum or Adam, shared by the simulated games and the neural lab.
 *
 * @module
 */

/** The optimizer of both players. */
export type Optimizer = "sgd" | "momentum" | "adam";

/** One player's optimizer state. `apply` moves along an ascent direction. */
export class Stepper {
  m: Float64Array;
  v: Float64Array;
  t = 0;
  constructor(
    n: number,
    readonly kind: Optimizer,
    public lr: number,
    readonly b1: number,
    readonly b2: number,
  ) {
    this.m = new Float64Array(n);
    this.v = new Float64Array(n);
  }
  /** Move x along direction g (an ascent direction of its player). */
  apply(x: Float64Array, g: Float64Array): void {
    this.t++;
    if (this.kind === "sgd") {
      for (let i = 0; i < x.length; i++) x[i] += this.lr * g[i];
    } else if (this.kind === "momentum") {
      for (let i = 0; i < x.length; i++) {
        this.m[i] = this.b1 * this.m[i] + g[i];
        x[i] += this.lr * this.m[i];
      }
    } else {
      const c1 = 1 - this.b1 ** this.t, c2 = 1 - this.b2 ** this.t;
      for (let i = 0; i < x.length; i++) {
        this.m[i] = this.b1 * this.m[i] + (1 - this.b1) * g[i];
        this.v[i] = this.b2 * this.v[i] + (1 - this.b2) * g[i] * g[i];
        x[i] += (this.lr * (this.m[i] / c1)) / (Math.sqrt(this.v[i] / c2) + 1e-8);
      }
    }
  }
}
