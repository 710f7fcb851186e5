/**
 * Why the minimax generator loss saturates: the gradients of both generator objectives with
 * respect to the discriminator's logit, over where the generated samples actually sit.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { GeneratorObjectives } from "../value/generator_objectives.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { axisLabel, referenceX } from "./axes.ts";
import { composeFigure } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { linspace } from "./_grid.ts";
import { short } from "./_text.ts";
import { INK, mixHex, PALETTE } from "./palette.ts";

/** Options of {@linkcode plotGeneratorObjectives}. */
export interface GeneratorObjectivesPlotOptions {
  /** Histogram bins of the generated samples' logits (default 40). */
  bins?: number;
  /** Title. */
  title?: string;
  /** Panel width in px (default 600). */
  width?: number;
}

const MINIMAX_COLOR = mixHex(PALETTE.generated.color, "#000000", 0.45);

/**
 * Plot `|d/dl ln(1 - sigmoid(l))| = sigmoid(l)` (minimax objective) and
 * `|d/dl -ln sigmoid(l)| = sigmoid(-l)` (non-saturating loss) against the discriminator's
 * logit l, above a histogram of the logits of the generated samples in a
 * `generatorObjectives` result: where the discriminator rejects them (l << 0) the minimax
 * gradient vanishes and the non-saturating one stays near 1.
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), sec. 3;
 * Arjovsky & Bottou 2017 (ICLR), sec. 2.2.
 *
 * @example
 * ```ts
 * import { plotGeneratorObjectives } from "./generator_objectives_plot.ts";
 * import { generatorObjectives } from "../value/generator_objectives.ts";
 * import assert from "node:assert/strict";
 * const g = generatorObjectives([-6, -5, -4.5, -3], { scale: "logit" });
 * assert.match(plotGeneratorObjectives(g).toSVG(), /non-saturating/);
 * ```
 */
export function plotGeneratorObjectives(
  result: GeneratorObjectives,
  options: GeneratorObjectivesPlotOptions = {},
): Figure {
  // gradMinimax = -sigmoid(l), so the logit of each generated sample is logit(-gradMinimax).
  const logits = Array.from(result.gradMinimax, (g) => {
    const p = -g;
    return Math.log(p) - Math.log1p(-p);
  }).filter(Number.isFinite);
  if (logits.length === 0) {
    throw new SaddleError("empty", "the result holds no generated samples with a finite logit", {
      parameter: "result",
    });
  }
  const lo = Math.min(-8, Math.floor(Math.min(...logits))),
    hi = Math.max(8, Math.ceil(Math.max(...logits)));
  const l = linspace(lo, hi, 401);
  const curves = Array.from(l, (v) => ({
    l: v,
    minimax: 1 / (1 + Math.exp(-v)),
    nonSaturating: 1 / (1 + Math.exp(v)),
  }));
  const width = options.width ?? 600;
  const top: Plot.Markish[] = [
    ...referenceX(0, { label: "D = 1/2" }),
    Plot.lineY(curves, {
      x: "l",
      y: "nonSaturating",
      stroke: PALETTE.generated.color,
      strokeWidth: 2.5,
    }),
    Plot.lineY(curves, {
      x: "l",
      y: "minimax",
      stroke: MINIMAX_COLOR,
      strokeWidth: 2,
      strokeDasharray: "7 3",
    }),
  ];
  const bottom: Plot.Markish[] = [
    Plot.rectY(
      logits,
      Plot.binX<Plot.RectYOptions>({ y: "count" }, {
        x: Plot.identity,
        thresholds: options.bins ?? 40,
        fill: PALETTE.generated.color,
        fillOpacity: 0.6,
        insetLeft: 0.5,
        insetRight: 0.5,
      }),
    ),
    Plot.ruleY([0], { stroke: INK }),
    Plot.ruleX([0], { stroke: PALETTE.reference.color, strokeDasharray: PALETTE.reference.dash }),
  ];
  const g = result.meanAbsGradient;
  return composeFigure({
    title: options.title ?? "Generator objectives: which one saturates",
    subtitle: `n = ${logits.length} generated samples; mean |gradient|: non-saturating ${
      short(g.nonSaturating, 3)
    }, minimax ${short(g.minimax, 3)}`,
    legend: [
      { label: "non-saturating −ln D(G(z))", color: PALETTE.generated.color, strokeWidth: 2.5 },
      { label: "minimax ln(1 − D(G(z)))", color: MINIMAX_COLOR, dash: "7 3", strokeWidth: 2 },
      { label: "generated samples", role: "generated", shape: "box" },
    ],
    columns: 1,
    panels: [
      {
        width,
        height: 250,
        margin: { bottom: 30 },
        layers: [{
          x: { domain: [lo, hi], label: null, tickFormat: () => "" },
          y: { domain: [0, 1], label: "|gradient| w.r.t. the logit", grid: true },
          marks: top,
        }],
      },
      {
        width,
        height: 160,
        margin: { top: 6 },
        layers: [{
          x: {
            domain: [lo, hi],
            label: "discriminator logit l on generated samples (D = sigmoid(l))",
          },
          y: { label: axisLabel("count", { n: logits.length }), grid: true },
          marks: bottom,
        }],
      },
    ],
    caption: [
      `Objectives: non-saturating ${short(result.nonSaturating.value, 4)} nats, minimax ${
        short(result.minimax.value, 4)
      } nats.`,
    ],
    marks: top,
  });
}
