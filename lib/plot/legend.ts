/**
 * The legend drawn inside every figure's SVG: entry types (line, dot, box, band, colour
 * ramp), their swatches in the palette's role styles, and the row layout.
 *
 * @module
 */
import { escapeXml, short, textWidth } from "./_text.ts";
import { INK, INK_MUTED, PALETTE, type Role, type RoleStyle } from "./palette.ts";

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

/** Where and how large {@linkcode layoutLegend} draws. */
export interface LegendLayout {
  /** Width available for a row of entries, px. */
  maxWidth: number;
  /** Left edge, px. */
  x: number;
  /** Top edge, px. */
  y: number;
  /** Font size of the labels, px. */
  fontSize: number;
}

/**
 * Lay the legend out in rows that wrap at `maxWidth`: entries (swatch and label), colour
 * ramps, then raw legends already drawn (their inner SVG and size). Returns the SVG group
 * and its height.
 */
export function layoutLegend(
  items: readonly LegendItem[],
  raw: readonly { inner: string; width: number; height: number }[],
  layout: LegendLayout,
): { svg: string; height: number } {
  const { maxWidth, x: x0, y: y0, fontSize: fs } = layout;
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

function r2(v: number): number {
  return Math.round(v * 100) / 100;
}
