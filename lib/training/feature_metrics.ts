/**
 * Feature-space metrics of checkpoint series, registered by name: "frechet", "mmd",
 * "precision-recall" and "density-coverage" (the defaults for d > 2).
 *
 * @module
 */
import { frechetDistance } from "../divergence/frechet.ts";
import { mmd } from "../divergence/mmd.ts";
import { densityCoverage, precisionRecall } from "../metrics/precision_recall.ts";
import { type CheckpointMetric, registerCheckpointMetric } from "./checkpoint_metrics.ts";

/**
 * The feature-space metrics as checkpoint metrics: Fréchet distance of Gaussian fits
 * (bootstrap interval; Heusel et al. 2017), MMD (Gretton et al. 2012), precision and recall
 * with k = 3 (Kynkäänniemi et al. 2019), density and coverage with k = 5 (Naeem et al.
 * 2020), each with the series' seed, level and replicates.
 *
 * @example
 * ```ts
 * import { FEATURE_CHECKPOINT_METRICS } from "./feature_metrics.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(FEATURE_CHECKPOINT_METRICS.map((m) => m.name), ["frechet", "mmd", "precision-recall", "density-coverage"]);
 * ```
 */
export const FEATURE_CHECKPOINT_METRICS: readonly CheckpointMetric[] = [
  {
    name: "frechet",
    outputs: ["frechet"],
    description: "Fréchet distance of Gaussian fits, bootstrap interval",
    prepare: () => null,
    compute: (_s, fake, c) => ({
      frechet: frechetDistance(c.real, fake, {
        replicates: c.replicates,
        seed: c.seed,
        level: c.level,
      }),
    }),
  },
  {
    name: "mmd",
    outputs: ["mmd"],
    description: "MMD, Gaussian kernel at the median distance",
    prepare: () => null,
    compute: (_s, fake, c) => ({ mmd: mmd(c.real, fake, { seed: c.seed, level: c.level }) }),
  },
  {
    name: "precision-recall",
    outputs: ["precision", "recall"],
    description: "precision and recall of k-NN balls, k = 3",
    prepare: () => null,
    compute: (_s, fake, c) => {
      const pr = precisionRecall(c.real, fake, {
        k: 3,
        replicates: c.replicates,
        seed: c.seed,
        level: c.level,
      });
      return { precision: pr.precision, recall: pr.recall };
    },
  },
  {
    name: "density-coverage",
    outputs: ["density", "coverage"],
    description: "density and coverage, k = 5",
    prepare: () => null,
    compute: (_s, fake, c) => {
      const dc = densityCoverage(c.real, fake, {
        k: 5,
        replicates: c.replicates,
        seed: c.seed,
        level: c.level,
      });
      return { density: dc.density, coverage: dc.coverage };
    },
  },
];

for (const m of FEATURE_CHECKPOINT_METRICS) registerCheckpointMetric(m);
