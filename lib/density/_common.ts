/**
 * Private helpers shared by the densities: matrix inputs, query checks, log-sum-exp and
 * the rich display of descriptions.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { displayBundle, type MimeBundle, withDisplay } from "../estimate/display.ts";
import { formatNumber, htmlTable, textTable } from "../estimate/format.ts";
import type { Samples } from "../samples/samples.ts";
import type { DensityDescription } from "./types.ts";

/** A square matrix: row-major flat values or rows (a number is a 1 x 1 matrix or σ² I). */
export type MatrixInput = number | ArrayLike<number> | readonly (readonly number[])[];

/** `ln(2π)`. */
export const LOG_2PI = Math.log(2 * Math.PI);

/** A vector input as a Float64Array of finite values. */
export function toVector(v: number | ArrayLike<number>, name: string): Float64Array {
  const out = typeof v === "number" ? new Float64Array([v]) : Float64Array.from(v);
  if (out.length === 0) throw new SaddleError("empty", `${name} is empty`, { parameter: name });
  for (let i = 0; i < out.length; i++) {
    if (!Number.isFinite(out[i])) {
      throw new SaddleError("non-finite", `${name}[${i}] is ${out[i]}`, { parameter: name });
    }
  }
  return out;
}

/**
 * A `d x d` row-major matrix from flat values, rows, or a number (σ² I). Checks finiteness
 * and symmetry (to 1e-10 relative).
 */
export function toMatrix(m: MatrixInput, d: number, name: string): Float64Array {
  let out: Float64Array;
  if (typeof m === "number") {
    out = new Float64Array(d * d);
    for (let i = 0; i < d; i++) out[i * d + i] = m;
  } else if (m.length > 0 && typeof (m as ArrayLike<unknown>)[0] === "object") {
    const rows = m as readonly (readonly number[])[];
    if (rows.length !== d || rows.some((r) => r.length !== d)) {
      throw new SaddleError(
        "dimension-mismatch",
        `${name} must be ${d} x ${d} (the dimension of the mean), got ${rows.length} rows of ` +
          `lengths ${rows.map((r) => r.length).join(", ")}`,
        { parameter: name },
      );
    }
    out = new Float64Array(d * d);
    for (let i = 0; i < d; i++) for (let j = 0; j < d; j++) out[i * d + j] = rows[i][j];
  } else {
    out = Float64Array.from(m as ArrayLike<number>);
    if (out.length !== d * d) {
      throw new SaddleError(
        "dimension-mismatch",
        `${name} must have ${d * d} row-major entries (${d} x ${d}), got ${out.length}`,
        { parameter: name },
      );
    }
  }
  for (let i = 0; i < d * d; i++) {
    if (!Number.isFinite(out[i])) {
      throw new SaddleError(
        "non-finite",
        `${name} entry (${Math.floor(i / d)}, ${i % d}) is ${out[i]}`,
        { parameter: name },
      );
    }
  }
  for (let i = 0; i < d; i++) {
    for (let j = i + 1; j < d; j++) {
      const a = out[i * d + j], b = out[j * d + i];
      if (Math.abs(a - b) > 1e-10 * Math.max(Math.abs(a), Math.abs(b), 1e-300)) {
        throw new SaddleError(
          "invalid-argument",
          `${name} is not symmetric: entry (${i}, ${j}) = ${a} but (${j}, ${i}) = ${b}`,
          { parameter: name },
        );
      }
      const s = 0.5 * (a + b);
      out[i * d + j] = s;
      out[j * d + i] = s;
    }
  }
  return out;
}

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

/** `log Σ exp(v_i)` relative to the largest term; -Infinity for an empty or all -∞ input. */
export function logSumExp(v: ArrayLike<number>, from = 0, to = v.length): number {
  let m = -Infinity;
  for (let i = from; i < to; i++) if (v[i] > m) m = v[i];
  if (m === -Infinity) return -Infinity;
  if (m === Infinity) return Infinity;
  let s = 0;
  for (let i = from; i < to; i++) s += Math.exp(v[i] - m);
  return m + Math.log(s);
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
