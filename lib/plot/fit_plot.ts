/**
 * A fitted density against its samples: over a histogram (1-D) or as contours over the
 * scatter (2-D), so that a user can judge the fit.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { Density } from "../density/types.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import type { RandomSource } from "../random/rng.ts";
import type { Samples } from "../samples/samples.ts";
import { axisLabel, dotStyle, lineStyle } from "./axes.ts";
import { columnLabel, type ColumnLabelOptions } from "./_axis_labels.ts";
import { composeFigure, type LegendItem, type PanelSpec } from "./compose.ts";
import type { Figure } from "./figure.ts";
import {
  type AxisRange,
  grid1d,
  grid2d,
  hdrThresholds,
  plottingRange,
  subsampleRows,
} from "./_grid.ts";
import { mixHex, PALETTE } from "./palette.ts";

/** One fit to show: a density, the samples it was fitted to, and which side they are. */
export interface FitInput {
  /** The fitted density. */
  density: Density;
  /** Its samples. */
  samples: Samples;
  /** Which side (default "real"): sets colour and label. */
  role?: "real" | "generated";
  /** Panel title (default: the side and the density's kind). */
  label?: string;
}

const HDR_LEVELS = [0.5, 0.8, 0.95, 0.99];

/** Options of {@linkcode plotFit}. */
export interface FitPlotOptions extends ColumnLabelOptions {
  /** Histogram bins in 1-D (default: Freedman–Diaconis, at most 80). */
  bins?: number;
  /** Range(s) of the axes (default: from all samples). */
  domain?: readonly AxisRange[];
  /**
   * Contours in 2-D: the highest-density regions holding these shares of the fitted mass
   * (default [0.5, 0.8, 0.95, 0.99]).
   */
  levels?: readonly number[];
  /** At most this many points per side in 2-D (default 800). */
  maxPoints?: number;
  /** Seed of the subsample (default 0). */
  seed?: RandomSource;
  /** Title. */
  title?: string;
  /** Panel width in px (default 480 for 1-D, 420 for 2-D). */
  width?: number;
  /** Panel height in px (default 300 for 1-D, 380 for 2-D). */
  height?: number;
}

/**
 * Show each fit against its samples, one panel per fit: in 1-D a density-scaled histogram
 * with the fitted curve; in 2-D the scatter with contours of the fitted density. Higher
 * dimensions need a choice of two columns first (`selectColumns`) and a fit on them.
 *
 * @example
 * ```ts
 * import { plotFit } from "./fit_plot.ts";
 * import { gaussian } from "../density/gaussian.ts";
 * import assert from "node:assert/strict";
 * const p = gaussian([0], [[1]]);
 * const fig = plotFit({ density: p, samples: p.sample(300, 1) });
 * assert.match(fig.toSVG(), /n = 300/);
 * ```
 */
export function plotFit(
  fits: FitInput | readonly FitInput[],
  options: FitPlotOptions = {},
): Figure {
  const list: readonly FitInput[] = Array.isArray(fits) ? fits : [fits as FitInput];
  if (list.length === 0) throw new SaddleError("empty", "no fits to plot", { parameter: "fits" });
  const d = list[0].density.d;
  for (const [k, f] of list.entries()) {
    if (f.density.d !== d || f.samples.d !== d) {
      throw new SaddleError(
        "dimension-mismatch",
        `fit ${k}: density d = ${f.density.d}, samples d = ${f.samples.d}, expected d = ${d}`,
        { parameter: "fits" },
      );
    }
  }
  if (d > 2) {
    throw new SaddleError(
      "dimension-mismatch",
      `plotFit shows 1-D or 2-D fits, got d = ${d}; select two columns with selectColumns ` +
        "and fit on them",
      { parameter: "fits" },
    );
  }
  const sets = list.map((f) => f.samples);
  const domain = options.domain ?? plottingRange(sets);
  const panels = list.map((
    f,
  ) => (d === 1 ? panel1d(f, domain[0], options, sets) : panel2d(f, domain, options, sets)));
  const roles = [...new Set(list.map((f) => f.role ?? "real"))];
  const legend: LegendItem[] = roles.flatMap((r): LegendItem[] =>
    d === 1
      ? [
        { label: `${PALETTE[r].label}: histogram`, role: r, shape: "box" as const },
        { label: `${PALETTE[r].label}: fitted density`, role: r, dash: "none" },
      ]
      : [
        { label: `${PALETTE[r].label}`, role: r, shape: "dot" as const },
        {
          label: `fitted density: ${
            (options.levels ?? HDR_LEVELS).map((f) => `${Math.round(f * 100)}`).join("/")
          }% regions`,
          color: contourColor(r),
          strokeWidth: 1.3,
        },
      ]
  );
  const kinds = [...new Set(list.map((f) => f.density.describe().kind))];
  return composeFigure({
    title: options.title ?? `Fitted densities against their samples`,
    subtitle: `${kinds.join(", ")} fit${list.length > 1 ? "s" : ""}`,
    legend,
    panels: panels.map((p) => p.panel),
    marks: panels[0].marks,
  });
}

function panelTitle(f: FitInput): string {
  const role = f.role ?? "real";
  return f.label ?? `${PALETTE[role].label} (n = ${f.samples.n})`;
}

function panel1d(
  f: FitInput,
  domain: AxisRange,
  options: FitPlotOptions,
  sets: readonly Samples[],
): { panel: PanelSpec; marks: Plot.Markish[] } {
  const role = f.role ?? "real";
  const x = f.samples.data;
  const bins = options.bins ?? fdBins(x, domain);
  const w = (domain[1] - domain[0]) / bins;
  const counts = new Float64Array(bins);
  let inside = 0;
  for (const v of x) {
    const b = Math.floor((v - domain[0]) / w);
    if (b >= 0 && b < bins) {
      counts[b]++;
      inside++;
    }
  }
  const hist = Array.from(counts, (c, b) => ({
    x1: domain[0] + b * w,
    x2: domain[0] + (b + 1) * w,
    // Density scale: count / (n w), with n all samples so that the area matches the fit's.
    y: c / (f.samples.n * w),
  }));
  const g = grid1d(domain, 301);
  const lp = f.density.logPdf(g);
  const curve = Array.from(g.data, (v, i) => ({ x: v, y: Math.exp(lp[i]) }));
  const marks: Plot.Markish[] = [
    Plot.rectY(hist, {
      x1: "x1",
      x2: "x2",
      y: "y",
      fill: PALETTE[role].color,
      fillOpacity: 0.3,
      insetLeft: 0.5,
      insetRight: 0.5,
    }),
    Plot.lineY(curve, { x: "x", y: "y", ...lineStyle(role), strokeDasharray: undefined }),
    Plot.ruleY([0]),
  ];
  const unit = options.units?.[0];
  const outside = f.samples.n - inside;
  return {
    panel: {
      width: options.width ?? 480,
      height: options.height ?? 300,
      title: panelTitle(f) + (outside ? `, ${outside} outside the range` : ""),
      layers: [{
        x: { domain, label: columnLabel(0, options, sets) },
        y: {
          label: axisLabel("density", { unit: unit ? `1/(${unit})` : undefined }),
          grid: true,
          zero: true,
        },
        marks,
      }],
    },
    marks,
  };
}

function panel2d(
  f: FitInput,
  domain: readonly AxisRange[],
  options: FitPlotOptions,
  sets: readonly Samples[],
): { panel: PanelSpec; marks: Plot.Markish[] } {
  const role = f.role ?? "real";
  const [xr, yr] = domain;
  const res = 70;
  const ex = (2 * (xr[1] - xr[0])) / res, ey = (2 * (yr[1] - yr[0])) / res;
  const gx: AxisRange = [xr[0] - ex, xr[1] + ex], gy: AxisRange = [yr[0] - ey, yr[1] + ey];
  const n = res + 4;
  const lp = f.density.logPdf(grid2d(gx, gy, n, n));
  const values = Array.from(lp, Math.exp);
  // Levels of highest-density regions, from the grid inside the frame (the extension cells
  // beyond it only keep the contours from closing along the frame).
  const inner: number[] = [];
  for (let j = 2; j < n - 2; j++) for (let i = 2; i < n - 2; i++) inner.push(values[j * n + i]);
  const thresholds = hdrThresholds(inner, options.levels ?? HDR_LEVELS);
  const s = f.samples;
  const rows = subsampleRows(s, options.maxPoints ?? 800, `${String(options.seed ?? 0)}:${role}`);
  const marks: Plot.Markish[] = [
    Plot.dot(rows, {
      x: (i: number) => s.data[2 * i],
      y: (i: number) => s.data[2 * i + 1],
      ...dotStyle(role),
      r: 1.8,
      fillOpacity: 0.45,
      clip: true,
    }),
    Plot.contour(values, {
      width: n,
      height: n,
      x1: gx[0],
      x2: gx[1],
      y1: gy[0],
      y2: gy[1],
      value: Plot.identity,
      thresholds,
      stroke: contourColor(role),
      strokeWidth: 1.3,
      clip: true,
    }),
  ];
  return {
    panel: {
      width: options.width ?? 420,
      height: options.height ?? 380,
      title: panelTitle(f) + (rows.length < s.n ? `, ${rows.length} drawn` : ""),
      layers: [{
        x: { domain: xr, label: columnLabel(0, options, sets) },
        y: { domain: yr, label: columnLabel(1, options, sets) },
        marks,
      }],
    },
    marks,
  };
}

/** Contours of a side's fit: its colour darkened, so that they stand out from its points. */
function contourColor(role: "real" | "generated"): string {
  return mixHex(PALETTE[role].color, "#000000", 0.45);
}

/** Freedman–Diaconis bin count over `domain`, between 10 and 80. */
function fdBins(x: Float64Array, domain: AxisRange): number {
  const s = Float64Array.from(x).sort();
  const q = (p: number) => s[Math.min(s.length - 1, Math.floor(p * (s.length - 1)))];
  const iqr = q(0.75) - q(0.25);
  const h = 2 * iqr / Math.cbrt(s.length);
  const k = h > 0 ? Math.round((domain[1] - domain[0]) / h) : 30;
  return Math.max(10, Math.min(80, k));
}
