/**
 * The periodogram of a detrended series and Fisher's g test for its largest ordinate: is
 * there one dominant period, stronger than white noise would give?
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";

/** Options of {@linkcode periodogram}. */
export interface PeriodogramOptions {
  /** Degree of the least-squares polynomial trend removed first (default 3; 0 = the mean). */
  detrendDegree?: number;
  /**
   * Lowest Fourier index kept (default 3: a period must fit at least 3 times in the series,
   * so the trend left after detrending is not read as a slow oscillation).
   */
  minCycles?: number;
  /** Spacing of the records in steps, to express periods in steps (default 1). */
  stepSize?: number;
}

/** A periodogram with Fisher's g test for its maximum. */
export interface Periodogram {
  /** Fourier indices k (cycles over the series) of the ordinates. */
  readonly k: Uint32Array;
  /** Frequencies in cycles per step: k / (n stepSize). */
  readonly frequency: Float64Array;
  /** Periods in steps: n stepSize / k. */
  readonly period: Float64Array;
  /** Ordinates I_k = |sum_t x_t e^(-2 pi i k t / n)|^2 / n of the detrended series. */
  readonly power: Float64Array;
  /** Index (into the arrays) of the largest ordinate. */
  readonly peak: number;
  /** Fisher's g: the largest ordinate over their sum. */
  readonly g: number;
  /** P(g >= observed) for Gaussian white noise (Fisher 1929). */
  readonly pValue: number;
  /** Amplitude of the sinusoid at the peak: 2 sqrt(I_peak / n). */
  readonly amplitude: number;
  /** Number of records used. */
  readonly n: number;
}

/**
 * Residuals of a least-squares polynomial fit of degree `deg` in the record index.
 *
 * @example A quadratic trend is removed exactly
 * ```ts
 * import { detrend } from "./periodogram.ts";
 * import assert from "node:assert/strict";
 * const r = detrend(Array.from({ length: 20 }, (_, t) => 3 + 2 * t - 0.1 * t * t), 2);
 * assert.ok(r.every((v) => Math.abs(v) < 1e-9));
 * ```
 */
export function detrend(x: ArrayLike<number>, deg: number): Float64Array {
  const n = x.length, p = Math.min(deg, n - 1) + 1;
  const t = (i: number) => (n > 1 ? (2 * i) / (n - 1) - 1 : 0);
  // Normal equations on Legendre-like monomials are ill-conditioned only for high degree;
  // deg <= 5 on [-1, 1] is fine. Solve by Gaussian elimination with partial pivoting.
  const a = Array.from({ length: p }, () => new Float64Array(p + 1));
  const pw = new Float64Array(p);
  for (let i = 0; i < n; i++) {
    const ti = t(i);
    pw[0] = 1;
    for (let j = 1; j < p; j++) pw[j] = pw[j - 1] * ti;
    for (let r = 0; r < p; r++) {
      for (let c = 0; c < p; c++) a[r][c] += pw[r] * pw[c];
      a[r][p] += pw[r] * x[i];
    }
  }
  for (let c = 0; c < p; c++) {
    let best = c;
    for (let r = c + 1; r < p; r++) if (Math.abs(a[r][c]) > Math.abs(a[best][c])) best = r;
    [a[c], a[best]] = [a[best], a[c]];
    for (let r = 0; r < p; r++) {
      if (r === c || a[c][c] === 0) continue;
      const f = a[r][c] / a[c][c];
      for (let k = c; k <= p; k++) a[r][k] -= f * a[c][k];
    }
  }
  const coef = a.map((row, r) => (row[r] === 0 ? 0 : row[p] / row[r]));
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let v = 0, pw = 1;
    const ti = t(i);
    for (let j = 0; j < p; j++) {
      v += coef[j] * pw;
      pw *= ti;
    }
    out[i] = x[i] - v;
  }
  return out;
}

function logChoose(m: number, j: number): number {
  let s = 0;
  for (let i = 1; i <= j; i++) s += Math.log((m - j + i) / i);
  return s;
}

/**
 * Fisher's exact tail probability of g = max I_k / sum I_k over `m` periodogram ordinates
 * of Gaussian white noise: `P(g >= x) = sum_{j=1}^{floor(1/x)} (-1)^(j-1) C(m, j)
 * (1 - j x)^(m-1)`, clamped to [0, 1] (the alternating sum loses precision only where the
 * probability is near 1).
 *
 * References: Fisher 1929, Tests of significance in harmonic analysis (Proc. R. Soc. A 125).
 *
 * @example For two ordinates g is uniform on [1/2, 1]: P(g >= x) = 2 (1 - x)
 * ```ts
 * import { fisherG } from "./periodogram.ts";
 * import assert from "node:assert/strict";
 * assert.ok(Math.abs(fisherG(0.8, 2) - 0.4) < 1e-12);
 * ```
 */
export function fisherG(g: number, m: number): number {
  if (!(m >= 1) || !Number.isInteger(m)) {
    throw new SaddleError("invalid-argument", `m must be a positive integer, got ${m}`, {
      parameter: "m",
    });
  }
  if (!(g > 0)) return 1;
  if (g >= 1) return m === 1 ? 1 : 0;
  let p = 0;
  const top = Math.min(m, Math.floor(1 / g));
  for (let j = 1; j <= top; j++) {
    const base = 1 - j * g;
    if (base <= 0) break;
    const term = Math.exp(logChoose(m, j) + (m - 1) * Math.log(base));
    p += j % 2 ? term : -term;
    if (term < 1e-18 * Math.abs(p)) break;
  }
  return Math.min(1, Math.max(0, p));
}

/**
 * The periodogram of `x` after removing a polynomial trend, at the Fourier frequencies
 * k/n for k = `minCycles` .. floor((n-1)/2), with the dominant period and Fisher's g test
 * of it against Gaussian white noise. Noise that is not white (red noise, a trend the
 * polynomial misses) makes the test too eager at low frequencies: keep `minCycles` >= 3.
 *
 * References: Schuster 1898 (the periodogram); Fisher 1929 (Proc. R. Soc. A 125), the g
 * test for the periodogram maximum.
 *
 * @example A sinusoid of period 20 records
 * ```ts
 * import { periodogram } from "./periodogram.ts";
 * import assert from "node:assert/strict";
 * const x = Array.from({ length: 200 }, (_, t) => Math.sin((2 * Math.PI * t) / 20) + 0.1 * Math.cos(t * t));
 * const p = periodogram(x);
 * assert.equal(p.period[p.peak], 20);
 * assert.ok(p.pValue < 1e-6);
 * ```
 */
export function periodogram(x: ArrayLike<number>, options: PeriodogramOptions = {}): Periodogram {
  const n = x.length;
  const deg = options.detrendDegree ?? 3;
  const kMin = options.minCycles ?? 3;
  const dt = options.stepSize ?? 1;
  const kMax = Math.floor((n - 1) / 2);
  if (kMax < kMin) {
    throw new SaddleError(
      "too-few-samples",
      `${n} records give no Fourier frequency with at least ${kMin} cycles; log more steps`,
      { parameter: "x" },
    );
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(x[i])) {
      throw new SaddleError(
        "non-finite",
        `value ${i} is ${x[i]}; drop or fill non-finite values first`,
        {
          parameter: "x",
          row: i,
        },
      );
    }
  }
  const r = detrend(x, deg);
  const m = kMax - kMin + 1;
  const k = new Uint32Array(m), frequency = new Float64Array(m), period = new Float64Array(m);
  const power = new Float64Array(m);
  let peak = 0, total = 0;
  for (let j = 0; j < m; j++) {
    const kk = kMin + j;
    const w = (2 * Math.PI * kk) / n;
    // The phasor e^(-i w t) by rotation, re-anchored every 64 records against drift.
    const c = Math.cos(w), s = Math.sin(w);
    let re = 0, im = 0, pc = 1, ps = 0;
    for (let t = 0; t < n; t++) {
      if ((t & 63) === 0) {
        pc = Math.cos(w * t);
        ps = Math.sin(w * t);
      }
      re += r[t] * pc;
      im -= r[t] * ps;
      const next = pc * c - ps * s;
      ps = ps * c + pc * s;
      pc = next;
    }
    k[j] = kk;
    frequency[j] = kk / (n * dt);
    period[j] = (n * dt) / kk;
    power[j] = (re * re + im * im) / n;
    total += power[j];
    if (power[j] > power[peak]) peak = j;
  }
  const g = total > 0 ? power[peak] / total : 0;
  return Object.freeze({
    k,
    frequency,
    period,
    power,
    peak,
    g,
    pValue: fisherG(g, m),
    amplitude: 2 * Math.sqrt(power[peak] / n),
    n,
  });
}
