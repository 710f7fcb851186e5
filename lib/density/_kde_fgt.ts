/**
 * Fast Gauss transform for 2-D kernel sums with a guaranteed relative error (private).
 *
 * Centres are binned in unit boxes (whitened units, i.e. kernel standard deviations). In
 * each dimension the kernel `exp(-(x - y)²/2)` with `x = c_T + t`, `y = c_S + s` and
 * `D = c_T - c_S` is the Taylor series of `f(u) = exp(-(D + u)²/2)` at `u = t - s`:
 * `Σ_n a_n (t - s)^n`, `a_n = (-1)^n He_n(D) exp(-D²/2) / n!` (He: probabilists' Hermite
 * polynomials), truncated at total order P in `(t, s)`. Source boxes carry the moments
 * `Σ w (-s1)^m1 (-s2)^m2`; the local Taylor coefficients of every target box are their
 * convolution over the box lattice, one dimension at a time; a query costs P² operations.
 *
 * Error bound, per dimension (Lagrange remainder and Cramér's inequality
 * `|He_n(y)| exp(-y²/4) <= K sqrt(n!)`, K = 1.086435, Abramowitz & Stegun 22.14.17):
 * `|f - F_P| <= K B^P / sqrt(P!) exp(-(|D| - B)₊² / 4)` for box side B; the 2-D product
 * error is `R1 F2 + (F1 + R1) R2` with `F = exp(-(|D| - B)₊² / 2)`; boxes beyond the
 * interaction range add at most `W exp(-dmin² / 2)`; rounding adds `16 P u A1 A2 W` with
 * `A = K exp(-D²/4) Σ_n B^n / sqrt(n!)` the absolute sum of the series. The sum over source
 * boxes gives an absolute bound E for every point of a target box. A query whose value S
 * satisfies `E <= ε (S - E)` has relative error at most ε = 1e-10 on the density; every
 * other query (far tails, empty regions) is evaluated by the exact evaluator instead.
 *
 * References: Greengard & Strain 1991, The fast Gauss transform (SIAM J. Sci. Stat.
 * Comput.); Cramér's inequality as in Abramowitz & Stegun 1964, 22.14.17.
 *
 * @module
 */
import type { EvalMethod } from "./kde_types.ts";

/** What the transform needs of an evaluator (structural, to keep the files acyclic). */
interface RowEvaluator {
  readonly method: EvalMethod;
  evaluate(q: Float64Array, out: Float64Array, from: number, to: number): void;
}

/** The transform's evaluator: counts the queries its bound accepted (the rest went exact). */
export interface FgtEvaluator extends RowEvaluator {
  readonly method: "fgt";
  /** Queries evaluated by the transform so far (not handed to the exact evaluator). */
  readonly accepted: number;
}

/** Guaranteed relative error of an accepted query's density. */
export const FGT_RELATIVE_ERROR = 1e-10;
/** Largest target lattice (boxes) the transform builds; beyond it the exact one is used. */
export const FGT_MAX_BOXES = 4000;
/** Box side in kernel standard deviations. */
const B = 1;
/** Truncation order per dimension. */
const P = 26;
/** Source boxes within this many boxes (per dimension) of a target box are expanded. */
const R = 9;
/** Cramér's constant. */
const K_CRAMER = 1.086435;
const UNIT_ROUNDOFF = 2 ** -53;

/** Taylor coefficients `c[j][m] = a_{j+m}(D) C(j+m, j)` (j + m < P) of one box offset. */
function offsetCoefficients(D: number): Float64Array {
  const a = new Float64Array(P);
  // h_n = He_n(D) / n!: h_{n+1} = (D h_n - h_{n-1}) / (n + 1).
  let hPrev = 1, h = D;
  const g = Math.exp(-0.5 * D * D);
  a[0] = g;
  if (P > 1) a[1] = -D * g;
  for (let n = 1; n + 1 < P; n++) {
    const next = (D * h - hPrev) / (n + 1);
    hPrev = h;
    h = next;
    a[n + 1] = ((n + 1) % 2 === 0 ? 1 : -1) * h * g;
  }
  const c = new Float64Array(P * P);
  for (let j = 0; j < P; j++) {
    let binom = 1; // C(j + m, j), m = 0
    for (let m = 0; j + m < P; m++) {
      c[j * P + m] = a[j + m] * binom;
      binom = binom * (j + m + 1) / (m + 1);
    }
  }
  return c;
}

/** Per-dimension error terms of a box offset of `delta` boxes. */
function offsetBounds(delta: number): { rem: number; fmax: number; abs: number } {
  const D = Math.abs(delta) * B;
  const gapD = Math.max(D - B, 0);
  let lgammaP = 0;
  for (let k = 2; k <= P; k++) lgammaP += Math.log(k);
  const rem = K_CRAMER * Math.exp(P * Math.log(B) - 0.5 * lgammaP - gapD * gapD / 4);
  let series = 0, lf = 0;
  for (let n = 0; n < P; n++) {
    if (n > 1) lf += Math.log(n);
    series += Math.exp(n * Math.log(B) - 0.5 * lf);
  }
  return { rem, fmax: Math.exp(-gapD * gapD / 2), abs: K_CRAMER * Math.exp(-D * D / 4) * series };
}

/**
 * A 2-D evaluator of `log Σ_j w_j exp(-|q - z_j|²/2)` by the fast Gauss transform, with the
 * exact evaluator `exact` for the queries whose bound is not met. Setup (the lattice
 * convolution) happens at construction; centres spread over more than
 * {@linkcode FGT_MAX_BOXES} target boxes get the exact evaluator itself.
 */
export function fgtEvaluator(
  z: Float64Array,
  lw: Float64Array | null,
  exact: RowEvaluator,
): FgtEvaluator | RowEvaluator {
  const n = z.length / 2;
  let lo0 = Infinity, lo1 = Infinity, hi0 = -Infinity, hi1 = -Infinity;
  for (let i = 0; i < n; i++) {
    lo0 = Math.min(lo0, z[2 * i]);
    hi0 = Math.max(hi0, z[2 * i]);
    lo1 = Math.min(lo1, z[2 * i + 1]);
    hi1 = Math.max(hi1, z[2 * i + 1]);
  }
  const G0 = Math.floor((hi0 - lo0) / B) + 1, G1 = Math.floor((hi1 - lo1) / B) + 1;
  const T0 = G0 + 2 * R, T1 = G1 + 2 * R;
  if (!(T0 * T1 <= FGT_MAX_BOXES)) return exact;
  const PP = P * P;
  // Source moments M[S0][S1][m0][m1] and box weights.
  const M = new Float64Array(G0 * G1 * PP);
  const W = new Float64Array(G0 * G1);
  const p0 = new Float64Array(P), p1 = new Float64Array(P);
  for (let i = 0; i < n; i++) {
    const k0 = Math.min(G0 - 1, Math.floor((z[2 * i] - lo0) / B));
    const k1 = Math.min(G1 - 1, Math.floor((z[2 * i + 1] - lo1) / B));
    const s0 = z[2 * i] - (lo0 + (k0 + 0.5) * B), s1 = z[2 * i + 1] - (lo1 + (k1 + 0.5) * B);
    const w = lw ? Math.exp(lw[i]) : 1 / n;
    const box = k0 * G1 + k1;
    W[box] += w;
    p0[0] = w;
    p1[0] = 1;
    for (let m = 1; m < P; m++) {
      p0[m] = p0[m - 1] * -s0;
      p1[m] = p1[m - 1] * -s1;
    }
    const o = box * PP;
    for (let a = 0; a < P; a++) {
      const v = p0[a];
      for (let b = 0; b < P; b++) M[o + a * P + b] += v * p1[b];
    }
  }
  // Coefficients and bounds of every offset -R..R.
  const coef: Float64Array[] = [], bounds: ReturnType<typeof offsetBounds>[] = [];
  for (let delta = -R; delta <= R; delta++) {
    coef.push(offsetCoefficients(delta * B));
    bounds.push(offsetBounds(delta));
  }
  // Pass along dimension 1: X[S0][t1][m0][j1] = Σ_{S1} Σ_{m1} c_{t1-S1}[j1][m1] M[S0][S1][m0][m1].
  const X = new Float64Array(G0 * T1 * PP);
  const rowUsed = new Uint8Array(G0 * T1);
  for (let s0 = 0; s0 < G0; s0++) {
    for (let s1 = 0; s1 < G1; s1++) {
      const box = s0 * G1 + s1;
      if (W[box] === 0) continue;
      const mo = box * PP;
      for (let t1 = s1; t1 <= s1 + 2 * R; t1++) {
        // Target index t1 is box t1 - R; offset (t1 - R) - s1 in -R..R.
        const c = coef[t1 - s1];
        const xo = (s0 * T1 + t1) * PP;
        rowUsed[s0 * T1 + t1] = 1;
        for (let m0 = 0; m0 < P; m0++) {
          const mrow = mo + m0 * P, xrow = xo + m0 * P;
          for (let j1 = 0; j1 < P; j1++) {
            const cr = j1 * P;
            let acc = 0;
            for (let m1 = 0; m1 + j1 < P; m1++) acc += c[cr + m1] * M[mrow + m1];
            X[xrow + j1] += acc;
          }
        }
      }
    }
  }
  // Pass along dimension 0: L[t0][t1][j0][j1] = Σ_{S0} Σ_{m0} c_{t0-S0}[j0][m0] X[S0][t1][m0][j1].
  const L = new Float64Array(T0 * T1 * PP);
  for (let s0 = 0; s0 < G0; s0++) {
    for (let t1 = 0; t1 < T1; t1++) {
      if (!rowUsed[s0 * T1 + t1]) continue;
      const xo = (s0 * T1 + t1) * PP;
      for (let t0 = s0; t0 <= s0 + 2 * R; t0++) {
        const c = coef[t0 - s0];
        const lo = (t0 * T1 + t1) * PP;
        for (let j0 = 0; j0 < P; j0++) {
          const cr = j0 * P, lrow = lo + j0 * P;
          for (let m0 = 0; m0 + j0 < P; m0++) {
            const cv = c[cr + m0];
            const xrow = xo + m0 * P;
            for (let j1 = 0; j1 < P; j1++) L[lrow + j1] += cv * X[xrow + j1];
          }
        }
      }
    }
  }
  // Absolute error bound of every target box.
  const E = new Float64Array(T0 * T1);
  const gamma = 16 * P * UNIT_ROUNDOFF;
  for (let t0 = 0; t0 < T0; t0++) {
    for (let t1 = 0; t1 < T1; t1++) {
      let e = 0;
      for (let s0 = 0; s0 < G0; s0++) {
        for (let s1 = 0; s1 < G1; s1++) {
          const w = W[s0 * G1 + s1];
          if (w === 0) continue;
          const d0 = t0 - R - s0, d1 = t1 - R - s1;
          if (Math.abs(d0) <= R && Math.abs(d1) <= R) {
            const b0 = bounds[d0 + R], b1 = bounds[d1 + R];
            e += w * (b0.rem * b1.fmax + (b0.fmax + b0.rem) * b1.rem + gamma * b0.abs * b1.abs);
          } else {
            const g0 = Math.max(Math.abs(d0) - 1, 0) * B, g1 = Math.max(Math.abs(d1) - 1, 0) * B;
            e += w * Math.exp(-0.5 * (g0 * g0 + g1 * g1));
          }
        }
      }
      E[t0 * T1 + t1] = e;
    }
  }
  const one = new Float64Array(1);
  let accepted = 0;
  return {
    method: "fgt" as const,
    get accepted() {
      return accepted;
    },
    evaluate(q: Float64Array, out: Float64Array, from: number, to: number) {
      for (let r = from; r < to; r++) {
        const x0 = q[2 * r], x1 = q[2 * r + 1];
        const k0 = Math.floor((x0 - lo0) / B), k1 = Math.floor((x1 - lo1) / B);
        const t0 = k0 + R, t1 = k1 + R;
        let value = NaN;
        if (t0 >= 0 && t0 < T0 && t1 >= 0 && t1 < T1) {
          const u0 = x0 - (lo0 + (k0 + 0.5) * B), u1 = x1 - (lo1 + (k1 + 0.5) * B);
          const o = (t0 * T1 + t1) * PP;
          let s = 0;
          for (let j0 = P - 1; j0 >= 0; j0--) {
            const row = o + j0 * P;
            let inner = L[row + P - 1];
            for (let j1 = P - 2; j1 >= 0; j1--) inner = inner * u1 + L[row + j1];
            s = s * u0 + inner;
          }
          const e = E[t0 * T1 + t1];
          if (s > e && e <= FGT_RELATIVE_ERROR * (s - e)) {
            value = Math.log(s);
            accepted++;
          }
        }
        if (Number.isNaN(value)) {
          exact.evaluate(q, one, r, r + 1);
          value = one[0];
        }
        out[r - from] = value;
      }
    },
  };
}
