/**
 * A density-free estimate of the optimal discriminator: regularised logistic regression
 * between real and generated samples, cross-fitted so the ratio is judged out of sample.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { withDisplay } from "../display/display.ts";
import type { Estimate } from "../estimate/estimate.ts";
import { formatNumber, htmlTable, type TableCell, textTable } from "../display/table.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import { assertSameDimension, type Samples } from "../samples/samples.ts";
import { concatSamples } from "../samples/transform.ts";
import { twoSampleSum } from "../estimate/two_sample.ts";
import { type FeatureKind, type FeatureMap, fitFeatures } from "./_features.ts";
import { logSigmoid, sigmoid } from "../math/log_space.ts";
import { fitLogistic, type LogisticFit, predictLogit } from "./_logistic_regression.ts";
import { tuneClassifier } from "./_classifier_tuning.ts";
import { makeEstimate } from "../estimate/estimate.ts";
import type { ClassifierTuning, Discriminator } from "./types.ts";

/** Options of {@linkcode classifierDiscriminator}. */
export interface ClassifierDiscriminatorOptions {
  /** Feature expansion of the standardised inputs (default "rff"). */
  features?: FeatureKind;
  /**
   * Random Fourier features for "rff", added to the linear terms (default: tuned among 32,
   * 64 and 128; 64 with `tune: false`).
   */
  randomFeatures?: number;
  /**
   * RBF bandwidth in standardised units for "rff" (default: tuned among 1/8 to 2 times the
   * median pairwise distance; the median itself with `tune: false`).
   */
  bandwidth?: number;
  /**
   * Ridge penalty on the coefficients of the mean log-loss (default: tuned between 1e-5 and
   * 0.1; 1e-3 with `tune: false`).
   */
  regularization?: number;
  /**
   * Choose the bandwidth, the number of features and the penalty that are not given by
   * seeded 3-fold cross-validated log-loss on up to 2000 points a side (default true).
   */
  tune?: boolean;
  /** @deprecated The former name of `regularization`; still accepted. */
  l2?: number;
  /** Cross-fitting folds (default 5; >= 2). */
  folds?: number;
  /** Seed of the fold split and the random features (default 0). */
  seed?: RandomSource;
  /** Confidence level of the log-loss interval (default 0.95). */
  level?: number;
  /** Newton iterations per fit (default 100). */
  maxIter?: number;
}

/** The fitted classifier estimate of D*; `prob`/`logit` use the model fitted on all points. */
export interface ClassifierDiscriminator extends Discriminator {
  /** Out-of-fold logits on the training points (each from a model that did not see it). */
  readonly crossFitted: { readonly logitReal: Float64Array; readonly logitFake: Float64Array };
  /** Held-out log-loss (equal priors), nats; ln 2 is chance, 0 perfect separation. */
  readonly heldOutLogLoss: Estimate;
  /**
   * Lower bound on the JSD (nats) implied by the held-out log-loss at equal priors:
   * ln 2 - log-loss <= JSD, since the log-loss of any D is at least that of D*, ln 2 - JSD.
   */
  readonly jsdLowerBound: Estimate;
  /** Feature expansion used. */
  readonly features: FeatureKind;
  /** RBF bandwidth of the model fitted on all points (standardised units), for "rff". */
  readonly bandwidth?: number;
  /** Random Fourier features, for "rff". */
  readonly randomFeatures?: number;
  /** Ridge penalty of the model fitted on all points. */
  readonly regularization: number;
  /** How the unset settings were chosen, when tuned. */
  readonly tuning?: ClassifierTuning;
  /** Features per point (without intercept). */
  readonly featureDimension: number;
  /** Number of folds. */
  readonly folds: number;
  /** Whether every Newton fit converged. */
  readonly converged: boolean;
  /** Caveats. */
  readonly notes: readonly string[];
}

const MAX_FEATURES = 600;

interface Model {
  features: FeatureMap;
  fit: LogisticFit;
  /** Features of the pooled points (real rows first), n x features.dim. */
  x: Float64Array;
}

/** A resolved setting: the penalty per fit scales with the pooled training size. */
interface Setting {
  features: FeatureKind;
  bandwidth?: number;
  randomFeatures?: number;
  /** Penalty times pooled training points (a fixed Gaussian prior), or a fixed penalty. */
  penalty: { perPoint: number } | { fixed: number };
  maxIter: number;
}

function fitModel(real: Samples, fake: Samples, setting: Setting, seed: RandomSource): Model {
  const pooled = concatSamples(real, fake);
  const features = fitFeatures(pooled, { ...setting, seed });
  if (features.dim > MAX_FEATURES) {
    throw new SaddleError(
      "invalid-argument",
      `${features.dim} features are too many for Newton's method; use features: "rff" with ` +
        "fewer randomFeatures, or reduce the dimension first",
      { parameter: "features" },
    );
  }
  const x = features.map(pooled);
  const y = new Uint8Array(pooled.n);
  const s = new Float64Array(pooled.n);
  // Each side carries half the weight, so the logit estimates ln(p_data / p_g) (equal priors).
  for (let i = 0; i < pooled.n; i++) {
    const isReal = i < real.n;
    y[i] = isReal ? 1 : 0;
    s[i] = isReal ? pooled.n / (2 * real.n) : pooled.n / (2 * fake.n);
  }
  const fit = fitLogistic({
    x,
    p: features.dim,
    y,
    s,
    lambda: penaltyFor(setting, pooled.n),
    maxIterations: setting.maxIter,
  });
  return { features, fit, x };
}

/**
 * Fit on the pooled rows `train` of the full model's features (`nReal` real rows come
 * first in the pooled order), starting from the full fit: the problem is strictly convex,
 * so a converged fit is the same wherever it starts, and a warm start needs few steps.
 */
function fitRows(
  full: Model,
  { train, nReal, setting }: { train: readonly number[]; nReal: number; setting: Setting },
): LogisticFit {
  const dim = full.features.dim;
  const x = new Float64Array(train.length * dim);
  const y = new Uint8Array(train.length), s = new Float64Array(train.length);
  let realCount = 0;
  for (const i of train) if (i < nReal) realCount++;
  const fakeCount = train.length - realCount;
  train.forEach((i, r) => {
    x.set(full.x.subarray(i * dim, (i + 1) * dim), r * dim);
    const isReal = i < nReal;
    y[r] = isReal ? 1 : 0;
    s[r] = isReal ? train.length / (2 * realCount) : train.length / (2 * fakeCount);
  });
  const start = new Float64Array(dim + 1);
  start[0] = full.fit.intercept;
  start.set(full.fit.coef, 1);
  return fitLogistic({
    x,
    p: dim,
    y,
    s,
    lambda: penaltyFor(setting, train.length),
    maxIterations: setting.maxIter,
    start,
  });
}

/** Logit of pooled row `i` under `fit`, from the full model's features. */
function rowLogit(full: Model, fit: LogisticFit, i: number): number {
  const dim = full.features.dim;
  let e = fit.intercept;
  for (let j = 0; j < dim; j++) e += full.x[i * dim + j] * fit.coef[j];
  return e;
}

function penaltyFor(setting: Setting, pooled: number): number {
  const p = setting.penalty;
  return "fixed" in p ? p.fixed : p.perPoint / pooled;
}

/** The ridge penalty from `regularization` or its former name `l2` (default 1e-3), checked. */
function ridgeOf(options: ClassifierDiscriminatorOptions): number | undefined {
  const { regularization, l2 } = options;
  if (regularization !== undefined && l2 !== undefined && regularization !== l2) {
    throw new SaddleError(
      "invalid-argument",
      `regularization and l2 name the same penalty but differ (${regularization} vs ${l2}); ` +
        "give regularization only",
      { parameter: "regularization" },
    );
  }
  const name = regularization === undefined && l2 !== undefined ? "l2" : "regularization";
  const value = regularization ?? l2;
  if (value === undefined) return undefined;
  if (!(value >= 0) || value === Infinity) {
    throw new SaddleError("invalid-argument", `${name} must be >= 0 and finite, got ${value}`, {
      parameter: name,
    });
  }
  return value;
}

function predict(m: Model, x: Samples): Float64Array {
  return predictLogit(m.fit, m.features.map(x), m.features.dim);
}

/**
 * Estimate D* from samples alone: a classifier between real (label 1) and generated
 * (label 0) points, each side weighted half so that its logit estimates the log density
 * ratio `ln(p_data / p_g)` (the density-ratio trick: Sugiyama, Suzuki & Kanamori 2012;
 * Goodfellow et al. 2014, Prop. 1). The classifier is L2-regularised logistic regression on
 * standardised features: by default the inputs plus random Fourier (RBF) features (Rahimi &
 * Recht 2007), or the inputs alone ("linear"), or with their products ("quadratic"), fitted
 * by Newton's method (IRLS). Whatever of the RBF bandwidth, the number of random features
 * and the ridge penalty is not given is chosen by seeded 3-fold cross-validated log-loss on
 * up to 2000 points a side (`tuning` lists every setting tried; the penalty is carried to
 * the full sample as a fixed Gaussian prior, i.e. scaled by the ratio of sample sizes);
 * `tune: false` uses fixed defaults instead. The feature map uses no labels and is fitted
 * once on all points; the logistic fit is cross-fitted over K seeded folds: `crossFitted`
 * holds each point's logit from the fit that did not see its label, and `heldOutLogLoss`
 * their log-loss (= -V(D, G)/2 of the cross-fitted D; ln 2 at chance), with the lower bound
 * `jsdLowerBound` = ln 2 - log-loss on the JSD it implies. `prob`/`logit` evaluate a model
 * fitted on all points, for use in {@linkcode valueFunction} or as the `reference` of
 * {@linkcode discriminatorGap}.
 *
 * References: Sugiyama, Suzuki & Kanamori 2012, Density Ratio Estimation in Machine
 * Learning; Rahimi & Recht 2007, Random Features for Large-Scale Kernel Machines (NeurIPS);
 * Chernozhukov et al. 2018 (Econometrics J.) for cross-fitting; Stone 1974 (J. R. Stat.
 * Soc. B) for choosing settings by cross-validation.
 *
 * @example Two shifted clouds
 * ```ts
 * import { classifierDiscriminator } from "./classifier_discriminator.ts";
 * import { samples } from "../samples/samples.ts";
 * import { Rng } from "../random/rng.ts";
 * import assert from "node:assert/strict";
 * const r = new Rng(1);
 * const real = samples(Array.from({ length: 300 }, () => r.normal(1, 1)));
 * const fake = samples(Array.from({ length: 300 }, () => r.normal(-1, 1)));
 * const c = classifierDiscriminator(real, fake, { seed: 2 });
 * // True log-ratio is 2x: the fitted slope is close, and the log-loss beats chance.
 * assert.ok(Math.abs(c.logit(samples([1]))[0] - 2) < 0.6);
 * assert.ok(c.heldOutLogLoss.value < Math.log(2));
 * ```
 */
export function classifierDiscriminator(
  real: Samples,
  fake: Samples,
  options: ClassifierDiscriminatorOptions = {},
): ClassifierDiscriminator {
  assertSameDimension(real, fake, "real", "fake");
  const K = options.folds ?? 5;
  if (!Number.isInteger(K) || K < 2) {
    throw new SaddleError("invalid-argument", `folds must be an integer >= 2, got ${K}`, {
      parameter: "folds",
    });
  }
  for (const [s, name] of [[real, "real"], [fake, "fake"]] as const) {
    if (s.n < K) {
      throw new SaddleError(
        "too-few-samples",
        `${name} has ${s.n} points, fewer than the ${K} folds; give more points or fewer folds`,
        { parameter: name },
      );
    }
  }
  const fixedRidge = ridgeOf(options);
  const rng = toRng(options.seed ?? 0);
  const kind = options.features ?? "rff";
  const maxIter = options.maxIter ?? 100;
  const rff = kind === "rff";
  const open = fixedRidge === undefined ||
    (rff && (options.bandwidth === undefined || options.randomFeatures === undefined));
  let tuning: ClassifierTuning | undefined;
  let setting: Setting;
  if ((options.tune ?? true) && open) {
    tuning = tuneClassifier({
      real,
      fake,
      features: kind,
      ...(rff ? { bandwidth: options.bandwidth, randomFeatures: options.randomFeatures } : {}),
      regularization: fixedRidge,
      maxIter,
      rng: rng.fork("tuning"),
    });
    const [nr, nf] = tuning.points;
    const tuneTrain = (nr + nf) * (tuning.folds - 1) / tuning.folds;
    setting = {
      features: kind,
      ...(rff
        ? { bandwidth: tuning.best.bandwidth, randomFeatures: tuning.best.randomFeatures }
        : {}),
      penalty: fixedRidge !== undefined
        ? { fixed: fixedRidge }
        : { perPoint: tuning.best.regularization * tuneTrain },
      maxIter,
    };
  } else {
    setting = {
      features: kind,
      bandwidth: options.bandwidth,
      randomFeatures: options.randomFeatures,
      penalty: { fixed: fixedRidge ?? 1e-3 },
      maxIter,
    };
  }
  const permR = rng.fork("folds-real").permutation(real.n);
  const permF = rng.fork("folds-fake").permutation(fake.n);
  const logitReal = new Float64Array(real.n), logitFake = new Float64Array(fake.n);
  let converged = true;
  const split = (perm: Uint32Array, k: number) => {
    const inFold: number[] = [], out: number[] = [];
    for (let i = 0; i < perm.length; i++) (i % K === k ? inFold : out).push(perm[i]);
    return { inFold, out };
  };
  // The feature map (standardisation, random frequencies) uses no labels: it is fitted
  // once on all points, and each fold's logistic fit sees only its training rows.
  const full = fitModel(real, fake, setting, rng.fork("rff-full"));
  converged &&= full.fit.converged;
  for (let k = 0; k < K; k++) {
    const r = split(permR, k), f = split(permF, k);
    const train = [...r.out, ...f.out.map((i) => real.n + i)];
    const fit = fitRows(full, { train, nReal: real.n, setting });
    converged &&= fit.converged;
    for (const i of r.inFold) logitReal[i] = rowLogit(full, fit, i);
    for (const i of f.inFold) logitFake[i] = rowLogit(full, fit, real.n + i);
  }
  const notes: string[] = [];
  if (!converged) {
    notes.push("a Newton fit stopped before converging: raise maxIter or regularization");
  }
  const heldOutLogLoss = twoSampleSum(
    logitReal.map((l) => -logSigmoid(l)),
    logitFake.map((l) => -logSigmoid(-l)),
    {
      weights: [0.5, 0.5],
      level: options.level,
      seed: rng.fork("bootstrap"),
      unit: "nats",
      notes: [`${K}-fold cross-fitted log-loss; chance level ln 2 = 0.6931`],
    },
  );
  // ln 2 - log-loss <= JSD at equal priors: the interval maps through the same shift.
  const ll = heldOutLogLoss;
  const jsdLowerBound = makeEstimate({
    value: Math.LN2 - ll.value,
    ...(ll.se !== undefined ? { se: ll.se } : {}),
    ...(ll.ci ? { ci: [Math.LN2 - ll.ci[1], Math.LN2 - ll.ci[0]] as const } : {}),
    level: ll.level,
    method: "ln 2 - held-out log-loss",
    n: ll.n,
    unit: "nats",
    notes: ["a lower bound on the JSD (equal priors); negative values bound nothing"],
  });
  const logit = (x: Samples): Float64Array => {
    assertSameDimension(real, x, "the training samples", "x");
    return predict(full, x);
  };
  const out: ClassifierDiscriminator = {
    d: real.d,
    logit,
    prob: (x) => logit(x).map(sigmoid),
    crossFitted: { logitReal, logitFake },
    heldOutLogLoss,
    jsdLowerBound,
    features: kind,
    ...(rff
      ? { bandwidth: full.features.bandwidth, randomFeatures: full.features.dim - real.d }
      : {}),
    regularization: penaltyFor(setting, real.n + fake.n),
    ...(tuning ? { tuning } : {}),
    featureDimension: full.features.dim,
    folds: K,
    converged,
    notes,
  };
  return withDisplay(out, (c) => {
    const rows: TableCell[][] = [
      ["features", `${c.features} (${c.featureDimension})`],
      ...(c.bandwidth !== undefined
        ? [["bandwidth (standardised)", formatNumber(c.bandwidth)]] as TableCell[][]
        : []),
      ["regularization", formatNumber(c.regularization)],
      [
        "chosen by",
        c.tuning
          ? `${c.tuning.folds}-fold CV log-loss over ${c.tuning.candidates.length} settings ` +
            `(${c.tuning.points[0]} + ${c.tuning.points[1]} points)`
          : "given / fixed defaults",
      ],
      ["folds", c.folds],
      ["held-out log-loss", c.heldOutLogLoss],
      ["JSD lower bound (ln 2 - log-loss)", c.jsdLowerBound],
      ["converged", String(c.converged)],
    ];
    return {
      "text/plain": textTable(["classifier estimate of D*", ""], rows),
      "text/html": htmlTable(["classifier estimate of D*", ""], rows),
    };
  });
}
