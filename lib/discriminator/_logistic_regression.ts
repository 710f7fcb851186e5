/**
 * Weighted L2-regularised logistic regression fitted by Newton's method (IRLS) with step
 * halving, on a row-major design matrix with an implicit intercept.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { cholesky, choleskySolve, syrk } from "../linalg/mod.ts";
import { sigmoid, softplus } from "../math/log_space.ts";

/** A fitted model: `eta = intercept + x · coef`. */
export interface LogisticFit {
  readonly intercept: number;
  readonly coef: Float64Array;
  readonly iterations: number;
  readonly converged: boolean;
}

/** Objective `Σ s_i [softplus(η_i) - y_i η_i] / Σ s + (λ/2) |coef|²`. */
function objective(
  { x, p, y, s, beta, lambda, eta }: {
    x: Float64Array;
    p: number;
    y: Uint8Array;
    s: Float64Array;
    beta: Float64Array;
    lambda: number;
    eta: Float64Array;
  },
): number {
  const n = y.length;
  let total = 0, sw = 0;
  for (let i = 0; i < n; i++) {
    let e = beta[0];
    for (let j = 0; j < p; j++) e += x[i * p + j] * beta[j + 1];
    eta[i] = e;
    total += s[i] * (softplus(e) - y[i] * e);
    sw += s[i];
  }
  let pen = 0;
  for (let j = 1; j <= p; j++) pen += beta[j] * beta[j];
  return total / sw + 0.5 * lambda * pen;
}

/**
 * Fit by Newton–IRLS. `x` is n x p row-major, `y` the 0/1 labels, `s` the sample weights,
 * `lambda` the ridge on the coefficients (not the intercept). The penalty keeps the fit
 * finite on separable data (disjoint supports).
 */
export function fitLogistic(
  { x, p, y, s, lambda, maxIterations = 100, start, tolerance = 1e-14 }: {
    x: Float64Array;
    p: number;
    y: Uint8Array;
    s: Float64Array;
    lambda: number;
    maxIterations?: number;
    /** Warm start: intercept then coefficients (length p + 1). */
    start?: Float64Array;
    /** Stop when the objective improves by less than this, relative (default 1e-14). */
    tolerance?: number;
  },
): LogisticFit {
  const n = y.length;
  const q = p + 1;
  let beta = start ? Float64Array.from(start) : new Float64Array(q);
  const eta = new Float64Array(n);
  let f = objective({ x, p, y, s, beta, lambda, eta });
  let sw = 0;
  for (let i = 0; i < n; i++) sw += s[i];
  const g = new Float64Array(q);
  let converged = false, it = 0;
  // The Hessian Xᵀ W X (with the intercept column) is one symmetric product of the rows
  // scaled by sqrt(w_i), on lib/linalg's backend (native BLAS when available).
  const scaled = new Float64Array(n * q);
  for (; it < maxIterations; it++) {
    g.fill(0);
    for (let i = 0; i < n; i++) {
      const mu = sigmoid(eta[i]);
      const r = s[i] * (mu - y[i]) / sw;
      const root = Math.sqrt(s[i] * mu * (1 - mu) / sw);
      const o = i * q, xo = i * p;
      scaled[o] = root;
      g[0] += r;
      for (let j = 0; j < p; j++) {
        const v = x[xo + j];
        scaled[o + j + 1] = root * v;
        g[j + 1] += r * v;
      }
    }
    const H = syrk(scaled, { n, d: q });
    for (let a = 0; a < q; a++) {
      if (a > 0) {
        H[a * q + a] += lambda;
        g[a] += lambda * beta[a];
      } else H[0] += 1e-12;
    }
    let L: Float64Array;
    try {
      L = cholesky(H, q, { name: "Hessian" });
    } catch {
      throw new SaddleError(
        "numerical",
        "the logistic-regression Hessian is singular: increase `regularization` or use fewer features",
        { parameter: "regularization" },
      );
    }
    const delta = choleskySolve(L, q, g);
    let step = 1, fNew = Infinity;
    let next = beta;
    for (let h = 0; h < 30; h++) {
      next = beta.map((b, j) => b - step * delta[j]);
      fNew = objective({ x, p, y, s, beta: next, lambda, eta });
      if (fNew <= f + 1e-15 * Math.abs(f)) break;
      step *= 0.5;
    }
    let maxStep = 0;
    for (let j = 0; j < q; j++) maxStep = Math.max(maxStep, Math.abs(step * delta[j]));
    beta = next;
    const df = f - fNew;
    f = fNew;
    if (maxStep < 1e-9 || df < tolerance * Math.max(1, Math.abs(f))) {
      converged = true;
      it++;
      break;
    }
  }
  return { intercept: beta[0], coef: beta.subarray(1), iterations: it, converged };
}

/** Linear predictor of a fitted model on an n x p design. */
export function predictLogit(fit: LogisticFit, x: Float64Array, p: number): Float64Array {
  const n = x.length / p;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let e = fit.intercept;
    for (let j = 0; j < p; j++) e += x[i * p + j] * fit.coef[j];
    out[i] = e;
  }
  return out;
}
