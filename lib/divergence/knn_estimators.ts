/**
 * k-nearest-neighbour estimators of the KL divergence and of differential entropy.
 *
 * @module
 */
import digamma from "@stdlib/math-base-special-digamma";
import { SaddleError } from "../errors/saddle_error.ts";
import { type Estimate, meanEstimate } from "../estimate/mod.ts";
import { kNearest, kNearestSelf } from "../neighbors/mod.ts";
import { type RandomSource, toRng } from "../random/mod.ts";
import { fromBuffer, type Samples, type SamplesInput } from "../samples/mod.ts";
import { asSamples, samplePair } from "./_inputs.ts";
import { logBase, scaleEstimate, unitOf } from "../estimate/units.ts";

/** Options of {@linkcode knnKlDivergence} and {@linkcode knnEntropy}. */
export interface KnnEstimatorOptions {
  /** Neighbour order k (default 1). */
  k?: number;
  /** Logarithm base (default e: nats; 2 gives bits). */
  base?: number;
  /** Confidence level (default 0.95). */
  level?: number;
  /**
   * Add independent N(0, jitter²) noise to every coordinate (seeded by `seed`) before the
   * search: breaks the ties of rounded or discrete data. Default 0 (no noise).
   */
  jitter?: number;
  /** Drop repeated rows within each set (keeping the first) before the search. */
  dedupe?: boolean;
  /** Seed of the jitter noise (default 0). */
  seed?: RandomSource;
}

/**
 * The k-NN estimate of `KL(p ‖ q)` from `x ~ p` (n rows) and `y ~ q` (m rows):
 * `(d/n) Σ_i log(ν_k(i)/ρ_k(i)) + log(m/(n−1))`, with `ρ_k(i)` the distance from `x_i` to its
 * k-th nearest other point of x and `ν_k(i)` to its k-th nearest point of y.
 *
 * Bias: consistent as n, m → ∞ with k fixed, but biased at finite n; the bias grows with the
 * dimension (the k-NN balls stop being small where the densities change, roughly as
 * n^(−1/d)) and with the divergence itself, and is typically downward for well-separated
 * distributions. The interval is the normal interval of the mean of the per-point terms
 * (method "knn-terms"); the terms are weakly dependent through shared neighbours, so it is
 * approximate. Zero distances (repeated rows) make a term infinite: the call throws and
 * names the `jitter` and `dedupe` options.
 *
 * References: Wang, Kulkarni & Verdú 2009, Divergence estimation for multidimensional
 * densities via k-nearest-neighbor distances (IEEE T-IT).
 *
 * @example
 * ```ts
 * import { knnKlDivergence } from "./knn_estimators.ts";
 * import { rng } from "../random/mod.ts";
 * import assert from "node:assert/strict";
 * const r = rng(1);
 * const x = Array.from({ length: 2000 }, () => r.normal());
 * const y = Array.from({ length: 2000 }, () => r.normal(1, 1));
 * const kl = knnKlDivergence(x, y, { k: 5 });
 * assert.ok(Math.abs(kl.value - 0.5) < 0.1); // KL(N(0,1) ‖ N(1,1)) = 1/2
 * ```
 */
export function knnKlDivergence(
  x: SamplesInput,
  y: SamplesInput,
  options: KnnEstimatorOptions = {},
): Estimate {
  let [p, q] = samplePair(x, y, 1, ["x", "y"]);
  const k = checkK(options.k ?? 1);
  [p, q] = prepare([p, q], options);
  if (p.n <= k || q.n < k) {
    throw new SaddleError(
      "too-few-samples",
      `x has ${p.n} and y ${q.n} rows but k = ${k} needs more than k rows in x and at least k ` +
        "in y; lower k or give more points",
      { parameter: "k" },
    );
  }
  const rho = kNearestSelf(p, { k }), nu = kNearest(q, p, { k });
  const d = p.d, terms = new Float64Array(p.n), c = Math.log(q.n / (p.n - 1));
  for (let i = 0; i < p.n; i++) {
    const r = rho.distances[i * k + k - 1], v = nu.distances[i * k + k - 1];
    if (r === 0 || v === 0) throw zeroDistance(i, r === 0 ? "x" : "y");
    terms[i] = d * Math.log(v / r) + c;
  }
  return finish(terms, options, "KL divergence", `k = ${k}, d = ${d}, n = ${p.n}, m = ${q.n}`);
}

/**
 * The Kozachenko–Leonenko k-NN estimate of the differential entropy of `x`:
 * `ψ(n) − ψ(k) + log V_d + (d/n) Σ_i log ρ_k(i)`, with `V_d` the volume of the unit ball and
 * `ρ_k(i)` the distance from `x_i` to its k-th nearest other point.
 *
 * Bias: consistent with k fixed; at finite n the estimate is biased, more so in higher
 * dimensions and for densities with heavy tails or sharp edges (boundary effects make it
 * overestimate on bounded supports). The interval is the normal interval of the mean of the
 * per-point terms (method "knn-terms"), approximate since the terms share neighbours.
 *
 * References: Kozachenko & Leonenko 1987, Sample estimate of the entropy of a random vector
 * (Probl. Inf. Transm.); the k-th neighbour form as in Kraskov, Stögbauer & Grassberger 2004.
 *
 * @example
 * ```ts
 * import { knnEntropy } from "./knn_estimators.ts";
 * import { rng } from "../random/mod.ts";
 * import assert from "node:assert/strict";
 * const r = rng(2);
 * const x = Array.from({ length: 4000 }, () => r.normal());
 * const h = knnEntropy(x, { k: 3 });
 * assert.ok(Math.abs(h.value - 0.5 * Math.log(2 * Math.PI * Math.E)) < 0.05);
 * ```
 */
export function knnEntropy(x: SamplesInput, options: KnnEstimatorOptions = {}): Estimate {
  let p = asSamples(x, "x");
  const k = checkK(options.k ?? 1);
  [p] = prepare([p], options);
  if (p.n <= k) {
    throw new SaddleError(
      "too-few-samples",
      `x has ${p.n} rows but k = ${k} needs more than k; lower k or give more points`,
      { parameter: "k" },
    );
  }
  const rho = kNearestSelf(p, { k });
  const d = p.d;
  const c = digamma(p.n) - digamma(k) + logUnitBallVolume(d);
  const terms = new Float64Array(p.n);
  for (let i = 0; i < p.n; i++) {
    const r = rho.distances[i * k + k - 1];
    if (r === 0) throw zeroDistance(i, "x");
    terms[i] = c + d * Math.log(r);
  }
  return finish(terms, options, "entropy", `k = ${k}, d = ${d}, n = ${p.n}`);
}

/** `log(π^(d/2) / Γ(d/2 + 1))`, the log-volume of the unit ball in d dimensions. */
export function logUnitBallVolume(d: number): number {
  // log Γ(d/2 + 1) by the recursion Γ(x + 1) = x Γ(x) from Γ(1) = 1 or Γ(1/2) = √π.
  let lg = d % 2 === 0 ? 0 : 0.5 * Math.log(Math.PI);
  for (let x = d % 2 === 0 ? 1 : 0.5; x < d / 2 + 1 - 1e-9; x++) lg += Math.log(x);
  return (d / 2) * Math.log(Math.PI) - lg;
}

function finish(
  terms: Float64Array,
  options: KnnEstimatorOptions,
  what: string,
  note: string,
): Estimate {
  const e = meanEstimate(terms, {
    level: options.level ?? 0.95,
    method: "knn-terms",
    unit: "nats",
    notes: [`k-NN ${what}, ${note}`],
  });
  return scaleEstimate(e, logBase(options.base), unitOf(options.base));
}

function checkK(k: number): number {
  if (!Number.isInteger(k) || k < 1) {
    throw new SaddleError("invalid-argument", `k must be an integer >= 1, got ${k}`, {
      parameter: "k",
    });
  }
  return k;
}

function zeroDistance(row: number, set: string): SaddleError {
  return new SaddleError(
    "invalid-argument",
    `point ${row} of x has a k-th nearest neighbour in ${set} at distance 0 (repeated rows), ` +
      "so its log-distance is -Infinity; pass { dedupe: true } to drop repeated rows, or " +
      "{ jitter: s } to add N(0, s²) noise below the data's resolution",
    { row, parameter: "x" },
  );
}

function prepare(sets: Samples[], options: KnnEstimatorOptions): Samples[] {
  let out = sets;
  if (options.dedupe) out = out.map(dedupeRows);
  const jitter = options.jitter ?? 0;
  if (!(jitter >= 0) || !Number.isFinite(jitter)) {
    throw new SaddleError(
      "invalid-argument",
      `jitter must be a finite number >= 0, got ${jitter}`,
      {
        parameter: "jitter",
      },
    );
  }
  if (jitter > 0) {
    const r = toRng(options.seed ?? 0).fork("knn-jitter");
    out = out.map((s) => {
      const data = r.fillNormal(new Float64Array(s.data.length));
      for (let i = 0; i < data.length; i++) data[i] = s.data[i] + jitter * data[i];
      return fromBuffer(data, s.d);
    });
  }
  return out;
}

/** The rows of `s` without repeats (first occurrence kept, order preserved). */
export function dedupeRows(s: Samples): Samples {
  const seen = new Set<string>();
  const keep: number[] = [];
  for (let i = 0; i < s.n; i++) {
    const key = s.data.subarray(i * s.d, (i + 1) * s.d).join(",");
    if (!seen.has(key)) {
      seen.add(key);
      keep.push(i);
    }
  }
  if (keep.length === s.n) return s;
  const data = new Float64Array(keep.length * s.d);
  keep.forEach((i, r) => data.set(s.data.subarray(i * s.d, (i + 1) * s.d), r * s.d));
  return fromBuffer(data, s.d);
}
