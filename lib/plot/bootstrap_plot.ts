/**
 * The bootstrap distribution of an estimate: a histogram of its replicates with the point
 * estimate and the interval.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { Estimate } from "../estimate/estimate.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { axisLabel, lineStyle } from "./axes.ts";
import { composeFigure, type LegendItem } from "./compose.ts";
import { levelText } from "./_estimates.ts";
import type { Figure } from "./figure.ts";
import { short } from "./_text.ts";
import { INK, PALETTE } from "./palette.ts";

/** Options of {@linkcode plotBootstrap}. */
export interface BootstrapPlotOptions {
  /** What the estimate is, for the axis ("JSD", "V(D*, G)"...; default "statistic"). */
  name?: string;
  /** Histogram bins (default: Rice's rule 2 B^(1/3), between 8 and 50). */
  bins?: number;
  /** A value to compare with (a closed form or an equilibrium value). */
  reference?: number;
  /** Legend text of the reference (default "reference value"). */
  referenceLabel?: string;
  /** Title. */
  title?: string;
  /** Panel width in px (default 600). */
  width?: number;
  /** Panel height in px (default 300). */
  height?: number;
}

/**
 * Histogram of the replicates of a bootstrap {@linkcode Estimate} (its non-enumerable
 * `replicates`), with the point estimate, the percentile interval and an optional
 * reference value.
 *
 * References: Efron & Tibshirani 1993, An Introduction to the Bootstrap, ch. 13.
 *
 * @example
 * ```ts
 * import { plotBootstrap } from "./bootstrap_plot.ts";
 * import { bootstrap } from "../estimate/bootstrap.ts";
 * import assert from "node:assert/strict";
 * const x = Float64Array.from({ length: 100 }, (_, i) => Math.sin(i));
 * const e = bootstrap(100, (idx) => idx.reduce((s, i) => s + x[i], 0) / idx.length, { seed: 1, replicates: 200 });
 * assert.match(plotBootstrap(e, { name: "mean" }).toSVG(), /B = 200 replicates/);
 * ```
 */
export function plotBootstrap(
  estimate: Estimate & { readonly replicates?: ArrayLike<number> },
  options: BootstrapPlotOptions = {},
): Figure {
  const reps = estimate.replicates;
  if (!reps || reps.length < 2) {
    throw new SaddleError(
      "invalid-argument",
      "this estimate has no bootstrap replicates; make it with bootstrap(...) or a " +
        "function that reports a bootstrap interval",
      { parameter: "estimate" },
    );
  }
  const values = Array.from(reps);
  const name = options.name ?? "statistic";
  const unit = estimate.unit && estimate.unit !== "none" ? estimate.unit : undefined;
  const marks: Plot.Markish[] = [
    Plot.rectY(
      values,
      Plot.binX<Plot.RectYOptions>({ y: "count" }, {
        x: Plot.identity,
        thresholds: options.bins ??
          Math.min(50, Math.max(8, Math.round(2 * Math.cbrt(values.length)))),
        fill: PALETTE.optimal.color,
        fillOpacity: 0.35,
        insetLeft: 0.5,
        insetRight: 0.5,
      }),
    ),
    Plot.ruleY([0], { stroke: INK }),
    Plot.ruleX([estimate.value], { stroke: INK, strokeWidth: 2.2 }),
  ];
  const legend: LegendItem[] = [
    { label: `replicates`, role: "optimal", shape: "box", color: PALETTE.optimal.color },
    { label: `estimate ${short(estimate.value, 4)}`, color: INK, strokeWidth: 2.2 },
  ];
  if (estimate.ci && Number.isFinite(estimate.ci[0])) {
    marks.push(
      Plot.ruleX([...estimate.ci], { stroke: INK, strokeWidth: 1.4, strokeDasharray: "5 3" }),
    );
    legend.push({
      label: `${levelText(estimate.level)} [${short(estimate.ci[0], 4)}, ${
        short(estimate.ci[1], 4)
      }]`,
      color: INK,
      dash: "5 3",
      strokeWidth: 1.4,
    });
  }
  if (options.reference !== undefined) {
    marks.push(Plot.ruleX([options.reference], { ...lineStyle("reference"), strokeWidth: 2 }));
    legend.push({
      label: `${options.referenceLabel ?? "reference value"} ${short(options.reference, 4)}`,
      role: "reference",
      strokeWidth: 2,
    });
  }
  return composeFigure({
    title: options.title ?? `Bootstrap distribution of ${name}`,
    subtitle: `B = ${values.length} replicates, n = ${estimate.n}; ${estimate.method}`,
    legend,
    panels: [{
      width: options.width ?? 600,
      height: options.height ?? 300,
      layers: [{
        x: { label: axisLabel(name, { unit }) },
        y: { label: "replicates per bin", grid: true },
        marks,
      }],
    }],
    marks,
  });
}
