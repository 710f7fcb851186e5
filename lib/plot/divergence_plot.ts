/**
 * Several divergences side by side as bars with confidence intervals.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { SaddleError } from "../errors/saddle_error.ts";
import { axisLabel, lineStyle } from "./axes.ts";
import { composeFigure, type LegendItem } from "./compose.ts";
import { type EstimateOrNumber, levelText, readEstimate } from "./_estimates.ts";
import type { Figure } from "./figure.ts";
import { short, textWidth } from "./_text.ts";
import { INK, PALETTE } from "./palette.ts";

/** One bar: a named divergence, with an optional reference value (closed form, bound). */
export interface DivergenceBar {
  /** Name shown on the axis ("KL(p_data ‖ p_g)", "JSD"...). */
  name: string;
  /** The estimate. */
  estimate: EstimateOrNumber;
  /** A value to compare against (closed form, known bound), drawn as a tick. */
  reference?: number;
  /** What the reference is (legend text, default "reference value"). */
  referenceLabel?: string;
}

/** Options of {@linkcode plotDivergences}. */
export interface DivergencePlotOptions {
  /** Title. */
  title?: string;
  /**
   * Unit on the axis (default: the estimates' shared unit, none for unitless ones such as
   * TV; with mixed units each value label carries its own; "nats" for plain numbers).
   */
  unit?: string;
  /** Panel width in px (default 620). */
  width?: number;
  /** Height per bar in px (default 34). */
  barHeight?: number;
}

/**
 * Horizontal bars of divergence estimates with their intervals (whiskers) and optional
 * reference ticks, e.g. a closed form or the bound ln 2 of the JSD. Takes a record
 * `{ name: Estimate }` or a list of {@linkcode DivergenceBar}.
 *
 * References: Nowozin, Cseke & Tomioka 2016, f-GAN (NeurIPS), Table 1 (the divergences);
 * Lin 1991 (JSD <= ln 2).
 *
 * @example
 * ```ts
 * import { plotDivergences } from "./divergence_plot.ts";
 * import assert from "node:assert/strict";
 * const fig = plotDivergences([
 *   { name: "KL", estimate: 0.5, reference: 0.5 },
 *   { name: "JSD", estimate: 0.11, reference: Math.LN2, referenceLabel: "ln 2 bound" },
 * ]);
 * assert.match(fig.toSVG(), /ln 2 bound/);
 * ```
 */
export function plotDivergences(
  entries: Readonly<Record<string, EstimateOrNumber>> | readonly DivergenceBar[],
  options: DivergencePlotOptions = {},
): Figure {
  const list: DivergenceBar[] = Array.isArray(entries)
    ? [...(entries as readonly DivergenceBar[])]
    : Object.entries(entries as Record<string, EstimateOrNumber>).map(([name, estimate]) => ({
      name,
      estimate,
    }));
  if (list.length === 0) {
    throw new SaddleError("empty", "no divergences to plot", { parameter: "entries" });
  }
  const read = list.map((b) => ({ b, e: readEstimate(b.estimate) }));
  // Units: one shared unit goes on the axis ("none" is unitless: TV, squared Hellinger);
  // mixed units (KL in nats beside TV) go on each bar's value label instead, so no
  // unitless divergence is labelled in nats.
  const units = [...new Set(read.map(({ e }) => e.unit).filter((u) => u !== undefined))];
  const mixed = options.unit === undefined && units.length > 1;
  const shared = options.unit ?? (units.length === 0 ? "nats" : units[0]);
  const unit = mixed || shared === "none" ? undefined : shared;
  const rows = read.map(({ b, e }) => ({
    name: b.name,
    ...e,
    reference: b.reference,
    label: short(e.value, 3) + (mixed && e.unit && e.unit !== "none" ? ` ${e.unit}` : ""),
  }));
  const withCi = rows.filter((r) => r.lo !== undefined);
  const refs = rows.filter((r) => r.reference !== undefined);
  const all = rows.flatMap((r) => [r.value, r.hi ?? r.value, r.reference ?? 0, r.lo ?? 0, 0]);
  const lo = Math.min(...all), hi = Math.max(...all);
  const pad = 0.12 * (hi - lo || 1);
  const barHeight = options.barHeight ?? 34;
  const left = Math.min(260, Math.max(70, ...rows.map((r) => textWidth(r.name, 11) + 16)));
  const marks: Plot.Markish[] = [
    Plot.barX(rows, {
      y: "name",
      x1: 0,
      x2: "value",
      fill: PALETTE.optimal.color,
      fillOpacity: 0.75,
    }),
    Plot.ruleX([0], { stroke: INK }),
    Plot.ruleY(withCi, { y: "name", x1: "lo", x2: "hi", stroke: INK, strokeWidth: 1.6 }),
    Plot.tickX(withCi, {
      y: "name",
      x: "lo",
      stroke: INK,
      strokeWidth: 1.6,
      inset: barHeight * 0.22,
    }),
    Plot.tickX(withCi, {
      y: "name",
      x: "hi",
      stroke: INK,
      strokeWidth: 1.6,
      inset: barHeight * 0.22,
    }),
    // A white underlay keeps the reference tick visible on top of a bar.
    Plot.tickX(refs, { y: "name", x: "reference", stroke: "white", strokeWidth: 5, inset: -3 }),
    Plot.tickX(refs, {
      y: "name",
      x: "reference",
      ...lineStyle("reference"),
      strokeWidth: 2.4,
      strokeDasharray: "3 2",
      inset: -3,
    }),
    Plot.text(rows, {
      y: "name",
      x: (r: (typeof rows)[number]) => Math.max(r.hi ?? r.value, r.value),
      text: "label",
      dx: 6,
      textAnchor: "start",
      fill: INK,
      fontSize: 10.5,
    }),
  ];
  const refLabels = [
    ...new Set(
      list.filter((b) => b.reference !== undefined).map((b) =>
        b.referenceLabel ?? "reference value"
      ),
    ),
  ];
  const legend: LegendItem[] = [
    { label: "estimate", role: "optimal", shape: "box" },
    ...(withCi.length ? [{ label: levelText(withCi[0].level), color: INK, strokeWidth: 1.6 }] : []),
    ...(refLabels.length
      ? [{
        label: refLabels.join(" / "),
        role: "reference" as const,
        dash: "3 2",
        strokeWidth: 2.4,
      }]
      : []),
  ];
  const ns = [...new Set(rows.map((r) => r.n).filter((n): n is number => !!n))];
  return composeFigure({
    title: options.title ?? "Divergences between the two sides",
    ...(ns.length === 1 ? { subtitle: `n = ${ns[0]}` } : {}),
    legend,
    panels: [{
      width: options.width ?? 620,
      height: 64 + barHeight * rows.length,
      margin: { left, right: 56, bottom: 40, top: 8 },
      layers: [{
        y: { domain: rows.map((r) => r.name), label: null, padding: 0.25 },
        x: {
          domain: [Math.min(0, lo - pad), hi + pad * 1.6],
          label: mixed ? "divergence (units on each value)" : axisLabel("divergence", { unit }),
          grid: true,
        },
        marks,
      }],
    }],
    marks,
  });
}
