/**
 * Reliability diagram of a trained discriminator against D*, from the bins of
 * `discriminatorGap`.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { DiscriminatorGap, ReliabilityBin } from "../discriminator/discriminator_gap.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { wilsonInterval } from "../estimate/wilson.ts";
import type { Estimate } from "../estimate/estimate.ts";
import { levelText } from "./_estimates.ts";
import { short } from "./_text.ts";
import { axisLabel, dotStyle, lineStyle } from "./axes.ts";
import { composeFigure, type LegendItem } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { INK, PALETTE } from "./palette.ts";

/** What {@linkcode plotReliability} draws: the bins (and calibration errors) of a gap. */
export type ReliabilitySource =
  & Pick<DiscriminatorGap, "bins">
  & Partial<Pick<DiscriminatorGap, "ece" | "eceVsOptimal">>;

/** Options of {@linkcode plotReliability}. */
export interface ReliabilityPlotOptions {
  /** Confidence level of the per-bin intervals (default 0.95). */
  level?: number;
  /** Title. */
  title?: string;
  /** Panel width in px (default 520). */
  width?: number;
}

/**
 * Reliability diagram: per bin of the discriminator's output, the observed fraction of real
 * samples (equal priors, as D* assumes) against the mean output, with Wilson intervals on
 * the bin's count (exact for equal class sizes, approximate otherwise), the diagonal of
 * perfect calibration, the mean D* per bin when known, and the counts per bin below. Takes
 * the result of `discriminatorGap` (its `bins`, `ece` and `eceVsOptimal`).
 *
 * References: Guo et al. 2017, On Calibration of Modern Neural Networks (ICML), Sec. 2.
 *
 * @example
 * ```ts
 * import { plotReliability } from "./reliability_plot.ts";
 * import { discriminatorGap } from "../discriminator/discriminator_gap.ts";
 * import assert from "node:assert/strict";
 * const gap = discriminatorGap({ dReal: [0.9, 0.7, 0.6, 0.4], dFake: [0.1, 0.3, 0.35, 0.8], scale: "prob", replicates: 20 });
 * assert.match(plotReliability(gap).toSVG(), /perfect calibration/);
 * ```
 */
export function plotReliability(
  source: ReliabilitySource,
  options: ReliabilityPlotOptions = {},
): Figure {
  const used = source.bins.filter((b) => b.count > 0);
  if (used.length === 0) {
    throw new SaddleError("empty", "every reliability bin is empty", { parameter: "bins" });
  }
  const level = options.level ?? 0.95;
  const rows = used.map((b: ReliabilityBin) => {
    const [lo, hi] = wilsonInterval(b.fractionReal, b.count, level);
    return { ...b, lo: b.lo, hi: b.hi, ciLo: lo, ciHi: hi };
  });
  const hasStar = used.some((b) => b.meanOptimal !== undefined && Number.isFinite(b.meanOptimal));
  const total = used.reduce((s, b) => s + b.count, 0);
  const width = options.width ?? 520;
  const main: Plot.Markish[] = [
    Plot.line([[0, 0], [1, 1]], { ...lineStyle("reference") }),
    Plot.ruleX(rows, {
      x: "meanD",
      y1: "ciLo",
      y2: "ciHi",
      stroke: PALETTE.discriminator.color,
      strokeWidth: 1.5,
    }),
    Plot.line(rows, { x: "meanD", y: "fractionReal", ...lineStyle("discriminator") }),
    Plot.dot(rows, { x: "meanD", y: "fractionReal", ...dotStyle("discriminator"), r: 4 }),
    ...(hasStar
      ? [Plot.dot(rows, { x: "meanD", y: "meanOptimal", ...dotStyle("optimal"), r: 4.5 })]
      : []),
  ];
  const countMarks: Plot.Markish[] = [
    Plot.rectY(rows, {
      x1: "lo",
      x2: "hi",
      y: "count",
      fill: PALETTE.discriminator.color,
      fillOpacity: 0.55,
      insetLeft: 1,
      insetRight: 1,
    }),
    Plot.ruleY([0], { stroke: INK }),
  ];
  const legend: LegendItem[] = [
    { label: "fraction real per bin", role: "discriminator" },
    ...(hasStar
      ? [{ label: "mean D* per bin", role: "optimal" as const, shape: "dot" as const }]
      : []),
    { label: "perfect calibration", role: "reference" },
  ];
  const captions: string[] = [
    `Fractions weigh each side ½ (equal priors); whiskers: ${
      Math.round(level * 100)
    }% Wilson intervals on the bin's count.`,
  ];
  const brief = (e: Estimate) =>
    `${short(e.value, 4)}` +
    (e.ci
      ? ` [${short(e.ci[0], 4)}, ${short(e.ci[1], 4)}] (${levelText(e.level)}, ${e.method})`
      : "");
  if (source.ece) captions.push(`ECE (labels): ${brief(source.ece)}.`);
  if (source.eceVsOptimal) captions.push(`ECE against D*: ${brief(source.eceVsOptimal)}.`);
  return composeFigure({
    title: options.title ?? "Reliability of the trained discriminator",
    subtitle: `n = ${total} outputs in ${source.bins.length} bins`,
    legend,
    columns: 1,
    panels: [
      {
        width,
        height: 330,
        margin: { bottom: 30 },
        layers: [{
          x: { domain: [0, 1], label: null, tickFormat: () => "" },
          y: { domain: [0, 1], label: "fraction real", grid: true },
          marks: main,
        }],
      },
      {
        width,
        height: 150,
        margin: { top: 6 },
        layers: [{
          x: { domain: [0, 1], label: "discriminator output D(x)" },
          y: { label: axisLabel("count", { n: total }), grid: true, nice: true },
          marks: countMarks,
        }],
      },
    ],
    caption: captions,
    marks: main,
  });
}
