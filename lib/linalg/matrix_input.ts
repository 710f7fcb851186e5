/**
 * Matrix and vector inputs (a number, flat row-major values or rows) checked and turned
 * into `Float64Array`s, with errors that name the parameter.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";

/** A square matrix: row-major flat values or rows (a number is a 1 x 1 matrix or σ² I). */
export type MatrixInput = number | ArrayLike<number> | readonly (readonly number[])[];

/**
 * A vector input as a Float64Array of finite values; errors name the parameter `name`.
 *
 * @example
 * ```ts
 * import { toVector } from "./matrix_input.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(toVector([1, 2], "mean"), Float64Array.from([1, 2]));
 * assert.throws(() => toVector([1, NaN], "mean"), /mean\[1\] is NaN/);
 * ```
 */
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
 * and symmetry (to 1e-10 relative); errors name the parameter `name`.
 *
 * @example
 * ```ts
 * import { toMatrix } from "./matrix_input.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(toMatrix(2, 2, "cov"), Float64Array.from([2, 0, 0, 2]));
 * assert.deepEqual(toMatrix([[1, 0.5], [0.5, 1]], 2, "cov"), Float64Array.from([1, 0.5, 0.5, 1]));
 * ```
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
