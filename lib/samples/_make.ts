/**
 * The one place that builds a Samples object: plain fields plus a non-enumerable rich
 * display, so a bare `real` in a notebook cell shows a short table instead of printing
 * its whole buffer.
 *
 * @module
 */
import { withDisplay } from "../display/display.ts";
import { htmlTable, textTable } from "../display/table.ts";
import type { Samples } from "./types.ts";

const HEAD_ROWS = 5;

/** Samples over `data` (not copied, not validated: callers have checked it). */
export function makeSamples(
  n: number,
  d: number,
  data: Float64Array,
  columns?: readonly string[],
): Samples {
  const s: Samples = columns ? { n, d, data, columns: [...columns] } : { n, d, data };
  return withDisplay(s, samplesBundle);
}

function samplesBundle(s: Samples): Record<string, string> {
  const names = s.columns ? [...s.columns] : Array.from({ length: s.d }, (_, j) => `x${j}`);
  // Wide feature sets show their first columns only; the caption says how many there are.
  const shown = Math.min(s.d, 8);
  const header = ["", ...names.slice(0, shown)];
  const rows: (string | number)[][] = [];
  for (let i = 0; i < Math.min(s.n, HEAD_ROWS); i++) {
    rows.push([`row ${i}`, ...Array.from(s.data.subarray(i * s.d, i * s.d + shown))]);
  }
  const mean = new Float64Array(shown), m2 = new Float64Array(shown);
  for (let j = 0; j < shown; j++) {
    let sum = 0;
    for (let i = 0; i < s.n; i++) sum += s.data[i * s.d + j];
    mean[j] = sum / s.n;
    for (let i = 0; i < s.n; i++) m2[j] += (s.data[i * s.d + j] - mean[j]) ** 2;
  }
  rows.push(["mean", ...mean]);
  rows.push(["sd", ...Array.from(m2, (v) => (s.n > 1 ? Math.sqrt(v / (s.n - 1)) : NaN))]);
  const caption = `Samples: n = ${s.n}, d = ${s.d}` +
    (shown < s.d ? ` (first ${shown} columns shown)` : "");
  return {
    "text/plain": `${caption}\n${textTable(header, rows)}`,
    "text/html": htmlTable(header, rows, caption),
  };
}
