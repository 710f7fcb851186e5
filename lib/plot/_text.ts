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
