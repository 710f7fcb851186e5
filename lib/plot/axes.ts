/**
 * Shared pieces of every figure: axis labels with units and sample sizes, styles of the
 * palette's roles as Plot options, and reference lines at the equilibrium values. Later
 * figures (value surfaces, training curves) reuse these.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { INK_MUTED, PALETTE, type Role } from "./palette.ts";
import type { PlotMark } from "./plot_types.ts";

/** Units shown in axis labels. */
export type AxisUnit = "nats" | "bits" | string;

/**
 * An axis label "name (unit)", with ", n = ..." when a sample size is given.
 *
 * @example
 * ```ts
 * import { axisLabel } from "./axes.ts";
 * import assert from "node:assert/strict";
 * assert.equal(axisLabel("JSD", { unit: "nats" }), "JSD (nats)");
 * assert.equal(axisLabel("count", { n: 2000 }), "count (n = 2000)");
 * ```
 */
export function axisLabel(name: string, { unit, n }: { unit?: AxisUnit; n?: number } = {}): string {
  const parts = [unit, n !== undefined ? `n = ${n}` : undefined].filter(Boolean);
  return parts.length ? `${name} (${parts.join(", ")})` : name;
}

/**
 * Plot stroke options drawing a line in a role's style (colour, width, dash).
 *
 * @example
 * ```ts
 * import { lineStyle } from "./axes.ts";
 * import assert from "node:assert/strict";
 * assert.equal(lineStyle("generated").strokeDasharray, "7 3");
 * ```
 */
export function lineStyle(role: Role): {
  stroke: string;
  strokeWidth: number;
  strokeDasharray?: string;
} {
  const s = PALETTE[role];
  return {
    stroke: s.color,
    strokeWidth: s.strokeWidth,
    ...(s.dash !== "none" ? { strokeDasharray: s.dash } : {}),
  };
}

/**
 * Plot options drawing points in a role's style (colour, symbol).
 *
 * @example
 * ```ts
 * import { dotStyle } from "./axes.ts";
 * import assert from "node:assert/strict";
 * assert.equal(dotStyle("real").symbol, "circle");
 * ```
 */
export function dotStyle(role: Role): { fill: string; symbol: string; stroke: string } {
  const s = PALETTE[role];
  return { fill: s.color, symbol: s.symbol, stroke: "none" };
}

/** The values the theory predicts at the equilibrium p_g = p_data, and the saturation bound. */
export const EQUILIBRIUM_VALUES: Readonly<{ dStar: number; value: number; jsdMax: number }> = Object
  .freeze({
    /** D*(x) = 1/2 everywhere (Goodfellow et al. 2014, Prop. 1). */
    dStar: 0.5,
    /** V(D*, G) = -ln 4 (Goodfellow et al. 2014, Thm. 1). */
    value: -Math.log(4),
    /** JSD = ln 2, its maximum, reached on disjoint supports (Lin 1991). */
    jsdMax: Math.LN2,
  });

/** Options of {@linkcode referenceY} and {@linkcode referenceX}. */
export interface ReferenceOptions {
  /** Text placed at the end of the line. */
  label?: string;
  /**
   * Where the label goes: above the line at its "start" or "end" (default), or "outside"
   * the frame (right of a horizontal line, in the right margin; above a vertical one).
   */
  at?: "start" | "end" | "outside";
}

/**
 * A horizontal reference line (equilibrium value) in the palette's reference style, with an
 * optional label above its end: `[rule, text?]` marks.
 *
 * @example
 * ```ts
 * import { referenceY } from "./axes.ts";
 * import assert from "node:assert/strict";
 * assert.equal(referenceY(0.5, { label: "D* = 1/2" }).length, 2);
 * ```
 */
export function referenceY(value: number, options: ReferenceOptions = {}): PlotMark[] {
  const marks: PlotMark[] = [Plot.ruleY([value], { ...lineStyle("reference") })];
  if (options.label && options.at === "outside") {
    marks.push(
      Plot.text([options.label], {
        frameAnchor: "right",
        y: [value],
        dx: 6,
        textAnchor: "start",
        lineAnchor: "middle",
        fill: INK_MUTED,
        fontSize: 10,
      }),
    );
  } else if (options.label) {
    const end = (options.at ?? "end") === "end";
    marks.push(
      Plot.text([options.label], {
        frameAnchor: end ? "right" : "left",
        y: [value],
        dy: -7,
        dx: end ? -4 : 4,
        textAnchor: end ? "end" : "start",
        fill: INK_MUTED,
        fontSize: 10,
      }),
    );
  }
  return marks;
}

/**
 * A vertical reference line with an optional label near its top: `[rule, text?]` marks.
 *
 * @example
 * ```ts
 * import { referenceX } from "./axes.ts";
 * import assert from "node:assert/strict";
 * assert.equal(referenceX(-Math.log(4)).length, 1);
 * ```
 */
export function referenceX(value: number, options: ReferenceOptions = {}): PlotMark[] {
  const marks: PlotMark[] = [Plot.ruleX([value], { ...lineStyle("reference") })];
  if (options.label) {
    const top = (options.at ?? "end") !== "start";
    marks.push(
      Plot.text([options.label], {
        frameAnchor: top ? "top" : "bottom",
        x: [value],
        dx: 5,
        dy: top ? 4 : -4,
        textAnchor: "start",
        fill: INK_MUTED,
        fontSize: 10,
      }),
    );
  }
  return marks;
}
