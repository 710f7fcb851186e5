/**
 * Text and HTML formatting of estimates and small result tables for notebook cells.
 *
 * @module
 */
import type { Estimate } from "./estimate.ts";

/**
 * A number to `digits` significant digits, without trailing zeros, in exponent form when
 * very small or large; NaN and infinities spelled out.
 *
 * @example
 * ```ts
 * import { formatNumber } from "./format.ts";
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
 * One-line text form of an {@linkcode Estimate}: value ± se, interval, method and n.
 *
 * @example
 * ```ts
 * import { formatEstimate } from "./format.ts";
 * import { makeEstimate } from "./estimate.ts";
 * import assert from "node:assert/strict";
 * const e = makeEstimate({ value: 0.25, se: 0.01, ci: [0.23, 0.27], method: "bootstrap-percentile", n: 500, unit: "nats" });
 * assert.equal(formatEstimate(e), "0.25 ± 0.01 nats [0.23, 0.27] (95% CI, bootstrap-percentile, n = 500)");
 * ```
 */
export function formatEstimate(e: Estimate, digits = 4): string {
  const unit = e.unit && e.unit !== "none" ? ` ${e.unit}` : "";
  if (e.method === "exact") return `${formatNumber(e.value, digits)}${unit} (exact)`;
  const se = e.se !== undefined ? ` ± ${formatNumber(e.se, 2)}` : "";
  const ci = e.ci ? ` [${formatNumber(e.ci[0], digits)}, ${formatNumber(e.ci[1], digits)}]` : "";
  const lvl = e.ci ? `${Math.round(e.level * 1000) / 10}% CI, ` : "";
  const notes = e.notes.length ? `; ${e.notes.join("; ")}` : "";
  return `${
    formatNumber(e.value, digits)
  }${se}${unit}${ci} (${lvl}${e.method}, n = ${e.n})${notes}`;
}

/**
 * Escape text for HTML element content and attribute values.
 *
 * @example
 * ```ts
 * import { escapeHtml } from "./format.ts";
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

/** A cell of {@linkcode htmlTable}: text, a number (formatted) or an Estimate. */
export type TableCell = string | number | Estimate | null | undefined;

/**
 * A compact HTML table with a header row; numbers right-aligned and formatted, Estimates
 * shown as value ± se with their interval. Used by every rich display.
 *
 * @example
 * ```ts
 * import { htmlTable } from "./format.ts";
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
 * import { textTable } from "./format.ts";
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

function estimateCell(e: Estimate): string {
  if (e.method === "exact") return formatNumber(e.value);
  const se = e.se !== undefined ? ` ± ${formatNumber(e.se, 2)}` : "";
  const ci = e.ci ? ` [${formatNumber(e.ci[0])}, ${formatNumber(e.ci[1])}]` : "";
  return `${formatNumber(e.value)}${se}${ci}`;
}

/**
 * HTML table of one estimate (its rich display in a notebook cell).
 *
 * @example
 * ```ts
 * import { estimateHtml } from "./format.ts";
 * import { makeEstimate } from "./estimate.ts";
 * import assert from "node:assert/strict";
 * assert.match(estimateHtml(makeEstimate({ value: 1, method: "exact", n: 0 })), /exact/);
 * ```
 */
export function estimateHtml(e: Estimate): string {
  const ci = e.ci
    ? `[${formatNumber(e.ci[0])}, ${formatNumber(e.ci[1])}] (${Math.round(e.level * 1000) / 10}%)`
    : "";
  return htmlTable(
    ["value", "se", "interval", "unit", "method", "n", "notes"],
    [[e.value, e.se ?? null, ci, e.unit ?? "", e.method, e.n, e.notes.join("; ")]],
  );
}
