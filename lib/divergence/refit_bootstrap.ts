/**
 * The refit bootstrap shared by the sample-based divergences and the decomposition at the
 * optimum: resample each side with replacement on its own, refit both densities, recompute
 * the quantity, and turn the replicates into percentile intervals (Efron 1979; Efron &
 * Tibshirani 1993, ch. 6, 10 and 13).
 *
 * @module
 */
import { fitKde } from "../density/kde.ts";
import type { Density } from "../density/types.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import type { BootstrapEstimate } from "../estimate/bootstrap.ts";
import { bootstrapInterval, type BootstrapIntervalMethod } from "../estimate/bootstrap_interval.ts";
import { withHidden } from "../estimate/hidden.ts";
import {
  type Estimate,
  type EstimateUnit,
  makeEstimate,
  meanVariance,
} from "../estimate/estimate.ts";
import { type RandomSource, type Rng, toRng } from "../random/rng.ts";
import { type Samples, samples, type SamplesInput } from "../samples/samples.ts";
import { takeRows } from "../samples/transform.ts";
import { fromBuffer } from "../samples/samples.ts";
import { jackknifeAcceleration } from "../estimate/bootstrap_interval.ts";
import { logBase, scaleEstimate, unitOf } from "../estimate/units.ts";
import {
  countsOf,
  type PairData,
  pairDensities,
  type PairPlan,
  pairSums,
  planPair,
  scottBandwidth,
} from "./_binned_pair.ts";
import {
  type BinnedJob,
  binnedWeights,
  type DiscriminatorTerms,
  type QuantityWire,
  refitQuantities,
  valueOfD,
  valuesFromSums,
} from "./_refit_core.ts";
import { type OutputScale, outputsToLogits } from "../discriminator/output_scale.ts";
import { logSigmoid } from "../math/log_space.ts";
import { runBinned } from "./_refit_parallel.ts";
import { LOGARITHMIC_DIVERGENCES } from "./f_divergence_table.ts";
import {
  DECOMPOSITION_TERMS,
  type RefitQuantity,
  type ResolvedQuantity,
  resolveQuantities,
} from "./refit_quantities.ts";
import type { IntegrationOptions } from "./integration_options.ts";

/** Options of the refit bootstrap shared by the sample-based estimators. */
export interface RefitOptions {
  /**
   * Fitter from samples to a density, called on each side and on every resample
   * (default: a Gaussian KDE with Scott's rule, `fitKde(s, { bandwidth: "scott" })`).
   */
  fit?: (s: Samples) => Density;
  /** Refit bootstrap replicates (default 200). */
  replicates?: number;
  /**
   * Seed of the resampling and of each replicate's integration draws; the plug-in uses it
   * for its own integration draws (default 0). The same seed gives the same bits.
   */
  seed?: RandomSource;
  /** Confidence level of the percentile intervals (default 0.95). */
  level?: number;
}

/** Method name of every estimate made here. */
export const REFIT_METHOD = "bootstrap-percentile (refit)";

/** Default number of refit replicates. */
export const DEFAULT_REFIT_REPLICATES = 200;

/**
 * Integration defaults of the refit estimators: coarse grid cells per dimension in 1-D and
 * 2-D, Monte Carlo draws a density for d > 2. Measured on the 2-D demo data (2 x 2000
 * points, KDE, Scott): a 48 x 48 grid replicate of the decomposition takes about 0.1 s with
 * a quadrature error bar of JSD near 5e-4, against a bootstrap se near 5e-3; Monte Carlo
 * with 2000 draws took longer (0.13 s) with an se near 5e-3, i.e. no better than the
 * sampling error. A 1-D grid of 500 cells costs a few ms. The notes of every estimate give
 * the numerical share of its variance.
 */
export const REFIT_GRID_1D = 500, REFIT_GRID_2D = 48, REFIT_MC_DRAWS = 2000;

/** The fitter used when none is given: a Gaussian KDE with Scott's rule (Scott 1992). */
export function defaultFit(s: Samples): Density {
  return fitKde(s, { bandwidth: "scott" });
}

/** Validated inputs of a refit bootstrap. */
export interface RefitSetup {
  readonly real: Samples;
  readonly fake: Samples;
  readonly fit: (s: Samples) => Density;
  readonly fitName: string;
  readonly replicates: number;
  readonly seed: RandomSource;
  readonly level: number;
}

function toSamples(x: Samples | SamplesInput, name: "real" | "fake"): Samples {
  if (x === null || typeof x !== "object") {
    throw new SaddleError("invalid-argument", `${name} must be samples (rows of numbers)`, {
      parameter: name,
    });
  }
  const s = samples(x, { source: name });
  if (s.n < 2) {
    throw new SaddleError(
      "too-few-samples",
      `${name} has ${s.n} point; the refit bootstrap needs at least 2 points a side`,
      { parameter: name },
    );
  }
  return s;
}

/** Check samples and options before any work, so that a bad call fails at once. */
export function prepareRefit(
  real: Samples | SamplesInput,
  fake: Samples | SamplesInput,
  options: RefitOptions,
): RefitSetup {
  const r = toSamples(real, "real"), f = toSamples(fake, "fake");
  if (r.d !== f.d) {
    throw new SaddleError(
      "dimension-mismatch",
      `real has d = ${r.d} but fake has d = ${f.d}; both sample sets must live in the same space`,
      { parameter: "fake" },
    );
  }
  const B = options.replicates ?? DEFAULT_REFIT_REPLICATES;
  if (!Number.isInteger(B) || B < 2) {
    throw new SaddleError("invalid-argument", `replicates must be an integer >= 2, got ${B}`, {
      parameter: "replicates",
    });
  }
  const level = options.level ?? 0.95;
  if (!(level > 0 && level < 1)) {
    throw new SaddleError("invalid-argument", `level must be in (0, 1), got ${level}`, {
      parameter: "level",
    });
  }
  const fit = options.fit ?? defaultFit;
  if (typeof fit !== "function") {
    throw new SaddleError("invalid-argument", "fit must be a function from Samples to a Density", {
      parameter: "fit",
    });
  }
  const seed = options.seed ?? 0;
  toRng(seed); // checks the seed now rather than after the plug-in fit
  const fitName = options.fit ? (fit.name || "user fitter") : "KDE, Scott's rule";
  return { real: r, fake: f, fit, fitName, replicates: B, seed, level };
}

/** Integration options with the refit defaults filled in (method, grid size, draws). */
export function refitIntegration<T extends IntegrationOptions>(d: number, options: T): T {
  const method = options.method ?? (d <= 2 ? "grid" : "monte-carlo");
  const out: T = { ...options, method };
  if (method === "grid" && options.gridSize === undefined) {
    out.gridSize = d === 1 ? REFIT_GRID_1D : REFIT_GRID_2D;
  }
  if (method === "monte-carlo" && options.n === undefined) out.n = REFIT_MC_DRAWS;
  return out;
}

/**
 * Whether the options fix the integration (grid size or draws), so that the plug-in and
 * the replicates integrate alike.
 */
export function sameIntegration(o: { gridSize?: number; n?: number }): boolean {
  return o.gridSize !== undefined || o.n !== undefined;
}

/** "grid quadrature, 500 coarse cells per dimension" or "Monte Carlo, 2000 draws a density". */
export function integrationText(o: { method?: string; gridSize?: number; n?: number }): string {
  return o.method === "grid"
    ? `grid quadrature, ${o.gridSize ?? "default"} coarse cells per dimension`
    : `Monte Carlo, ${o.n ?? "default"} draws a density`;
}

/** Fit both sides, checking that the fitter returns densities of the right dimension. */
export function fitBoth(setup: RefitSetup, real: Samples, fake: Samples): [Density, Density] {
  const p = fitSide(setup, real, "real"), q = fitSide(setup, fake, "fake");
  for (const [dens, name] of [[p, "real"], [q, "fake"]] as const) {
    if (
      dens === null || typeof dens !== "object" || typeof dens.logPdf !== "function" ||
      dens.d !== real.d
    ) {
      throw new SaddleError(
        "invalid-argument",
        `fit returned ${
          dens && typeof dens === "object" ? `a density of d = ${dens.d}` : String(dens)
        } for the ${name} samples of d = ${real.d}; it must return a Density of the same dimension`,
        { parameter: "fit" },
      );
    }
  }
  return [p, q];
}

/**
 * `setup.fit(x)`, with a SaddleError from the fitter re-raised as one that names the side
 * (parameter "real" or "fake"), keeps the fitter's row, column and code, and carries the
 * fitter's error as its `cause`.
 */
function fitSide(setup: RefitSetup, x: Samples, side: "real" | "fake"): Density {
  try {
    return setup.fit(x);
  } catch (e) {
    if (!(e instanceof SaddleError)) throw e;
    // The new error formats its own location (with the side as the parameter) before the
    // fitter's detail; the fitter's error stays reachable as the cause.
    const { parameter: _parameter, ...rest } = e.location;
    throw new SaddleError(
      e.code,
      `fitting the ${side} samples: ${e.detail}`,
      { ...rest, parameter: side },
      { cause: e },
    );
  }
}

/** The replicate values of each term, in draw order (NaN where a replicate failed). */
export interface RefitReplicates {
  /** One column per term, each of length `replicates`. */
  readonly columns: readonly Float64Array[];
  /** Replicates whose fit or recomputation threw a SaddleError. */
  readonly failed: number;
  /** The first few distinct failure messages. */
  readonly failures: readonly string[];
}

/**
 * Run the replicates: for replicate b, an Rng forked from the seed with label `refit/b`
 * draws the real indices (fork "real"), the fake indices (fork "fake") and is handed to
 * `compute` for its integration draws (fork "integrate"); each replicate therefore depends
 * on the seed and b only. `compute` returns one number per term. A SaddleError from the
 * fitter or from `compute` marks the replicate as failed; any other error is a bug and is
 * rethrown.
 */
export function runReplicates(
  setup: RefitSetup,
  terms: number,
  compute: (
    p: Density,
    q: Density,
    seed: Rng,
    indices: { real: Uint32Array; fake: Uint32Array },
  ) => ArrayLike<number>,
  onDone?: () => void,
): RefitReplicates {
  const { real, fake, replicates: B } = setup;
  const base = toRng(setup.seed);
  const columns = Array.from({ length: terms }, () => new Float64Array(B).fill(NaN));
  const iReal = new Uint32Array(real.n), iFake = new Uint32Array(fake.n);
  const failures: string[] = [];
  let failed = 0;
  for (let b = 0; b < B; b++) {
    const rb = base.fork(`refit/${b}`);
    rb.fork("real").bootstrapIndices(real.n, real.n, iReal);
    rb.fork("fake").bootstrapIndices(fake.n, fake.n, iFake);
    try {
      const [p, q] = fitBoth(setup, takeRows(real, iReal), takeRows(fake, iFake));
      const v = compute(p, q, rb.fork("integrate"), { real: iReal, fake: iFake });
      // A NaN is a failure of the recomputation, not a value: counted with the failures.
      const bad = Array.from({ length: terms }, (_, t) => v[t]).findIndex(Number.isNaN);
      if (bad >= 0) {
        throw new SaddleError("non-finite", `replicate ${b} gave NaN for term ${bad}`, {
          parameter: "fit",
        });
      }
      for (let t = 0; t < terms; t++) columns[t][b] = v[t];
    } catch (err) {
      if (!(err instanceof SaddleError)) throw err;
      failed++;
      if (failures.length < 3 && !failures.includes(err.message)) failures.push(err.message);
    }
    onDone?.();
  }
  return { columns, failed, failures };
}

/** The finite values of a column, in draw order. */
function finiteOf(column: Float64Array): Float64Array {
  let k = 0;
  for (let i = 0; i < column.length; i++) if (Number.isFinite(column[i])) k++;
  const out = new Float64Array(k);
  k = 0;
  for (let i = 0; i < column.length; i++) if (Number.isFinite(column[i])) out[k++] = column[i];
  return out;
}

function fmt(x: number): string {
  return Number.isFinite(x) ? Number(x.toPrecision(3)).toString() : String(x);
}

/** Fields of {@linkcode refitEstimate}. */
export interface RefitEstimateFields {
  /** What the term is, for the notes ("JSD", "KL(P || Q)"...). */
  readonly what: string;
  /** The plug-in estimate between the two fits (value and its numerical error bar). */
  readonly plugIn: Estimate;
  /**
   * Numerical se of one replicate: the same quantity at the replicates' integration (a
   * coarser grid, or fewer draws), for the share of the bootstrap variance that is
   * numerical (default: the plug-in's own se).
   */
  readonly replicateError?: Estimate;
  /** Unit of the term. */
  readonly unit?: EstimateUnit;
  /** Whether to report the bootstrap bias estimate (divergences, not exact constants). */
  readonly bias?: boolean;
  /** Replicates that failed (their NaN is not reported again as a non-finite value). */
  readonly failed: number;
  /** Notes placed before the estimate's own. */
  readonly notes?: readonly string[];
  /** Append the plug-in's notes, prefixed "plug-in: ". */
  readonly plugInNotes?: boolean;
  /** Interval method (default "percentile"). */
  readonly interval?: BootstrapIntervalMethod;
  /** BCa acceleration (interval "bca"). */
  readonly acceleration?: number;
}

/**
 * A refit-bootstrap estimate: plug-in value, bootstrap se, and an interval of the chosen
 * method from the replicates. The notes give the bootstrap bias estimate (mean of the
 * replicates - plug-in) with its direction as measured.
 */
export function refitEstimate(
  setup: RefitSetup,
  column: Float64Array,
  fields: RefitEstimateFields,
): BootstrapEstimate {
  const reps = finiteOf(column);
  const kept = reps.length, B = column.length;
  const value = fields.plugIn.value;
  const notes: string[] = [...(fields.notes ?? [])];
  let se = NaN, ci: [number, number] = [NaN, NaN];
  if (kept >= 2) {
    const { mean, variance } = meanVariance(reps);
    se = Math.sqrt(variance);
    const method = fields.interval ?? "percentile";
    ci = bootstrapInterval(reps, {
      value,
      level: setup.level,
      method,
      ...(fields.acceleration !== undefined ? { acceleration: fields.acceleration } : {}),
    });
    if (method === "percentile" && (value < ci[0] || value > ci[1])) {
      notes.push(
        "the plug-in value lies outside its own percentile interval: the replicates are " +
          "shifted by the bias of the fits, so read the interval as the spread of the " +
          "estimate rather than as a range for the true value",
      );
    }
    const rep = fields.replicateError ?? fields.plugIn;
    const num = rep.se;
    if (num !== undefined && Number.isFinite(num) && se > 0) {
      const share = Math.min(1, (num * num) / (se * se));
      notes.push(
        `numerical error of a replicate (${rep.method}, se ${fmt(num)}) is ` +
          `${share < 1e-3 ? "< 0.1" : fmt(100 * share)}% of the bootstrap variance (se ${
            fmt(se)
          }); the rest is the ` +
          "sampling error of the data" +
          (share > 0.25 ? ": raise gridSize or n to narrow the interval" : ""),
      );
    }
    if (fields.bias && Number.isFinite(value)) {
      const bias = mean - value;
      const sig = Math.abs(bias) > 2 * se / Math.sqrt(kept);
      notes.push(
        `bootstrap bias estimate (mean of replicates - plug-in) ${bias >= 0 ? "+" : ""}` +
          `${fmt(bias)}: ${
            !sig
              ? "no bias distinguishable from the replicates' noise"
              : bias > 0
              ? "the plug-in is biased upward here"
              : "the plug-in is biased downward here"
          }; ${
            fields.interval === "basic" || fields.interval === "bc" || fields.interval === "bca"
              ? `the ${fields.interval} interval corrects for it`
              : "the percentile interval does not correct for it"
          }`,
      );
    }
  } else {
    notes.push(`only ${kept} finite replicate(s): no standard error or interval`);
  }
  const infinite = B - kept - fields.failed;
  if (infinite > 0) {
    notes.push(`${infinite} of ${B} replicates gave an infinite or NaN value and were left out`);
  }
  if (fields.plugInNotes) {
    for (const n of fields.plugIn.notes) if (!notes.includes(n)) notes.push(`plug-in: ${n}`);
  }
  const est = makeEstimate({
    value,
    se,
    ci,
    level: setup.level,
    method: fields.interval && fields.interval !== "percentile"
      ? `bootstrap-${fields.interval} (refit)`
      : REFIT_METHOD,
    n: setup.real.n + setup.fake.n,
    notes,
    ...(fields.unit ? { unit: fields.unit } : {}),
  });
  return withHidden(est, { replicates: reps }) as BootstrapEstimate;
}

/** The notes every refit result carries: what was done, failures, and the bias caveat. */
export function refitNotes(
  setup: RefitSetup,
  run: RefitReplicates,
  what: string,
  integration: string,
): string[] {
  const B = setup.replicates;
  const notes = [
    `${B} refit bootstrap replicates (seed ${toRng(setup.seed).seed}): each sample set ` +
    `resampled with replacement on its own (${setup.real.n} real, ${setup.fake.n} fake ` +
    `points), refitted (${setup.fitName}) and ${what} recomputed (${integration}, fresh ` +
    "draws per replicate); the interval includes the sampling error of the data and the " +
    "numerical error",
  ];
  if (run.failed > 0) {
    notes.push(
      `${run.failed} of ${B} replicates failed and were left out` +
        (run.failed > 0.1 * B ? " (more than 10%: the interval may be too narrow)" : "") +
        `; first error: ${run.failures.join(" | ")}`,
    );
  }
  notes.push(
    "plug-in divergences between fitted densities are biased: sampling noise pushes them " +
      "up, smoothing pulls them down; each estimate's notes give the direction and size the " +
      "bootstrap measured here",
  );
  notes.push(
    "the fitter's own systematic error (bandwidth, number of components) is not in the " +
      "interval except as far as it varies between resamples",
  );
  return notes;
}

/** Options of {@linkcode refitBootstrap}. */
export interface RefitBootstrapOptions extends IntegrationOptions, RefitOptions {
  /**
   * What to compute from every pair of fits: decomposition terms ("value", "jsd",
   * "klRealMix", "klFakeMix", "residual") and f-divergences by name or row (default: the
   * decomposition terms).
   */
  quantities?: readonly RefitQuantity[];
  /** α of the "alpha" divergence. */
  alpha?: number;
  /** Log base of the logarithmic quantities: 2 gives bits (default e, nats). */
  base?: number;
  /** Interval from the replicates (default {@linkcode DEFAULT_REFIT_INTERVAL}, "percentile"). */
  interval?: BootstrapIntervalMethod;
  /** Called after each replicate with (replicates done, replicates in all). */
  onProgress?: (done: number, total: number) => void;
  /**
   * A trained discriminator's outputs on the real and fake samples (row for row), for the
   * quantity "gap": `V(D*, G)` of the fits minus `V(D, G)` of the outputs, both on the
   * same resample in every replicate.
   */
  discriminator?: { dReal: ArrayLike<number>; dFake: ArrayLike<number>; scale: OutputScale };
  /**
   * Web Workers for the binned route's replicates (default: as many as the machine has
   * cores, at most 4, when the job is worth it; 1 keeps everything on this thread). The
   * numbers are identical whatever the count.
   */
  workers?: number;
}

/**
 * Interval method of the refit estimates when none is given, chosen by the seeded coverage
 * study (bench/coverage_study.ts, table in the README): the percentile interval covered
 * best with the default KDE (whose smoothing bias, downward, partly offsets the upward
 * shift of the replicates) and with a parametric Gaussian fit of KL at n = 100 (95 of 100
 * trials, against 87 for "basic"); with Gaussian-mixture fits of the JSD, "basic" (which
 * subtracts the bootstrap's bias estimate) covered as well or better, so pass
 * `interval: "basic"` there.
 */
export const DEFAULT_REFIT_INTERVAL: BootstrapIntervalMethod = "percentile";

/**
 * Everything one shared refit bootstrap computed: for each requested quantity (by key: the
 * term name, or the divergence's `name`), the plug-in between the fits of the data with
 * its numerical error, and the refit-bootstrap estimate.
 */
export interface RefitBootstrap {
  /** Keys of the quantities, in the order requested. */
  readonly keys: readonly string[];
  /** Per key: plug-in value, bootstrap se, interval; replicates hidden (`.replicates`). */
  readonly estimates: Readonly<Record<string, BootstrapEstimate>>;
  /** Per key: the plug-in between the fits of the data, with its numerical error only. */
  readonly plugIn: Readonly<Record<string, Estimate>>;
  /** Per key: every replicate in draw order, NaN where a replicate failed. */
  readonly columns: Readonly<Record<string, Float64Array>>;
  /**
   * "binned": KDEs with Scott's rule evaluated by binning and FFT, a replicate being a
   * reweighted binning; "refit": each resample refitted with `fit` and integrated.
   * Quantities with unbounded integrands (KL, χ²...) always take the refit route.
   */
  readonly route: Readonly<Record<string, "binned" | "refit">>;
  /** Integration method: "grid" or "monte-carlo". */
  readonly method: "grid" | "monte-carlo";
  /** Replicates that failed (a SaddleError from a fit or an integration). */
  readonly failed: number;
  /** The fitter's name. */
  readonly fitName: string;
  /** What was done. */
  readonly notes: readonly string[];
}

/**
 * One refit bootstrap shared by every quantity: each replicate resamples both sample sets
 * once (with replacement, each on its own), refits both sides once and computes every
 * requested quantity from those fits; the plug-in is the same computation on the data.
 * `decompositionFromSamples` and `divergenceFromSamples` are views of this function (the
 * same seed gives the same numbers).
 *
 * Routes. With the default fit (Gaussian KDE, Scott's rule), d <= 2 and the grid method,
 * the quantities with bounded integrands (the decomposition terms, JS, total variation,
 * squared Hellinger, the GAN divergence) take the binned route: both KDEs are evaluated on
 * grids that follow the data (range: the data ± 6.5 kernel sd; spacing: a third of the
 * smaller kernel sd, refined to fill the FFT; one grid per side when the sides lie apart)
 * by linear binning and one FFT, and a replicate is the same binning with the bootstrap
 * counts as weights (the counts also give the resample's covariance, hence its Scott
 * bandwidth: no point-level refit). The plug-in's numerical error adds the quadrature
 * refinement |all nodes - every other node|, the binning error (|binned without - with the
 * binning-variance correction|, a bound on the corrected scheme's error, which is of
 * higher order) and the tail beyond the grid; the notes give the densities' largest
 * relative error against the exact evaluator at check nodes. Everything else takes the
 * refit route: `fit` on each resample, then grid quadrature or Monte Carlo.
 *
 * Replicate b depends only on the seed and b (forks `refit/b/real`, `refit/b/fake`,
 * `refit/b/integrate`), so the numbers are bit-identical whatever the number of workers.
 * Intervals: "percentile", "basic" (reflected: subtracts the bootstrap bias), "bc" or "bca"
 * (Efron 1987; the acceleration from a grouped jackknife of 10 groups a side).
 *
 * References: Efron 1979 (Ann. Stat.); Efron 1987, Better bootstrap confidence intervals
 * (JASA); Efron & Tibshirani 1993, An Introduction to the Bootstrap (ch. 6, 10, 13, 14);
 * Wand & Jones 1995, Kernel Smoothing, app. D (binned KDE); Goodfellow et al. 2014 (Thm. 1).
 *
 * @example JSD and total variation between two Gaussian samples from one bootstrap
 * ```ts
 * import { refitBootstrap } from "./refit_bootstrap.ts";
 * import { gaussian } from "../density/gaussian.ts";
 * import assert from "node:assert/strict";
 * const real = gaussian(0, 1).sample(300, 1), fake = gaussian(1, 1).sample(300, 2);
 * const r = refitBootstrap(real, fake, {
 *   quantities: ["jsd", "total-variation"],
 *   replicates: 20,
 *   seed: 3,
 * });
 * assert.equal(r.route.jsd, "binned");
 * assert.equal(r.estimates.jsd.replicates.length, 20);
 * // JSD of N(0,1) and N(1,1) is about 0.117 nats; TV about 0.383.
 * assert.ok(Math.abs(r.estimates.jsd.value - 0.117) < 0.05);
 * assert.ok(Math.abs(r.estimates["total-variation"].value - 0.383) < 0.1);
 * ```
 */
export function refitBootstrap(
  real: Samples | SamplesInput,
  fake: Samples | SamplesInput,
  options: RefitBootstrapOptions = {},
): RefitBootstrap {
  const setup = prepareRefit(real, fake, options);
  const quantities = resolveQuantities(
    options.quantities ?? DECOMPOSITION_TERMS,
    options.alpha !== undefined ? { alpha: options.alpha } : {},
  );
  const interval = options.interval ?? DEFAULT_REFIT_INTERVAL;
  bootstrapInterval([0, 1], { value: 0, method: interval }); // validates the name now
  const c = logBase(options.base);
  const unit = unitOf(options.base);
  const logarithmic = (q: ResolvedQuantity) => !q.spec || LOGARITHMIC_DIVERGENCES.has(q.key);
  if (options.base !== undefined) {
    const bad = quantities.find((q) => !logarithmic(q));
    if (bad) {
      throw new SaddleError(
        "invalid-argument",
        `base applies to the logarithmic divergences only, not to "${bad.key}"`,
        { parameter: "base" },
      );
    }
  }
  const {
    fit: _f,
    replicates: _r,
    quantities: _q,
    interval: _i,
    onProgress,
    workers,
    base: _base,
    discriminator: _disc,
    ...rest
  } = options;
  const disc = discriminatorTerms(options, setup, quantities);
  const vD0 = disc ? valueOfD(disc, null, null) : NaN;
  const d = setup.real.d;
  const integ = refitIntegration(d, { ...rest, seed: setup.seed, level: setup.level }) as
    & IntegrationOptions
    & { method: "grid" | "monte-carlo" };
  const B = setup.replicates;
  const notes: string[] = [];
  // The binned route: default fit, d <= 2, grid, no user bounds, bounded integrands.
  let pair: { data: PairData; plan: PairPlan; hR: Float64Array; hF: Float64Array } | undefined;
  if (
    !options.fit && d <= 2 && integ.method === "grid" && !options.bounds &&
    options.gridSize === undefined
  ) {
    const data: PairData = {
      d,
      real: setup.real.data,
      fake: setup.fake.data,
      nReal: setup.real.n,
      nFake: setup.fake.n,
    };
    const bandwidth = (side: "real" | "fake") => {
      try {
        return side === "real"
          ? scottBandwidth(data.real, data.nReal, d, null)
          : scottBandwidth(data.fake, data.nFake, d, null);
      } catch (e) {
        if (!(e instanceof SaddleError)) throw e;
        const { parameter: _p, ...where } = e.location;
        throw new SaddleError(e.code, `fitting the ${side} samples: ${e.detail}`, {
          ...where,
          parameter: side,
        }, { cause: e });
      }
    };
    const hR = bandwidth("real"), hF = bandwidth("fake");
    const plan = planPair(data, hR, hF);
    if (plan) pair = { data, plan, hR, hF };
    else notes.push("the binned grid would be coarser than the kernels: every quantity refitted");
  }
  // The gap follows the value: binned whenever the value is.
  const binnedQ = pair ? quantities.filter((q) => q.bounded) : [];
  const refitQ = quantities.filter((q) => !binnedQ.includes(q));
  const wire: QuantityWire[] = binnedQ.map((q) =>
    q.spec
      ? {
        key: q.key,
        name: q.spec.name.startsWith("alpha") ? "alpha" : q.spec.name,
        ...(options.alpha !== undefined ? { alpha: options.alpha } : {}),
      }
      : { key: q.key }
  );
  // Plug-ins.
  const plugIn: Record<string, Estimate> = {};
  const replicateError: Record<string, Estimate> = {};
  if (pair) {
    const bin = binnedPlugIn(pair, wire, setup, integ.level ?? 0.95, vD0);
    binnedQ.forEach((q, i) => (plugIn[q.key] = bin.estimates[i]));
    notes.push(...bin.notes);
  }
  if (refitQ.length > 0) {
    const [p, q] = fitBoth(setup, setup.real, setup.fake);
    // The plug-in at the stand-alone defaults (finer grid, more draws) unless the options
    // fix them; the replicates' coarser integration gives the numerical share of the variance.
    const alone = { ...rest, seed: setup.seed, level: setup.level, method: integ.method };
    const ests = refitQuantities(p, q, refitQ, alone, vD0);
    const coarse = sameIntegration(rest) ? ests : refitQuantities(p, q, refitQ, integ, vD0);
    refitQ.forEach((x, i) => {
      plugIn[x.key] = ests[i];
      replicateError[x.key] = coarse[i];
    });
  }
  // Replicates.
  const columns: Record<string, Float64Array> = {};
  for (const q of quantities) columns[q.key] = new Float64Array(B).fill(NaN);
  const failures = new Set<string>();
  const failedAt = new Uint8Array(B);
  let done = 0;
  const tick = () => onProgress?.(++done, B * (binnedQ.length > 0 && refitQ.length > 0 ? 2 : 1));
  if (pair && binnedQ.length > 0) {
    const job: BinnedJob = {
      data: pair.data,
      plan: pair.plan,
      quantities: wire,
      seed: toRng(setup.seed).seed,
      ...(disc ? { discriminator: disc } : {}),
    };
    const out = runBinned(job, B, workers, tick);
    for (let b = 0; b < B; b++) {
      binnedQ.forEach((q, t) => (columns[q.key][b] = out.values[b * wire.length + t]));
    }
    out.failures.forEach((f) => failures.add(f));
    for (let b = 0; b < B; b++) {
      if (Number.isNaN(out.values[b * wire.length])) failedAt[b] = 1;
    }
  }
  if (refitQ.length > 0) {
    const cR = new Uint32Array(setup.real.n), cF = new Uint32Array(setup.fake.n);
    const run = runReplicates(setup, refitQ.length, (pb, qb, r, idx) => {
      const vD = disc ? valueOfD(disc, countsOf(idx.real, cR), countsOf(idx.fake, cF)) : NaN;
      return refitQuantities(pb, qb, refitQ, { ...integ, seed: r }, vD).map((e) => e.value);
    }, tick);
    refitQ.forEach((q, t) => columns[q.key].set(run.columns[t]));
    run.failures.forEach((f) => failures.add(f));
    for (let b = 0; b < B; b++) if (Number.isNaN(run.columns[0][b])) failedAt[b] = 1;
  }
  const failed = failedAt.reduce((a, b) => a + b, 0);
  // BCa: the acceleration from a grouped jackknife (10 groups a side).
  const accel: Record<string, number> = {};
  if (interval === "bca") {
    const jk = groupedJackknife(setup, pair, wire, binnedQ, refitQ, integ, disc);
    for (const q of quantities) accel[q.key] = jackknifeAcceleration(jk[q.key]);
  }
  const scaleTo = (q: ResolvedQuantity, e: Estimate): Estimate =>
    logarithmic(q) ? scaleEstimate(e, c, unit) : e;
  if (c !== 1) {
    for (const q of quantities) {
      if (logarithmic(q)) columns[q.key] = columns[q.key].map((v) => v / c);
    }
  }
  const runInfo: RefitReplicates = {
    columns: [],
    failed,
    failures: [...failures].slice(0, 3),
  };
  const routes: Record<string, "binned" | "refit"> = {};
  for (const q of quantities) routes[q.key] = binnedQ.includes(q) ? "binned" : "refit";
  const estimates: Record<string, BootstrapEstimate> = {};
  const plugScaled: Record<string, Estimate> = {};
  for (const q of quantities) {
    const pi = scaleTo(q, plugIn[q.key]);
    plugScaled[q.key] = pi;
    estimates[q.key] = refitEstimate(setup, columns[q.key], {
      what: q.label,
      plugIn: pi,
      ...(replicateError[q.key] ? { replicateError: scaleTo(q, replicateError[q.key]) } : {}),
      failed,
      bias: q.key !== "residual",
      interval,
      ...(accel[q.key] !== undefined ? { acceleration: accel[q.key] } : {}),
      ...(pi.unit ? { unit: pi.unit } : {}),
    });
  }
  const how = [
    binnedQ.length > 0
      ? `${
        binnedQ.map((q) => q.key).join(", ")
      }: binned KDEs (Scott's rule; bootstrap counts as weights)`
      : "",
    refitQ.length > 0 ? `${refitQ.map((q) => q.key).join(", ")}: ${integrationText(integ)}` : "",
  ].filter((s) => s).join("; ");
  return Object.freeze({
    keys: quantities.map((q) => q.key),
    estimates: Object.freeze(estimates),
    plugIn: Object.freeze(plugScaled),
    columns: Object.freeze(columns),
    route: Object.freeze(routes),
    method: integ.method,
    failed,
    fitName: setup.fitName,
    notes: [...refitNotes(setup, runInfo, "every quantity", how), ...notes],
  });
}

/** The binned plug-in: values in nats with their numerical error, and notes. */
function binnedPlugIn(
  pair: { data: PairData; plan: PairPlan; hR: Float64Array; hF: Float64Array },
  wire: readonly QuantityWire[],
  setup: RefitSetup,
  level: number,
  vD: number,
): { estimates: Estimate[]; notes: string[] } {
  const { data, plan, hR, hF } = pair;
  const weights = binnedWeights(wire);
  const ones = { real: null, fake: null };
  const dens = pairDensities(data, plan, hR, hF, ones);
  const sums = pairSums(plan, dens, weights, true);
  const raw = pairSums(plan, pairDensities(data, plan, hR, hF, ones, false), weights, false);
  // Per weight: quadrature refinement + binning (uncorrected - corrected) + tail + rounding.
  const err = sums.fine.map((v, w) =>
    Math.abs(v - sums.coarse[w]) + Math.abs(v - raw.fine[w]) + sums.tail[w] +
    1e-12 * Math.abs(v)
  );
  const values = valuesFromSums(wire, sums.fine, vD);
  const errors = valuesFromSums(wire, err, 0);
  const check = exactCheck(data, plan, dens, setup);
  const cells = plan.boxes.reduce((a, g) => a + g.size.reduce((x, y) => x * y, 1), 0);
  const shape = plan.boxes.map((g) => g.size.join(" x ")).join(" and ");
  const notes = [
    ...plan.notes,
    `binned KDEs on ${shape} nodes (spacing ${
      plan.boxes[0].step.map((s) => s.toPrecision(3)).join(", ")
    }); largest relative error of the binned densities against the exact evaluator at ` +
    `${check.checked} check nodes (density >= 1e-3 of its peak): ${check.rel.toExponential(2)}`,
  ];
  const estimates = wire.map((q, i) => {
    const unit = q.name === undefined || LOGARITHMIC_DIVERGENCES.has(q.name) ? "nats" : "none";
    if (q.key === "residual") {
      return makeEstimate({
        value: values[i],
        level,
        method: "identity residual",
        n: cells,
        unit: "nats",
        notes: ["value - (-ln 4 + KL(p_data || m) + KL(p_g || m)); only rounding is expected"],
      });
    }
    return makeEstimate({
      value: values[i],
      se: errors[i],
      ci: [values[i] - errors[i], values[i] + errors[i]],
      level,
      method: "binned grid quadrature",
      n: cells,
      unit,
      notes: [
        "error bar = |all nodes - every other node| + |binned without - with the binning " +
        "correction| + estimated tail beyond the grid",
      ],
    });
  });
  return { estimates, notes };
}

/**
 * Largest relative error of the binned densities of both sides against the exact
 * evaluator, at up to 32 nodes a side where the density is at least 1e-3 of its peak
 * (evenly spread over those nodes of the first grid, plus the peak).
 */
function exactCheck(
  data: PairData,
  plan: PairPlan,
  dens: readonly { p: Float64Array; q: Float64Array }[],
  setup: RefitSetup,
): { checked: number; rel: number } {
  let rel = 0, checked = 0;
  const grid = plan.boxes[0];
  const ny = data.d === 2 ? grid.size[1] : 1;
  for (const side of ["p", "q"] as const) {
    const v = dens[0][side];
    let top = 0, peak = 0;
    for (let i = 0; i < v.length; i++) {
      if (v[i] > top) {
        top = v[i];
        peak = i;
      }
    }
    if (!(top > 0)) continue;
    const bulk: number[] = [];
    for (let i = 0; i < v.length; i++) if (v[i] >= 1e-3 * top) bulk.push(i);
    const nodes = [peak];
    for (let k = 0; k < 31 && bulk.length > 0; k++) {
      nodes.push(bulk[Math.floor((k * bulk.length) / 31)]);
    }
    const q = new Float64Array(nodes.length * data.d);
    nodes.forEach((node, r) => {
      const i = Math.floor(node / ny), j = node % ny;
      q[r * data.d] = grid.lower[0] + i * grid.step[0];
      if (data.d === 2) q[r * 2 + 1] = grid.lower[1] + j * grid.step[1];
    });
    const s = side === "p" ? setup.real : setup.fake;
    const exact = fitKde(s, { bandwidth: "scott" }).logPdf(fromBuffer(q, data.d));
    nodes.forEach((node, r) => {
      const e = Math.exp(exact[r]);
      if (e > 0) rel = Math.max(rel, Math.abs(v[node] - e) / e);
    });
    checked += nodes.length;
  }
  return { checked, rel };
}

/**
 * Jackknife values for the BCa acceleration: each sample set cut into 10 groups (rows
 * i mod 10), each group left out in turn on one side; per key, the values of both sides.
 */
function groupedJackknife(
  setup: RefitSetup,
  pair: { data: PairData; plan: PairPlan } | undefined,
  wire: readonly QuantityWire[],
  binnedQ: readonly ResolvedQuantity[],
  refitQ: readonly ResolvedQuantity[],
  integ: IntegrationOptions & { method: "grid" | "monte-carlo" },
  jkDisc: DiscriminatorTerms | undefined,
): Record<string, Float64Array[]> {
  const G = 10;
  const out: Record<string, Float64Array[]> = {};
  for (const q of [...binnedQ, ...refitQ]) out[q.key] = [new Float64Array(G), new Float64Array(G)];
  for (const [s, side] of [[0, "real"], [1, "fake"]] as const) {
    const n = side === "real" ? setup.real.n : setup.fake.n;
    for (let g = 0; g < G; g++) {
      const keep = new Uint32Array(n);
      for (let i = 0; i < n; i++) keep[i] = i % G === g ? 0 : 1;
      try {
        if (pair && binnedQ.length > 0) {
          const counts = {
            real: side === "real" ? keep : null,
            fake: side === "fake" ? keep : null,
          };
          const hR = scottBandwidth(pair.data.real, pair.data.nReal, pair.data.d, counts.real);
          const hF = scottBandwidth(pair.data.fake, pair.data.nFake, pair.data.d, counts.fake);
          const dens = pairDensities(pair.data, pair.plan, hR, hF, counts);
          const vD = jkDisc ? valueOfD(jkDisc, counts.real, counts.fake) : NaN;
          const v = valuesFromSums(
            wire,
            pairSums(pair.plan, dens, binnedWeights(wire), false).fine,
            vD,
          );
          binnedQ.forEach((q, t) => (out[q.key][s][g] = v[t]));
        }
        if (refitQ.length > 0) {
          const rows = Array.from(keep.keys()).filter((i) => keep[i] === 1);
          const r = side === "real" ? takeRows(setup.real, rows) : setup.real;
          const f = side === "fake" ? takeRows(setup.fake, rows) : setup.fake;
          const [pb, qb] = fitBoth(setup, r, f);
          const vD = jkDisc
            ? valueOfD(
              jkDisc,
              side === "real" ? keep : null,
              side === "fake" ? keep : null,
            )
            : NaN;
          const v = refitQuantities(pb, qb, refitQ, integ, vD);
          refitQ.forEach((q, t) => (out[q.key][s][g] = v[t].value));
        }
      } catch (err) {
        if (!(err instanceof SaddleError)) throw err;
        for (const q of [...binnedQ, ...refitQ]) out[q.key][s][g] = NaN;
      }
    }
  }
  // A failed group is dropped from its side.
  for (const k of Object.keys(out)) out[k] = out[k].map((a) => a.filter(Number.isFinite));
  return out;
}

/** ln D and ln(1 - D) of the discriminator's outputs, checked against the samples. */
function discriminatorTerms(
  options: RefitBootstrapOptions,
  setup: RefitSetup,
  quantities: readonly ResolvedQuantity[],
): DiscriminatorTerms | undefined {
  const wants = quantities.some((q) => q.key === "gap");
  const dd = options.discriminator;
  if (!wants) return undefined;
  if (!dd) {
    throw new SaddleError(
      "invalid-argument",
      'the quantity "gap" needs the discriminator\'s outputs: pass discriminator: { dReal, dFake, scale }',
      { parameter: "discriminator" },
    );
  }
  for (
    const [v, n, name] of [[dd.dReal, setup.real.n, "dReal"], [
      dd.dFake,
      setup.fake.n,
      "dFake",
    ]] as const
  ) {
    if (!v || v.length !== n) {
      throw new SaddleError(
        "dimension-mismatch",
        `discriminator.${name} has ${v?.length} outputs for ${n} samples; give one output per row`,
        { parameter: `discriminator.${name}` },
      );
    }
  }
  const lr = outputsToLogits(dd.dReal, dd.scale, "dReal").logit;
  const lf = outputsToLogits(dd.dFake, dd.scale, "dFake").logit;
  return { logD: lr.map((z) => logSigmoid(z)), log1mD: lf.map((z) => logSigmoid(-z)) };
}
