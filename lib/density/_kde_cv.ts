/**
 * The cross-validation search of the KDE bandwidth factor (private): the leave-one-out
 * likelihood over a factor grid, refined around the best factor.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { cholesky, trsm } from "../linalg/cholesky.ts";
import type { Samples } from "../samples/types.ts";
import { expNeg, LOG_CUT } from "./_kde_eval.ts";
import { scottFactor } from "./bandwidth.ts";
import type { KdeOptions } from "./kde_types.ts";

/** Result of a LOO scan over factors. */
export interface CvScan {
  readonly factors: Float64Array;
  /** Mean leave-one-out log-likelihood per held-out point (nats). */
  readonly scores: Float64Array;
  /** Held-out points that had exact copies elsewhere in the data (left out with them). */
  readonly tied: number;
}

/**
 * Mean LOO log-likelihood `(1/m) Σ_i log Σ_{j≠i} w_j/(1 - w_i) N(u_i; u_j, f² I)` for each
 * factor `f`, over `u` whitened by the data covariance (so the kernel is `f² Σ`). The
 * held-out set is every point when n <= maxHeldOut, else `maxHeldOut` evenly spaced rows.
 * The log-determinant of Σ is a constant and is left out.
 *
 * Ties: exact copies of the held-out point are left out with it ("leave-one-value-out"),
 * since on rounded or repeated data the copies would otherwise reward a bandwidth that
 * shrinks to 0 (the likelihood grows without bound as each point predicts its own copy).
 * A held-out point whose every other point is a copy is skipped.
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
  let heldWeight = 0, tied = 0;
  for (let k = 0; k < m; k++) {
    const i = m === n ? k : Math.floor((k * n) / m);
    let dmin = Infinity, copies = 0;
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
      if (s2 === 0) {
        dist[j] = Infinity;
        copies += w[j];
        continue;
      }
      dist[j] = s2;
      if (s2 < dmin) dmin = s2;
    }
    if (copies > 0) tied++;
    if (dmin === Infinity) continue;
    const rest = 1 - w[i] - copies;
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
  return { factors, scores: total.map((t) => t / heldWeight), tied };
}

/**
 * The factor `"cv"` picks: the best of a 25-point log grid in [1/8, 2] x Scott (or
 * `options.cvFactors`), refined on 11 points between its neighbours; the scan goes into
 * `extra` and a warning into `notes` when the optimum is at the end of the grid.
 */
export function cvFactor(
  { s, w, cov, neff, options, extra, notes }: {
    s: Samples;
    w: Float64Array;
    cov: Float64Array;
    neff: number;
    options: KdeOptions;
    extra: Record<string, unknown>;
    notes: string[];
  },
): number {
  const d = s.d;
  // Every row whitened by the data covariance: one triangular solve over the block.
  const u = trsm(cholesky(cov, d, { name: "data covariance" }), s.data, {
    m: s.n,
    n: d,
    side: "right",
    transpose: true,
  });
  const maxHeld = options.cvMaxPoints ?? 1000;
  const scott = scottFactor(neff, d);
  let grid: Float64Array;
  if (options.cvFactors) {
    grid = Float64Array.from(options.cvFactors);
    if (grid.length === 0 || grid.some((f) => !(f > 0) || !Number.isFinite(f))) {
      throw new SaddleError("invalid-argument", "cvFactors must be positive finite numbers", {
        parameter: "cvFactors",
      });
    }
  } else {
    grid = Float64Array.from({ length: 25 }, (_, i) => scott * Math.pow(2, -3 + (4 * i) / 24));
  }
  let scan = looScan(u, d, w, grid, maxHeld);
  let best = argmax(scan.scores);
  const coarse = scan;
  if (!options.cvFactors && best > 0 && best < grid.length - 1) {
    const lo = Math.log(grid[best - 1]), hi = Math.log(grid[best + 1]);
    const fine = Float64Array.from({ length: 11 }, (_, i) => Math.exp(lo + ((hi - lo) * i) / 10));
    scan = looScan(u, d, w, fine, maxHeld);
    best = argmax(scan.scores);
  } else if (best === 0 || best === grid.length - 1) {
    notes.push(
      `the leave-one-out optimum lies at the ${
        best === 0 ? "smallest" : "largest"
      } factor tried; ` +
        "widen cvFactors (ties in the data push the optimum to 0)",
    );
  }
  if (coarse.tied > 0) {
    notes.push(
      `${coarse.tied} of ${Math.min(s.n, maxHeld)} held-out points have exact copies in ` +
        "the data (rounded or repeated values): each was left out together with its copies",
    );
  }
  extra.cv = {
    factors: Array.from(coarse.factors),
    looLogLikelihood: Array.from(coarse.scores),
    heldOut: Math.min(s.n, maxHeld),
  };
  extra.looLogLikelihood = scan.scores[best];
  return scan.factors[best];
}

function argmax(v: Float64Array): number {
  let b = 0;
  for (let i = 1; i < v.length; i++) if (v[i] > v[b]) b = i;
  return b;
}
