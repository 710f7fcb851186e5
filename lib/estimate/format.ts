/**
 * Text and HTML forms of an {@linkcode Estimate} for printed output and notebook cells.
 *
 * @module
 */
import { formatNumber, htmlTable } from "../display/table.ts";
import type { Estimate } from "./types.ts";

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
