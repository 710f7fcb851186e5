/**
 * Training curves of a simulated game or a neural-lab run, against the values the theory
 * predicts at the equilibrium.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { GeneratorLoss } from "../game/game.ts";
import type { NeuralRun } from "../game/neural_lab.ts";
import type { Simulation } from "../game/simulate_training.ts";
import { EQUILIBRIUM_VALUES, lineStyle, referenceY } from "./axes.ts";
import { composeFigure, type PanelSpec } from "./compose.ts";
import type { Figure } from "./figure.ts";

/** Options of {@linkcode plotTrainingCurves}. */
export interface TrainingCurvesPlotOptions {
  /** Title. */
  title?: string;
  /** Width of each panel in px (default 330). */
  width?: number;
  /** Height of each panel in px (default 220). */
  height?: number;
  /** At most this many points per curve (default 600; longer runs are thinned evenly). */
  maxPoints?: number;
}

interface Curves {
  step: ArrayLike<number>;
  dLoss: ArrayLike<number>;
  gLoss: ArrayLike<number>;
  meanDReal: ArrayLike<number>;
  meanDFake: ArrayLike<number>;
  distance?: ArrayLike<number>;
  loss: GeneratorLoss;
  what: string;
}

function isSimulation(x: Simulation | NeuralRun): x is Simulation {
  return "trajectory" in x;
}

/**
 * Training curves in small multiples, each with its equilibrium line (Goodfellow et al.
 * 2014, Prop. 1 and Thm. 1: at p_g = p_data, D = 1/2 everywhere): the discriminator's loss
 * (binary cross-entropy of both sides, 2 ln 2 at equilibrium), mean D on real and generated
 * points (1/2), the generator's loss (non-saturating −E ln D: ln 2; minimax E ln(1 − D):
 * −ln 2) and, for simulated games, the distance to the equilibrium on a log scale.
 * Takes a {@linkcode simulateTraining} result or a neural-lab run.
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Alg. 1.
 *
 * @example
 * ```ts
 * import { plotTrainingCurves } from "./training_curves_plot.ts";
 * import { locationGame, simulateTraining } from "../game/mod.ts";
 * import assert from "node:assert/strict";
 * const sim = simulateTraining(locationGame(), {
 *   start: { theta: [2], phi: [0, 0] }, steps: 200, learningRate: 0.1, k: 2,
 * });
 * assert.match(plotTrainingCurves(sim).toSVG(), /2 ln 2/);
 * ```
 */
export function plotTrainingCurves(
  run: Simulation | NeuralRun,
  options: TrainingCurvesPlotOptions = {},
): Figure {
  let c: Curves;
  if (isSimulation(run)) {
    const t = run.trajectory;
    c = {
      step: Array.from({ length: t.length }, (_, i) => i),
      dLoss: t.dLoss,
      gLoss: t.gLoss,
      meanDReal: t.meanDReal,
      meanDFake: t.meanDFake,
      ...(run.equilibrium ? { distance: t.distance } : {}),
      loss: run.settings.loss,
      what: `simulated ${run.settings.updates} training, k = ${run.settings.k}: ${run.verdict}`,
    };
  } else {
    c = {
      step: Array.from({ length: run.dLoss.length }, (_, i) => i + 1),
      dLoss: run.dLoss,
      gLoss: run.gLoss,
      meanDReal: run.meanDReal,
      meanDFake: run.meanDFake,
      loss: run.settings.loss as GeneratorLoss,
      what: `neural lab on ${run.settings.data}, minibatch values`,
    };
  }
  const n = c.step.length, max = options.maxPoints ?? 600;
  const stride = Math.max(1, Math.ceil(n / max));
  const idx = Array.from({ length: Math.ceil(n / stride) }, (_, i) => Math.min(n - 1, i * stride));
  const rows = idx.map((i) => ({
    step: c.step[i],
    dLoss: c.dLoss[i],
    gLoss: c.gLoss[i],
    real: c.meanDReal[i],
    fake: c.meanDFake[i],
    distance: c.distance ? Math.max(c.distance[i], 1e-12) : NaN,
  }));
  const w = options.width ?? 330, h = options.height ?? 220;
  // Dense curves: thin and solid, so the dash pattern does not hide the wiggles.
  const style = (role: "discriminator" | "real" | "generated" | "optimal") =>
    rows.length > 150
      ? { ...lineStyle(role), strokeDasharray: "none", strokeWidth: 1.1 }
      : lineStyle(role);
  const xOpt = { label: "generator step" };
  const ln4 = -EQUILIBRIUM_VALUES.value, ln2 = ln4 / 2;
  const panels: PanelSpec[] = [
    {
      width: w,
      height: h,
      title: "discriminator loss",
      layers: [{
        x: xOpt,
        y: { label: "−E ln D − E ln(1 − D) (nats)" },
        marks: [
          ...referenceY(ln4, { label: "2 ln 2" }),
          Plot.line(rows, { x: "step", y: "dLoss", ...style("discriminator") }),
        ],
      }],
    },
    {
      width: w,
      height: h,
      title: "mean D",
      layers: [{
        x: xOpt,
        y: { label: "mean D(x)", domain: [0, 1] },
        marks: [
          ...referenceY(EQUILIBRIUM_VALUES.dStar, { label: "1/2" }),
          Plot.line(rows, { x: "step", y: "real", ...style("real") }),
          Plot.line(rows, { x: "step", y: "fake", ...style("generated") }),
        ],
      }],
    },
    {
      width: w,
      height: h,
      title: `generator loss (${c.loss})`,
      layers: [{
        x: xOpt,
        y: { label: c.loss === "minimax" ? "E ln(1 − D) (nats)" : "−E ln D (nats)" },
        marks: [
          ...referenceY(c.loss === "minimax" ? -ln2 : ln2, {
            label: c.loss === "minimax" ? "−ln 2" : "ln 2",
          }),
          Plot.line(rows, { x: "step", y: "gLoss", ...style("generated") }),
        ],
      }],
    },
  ];
  if (c.distance) {
    panels.push({
      width: w,
      height: h,
      title: "distance to the equilibrium",
      layers: [{
        x: xOpt,
        y: { label: "|(θ, φ) − (θ*, φ*)|", type: "log" },
        marks: [Plot.line(rows, { x: "step", y: "distance", ...style("optimal") })],
      }],
    });
  }
  return composeFigure({
    title: options.title ?? "Training curves against the equilibrium values",
    subtitle: c.what,
    legend: [
      { label: "D loss", role: "discriminator" },
      { label: "mean D on real", role: "real" },
      { label: "mean D on generated / G loss", role: "generated" },
      { label: "equilibrium value", role: "reference" },
    ],
    panels,
    columns: 2,
  });
}
