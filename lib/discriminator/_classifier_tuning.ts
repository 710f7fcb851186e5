/**
 * Cross-validated choice of the classifier's RBF bandwidth, number of random Fourier
 * features and ridge penalty (private to the discriminator folder).
 *
 * @module
 */
import type { Rng } from "../random/rng.ts";
import type { Samples } from "../samples/samples.ts";
import { concatSamples, takeRows } from "../samples/transform.ts";
import { logSigmoid } from "../math/log_space.ts";
import { type FeatureKind, fitFeatures, medianBandwidth } from "./_features.ts";
import { fitLogistic, predictLogit } from "./_logistic_regression.ts";
import type { ClassifierTuning, TuningCandidate } from "./types.ts";

/** Points per side the tuning uses at most (a seeded subsample of larger inputs). */
export const TUNE_POINTS = 2000;
/** Folds of the tuning cross-validation. */
export const TUNE_FOLDS = 3;
/** Bandwidth candidates as multiples of the median heuristic. */
const BANDWIDTH_FACTORS = [0.125, 0.25, 0.5, 1, 2];
/** Numbers of random Fourier features tried. */
const FEATURE_COUNTS = [32, 64, 128];
/** First number of features (the bandwidth and the penalty are chosen with it). */
const FIRST_COUNT = 64;
/** Relative objective change at which a tuning fit stops (far below the loss differences). */
const TUNE_TOLERANCE = 1e-9;
/** Penalty path, largest first (each fit starts from the previous one). */
const PENALTIES = [1e-1, 1e-2, 1e-3, 1e-4, 1e-5, 1e-6];

/** What the caller fixed; the rest is tuned. */
export interface TuningRequest {
  real: Samples;
  fake: Samples;
  features: FeatureKind;
  bandwidth?: number;
  randomFeatures?: number;
  regularization?: number;
  maxIter: number;
  rng: Rng;
}

interface Fold {
  train: Samples;
  valid: Samples;
  y: Uint8Array;
  s: Float64Array;
  /** Validation rows: the first `nr` are real. */
  nr: number;
}

function subsample(x: Samples, rng: Rng): Samples {
  if (x.n <= TUNE_POINTS) return x;
  return takeRows(x, rng.permutation(x.n).subarray(0, TUNE_POINTS));
}

function makeFolds(real: Samples, fake: Samples, rng: Rng): Fold[] {
  const pr = rng.fork("real").permutation(real.n), pf = rng.fork("fake").permutation(fake.n);
  const folds: Fold[] = [];
  for (let k = 0; k < TUNE_FOLDS; k++) {
    const part = (perm: Uint32Array) => {
      const inF: number[] = [], out: number[] = [];
      for (let i = 0; i < perm.length; i++) (i % TUNE_FOLDS === k ? inF : out).push(perm[i]);
      return { inF, out };
    };
    const r = part(pr), f = part(pf);
    const train = concatSamples(takeRows(real, r.out), takeRows(fake, f.out));
    const valid = concatSamples(takeRows(real, r.inF), takeRows(fake, f.inF));
    const nrt = r.out.length, nft = f.out.length;
    const y = new Uint8Array(train.n), s = new Float64Array(train.n);
    for (let i = 0; i < train.n; i++) {
      y[i] = i < nrt ? 1 : 0;
      s[i] = i < nrt ? train.n / (2 * nrt) : train.n / (2 * nft);
    }
    folds.push({ train, valid, y, s, nr: r.inF.length });
  }
  return folds;
}

/** Equal-prior log-loss of validation logits (first `nr` rows real). */
function logLoss(logit: Float64Array, nr: number): number {
  let a = 0, b = 0;
  for (let i = 0; i < nr; i++) a -= logSigmoid(logit[i]);
  for (let i = nr; i < logit.length; i++) b -= logSigmoid(-logit[i]);
  return 0.5 * a / nr + 0.5 * b / (logit.length - nr);
}

/**
 * Mean validation log-loss of every penalty on the path, for one feature setting. The
 * random frequencies depend on the number of features and the fold only, so bandwidths are
 * compared on common random numbers.
 */
function pathLoss(
  folds: readonly Fold[],
  setting: { features: FeatureKind; bandwidth?: number; randomFeatures?: number },
  penalties: readonly number[],
  req: TuningRequest,
): number[] {
  const total = new Array<number>(penalties.length).fill(0);
  const fits = folds.map((fold, k) => {
    const map = fitFeatures(fold.train, {
      ...setting,
      seed: req.rng.fork(`frequencies-${setting.randomFeatures ?? 0}-${k}`),
    });
    return {
      map,
      x: map.map(fold.train),
      xv: map.map(fold.valid),
      start: undefined as Float64Array | undefined,
    };
  });
  // Down the path, largest penalty first, each fit warm-started from the previous one; the
  // path stops once the validation loss has risen twice in a row (it is unimodal in practice).
  let rises = 0;
  for (let j = 0; j < penalties.length; j++) {
    fits.forEach((f, k) => {
      const fold = folds[k];
      const fit = fitLogistic({
        x: f.x,
        p: f.map.dim,
        y: fold.y,
        s: fold.s,
        lambda: penalties[j],
        maxIterations: req.maxIter,
        start: f.start,
        tolerance: TUNE_TOLERANCE,
      });
      f.start = new Float64Array(f.map.dim + 1);
      f.start[0] = fit.intercept;
      f.start.set(fit.coef, 1);
      total[j] += logLoss(predictLogit(fit, f.xv, f.map.dim), fold.nr) / folds.length;
    });
    if (j > 0 && total[j] > total[j - 1]) {
      if (++rises === 2) return total.slice(0, j + 1);
    } else rises = 0;
  }
  return total;
}

/**
 * Choose the unset bandwidth, number of features and penalty by seeded
 * {@linkcode TUNE_FOLDS}-fold cross-validated log-loss on up to {@linkcode TUNE_POINTS}
 * points a side: first the bandwidth (multiples of the median heuristic) and the penalty
 * with 64 features, then the number of features at that bandwidth.
 */
export function tuneClassifier(req: TuningRequest): ClassifierTuning {
  const real = subsample(req.real, req.rng.fork("subsample-real"));
  const fake = subsample(req.fake, req.rng.fork("subsample-fake"));
  const folds = makeFolds(real, fake, req.rng.fork("folds"));
  const penalties = req.regularization !== undefined ? [req.regularization] : PENALTIES;
  const candidates: TuningCandidate[] = [];
  const tryPath = (setting: { bandwidth?: number; randomFeatures?: number }) => {
    const losses = pathLoss(folds, { features: req.features, ...setting }, penalties, req);
    losses.forEach((l, j) =>
      candidates.push({ ...setting, regularization: penalties[j], logLoss: l })
    );
  };
  const best = () => candidates.reduce((a, b) => (b.logLoss < a.logLoss ? b : a));
  let median: number | undefined;
  if (req.features === "rff") {
    median = medianBandwidth(concatSamples(real, fake));
    const m = median;
    const bandwidths = req.bandwidth !== undefined
      ? [req.bandwidth]
      : BANDWIDTH_FACTORS.map((f) => f * m);
    const first = req.randomFeatures ?? FIRST_COUNT;
    for (const bandwidth of bandwidths) tryPath({ bandwidth, randomFeatures: first });
    if (req.randomFeatures === undefined) {
      const bandwidth = best().bandwidth;
      for (const randomFeatures of FEATURE_COUNTS) {
        if (randomFeatures !== first) tryPath({ bandwidth, randomFeatures });
      }
    }
  } else {
    tryPath({});
  }
  return {
    candidates,
    best: best(),
    points: [real.n, fake.n],
    folds: TUNE_FOLDS,
    ...(median !== undefined ? { medianBandwidth: median } : {}),
  };
}
