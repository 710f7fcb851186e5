/**
 * The hot loop of EM for Gaussian mixtures (private; shared by the main thread and the EM
 * workers): one pass over rows computing each point's log-likelihood and, optionally, the
 * responsibility-weighted moments about the current means.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { cholesky, logDetCholesky } from "../linalg/cholesky.ts";

const LOG_2PI = Math.log(2 * Math.PI);

/** Inverse Cholesky factors `U_j = L_j⁻¹` (k x d x d) and `log w_j - ½ log det(2π Σ_j)`. */
export interface Prepared {
  readonly U: Float64Array;
  readonly base: Float64Array;
}

/**
 * Factorise every component covariance; a component that is not positive definite throws a
 * `numerical` SaddleError (it collapsed beyond what the floor repairs).
 */
export function prepare(w: Float64Array, cov: Float64Array, k: number, d: number): Prepared {
  const U = new Float64Array(k * d * d);
  const base = new Float64Array(k);
  for (let j = 0; j < k; j++) {
    let L: Float64Array;
    try {
      L = cholesky(cov.subarray(j * d * d, (j + 1) * d * d), d, { name: `covariance ${j}` });
    } catch {
      throw new SaddleError(
        "numerical",
        `mixture component ${j} collapsed: its covariance is not positive definite even after ` +
          "the floor; raise `regularization` (e.g. 1e-4 x the data variance) or use fewer components",
        { parameter: "regularization" },
      );
    }
    U.set(lowerInverse(L, d), j * d * d);
    base[j] = Math.log(w[j]) - 0.5 * (d * LOG_2PI + logDetCholesky(L, d));
  }
  return { U, base };
}

/** Inverse of a lower-triangular matrix (lower-triangular, row-major). */
function lowerInverse(L: Float64Array, d: number): Float64Array {
  const inv = new Float64Array(d * d);
  for (let c = 0; c < d; c++) {
    inv[c * d + c] = 1 / L[c * d + c];
    for (let r = c + 1; r < d; r++) {
      let t = 0;
      for (let m = c; m < r; m++) t -= L[r * d + m] * inv[m * d + c];
      inv[r * d + c] = t / L[r * d + r];
    }
  }
  return inv;
}

/** Responsibility-weighted sums of one pass, about the current means. */
export interface PassStats {
  /** Σ r_ij (k). */
  readonly nk: Float64Array;
  /** Σ r_ij (x_i - μ_j) (k x d). */
  readonly s1: Float64Array;
  /** Σ r_ij (x_i - μ_j)(x_i - μ_j)ᵀ, upper triangle (diagonal only unless `full`). */
  readonly s2: Float64Array;
}

/**
 * Rows `from <= i < to` of `data`: `ll[i]` = log Σ_j exp(base_j - ½|U_j (x_i - μ_j)|²) by
 * log-sum-exp relative to the largest term; when `stats` is given, adds the moments of the
 * responsibilities (those below 1e-14 are skipped: they move the sums by < n·1e-14).
 * Returns Σ ll[i] over the rows.
 */
export function emPass(
  { data, from, to, d, k, mu, prep, full, ll, stats }: {
    data: Float64Array;
    from: number;
    to: number;
    d: number;
    k: number;
    mu: Float64Array;
    prep: Prepared;
    full: boolean;
    ll: Float64Array;
    stats: PassStats | null;
  },
): number {
  const { U, base } = prep;
  const dev = new Float64Array(k * d);
  const v = new Float64Array(k);
  const nk = stats?.nk, s1 = stats?.s1, s2 = stats?.s2;
  let total = 0;
  for (let i = from; i < to; i++) {
    const o = i * d;
    let m = -Infinity;
    for (let j = 0; j < k; j++) {
      const mo = j * d, uo = j * d * d;
      for (let a = 0; a < d; a++) dev[mo + a] = data[o + a] - mu[mo + a];
      let q = 0;
      for (let a = 0; a < d; a++) {
        let t = 0;
        const ra = uo + a * d;
        for (let b = 0; b <= a; b++) t += U[ra + b] * dev[mo + b];
        q += t * t;
      }
      const lv = base[j] - 0.5 * q;
      v[j] = lv;
      if (lv > m) m = lv;
    }
    let sum = 0;
    for (let j = 0; j < k; j++) {
      const e = Math.exp(v[j] - m);
      v[j] = e;
      sum += e;
    }
    const li = m + Math.log(sum);
    ll[i] = li;
    total += li;
    if (!nk || !s1 || !s2) continue;
    const inv = 1 / sum;
    for (let j = 0; j < k; j++) {
      const r = v[j] * inv;
      if (r < 1e-14) continue;
      nk[j] += r;
      const mo = j * d, co = j * d * d;
      for (let a = 0; a < d; a++) {
        const ra = r * dev[mo + a];
        s1[mo + a] += ra;
        if (full) {
          const row = co + a * d;
          for (let b = a; b < d; b++) s2[row + b] += ra * dev[mo + b];
        } else s2[co + a * d + a] += ra * dev[mo + a];
      }
    }
  }
  return total;
}
