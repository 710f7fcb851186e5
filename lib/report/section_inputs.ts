/**
 * The first section: what was compared, column by column.
 *
 * @module
 */
import { meanEstimate } from "../estimate/mod.ts";
import { htmlTable } from "../display/mod.ts";
import type { Samples } from "../samples/mod.ts";
import type { ReportSection } from "./types.ts";

function column(s: Samples, j: number): Float64Array {
  const out = new Float64Array(s.n);
  for (let i = 0; i < s.n; i++) out[i] = s.data[i * s.d + j];
  return out;
}

/** Columns shown in the inputs table at most (high-dimensional features are summarised). */
export const INPUT_COLUMNS_SHOWN = 12;

/**
 * The inputs section: each column's mean with its interval on both sides (the first 12
 * columns of wider data). It writes no estimates; the inputs themselves (paths, n, d,
 * columns, checksums) are under `inputs` in summary.json.
 *
 * @example
 * ```ts
 * import { inputsSection } from "./section_inputs.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(inputsSection.keys({} as never), []);
 * ```
 */
export const inputsSection: ReportSection = {
  id: "inputs",
  title: "The samples",
  applies: () => true,
  keys: () => [],
  run(ctx, out) {
    const real = ctx.inputs.real.samples, fake = ctx.inputs.fake.samples;
    const shown = Math.min(real.d, INPUT_COLUMNS_SHOWN);
    const rows = Array.from({ length: shown }, (_, j) => [
      real.columns?.[j] ?? `column ${j}`,
      meanEstimate(column(real, j), { level: ctx.plan.level, method: "sample mean" }),
      meanEstimate(column(fake, j), { level: ctx.plan.level, method: "sample mean" }),
    ]);
    out.html.push(htmlTable(
      ["column", "mean, real", "mean, generated"],
      rows,
      `Column means with ${Math.round(ctx.plan.level * 100)}% intervals` +
        (shown < real.d ? ` (first ${shown} of ${real.d} columns)` : ""),
    ));
    out.methods.inputs = { columnsShown: shown };
  },
};
