/**
 * The periodogram behind an oscillation flag: power against period, the peak, and the
 * ordinate Fisher's g test would need at the flag's level.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { SaddleError } from "../errors/saddle_error.ts";
import type { TrainingDiagnosis } from "../training/diagnose_training.ts";
import { fisherG } from "../training/periodogram.ts";
import type { TrainingLog } from "../training/training_log.ts";
import { formatNumber } from "../display/table.ts";
import { lineStyle } from "./axes.ts";
import { composeFigure } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { INK, PALETTE } from "./palette.ts";
import type { PlotMark } from "./plot_types.ts";
import { asDiagnosis, pickRun } from "./_training.ts";

/** Options of {@linkcode plotPeriodogram}. */
export interface PeriodogramPlotOptions {
  /** Run (default: that of the first oscillation flag, else the first run). */
  run?: string;
  /** Column (default: that of the first oscillation flag of the run, else the D loss). */
  series?: string;
  /** Title. */
  title?: string;
  /** Panel width in px (default 600). */
  width?: number;
  /** Panel height in px (default 280). */
  height?: number;
}

/** The g for which Fisher's tail probability is `alpha` (bisection; P falls as g grows). */
function criticalG(alpha: number, m: number): number {
  let lo = 0, hi = 1;
  for (let i = 0; i < 60; i++) {
    const mid = (lo + hi) / 2;
    if (fisherG(mid, m) > alpha) lo = mid;
    else hi = mid;
  }
  return hi;
}

/**
 * The periodogram of a logged series after the warm-up and detrending, against the period
 * in steps (log scale), with the peak marked and the ordinate that Fisher's g test needs
 * for significance at the diagnosis's level (split over the series tested), so the flag's
 * evidence can be seen. Takes a diagnosis, or a log.
 *
 * References: Fisher 1929, Tests of significance in harmonic analysis (Proc. R. Soc. A 125).
 *
 * @example
 * ```ts
 * import { plotPeriodogram } from "./periodogram_plot.ts";
 * import { trainingLog } from "../training/training_log.ts";
 * import assert from "node:assert/strict";
 * const step = Array.from({ length: 200 }, (_, i) => 10 * i); // 180 records after the warm-up
 * const d_loss = step.map((_, i) => 1.39 + 0.2 * Math.sin((2 * Math.PI * i) / 20) + 0.05 * Math.sin(i * i));
 * assert.match(plotPeriodogram(trainingLog({ step, d_loss })).toSVG(), /period 200 steps/);
 * ```
 */
export function plotPeriodogram(
  input: TrainingDiagnosis | TrainingLog,
  options: PeriodogramPlotOptions = {},
): Figure {
  const d = asDiagnosis(input);
  const osc = d.flags.find((f) =>
    f.kind === "oscillation" && (options.run === undefined || f.run === options.run) &&
    (options.series === undefined || f.series === options.series)
  );
  const run = options.run ?? osc?.run ?? pickRun(d, undefined);
  const column = options.series ?? osc?.series ?? d.log.roles.dLoss;
  const s = d.series.find((x) => x.run === run && x.column === column);
  if (!s || !s.periodogram) {
    throw new SaddleError(
      "not-found",
      `no periodogram for "${column}"${run ? ` in run "${run}"` : ""}; pick a series with ` +
        `at least ${2 * d.thresholds.minCycles + 1} finite records after the warm-up`,
      { parameter: "series" },
    );
  }
  const p = s.periodogram;
  const rows = Array.from(p.power, (power, i) => ({ period: p.period[i], power }));
  const total = rows.reduce((a, r) => a + r.power, 0);
  const tested = new Set(d.series.filter((x) => x.run === run).map((x) => x.column)).size;
  const alpha = d.thresholds.oscillationAlpha / Math.max(1, tested);
  const needed = criticalG(alpha, rows.length) * total;
  const peak = rows[p.peak];
  const marks: PlotMark[] = [
    Plot.ruleX(rows, {
      x: "period",
      y: "power",
      stroke: PALETTE.discriminator.color,
      strokeWidth: 1.2,
    }),
    Plot.lineY(rows, { x: "period", y: "power", ...lineStyle("discriminator"), strokeWidth: 1 }),
    Plot.ruleY([needed], { ...lineStyle("reference") }),
    Plot.text([`needed at level ${formatNumber(alpha, 2)}`], {
      frameAnchor: "right",
      y: [needed],
      dy: -7,
      textAnchor: "end",
      fontSize: 10,
      fill: INK,
    }),
    Plot.dot([peak], { x: "period", y: "power", r: 4, fill: INK }),
    Plot.text([peak], {
      x: "period",
      y: "power",
      text: () => `period ${formatNumber(peak.period, 3)} steps, p = ${formatNumber(p.pValue, 2)}`,
      dx: 8,
      textAnchor: "start",
      fontSize: 10.5,
      fill: INK,
    }),
  ];
  return composeFigure({
    title: options.title ?? `Periodogram of "${column}"`,
    subtitle: `${p.n} records from step ${s.periodogramStart}, detrended (degree ` +
      `${d.thresholds.detrendDegree}); Fisher's g = ${formatNumber(p.g, 3)} over ${rows.length} ` +
      "frequencies",
    legend: [
      { label: "periodogram ordinate", role: "discriminator" },
      { label: "ordinate needed for significance", role: "reference" },
    ],
    panels: [{
      width: options.width ?? 600,
      height: options.height ?? 280,
      layers: [{
        x: { label: "period (steps)", type: "log" },
        y: { label: "power", grid: true },
        marks,
      }],
    }],
    marks,
  });
}
