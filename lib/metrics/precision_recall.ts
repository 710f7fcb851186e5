/**
 * Fidelity and diversity of generated samples from k-NN balls: precision and recall
 * (Kynkäänniemi et al. 2019), density and coverage (Naeem et al. 2020).
 *
 * @module
 */
import { bootstrap, type Estimate, makeEstimate } from "../estimate/mod.ts";
import { htmlTable, textTable, withDisplay } from "../display/mod.ts";
import { ballCounts, kNearest, kNearestSelf } from "../neighbors/mod.ts";
import type { RandomSource } from "../random/mod.ts";
import type { Samples, SamplesInput } from "../samples/mod.ts";
import { metricPair } from "./_inputs.ts";

/** Options of {@linkcode precisionRecall} and {@linkcode densityCoverage}. */
export interface ManifoldOptions {
  /** Neighbour order of the balls (default 3 for precision/recall, 5 for density/coverage). */
  k?: number;
  /** Bootstrap replicates of the intervals (default 200). */
  replicates?: number;
  /** Confidence level (default 0.95). */
  level?: number;
  /** Seed of the bootstrap (default 0). */
  seed?: RandomSource;
}

/** Precision and recall of generated samples, with the per-point memberships behind them. */
export interface PrecisionRecall {
  /** Share of generated points inside the real k-NN manifold. */
  readonly precision: Estimate;
  /** Share of real points inside the generated k-NN manifold. */
  readonly recall: Estimate;
  /** Neighbour order. */
  readonly k: number;
  /** Per generated point: inside the real manifold (1) or not (0). */
  readonly fakeInReal: Uint8Array;
  /** Per real point: inside the generated manifold (1) or not (0). */
  readonly realInFake: Uint8Array;
}

/**
 * Improved precision and recall: the real manifold is the union of balls around each real
 * point with radius its distance to its k-th nearest other real point; precision is the
 * share of generated points inside it, and recall the share of real points inside the
 * generated manifold built the same way. Intervals: percentile bootstrap of the points being
 * scored, the manifold held fixed (method "bootstrap-percentile"; the manifold's own
 * sampling error is not included). Identical distributions give values near 1 (below 1 for
 * small n); duplicates give zero-radius balls, which count only exact repeats.
 *
 * References: Kynkäänniemi, Karras, Laine, Lehtinen & Aila 2019, Improved precision and
 * recall metric for assessing generative models (NeurIPS); Efron 1979.
 *
 * @example
 * ```ts
 * import { precisionRecall } from "./precision_recall.ts";
 * import assert from "node:assert/strict";
 * const real = [[0], [1], [2], [3], [4], [5]];
 * const fake = [[0.5], [1.5], [2.5], [30], [31], [32]];
 * const pr = precisionRecall(real, fake, { k: 2, replicates: 20 });
 * assert.equal(pr.precision.value, 0.5);
 * ```
 */
export function precisionRecall(
  real: SamplesInput,
  fake: SamplesInput,
  options: ManifoldOptions = {},
): PrecisionRecall {
  const k = options.k ?? 3;
  const [r, f] = metricPair(real, fake, k);
  const rr = kthDistances(r, k), fr = kthDistances(f, k);
  const fakeInReal = indicator(ballCounts(r, rr, f));
  const realInFake = indicator(ballCounts(f, fr, r));
  const precision = shareEstimate(fakeInReal, options, "fake", 0);
  const recall = shareEstimate(realInFake, options, "real", 1);
  return Object.freeze(withDisplay(
    { precision, recall, k, fakeInReal, realInFake },
    () =>
      table(`precision and recall, k = ${k} (Kynkäänniemi et al. 2019)`, [
        ["precision", precision],
        ["recall", recall],
      ]),
  ));
}

/** Density and coverage of generated samples. */
export interface DensityCoverage {
  /** Mean number of real balls containing a generated point, divided by k (1 when equal). */
  readonly density: Estimate;
  /** Share of real balls that contain at least one generated point. */
  readonly coverage: Estimate;
  /** Neighbour order. */
  readonly k: number;
}

/**
 * Density and coverage: with the same real k-NN balls as {@linkcode precisionRecall},
 * density is `(1/(k M)) Σ_j #{i : y_j ∈ B(x_i, r_i)}` over the M generated points (expected
 * value 1 when the distributions are equal, above 1 where generated points crowd the real
 * modes) and coverage the share of real points whose ball contains a generated point
 * (expected `1 − 2^−k` for equal distributions and large equal sizes, by Naeem et al.'s
 * Lemma). Intervals: percentile bootstrap of the generated points (density) and of the real
 * balls (coverage), the balls held fixed (method "bootstrap-percentile").
 *
 * References: Naeem, Oh, Uh, Choi & Yoo 2020, Reliable fidelity and diversity metrics for
 * generative models (ICML); Efron 1979.
 *
 * @example
 * ```ts
 * import { densityCoverage } from "./precision_recall.ts";
 * import assert from "node:assert/strict";
 * const real = [[0], [1], [2], [3], [4], [5], [6]];
 * const dc = densityCoverage(real, [[100], [101], [102]], { k: 2, replicates: 20 });
 * assert.equal(dc.coverage.value, 0);
 * ```
 */
export function densityCoverage(
  real: SamplesInput,
  fake: SamplesInput,
  options: ManifoldOptions = {},
): DensityCoverage {
  const k = options.k ?? 5;
  const [r, f] = metricPair(real, fake, k);
  const rr = kthDistances(r, k);
  const counts = ballCounts(r, rr, f);
  const perFake = Float64Array.from(counts, (c) => c / k);
  const nearest = kNearest(f, r, { k: 1 }).distances;
  const covered = new Uint8Array(r.n);
  for (let i = 0; i < r.n; i++) covered[i] = nearest[i] <= rr[i] ? 1 : 0;
  const density = shareEstimate(perFake, options, "fake", 0);
  const coverage = shareEstimate(covered, options, "real", 1);
  return Object.freeze(withDisplay(
    { density, coverage, k },
    () =>
      table(`density and coverage, k = ${k} (Naeem et al. 2020)`, [
        ["density", density],
        ["coverage", coverage],
      ]),
  ));
}

/** Distance from each point to its k-th nearest other point of the same set. */
export function kthDistances(s: Samples, k: number): Float64Array {
  const nb = kNearestSelf(s, { k });
  const out = new Float64Array(s.n);
  for (let i = 0; i < s.n; i++) out[i] = nb.distances[i * k + k - 1];
  return out;
}

function indicator(counts: Int32Array): Uint8Array {
  return Uint8Array.from(counts, (c) => (c > 0 ? 1 : 0));
}

function shareEstimate(
  values: ArrayLike<number>,
  options: ManifoldOptions,
  set: string,
  stream: number,
): Estimate {
  const mean = (idx: Uint32Array) => {
    let s = 0;
    for (let i = 0; i < idx.length; i++) s += values[idx[i]];
    return s / idx.length;
  };
  const e = bootstrap(values.length, mean, {
    replicates: options.replicates ?? 200,
    level: options.level ?? 0.95,
    seed: `${seedText(options.seed)}/${stream}`,
    unit: "none",
  });
  return withNote(e, `${set} points resampled, k-NN balls held fixed`);
}

function seedText(seed: RandomSource | undefined): string {
  if (seed === undefined) return "0";
  return typeof seed === "object" ? String(seed.seed) : String(seed);
}

function withNote(e: Estimate, note: string): Estimate {
  return makeEstimate({ ...e, notes: [...e.notes, note] });
}

function table(caption: string, rows: [string, Estimate][]) {
  return {
    "text/plain": `${caption}\n${textTable(["metric", "value"], rows)}`,
    "text/html": htmlTable(["metric", "value"], rows, caption),
  };
}
