/**
 * A density-free estimate of the optimal discriminator: regularised logistic regression
 * between real and generated samples, cross-fitted so the ratio is judged out of sample.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { withDisplay } from "../display/display.ts";
import type { Estimate } from "../estimate/estimate.ts";
import { htmlTable, type TableCell, textTable } from "../display/table.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import { assertSameDimension, type Samples } from "../samples/samples.ts";
import { concatSamples, takeRows } from "../samples/transform.ts";
import { twoSampleSum } from "../estimate/two_sample.ts";
import { type FeatureKind, type FeatureMap, fitFeatures } from "./_features.ts";
import { logSigmoid, sigmoid } from "../math/log_space.ts";
import { fitLogistic, type LogisticFit, predictLogit } from "./_logistic_regression.ts";
import type { Discriminator } from "./types.ts";

/** Options of {@linkcode classifierDiscriminator}. */
export interface ClassifierDiscriminatorOptions {
  /** Feature expansion of the standardised inputs (default "linear"). */
  features?: FeatureKind;
  /** Random Fourier features for "rff" (default 64), added to the linear terms. */
  randomFeatures?: number;
  /** RBF bandwidth in standardised units for "rff" (default: median pairwise distance). */
  bandwidth?: number;
  /** Ridge penalty on the coefficients of the mean log-loss (default 1e-3). */
  regularization?: number;
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
  /** Feature expansion used. */
  readonly features: FeatureKind;
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
}

function fitModel(
  real: Samples,
  fake: Samples,
  options: ClassifierDiscriminatorOptions,
  seed: RandomSource,
): Model {
  const pooled = concatSamples(real, fake);
  const features = fitFeatures(pooled, { ...options, seed });
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
    lambda: ridgeOf(options),
    maxIterations: options.maxIter ?? 100,
  });
  return { features, fit };
}

/** The ridge penalty from `regularization` or its former name `l2` (default 1e-3), checked. */
function ridgeOf(options: ClassifierDiscriminatorOptions): number {
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
  const value = regularization ?? l2 ?? 1e-3;
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
 * features standardised on the training points, with optional quadratic or random Fourier
 * (RBF) features (Rahimi & Recht 2007), fitted by Newton's method (IRLS). It is cross-fitted
 * over K seeded folds: `crossFitted` holds each point's logit from the model that did not see
 * it, and `heldOutLogLoss` their log-loss (= -V(D, G)/2 of the cross-fitted D; ln 2 at
 * chance). `prob`/`logit` evaluate a model fitted on all points, for use in
 * {@linkcode valueFunction} or as the `reference` of {@linkcode discriminatorGap}.
 *
 * References: Sugiyama, Suzuki & Kanamori 2012, Density Ratio Estimation in Machine
 * Learning; Rahimi & Recht 2007, Random Features for Large-Scale Kernel Machines (NeurIPS);
 * Chernozhukov et al. 2018 (Econometrics J.) for cross-fitting.
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
  ridgeOf(options);
  const rng = toRng(options.seed ?? 0);
  const permR = rng.fork("folds-real").permutation(real.n);
  const permF = rng.fork("folds-fake").permutation(fake.n);
  const logitReal = new Float64Array(real.n), logitFake = new Float64Array(fake.n);
  let converged = true;
  const split = (perm: Uint32Array, k: number) => {
    const inFold: number[] = [], out: number[] = [];
    for (let i = 0; i < perm.length; i++) (i % K === k ? inFold : out).push(perm[i]);
    return { inFold, out };
  };
  for (let k = 0; k < K; k++) {
    const r = split(permR, k), f = split(permF, k);
    const m = fitModel(takeRows(real, r.out), takeRows(fake, f.out), options, rng.fork(`rff-${k}`));
    converged &&= m.fit.converged;
    const pr = predict(m, takeRows(real, r.inFold));
    const pf = predict(m, takeRows(fake, f.inFold));
    r.inFold.forEach((i, j) => (logitReal[i] = pr[j]));
    f.inFold.forEach((i, j) => (logitFake[i] = pf[j]));
  }
  const full = fitModel(real, fake, options, rng.fork("rff-full"));
  converged &&= full.fit.converged;
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
  const features = options.features ?? "linear";
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
    features,
    featureDimension: full.features.dim,
    folds: K,
    converged,
    notes,
  };
  return withDisplay(out, (c) => {
    const rows: TableCell[][] = [
      ["features", `${c.features} (${c.featureDimension})`],
      ["folds", c.folds],
      ["held-out log-loss", c.heldOutLogLoss],
      ["converged", String(c.converged)],
    ];
    return {
      "text/plain": textTable(["classifier estimate of D*", ""], rows),
      "text/html": htmlTable(["classifier estimate of D*", ""], rows),
    };
  });
}
