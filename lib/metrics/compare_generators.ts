/**
 * Comparing several generators against one real set on several metrics, with paired
 * half-sampling intervals for every value and every pairwise difference.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { type Estimate, makeEstimate, percentileInterval } from "../estimate/mod.ts";
import { htmlTable, type TableCell, textTable, withDisplay } from "../display/mod.ts";
import {
  energyDistance,
  frechetDistance,
  medianBandwidth,
  mmd,
  slicedWasserstein,
} from "../divergence/mod.ts";
import { type RandomSource, toRng } from "../random/mod.ts";
import { concatSamples, type Samples, type SamplesInput, takeRows } from "../samples/mod.ts";
import { metricPair } from "./_inputs.ts";
import { densityCoverage, precisionRecall } from "./precision_recall.ts";

/** Built-in metrics of {@linkcode compareGenerators}. */
export type MetricName =
  | "frechet"
  | "mmd"
  | "precision"
  | "recall"
  | "density"
  | "coverage"
  | "energy"
  | "sliced-wasserstein";

/** A metric of your own: a number from (real, fake) and which direction is better. */
export interface CustomMetric {
  /** Name shown in tables. */
  readonly name: string;
  /** Whether lower or higher values are better. */
  readonly better: "lower" | "higher";
  /** The metric on one real set and one generated set. */
  compute(real: Samples, fake: Samples): number;
}

const BETTER: Record<MetricName, "lower" | "higher"> = {
  frechet: "lower",
  mmd: "lower",
  precision: "higher",
  recall: "higher",
  density: "higher",
  coverage: "higher",
  energy: "lower",
  "sliced-wasserstein": "lower",
};

/** Options of {@linkcode compareGenerators}. */
export interface CompareGeneratorsOptions {
  /** Names of the generators (default "G1", "G2", ... or the keys of a record). */
  names?: readonly string[];
  /** Half-sample replicates (default 50). */
  replicates?: number;
  /** Confidence level of the intervals and of the verdicts (default 0.95). */
  level?: number;
  /** Seed of the half-samples (default 0). */
  seed?: RandomSource;
  /** Neighbour order of precision/recall (default 3). */
  kPrecision?: number;
  /** Neighbour order of density/coverage (default 5). */
  kDensity?: number;
  /** Called after each replicate with the number done and the total. */
  onProgress?: (done: number, total: number) => void;
}

/** One metric of one generator. */
export interface GeneratorValue {
  /** Generator name. */
  readonly generator: string;
  /** Metric name. */
  readonly metric: string;
  /** The metric with its half-sampling interval. */
  readonly estimate: Estimate;
}

/** One pairwise difference on one metric. */
export interface GeneratorDifference {
  /** Metric name. */
  readonly metric: string;
  /** First generator. */
  readonly a: string;
  /** Second generator. */
  readonly b: string;
  /** Metric of a minus metric of b, with the paired interval. */
  readonly difference: Estimate;
  /** Whether the interval excludes 0. */
  readonly resolved: boolean;
  /** The better generator when resolved, else null. */
  readonly better: string | null;
}

/** The result of {@linkcode compareGenerators}. */
export interface GeneratorComparison {
  /** Generator names in input order. */
  readonly generators: readonly string[];
  /** Metric names in input order. */
  readonly metrics: readonly string[];
  /** Which direction is better, per metric. */
  readonly better: Readonly<Record<string, "lower" | "higher">>;
  /** Every metric of every generator. */
  readonly values: readonly GeneratorValue[];
  /** Every pairwise difference on every metric. */
  readonly differences: readonly GeneratorDifference[];
}

/**
 * Each metric for each generator against the same real set, and each pairwise difference
 * with a paired interval and a verdict: "is A really better than B on this metric, with
 * these sample sizes?". Intervals come from paired half-sampling: each replicate draws half
 * of the real rows and half of each generator's rows without replacement (no repeated rows,
 * so k-NN radii stay meaningful), the same real half for every generator, and recomputes
 * every metric; the spread of replicate minus replicate mean, added to the full-data value,
 * gives a centred percentile interval (for mean-like statistics, half-samples without
 * replacement have about the variance of the full sample: Efron 1982, ch. 8). A difference
 * is resolved when its interval excludes 0. The Gaussian MMD uses one bandwidth for all
 * (median heuristic on the pooled data), and the sliced distance the same directions, so the
 * generators are measured alike.
 *
 * References: Efron 1982, The Jackknife, the Bootstrap and Other Resampling Plans (SIAM),
 * half-sampling; the metrics' own papers (see each function).
 *
 * @example
 * ```ts
 * import { compareGenerators } from "./compare_generators.ts";
 * import { rng } from "../random/mod.ts";
 * import assert from "node:assert/strict";
 * const r = rng(1);
 * const cloud = (shift: number) => Array.from({ length: 200 }, () => [r.normal(shift, 1), r.normal()]);
 * const c = compareGenerators(cloud(0), { good: cloud(0.1), bad: cloud(2) }, ["frechet"], { replicates: 20 });
 * assert.equal(c.differences[0].better, "good");
 * ```
 */
export function compareGenerators(
  real: SamplesInput,
  fakes: readonly SamplesInput[] | Readonly<Record<string, SamplesInput>>,
  metrics: readonly (MetricName | CustomMetric)[] = ["frechet", "precision", "recall", "coverage"],
  options: CompareGeneratorsOptions = {},
): GeneratorComparison {
  const list = Array.isArray(fakes) ? fakes as readonly SamplesInput[] : Object.values(fakes);
  const names = options.names ??
    (Array.isArray(fakes) ? list.map((_, i) => `G${i + 1}`) : Object.keys(fakes));
  if (list.length < 1 || names.length !== list.length) {
    throw new SaddleError(
      "invalid-argument",
      `${list.length} generators and ${names.length} names; give at least one generator and one name each`,
      { parameter: "names" },
    );
  }
  if (metrics.length === 0) {
    throw new SaddleError("invalid-argument", "no metrics asked", { parameter: "metrics" });
  }
  const kp = options.kPrecision ?? 3, kd = options.kDensity ?? 5;
  const kNeed = 2 * Math.max(kp, kd) + 2;
  const pairs = list.map((f, g) => metricPair(real, f, kNeed, ["real", names[g]]));
  const r0 = pairs[0][0];
  const fs = pairs.map((p) => p[1]);
  const metricNames = metrics.map((m) => (typeof m === "string" ? m : m.name));
  for (const m of metrics) {
    if (typeof m === "string" && !(m in BETTER)) {
      throw new SaddleError(
        "invalid-argument",
        `unknown metric "${m}"; use one of ${Object.keys(BETTER).join(", ")} or a custom metric`,
        { parameter: "metrics" },
      );
    }
  }
  const bandwidth = metricNames.includes("mmd") ? medianBandwidth(r0, concatSamples(...fs)) : 1;
  const evaluate = (r: Samples, f: Samples): Float64Array => {
    const out = new Float64Array(metrics.length);
    let pr: ReturnType<typeof precisionRecall> | undefined;
    let dc: ReturnType<typeof densityCoverage> | undefined;
    metrics.forEach((m, j) => {
      if (typeof m !== "string") {
        out[j] = m.compute(r, f);
        return;
      }
      switch (m) {
        case "frechet":
          out[j] = frechetDistance(r, f).value;
          break;
        case "mmd":
          out[j] = mmd(r, f, { bandwidth }).value;
          break;
        case "energy":
          out[j] = energyDistance(r, f).value;
          break;
        case "sliced-wasserstein":
          out[j] = slicedWasserstein(r, f, { seed: 1, projections: 50 }).value;
          break;
        case "precision":
        case "recall":
          pr ??= precisionRecall(r, f, { k: kp, replicates: 2 });
          out[j] = (m === "precision" ? pr.precision : pr.recall).value;
          break;
        case "density":
        case "coverage":
          dc ??= densityCoverage(r, f, { k: kd, replicates: 2 });
          out[j] = (m === "density" ? dc.density : dc.coverage).value;
          break;
      }
    });
    return out;
  };
  const G = fs.length, M = metrics.length;
  const full = fs.map((f) => evaluate(r0, f));
  const B = options.replicates ?? 50;
  if (!Number.isInteger(B) || B < 2) {
    throw new SaddleError("invalid-argument", `replicates must be an integer >= 2, got ${B}`, {
      parameter: "replicates",
    });
  }
  const rng = toRng(options.seed ?? 0).fork("compare-generators");
  // reps[(b * G + g) * M + j]
  const reps = new Float64Array(B * G * M);
  for (let b = 0; b < B; b++) {
    const rh = takeRows(r0, rng.permutation(r0.n).subarray(0, Math.floor(r0.n / 2)));
    fs.forEach((f, g) => {
      const fh = takeRows(f, rng.permutation(f.n).subarray(0, Math.floor(f.n / 2)));
      reps.set(evaluate(rh, fh), (b * G + g) * M);
    });
    options.onProgress?.(b + 1, B);
  }
  const level = options.level ?? 0.95;
  const method = "half-sampling (paired, centred percentile)";
  const centred = (value: number, series: Float64Array, n: number): Estimate => {
    let mean = 0;
    for (const v of series) mean += v / series.length;
    let v2 = 0;
    for (const v of series) v2 += (v - mean) ** 2 / (series.length - 1);
    const [lo, hi] = percentileInterval(series.map((v) => v - mean), level);
    return makeEstimate({
      value,
      se: Math.sqrt(v2),
      ci: [value + lo, value + hi],
      level,
      method,
      n,
      notes: [`${series.length} half-sample replicates`],
    });
  };
  const series = (g: number, j: number) =>
    Float64Array.from({ length: B }, (_, b) => reps[(b * G + g) * M + j]);
  const values: GeneratorValue[] = [];
  for (let g = 0; g < G; g++) {
    for (let j = 0; j < M; j++) {
      values.push({
        generator: names[g],
        metric: metricNames[j],
        estimate: centred(full[g][j], series(g, j), r0.n + fs[g].n),
      });
    }
  }
  const better: Record<string, "lower" | "higher"> = {};
  metrics.forEach((
    m,
    j,
  ) => (better[metricNames[j]] = typeof m === "string" ? BETTER[m] : m.better));
  const differences: GeneratorDifference[] = [];
  for (let j = 0; j < M; j++) {
    for (let a = 0; a < G; a++) {
      for (let b = a + 1; b < G; b++) {
        const sa = series(a, j), sb = series(b, j);
        const diff = centred(
          full[a][j] - full[b][j],
          sa.map((v, i) => v - sb[i]),
          r0.n + fs[a].n + fs[b].n,
        );
        const resolved = diff.ci![0] > 0 || diff.ci![1] < 0;
        const aHigher = diff.value > 0;
        const winner = better[metricNames[j]] === "higher" ? (aHigher ? a : b) : (aHigher ? b : a);
        differences.push({
          metric: metricNames[j],
          a: names[a],
          b: names[b],
          difference: diff,
          resolved,
          better: resolved ? names[winner] : null,
        });
      }
    }
  }
  return Object.freeze(withDisplay(
    { generators: names, metrics: metricNames, better, values, differences },
    comparisonBundle,
  ));
}

function comparisonBundle(c: GeneratorComparison) {
  const header = ["metric", ...c.generators];
  const rows: TableCell[][] = c.metrics.map((m) => [
    `${m} (${c.better[m]} is better)`,
    ...c.generators.map((g) => c.values.find((v) => v.metric === m && v.generator === g)!.estimate),
  ]);
  const dHeader = ["metric", "a − b", "difference", "verdict"];
  const dRows: TableCell[][] = c.differences.map((d) => [
    d.metric,
    `${d.a} − ${d.b}`,
    d.difference,
    d.resolved ? `${d.better} better` : "unresolved",
  ]);
  return {
    "text/plain": `${textTable(header, rows)}\n\n${textTable(dHeader, dRows)}`,
    "text/html": htmlTable(header, rows, "metrics per generator") +
      htmlTable(dHeader, dRows, "pairwise differences (paired half-sampling)"),
  };
}
