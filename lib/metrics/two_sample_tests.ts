/**
 * Two-sample tests with p-values: the kernel (MMD) permutation test, the classifier test,
 * and a permutation test of any statistic.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { type Estimate, makeEstimate, meanEstimate, normalCritical } from "../estimate/mod.ts";
import { htmlTable, type TableCell, textTable, withDisplay } from "../display/mod.ts";
import { classifierDiscriminator, type FeatureKind } from "../discriminator/mod.ts";
import { type MmdKernel, mmdPermutations } from "../divergence/mod.ts";
import { type RandomSource, toRng } from "../random/mod.ts";
import { concatSamples, type Samples, type SamplesInput, takeRows } from "../samples/mod.ts";
import { metricPair } from "./_inputs.ts";

/** The result of a two-sample test. */
export interface TwoSampleTest {
  /** The test's name. */
  readonly method: string;
  /** The test statistic on the data. */
  readonly statistic: Estimate;
  /** p-value of the null hypothesis "both sets come from one distribution". */
  readonly pValue: number;
  /** Random relabellings behind the p-value (0 for the classifier test's exact binomial). */
  readonly permutations: number;
  /** Further estimates of the test (the classifier test's log-loss and JSD bound). */
  readonly extra: Readonly<Record<string, Estimate>>;
  /** Caveats and settings. */
  readonly notes: readonly string[];
}

function testResult(r: TwoSampleTest): TwoSampleTest {
  return Object.freeze(withDisplay(r, (t) => {
    const rows: TableCell[][] = [
      ["statistic", t.statistic],
      ["p-value", t.pValue],
      ...Object.entries(t.extra).map(([k, v]) => [k, v] as TableCell[]),
    ];
    const caption = `${t.method}` +
      (t.permutations ? ` (${t.permutations} permutations)` : "") +
      (t.notes.length ? `; ${t.notes.join("; ")}` : "");
    return {
      "text/plain": `${caption}\n${textTable(["", "value"], rows)}`,
      "text/html": htmlTable(["", "value"], rows, caption),
    };
  }));
}

/** Options of {@linkcode mmdTest}. */
export interface MmdTestOptions {
  /** "gaussian" (default) or "cubic". */
  kernel?: MmdKernel;
  /** σ of the Gaussian kernel (default: the median heuristic on the pooled points). */
  bandwidth?: number;
  /** Random relabellings (default 200). */
  permutations?: number;
  /** Seed (default 0). */
  seed?: RandomSource;
  /** Confidence level of the statistic's interval (default 0.95). */
  level?: number;
}

/**
 * The kernel two-sample test: the unbiased MMD² of `a` versus `b` against its permutation
 * null, p = (1 + #{null ≥ observed}) / (1 + permutations), exact in level for any sizes.
 * The statistic carries its first-order U-statistic interval (see `mmd`).
 *
 * References: Gretton, Borgwardt, Rasch, Schölkopf & Smola 2012, A Kernel Two-Sample Test
 * (JMLR).
 *
 * @example
 * ```ts
 * import { mmdTest } from "./two_sample_tests.ts";
 * import assert from "node:assert/strict";
 * const a = Array.from({ length: 30 }, (_, i) => [i / 30]);
 * const b = Array.from({ length: 30 }, (_, i) => [3 + i / 30]);
 * assert.ok(mmdTest(a, b, { permutations: 99, seed: 1 }).pValue <= 0.01);
 * ```
 */
export function mmdTest(
  a: SamplesInput,
  b: SamplesInput,
  options: MmdTestOptions = {},
): TwoSampleTest {
  const [x, y] = metricPair(a, b, 1, ["a", "b"]);
  const permutations = options.permutations ?? 200;
  const r = mmdPermutations(x, y, { ...options, permutations });
  const level = options.level ?? 0.95, z = normalCritical(level);
  const statistic = makeEstimate({
    value: r.observed,
    se: r.se,
    ci: [r.observed - z * r.se, r.observed + z * r.se],
    level,
    method: "u-statistic",
    n: x.n + y.n,
    notes: ["unbiased MMD²"],
  });
  return testResult({
    method: "MMD permutation test",
    statistic,
    pValue: permutationP(r.observed, r.null),
    permutations,
    extra: {},
    notes: [
      options.kernel === "cubic"
        ? "cubic kernel"
        : `Gaussian kernel σ = ${+r.bandwidth.toPrecision(4)}`,
    ],
  });
}

/** `(1 + #{null ≥ observed}) / (1 + #null)`, with a relative tolerance for rounding ties. */
function permutationP(observed: number, nulls: ArrayLike<number>): number {
  const tol = 1e-12 * Math.max(Math.abs(observed), 1e-300);
  let c = 0;
  for (let i = 0; i < nulls.length; i++) if (nulls[i] >= observed - tol) c++;
  return (1 + c) / (1 + nulls.length);
}

/** Options of {@linkcode permutationTest}. */
export interface PermutationTestOptions {
  /** Random relabellings (default 999). */
  permutations?: number;
  /** Seed (default 0). */
  seed?: RandomSource;
  /**
   * "greater" (default): large statistics speak against the null; "less": small ones;
   * "two-sided": large |statistic − median of the null|.
   */
  alternative?: "greater" | "less" | "two-sided";
  /** Called every 50 permutations with the number done and the total. */
  onProgress?: (done: number, total: number) => void;
}

/**
 * A permutation test of any statistic of two sets: the statistic on the given split against
 * its values on seeded random splits of the pooled points into sets of the same sizes;
 * p = (1 + #{as extreme}) / (1 + permutations). The statistic is reported as observed
 * (method "observed", no interval: it is whatever the caller computes).
 *
 * References: Fisher 1935, The Design of Experiments; Good 2005, Permutation, Parametric
 * and Bootstrap Tests of Hypotheses.
 *
 * @example
 * ```ts
 * import { permutationTest } from "./two_sample_tests.ts";
 * import assert from "node:assert/strict";
 * const meanGap = (a: { data: Float64Array }, b: { data: Float64Array }) =>
 *   Math.abs(a.data.reduce((s, v) => s + v, 0) / a.data.length - b.data.reduce((s, v) => s + v, 0) / b.data.length);
 * const t = permutationTest([1, 2, 3, 4, 5], [11, 12, 13, 14, 15], meanGap, { permutations: 199 });
 * assert.ok(t.pValue < 0.05);
 * ```
 */
export function permutationTest(
  a: SamplesInput,
  b: SamplesInput,
  statistic: (a: Samples, b: Samples) => number,
  options: PermutationTestOptions = {},
): TwoSampleTest {
  const [x, y] = metricPair(a, b, 1, ["a", "b"]);
  const P = options.permutations ?? 999;
  if (!Number.isInteger(P) || P < 1) {
    throw new SaddleError("invalid-argument", `permutations must be an integer >= 1, got ${P}`, {
      parameter: "permutations",
    });
  }
  const alternative = options.alternative ?? "greater";
  if (!["greater", "less", "two-sided"].includes(alternative)) {
    throw new SaddleError(
      "invalid-argument",
      `unknown alternative "${alternative}"; use "greater", "less" or "two-sided"`,
      { parameter: "alternative" },
    );
  }
  const observed = statistic(x, y);
  if (!Number.isFinite(observed)) {
    throw new SaddleError("non-finite", `the statistic returned ${observed} on the data`, {
      parameter: "statistic",
    });
  }
  const z = concatSamples(x, y);
  const r = toRng(options.seed ?? 0).fork("permutation-test");
  const nulls = new Float64Array(P);
  for (let p = 0; p < P; p++) {
    const perm = r.permutation(z.n);
    nulls[p] = statistic(takeRows(z, perm.subarray(0, x.n)), takeRows(z, perm.subarray(x.n)));
    if ((p + 1) % 50 === 0 || p + 1 === P) options.onProgress?.(p + 1, P);
  }
  let pValue: number;
  if (alternative === "greater") pValue = permutationP(observed, nulls);
  else if (alternative === "less") pValue = permutationP(-observed, nulls.map((v) => -v));
  else {
    const mid = Float64Array.from(nulls).sort()[Math.floor(P / 2)];
    pValue = permutationP(Math.abs(observed - mid), nulls.map((v) => Math.abs(v - mid)));
  }
  return testResult({
    method: "permutation test",
    statistic: makeEstimate({ value: observed, method: "observed", n: x.n + y.n }),
    pValue,
    permutations: P,
    extra: {},
    notes: [`alternative: ${alternative}`],
  });
}

/** Options of {@linkcode classifierTest}. */
export interface ClassifierTestOptions {
  /** Share of each set held out for testing (default 0.5). */
  testFraction?: number;
  /** Feature expansion of the logistic classifier (default "quadratic" for d ≤ 20, else "linear"). */
  features?: FeatureKind;
  /** Ridge penalty of the classifier (default 1e-3). */
  regularization?: number;
  /** Seed of the split and of the classifier (default 0). */
  seed?: RandomSource;
  /** Confidence level (default 0.95). */
  level?: number;
}

/**
 * The classifier two-sample test: a logistic classifier (lib/discriminator's, each side
 * weighted half) is fitted on a seeded training part of both sets, and scored on held-out
 * parts of equal size from each set. Under the null its held-out accuracy is
 * Binomial(N, 1/2)/N whatever was learned, so the p-value is the exact binomial tail
 * P(Bin(N, 1/2) ≥ correct). `extra` holds the held-out log-loss at equal priors and the
 * lower bound `ln 2 − log-loss ≤ JSD` it gives (Goodfellow et al. 2014, Thm. 1: the
 * best classifier's loss is ln 2 − JSD), both with normal intervals of the per-point means.
 *
 * References: Lopez-Paz & Oquab 2017, Revisiting classifier two-sample tests (ICLR);
 * Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS).
 *
 * @example
 * ```ts
 * import { classifierTest } from "./two_sample_tests.ts";
 * import assert from "node:assert/strict";
 * const a = Array.from({ length: 100 }, (_, i) => [Math.sin(i), i % 7]);
 * const b = Array.from({ length: 100 }, (_, i) => [Math.sin(i) + 3, i % 7]);
 * const t = classifierTest(a, b, { seed: 1 });
 * assert.ok(t.statistic.value > 0.9 && t.pValue < 1e-6);
 * ```
 */
export function classifierTest(
  a: SamplesInput,
  b: SamplesInput,
  options: ClassifierTestOptions = {},
): TwoSampleTest {
  const [x, y] = metricPair(a, b, 1, ["a", "b"]);
  const frac = options.testFraction ?? 0.5;
  if (!(frac > 0 && frac < 1)) {
    throw new SaddleError("invalid-argument", `testFraction must be in (0, 1), got ${frac}`, {
      parameter: "testFraction",
    });
  }
  const r = toRng(options.seed ?? 0);
  const nt = Math.floor(Math.min(x.n, y.n) * frac);
  if (nt < 1 || x.n - nt < 2 || y.n - nt < 2) {
    throw new SaddleError(
      "too-few-samples",
      `sets of ${x.n} and ${y.n} rows leave too few for training and testing; give more points`,
      { parameter: "a" },
    );
  }
  const px = r.fork("split-a").permutation(x.n), py = r.fork("split-b").permutation(y.n);
  const trainX = takeRows(x, px.subarray(nt)), testX = takeRows(x, px.subarray(0, nt));
  const trainY = takeRows(y, py.subarray(nt)), testY = takeRows(y, py.subarray(0, nt));
  const features = options.features ?? (x.d <= 20 ? "quadratic" : "linear");
  const clf = classifierDiscriminator(trainX, trainY, {
    features,
    folds: 2,
    seed: r.fork("classifier"),
    ...(options.regularization !== undefined ? { regularization: options.regularization } : {}),
  });
  const lx = clf.logit(testX), ly = clf.logit(testY);
  const N = 2 * nt;
  let correct = 0;
  const correctTerms = new Float64Array(N),
    lossX = new Float64Array(nt),
    lossY = new Float64Array(nt);
  for (let i = 0; i < nt; i++) {
    correctTerms[i] = lx[i] > 0 ? 1 : lx[i] === 0 ? 0.5 : 0;
    correctTerms[nt + i] = ly[i] < 0 ? 1 : ly[i] === 0 ? 0.5 : 0;
    lossX[i] = softplus(-lx[i]);
    lossY[i] = softplus(ly[i]);
  }
  for (const c of correctTerms) correct += c;
  const level = options.level ?? 0.95;
  const accuracy = meanEstimate(correctTerms, { level, method: "held-out", unit: "probability" });
  const lx2 = meanEstimate(lossX), ly2 = meanEstimate(lossY);
  const loss = (lx2.value + ly2.value) / 2;
  const lossSe = Math.sqrt(lx2.se! ** 2 + ly2.se! ** 2) / 2;
  const z = normalCritical(level);
  const logLoss = makeEstimate({
    value: loss,
    se: lossSe,
    ci: [loss - z * lossSe, loss + z * lossSe],
    level,
    method: "held-out",
    n: N,
    unit: "nats",
  });
  const bound = Math.LN2 - loss;
  const jsdLowerBound = makeEstimate({
    value: bound,
    se: lossSe,
    ci: [bound - z * lossSe, bound + z * lossSe],
    level,
    method: "held-out",
    n: N,
    unit: "nats",
    notes: bound < 0 ? ["negative: the classifier is worse than chance, so the bound is 0"] : [],
  });
  return testResult({
    method: "classifier two-sample test",
    statistic: accuracy,
    pValue: binomialUpperTail(Math.ceil(correct - 1e-9), N),
    permutations: 0,
    extra: { "held-out log-loss": logLoss, "JSD lower bound": jsdLowerBound },
    notes: [`${features} logistic classifier, ${nt} + ${nt} held-out points`],
  });
}

function softplus(t: number): number {
  return t > 0 ? t + Math.log1p(Math.exp(-t)) : Math.log1p(Math.exp(t));
}

/**
 * The exact binomial tail `P(Bin(N, 1/2) ≥ c)`, summed in log space from the largest term
 * (the classifier test's p-value).
 *
 * @example
 * ```ts
 * import { binomialUpperTail } from "./two_sample_tests.ts";
 * import assert from "node:assert/strict";
 * // C(10,8) + C(10,9) + C(10,10) = 56 of 2^10 outcomes.
 * assert.ok(Math.abs(binomialUpperTail(8, 10) - 56 / 1024) < 1e-15);
 * ```
 */
export function binomialUpperTail(c: number, N: number): number {
  if (c <= 0) return 1;
  if (c > N) return 0;
  const logFact = new Float64Array(N + 1);
  for (let i = 1; i <= N; i++) logFact[i] = logFact[i - 1] + Math.log(i);
  const logTerm = (k: number) => logFact[N] - logFact[k] - logFact[N - k] - N * Math.LN2;
  let max = -Infinity;
  for (let k = c; k <= N; k++) max = Math.max(max, logTerm(k));
  let s = 0;
  for (let k = c; k <= N; k++) s += Math.exp(logTerm(k) - max);
  return Math.min(1, Math.exp(max + Math.log(s)));
}
