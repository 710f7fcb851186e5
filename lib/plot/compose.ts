/**
 * The frame every saddlekit figure is drawn in: a title, a subtitle, a legend drawn inside
 * the SVG, one or more panels (each an overlay of Observable Plot layers sharing the same
 * size and margins, e.g. a density axis on the left and a D* axis on the right), and notes
 * below. New figures are small additions: give the panels' Plot options and a legend.
 *
 * @module
 */
import type { PlotLayerOptions, PlotMark } from "./plot_types.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { type RenderedLayer, renderLayer } from "./_dom.ts";
import { escapeXml, short, textWidth } from "./_text.ts";
import { Figure } from "./figure.ts";
import { FONT_FAMILY, INK, INK_MUTED, PALETTE, type Role, type RoleStyle } from "./palette.ts";

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

/** A legend entry: a line, point, box or band in a role's (or a given) style. */
export interface LegendEntry {
  /** Text of the entry. */
  label: string;
  /** Style to draw with (colour, dash, symbol); `color`/`dash` override it. */
  role?: Role;
  /** Colour (default: the role's). */
  color?: string;
  /** Dash array (default: the role's; "none" for solid). */
  dash?: string;
  /** Line width (default: the role's). */
  strokeWidth?: number;
  /** What the swatch looks like (default "line"). */
  shape?: "line" | "dot" | "box" | "band";
}

/** A continuous colour ramp in the legend. */
export interface RampLegend {
  /** Draw a ramp. */
  shape: "ramp";
  /** Text before the ramp. */
  label: string;
  /** Values at the two ends. */
  domain: readonly [number, number];
  /** Colour of a value. */
  color: (value: number) => string;
  /** Values to label under the ramp (default: the ends and the middle). */
  ticks?: readonly number[];
}

/** Anything the legend shows. */
export type LegendItem = LegendEntry | RampLegend;

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

interface Placed {
  svg: string;
  height: number;
}

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
  let y = FRAME.pad;
  if (title) {
    for (const line of wrap(title, FRAME.titleSize, contentWidth)) {
      y += FRAME.titleSize + 3;
      parts.push(
        `<text x="${FRAME.pad}" y="${y - 4}" font-size="${FRAME.titleSize}" font-weight="bold">${
          escapeXml(line)
        }</text>`,
      );
    }
    y += 2;
  }
  if (subtitle) {
    for (const line of wrap(subtitle, FRAME.subtitleSize, contentWidth)) {
      y += FRAME.subtitleSize + 4;
      parts.push(
        `<text x="${FRAME.pad}" y="${
          y - 4
        }" font-size="${FRAME.subtitleSize}" fill="${INK_MUTED}">${escapeXml(line)}</text>`,
      );
    }
  }
  if (legendItems.length || rawLegends.length) {
    y += 6;
    const legend = layoutLegend(legendItems, rawLegends, contentWidth, FRAME.pad, y);
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
      for (const line of wrap(para, FRAME.captionSize, contentWidth)) {
        y += FRAME.captionSize + 4;
        parts.push(
          `<text x="${FRAME.pad}" y="${
            y - 3
          }" font-size="${FRAME.captionSize}" fill="${INK_MUTED}">${escapeXml(line)}</text>`,
        );
      }
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

const GEOMETRY = /\s(d|transform|x|y|x1|x2|y1|y2|cx|cy|r|width|height|points)="([^"]*)"/g;

/**
 * Round the numbers in geometry attributes to 0.01 px (Plot writes positions with 15
 * digits): figures get several times smaller and nothing moves visibly. Text is untouched.
 */
export function roundGeometry(svg: string): string {
  return svg.replace(
    GEOMETRY,
    (_, name: string, value: string) =>
      ` ${name}="${
        value.replace(/-?\d+\.\d{3,}/g, (num) => {
          const r = Math.round(Number(num) * 100) / 100;
          return String(Object.is(r, -0) ? 0 : r);
        })
      }"`,
  );
}

/**
 * Give the ids inside a figure (Plot's clip paths) names of their own: numbered in order of
 * appearance (deterministic output, whatever Plot's global counter says) and prefixed with
 * a hash of the figure, so that several figures inlined in one notebook page never pick up
 * each other's clip paths.
 */
export function uniqueIds(svg: string): string {
  const ids = new Map<string, string>();
  for (const m of svg.matchAll(/\sid="([^"]+)"/g)) {
    if (!ids.has(m[1])) ids.set(m[1], `k${ids.size + 1}`);
  }
  if (ids.size === 0) return svg;
  const rename = (s: string, f: (id: string) => string) =>
    s.replace(/(\sid=")([^"]+)(")/g, (_, a, id, b) => `${a}${f(id)}${b}`)
      .replace(/url\(#([^)]+)\)/g, (m, id) => (ids.has(id) ? `url(#${f(id)})` : m))
      .replace(/(href=")#([^"]+)(")/g, (m, a, id, b) => (ids.has(id) ? `${a}#${f(id)}${b}` : m));
  const local = rename(svg, (id) => ids.get(id) as string);
  let h = 0x811c9dc5;
  for (let i = 0; i < local.length; i++) h = Math.imul(h ^ local.charCodeAt(i), 0x01000193);
  const prefix = `sk${(h >>> 0).toString(36)}-`;
  return rename(svg, (id) => prefix + (ids.get(id) as string));
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

/** Break `text` into lines that fit `maxWidth` at `fontSize` (words longer than a line stay). */
export function wrap(text: string, fontSize: number, maxWidth: number): string[] {
  const words = text.split(/\s+/).filter(Boolean);
  const lines: string[] = [];
  let cur = "";
  for (const w of words) {
    const next = cur ? `${cur} ${w}` : w;
    if (cur && textWidth(next, fontSize) > maxWidth) {
      lines.push(cur);
      cur = w;
    } else cur = next;
  }
  if (cur) lines.push(cur);
  return lines;
}

function entryStyle(e: LegendEntry): { color: string; dash: string; width: number; s: RoleStyle } {
  const s = PALETTE[e.role ?? "reference"];
  return {
    color: e.color ?? s.color,
    dash: e.dash ?? (e.role ? s.dash : "none"),
    width: e.strokeWidth ?? s.strokeWidth,
    s,
  };
}

/** SVG of a legend swatch 24 px wide centred on (x + 12, y). */
function swatch(e: LegendEntry, x: number, y: number): string {
  const { color, dash, width, s } = entryStyle(e);
  const shape = e.shape ?? "line";
  const dashAttr = dash !== "none" ? ` stroke-dasharray="${dash}"` : "";
  if (shape === "box") {
    return `<rect x="${x + 4}" y="${
      y - 6
    }" width="16" height="12" fill="${color}" fill-opacity="0.85"/>`;
  }
  if (shape === "band") {
    return `<rect x="${x}" y="${
      y - 6
    }" width="24" height="12" fill="${color}" fill-opacity="0.25"/>` +
      `<line x1="${x}" y1="${y}" x2="${
        x + 24
      }" y2="${y}" stroke="${color}" stroke-width="${width}"${dashAttr}/>`;
  }
  if (shape === "dot") return symbolPath(e.role ? s.symbol : "circle", x + 12, y, color);
  return `<line x1="${x}" y1="${y}" x2="${
    x + 24
  }" y2="${y}" stroke="${color}" stroke-width="${width}"${dashAttr}/>`;
}

function symbolPath(symbol: RoleStyle["symbol"], cx: number, cy: number, color: string): string {
  const r = 4.5;
  switch (symbol) {
    case "triangle":
      return `<path d="M${cx},${cy - r}L${cx + r},${cy + r * 0.8}L${cx - r},${
        cy + r * 0.8
      }Z" fill="${color}"/>`;
    case "square":
      return `<rect x="${cx - r * 0.8}" y="${cy - r * 0.8}" width="${r * 1.6}" height="${
        r * 1.6
      }" fill="${color}"/>`;
    case "diamond":
      return `<path d="M${cx},${cy - r}L${cx + r},${cy}L${cx},${cy + r}L${
        cx - r
      },${cy}Z" fill="${color}"/>`;
    case "cross":
      return `<path d="M${cx - r},${cy}H${cx + r}M${cx},${cy - r}V${
        cy + r
      }" stroke="${color}" stroke-width="1.6"/>`;
    default:
      return `<circle cx="${cx}" cy="${cy}" r="${r * 0.9}" fill="${color}"/>`;
  }
}

const RAMP_WIDTH = 150;

function layoutLegend(
  items: readonly LegendItem[],
  raw: readonly { inner: string; width: number; height: number }[],
  maxWidth: number,
  x0: number,
  y0: number,
): Placed {
  const fs = FRAME.legendSize;
  const parts: string[] = [];
  let x = x0, y = y0, rowH = 18;
  const place = (w: number, h: number) => {
    if (x > x0 && x - x0 + w > maxWidth) {
      x = x0;
      y += rowH;
      rowH = 18;
    }
    rowH = Math.max(rowH, h);
    const at = { x, y };
    x += w + 16;
    return at;
  };
  for (const it of items) {
    if (it.shape === "ramp") {
      const lw = textWidth(it.label, fs) + 8;
      const at = place(lw + RAMP_WIDTH + 8, 32);
      const cy = at.y + 8;
      parts.push(`<text x="${at.x}" y="${cy + 4}" font-size="${fs}">${escapeXml(it.label)}</text>`);
      const rx = at.x + lw, steps = 30, [a, b] = it.domain;
      for (let i = 0; i < steps; i++) {
        const v = a + ((i + 0.5) / steps) * (b - a);
        parts.push(
          `<rect x="${r2(rx + (i * RAMP_WIDTH) / steps)}" y="${cy - 6}" width="${
            r2(RAMP_WIDTH / steps + 0.4)
          }" height="12" fill="${it.color(v)}"/>`,
        );
      }
      parts.push(
        `<rect x="${rx}" y="${
          cy - 6
        }" width="${RAMP_WIDTH}" height="12" fill="none" stroke="${INK_MUTED}" stroke-width="0.5"/>`,
      );
      for (const t of it.ticks ?? [a, (a + b) / 2, b]) {
        const tx = r2(rx + ((t - a) / (b - a)) * RAMP_WIDTH);
        parts.push(
          `<line x1="${tx}" y1="${cy + 6}" x2="${tx}" y2="${
            cy + 9
          }" stroke="${INK}" stroke-width="0.8"/>` +
            `<text x="${tx}" y="${cy + 19}" font-size="${fs - 1.5}" text-anchor="middle">${
              escapeXml(short(t))
            }</text>`,
        );
      }
    } else {
      const w = 24 + 6 + textWidth(it.label, fs);
      const at = place(w, 18);
      const cy = at.y + 8;
      parts.push(swatch(it, at.x, cy));
      parts.push(
        `<text x="${at.x + 30}" y="${cy + 4}" font-size="${fs}">${escapeXml(it.label)}</text>`,
      );
    }
  }
  for (const r of raw) {
    const at = place(r.width, r.height);
    parts.push(`<g transform="translate(${at.x},${at.y})">${r.inner}</g>`);
  }
  return { svg: `<g aria-label="legend">${parts.join("")}</g>`, height: y - y0 + rowH };
}
