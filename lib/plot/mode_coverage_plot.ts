/**
 * Per-mode coverage bars: each mode's share of the near samples with its interval, against
 * the share the mixture's weights expect.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { ModeCoverage } from "../metrics/mode_coverage.ts";
import { composeFigure } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { PALETTE } from "./palette.ts";

/** Options of {@linkcode plotModeCoverage}. */
export interface ModeCoveragePlotOptions {
  /** Title. */
  title?: string;
  /** Panel width in px (default: 40 per mode, at least 360). */
  width?: number;
  /** Panel height in px (default 260). */
  height?: number;
}

/**
 * Bars of each mode's share of the generated samples near a mode (bootstrap interval as a
 * whisker), with the share the mixture's weights expect as a tick; missed modes are marked.
 * The subtitle carries modes hit, the share within the threshold and the chi-square test.
 *
 * References: Srivastava et al. 2017, VEEGAN (NeurIPS); Pearson 1900.
 *
 * @example
 * ```ts
 * import { plotModeCoverage } from "./mode_coverage_plot.ts";
 * import { modeCoverage } from "../metrics/mod.ts";
 * import assert from "node:assert/strict";
 * const c = modeCoverage([[0, 0], [0.1, 0], [4, 4]], { means: [[0, 0], [4, 4], [8, 8]], sd: 0.5 }, { replicates: 20 });
 * assert.match(plotModeCoverage(c).toSVG(), /missed/);
 * ```
 */
export function plotModeCoverage(c: ModeCoverage, options: ModeCoveragePlotOptions = {}): Figure {
  const rows = c.perMode.map((m) => ({
    label: m.label,
    share: m.share.value,
    lo: m.share.ci?.[0] ?? m.share.value,
    hi: m.share.ci?.[1] ?? m.share.value,
    expected: m.weight,
    hit: m.hit,
  }));
  const labels = rows.map((r) => r.label);
  const marks: Plot.Markish[] = [
    Plot.barY(rows, {
      x: "label",
      y: (r: { share: number }) => (Number.isFinite(r.share) ? r.share : 0),
      fill: PALETTE.generated.color,
    }),
    Plot.ruleX(rows, { x: "label", y1: "lo", y2: "hi", stroke: "#444", strokeWidth: 1.5 }),
    Plot.tickY(rows, { x: "label", y: "expected", stroke: PALETTE.real.color, strokeWidth: 2.5 }),
    Plot.text(rows.filter((r) => !r.hit), {
      x: "label",
      y: 0,
      text: () => "missed",
      dy: -8,
      fill: PALETTE.discriminator.color,
      fontSize: 10,
    }),
    Plot.ruleY([0]),
  ];
  const fmt = (x: number) => (Number.isFinite(x) ? x.toPrecision(3) : String(x));
  return composeFigure({
    title: options.title ?? `Mode coverage: ${c.modesHit.value} of ${c.modes} modes hit`,
    subtitle: `n = ${c.n}; ${fmt(100 * c.shareWithin.value)} % within ${c.within} sd of a mode; ` +
      `chi-square ${fmt(c.chiSquare.value)} (df ${c.df}), p = ${fmt(c.pValue)}`,
    legend: [
      {
        label: "share of near samples (bootstrap interval)",
        color: PALETTE.generated.color,
        shape: "box",
      },
      {
        label: "expected share (mixture weight)",
        color: PALETTE.real.color,
        dash: "none",
        strokeWidth: 2.5,
      },
    ],
    panels: [{
      width: options.width ?? Math.max(360, 40 * c.modes),
      height: options.height ?? 260,
      layers: [{
        x: { domain: labels, label: null, tickRotate: c.modes > 10 ? -45 : 0 },
        y: {
          domain: [
            0,
            Math.max(
                ...rows.map((r) => (Number.isFinite(r.hi) ? r.hi : 0)),
                ...rows.map((r) => r.expected),
              ) * 1.1 || 1,
          ],
          label: "share of near samples",
        },
        marks,
      }],
    }],
    caption: c.notes.length ? [...c.notes] : undefined,
    marks,
  });
}
