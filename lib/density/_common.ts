/**
 * Private helpers shared by the densities: matrix inputs, query checks, log-sum-exp and
 * the rich display of descriptions.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { displayBundle, type MimeBundle, withDisplay } from "../display/display.ts";
import { formatNumber, htmlTable, textTable } from "../display/table.ts";
import type { Samples } from "../samples/samples.ts";
import type { DensityDescription } from "./types.ts";

export { LOG_2PI, logSumExp } from "../math/log_space.ts";

export { type MatrixInput, toMatrix, toVector } from "../linalg/matrix_input.ts";

/**
 * Check a query against a density of dimension `d`: same dimension, every value finite
 * (NaN would silently poison a log-density).
 */
export function checkQuery(x: Samples, d: number, what = "density"): void {
  if (x.d !== d) {
    throw new SaddleError(
      "dimension-mismatch",
      `the ${what} has d = ${d} but the query has d = ${x.d}; evaluate it at points of the ` +
        "dimension it was fitted on",
      { parameter: "x" },
    );
  }
  const a = x.data;
  for (let i = 0; i < a.length; i++) {
    if (a[i] - a[i] !== 0) {
      throw new SaddleError(
        "non-finite",
        `query value is ${a[i]}; a log-density at a non-finite point is undefined`,
        { row: Math.floor(i / d), column: i % d, parameter: "x" },
      );
    }
  }
}

/** Check `n` is a non-negative integer sample size. */
export function checkSampleSize(n: number): void {
  if (!Number.isInteger(n) || n < 1) {
    throw new SaddleError("invalid-argument", `n must be a positive integer, got ${n}`, {
      parameter: "n",
    });
  }
}

function formatValue(v: unknown, depth = 0): string {
  if (typeof v === "number") return formatNumber(v);
  if (typeof v === "string") return v;
  if (typeof v === "boolean") return String(v);
  if (v === null || v === undefined) return "";
  if (ArrayBuffer.isView(v) || Array.isArray(v)) {
    const arr = Array.from(v as ArrayLike<unknown>);
    const shown = arr.slice(0, 12).map((x) => formatValue(x, depth + 1));
    return `[${shown.join(", ")}${arr.length > 12 ? `, … (${arr.length})` : ""}]`;
  }
  if (typeof v === "object") {
    if (depth > 1) return "{…}";
    return `{ ${
      Object.entries(v as Record<string, unknown>).map(([k, x]) =>
        `${k}: ${formatValue(x, depth + 1)}`
      ).join(", ")
    } }`;
  }
  return String(v);
}

/** A {@linkcode DensityDescription} with a rich notebook display (parameter table). */
export function description(
  kind: string,
  d: number,
  parameters: Record<string, unknown>,
  notes: readonly string[] = [],
): DensityDescription {
  const desc: DensityDescription = { kind, d, parameters, notes: [...notes] };
  return withDisplay(desc, (o) => {
    const rows = Object.entries(o.parameters).map(([k, v]) => [k, formatValue(v)]);
    const noteText = o.notes.length ? `\nnotes: ${o.notes.join("; ")}` : "";
    const noteHtml = o.notes.length
      ? `<ul>${o.notes.map((n) => `<li>${escape(n)}</li>`).join("")}</ul>`
      : "";
    return {
      "text/plain": `${o.kind} density (d = ${o.d})\n${
        textTable(["parameter", "value"], rows)
      }${noteText}`,
      "text/html": htmlTable(["parameter", "value"], rows, `${o.kind} density (d = ${o.d})`) +
        noteHtml,
    };
  });
}

function escape(s: string): string {
  return s.replace(/[&<>]/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;" })[c] as string);
}

/** Rows of a d x d row-major matrix, for descriptions. */
export function matrixRows(m: ArrayLike<number>, d: number): number[][] {
  const rows: number[][] = [];
  for (let i = 0; i < d; i++) rows.push(Array.from({ length: d }, (_, j) => m[i * d + j]));
  return rows;
}

/**
 * Whether this process may start a Web Worker from `url` (Deno needs read access to a local
 * worker module). Checked before spawning, because a worker that fails to load cannot report
 * it while the main thread waits for it synchronously.
 */
export function canStartWorker(url: URL): boolean {
  if (typeof Worker === "undefined") return false;
  try {
    if (url.protocol !== "file:") return true;
    return Deno.permissions.querySync({ name: "read", path: url }).state === "granted";
  } catch {
    return false;
  }
}

/**
 * The notebook display of a density object itself: its description's table, so a bare
 * `pData` in a cell shows what was fitted rather than the object's internals.
 */
export function densityBundle(density: { describe(): DensityDescription }): MimeBundle {
  const desc = density.describe();
  return displayBundle(desc) ?? { "text/plain": `${desc.kind} density (d = ${desc.d})` };
}
