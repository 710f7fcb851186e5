/**
 * Numbers, HTML escaping and small result tables (HTML and aligned text) for notebook
 * cells and printed output.
 *
 * @module
 */

/**
 * A number to `digits` significant digits, without trailing zeros, in exponent form when
 * very small or large; NaN and infinities spelled out.
 *
 * @example
 * ```ts
 * import { formatNumber } from "./table.ts";
 * import assert from "node:assert/strict";
 * assert.equal(formatNumber(Math.PI), "3.142");
 * assert.equal(formatNumber(-Math.log(4), 6), "-1.38629");
 * assert.equal(formatNumber(1.5e-7), "1.5e-7");
 * ```
 */
export function formatNumber(x: number, digits = 4): string {
  if (Number.isNaN(x)) return "NaN";
  if (x === Infinity) return "∞";
  if (x === -Infinity) return "-∞";
  if (x === 0) return "0";
  const ax = Math.abs(x);
  if (ax < 1e-4 || ax >= 1e6) {
    const [m, e] = x.toExponential(digits - 1).split("e");
    return `${trimZeros(m)}e${Number(e)}`;
  }
  // toPrecision switches to "1.235e+5" when the exponent reaches `digits`: same form as above.
  const p = x.toPrecision(digits);
  if (p.includes("e")) {
    const [m, e] = p.split("e");
    return `${trimZeros(m)}e${Number(e)}`;
  }
  return trimZeros(p);
}

function trimZeros(s: string): string {
  return s.includes(".") ? s.replace(/0+$/, "").replace(/\.$/, "") : s;
}

/**
 * Escape text for HTML element content and attribute values.
 *
 * @example
 * ```ts
 * import { escapeHtml } from "./table.ts";
 * import assert from "node:assert/strict";
 * assert.equal(escapeHtml('a<b & "c"'), "a&lt;b &amp; &quot;c&quot;");
 * ```
 */
export function escapeHtml(s: string): string {
  return s.replace(
    /[&<>"']/g,
    (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c] as string,
  );
}

/**
 * A number with its uncertainty, as a table shows it: value ± se [ci], or the bare value
 * when `method` is "exact". Every `Estimate` (lib/estimate) is one.
 */
export interface UncertainValue {
  /** The point value. */
  readonly value: number;
  /** "exact" shows the value alone. */
  readonly method: string;
  /** Standard error, when known. */
  readonly se?: number;
  /** Confidence interval, when known. */
  readonly ci?: readonly [number, number];
}

/** A cell of {@linkcode htmlTable}: text, a number (formatted) or an Estimate. */
export type TableCell = string | number | UncertainValue | null | undefined;

/**
 * A compact HTML table with a header row; numbers right-aligned and formatted, Estimates
 * shown as value ± se with their interval. Used by every rich display.
 *
 * @example
 * ```ts
 * import { htmlTable } from "./table.ts";
 * import assert from "node:assert/strict";
 * const html = htmlTable(["term", "value"], [["JSD", 0.1234567]]);
 * assert.match(html, /<th>term<\/th>/);
 * assert.match(html, /0\.1235/);
 * ```
 */
export function htmlTable(
  header: readonly string[],
  rows: readonly (readonly TableCell[])[],
  caption?: string,
): string {
  const cell = (c: TableCell): string => {
    if (c === null || c === undefined) return `<td></td>`;
    if (typeof c === "number") {
      return `<td style="text-align:right;font-variant-numeric:tabular-nums">${
        escapeHtml(formatNumber(c))
      }</td>`;
    }
    if (typeof c === "string") return `<td style="text-align:left">${escapeHtml(c)}</td>`;
    return `<td style="text-align:right;font-variant-numeric:tabular-nums">${
      escapeHtml(estimateCell(c))
    }</td>`;
  };
  const head = header.map((h) => `<th>${escapeHtml(h)}</th>`).join("");
  const body = rows.map((r) => `<tr>${r.map(cell).join("")}</tr>`).join("");
  const cap = caption ? `<caption style="text-align:left">${escapeHtml(caption)}</caption>` : "";
  return `<table class="saddlekit">${cap}<thead><tr>${head}</tr></thead><tbody>${body}</tbody></table>`;
}

/**
 * A plain-text table with aligned columns (the `text/plain` fallback of rich displays).
 *
 * @example
 * ```ts
 * import { textTable } from "./table.ts";
 * import assert from "node:assert/strict";
 * assert.equal(textTable(["a", "b"], [["x", 1]]), "a  b\nx  1");
 * ```
 */
export function textTable(
  header: readonly string[],
  rows: readonly (readonly TableCell[])[],
): string {
  const text = (c: TableCell): string =>
    c === null || c === undefined
      ? ""
      : typeof c === "number"
      ? formatNumber(c)
      : typeof c === "string"
      ? c
      : estimateCell(c);
  const all = [header.map(String), ...rows.map((r) => r.map(text))];
  const widths = header.map((_, j) => Math.max(...all.map((r) => (r[j] ?? "").length)));
  return all.map((r) => r.map((c, j) => c.padEnd(widths[j])).join("  ").trimEnd()).join("\n");
}

function estimateCell(e: UncertainValue): string {
  if (e.method === "exact") return formatNumber(e.value);
  const se = e.se !== undefined ? ` ± ${formatNumber(e.se, 2)}` : "";
  const ci = e.ci ? ` [${formatNumber(e.ci[0])}, ${formatNumber(e.ci[1])}]` : "";
  return `${formatNumber(e.value)}${se}${ci}`;
}
