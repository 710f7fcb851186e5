/**
 * Leave-one-out likelihood cross-validation of the KDE bandwidth factor (private).
 *
 * @module
 */
import { expNeg, LOG_CUT } from "./_kde_eval.ts";

/** Result of a LOO scan over factors. */
export interface CvScan {
  readonly factors: Float64Array;
  /** Mean leave-one-out log-likelihood per held-out point (nats). */
  readonly scores: Float64Array;
}

/**
 * Mean LOO log-likelihood `(1/m) Σ_i log Σ_{j≠i} w_j/(1 - w_i) N(u_i; u_j, f² I)` for each
 * factor `f`, over `u` whitened by the data covariance (so the kernel is `f² Σ`). The
 * held-out set is every point when n <= maxHeldOut, else `maxHeldOut` evenly spaced rows.
 * The log-determinant of Σ is a constant and is left out.
 */
export function looScan(
  u: Float64Array,
  d: number,
  w: Float64Array,
  factors: Float64Array,
  maxHeldOut: number,
): CvScan {
  const n = u.length / d;
  const m = Math.min(n, maxHeldOut);
  const G = factors.length;
  const total = new Float64Array(G);
  const dist = new Float64Array(n);
  const inv2 = factors.map((f) => 0.5 / (f * f));
  const logNorm = factors.map((f) => -0.5 * d * Math.log(2 * Math.PI) - d * Math.log(f));
  const cut = LOG_CUT;
  let heldWeight = 0;
  for (let k = 0; k < m; k++) {
    const i = m === n ? k : Math.floor((k * n) / m);
    let dmin = Infinity;
    for (let j = 0; j < n; j++) {
      if (j === i) {
        dist[j] = Infinity;
        continue;
      }
      let s2 = 0;
      for (let c = 0; c < d; c++) {
        const t = u[i * d + c] - u[j * d + c];
        s2 += t * t;
      }
      dist[j] = s2;
      if (s2 < dmin) dmin = s2;
    }
    const rest = 1 - w[i];
    for (let g = 0; g < G; g++) {
      const a = inv2[g];
      const lim = dmin + cut / a;
      let s = 0;
      for (let j = 0; j < n; j++) {
        const dj = dist[j];
        if (dj <= lim) s += w[j] * expNeg(-a * (dj - dmin));
      }
      total[g] += w[i] * (Math.log(s / rest) - a * dmin + logNorm[g]);
    }
    heldWeight += w[i];
  }
  return { factors, scores: total.map((t) => t / heldWeight) };
}
