/**
 * The pointwise objective `a ln y + b ln(1 - y)` of the discriminator and its maximiser
 * `a / (a + b)`.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { pointwiseMaximiser, pointwiseObjective } from "../discriminator/pointwise_objective.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { axisLabel, EQUILIBRIUM_VALUES, referenceX } from "./axes.ts";
import { composeFigure, type LegendEntry } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { linspace } from "./_grid.ts";
import { short } from "./_text.ts";
import { INK, PALETTE } from "./palette.ts";

/** One curve: the weights `a = p_data(x)` and `b = p_g(x)` at a point. */
export interface ObjectivePair {
  /** Weight of ln y (the data density at the point). */
  a: number;
  /** Weight of ln(1 - y) (the model density at the point). */
  b: number;
}

/** Options of {@linkcode plotObjective}. */
export interface ObjectivePlotOptions {
  /** Title. */
  title?: string;
  /** Lowest objective value shown (default: 2.5 nats below the lowest maximum). */
  floor?: number;
  /** Panel width in px (default 600). */
  width?: number;
  /** Panel height in px (default 340). */
  height?: number;
}

const DASHES = ["none", "7 3", "2 3", "8 3 2 3", "12 4"];

/**
 * Plot `f(y) = a ln y + b ln(1 - y)` over y in (0, 1) for each pair and mark its maximum at
 * `y* = a / (a + b)`: the discriminator's best answer at a point where the densities are
 * a and b. Default pairs: (1, 1), (3, 1) and (1, 4).
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Prop. 1.
 *
 * @example
 * ```ts
 * import { plotObjective } from "./objective_plot.ts";
 * import assert from "node:assert/strict";
 * const fig = plotObjective([{ a: 3, b: 1 }]);
 * assert.match(fig.toSVG(), /y\* = 0\.75/);
 * ```
 */
export function plotObjective(
  pairs: readonly ObjectivePair[] = [{ a: 1, b: 1 }, { a: 3, b: 1 }, { a: 1, b: 4 }],
  options: ObjectivePlotOptions = {},
): Figure {
  if (pairs.length === 0 || pairs.length > DASHES.length) {
    throw new SaddleError(
      "invalid-argument",
      `give 1 to ${DASHES.length} (a, b) pairs, got ${pairs.length}`,
      { parameter: "pairs" },
    );
  }
  const y = linspace(0.002, 0.998, 499);
  const curves = pairs.map(({ a, b }) => {
    const f = pointwiseObjective(a, b, y);
    const yStar = pointwiseMaximiser(a, b);
    const fStar = pointwiseObjective(a, b, yStar);
    return { a, b, f, yStar, fStar };
  });
  const floor = options.floor ?? Math.min(...curves.map((c) => c.fStar)) - 2.5;
  const top = Math.max(...curves.map((c) => c.fStar));
  const rows = curves.flatMap((c, k) =>
    Array.from(y, (v, i) => ({ k, y: v, f: c.f[i] })).filter((r) => r.f >= floor)
  );
  const marks: Plot.Markish[] = [
    ...referenceX(EQUILIBRIUM_VALUES.dStar, { label: "y = 1/2" }),
    ...curves.map((_, k) =>
      Plot.lineY(rows.filter((r) => r.k === k), {
        x: "y",
        y: "f",
        stroke: PALETTE.optimal.color,
        strokeWidth: 2,
        ...(DASHES[k] !== "none" ? { strokeDasharray: DASHES[k] } : {}),
      })
    ),
    Plot.dot(curves, {
      x: "yStar",
      y: "fStar",
      symbol: PALETTE.optimal.symbol,
      fill: PALETTE.discriminator.color,
      stroke: INK,
      strokeWidth: 0.8,
      r: 5,
    }),
    Plot.text(curves, {
      x: "yStar",
      y: "fStar",
      text: (c: (typeof curves)[number]) => `y* = ${short(c.yStar)}`,
      dy: -12,
      fill: INK,
      fontSize: 10.5,
    }),
  ];
  const legend: LegendEntry[] = curves.map((c, k) => ({
    label: `a = ${short(c.a)}, b = ${short(c.b)}`,
    color: PALETTE.optimal.color,
    dash: DASHES[k],
    strokeWidth: 2,
  }));
  legend.push({
    label: "maximum at y* = a / (a + b)",
    role: "optimal",
    color: PALETTE.discriminator.color,
    shape: "dot",
  });
  return composeFigure({
    title: options.title ?? "Pointwise objective of the discriminator",
    subtitle: "f(y) = a ln y + b ln(1 − y) with a = p_data(x), b = p_g(x)",
    legend,
    panels: [{
      width: options.width ?? 600,
      height: options.height ?? 340,
      layers: [{
        x: { domain: [0, 1], label: "discriminator output y = D(x)" },
        y: {
          domain: [floor, top + 0.35 * (top - floor) / 2.5],
          label: axisLabel("f(y)", { unit: "nats" }),
          grid: true,
        },
        marks,
      }],
    }],
    marks,
  });
}
