/**
 * Loss curves of a training run with their equilibrium values and the flagged spans.
 *
 * @module
 */
import type { TrainingDiagnosis } from "../training/diagnose_training.ts";
import type { TrainingLog } from "../training/training_log.ts";
import type { Figure } from "./figure.ts";
import { trainingCurves, type TrainingPlotOptions } from "./_training.ts";

/**
 * The discriminator and generator losses over the steps (raw faintly, smoothed in bold)
 * with their equilibrium values, 2 ln 2 for D's summed binary cross-entropy and ln 2 for
 * the non-saturating generator loss (Goodfellow et al. 2014, Thm. 1), and every flag of
 * the diagnosis shaded from its step to its end. Takes a diagnosis, or a log (diagnosed
 * with the default thresholds).
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Thm. 1.
 *
 * @example
 * ```ts
 * import { plotLossCurves } from "./loss_curves_plot.ts";
 * import { trainingLog } from "../training/training_log.ts";
 * import assert from "node:assert/strict";
 * const step = Array.from({ length: 100 }, (_, i) => 10 * i);
 * const log = trainingLog({ step, d_loss: step.map((s) => 1.39 - Math.exp(-s / 200)), g_loss: step.map((s) => 0.69 + Math.exp(-s / 200)) });
 * assert.match(plotLossCurves(log).toSVG(), /equilibrium/);
 * ```
 */
export function plotLossCurves(
  input: TrainingDiagnosis | TrainingLog,
  options: TrainingPlotOptions = {},
): Figure {
  return trainingCurves(input, options, {
    roles: [
      { role: "dLoss", style: "discriminator", label: "D loss" },
      { role: "gLoss", style: "generated", label: "G loss" },
    ],
    yLabel: "loss",
    unit: "nats",
    title: "Losses against their equilibrium values",
  });
}
