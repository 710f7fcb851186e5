/**
 * Bandwidth rules for Gaussian kernel density estimates: Scott's and Silverman's factors
 * (multivariate normal-reference rules), Silverman's 1-D rule of thumb with the IQR guard,
 * and the diffusion selector of Botev, Grotowski & Kroese (2010) for 1-D data.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { quantileSorted } from "../estimate/bootstrap.ts";
import { fft, nextPow2 } from "./_fft.ts";

/**
 * Effective sample size `(Σw)² / Σw²` of weights (Kish); `n` when `weights` is undefined.
 *
 * References: Kish 1965, Survey Sampling (Wiley), the design-effect approximation.
 *
 * @example
 * ```ts
 * import { effectiveSampleSize } from "./bandwidth.ts";
 * import assert from "node:assert/strict";
 * assert.equal(effectiveSampleSize(4), 4);
 * assert.equal(effectiveSampleSize(3, [1, 1, 2]), 16 / 6);
 * ```
 */
export function effectiveSampleSize(n: number, weights?: ArrayLike<number>): number {
  if (!weights) return n;
  let s = 0, s2 = 0;
  for (let i = 0; i < weights.length; i++) {
    s += weights[i];
    s2 += weights[i] * weights[i];
  }
  return (s * s) / s2;
}

/**
 * Scott's factor `n^(-1/(d+4))`: the kernel covariance is the data covariance times its
 * square (normal-reference rule). With weights, `n` is the effective sample size.
 *
 * References: Scott 1992, Multivariate Density Estimation, eq. 6.42.
 *
 * @example
 * ```ts
 * import { scottFactor } from "./bandwidth.ts";
 * import assert from "node:assert/strict";
 * assert.ok(Math.abs(scottFactor(1e5, 1) - 0.1) < 1e-15);
 * ```
 */
export function scottFactor(n: number, d: number): number {
  checkN(n);
  return Math.pow(n, -1 / (d + 4));
}

/**
 * Silverman's multivariate factor `(n (d + 2) / 4)^(-1/(d+4))` (the factor scipy calls
 * `silverman_factor`).
 *
 * References: Silverman 1986, Density Estimation for Statistics and Data Analysis, eq. 4.14.
 *
 * @example
 * ```ts
 * import { silvermanFactor } from "./bandwidth.ts";
 * import assert from "node:assert/strict";
 * assert.ok(Math.abs(silvermanFactor(100, 2) - Math.pow(100, -1 / 6)) < 1e-15);
 * ```
 */
export function silvermanFactor(n: number, d: number): number {
  checkN(n);
  return Math.pow((n * (d + 2)) / 4, -1 / (d + 4));
}

/**
 * Silverman's 1-D rule of thumb `h = 0.9 min(s, IQR / 1.34) n^(-1/5)` (a bandwidth, not a
 * factor). The IQR guard keeps heavy tails and bimodality from inflating `h`; when the IQR
 * is 0 (many ties) the standard deviation alone is used. Weighted quantiles interpolate the
 * weighted empirical CDF; `n` is then the effective sample size.
 *
 * References: Silverman 1986, eq. 3.31.
 *
 * @example
 * ```ts
 * import { silvermanRuleOfThumb } from "./bandwidth.ts";
 * import assert from "node:assert/strict";
 * const h = silvermanRuleOfThumb([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
 * assert.ok(h > 0 && h < 3);
 * ```
 */
export function silvermanRuleOfThumb(x: ArrayLike<number>, weights?: ArrayLike<number>): number {
  const n = x.length;
  if (n < 2) throw tooFew(n);
  const { order, w } = sortWeighted(x, weights);
  let mean = 0;
  for (let i = 0; i < n; i++) mean += w[i] * x[i];
  let ss = 0;
  for (let i = 0; i < n; i++) ss += w[i] * (x[i] - mean) ** 2;
  const neff = effectiveSampleSize(n, weights);
  // Reliability-weights correction; reduces to n - 1 without weights.
  const sd = Math.sqrt(ss / (1 - 1 / neff));
  const iqr = weightedQuantile(x, order, w, 0.75) - weightedQuantile(x, order, w, 0.25);
  const spread = iqr > 0 ? Math.min(sd, iqr / 1.34) : sd;
  if (!(spread > 0)) {
    throw new SaddleError(
      "singular",
      "the data have zero spread (all values equal): no bandwidth can be derived; " +
        "give an explicit bandwidth matrix",
      { parameter: "bandwidth" },
    );
  }
  return 0.9 * spread * Math.pow(neff, -0.2);
}

/** Result of {@linkcode diffusionBandwidth}. */
export interface DiffusionBandwidth {
  /** The bandwidth (standard deviation of the Gaussian kernel). */
  readonly bandwidth: number;
  /** The fixed point `t*` of the diffusion equation (on the unit-scaled grid). */
  readonly tStar: number;
  /** Grid size used for the discrete cosine transform. */
  readonly gridSize: number;
}

/**
 * Diffusion bandwidth selector for 1-D data (the "improved Sheather–Jones" plug-in): bins
 * the data on 2^14 points over the range widened by a tenth on each side, takes the
 * discrete cosine transform, and solves `t = ξ γ^[l](t)` with l = 7 stages by bracketed
 * root finding. Weights give a weighted histogram and the effective sample size. N in the
 * fixed-point equation is the number of distinct values (as the authors' published code
 * counts it), so rounded or repeated data do not collapse the bandwidth.
 *
 * References: Botev, Grotowski & Kroese 2010, Kernel density estimation via diffusion,
 * Annals of Statistics 38(5), eqs. (29)-(30) and Algorithm 1.
 *
 * @example Close to the normal-reference bandwidth for normal data
 * ```ts
 * import { diffusionBandwidth } from "./bandwidth.ts";
 * import { Rng } from "../random/rng.ts";
 * import assert from "node:assert/strict";
 * const r = new Rng(1);
 * const x = Float64Array.from({ length: 5000 }, () => r.normal());
 * const { bandwidth } = diffusionBandwidth(x);
 * const normalRef = Math.pow(4 / (3 * 5000), 0.2);
 * assert.ok(Math.abs(bandwidth / normalRef - 1) < 0.2);
 * ```
 */
export function diffusionBandwidth(
  x: ArrayLike<number>,
  weights?: ArrayLike<number>,
  gridSize = 1 << 14,
): DiffusionBandwidth {
  const N = x.length;
  if (N < 2) throw tooFew(N);
  const n = nextPow2(gridSize);
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < N; i++) {
    if (x[i] < lo) lo = x[i];
    if (x[i] > hi) hi = x[i];
  }
  const range0 = hi - lo;
  if (!(range0 > 0)) {
    throw new SaddleError(
      "singular",
      "the data have zero spread (all values equal): the diffusion selector needs spread; " +
        "give an explicit bandwidth",
      { parameter: "bandwidth" },
    );
  }
  const MIN = lo - range0 / 10, MAX = hi + range0 / 10;
  const R = MAX - MIN;
  // Histogram on the n mesh points MIN + k R / (n - 1), as the published code's histc.
  const hist = new Float64Array(n);
  const dx = R / (n - 1);
  let total = 0;
  for (let i = 0; i < N; i++) {
    const k = Math.min(n - 1, Math.floor((x[i] - MIN) / dx));
    const w = weights ? weights[i] : 1;
    hist[k] += w;
    total += w;
  }
  for (let k = 0; k < n; k++) hist[k] /= total;
  // a_k = Σ_j h_j cos(π k (2j+1) / (2n)) by an FFT of the even extension (length 2n).
  const m = 2 * n;
  const re = new Float64Array(m), im = new Float64Array(m);
  for (let j = 0; j < n; j++) {
    re[j] = hist[j];
    re[m - 1 - j] = hist[j];
  }
  fft(re, im, -1);
  const a2 = new Float64Array(n - 1), I = new Float64Array(n - 1);
  for (let k = 1; k < n; k++) {
    const ang = (-Math.PI * k) / (2 * n);
    const ak = 0.5 * (Math.cos(ang) * re[k] - Math.sin(ang) * im[k]);
    a2[k - 1] = ak * ak;
    I[k - 1] = k * k;
  }
  // N is the number of distinct values, as in the authors' published code (from memory:
  // `N = length(unique(data))`): on rounded or repeated data the copies carry no new
  // information about the density's roughness, and counting them drives t* towards 0.
  const neff = Math.min(effectiveSampleSize(N, weights), distinctCount(x));
  const fp = fixedPointData(neff, I, a2);
  const f = (t: number) => fixedPoint(t, fp);
  const tStar = findRoot(f);
  return { bandwidth: Math.sqrt(tStar) * R, tStar, gridSize: n };
}

/** Number of distinct values in `x`. */
function distinctCount(x: ArrayLike<number>): number {
  const sorted = Float64Array.from(x).sort();
  let k = sorted.length > 0 ? 1 : 0;
  for (let i = 1; i < sorted.length; i++) if (sorted[i] !== sorted[i - 1]) k++;
  return k;
}

/** Precomputed pieces of the fixed-point map: `I^s a2` for s = 2..7 and `π² I`. */
interface FixedPointData {
  readonly N: number;
  readonly piI: Float64Array;
  readonly weighted: readonly Float64Array[]; // index s: I^s a2
}

function fixedPointData(N: number, I: Float64Array, a2: Float64Array): FixedPointData {
  const weighted: Float64Array[] = [];
  for (let s = 0; s <= 7; s++) {
    weighted.push(s < 2 ? new Float64Array(0) : a2.map((v, k) => Math.pow(I[k], s) * v));
  }
  return { N, piI: I.map((v) => v * Math.PI * Math.PI), weighted };
}

/** `t - ξ γ^[l](t)` with l = 7 (Botev et al. 2010, eq. 29 and the published algorithm). */
function fixedPoint(t: number, fp: FixedPointData): number {
  const l = 7;
  const sum = (s: number, time: number) => {
    const w = fp.weighted[s], piI = fp.piI;
    let f = 0;
    for (let k = 0; k < w.length; k++) f += w[k] * Math.exp(-piI[k] * time);
    return 2 * Math.pow(Math.PI, 2 * s) * f;
  };
  let f = sum(l, t);
  for (let s = l - 1; s >= 2; s--) {
    let K0 = 1;
    for (let j = 1; j <= 2 * s - 1; j += 2) K0 *= j;
    K0 /= Math.sqrt(2 * Math.PI);
    const c = (1 + Math.pow(0.5, s + 0.5)) / 3;
    const time = Math.pow((2 * c * K0) / fp.N / f, 2 / (3 + 2 * s));
    f = sum(s, time);
  }
  return t - Math.pow(2 * fp.N * Math.sqrt(Math.PI) * f, -2 / 5);
}

/**
 * Root of `f` on (0, b] with b grown from 0.1 (as the published code does), by the
 * Illinois variant of regula falsi with a bisection guard.
 */
function findRoot(f: (t: number) => number): number {
  let a = 1e-12;
  let fa = f(a);
  for (const b0 of [0.1, 0.2, 0.4, 0.8, 1]) {
    const fb0 = f(b0);
    if (Number.isFinite(fa) && Number.isFinite(fb0) && fa * fb0 <= 0) {
      let lo = a, hi = b0, flo = fa, fhi = fb0, side = 0;
      for (let it = 0; it < 200 && hi - lo > 1e-15 * hi; it++) {
        let mid = (lo * fhi - hi * flo) / (fhi - flo);
        if (!(mid > lo && mid < hi)) mid = 0.5 * (lo + hi);
        const fm = f(mid);
        if (fm === 0) return mid;
        if ((fm < 0) === (flo < 0)) {
          lo = mid;
          flo = fm;
          if (side === -1) fhi /= 2;
          side = -1;
        } else {
          hi = mid;
          fhi = fm;
          if (side === 1) flo /= 2;
          side = 1;
        }
      }
      return 0.5 * (lo + hi);
    }
    a = b0;
    fa = fb0;
  }
  throw new SaddleError(
    "numerical",
    "the diffusion bandwidth equation has no root in (0, 1]: the data may be too few or " +
      'too discrete; use bandwidth "scott" or "silverman" instead',
    { parameter: "bandwidth" },
  );
}

function sortWeighted(x: ArrayLike<number>, weights?: ArrayLike<number>) {
  const n = x.length;
  const order = Array.from({ length: n }, (_, i) => i).sort((i, j) => x[i] - x[j]);
  const w = new Float64Array(n);
  let total = 0;
  for (let i = 0; i < n; i++) {
    w[i] = weights ? weights[i] : 1;
    total += w[i];
  }
  for (let i = 0; i < n; i++) w[i] /= total;
  return { order, w };
}

/**
 * Quantile with linear interpolation; unweighted it is numpy's default ("linear", Hyndman
 * & Fan type 7). Weighted, the positions are the midpoint cumulative weights.
 */
function weightedQuantile(
  x: ArrayLike<number>,
  order: number[],
  w: Float64Array,
  p: number,
): number {
  const n = order.length;
  let uniform = true;
  for (let i = 1; i < n && uniform; i++) uniform = w[i] === w[0];
  if (uniform) return quantileSorted(Float64Array.from(order, (i) => x[i]), p);
  let cum = 0, prevPos = 0, prevX = x[order[0]];
  for (let k = 0; k < n; k++) {
    const wk = w[order[k]];
    const pos = cum + wk / 2;
    const xk = x[order[k]];
    if (pos >= p) {
      if (k === 0) return xk;
      return prevX + ((p - prevPos) / (pos - prevPos)) * (xk - prevX);
    }
    cum += wk;
    prevPos = pos;
    prevX = xk;
  }
  return prevX;
}

function checkN(n: number): void {
  if (!(n >= 1) || !Number.isFinite(n)) {
    throw new SaddleError("invalid-argument", `sample size must be >= 1, got ${n}`, {
      parameter: "n",
    });
  }
}

function tooFew(n: number): SaddleError {
  return new SaddleError(
    "too-few-samples",
    `a bandwidth needs at least 2 points, got ${n}`,
    { parameter: "samples" },
  );
}
