/**
 * D's mean output on real and on generated samples over the steps, converging to 1/2.
 *
 * @module
 */
import type { TrainingDiagnosis } from "../training/diagnose_training.ts";
import type { TrainingLog } from "../training/training_log.ts";
import type { Figure } from "./figure.ts";
import { trainingCurves, type TrainingPlotOptions } from "./_training.ts";

/**
 * D(real) and D(fake) over the steps (raw faintly, smoothed in bold) with the equilibrium
 * D = 1/2 (Goodfellow et al. 2014, Prop. 1: D* = p_data / (p_data + p_g) = 1/2 when p_g =
 * p_data) and the flags shaded. Takes a diagnosis, or a log.
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Prop. 1.
 *
 * @example
 * ```ts
 * import { plotDiscriminatorOutputs } from "./discriminator_outputs_plot.ts";
 * import { trainingLog } from "../training/training_log.ts";
 * import assert from "node:assert/strict";
 * const step = Array.from({ length: 100 }, (_, i) => 10 * i);
 * const log = trainingLog({ step, d_real: step.map((s) => 0.5 + 0.4 * Math.exp(-s / 200)), d_fake: step.map((s) => 0.5 - 0.4 * Math.exp(-s / 200)) });
 * assert.match(plotDiscriminatorOutputs(log).toSVG(), /D\(real\)/);
 * ```
 */
export function plotDiscriminatorOutputs(
  input: TrainingDiagnosis | TrainingLog,
  options: TrainingPlotOptions = {},
): Figure {
  return trainingCurves(input, options, {
    roles: [
      { role: "dReal", style: "real", label: "D(real)" },
      { role: "dFake", style: "generated", label: "D(fake)" },
    ],
    yLabel: "mean output of D",
    title: "Discriminator outputs converging to 1/2",
    y: { domain: [0, 1] },
  });
}
