/**
 * Exact evaluators of `log Σ_j w_j exp(-|q - z_j|² / 2)` over whitened kernel centres `z`
 * (private; shared by the main thread and the KDE workers). Every evaluator works relative
 * to the largest term and skips only terms below `exp(-LOG_CUT)` = 1e-16 of it, so the
 * result is exact to ~n·1e-16 relative in the density and stays finite far from the data.
 *
 * @module
 */
import type { EvalMethod } from "./kde_types.ts";
import { fgtEvaluator } from "./_kde_fgt.ts";

/** Terms more than this many nats below the largest are skipped (1e-16 relative). */
export const LOG_CUT = 16 * Math.LN10;

const EXP_STEP = 64;
const EXP_TABLE = Float64Array.from(
  { length: 38 * EXP_STEP + 2 },
  (_, j) => Math.exp(-j / EXP_STEP),
);

/**
 * `exp(x)` for `-LOG_CUT - 1 <= x <= 0`: a table of `exp(-j/64)` times a degree-6 Taylor
 * polynomial of the remainder (|r| <= 1/128, truncation < 3e-19): within 2 ulp of Math.exp,
 * about twice as fast in the kernel loops.
 */
export function expNeg(x: number): number {
  const j = Math.floor(0.5 - x * EXP_STEP);
  const r = x + j / EXP_STEP;
  return EXP_TABLE[j] *
    (1 + r * (1 + r * (0.5 + r * (1 / 6 + r * (1 / 24 + r * (1 / 120 + r * (1 / 720)))))));
}

export type { EvalMethod };

/** A ready evaluator over fixed centres. */
export interface KernelSumEvaluator {
  readonly method: EvalMethod;
  /** Fill `out[i - from]` for query rows `from <= i < to` of `q` (row-major, d columns). */
  evaluate(q: Float64Array, out: Float64Array, from: number, to: number): void;
}

/**
 * Choose the evaluator for a dimension: sorted for 1-D, the fast Gauss transform for 2-D
 * (large jobs only, see {@linkcode methodForJob}), tree for 3-D, else blocked.
 */
export function defaultMethod(d: number): EvalMethod {
  return d === 1 ? "sorted" : d === 2 ? "fgt" : d <= 3 ? "tree" : "blocked";
}

/** Jobs (centres x queries) below this size use the exact tree instead of the transform. */
export const FGT_MIN_PAIRS = 5e7;

/** The evaluator a job of `n` centres and `m` queries uses: "fgt" only for large jobs. */
export function methodForJob(method: EvalMethod, n: number, m: number): EvalMethod {
  return method === "fgt" && n * m < FGT_MIN_PAIRS ? "tree" : method;
}

/**
 * Build an evaluator. `z` is row-major n x d, `lw` the log weights (normalised, or null for
 * equal weights `-log n`).
 */
export function makeEvaluator(
  z: Float64Array,
  d: number,
  lw: Float64Array | null,
  method: EvalMethod = defaultMethod(d),
): KernelSumEvaluator {
  const n = z.length / d;
  if (method === "sorted" && d === 1) return sortedEvaluator(z, lw, n);
  if (method === "tree") return treeEvaluator(z, d, lw, n);
  if (method === "fgt" && d === 2) return fgtEvaluator(z, lw, treeEvaluator(z, d, lw, n));
  return blockedEvaluator(z, d, lw, n);
}

/** Width of a 1-D expansion box (whitened units, i.e. kernel standard deviations). */
const BOX = 0.5;
/** Taylor terms per box: error factor (TMAX BOX/2)^P / P! e^(TMAX BOX) < 1e-18. */
const TERMS = 28;
/** Farthest box centre (in kernel sds) at which a box's expansion is used. */
const TMAX = 10;
/** Boxes with fewer points are summed directly (cheaper than the expansion). */
const MIN_EXPAND = 8;

/**
 * 1-D evaluator over sorted centres. Centres are grouped in boxes of width 0.5 kernel sds;
 * a box with enough points carries the Taylor coefficients of `Σ_i w_i exp(tδ_i - δ_i²/2)`
 * in `t` (δ_i the offset of centre i from the box centre), so that its whole contribution
 * `exp(-t²/2) Σ_k A_k t^k` costs one exponential and a Horner sum when the query lies
 * within TMAX kernel sds of the box. Truncation and cancellation errors stay below ~1e-14
 * relative per box (|tδ| <= 2.5); farther boxes, sparse boxes and far-tail queries are
 * summed directly, relative to the largest term.
 *
 * References: Greengard & Strain 1991, The fast Gauss transform (SIAM J. Sci. Stat.
 * Comput.), for expanding Gaussian sums about box centres.
 */
function sortedEvaluator(z0: Float64Array, lw0: Float64Array | null, n: number) {
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => z0[a] - z0[b]);
  const z = new Float64Array(n);
  const lw = new Float64Array(n);
  const lwConst = -Math.log(n);
  for (let i = 0; i < n; i++) {
    z[i] = z0[order[i]];
    lw[i] = lw0 ? lw0[order[i]] : lwConst;
  }
  let lwMax = -Infinity;
  for (let i = 0; i < n; i++) if (lw[i] > lwMax) lwMax = lw[i];
  // Boxes: maximal runs of sorted centres within BOX of the run's first centre.
  const bStart: number[] = [], bEnd: number[] = [];
  for (let i = 0; i < n;) {
    const lo = z[i];
    let j = i + 1;
    while (j < n && z[j] < lo + BOX) j++;
    bStart.push(i);
    bEnd.push(j);
    i = j;
  }
  const nb = bStart.length;
  const first = new Float64Array(nb), last = new Float64Array(nb), centre = new Float64Array(nb);
  const coef = new Float64Array(nb * TERMS);
  const expand = new Uint8Array(nb);
  for (let b = 0; b < nb; b++) {
    first[b] = z[bStart[b]];
    last[b] = z[bEnd[b] - 1];
    const c = 0.5 * (first[b] + last[b]);
    centre[b] = c;
    if (bEnd[b] - bStart[b] < MIN_EXPAND) continue;
    expand[b] = 1;
    const o = b * TERMS;
    for (let i = bStart[b]; i < bEnd[b]; i++) {
      const dlt = z[i] - c;
      let term = Math.exp(lw[i] - 0.5 * dlt * dlt);
      for (let k = 0; k < TERMS; k++) {
        coef[o + k] += term;
        term *= dlt / (k + 1);
      }
    }
  }
  const lowerBound = (arr: Float64Array, len: number, v: number): number => {
    let lo = 0, hi = len;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (arr[mid] < v) lo = mid + 1;
      else hi = mid;
    }
    return lo;
  };
  const direct = (x: number, ref: number, radius: number, a: number, b: number): number => {
    let s = 0;
    for (let j = a; j < b; j++) {
      const t = x - z[j];
      if (t > radius) continue;
      if (t < -radius) break;
      s += Math.exp(lw[j] - 0.5 * t * t - ref);
    }
    return s;
  };
  return {
    method: "sorted" as const,
    evaluate(q: Float64Array, out: Float64Array, from: number, to: number) {
      for (let r = from; r < to; r++) {
        const x = q[r];
        const k = lowerBound(z, n, x);
        // Nearest centre: its term is a lower bound on the largest term.
        let near = k;
        if (k === n || (k > 0 && x - z[k - 1] <= z[k] - x)) near = k - 1;
        const dn = x - z[near];
        const ref = lw[near] - 0.5 * dn * dn;
        // (x - z)² overflowed: every term is below the smallest double (log-density -∞).
        if (ref === -Infinity) {
          out[r - from] = -Infinity;
          continue;
        }
        const radius = Math.sqrt(2 * (lwMax - ref + LOG_CUT));
        // Boxes that may hold a centre within `radius` of x.
        let b = lowerBound(last, nb, x - radius);
        let s = 0;
        for (; b < nb && first[b] <= x + radius; b++) {
          const t = x - centre[b];
          if (expand[b] && t <= TMAX && t >= -TMAX) {
            const o = b * TERMS;
            let p = coef[o + TERMS - 1];
            for (let m = TERMS - 2; m >= 0; m--) p = p * t + coef[o + m];
            s += Math.exp(-0.5 * t * t - ref) * p;
          } else {
            s += direct(x, ref, radius, bStart[b], bEnd[b]);
          }
        }
        // Cannot happen for |tδ| <= 2.5 (cancellation is bounded); kept as a guard.
        if (!(s > 0)) s = direct(x, ref, radius, 0, n);
        out[r - from] = ref + Math.log(s);
      }
    },
  };
}

function blockedEvaluator(z: Float64Array, d: number, lw: Float64Array | null, n: number) {
  // Column-major copy: each coordinate is one contiguous sweep over the centres.
  const cols = new Float64Array(n * d);
  for (let j = 0; j < n; j++) for (let c = 0; c < d; c++) cols[c * n + j] = z[j * d + c];
  const key = new Float64Array(n);
  const lwConst = -Math.log(n);
  return {
    method: "blocked" as const,
    evaluate(q: Float64Array, out: Float64Array, from: number, to: number) {
      for (let r = from; r < to; r++) {
        const o = r * d;
        if (lw) { for (let j = 0; j < n; j++) key[j] = -2 * lw[j]; }
        else key.fill(0);
        for (let c = 0; c < d; c++) {
          const qc = q[o + c], co = c * n;
          for (let j = 0; j < n; j++) {
            const t = qc - cols[co + j];
            key[j] += t * t;
          }
        }
        let best = Infinity;
        for (let j = 0; j < n; j++) if (key[j] < best) best = key[j];
        // key = |q - z_j|² - 2 lw_j, i.e. twice the negative log term. All keys overflowed:
        // the log-density is -∞ (and best - key would be ∞ - ∞ = NaN).
        if (best === Infinity) {
          out[r - from] = -Infinity;
          continue;
        }
        const lim = best + 2 * LOG_CUT;
        let s = 0;
        for (let j = 0; j < n; j++) {
          const kj = key[j];
          if (kj <= lim) s += expNeg(0.5 * (best - kj));
        }
        out[r - from] = (lw ? 0 : lwConst) - 0.5 * best + Math.log(s);
      }
    },
  };
}

const LEAF = 24;

function treeEvaluator(z0: Float64Array, d: number, lw0: Float64Array | null, n: number) {
  // Build: nodes in arrays; points reordered so every node covers a contiguous range.
  const idx = Array.from({ length: n }, (_, i) => i);
  const lo: number[] = [], hi: number[] = [], start: number[] = [], end: number[] = [];
  const left: number[] = [], right: number[] = [], nodeLw: number[] = [];
  const lwConst = -Math.log(n);
  const build = (a: number, b: number): number => {
    const id = start.length;
    start.push(a);
    end.push(b);
    left.push(-1);
    right.push(-1);
    nodeLw.push(-Infinity);
    let widest = 0, width = -1;
    for (let c = 0; c < d; c++) {
      let mn = Infinity, mx = -Infinity;
      for (let i = a; i < b; i++) {
        const v = z0[idx[i] * d + c];
        if (v < mn) mn = v;
        if (v > mx) mx = v;
      }
      lo[id * d + c] = mn;
      hi[id * d + c] = mx;
      if (mx - mn > width) {
        width = mx - mn;
        widest = c;
      }
    }
    let m = -Infinity;
    for (let i = a; i < b; i++) {
      const v = lw0 ? lw0[idx[i]] : lwConst;
      if (v > m) m = v;
    }
    nodeLw[id] = m;
    if (b - a > LEAF && width > 0) {
      const sub = idx.slice(a, b).sort((u, v) => z0[u * d + widest] - z0[v * d + widest]);
      for (let i = a; i < b; i++) idx[i] = sub[i - a];
      const mid = (a + b) >>> 1;
      left[id] = build(a, mid);
      right[id] = build(mid, b);
    }
    return id;
  };
  build(0, n);
  const z = new Float64Array(n * d);
  const lw = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    for (let c = 0; c < d; c++) z[i * d + c] = z0[idx[i] * d + c];
    lw[i] = lw0 ? lw0[idx[i]] : lwConst;
  }
  const L = Float64Array.from(lo), H = Float64Array.from(hi);
  const S = Int32Array.from(start), E = Int32Array.from(end);
  const Lc = Int32Array.from(left), Rc = Int32Array.from(right);
  const NL = Float64Array.from(nodeLw);
  const stack = new Int32Array(4 * 64);
  const nodeBound = (node: number, q: Float64Array, o: number): number => {
    let s2 = 0;
    for (let c = 0; c < d; c++) {
      const v = q[o + c];
      const l = L[node * d + c], h = H[node * d + c];
      const t = v < l ? l - v : v > h ? v - h : 0;
      s2 += t * t;
    }
    return 0.5 * s2 - NL[node];
  };
  return {
    method: "tree" as const,
    evaluate(q: Float64Array, out: Float64Array, from: number, to: number) {
      for (let r = from; r < to; r++) {
        const o = r * d;
        // Pass 1: smallest key 0.5|q - z|² - lw (the largest term), depth-first, near child first.
        let best = Infinity;
        let sp = 0;
        stack[sp++] = 0;
        while (sp > 0) {
          const node = stack[--sp];
          if (nodeBound(node, q, o) >= best) continue;
          const lc = Lc[node];
          if (lc < 0) {
            for (let j = S[node]; j < E[node]; j++) {
              let s2 = 0;
              for (let c = 0; c < d; c++) {
                const t = q[o + c] - z[j * d + c];
                s2 += t * t;
              }
              const kj = 0.5 * s2 - lw[j];
              if (kj < best) best = kj;
            }
          } else {
            const rc = Rc[node];
            const bl = nodeBound(lc, q, o), br = nodeBound(rc, q, o);
            if (bl < br) {
              stack[sp++] = rc;
              stack[sp++] = lc;
            } else {
              stack[sp++] = lc;
              stack[sp++] = rc;
            }
          }
        }
        if (best === Infinity) {
          out[r - from] = -Infinity; // every key overflowed: log-density -∞
          continue;
        }
        // Pass 2: sum every term within LOG_CUT of the largest.
        const lim = best + LOG_CUT;
        let s = 0;
        sp = 0;
        stack[sp++] = 0;
        while (sp > 0) {
          const node = stack[--sp];
          if (nodeBound(node, q, o) > lim) continue;
          const lc = Lc[node];
          if (lc < 0) {
            for (let j = S[node]; j < E[node]; j++) {
              let s2 = 0;
              for (let c = 0; c < d; c++) {
                const t = q[o + c] - z[j * d + c];
                s2 += t * t;
              }
              const kj = 0.5 * s2 - lw[j];
              if (kj <= lim) s += expNeg(best - kj);
            }
          } else {
            stack[sp++] = lc;
            stack[sp++] = Rc[node];
          }
        }
        out[r - from] = Math.log(s) - best;
      }
    },
  };
}
