/**
 * Text helpers for hand-placed SVG text: XML escaping and a width estimate for DejaVu Sans
 * (there is no layout engine on the server, so legends are laid out from this estimate).
 *
 * @module
 */

/** Escape text for SVG element content and attribute values. */
export function escapeXml(s: string): string {
  return s.replace(
    /[&<>"']/g,
    (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] as string,
  );
}

const NARROW = new Set([..."ilj.,:;|!'()[]{}ftrI·• "]);
const WIDE = new Set([..."mwMWOQG%@∞≤≥"]);

/**
 * Estimated advance width in px of `s` at `fontSize` in DejaVu Sans (from its metrics:
 * most glyphs are close to 0.63 em, narrow ones 0.32 em, wide ones 0.9 em; an overestimate
 * by a few percent is on purpose so that laid-out text never collides).
 */
export function textWidth(s: string, fontSize: number): number {
  let em = 0;
  for (const ch of s) em += NARROW.has(ch) ? 0.34 : WIDE.has(ch) ? 0.92 : 0.64;
  return em * fontSize;
}

/**
 * Format a number compactly for labels (at most `digits` significant digits), with a true
 * minus sign as Plot's tick labels have.
 */
export function short(x: number, digits = 3): string {
  if (Number.isNaN(x)) return "NaN";
  if (!Number.isFinite(x)) return x > 0 ? "∞" : "−∞";
  if (x === 0) return "0";
  const ax = Math.abs(x);
  let s: string;
  if (ax >= 1e5 || ax < 1e-3) s = ax.toExponential(digits - 1).replace(/\.?0+e/, "e");
  else {
    s = ax.toPrecision(digits);
    if (s.includes(".")) s = s.replace(/0+$/, "").replace(/\.$/, "");
  }
  return x < 0 ? `−${s}` : s;
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

/** Where {@linkcode wrappedText} writes: left edge, top, font, width, spacing, attributes. */
export interface WrappedTextOptions {
  /** Left edge, px. */
  x: number;
  /** The y before the first line, px. */
  y: number;
  /** Font size, px. */
  fontSize: number;
  /** Width the lines wrap at, px. */
  maxWidth: number;
  /** Space added to `fontSize` per line, px. */
  lead: number;
  /** How far above the advanced y the baseline sits, px. */
  rise: number;
  /** Extra attributes of each `<text>` (with a leading space), e.g. ` font-weight="bold"`. */
  attrs: string;
}

/**
 * Wrap `text` at `maxWidth` and append one `<text>` per line to `parts`, advancing y by
 * `fontSize + lead` a line; returns the y after the last line.
 */
export function wrappedText(parts: string[], text: string, o: WrappedTextOptions): number {
  let y = o.y;
  for (const line of wrap(text, o.fontSize, o.maxWidth)) {
    y += o.fontSize + o.lead;
    parts.push(
      `<text x="${o.x}" y="${y - o.rise}" font-size="${o.fontSize}"${o.attrs}>${
        escapeXml(line)
      }</text>`,
    );
  }
  return y;
}
