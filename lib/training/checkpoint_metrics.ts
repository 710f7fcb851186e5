/**
 * The metric registry of checkpoint series: each metric prepares the real side once and then
 * computes its estimates per checkpoint. Built in: the density-route decomposition (JSD and
 * V(D*, G) with refit-bootstrap intervals) and a trained discriminator's value and gap.
 *
 * @module
 */
import type { Density } from "../density/types.ts";
import { discriminatorGap } from "../discriminator/discriminator_gap.ts";
import type { Estimate } from "../estimate/estimate.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import type { RandomSource } from "../random/rng.ts";
import type { Samples } from "../samples/samples.ts";
import { fitKde } from "../density/kde.ts";
import { decompositionFromSamples } from "../value/sample_decomposition.ts";
import type { OutputScale } from "../discriminator/output_scale.ts";

/** A trained discriminator's outputs at one checkpoint. */
export interface CheckpointScores {
  /** D's outputs on the real set's points, in its row order. */
  readonly real: ArrayLike<number>;
  /** D's outputs on the checkpoint's generated points, in their row order. */
  readonly fake: ArrayLike<number>;
  /** Whether the outputs are probabilities or logits (default "prob"). */
  readonly scale?: OutputScale;
}

/** What a metric is told when it computes one checkpoint. */
export interface CheckpointContext {
  /** The real samples (the same object for every checkpoint). */
  readonly real: Samples;
  /** Seed of the metric's resampling; the same for every checkpoint. */
  readonly seed: RandomSource;
  /** Confidence level of the intervals. */
  readonly level: number;
  /** Bootstrap replicates. */
  readonly replicates: number;
  /** The checkpoint's step. */
  readonly step: number;
  /** The trained discriminator's outputs, when given for this checkpoint. */
  readonly scores?: CheckpointScores;
}

/**
 * A metric of a checkpoint series. `prepare` runs once per series on the real samples
 * (fits, feature statistics, neighbour radii); `compute` runs per checkpoint and returns an
 * estimate for each of `outputs` (or none of them, e.g. when it needs scores that a
 * checkpoint lacks). `version` goes into the cache key: change it when the computation
 * changes.
 */
export interface CheckpointMetric<S = unknown> {
  /** The name used in `metrics: [...]`. */
  readonly name: string;
  /** Names of the estimates it returns ("jsd", "value"...). */
  readonly outputs: readonly string[];
  /** One line for tables and notes. */
  readonly description: string;
  /** Cache-key version (default "1"). */
  readonly version?: string;
  /** Whether it needs a trained discriminator's scores (skipped where none are given). */
  readonly needsScores?: boolean;
  /** The real side's state, computed once. */
  prepare(real: Samples, context: Omit<CheckpointContext, "step" | "scores">): S;
  /** The checkpoint's estimates by output name. */
  compute(state: S, fake: Samples, context: CheckpointContext): Readonly<Record<string, Estimate>>;
}

const REGISTRY = new Map<string, CheckpointMetric>();

/**
 * Add a metric to the registry (or replace one of the same name), so that
 * `checkpointSeries(..., { metrics: [name] })` can use it.
 *
 * @example A sample mean difference as a metric
 * ```ts
 * import { registerCheckpointMetric, checkpointMetric } from "./checkpoint_metrics.ts";
 * import { exact } from "../estimate/estimate.ts";
 * import assert from "node:assert/strict";
 * registerCheckpointMetric({
 *   name: "mean-shift",
 *   outputs: ["meanShift"],
 *   description: "difference of the first coordinate's means",
 *   prepare: (real) => real.data.reduce((a, b) => a + b, 0) / real.n,
 *   compute: (mu, fake) => ({ meanShift: exact(fake.data.reduce((a, b) => a + b, 0) / fake.n - mu) }),
 * });
 * assert.equal(checkpointMetric("mean-shift").outputs[0], "meanShift");
 * ```
 */
export function registerCheckpointMetric<S>(metric: CheckpointMetric<S>): void {
  if (
    !metric || typeof metric.name !== "string" || metric.name === "" ||
    typeof metric.prepare !== "function" || typeof metric.compute !== "function" ||
    !Array.isArray(metric.outputs) || metric.outputs.length === 0
  ) {
    throw new SaddleError(
      "invalid-argument",
      "a checkpoint metric needs a name, outputs, prepare(real, context) and " +
        "compute(state, fake, context)",
      { parameter: "metric" },
    );
  }
  REGISTRY.set(metric.name, metric as CheckpointMetric);
}

/**
 * The registered metric of that name; the error lists the registered names.
 *
 * @example
 * ```ts
 * import { checkpointMetric } from "./checkpoint_metrics.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(checkpointMetric("decomposition").outputs, ["jsd", "value"]);
 * ```
 */
export function checkpointMetric(name: string): CheckpointMetric {
  const m = REGISTRY.get(name);
  if (!m) {
    throw new SaddleError(
      "not-found",
      `no checkpoint metric "${name}"; registered: ${[...REGISTRY.keys()].join(", ")}` +
        " (add one with registerCheckpointMetric)",
      { parameter: "metrics" },
    );
  }
  return m;
}

/**
 * Names of the registered metrics.
 *
 * @example
 * ```ts
 * import { checkpointMetricNames } from "./checkpoint_metrics.ts";
 * import assert from "node:assert/strict";
 * assert.ok(checkpointMetricNames().includes("discriminator"));
 * ```
 */
export function checkpointMetricNames(): string[] {
  return [...REGISTRY.keys()];
}

/**
 * A fitter that remembers its fits by the content of the samples, so the real side and
 * each of its bootstrap resamples (which depend only on the seed and the replicate) are
 * fitted once for a whole series. Fits not asked for during the last checkpoint are
 * dropped, so memory stays at about two checkpoints' worth.
 */
class FitMemo {
  readonly #fit: (s: Samples) => Density;
  readonly #map = new Map<string, { density: Density; generation: number }>();
  #generation = 0;
  hits = 0;
  misses = 0;
  constructor(fit: (s: Samples) => Density) {
    this.#fit = fit;
  }
  readonly fit = (s: Samples): Density => {
    const key = contentKey(s);
    const hit = this.#map.get(key);
    if (hit) {
      hit.generation = this.#generation;
      this.hits++;
      return hit.density;
    }
    this.misses++;
    const density = this.#fit(s);
    this.#map.set(key, { density, generation: this.#generation });
    return density;
  };
  /** End of a checkpoint: drop what it did not use. */
  next(): void {
    for (const [k, v] of this.#map) if (v.generation < this.#generation) this.#map.delete(k);
    this.#generation++;
  }
}

/** Two 32-bit FNV-1a hashes (different offsets) of the shape and the bytes. */
function contentKey(s: Samples): string {
  const words = new Uint32Array(s.data.buffer, s.data.byteOffset, s.data.length * 2);
  let a = 0x811c9dc5 ^ s.n, b = 0x01000193 ^ s.d;
  for (let i = 0; i < words.length; i++) {
    a = Math.imul(a ^ words[i], 0x01000193);
    b = Math.imul(b ^ words[i], 0x0100019d) ^ (b >>> 15);
  }
  return `${s.n}x${s.d}:${(a >>> 0).toString(36)}:${(b >>> 0).toString(36)}`;
}

/** Options of the built-in density-route metrics. */
export interface DensityRouteOptions {
  /** Fitter of both sides and every resample (default: Gaussian KDE, Scott's rule). */
  fit?: (s: Samples) => Density;
}

/**
 * The decomposition metric: `jsd` and `value` = V(D*, G) from
 * `decompositionFromSamples` (refit bootstrap: the interval includes the data's sampling
 * error), with the real side's fits made once for the series.
 *
 * @example
 * ```ts
 * import { decompositionMetric } from "./checkpoint_metrics.ts";
 * import assert from "node:assert/strict";
 * assert.equal(decompositionMetric().name, "decomposition");
 * ```
 */
export function decompositionMetric(
  options: DensityRouteOptions = {},
): CheckpointMetric {
  const metric: CheckpointMetric<FitMemo> = {
    name: "decomposition",
    outputs: ["jsd", "value"],
    description: "JSD(p_data, p_g) and V(D*, G) = -ln 4 + 2 JSD, density route, refit bootstrap",
    version: `1${options.fit ? `:${options.fit.name || "user fitter"}` : ""}`,
    prepare: () => new FitMemo(options.fit ?? scott),
    compute: (memo, fake, ctx) => {
      const dec = decompositionFromSamples(ctx.real, fake, {
        fit: memo.fit,
        replicates: ctx.replicates,
        seed: ctx.seed,
        level: ctx.level,
      });
      memo.next();
      return { jsd: dec.jsd, value: dec.value };
    },
  };
  // The state's type is private: callers hand it back to compute unseen.
  return metric as unknown as CheckpointMetric;
}

function scott(s: Samples): Density {
  return fitKde(s, { bandwidth: "scott" });
}

/**
 * The trained-discriminator metric, for checkpoints with scores: `dValue` = V(D, G) of the
 * trained D and `gap` = V(D*, G) - V(D, G) on the same points, D* from the two fitted
 * densities (paired bootstrap interval, `discriminatorGap`).
 *
 * @example
 * ```ts
 * import { discriminatorMetric } from "./checkpoint_metrics.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(discriminatorMetric().outputs, ["dValue", "gap"]);
 * ```
 */
export function discriminatorMetric(
  options: DensityRouteOptions = {},
): CheckpointMetric<{ fit: (s: Samples) => Density; pData: Density }> {
  return {
    name: "discriminator",
    outputs: ["dValue", "gap"],
    description: "trained D: V(D, G) and the gap V(D*, G) - V(D, G) on the same points",
    version: `1${options.fit ? `:${options.fit.name || "user fitter"}` : ""}`,
    needsScores: true,
    prepare: (real) => {
      const fit = options.fit ?? scott;
      return { fit, pData: fit(real) };
    },
    compute: (st, fake, ctx) => {
      const sc = ctx.scores;
      if (!sc) return {};
      const g = discriminatorGap({
        dReal: sc.real,
        dFake: sc.fake,
        scale: sc.scale ?? "prob",
        real: ctx.real,
        fake,
        pData: st.pData,
        pModel: st.fit(fake),
        seed: ctx.seed,
        replicates: ctx.replicates,
        level: ctx.level,
      });
      return { dValue: g.value, ...(g.gap ? { gap: g.gap } : {}) };
    },
  };
}

registerCheckpointMetric(decompositionMetric());
registerCheckpointMetric(discriminatorMetric());
