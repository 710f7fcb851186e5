/**
 * The GAN value function `V(D, G) = E_data[ln D(x)] + E_g[ln(1 - D(G(z)))]` from a
 * discriminator and two sample sets, or from a trained discriminator's outputs.
 *
 * @module
 */
import { logSigmoid } from "../math/log_space.ts";
import type { OptimalDiscriminator } from "../discriminator/optimal_discriminator.ts";
import type { Discriminator } from "../discriminator/types.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import type { Estimate } from "../estimate/estimate.ts";
import type { RandomSource } from "../random/rng.ts";
import { assertSameDimension, type Samples } from "../samples/samples.ts";
import { twoSampleSum } from "../estimate/two_sample.ts";
import {
  OUTPUT_EPSILON,
  type OutputScale,
  outputsToLogits,
} from "../discriminator/output_scale.ts";

/** Statistical options shared by the value-function estimators. */
export interface ValueOptions {
  /** Confidence level (default 0.95). */
  level?: number;
  /** Seed of the bootstrap interval (default 0). */
  seed?: RandomSource;
  /** Bootstrap replicates (default 1000). */
  replicates?: number;
  /** Clip for probabilities of exactly 0 or 1 (default {@linkcode OUTPUT_EPSILON}). */
  epsilon?: number;
}

/** A discriminator given as an object with `logit`/`prob`, or a function of a batch. */
export type DiscriminatorLike = Discriminator | ((x: Samples) => ArrayLike<number>);

/** Input of {@linkcode valueFunction}: a discriminator with both sample sets... */
export interface ValueFromDiscriminator extends ValueOptions {
  /** Real samples. */
  real: Samples;
  /** Generated samples. */
  fake: Samples;
  /** The discriminator; a plain function is read on `scale` (default "prob"). */
  discriminator: DiscriminatorLike;
  /** Scale of a plain function's outputs (default "prob"). */
  scale?: OutputScale;
}

/** ...or a trained discriminator's outputs on real and generated samples. */
export interface ValueFromOutputs extends ValueOptions {
  /** Outputs on the real samples (numbers, or a one-column Samples as read from a file). */
  dReal: ArrayLike<number> | Samples;
  /** Outputs on the generated samples. */
  dFake: ArrayLike<number> | Samples;
  /** Whether the outputs are probabilities or logits. */
  scale: OutputScale;
}

/** Per-sample terms of the value function. */
export interface ValueTerms {
  /** `ln D(x)` on each real sample. */
  readonly real: Float64Array;
  /** `ln(1 - D(x))` on each generated sample. */
  readonly fake: Float64Array;
  /** Logits of D on the real samples. */
  readonly logitReal: Float64Array;
  /** Logits of D on the generated samples. */
  readonly logitFake: Float64Array;
  /** Clipping counts and other caveats. */
  readonly notes: readonly string[];
}

function discriminatorLogits(
  disc: DiscriminatorLike,
  x: Samples,
  scale: OutputScale,
  name: string,
  epsilon: number,
): { logit: Float64Array; clipped: number; notes: string[] } {
  if (x.n === 0) {
    throw new SaddleError("empty", `${name} has no points`, { parameter: name });
  }
  let values: ArrayLike<number>;
  const notes: string[] = [];
  if (typeof disc === "function") values = disc(x);
  else if (isOptimal(disc)) {
    // D* reports the points outside both supports (set to 1/2) in its evaluation notes.
    const ev = disc.evaluate(x);
    values = ev.logit;
    notes.push(...ev.notes.map((n) => `${name}: ${n}`));
  } else values = disc.logit(x);
  if (values.length !== x.n) {
    throw new SaddleError(
      "dimension-mismatch",
      `the discriminator returned ${values.length} outputs for ${x.n} ${name} points`,
      { parameter: "discriminator" },
    );
  }
  return {
    ...outputsToLogits(values, typeof disc === "function" ? scale : "logit", name, epsilon),
    notes,
  };
}

function isOptimal(d: Discriminator): d is OptimalDiscriminator {
  return typeof (d as Partial<OptimalDiscriminator>).evaluate === "function";
}

/**
 * The per-sample terms `ln D(x)` on real and `ln(1 - D(x))` on generated points, computed
 * from logits as `-softplus(-l)` and `-softplus(l)` (never `log 0` for a finite logit).
 *
 * @example
 * ```ts
 * import { valueFunctionTerms } from "./value_function.ts";
 * import assert from "node:assert/strict";
 * const t = valueFunctionTerms({ dReal: [0], dFake: [0], scale: "logit" });
 * assert.equal(t.real[0], Math.log(0.5));
 * ```
 */
export function valueFunctionTerms(input: ValueFromDiscriminator | ValueFromOutputs): ValueTerms {
  const epsilon = input.epsilon ?? OUTPUT_EPSILON;
  let r: { logit: Float64Array; clipped: number; notes?: string[] };
  let f: { logit: Float64Array; clipped: number; notes?: string[] };
  if ("discriminator" in input) {
    assertSameDimension(input.real, input.fake, "real", "fake");
    const scale = input.scale ?? "prob";
    r = discriminatorLogits(input.discriminator, input.real, scale, "real", epsilon);
    f = discriminatorLogits(input.discriminator, input.fake, scale, "fake", epsilon);
  } else {
    r = outputsToLogits(input.dReal, input.scale, "dReal", epsilon);
    f = outputsToLogits(input.dFake, input.scale, "dFake", epsilon);
  }
  const real = r.logit.map(logSigmoid);
  const fake = f.logit.map((l) => logSigmoid(-l));
  const notes: string[] = [...(r.notes ?? []), ...(f.notes ?? [])];
  if (r.clipped + f.clipped > 0) {
    notes.push(
      `${r.clipped} real and ${f.clipped} generated outputs were exactly 0 or 1 and were ` +
        `clipped to [${epsilon}, 1 - ${epsilon}]; pass logits to keep their evidence`,
    );
  }
  return { real, fake, logitReal: r.logit, logitFake: f.logit, notes };
}

/**
 * The value function `V(D, G) = E_data[ln D(x)] + E_g[ln(1 - D(G(z)))]` (Goodfellow et
 * al. 2014, eq. 1) as an Estimate in nats: the sum of two independent sample means, se² =
 * s_r²/n_r + s_f²/n_f, and a seeded percentile-bootstrap interval that resamples each side.
 *
 * Give either `{ real, fake, discriminator }` or `{ dReal, dFake, scale }`. Logits are
 * used through the log-sigmoid (no clipping); probabilities of exactly 0 or 1 are clipped
 * at `epsilon` (default 1e-7) and counted in the notes. Probabilities outside [0, 1],
 * NaN outputs and empty sides throw. For D = 1/2 everywhere, V = -ln 4.
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS).
 *
 * @example From a trained discriminator's probabilities
 * ```ts
 * import { valueFunction } from "./value_function.ts";
 * import assert from "node:assert/strict";
 * const v = valueFunction({ dReal: [0.5, 0.5], dFake: [0.5, 0.5], scale: "prob" });
 * assert.ok(Math.abs(v.value + Math.log(4)) < 1e-15);
 * const w = valueFunction({ dReal: [0.9, 0.8, 1], dFake: [0.1, 0.3, 0.2], scale: "prob" });
 * assert.match(w.notes[0], /1 real and 0 generated outputs were exactly 0 or 1/);
 * ```
 */
export function valueFunction(input: ValueFromDiscriminator | ValueFromOutputs): Estimate {
  const t = valueFunctionTerms(input);
  return twoSampleSum(t.real, t.fake, {
    level: input.level,
    seed: input.seed ?? 0,
    replicates: input.replicates,
    unit: "nats",
    notes: t.notes,
  });
}
