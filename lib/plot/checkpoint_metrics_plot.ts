/**
 * Metrics of a checkpoint series over the training steps, with their interval bands.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { SaddleError } from "../errors/saddle_error.ts";
import type { CheckpointSeries } from "../training/checkpoint_series.ts";
import { readEstimate } from "./_estimates.ts";
import { levelText } from "./_estimates.ts";
import { axisLabel, EQUILIBRIUM_VALUES, lineStyle, referenceY } from "./axes.ts";
import { composeFigure, type PanelSpec } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { PALETTE, type Role } from "./palette.ts";
import type { PlotMark } from "./plot_types.ts";

/** Options of {@linkcode plotCheckpointMetrics}. */
export interface CheckpointMetricsPlotOptions {
  /** Outputs to draw, one panel each (default all of the series' outputs). */
  outputs?: readonly string[];
  /** Panels per row (default 2). */
  columns?: number;
  /** Title. */
  title?: string;
  /** Panel width in px (default 360). */
  width?: number;
  /** Panel height in px (default 240). */
  height?: number;
}

/** What each known output is called, its role colour and its value at equilibrium. */
const KNOWN: Readonly<
  Record<string, { label: string; role: Role; eq?: number; eqLabel?: string }>
> = {
  jsd: { label: "JSD(p_data, p_g)", role: "optimal", eq: 0, eqLabel: "0 at p_g = p_data" },
  value: {
    label: "V(D*, G)",
    role: "optimal",
    eq: EQUILIBRIUM_VALUES.value,
    eqLabel: "−ln 4 at p_g = p_data",
  },
  dValue: {
    label: "V(D, G), trained D",
    role: "discriminator",
    eq: EQUILIBRIUM_VALUES.value,
    eqLabel: "−ln 4",
  },
  gap: { label: "gap V(D*, G) − V(D, G)", role: "discriminator", eq: 0, eqLabel: "0: D optimal" },
};

/**
 * One panel per metric of a checkpoint series: the estimate at each checkpoint's step, its
 * interval as a band, and the metric's value at equilibrium (JSD 0 and V(D*, G) = −ln 4,
 * Goodfellow et al. 2014, Thm. 1; gap 0) as a reference line. Outputs of other registered
 * metrics are drawn the same way without a reference line.
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Thm. 1.
 *
 * @example
 * ```ts
 * import { plotCheckpointMetrics } from "./checkpoint_metrics_plot.ts";
 * import { checkpointSeries } from "../training/checkpoint_series.ts";
 * import { gaussian } from "../density/gaussian.ts";
 * import assert from "node:assert/strict";
 * const real = gaussian(0, 1).sample(100, 1);
 * const cps = [1, 0].map((mu, k) => ({ step: 100 * k, samples: gaussian(mu, 1).sample(100, 5 + k) }));
 * const fig = plotCheckpointMetrics(await checkpointSeries(real, cps, { replicates: 10 }));
 * assert.match(fig.toSVG(), /JSD\(p_data, p_g\)/);
 * ```
 */
export function plotCheckpointMetrics(
  series: CheckpointSeries,
  options: CheckpointMetricsPlotOptions = {},
): Figure {
  if (!series || !Array.isArray(series.checkpoints)) {
    throw new SaddleError("invalid-argument", "give the result of checkpointSeries", {
      parameter: "series",
    });
  }
  const outputs = options.outputs ?? series.outputs;
  for (const o of outputs) {
    if (!series.outputs.includes(o)) {
      throw new SaddleError(
        "not-found",
        `no output "${o}" in this series; it has ${series.outputs.join(", ")}`,
        { parameter: "outputs" },
      );
    }
  }
  const all: PlotMark[] = [];
  let level = 0.95;
  const panels: PanelSpec[] = outputs.map((o) => {
    const k = KNOWN[o] ?? { label: o, role: "optimal" as Role };
    const rows = series.checkpoints.filter((c) => c.metrics[o] !== undefined).map((c) => {
      const e = readEstimate(c.metrics[o]);
      level = e.level ?? level;
      return {
        step: c.step,
        value: e.value,
        lo: e.lo ?? e.value,
        hi: e.hi ?? e.value,
        unit: e.unit,
      };
    });
    const unit = rows.find((r) => r.unit)?.unit;
    const marks: PlotMark[] = [
      Plot.areaY(rows, {
        x: "step",
        y1: "lo",
        y2: "hi",
        fill: PALETTE[k.role].color,
        fillOpacity: 0.18,
      }),
      Plot.lineY(rows, { x: "step", y: "value", ...lineStyle(k.role) }),
      Plot.dot(rows, { x: "step", y: "value", fill: PALETTE[k.role].color, r: 2.5 }),
      ...(k.eq !== undefined ? referenceY(k.eq, { label: k.eqLabel, at: "start" }) : []),
    ];
    all.push(...marks);
    return {
      width: options.width ?? 360,
      height: options.height ?? 240,
      title: k.label,
      layers: [{
        x: { label: "step" },
        y: {
          label: axisLabel(o, { unit: unit && unit !== "none" ? unit : undefined }),
          grid: true,
        },
        marks,
      }],
    };
  });
  if (panels.length === 0) {
    throw new SaddleError("empty", "no outputs to draw", { parameter: "outputs" });
  }
  return composeFigure({
    title: options.title ?? "Metrics over the training steps",
    subtitle: `${series.checkpoints.length} checkpoints against ${series.real.n} real points ` +
      `(d = ${series.real.d}); bands: ${levelText(level)}`,
    legend: [
      { label: "estimate", role: "optimal" },
      { label: levelText(level), shape: "band", color: PALETTE.optimal.color },
      { label: "value at equilibrium", role: "reference" },
    ],
    panels,
    columns: options.columns ?? 2,
    marks: all,
  });
}
