/**
 * Your own Plot, drawn in saddlekit's frame: compose a builder's marks with yours and get a
 * standalone Figure.
 *
 * @module
 */
import type { PlotLayerOptions } from "./plot_types.ts";
import { composeFigure, type LegendItem, type Margins } from "./compose.ts";
import type { Figure } from "./figure.ts";

/** Plot options plus the frame's title, subtitle, legend and caption. */
export interface PlotFigureOptions extends PlotLayerOptions {
  /** Title (a Plot `title` is used too). */
  title?: string;
  /** Subtitle. */
  subtitle?: string;
  /** Legend entries drawn in the palette's styles. */
  legend?: readonly LegendItem[];
  /** Notes below the plot. */
  caption?: string;
  /** Margins per side; they override Plot's `margin`, `marginTop`... */
  margins?: Margins;
}

/**
 * Draw any Plot options (your marks, a builder's `figure.marks`, or both) as a standalone
 * {@linkcode Figure}. Plot's own swatch legends and titles are carried into the SVG.
 *
 * @example Adding a builder's marks to your own plot
 * ```ts
 * import * as Plot from "@observablehq/plot";
 * import { plotFigure } from "./plot_figure.ts";
 * import { plotObjective } from "./objective_plot.ts";
 * import assert from "node:assert/strict";
 * const base = plotObjective([{ a: 2, b: 1 }]);
 * const fig = plotFigure({
 *   title: "Objective with my mark",
 *   marks: [...base.marks, Plot.ruleX([0.9], { stroke: "red" })],
 *   x: { domain: [0, 1] },
 * });
 * assert.match(fig.toSVG(), /Objective with my mark/);
 * ```
 */
export function plotFigure(options: PlotFigureOptions): Figure {
  const { title, subtitle, legend, caption, margins, ...plot } = options;
  const all = plot.margin;
  const m: Margins = {
    ...(all !== undefined ? { top: all, right: all, bottom: all, left: all } : {}),
    ...(plot.marginTop !== undefined ? { top: plot.marginTop } : {}),
    ...(plot.marginRight !== undefined ? { right: plot.marginRight } : {}),
    ...(plot.marginBottom !== undefined ? { bottom: plot.marginBottom } : {}),
    ...(plot.marginLeft !== undefined ? { left: plot.marginLeft } : {}),
    ...margins,
  };
  return composeFigure({
    ...(title ? { title } : {}),
    ...(subtitle ? { subtitle } : {}),
    ...(legend ? { legend } : {}),
    ...(caption ? { caption } : {}),
    panels: [{ width: plot.width ?? 640, height: plot.height ?? 400, margin: m, layers: [plot] }],
  });
}
