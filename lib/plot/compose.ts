/**
 * The frame every saddlekit figure is drawn in: a title, a subtitle, a legend drawn inside
 * the SVG, one or more panels (each an overlay of Observable Plot layers sharing the same
 * size and margins, e.g. a density axis on the left and a D* axis on the right), and notes
 * below. New figures are small additions: give the panels' Plot options and a legend. The
 * legend layout is in `legend.ts`, the SVG post-processing in `svg_cleanup.ts`.
 *
 * @module
 */
import type { PlotLayerOptions, PlotMark } from "./plot_types.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { type RenderedLayer, renderLayer } from "./_dom.ts";
import { escapeXml, wrappedText } from "./_text.ts";
import { layoutLegend, type LegendItem } from "./legend.ts";
import { roundGeometry, uniqueIds } from "./svg_cleanup.ts";
import { Figure } from "./figure.ts";
import { FONT_FAMILY, INK, INK_MUTED } from "./palette.ts";

export type { LegendEntry, LegendItem, RampLegend } from "./legend.ts";

/** Margins of a panel in px. */
export interface Margins {
  /** Default 18. */
  top?: number;
  /** Default 22. */
  right?: number;
  /** Default 46. */
  bottom?: number;
  /** Default 62. */
  left?: number;
}

/** One panel: Plot layers drawn on top of each other with the same size and margins. */
export interface PanelSpec {
  /** Panel width in px. */
  width: number;
  /** Panel height in px. */
  height: number;
  /** Margins (the same for every layer, so that their scales line up). */
  margin?: Margins;
  /**
   * Plot options of each layer, bottom first. A later layer should give its x domain
   * explicitly and may carry a second y axis (`y: { axis: "right" }`).
   */
  layers: readonly PlotLayerOptions[];
  /** A title above the panel. */
  title?: string;
}

/** The whole figure. */
export interface FrameSpec {
  /** Title (bold, top left). */
  title?: string;
  /** One line under the title (sample sizes, units, method). */
  subtitle?: string;
  /** Legend entries, laid out in rows above the panels. */
  legend?: readonly LegendItem[];
  /** Panels, left to right, wrapping after `columns`. */
  panels: readonly PanelSpec[];
  /** Panels per row (default: all in one row). */
  columns?: number;
  /** Notes under the panels (one string per paragraph). */
  caption?: string | readonly string[];
  /** The marks to expose on the Figure (default: the first layer's marks). */
  marks?: readonly PlotMark[];
}

/** Defaults shared by every panel. */
export const FRAME = Object.freeze({
  pad: 12,
  gap: 18,
  fontSize: 11,
  titleSize: 15,
  subtitleSize: 11.5,
  legendSize: 11,
  captionSize: 10,
  margin: Object.freeze({ top: 18, right: 22, bottom: 46, left: 62 }),
});

/**
 * Draw a figure from panels of Plot layers: one standalone SVG with the legend, title and
 * notes inside it (Plot's own HTML legends are never used, so the result is always one
 * `<svg>`).
 *
 * @example
 * ```ts
 * import * as Plot from "@observablehq/plot";
 * import { composeFigure } from "./compose.ts";
 * import assert from "node:assert/strict";
 * const fig = composeFigure({
 *   title: "A line",
 *   legend: [{ label: "real data", role: "real" }],
 *   panels: [{ width: 300, height: 200, layers: [{ marks: [Plot.lineY([1, 3, 2])] }] }],
 * });
 * assert.match(fig.toSVG(), /^<svg xmlns="http:\/\/www.w3.org\/2000\/svg"/);
 * assert.match(fig.toSVG(), />real data</);
 * assert.equal(fig.marks.length, 1);
 * ```
 *
 * @example A new figure in a few lines: a training curve with its equilibrium value
 * ```ts
 * import * as Plot from "@observablehq/plot";
 * import { composeFigure } from "./compose.ts";
 * import { axisLabel, EQUILIBRIUM_VALUES, lineStyle, referenceY } from "./axes.ts";
 * import assert from "node:assert/strict";
 * const steps = Array.from({ length: 50 }, (_, i) => ({ step: i, v: -1.39 + Math.exp(-i / 8) }));
 * const fig = composeFigure({
 *   title: "Discriminator loss during training",
 *   legend: [{ label: "V(D, G)", role: "discriminator" }, { label: "−ln 4", role: "reference" }],
 *   panels: [{
 *     width: 480,
 *     height: 260,
 *     layers: [{
 *       x: { label: "step" },
 *       y: { label: axisLabel("V(D, G)", { unit: "nats" }) },
 *       marks: [
 *         Plot.lineY(steps, { x: "step", y: "v", ...lineStyle("discriminator") }),
 *         ...referenceY(EQUILIBRIUM_VALUES.value, { label: "−ln 4" }),
 *       ],
 *     }],
 *   }],
 * });
 * assert.match(fig.toSVG(), /V\(D, G\) \(nats\)/);
 * ```
 */
export function composeFigure(spec: FrameSpec): Figure {
  if (spec.panels.length === 0) {
    throw new SaddleError("empty", "a figure needs at least one panel", { parameter: "panels" });
  }
  for (const [i, p] of spec.panels.entries()) {
    if (!(p.width > 0 && p.height > 0 && Number.isFinite(p.width + p.height))) {
      throw new SaddleError(
        "invalid-argument",
        `panel ${i} needs a positive width and height in px, got ${p.width} x ${p.height}`,
        { parameter: "width" },
      );
    }
  }
  const columns = Math.max(1, Math.min(spec.columns ?? spec.panels.length, spec.panels.length));
  const rows: PanelSpec[][] = [];
  for (let i = 0; i < spec.panels.length; i += columns) {
    rows.push(spec.panels.slice(i, i + columns));
  }
  const rowWidth = (r: PanelSpec[]) =>
    r.reduce((s, p) => s + p.width, 0) + FRAME.gap * (r.length - 1);
  const rendered = spec.panels.map((p) => p.layers.map((l) => renderLayer(layerOptions(p, l))));
  const legendItems: LegendItem[] = [...(spec.legend ?? [])];
  let title = spec.title, subtitle = spec.subtitle;
  const captions = typeof spec.caption === "string" ? [spec.caption] : [...(spec.caption ?? [])];
  const rawLegends: { inner: string; width: number; height: number }[] = [];
  for (const layers of rendered) {
    for (const l of layers) {
      for (const s of l.swatches) {
        legendItems.push({ label: s.label, color: s.color, shape: "box" });
      }
      rawLegends.push(...l.extras);
      title ??= l.title;
      subtitle ??= l.subtitle;
      if (l.caption) captions.push(l.caption);
    }
  }
  const contentWidth = Math.max(...rows.map(rowWidth));
  const width = Math.round(contentWidth + 2 * FRAME.pad);
  const parts: string[] = [];
  let y: number = FRAME.pad;
  const muted = ` fill="${INK_MUTED}"`;
  const lines = { x: FRAME.pad, maxWidth: contentWidth };
  if (title) {
    const bold = ' font-weight="bold"';
    y = wrappedText(parts, title, {
      ...lines,
      y,
      fontSize: FRAME.titleSize,
      lead: 3,
      rise: 4,
      attrs: bold,
    });
    y += 2;
  }
  if (subtitle) {
    y = wrappedText(parts, subtitle, {
      ...lines,
      y,
      fontSize: FRAME.subtitleSize,
      lead: 4,
      rise: 4,
      attrs: muted,
    });
  }
  if (legendItems.length || rawLegends.length) {
    y += 6;
    const legend = layoutLegend(legendItems, rawLegends, {
      maxWidth: contentWidth,
      x: FRAME.pad,
      y,
      fontSize: FRAME.legendSize,
    });
    parts.push(legend.svg);
    y += legend.height;
  }
  y += 4;
  let k = 0;
  for (const row of rows) {
    const hasTitle = row.some((p) => p.title);
    const titleH = hasTitle ? 18 : 0;
    let x = FRAME.pad;
    for (const p of row) {
      if (p.title) {
        parts.push(
          `<text x="${x + (p.margin?.left ?? FRAME.margin.left)}" y="${
            y + 13
          }" font-size="12" font-weight="bold">${escapeXml(p.title)}</text>`,
        );
      }
      for (const layer of rendered[k]) parts.push(placeLayer(layer, x, y + titleH));
      x += p.width + FRAME.gap;
      k++;
    }
    y += titleH + Math.max(...row.map((p) => p.height)) + 6;
  }
  if (captions.length) {
    y += 2;
    for (const para of captions) {
      y = wrappedText(parts, para, {
        ...lines,
        y,
        fontSize: FRAME.captionSize,
        lead: 4,
        rise: 3,
        attrs: muted,
      });
    }
  }
  const height = Math.round(y + FRAME.pad);
  const markup = `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" ` +
    `viewBox="0 0 ${width} ${height}" font-family="${FONT_FAMILY}" font-size="${FRAME.fontSize}" ` +
    `fill="${INK}" color="${INK}">` +
    (title ? `<title>${escapeXml(title)}</title>` : "") +
    `<rect x="0" y="0" width="${width}" height="${height}" fill="white"/>` +
    parts.join("") + `</svg>`;
  const svg = uniqueIds(roundGeometry(markup));
  const layers = spec.panels.flatMap((p) => p.layers.map((l) => layerOptions(p, l)));
  const marks = spec.marks ?? flatMarks(spec.panels[0].layers[0]?.marks);
  return new Figure(svg, { width, height, marks, layers, ...(title ? { title } : {}) });
}

function flatMarks(m: readonly PlotMark[] | undefined): PlotMark[] {
  return m ? [...m] : [];
}

function layerOptions(p: PanelSpec, l: PlotLayerOptions): PlotLayerOptions {
  const m = { ...FRAME.margin, ...p.margin };
  const axisDefaults = { labelArrow: "none" as const, labelAnchor: "center" as const };
  return {
    ...l,
    width: p.width,
    height: p.height,
    marginTop: m.top,
    marginRight: m.right,
    marginBottom: m.bottom,
    marginLeft: m.left,
    x: { ...axisDefaults, ...l.x },
    y: { ...axisDefaults, ...l.y },
  };
}

function placeLayer(layer: RenderedLayer, x: number, y: number): string {
  return `<g transform="translate(${r2(x)},${r2(y)})" text-anchor="${layer.textAnchor}" ` +
    `fill="currentColor">${layer.inner}</g>`;
}

function r2(v: number): number {
  return Math.round(v * 100) / 100;
}
