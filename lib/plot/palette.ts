/**
 * The one palette of saddlekit: every figure draws real data, generated data, D*, a user's
 * discriminator and reference lines with the same colour, dash and marker.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { type MimeBundle, withDisplay } from "../display/display.ts";
import { escapeHtml, textTable } from "../display/table.ts";

/** What a drawn element stands for. */
export type Role = "real" | "generated" | "optimal" | "discriminator" | "reference";

/** How one {@linkcode Role} is drawn. */
export interface RoleStyle {
  /** Default legend label. */
  readonly label: string;
  /** Stroke and fill colour (sRGB hex). */
  readonly color: string;
  /** SVG `stroke-dasharray` of lines ("none" for solid). */
  readonly dash: string;
  /** Line width in px. */
  readonly strokeWidth: number;
  /** Marker symbol for points (an Observable Plot symbol name). */
  readonly symbol: "circle" | "triangle" | "square" | "diamond" | "cross";
}

/**
 * The palette. Hues were chosen so that the two data sides differ for every common colour
 * vision deficiency (a blue-green against a yellow-orange), and CIE lightness L* steps
 * apart so a greyscale print still separates them; the dash styles separate them again.
 *
 * | role            | colour    | L* | line                   | marker   |
 * | --------------- | --------- | -- | ---------------------- | -------- |
 * | `optimal` (D*)  | `#4a1a4f` | 19 | solid, 2.5 px          | diamond  |
 * | `real`          | `#1f6a88` | 42 | solid, 2 px            | circle   |
 * | `reference`     | `#8a8a8a` | 57 | dotted `2 3`, 1.2 px   | cross    |
 * | `discriminator` | `#e07050` | 60 | dash-dot `8 3 2 3`     | square   |
 * | `generated`     | `#f0b44c` | 77 | dashed `7 3`, 2 px     | triangle |
 *
 * Reference lines mark the values the theory predicts at the equilibrium: D* = 1/2,
 * V(D*, G) = -ln 4, JSD = ln 2 on disjoint supports (Goodfellow et al. 2014; Lin 1991).
 *
 * Heat maps of D* run from the generated colour (D* = 0) through a warm off-white
 * `#f5f2ec` (D* = 1/2) to the real colour (D* = 1): {@linkcode dStarColor}.
 *
 * @example
 * ```ts
 * import { PALETTE } from "./palette.ts";
 * import assert from "node:assert/strict";
 * assert.equal(PALETTE.real.color, "#1f6a88");
 * assert.notEqual(PALETTE.real.dash, PALETTE.generated.dash);
 * ```
 */
export const PALETTE: Readonly<Record<Role, RoleStyle>> = Object.freeze(withDisplay({
  real: Object.freeze({
    label: "real data",
    color: "#1f6a88",
    dash: "none",
    strokeWidth: 2,
    symbol: "circle" as const,
  }),
  generated: Object.freeze({
    label: "generated data",
    color: "#f0b44c",
    dash: "7 3",
    strokeWidth: 2,
    symbol: "triangle" as const,
  }),
  optimal: Object.freeze({
    label: "D* (optimal discriminator)",
    color: "#4a1a4f",
    dash: "none",
    strokeWidth: 2.5,
    symbol: "diamond" as const,
  }),
  discriminator: Object.freeze({
    label: "trained discriminator",
    color: "#e07050",
    dash: "8 3 2 3",
    strokeWidth: 2,
    symbol: "square" as const,
  }),
  reference: Object.freeze({
    label: "reference value",
    color: "#8a8a8a",
    dash: "2 3",
    strokeWidth: 1.2,
    symbol: "cross" as const,
  }),
}, paletteBundle));

/** Text colour of figures (axes, labels). */
export const INK = "#222222";
/** Secondary text colour (subtitles, notes). */
export const INK_MUTED = "#5c5c5c";
/** The neutral midpoint of the D* colour ramp. */
export const NEUTRAL = "#f5f2ec";
/** The font family list of every figure (DejaVu Sans is embedded for PNG output). */
export const FONT_FAMILY = "DejaVu Sans, Verdana, Helvetica, Arial, sans-serif";

/**
 * The colour of a D* value on the shared ramp: generated colour at 0, {@linkcode NEUTRAL}
 * at 1/2, real colour at 1, interpolated linearly in sRGB; values outside [0, 1] clamp.
 * `tint` in [0, 1] mixes the result towards white (heat maps use 0.4, so that points drawn
 * on top stay visible).
 *
 * @example
 * ```ts
 * import { dStarColor, NEUTRAL, PALETTE } from "./palette.ts";
 * import assert from "node:assert/strict";
 * assert.equal(dStarColor(0.5), NEUTRAL);
 * assert.equal(dStarColor(1), PALETTE.real.color);
 * assert.equal(dStarColor(-3), PALETTE.generated.color);
 * assert.equal(dStarColor(1, 1), "#ffffff");
 * ```
 */
export function dStarColor(t: number, tint = 0): string {
  const u = Number.isNaN(t) ? 0.5 : Math.min(1, Math.max(0, t));
  const c = u <= 0.5
    ? mixHex(PALETTE.generated.color, NEUTRAL, u / 0.5)
    : mixHex(NEUTRAL, PALETTE.real.color, (u - 0.5) / 0.5);
  return tint > 0 ? mixHex(c, "#ffffff", Math.min(1, tint)) : c;
}

/**
 * Linear sRGB mix of two hex colours, `t = 0` giving `a` and `t = 1` giving `b`.
 *
 * @example
 * ```ts
 * import { mixHex } from "./palette.ts";
 * import assert from "node:assert/strict";
 * assert.equal(mixHex("#000000", "#ffffff", 0.5), "#808080");
 * ```
 */
export function mixHex(a: string, b: string, t: number): string {
  const pa = parseHex(a), pb = parseHex(b);
  const c = pa.map((v, i) => Math.round(v + (pb[i] - v) * t));
  return `#${c.map((v) => v.toString(16).padStart(2, "0")).join("")}`;
}

/**
 * CIE 1976 lightness L* (0 black to 100 white) of an sRGB hex colour: the number that
 * decides whether two colours stay apart in a greyscale print.
 *
 * References: CIE 15:2004 (L* from relative luminance Y); IEC 61966-2-1 (sRGB transfer).
 *
 * @example
 * ```ts
 * import { cieLightness } from "./palette.ts";
 * import assert from "node:assert/strict";
 * assert.equal(Math.round(cieLightness("#ffffff")), 100);
 * assert.equal(Math.round(cieLightness("#777777")), 50);
 * ```
 */
export function cieLightness(hex: string): number {
  const [r, g, b] = parseHex(hex).map((v) => {
    const c = v / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  });
  const y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  return y > 216 / 24389 ? 116 * Math.cbrt(y) - 16 : (24389 / 27) * y;
}

function parseHex(hex: string): [number, number, number] {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  if (!m) {
    throw new SaddleError("invalid-argument", `expected a #rrggbb colour, got "${hex}"`, {
      parameter: "color",
    });
  }
  return [parseInt(m[1], 16), parseInt(m[2], 16), parseInt(m[3], 16)];
}

/** Rich display of the palette: a swatch, colour, lightness and line style per role. */
function paletteBundle(p: Readonly<Record<Role, RoleStyle>>): MimeBundle {
  const roles = Object.keys(p) as Role[];
  const line = (s: RoleStyle) =>
    `<svg xmlns="http://www.w3.org/2000/svg" width="40" height="12"><line x1="2" y1="6" x2="38" ` +
    `y2="6" stroke="${s.color}" stroke-width="${s.strokeWidth}"${
      s.dash !== "none" ? ` stroke-dasharray="${s.dash}"` : ""
    }/></svg>`;
  const rows = roles.map((r) => {
    const s = p[r];
    return `<tr><td>${escapeHtml(r)}</td><td>${escapeHtml(s.label)}</td><td>${line(s)}</td>` +
      `<td><code>${s.color}</code></td><td style="text-align:right">${
        Math.round(cieLightness(s.color))
      }</td><td>${escapeHtml(s.dash)}</td><td>${s.symbol}</td></tr>`;
  });
  const header = ["role", "label", "line", "colour", "L*", "dash", "marker"];
  return {
    "text/html": `<table class="saddlekit"><caption style="text-align:left">saddlekit palette` +
      `</caption><thead><tr>${header.map((h) => `<th>${h}</th>`).join("")}</tr></thead>` +
      `<tbody>${rows.join("")}</tbody></table>`,
    "text/plain": textTable(
      header.filter((h) => h !== "line"),
      roles.map((r) => [
        r,
        p[r].label,
        p[r].color,
        Math.round(cieLightness(p[r].color)),
        p[r].dash,
        p[r].symbol,
      ]),
    ),
  };
}
