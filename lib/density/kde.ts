/**
 * Gaussian kernel density estimates in any dimension, with a full bandwidth matrix (data
 * covariance x factor², as is standard), bandwidth rules, weighted samples and exact
 * tail-safe log-densities. The evaluators are in `_kde_eval.ts`, the evaluation in Web
 * Workers in `_kde_parallel.ts`, the cross-validation search in `_kde_cv.ts`, the types in
 * `kde_types.ts`.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { cholesky, logDetCholesky, trsm } from "../linalg/cholesky.ts";
import { covariance } from "../linalg/moments.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import { fromBuffer, type Samples, samples, type SamplesInput } from "../samples/samples.ts";
import { JUPYTER_DISPLAY, type MimeBundle } from "../display/display.ts";
import {
  checkQuery,
  checkSampleSize,
  densityBundle,
  description,
  LOG_2PI,
  matrixRows,
  toMatrix,
} from "./_common.ts";
import { cvFactor } from "./_kde_cv.ts";
import {
  defaultMethod,
  type KernelSumEvaluator,
  makeEvaluator,
  methodForJob,
} from "./_kde_eval.ts";
import {
  evaluateInWorkers,
  evaluateShared,
  type KernelCentres,
  workerCount,
} from "./_kde_parallel.ts";
import {
  diffusionBandwidth,
  effectiveSampleSize,
  scottFactor,
  silvermanFactor,
  silvermanRuleOfThumb,
} from "./bandwidth.ts";
import type { EvalMethod, KdeDensity, KdeOptions, ParallelOptions } from "./kde_types.ts";
import type { DensityDescription } from "./types.ts";

export type {
  Bandwidth,
  BandwidthRule,
  EvalMethod,
  KdeDensity,
  KdeOptions,
  ParallelOptions,
} from "./kde_types.ts";

/** What the `Kde` constructor takes: the fitted centres, their weights and the bandwidth. */
interface KdeParts {
  /** Kernel centres (points with positive weight). */
  readonly points: Samples;
  /** Normalised weights of the centres. */
  readonly weights: Float64Array;
  /** True when every weight is 1/n (no weights given). */
  readonly uniform: boolean;
  /** Kernel covariance H, row-major d x d. */
  readonly bandwidth: Float64Array;
  /** How H was chosen. */
  readonly rule: string;
  /** The factor with H = data covariance x factor², when H was built that way. */
  readonly factor?: number;
  /** The evaluator. */
  readonly method: EvalMethod;
  /** Extra description parameters (the CV scan, the diffusion time...). */
  readonly extra: Record<string, unknown>;
  /** Notes of the description. */
  readonly notes: string[];
  /** Smallest job `logPdf` splits across workers. */
  readonly syncMinPairs: number;
}

/** Every row `x` of `s` as `L⁻¹ x`: one triangular solve over the block (lib/linalg). */
function whiten(s: Samples, L: Float64Array): Float64Array {
  return trsm(L, s.data, { m: s.n, n: s.d, side: "right", transpose: true });
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
  readonly #centres: KernelCentres;
  readonly #logNorm: number;
  readonly #extra: Record<string, unknown>;
  readonly #notes: string[];
  readonly #syncMinPairs: number;
  readonly #evaluators = new Map<EvalMethod, KernelSumEvaluator>();

  constructor(o: KdeParts) {
    const points = o.points, d = points.d;
    this.d = d;
    this.points = points;
    this.weights = o.weights;
    this.bandwidth = o.bandwidth;
    if (o.factor !== undefined) this.factor = o.factor;
    this.rule = o.rule;
    this.neff = effectiveSampleSize(points.n, o.uniform ? undefined : o.weights);
    this.method = o.method;
    this.#L = cholesky(o.bandwidth, d, { name: "bandwidth" });
    this.#centres = {
      z: whiten(points, this.#L),
      d,
      lw: o.uniform ? null : o.weights.map(Math.log),
      method: o.method,
    };
    this.#logNorm = -0.5 * (d * LOG_2PI + logDetCholesky(this.#L, d));
    this.#extra = o.extra;
    this.#notes = o.notes;
    this.#syncMinPairs = o.syncMinPairs;
  }

  logPdf(x: Samples): Float64Array {
    checkQuery(x, this.d, "kde");
    const q = whiten(x, this.#L);
    const c = this.#job(x.n);
    const threads = workerCount(c, x.n, this.#syncMinPairs);
    const out = threads > 1
      ? evaluateShared(c, this.#here(c.method), q, x.n, threads)
      : this.#evaluateHere(q, x.n, c.method);
    for (let i = 0; i < x.n; i++) out[i] += this.#logNorm;
    return out;
  }

  /** The centres with the evaluator a job of `m` queries uses (the transform for large ones). */
  #job(m: number): KernelCentres {
    const c = this.#centres;
    const method = methodForJob(c.method, c.z.length / c.d, m);
    return method === c.method ? c : { ...c, method };
  }

  #here(method: EvalMethod): KernelSumEvaluator {
    let e = this.#evaluators.get(method);
    if (!e) {
      const c = this.#centres;
      e = makeEvaluator(c.z, c.d, c.lw, method);
      this.#evaluators.set(method, e);
    }
    return e;
  }

  #evaluateHere(q: Float64Array, m: number, method: EvalMethod): Float64Array {
    const out = new Float64Array(m);
    this.#here(method).evaluate(q, out, 0, m);
    return out;
  }

  async logPdfParallel(x: Samples, options: ParallelOptions = {}): Promise<Float64Array> {
    checkQuery(x, this.d, "kde");
    const c = this.#job(x.n);
    const workers = workerCount(c, x.n, options.minPairs ?? 4e6, options.workers);
    const q = whiten(x, this.#L);
    let out: Float64Array;
    if (workers < 2) out = this.#evaluateHere(q, x.n, c.method);
    else {
      try {
        out = await evaluateInWorkers(c, q, x.n, workers);
      } catch {
        // Workers unavailable (permissions) or failed: evaluate here instead.
        return this.logPdf(x);
      }
    }
    for (let i = 0; i < x.n; i++) out[i] += this.#logNorm;
    return out;
  }

  sample(n: number, seed: RandomSource): Samples {
    checkSampleSize(n);
    const rng = toRng(seed);
    const d = this.d, L = this.#L, src = this.points.data;
    const pick = this.#centres.lw ? rng.categoricalSampler(this.weights) : null;
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

/**
 * Fit a Gaussian kernel density estimate. The kernel covariance H is the (weighted) data
 * covariance times factor² for the rules and for a numeric factor (Scott: `neff^(-1/(d+4))`,
 * as scipy's `gaussian_kde`); `"silverman"` is the 1-D rule of thumb with the IQR guard in
 * 1-D and the multivariate factor otherwise; `"cv"` maximises the leave-one-out likelihood
 * over a factor grid; `"diffusion"` is the Botev et al. selector (1-D only). A matrix gives
 * H directly.
 *
 * `logPdf` is exact up to terms below 1e-16 of the largest kernel term and computed relative
 * to that term, so queries far from every point still get a finite log-density. In 2-D,
 * jobs of at least 5e7 centre-query pairs use the fast Gauss transform (Greengard & Strain
 * 1991) with a guaranteed relative error of at most 1e-10 on the density; a query where
 * that bound is not met (far tails, empty regions) is summed exactly. `method: "tree"`
 * keeps every job exact. A column
 * with zero variance throws (drop it, or pass an explicit bandwidth matrix).
 *
 * References: Scott 1992; Silverman 1986; Botev, Grotowski & Kroese 2010 (Ann. Stat.);
 * Greengard & Strain 1991, The fast Gauss transform (SIAM J. Sci. Stat. Comput.).
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
  if (method === "fgt" && d !== 2) {
    throw new SaddleError(
      "invalid-argument",
      `method "fgt" (the fast Gauss transform) is for 2-D data, got d = ${d}; leave method unset`,
      { parameter: "method" },
    );
  }
  const notes: string[] = [];
  const extra: Record<string, unknown> = {};
  const syncMinPairs = options.parallelMinPairs ?? 5e7;
  const make = (bandwidth: Float64Array, rule: string, factor?: number) =>
    new Kde({
      points: s,
      weights: w,
      uniform,
      bandwidth,
      rule,
      ...(factor !== undefined ? { factor } : {}),
      method,
      extra,
      notes,
      syncMinPairs,
    });
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
      const f = cvFactor({ s, w, cov, neff, options, extra, notes });
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
