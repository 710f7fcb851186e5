/**
 * Metrics of several generators side by side, one panel per metric, with intervals.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { GeneratorComparison } from "../metrics/mod.ts";
import { composeFigure, type LegendItem, type PanelSpec } from "./compose.ts";
import { levelText } from "./_estimates.ts";
import type { Figure } from "./figure.ts";
import { short, textWidth } from "./_text.ts";
import { INK, PALETTE } from "./palette.ts";

/** Options of {@linkcode plotGeneratorComparison}. */
export interface GeneratorComparisonPlotOptions {
  /** Title. */
  title?: string;
  /** Panels per row (default 3). */
  columns?: number;
  /** Width of each panel in px (default 260). */
  panelWidth?: number;
}

/**
 * One panel per metric of a {@linkcode compareGenerators} result: each generator's value as
 * a dot with its interval, the better direction in the panel title, and a caption listing
 * the pairwise verdicts (resolved differences and which generator wins).
 *
 * References: Efron 1982 (half-sampling intervals, as in compareGenerators).
 *
 * @example
 * ```ts
 * import { plotGeneratorComparison } from "./generator_comparison_plot.ts";
 * import { compareGenerators } from "../metrics/mod.ts";
 * import assert from "node:assert/strict";
 * const real = Array.from({ length: 60 }, (_, i) => [Math.sin(i), Math.cos(3 * i)]);
 * const a = real.map(([x, y]) => [x + 0.05, y]), b = real.map(([x, y]) => [x + 1, y]);
 * const c = compareGenerators(real, { a, b }, ["frechet"], { replicates: 10 });
 * assert.match(plotGeneratorComparison(c).toSVG(), /frechet/);
 * ```
 */
export function plotGeneratorComparison(
  comparison: GeneratorComparison,
  options: GeneratorComparisonPlotOptions = {},
): Figure {
  const gens = comparison.generators;
  const left = Math.min(180, Math.max(50, ...gens.map((g) => textWidth(g, 11) + 14)));
  const width = options.panelWidth ?? 260;
  const allMarks: Plot.Markish[] = [];
  const panels: PanelSpec[] = comparison.metrics.map((metric) => {
    const rows = comparison.values.filter((v) => v.metric === metric).map((v) => ({
      generator: v.generator,
      value: v.estimate.value,
      lo: v.estimate.ci?.[0] ?? v.estimate.value,
      hi: v.estimate.ci?.[1] ?? v.estimate.value,
      label: short(v.estimate.value, 3),
    }));
    const lo = Math.min(...rows.map((r) => r.lo)), hi = Math.max(...rows.map((r) => r.hi));
    const pad = 0.15 * (hi - lo || Math.abs(hi) || 1);
    const marks: Plot.Markish[] = [
      Plot.ruleY(rows, { y: "generator", x1: "lo", x2: "hi", stroke: INK, strokeWidth: 1.6 }),
      Plot.dot(rows, {
        y: "generator",
        x: "value",
        r: 4.5,
        symbol: PALETTE.generated.symbol,
        fill: PALETTE.generated.color,
        stroke: INK,
        strokeWidth: 0.8,
      }),
      Plot.text(rows, {
        y: "generator",
        x: "hi",
        text: "label",
        dx: 6,
        textAnchor: "start",
        fill: INK,
        fontSize: 10,
      }),
    ];
    allMarks.push(...marks);
    return {
      width,
      height: 60 + 30 * gens.length,
      title: `${metric} (${comparison.better[metric]} is better)`,
      margin: { left, right: 44, bottom: 34, top: 8 },
      layers: [{
        y: { domain: [...gens], label: null, padding: 0.3 },
        x: { domain: [lo - pad, hi + 2 * pad], label: null, grid: true, ticks: 4 },
        marks,
      }],
    };
  });
  const level = comparison.values[0]?.estimate.level ?? 0.95;
  const legend: LegendItem[] = [
    { label: "estimate", role: "generated", shape: "dot" },
    { label: `${levelText(level)} (paired half-sampling)`, color: INK, strokeWidth: 1.6 },
  ];
  const verdicts = comparison.differences.map((d) =>
    `${d.metric}: ${d.a} − ${d.b} = ${short(d.difference.value, 3)} [${
      short(d.difference.ci![0], 3)
    }, ${short(d.difference.ci![1], 3)}], ${d.resolved ? `${d.better} better` : "unresolved"}`
  );
  return composeFigure({
    title: options.title ?? "Generators compared on each metric",
    legend,
    panels,
    columns: options.columns ?? 3,
    caption: verdicts,
    marks: allMarks,
  });
}
