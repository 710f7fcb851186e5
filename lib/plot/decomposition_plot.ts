/**
 * The value at the optimum split into its terms, as a waterfall with confidence intervals:
 * V(D*, G) = -ln 4 + KL(p_data || m) + KL(p_g || m).
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { axisLabel, EQUILIBRIUM_VALUES, referenceY } from "./axes.ts";
import { composeFigure } from "./compose.ts";
import { type EstimateOrNumber, levelText, readEstimate } from "./_estimates.ts";
import type { Figure } from "./figure.ts";
import { short } from "./_text.ts";
import { INK, PALETTE } from "./palette.ts";

/** The terms of the decomposition (the shape `optimumDecomposition` returns). */
export interface DecompositionTerms {
  /** V(D*, G). */
  value: EstimateOrNumber;
  /** KL(p_data || m), m = (p_data + p_g) / 2. */
  klRealMix: EstimateOrNumber;
  /** KL(p_g || m). */
  klFakeMix: EstimateOrNumber;
  /** The constant -ln 4 (default exact; -2 when the terms are in bits). */
  constant?: EstimateOrNumber;
}

/** Options of {@linkcode plotDecomposition}. */
export interface DecompositionPlotOptions {
  /** Title. */
  title?: string;
  /** Unit label (default: the value's unit, else "nats"). */
  unit?: string;
  /** Panel width in px (default 560). */
  width?: number;
  /** Panel height in px (default 360). */
  height?: number;
}

/**
 * A waterfall of V(D*, G) = -ln 4 + KL(p_data || m) + KL(p_g || m): the constant bar, each
 * KL term stacked on it with its interval, and the total with its interval, between the
 * reference lines -ln 4 (p_g = p_data) and 0 (disjoint supports, JSD = ln 2).
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Thm. 1;
 * Lin 1991 (JSD <= ln 2).
 *
 * @example
 * ```ts
 * import { plotDecomposition } from "./decomposition_plot.ts";
 * import assert from "node:assert/strict";
 * const fig = plotDecomposition({ value: -1.2, klRealMix: 0.09, klFakeMix: 0.096 });
 * const svg = fig.toSVG();
 * assert.match(svg, /KL\(p_data ‖ m\)/);
 * assert.equal((svg.match(/aria-label="bar"/g) ?? []).length, 1);
 * ```
 */
export function plotDecomposition(
  terms: DecompositionTerms,
  options: DecompositionPlotOptions = {},
): Figure {
  const v = readEstimate(terms.value);
  const k1 = readEstimate(terms.klRealMix);
  const k2 = readEstimate(terms.klFakeMix);
  const unit = options.unit ?? v.unit ?? "nats";
  const bits = unit === "bits";
  // In bits the constant is -log2 4 = -2; the upper end (disjoint supports) is 0 either way.
  const c = readEstimate(terms.constant ?? (bits ? -2 : EQUILIBRIUM_VALUES.value));
  const cName = bits ? "−log₂ 4" : "−ln 4";
  const names = [`constant ${cName}`, "+ KL(p_data ‖ m)", "+ KL(p_g ‖ m)", "= V(D*, G)"];
  const bars = [
    { name: names[0], y1: 0, y2: c.value, fill: PALETTE.reference.color, label: short(c.value, 4) },
    {
      name: names[1],
      y1: c.value,
      y2: c.value + k1.value,
      fill: PALETTE.real.color,
      label: signed(k1.value),
      lo: k1.lo !== undefined ? c.value + k1.lo : undefined,
      hi: k1.hi !== undefined ? c.value + k1.hi : undefined,
    },
    {
      name: names[2],
      y1: c.value + k1.value,
      y2: c.value + k1.value + k2.value,
      fill: PALETTE.generated.color,
      label: signed(k2.value),
      lo: k2.lo !== undefined ? c.value + k1.value + k2.lo : undefined,
      hi: k2.hi !== undefined ? c.value + k1.value + k2.hi : undefined,
    },
    {
      name: names[3],
      y1: 0,
      y2: v.value,
      fill: PALETTE.optimal.color,
      label: short(v.value, 4),
      lo: v.lo,
      hi: v.hi,
    },
  ];
  const whiskers = bars.filter((b) => b.lo !== undefined && b.hi !== undefined);
  const lows = bars.flatMap((b) => [b.y1, b.y2, b.lo ?? b.y2]);
  const highs = bars.flatMap((b) => [b.y1, b.y2, b.hi ?? b.y2]);
  const yMin = Math.min(...lows, c.value), yMax = Math.max(...highs, 0);
  const span = yMax - yMin;
  const width = options.width ?? 620;
  const band = (width - 62 - 112) / 4;
  const marks: Plot.Markish[] = [
    Plot.barY(bars, { x: "name", y1: "y1", y2: "y2", fill: "fill", fillOpacity: 0.9 }),
    ...referenceY(c.value, { label: `${cName}\np_g = p_data`, at: "outside" }),
    ...referenceY(0, { label: "0\ndisjoint supports", at: "outside" }),
    Plot.ruleX(whiskers, { x: "name", y1: "lo", y2: "hi", stroke: INK, strokeWidth: 1.6 }),
    Plot.tickY(whiskers, { x: "name", y: "lo", stroke: INK, strokeWidth: 1.6, inset: band * 0.38 }),
    Plot.tickY(whiskers, { x: "name", y: "hi", stroke: INK, strokeWidth: 1.6, inset: band * 0.38 }),
  ];
  const tickText = new Map(bars.map((b) => [b.name, `${b.name}\n${b.label}`]));
  const level = v.level ?? k1.level ?? 0.95;
  return composeFigure({
    title: options.title ?? "Value at the optimum, term by term",
    subtitle: `V(D*, G) = ${cName} + KL(p_data ‖ m) + KL(p_g ‖ m), m = (p_data + p_g)/2` +
      (v.n ? `; n = ${v.n}` : ""),
    legend: [
      { label: `constant ${cName}`, role: "reference", shape: "box" },
      { label: "KL(p_data ‖ m)", role: "real", shape: "box" },
      { label: "KL(p_g ‖ m)", role: "generated", shape: "box" },
      { label: "V(D*, G)", role: "optimal", shape: "box" },
      ...(whiskers.length ? [{ label: levelText(level), color: INK, strokeWidth: 1.6 }] : []),
    ],
    panels: [{
      width,
      height: options.height ?? 360,
      margin: { right: 112, bottom: 52 },
      layers: [{
        x: { domain: names, label: null, padding: 0.3, tickFormat: (d: string) => tickText.get(d) },
        y: {
          domain: [yMin - 0.12 * span, yMax + 0.12 * span],
          label: axisLabel("value", { unit }),
          grid: true,
        },
        marks,
      }],
    }],
    ...(v.method ? { caption: `Intervals: ${v.method}.` } : {}),
    marks,
  });
}

function signed(x: number): string {
  return x >= 0 ? `+${short(x, 3)}` : short(x, 3);
}
