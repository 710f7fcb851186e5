/**
 * The two generator objectives of the GAN game and their gradients with respect to the
 * discriminator's logit on generated samples: why the minimax one saturates.
 *
 * @module
 */
import { logSigmoid, sigmoid } from "../math/log_space.ts";
import { type MimeBundle, withDisplay } from "../display/display.ts";
import { type Estimate, meanEstimate } from "../estimate/estimate.ts";
import { htmlTable, textTable } from "../display/table.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import type { Samples } from "../samples/samples.ts";
import {
  OUTPUT_EPSILON,
  type OutputScale,
  outputsToLogits,
} from "../discriminator/output_scale.ts";

/** Options of {@linkcode generatorObjectives}. */
export interface GeneratorObjectivesOptions {
  /**
   * Whether `dFake` holds probabilities or logits. Required: read on the wrong scale, a
   * probability of 0.9 would pass for a logit of 0.9 without any error.
   */
  scale: OutputScale;
  /** Confidence level (default 0.95). */
  level?: number;
  /** Clip for probabilities of exactly 0 or 1 (default 1e-7). */
  epsilon?: number;
}

/** Both generator objectives on a batch of generated samples. */
export interface GeneratorObjectives {
  /** The non-saturating loss `-E_g[ln D(G(z))]` (to be minimised). */
  readonly nonSaturating: Estimate;
  /** The minimax objective `E_g[ln(1 - D(G(z)))]` (minimised by the generator). */
  readonly minimax: Estimate;
  /** Per-sample `d/dl [-ln sigmoid(l)] = -sigmoid(-l)`: stays near -1 when D rejects. */
  readonly gradNonSaturating: Float64Array;
  /** Per-sample `d/dl [ln(1 - sigmoid(l))] = -sigmoid(l)`: vanishes when D rejects. */
  readonly gradMinimax: Float64Array;
  /** Mean absolute gradients: `{ nonSaturating, minimax }`. */
  readonly meanAbsGradient: { readonly nonSaturating: number; readonly minimax: number };
  /** Caveats (clipped outputs). */
  readonly notes: readonly string[];
}

/**
 * The minimax generator objective `E_g[ln(1 - D(G(z)))]` and the non-saturating loss
 * `-E_g[ln D(G(z))]` (Goodfellow et al. 2014, sec. 3), each an Estimate in nats, with their
 * per-sample gradients with respect to the discriminator's logit `l` on each generated
 * point. When the discriminator confidently rejects the generated samples (l → -∞) the
 * minimax gradient `-sigmoid(l)` vanishes while the non-saturating one `-sigmoid(-l)`
 * tends to -1: that is why the minimax objective saturates early in training.
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), sec. 3.
 *
 * @example A confident discriminator
 * ```ts
 * import { generatorObjectives } from "./generator_objectives.ts";
 * import assert from "node:assert/strict";
 * const g = generatorObjectives([-8, -9, -10], { scale: "logit" });
 * assert.ok(g.meanAbsGradient.minimax < 1e-3);
 * assert.ok(g.meanAbsGradient.nonSaturating > 0.999);
 * ```
 */
export function generatorObjectives(
  dFake: ArrayLike<number> | Samples,
  options: GeneratorObjectivesOptions,
): GeneratorObjectives {
  if (options === null || typeof options !== "object") {
    throw new SaddleError(
      "invalid-argument",
      "options are required: say whether dFake holds probabilities or logits, e.g. " +
        '{ scale: "prob" } or { scale: "logit" }',
      { parameter: "options" },
    );
  }
  const epsilon = options.epsilon ?? OUTPUT_EPSILON;
  const { logit, clipped } = outputsToLogits(dFake, options.scale, "dFake", epsilon);
  const n = logit.length;
  const ns = new Float64Array(n), mm = new Float64Array(n);
  const gNs = new Float64Array(n), gMm = new Float64Array(n);
  let aNs = 0, aMm = 0;
  for (let i = 0; i < n; i++) {
    const l = logit[i];
    ns[i] = -logSigmoid(l);
    mm[i] = logSigmoid(-l);
    gNs[i] = -sigmoid(-l);
    gMm[i] = -sigmoid(l);
    aNs += -gNs[i];
    aMm += -gMm[i];
  }
  const notes = clipped > 0
    ? [`${clipped} outputs were exactly 0 or 1 and were clipped to [${epsilon}, 1 - ${epsilon}]`]
    : [];
  const opt = { level: options.level, method: "sample mean", unit: "nats" as const, notes };
  return withDisplay({
    nonSaturating: meanEstimate(ns, opt),
    minimax: meanEstimate(mm, opt),
    gradNonSaturating: gNs,
    gradMinimax: gMm,
    meanAbsGradient: { nonSaturating: aNs / n, minimax: aMm / n },
    notes,
  }, objectivesBundle);
}

function objectivesBundle(g: GeneratorObjectives): MimeBundle {
  const header = ["generator objective", "estimate (nats)", "mean |d/dlogit|"];
  const rows = [
    ["non-saturating  -E_g[ln D(G(z))]", g.nonSaturating, g.meanAbsGradient.nonSaturating],
    ["minimax  E_g[ln(1 - D(G(z)))]", g.minimax, g.meanAbsGradient.minimax],
  ];
  const caption = `generator objectives on n = ${g.gradMinimax.length} generated samples` +
    (g.notes.length ? `; ${g.notes.join("; ")}` : "");
  return {
    "text/plain": `${caption}\n${textTable(header, rows)}`,
    "text/html": htmlTable(header, rows, caption),
  };
}
