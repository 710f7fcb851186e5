/**
 * The hot loop of EM for Gaussian mixtures (private; shared by the main thread and the EM
 * workers): one pass over rows computing each point's log-likelihood and, optionally, the
 * responsibility-weighted moments about the current means. Rows go in fixed blocks of
 * {@linkcode BLOCK}: the Mahalanobis terms of a block are one triangular solve per
 * component (`squaredMahalanobis`, a `trsm`), its scatter one symmetric rank-k update
 * (`syrk`), on the backend of lib/linalg. Blocks depend only on the rows, so the sums do not depend on the number of
 * threads.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { cholesky, logDetCholesky } from "../linalg/cholesky.ts";
import { squaredMahalanobis } from "../linalg/mahalanobis.ts";
import { syrk } from "../linalg/products.ts";

const LOG_2PI = Math.log(2 * Math.PI);

/** Rows per block of a pass. */
export const BLOCK = 256;

/**
 * Below this dimension the Mahalanobis terms are one fused loop per row (centre, forward
 * substitution, squared norm): a block solve pays only from here on (measured with
 * `deno task bench:compare em-full`, d = 8: about 1.4x slower through `trsm`).
 */
const SMALL_D = 16;

/** `q[i] = |L_j⁻¹ (x_i - μ_j)|²` for the `m` rows, fused per row (small d only). */
function smallMahalanobis(
  rows: Float64Array,
  m: number,
  d: number,
  L: Float64Array,
  j: number,
  mu: Float64Array,
  q: Float64Array,
): void {
  const lo = j * d * d, mo = j * d;
  const z = new Float64Array(d);
  for (let i = 0; i < m; i++) {
    const o = i * d;
    let s2 = 0;
    for (let a = 0; a < d; a++) {
      let t = rows[o + a] - mu[mo + a];
      const la = lo + a * d;
      for (let b = 0; b < a; b++) t -= L[la + b] * z[b];
      const za = t / L[la + a];
      z[a] = za;
      s2 += za * za;
    }
    q[i] = s2;
  }
}

/** Cholesky factors `L_j` of the covariances (k x d x d) and `log w_j - ½ log det(2π Σ_j)`. */
export interface Prepared {
  readonly L: Float64Array;
  readonly base: Float64Array;
}

/**
 * Factorise every component covariance; a component that is not positive definite throws a
 * `numerical` SaddleError (it collapsed beyond what the floor repairs).
 */
export function prepare(w: Float64Array, cov: Float64Array, k: number, d: number): Prepared {
  const Ls = new Float64Array(k * d * d);
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
    Ls.set(L, j * d * d);
    base[j] = Math.log(w[j]) - 0.5 * (d * LOG_2PI + logDetCholesky(L, d));
  }
  return { L: Ls, base };
}

/** Responsibility-weighted sums of one pass, about the current means. */
export interface PassStats {
  /** Σ r_ij (k). */
  readonly nk: Float64Array;
  /** Σ r_ij (x_i - μ_j) (k x d). */
  readonly s1: Float64Array;
  /**
   * Σ r_ij (x_i - μ_j)(x_i - μ_j)ᵀ (k x d x d): both triangles with `full`, else the
   * diagonal only. Added to what it holds.
   */
  readonly s2: Float64Array;
}

/**
 * Rows `from <= i < to` of `data`: `ll[i]` = log Σ_j exp(base_j - ½|L_j⁻¹ (x_i - μ_j)|²) by
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
  const B = Math.max(1, Math.min(BLOCK, to - from));
  const { L, base } = prep;
  const q = new Float64Array(B);
  const v = new Float64Array(B * k); // log terms, then responsibilities
  const scaled = stats && full ? new Float64Array(B * d) : null;
  const s2 = stats && full ? new Float64Array(k * d * d) : null;
  let total = 0;
  for (let r0 = from; r0 < to; r0 += B) {
    const m = Math.min(B, to - r0);
    const rows = data.subarray(r0 * d, (r0 + m) * d);
    for (let j = 0; j < k; j++) {
      if (d < SMALL_D) smallMahalanobis(rows, m, d, L, j, mu, q);
      else {
        squaredMahalanobis(rows, L.subarray(j * d * d, (j + 1) * d * d), {
          n: m,
          d,
          mean: mu.subarray(j * d, (j + 1) * d),
          out: q,
        });
      }
      for (let i = 0; i < m; i++) v[i * k + j] = base[j] - 0.5 * q[i];
    }
    for (let i = 0; i < m; i++) {
      const vo = i * k;
      let best = -Infinity;
      for (let j = 0; j < k; j++) if (v[vo + j] > best) best = v[vo + j];
      let sum = 0;
      for (let j = 0; j < k; j++) {
        const e = Math.exp(v[vo + j] - best);
        v[vo + j] = e;
        sum += e;
      }
      const li = best + Math.log(sum);
      ll[r0 + i] = li;
      total += li;
      const inv = 1 / sum;
      for (let j = 0; j < k; j++) v[vo + j] *= inv;
    }
    if (stats) accumulate({ stats, s2, scaled, rows, mu, v, m, d, k });
  }
  if (s2) { for (let a = 0; a < s2.length; a++) stats!.s2[a] += s2[a]; }
  return total;
}

/**
 * Add the moments about `mu` of given responsibilities `resp` (`n x k`, row-major) to
 * `stats`, block by block as in {@linkcode emPass} (used for the initial M-step).
 */
export function addMoments(
  { data, n, d, k, mu, resp, full, stats }: {
    data: Float64Array;
    n: number;
    d: number;
    k: number;
    mu: Float64Array;
    resp: Float64Array;
    full: boolean;
    stats: PassStats;
  },
): void {
  const B = Math.max(1, Math.min(BLOCK, n));
  const scaled = full ? new Float64Array(B * d) : null;
  const s2 = full ? new Float64Array(k * d * d) : null;
  for (let r0 = 0; r0 < n; r0 += B) {
    const m = Math.min(B, n - r0);
    const rows = data.subarray(r0 * d, (r0 + m) * d), v = resp.subarray(r0 * k, (r0 + m) * k);
    accumulate({ stats, s2, scaled, rows, mu, v, m, d, k });
  }
  if (s2) { for (let a = 0; a < s2.length; a++) stats.s2[a] += s2[a]; }
}

/** Add one block's responsibility-weighted moments (skipping r < 1e-14). */
function accumulate(
  { stats, s2, scaled, rows, mu, v, m, d, k }: {
    stats: PassStats;
    s2: Float64Array | null;
    scaled: Float64Array | null;
    rows: Float64Array;
    mu: Float64Array;
    v: Float64Array;
    m: number;
    d: number;
    k: number;
  },
): void {
  const { nk, s1 } = stats;
  for (let j = 0; j < k; j++) {
    const mo = j * d, co = j * d * d;
    let used = 0; // rows of `scaled` filled: only those with a responsibility
    for (let i = 0; i < m; i++) {
      const r = v[i * k + j], p = i * d;
      if (r < 1e-14) continue;
      nk[j] += r;
      if (scaled) {
        const h = Math.sqrt(r), w = used++ * d;
        for (let a = 0; a < d; a++) {
          const da = rows[p + a] - mu[mo + a];
          s1[mo + a] += r * da;
          scaled[w + a] = h * da;
        }
      } else {
        for (let a = 0; a < d; a++) {
          const da = rows[p + a] - mu[mo + a];
          s1[mo + a] += r * da;
          stats.s2[co + a * d + a] += r * da * da;
        }
      }
    }
    // Σ r_i dev_i dev_iᵀ = Wᵀ W with rows w_i = √r_i dev_i: one symmetric rank-m update.
    if (scaled && s2 && used > 0) {
      syrk(scaled.subarray(0, used * d), { n: used, d, beta: 1, c: s2.subarray(co, co + d * d) });
    }
  }
}
