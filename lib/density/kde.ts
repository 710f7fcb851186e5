/**
 * Gaussian kernel density estimates in any dimension, with a full bandwidth matrix (data
 * covariance x factor², as is standard), bandwidth rules, weighted samples, exact tail-safe
 * log-densities and parallel evaluation in Web Workers.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { cholesky, logDetCholesky } from "../linalg/cholesky.ts";
import { covariance } from "../linalg/moments.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import { fromBuffer, type Samples, samples, type SamplesInput } from "../samples/samples.ts";
import {
  canStartWorker,
  checkQuery,
  checkSampleSize,
  densityBundle,
  description,
  LOG_2PI,
  type MatrixInput,
  matrixRows,
  toMatrix,
} from "./_common.ts";
import { looScan } from "./_cv.ts";
import { defaultMethod, type EvalMethod, makeEvaluator } from "./_kde_eval.ts";
import type { KdeJob, KdeSharedJob } from "./_kde_worker.ts";

/** How long `logPdf` waits for a worker before doing its rows itself (ms). */
const WORKER_TIMEOUT_MS = 60000;
const WORKER_URL = new URL("./_kde_worker.ts", import.meta.url);
import {
  diffusionBandwidth,
  effectiveSampleSize,
  scottFactor,
  silvermanFactor,
  silvermanRuleOfThumb,
} from "./bandwidth.ts";
import type { Density, DensityDescription } from "./types.ts";
import { JUPYTER_DISPLAY, type MimeBundle } from "../display/display.ts";

/** A named bandwidth rule. */
export type BandwidthRule = "scott" | "silverman" | "cv" | "diffusion";

/**
 * A bandwidth: a rule, a factor (number: kernel covariance = data covariance x factor²),
 * the kernel covariance matrix itself (row-major `d * d` values or rows; in 1-D `[h²]`), or
 * for d >= 2 its diagonal (`d` per-axis variances).
 */
export type Bandwidth = BandwidthRule | number | Exclude<MatrixInput, number>;

/** Options of {@linkcode fitKde}. */
export interface KdeOptions {
  /** Bandwidth rule, factor or matrix (default "scott"). */
  bandwidth?: Bandwidth;
  /** Per-sample weights (non-negative, not all 0); zero-weight points are dropped. */
  weights?: ArrayLike<number>;
  /** Factors tried by `"cv"` (default: 25 log-spaced in [1/8, 2] x Scott, then refined). */
  cvFactors?: ArrayLike<number>;
  /** Held-out points used by `"cv"` (default 1000; evenly spaced rows when n is larger). */
  cvMaxPoints?: number;
  /** Evaluator (default: sorted for 1-D, k-d tree for 2-D/3-D, blocked for d >= 4). */
  method?: EvalMethod;
  /**
   * Jobs of at least this many kernel terms (fit points x queries) make `logPdf` split the
   * queries across Web Workers and wait for them (default 5e7; Infinity keeps it on this
   * thread). The values are identical either way.
   */
  parallelMinPairs?: number;
}

/** Options of {@linkcode KdeDensity.logPdfParallel}. */
export interface ParallelOptions {
  /** Number of workers (default `navigator.hardwareConcurrency`, at most 8). */
  workers?: number;
  /**
   * Smallest job (fit points x query points) worth workers (default 4e6; the 1-D evaluator
   * counts at most 1000 points a query and needs 100 times more, since it is much faster).
   */
  minPairs?: number;
}

/** A fitted Gaussian KDE. */
export interface KdeDensity extends Density {
  /** Kernel centres (the fitted points with positive weight). */
  readonly points: Samples;
  /** Normalised weights of the centres (sum 1). */
  readonly weights: Float64Array;
  /** Kernel covariance H (row-major d x d); in 1-D `[h²]`. */
  readonly bandwidth: Float64Array;
  /** The factor with H = data covariance x factor², when H was built that way. */
  readonly factor?: number;
  /** How H was chosen: "scott", "silverman", "cv", "diffusion", "factor", "matrix", "diagonal". */
  readonly rule: string;
  /** Effective sample size (Kish) of the weights; n without weights. */
  readonly neff: number;
  /** The exact evaluator in use. */
  readonly method: EvalMethod;
  /** `logPdf` split across Web Workers when the job is large enough (same values). */
  logPdfParallel(x: Samples, options?: ParallelOptions): Promise<Float64Array>;
}

class Kde implements KdeDensity {
  readonly d: number;
  readonly points: Samples;
  readonly weights: Float64Array;
  readonly bandwidth: Float64Array;
  readonly factor?: number;
  readonly rule: string;
  readonly neff: number;
  readonly method: EvalMethod;
  readonly #L: Float64Array;
  readonly #z: Float64Array;
  readonly #lw: Float64Array | null;
  readonly #logNorm: number;
  readonly #extra: Record<string, unknown>;
  readonly #notes: string[];
  readonly #syncMinPairs: number;
  #evaluator?: ReturnType<typeof makeEvaluator>;

  constructor(
    points: Samples,
    weights: Float64Array,
    uniform: boolean,
    H: Float64Array,
    rule: string,
    factor: number | undefined,
    method: EvalMethod,
    extra: Record<string, unknown>,
    notes: string[],
    syncMinPairs: number,
  ) {
    const d = points.d;
    this.d = d;
    this.points = points;
    this.weights = weights;
    this.bandwidth = H;
    if (factor !== undefined) this.factor = factor;
    this.rule = rule;
    this.neff = effectiveSampleSize(points.n, uniform ? undefined : weights);
    this.method = method;
    this.#L = cholesky(H, d, { name: "bandwidth" });
    this.#z = whiten(points.data, d, this.#L);
    this.#lw = uniform ? null : weights.map(Math.log);
    this.#logNorm = -0.5 * (d * LOG_2PI + logDetCholesky(this.#L, d));
    this.#extra = extra;
    this.#notes = notes;
    this.#syncMinPairs = syncMinPairs;
  }

  logPdf(x: Samples): Float64Array {
    checkQuery(x, this.d, "kde");
    const q = whiten(x.data, this.d, this.#L);
    const out = this.#workerCount(x.n, this.#syncMinPairs) > 1
      ? this.#evaluateShared(q, x.n)
      : this.#evaluateHere(q, x.n);
    for (let i = 0; i < x.n; i++) out[i] += this.#logNorm;
    return out;
  }

  #evaluateHere(q: Float64Array, m: number): Float64Array {
    this.#evaluator ??= makeEvaluator(this.#z, this.d, this.#lw, this.method);
    const out = new Float64Array(m);
    this.#evaluator.evaluate(q, out, 0, m);
    return out;
  }

  /** Workers wanted for `m` queries: 1 below `minPairs` of estimated kernel terms. */
  #workerCount(m: number, minPairs: number, requested?: number): number {
    const cores = Math.min(8, navigator.hardwareConcurrency ?? 1);
    const workers = Math.max(1, Math.min(requested ?? cores, m));
    // The 1-D evaluator costs about the same per query whatever n (box expansions): count
    // its work as at most 1000 kernel terms a query, and ask for 100 times more.
    const sorted = this.method === "sorted";
    const work = m * (sorted ? Math.min(this.points.n, 1000) : this.points.n);
    if (workers < 2 || work < minPairs * (sorted ? 100 : 1)) return 1;
    return canStartWorker(WORKER_URL) ? workers : 1;
  }

  /**
   * Synchronous parallel evaluation: workers read the whitened queries from shared memory
   * while this thread does its own share, then it waits on shared flags (Atomics.wait).
   */
  #evaluateShared(q: Float64Array, m: number): Float64Array {
    const d = this.d;
    const threads = this.#workerCount(m, this.#syncMinPairs);
    const qSab = new SharedArrayBuffer(q.length * 8);
    new Float64Array(qSab).set(q);
    const outSab = new SharedArrayBuffer(m * 8);
    const doneSab = new SharedArrayBuffer(threads * 4);
    const flags = new Int32Array(doneSab);
    const bounds = Array.from({ length: threads + 1 }, (_, i) => Math.floor((i * m) / threads));
    const workers: Worker[] = [];
    for (let i = 1; i < threads; i++) {
      let w: Worker;
      try {
        w = new Worker(WORKER_URL, { type: "module" });
      } catch {
        break; // no permission to start workers: the remaining rows are done here
      }
      const job: KdeSharedJob = {
        z: this.#z,
        d,
        lw: this.#lw,
        method: this.method,
        q: qSab,
        out: outSab,
        done: doneSab,
        index: i,
        from: bounds[i],
        to: bounds[i + 1],
      };
      w.postMessage(job);
      workers.push(w);
    }
    const out = new Float64Array(outSab);
    this.#evaluator ??= makeEvaluator(this.#z, d, this.#lw, this.method);
    const qs = new Float64Array(qSab);
    this.#evaluator.evaluate(qs, out.subarray(0, bounds[1]), 0, bounds[1]);
    try {
      for (let i = 1; i < threads; i++) {
        // A worker that has not finished within the timeout (it could not start, say) has
        // its rows done here instead.
        const r = i <= workers.length ? Atomics.wait(flags, i, 0, WORKER_TIMEOUT_MS) : "none";
        if (r === "timed-out" || r === "none" || Atomics.load(flags, i) !== 1) {
          this.#evaluator.evaluate(
            qs,
            out.subarray(bounds[i], bounds[i + 1]),
            bounds[i],
            bounds[i + 1],
          );
        }
      }
    } finally {
      for (const w of workers) w.terminate();
    }
    return Float64Array.from(out);
  }

  async logPdfParallel(x: Samples, options: ParallelOptions = {}): Promise<Float64Array> {
    checkQuery(x, this.d, "kde");
    const workers = this.#workerCount(x.n, options.minPairs ?? 4e6, options.workers);
    if (workers < 2) {
      const q = whiten(x.data, this.d, this.#L);
      const out = this.#evaluateHere(q, x.n);
      for (let i = 0; i < x.n; i++) out[i] += this.#logNorm;
      return out;
    }
    const q = whiten(x.data, this.d, this.#L);
    const d = this.d;
    const chunks: Promise<Float64Array>[] = [];
    for (let k = 0; k < workers; k++) {
      const a = Math.floor((k * x.n) / workers), b = Math.floor(((k + 1) * x.n) / workers);
      const job: KdeJob = {
        z: this.#z,
        d,
        lw: this.#lw,
        method: this.method,
        q: q.slice(a * d, b * d),
      };
      chunks.push(runWorker(job));
    }
    let parts: Float64Array[];
    try {
      parts = await Promise.all(chunks);
    } catch {
      // Workers unavailable (permissions) or failed: evaluate here instead.
      return this.logPdf(x);
    }
    const out = new Float64Array(x.n);
    let o = 0;
    for (const p of parts) {
      for (let i = 0; i < p.length; i++) out[o + i] = p[i] + this.#logNorm;
      o += p.length;
    }
    return out;
  }

  sample(n: number, seed: RandomSource): Samples {
    checkSampleSize(n);
    const rng = toRng(seed);
    const d = this.d, L = this.#L, src = this.points.data;
    const pick = this.#lw ? rng.categoricalSampler(this.weights) : null;
    const out = new Float64Array(n * d);
    const e = new Float64Array(d);
    for (let r = 0; r < n; r++) {
      const i = pick ? pick() : rng.integer(this.points.n);
      for (let c = 0; c < d; c++) e[c] = rng.normal();
      for (let c = 0; c < d; c++) {
        let s = src[i * d + c];
        for (let k = 0; k <= c; k++) s += L[c * d + k] * e[k];
        out[r * d + c] = s;
      }
    }
    return fromBuffer(out, d);
  }

  /** Rich notebook display: the description's parameter table. */
  [JUPYTER_DISPLAY](): MimeBundle {
    return densityBundle(this);
  }

  describe(): DensityDescription {
    const d = this.d;
    return description("kde", d, {
      n: this.points.n,
      neff: this.neff,
      rule: this.rule,
      ...(this.factor !== undefined ? { factor: this.factor } : {}),
      bandwidth: d === 1 ? Math.sqrt(this.bandwidth[0]) : matrixRows(this.bandwidth, d),
      evaluator: this.method,
      ...this.#extra,
    }, this.#notes);
  }
}

function runWorker(job: KdeJob): Promise<Float64Array> {
  let worker: Worker;
  try {
    worker = new Worker(WORKER_URL, { type: "module" });
  } catch (e) {
    return Promise.reject(e);
  }
  return new Promise<Float64Array>((resolve, reject) => {
    worker.onmessage = (e: MessageEvent<Float64Array>) => {
      worker.terminate();
      resolve(e.data);
    };
    worker.onerror = (e: ErrorEvent) => {
      e.preventDefault();
      worker.terminate();
      reject(new SaddleError("numerical", `KDE worker failed: ${e.message}`));
    };
    worker.postMessage(job);
  });
}

/** `L⁻¹ x` for every row (forward substitution with the lower Cholesky factor). */
function whiten(x: Float64Array, d: number, L: Float64Array): Float64Array {
  const n = x.length / d;
  const z = new Float64Array(x.length);
  for (let r = 0; r < n; r++) {
    const o = r * d;
    for (let i = 0; i < d; i++) {
      let s = x[o + i];
      for (let k = 0; k < i; k++) s -= L[i * d + k] * z[o + k];
      z[o + i] = s / L[i * d + i];
    }
  }
  return z;
}

/**
 * Fit a Gaussian kernel density estimate. The kernel covariance H is the (weighted) data
 * covariance times factor² for the rules and for a numeric factor (Scott: `neff^(-1/(d+4))`,
 * as scipy's `gaussian_kde`); `"silverman"` is the 1-D rule of thumb with the IQR guard in
 * 1-D and the multivariate factor otherwise; `"cv"` maximises the leave-one-out likelihood
 * over a factor grid; `"diffusion"` is the Botev et al. selector (1-D only). A matrix gives
 * H directly.
 *
 * `logPdf` is exact up to terms below 1e-16 of the largest kernel term and computed relative
 * to that term, so queries far from every point still get a finite log-density. A column
 * with zero variance throws (drop it, or pass an explicit bandwidth matrix).
 *
 * References: Scott 1992; Silverman 1986; Botev, Grotowski & Kroese 2010 (Ann. Stat.).
 *
 * @example Fit, evaluate in the far tail, sample
 * ```ts
 * import { fitKde } from "./kde.ts";
 * import { samples } from "../samples/samples.ts";
 * import assert from "node:assert/strict";
 * const kde = fitKde([0.1, -0.4, 1.3, 0.8, -1.1, 0.2]);
 * const lp = kde.logPdf(samples([0, 1e4]));
 * assert.ok(lp[0] > -2 && Number.isFinite(lp[1]));
 * assert.equal(kde.rule, "scott");
 * assert.equal(kde.sample(10, 1).n, 10);
 * ```
 */
export function fitKde(input: SamplesInput, options: KdeOptions = {}): KdeDensity {
  const s0 = samples(input);
  const d = s0.d;
  if (s0.n < 2) {
    throw new SaddleError("too-few-samples", `a KDE needs at least 2 points, got ${s0.n}`, {
      parameter: "samples",
    });
  }
  const { s, w, uniform } = applyWeights(s0, options.weights);
  if (s.n < 2) {
    throw new SaddleError(
      "too-few-samples",
      `a KDE needs at least 2 points with positive weight, got ${s.n}`,
      { parameter: "weights" },
    );
  }
  const bw = options.bandwidth ?? "scott";
  const method = options.method ?? defaultMethod(d);
  const notes: string[] = [];
  const extra: Record<string, unknown> = {};
  const make = (H: Float64Array, rule: string, factor?: number) =>
    new Kde(s, w, uniform, H, rule, factor, method, extra, notes, options.parallelMinPairs ?? 5e7);
  const neff = effectiveSampleSize(s.n, uniform ? undefined : w);
  if (typeof bw !== "string" && typeof bw !== "number") {
    const flat = bw as ArrayLike<unknown>;
    if (d > 1 && flat.length === d && typeof flat[0] === "number") {
      // d numbers: a diagonal kernel covariance (per-axis variances).
      const diag = new Float64Array(d * d);
      for (let c = 0; c < d; c++) diag[c * d + c] = flat[c] as number;
      return make(toMatrix(diag, d, "bandwidth"), "diagonal");
    }
    return make(toMatrix(bw, d, "bandwidth"), "matrix");
  }
  const cov = dataCovariance(s, uniform ? undefined : w);
  const scaled = (f: number) => cov.map((v) => v * f * f);
  if (typeof bw === "number") {
    if (!(bw > 0) || !Number.isFinite(bw)) {
      throw new SaddleError("invalid-argument", `a bandwidth factor must be > 0, got ${bw}`, {
        parameter: "bandwidth",
      });
    }
    return make(scaled(bw), "factor", bw);
  }
  switch (bw) {
    case "scott": {
      const f = scottFactor(neff, d);
      return make(scaled(f), "scott", f);
    }
    case "silverman": {
      if (d === 1) {
        const h = silvermanRuleOfThumb(s.data, uniform ? undefined : w);
        return make(new Float64Array([h * h]), "silverman", h / Math.sqrt(cov[0]));
      }
      const f = silvermanFactor(neff, d);
      return make(scaled(f), "silverman", f);
    }
    case "diffusion": {
      if (d !== 1) {
        throw new SaddleError(
          "invalid-argument",
          `the diffusion selector is for 1-D data; these have d = ${d}: use "scott", "silverman" or "cv"`,
          { parameter: "bandwidth" },
        );
      }
      const r = diffusionBandwidth(s.data, uniform ? undefined : w);
      extra.tStar = r.tStar;
      return make(
        new Float64Array([r.bandwidth ** 2]),
        "diffusion",
        r.bandwidth / Math.sqrt(cov[0]),
      );
    }
    case "cv": {
      const f = cvFactor(s, w, cov, neff, options, extra, notes);
      return make(scaled(f), "cv", f);
    }
    default:
      throw new SaddleError(
        "invalid-argument",
        `unknown bandwidth "${bw}"; use "scott", "silverman", "cv", "diffusion", a factor or a matrix`,
        { parameter: "bandwidth" },
      );
  }
}

function cvFactor(
  s: Samples,
  w: Float64Array,
  cov: Float64Array,
  neff: number,
  options: KdeOptions,
  extra: Record<string, unknown>,
  notes: string[],
): number {
  const d = s.d;
  const u = whiten(s.data, d, cholesky(cov, d, { name: "data covariance" }));
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

function applyWeights(s: Samples, weights?: ArrayLike<number>) {
  if (!weights) return { s, w: new Float64Array(s.n).fill(1 / s.n), uniform: true };
  if (weights.length !== s.n) {
    throw new SaddleError(
      "dimension-mismatch",
      `${weights.length} weights for ${s.n} points; give one weight per point`,
      { parameter: "weights" },
    );
  }
  let total = 0, kept = 0;
  for (let i = 0; i < s.n; i++) {
    const v = weights[i];
    if (!(v >= 0) || v === Infinity) {
      throw new SaddleError(
        "invalid-argument",
        `weight ${i} is ${v}; weights must be finite and >= 0`,
        {
          parameter: "weights",
          row: i,
        },
      );
    }
    total += v;
    if (v > 0) kept++;
  }
  if (!(total > 0)) {
    throw new SaddleError("invalid-argument", "all weights are 0", { parameter: "weights" });
  }
  const d = s.d;
  const data = new Float64Array(kept * d);
  const w = new Float64Array(kept);
  let k = 0;
  for (let i = 0; i < s.n; i++) {
    if (weights[i] > 0) {
      for (let c = 0; c < d; c++) data[k * d + c] = s.data[i * d + c];
      w[k++] = weights[i] / total;
    }
  }
  const pts: Samples = s.columns ? { n: kept, d, data, columns: s.columns } : { n: kept, d, data };
  return { s: pts, w, uniform: false };
}

function dataCovariance(s: Samples, w?: Float64Array): Float64Array {
  const d = s.d;
  const cov = covariance(s.data, s.n, d, w ? { weights: w } : {});
  for (let c = 0; c < d; c++) {
    if (!(cov[c * d + c] > 0)) {
      throw new SaddleError(
        "singular",
        `column ${c} has zero variance: a bandwidth scaled from the data covariance would be ` +
          "singular; drop the constant column, or pass an explicit bandwidth matrix",
        { column: s.columns?.[c] ?? c, parameter: "samples" },
      );
    }
  }
  return cov;
}
