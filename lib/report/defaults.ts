/**
 * Defaults chosen by the data: which density route (KDE, a BIC-selected mixture, or none),
 * Monte Carlo sizes, bootstrap replicates and seeds, each with the reason it was chosen,
 * recorded in summary.json.
 *
 * @module
 */
import { SaddleError } from "../errors/mod.ts";

/** Caller's overrides of the data-driven defaults. */
export interface PlanOptions {
  /** Base seed of every random step (default 2026). Sections derive `seed:section`. */
  seed?: number;
  /** Confidence level of every interval (default 0.95). */
  level?: number;
  /** Refit-bootstrap replicates of the density route (default 100). */
  replicates?: number;
  /** Rows a side the density route uses at most (default 5000; a seeded subsample above). */
  maxDensityRows?: number;
  /** Bootstrap replicates of each checkpoint's metrics (default 20). */
  checkpointReplicates?: number;
  /** Half-sample replicates of the comparison of several generators (default 50). */
  comparisonReplicates?: number;
}

/** How the density-based quantities are computed, or why they are not. */
export type DensityRoute =
  | {
    readonly kind: "kde";
    readonly bandwidth: "scott";
    readonly integration: "grid" | "monte-carlo";
    readonly reason: string;
  }
  | {
    readonly kind: "mixture";
    readonly components: readonly [number, number];
    readonly criterion: "bic";
    readonly integration: "monte-carlo";
    readonly reason: string;
  }
  | { readonly kind: "none"; readonly reason: string };

/** Everything chosen before the run, recorded under `plan` in summary.json. */
export interface ReportPlan {
  /** Base seed. */
  readonly seed: number;
  /** Confidence level. */
  readonly level: number;
  /** Dimension of the data. */
  readonly d: number;
  /** Rows of each side. */
  readonly n: { readonly real: number; readonly fake: number };
  /** The density route. */
  readonly density: DensityRoute;
  /** Refit-bootstrap replicates of the density route. */
  readonly replicates: number;
  /** Rows a side the density route uses (a seeded subsample when the data have more). */
  readonly densityRows: number;
  /** Bootstrap replicates of the sample statistics (Gaussian fits, the discriminator). */
  readonly sampleReplicates: number;
  /** Largest d for which Gaussian fits of both sides are compared in closed form. */
  readonly gaussianMaxD: number;
  /** Monte Carlo draws a density for d > 2 (each replicate). */
  readonly monteCarloDraws: number;
  /** Rows a side the pairwise feature-space metrics and tests use at most. */
  readonly metricRows: number;
  /** Bootstrap replicates of the Fréchet distance (each a covariance and an eigensolve). */
  readonly frechetReplicates: number;
  /** Random relabellings of the MMD permutation test. */
  readonly permutations: number;
  /** Bootstrap replicates of each checkpoint's metrics (`--checkpoints`). */
  readonly checkpointReplicates: number;
  /** Half-sample replicates of the comparison of several generators. */
  readonly comparisonReplicates: number;
  /** Neighbours k of the k-NN metrics: precision/recall and density/coverage. */
  readonly metricK: { readonly precisionRecall: number; readonly densityCoverage: number };
  /** Why each choice was made. */
  readonly reasons: readonly string[];
}

function atLeastTen(v: number, what: string, parameter: string): number {
  if (!Number.isInteger(v) || v < 10) {
    throw new SaddleError("invalid-argument", `${what} must be a whole number >= 10, got ${v}`, {
      parameter,
    });
  }
  return v;
}

/** Largest d with a KDE route. */
export const KDE_MAX_D = 3;
/** Largest d with any density route: above it densities are not estimated. */
export const DENSITY_MAX_D = 10;

/**
 * Choose the methods from the data's size and dimension:
 * - density route: a Gaussian KDE (Scott's rule) for d ≤ 3, a Gaussian mixture with 1–5
 *   components chosen by BIC for 3 < d ≤ 10, none above (density estimates degrade in high
 *   dimension), and none when a side has fewer than max(20, 5·(d+1)) rows;
 * - integration on a grid for d ≤ 2, Monte Carlo (2000 draws a density) above;
 * - 100 refit replicates, on at most 5000 rows a side (a seeded subsample above);
 * - Gaussian closed forms for d ≤ 64 when each side has more than d + 1 rows;
 * - feature-space metrics for every d: the pairwise ones (MMD, energy, sliced Wasserstein,
 *   k-NN precision/recall with k = 3 and density/coverage with k = 5, the two-sample tests
 *   with 200 permutations) on a seeded subsample of at most 2000 rows a side, the Fréchet
 *   distance on all rows with 100 bootstrap replicates for d ≤ 64, 30 for d ≤ 512, 10 above.
 *
 * @example
 * ```ts
 * import { choosePlan } from "./defaults.ts";
 * import assert from "node:assert/strict";
 * assert.equal(choosePlan({ d: 2, nReal: 2000, nFake: 2000 }).density.kind, "kde");
 * assert.equal(choosePlan({ d: 8, nReal: 2000, nFake: 2000 }).density.kind, "mixture");
 * assert.equal(choosePlan({ d: 64, nReal: 2000, nFake: 2000 }).density.kind, "none");
 * ```
 */
export function choosePlan(
  data: { d: number; nReal: number; nFake: number },
  options: PlanOptions = {},
): ReportPlan {
  const { d, nReal, nFake } = data;
  const seed = options.seed ?? 2026;
  const level = options.level ?? 0.95;
  const replicates = options.replicates ?? 100;
  const maxRows = options.maxDensityRows ?? 5000;
  if (!Number.isSafeInteger(seed) || seed < 0) {
    throw new SaddleError("invalid-argument", `seed must be a whole number >= 0, got ${seed}`, {
      parameter: "--seed",
    });
  }
  if (!Number.isInteger(replicates) || replicates < 10) {
    throw new SaddleError(
      "invalid-argument",
      `replicates must be a whole number >= 10, got ${replicates}`,
      { parameter: "--replicates" },
    );
  }
  if (!(level > 0 && level < 1)) {
    throw new SaddleError("invalid-argument", `level must be in (0, 1), got ${level}`, {
      parameter: "--level",
    });
  }
  if (!Number.isInteger(maxRows) || maxRows < 20) {
    throw new SaddleError("invalid-argument", `max density rows must be >= 20, got ${maxRows}`, {
      parameter: "maxDensityRows",
    });
  }
  const reasons: string[] = [];
  const nMin = Math.min(nReal, nFake);
  const needed = Math.max(20, 5 * (d + 1));
  let density: DensityRoute;
  if (d > DENSITY_MAX_D) {
    density = {
      kind: "none",
      reason: `d = ${d} > ${DENSITY_MAX_D}: density estimates (and D*, the value at the optimum ` +
        "and f-divergences between them) degrade in high dimension and are not computed",
    };
  } else if (nMin < needed) {
    density = {
      kind: "none",
      reason: `a side has ${nMin} rows, fewer than ${needed} = max(20, 5(d + 1)): too few to fit ` +
        "a density",
    };
  } else if (d <= KDE_MAX_D) {
    density = {
      kind: "kde",
      bandwidth: "scott",
      integration: d <= 2 ? "grid" : "monte-carlo",
      reason: `d = ${d} ≤ ${KDE_MAX_D}: Gaussian KDE with Scott's rule on each side`,
    };
  } else {
    density = {
      kind: "mixture",
      components: [1, 5],
      criterion: "bic",
      integration: "monte-carlo",
      reason: `${KDE_MAX_D} < d = ${d} ≤ ${DENSITY_MAX_D}: a KDE is a poor density estimate ` +
        "here; a full-covariance Gaussian mixture with 1–5 components chosen by BIC on each side",
    };
  }
  reasons.push(density.reason);
  const densityRows = Math.min(maxRows, Math.max(nReal, nFake));
  if (density.kind !== "none") {
    reasons.push(
      `refit bootstrap with ${replicates} replicates` +
        (Math.max(nReal, nFake) > maxRows
          ? `, on a seeded subsample of ${maxRows} rows a side (more rows make each replicate ` +
            "slower and the interval only slightly narrower)"
          : ""),
    );
    reasons.push(
      density.integration === "grid"
        ? "integration on a grid (500 cells in 1-D, 48 × 48 in 2-D)"
        : "Monte Carlo integration with 2000 draws a density in each replicate",
    );
  }
  const gaussianMaxD = 64;
  reasons.push(
    `Gaussian fits compared in closed form for d ≤ ${gaussianMaxD} (each side needs more than ` +
      "d + 1 rows); 200 bootstrap replicates",
  );
  const metricRows = 2000;
  const frechetReplicates = d <= 64 ? 100 : d <= 512 ? 30 : 10;
  reasons.push(
    `feature-space metrics for every d: pairwise ones (MMD, energy, sliced Wasserstein, k-NN ` +
      `precision/recall with k = 3, density/coverage with k = 5, tests) on at most ${metricRows} ` +
      `rows a side; the Fréchet distance on all rows with ${frechetReplicates} bootstrap ` +
      `replicates (fewer for larger d: each costs a d × d covariance and an eigensolve); ` +
      "200 permutations for the MMD test",
  );
  const checkpointReplicates = atLeastTen(
    options.checkpointReplicates ?? 20,
    "checkpoint replicates",
    "--checkpoint-replicates",
  );
  const comparisonReplicates = atLeastTen(
    options.comparisonReplicates ?? 50,
    "comparison replicates",
    "comparisonReplicates",
  );
  reasons.push(
    `several generators (when given): compared on the same seeded subsample of at most ` +
      `${metricRows} rows a side with ${comparisonReplicates} half-sample replicates`,
  );
  reasons.push(
    `checkpoints (when given): ${checkpointReplicates} bootstrap replicates each (a series of ` +
      "many checkpoints multiplies the cost; the trend matters more than each interval)",
  );
  reasons.push(`seed ${seed}; each section draws from the seed "${seed}:<section id>"`);
  return {
    seed,
    level,
    d,
    n: { real: nReal, fake: nFake },
    density,
    replicates,
    densityRows,
    sampleReplicates: 200,
    gaussianMaxD,
    monteCarloDraws: 2000,
    metricRows,
    frechetReplicates,
    permutations: 200,
    metricK: { precisionRecall: 3, densityCoverage: 5 },
    checkpointReplicates,
    comparisonReplicates,
    reasons,
  };
}
