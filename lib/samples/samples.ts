/**
 * The row-major `Samples` type and its validating constructor.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { makeSamples } from "./_make.ts";

export type { SampleRecord, Samples, SamplesInput } from "./types.ts";
import type { SampleRecord, Samples, SamplesInput } from "./types.ts";

/** Options of {@linkcode samples}. */
export interface SamplesOptions {
  /**
   * Dimension of a flat numeric input (number[] or typed array), read as row-major
   * `(length / d) x d`. Default 1: a flat input is `length` one-dimensional points.
   */
  d?: number;
  /**
   * For records: the keys to take, in order (default: every key of the first record,
   * keeping those whose value is a number). For arrays: names given to the columns.
   */
  columns?: readonly string[];
  /** Name of the input, used in error messages (a file path, "real", "fake"...). */
  source?: string;
}

/**
 * Build a validated {@linkcode Samples} from numbers, rows, typed arrays or records.
 *
 * Rejects empty input, ragged rows, non-numeric cells and NaN/±Infinity with a
 * {@linkcode SaddleError} naming the row and column. A `Float64Array` input is copied, so
 * later changes to it do not change the samples.
 *
 * @example From rows, from a flat array, from records
 * ```ts
 * import { samples } from "./samples.ts";
 * import assert from "node:assert/strict";
 *
 * const a = samples([[0, 1], [2, 3], [4, 5]]);
 * const b = samples(new Float64Array([0, 1, 2, 3, 4, 5]), { d: 2 });
 * const c = samples([{ x: 0, y: 1 }, { x: 2, y: 3 }, { x: 4, y: 5 }]);
 * assert.deepEqual([a.n, a.d], [3, 2]);
 * assert.deepEqual(a.data, b.data);
 * assert.deepEqual(c.data, a.data);
 * assert.deepEqual(c.columns, ["x", "y"]);
 * ```
 */
export function samples(input: SamplesInput, options: SamplesOptions = {}): Samples {
  const src = options.source;
  if (isSamples(input)) {
    return fromFlat(input.data, input.d, options.columns ?? input.columns, src);
  }
  if (ArrayBuffer.isView(input)) {
    return fromFlat(input, checkDim(options.d ?? 1), options.columns, src);
  }
  if (!Array.isArray(input)) {
    throw new SaddleError(
      "invalid-argument",
      `cannot read samples from ${describeValue(input)}; ` +
        "give numbers, rows of numbers, a typed array or records",
      { ...at(src), parameter: "input" },
    );
  }
  const arr = input as readonly unknown[];
  if (arr.length === 0) {
    throw new SaddleError("empty", "no rows: give at least one point", at(src));
  }
  const first = arr[0];
  if (typeof first === "number") {
    for (let i = 0; i < arr.length; i++) {
      if (typeof arr[i] !== "number") {
        throw new SaddleError(
          "parse",
          `expected a number, got ${describeValue(arr[i])}`,
          { ...at(src), row: i },
        );
      }
    }
    return fromFlat(arr as readonly number[], checkDim(options.d ?? 1), options.columns, src);
  }
  if (Array.isArray(first) || ArrayBuffer.isView(first)) {
    return fromRows(arr as readonly (readonly unknown[])[], options.columns, src);
  }
  if (typeof first === "object" && first !== null) {
    return fromRecords(arr as readonly SampleRecord[], options.columns, src);
  }
  throw new SaddleError(
    "invalid-argument",
    `cannot read samples from an array of ${describeValue(first)}; ` +
      "give numbers, rows of numbers, a typed array or records",
    { ...at(src), parameter: "input" },
  );
}

/**
 * Whether `x` is already a {@linkcode Samples} object (has `n`, `d` and a Float64Array).
 *
 * @example
 * ```ts
 * import { isSamples, samples } from "./samples.ts";
 * import assert from "node:assert/strict";
 * assert.ok(isSamples(samples([1, 2, 3])));
 * assert.ok(!isSamples([1, 2, 3]));
 * ```
 */
export function isSamples(x: unknown): x is Samples {
  return typeof x === "object" && x !== null && "data" in x && "n" in x && "d" in x &&
    (x as Samples).data instanceof Float64Array;
}

/**
 * Wrap a row-major buffer as Samples without copying, after checking that every value is
 * finite. The buffer is owned by the result afterwards: do not modify it.
 *
 * @example
 * ```ts
 * import { fromBuffer } from "./samples.ts";
 * import assert from "node:assert/strict";
 * const s = fromBuffer(new Float64Array([1, 2, 3, 4]), 2);
 * assert.equal(s.n, 2);
 * ```
 */
export function fromBuffer(
  data: Float64Array,
  d: number,
  columns?: readonly string[],
  source?: string,
): Samples {
  checkDim(d);
  if (data.length === 0) throw new SaddleError("empty", "no values", at(source));
  if (data.length % d !== 0) {
    throw new SaddleError(
      "dimension-mismatch",
      `${data.length} values do not split into rows of ${d}`,
      { ...at(source), parameter: "d" },
    );
  }
  assertFinite(data, d, source);
  checkColumns(columns, d, source);
  return makeSamples(data.length / d, d, data, columns);
}

/**
 * Throw a {@linkcode SaddleError} naming the first non-finite value's row and column.
 *
 * @example
 * ```ts
 * import { assertFinite } from "./samples.ts";
 * import assert from "node:assert/strict";
 * assert.throws(() => assertFinite(new Float64Array([1, NaN]), 1), /row 1, column 0/);
 * ```
 */
export function assertFinite(data: ArrayLike<number>, d: number, source?: string): void {
  for (let i = 0; i < data.length; i++) {
    const v = data[i];
    // `v - v` is NaN for NaN and for ±Infinity, and 0 otherwise: one test for both.
    if (v - v !== 0) {
      throw new SaddleError(
        "non-finite",
        `value is ${v}; remove or impute non-finite values before analysis`,
        { ...at(source), row: Math.floor(i / d), column: i % d },
      );
    }
  }
}

/**
 * Throw unless `a` and `b` have the same dimension; the message names both inputs.
 *
 * @example
 * ```ts
 * import { assertSameDimension, samples } from "./samples.ts";
 * import assert from "node:assert/strict";
 * assert.throws(
 *   () => assertSameDimension(samples([[1, 2]]), samples([1]), "real", "fake"),
 *   /real has d = 2 but fake has d = 1/,
 * );
 * ```
 */
export function assertSameDimension(
  a: { d: number },
  b: { d: number },
  nameA = "first input",
  nameB = "second input",
): void {
  if (a.d !== b.d) {
    throw new SaddleError(
      "dimension-mismatch",
      `${nameA} has d = ${a.d} but ${nameB} has d = ${b.d}; both must live in the same space`,
      { parameter: nameB },
    );
  }
}

/**
 * Copy of row `i` of `s` (for display and tests; hot loops index `data` directly).
 *
 * @example
 * ```ts
 * import { row, samples } from "./samples.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(row(samples([[1, 2], [3, 4]]), 1), [3, 4]);
 * ```
 */
export function row(s: Samples, i: number): number[] {
  if (!Number.isInteger(i) || i < 0 || i >= s.n) {
    throw new SaddleError("invalid-argument", `row ${i} is outside 0..${s.n - 1}`, {
      parameter: "i",
    });
  }
  return Array.from(s.data.subarray(i * s.d, (i + 1) * s.d));
}

function fromFlat(
  values: ArrayLike<number>,
  d: number,
  columns: readonly string[] | undefined,
  source: string | undefined,
): Samples {
  return fromBuffer(Float64Array.from(values), d, columns, source);
}

function fromRows(
  rows: readonly (readonly unknown[])[],
  columns: readonly string[] | undefined,
  source: string | undefined,
): Samples {
  const n = rows.length;
  const first = rows[0];
  const d = first.length;
  if (d === 0) throw new SaddleError("empty", "row 0 has no values", { ...at(source), row: 0 });
  const data = new Float64Array(n * d);
  for (let i = 0; i < n; i++) {
    const r = rows[i];
    if (!Array.isArray(r) && !ArrayBuffer.isView(r)) {
      throw new SaddleError("parse", `expected a row of numbers, got ${describeValue(r)}`, {
        ...at(source),
        row: i,
      });
    }
    if (r.length !== d) {
      throw new SaddleError(
        "dimension-mismatch",
        `row has ${r.length} values but row 0 has ${d}; every row needs the same length`,
        { ...at(source), row: i },
      );
    }
    for (let j = 0; j < d; j++) {
      const v = r[j];
      if (typeof v !== "number") {
        throw new SaddleError("parse", `expected a number, got ${describeValue(v)}`, {
          ...at(source),
          row: i,
          column: j,
        });
      }
      data[i * d + j] = v;
    }
  }
  return fromBuffer(data, d, columns, source);
}

function fromRecords(
  records: readonly SampleRecord[],
  columns: readonly string[] | undefined,
  source: string | undefined,
): Samples {
  // Default fields: those holding a number in the first record. A null there is a missing
  // value, not a reason to drop the field silently: refused (choose fields with `columns`).
  if (!columns) {
    for (const k of Object.keys(records[0])) {
      if (records[0][k] === null) {
        throw new SaddleError(
          "parse",
          `field "${k}" is null (a missing value); fill it in, drop the record, or choose ` +
            "the fields to read with `columns`",
          { ...at(source), row: 0, column: k },
        );
      }
    }
  }
  const keys = columns ??
    Object.keys(records[0]).filter((k) => typeof records[0][k] === "number");
  if (keys.length === 0) {
    throw new SaddleError(
      "empty",
      "the first record has no numeric field; pass `columns` to choose fields",
      { ...at(source), row: 0, parameter: "columns" },
    );
  }
  const n = records.length;
  const d = keys.length;
  const data = new Float64Array(n * d);
  for (let i = 0; i < n; i++) {
    const rec = records[i];
    if (typeof rec !== "object" || rec === null) {
      throw new SaddleError("parse", `expected a record, got ${describeValue(rec)}`, {
        ...at(source),
        row: i,
      });
    }
    for (let j = 0; j < d; j++) {
      const v = Object.hasOwn(rec, keys[j]) ? rec[keys[j]] : undefined;
      if (v === null) {
        throw new SaddleError(
          "parse",
          `field "${keys[j]}" is null (a missing value); fill it in or drop the record`,
          { ...at(source), row: i, column: keys[j] },
        );
      }
      if (v === undefined) {
        throw new SaddleError("parse", "field is missing", {
          ...at(source),
          row: i,
          column: keys[j],
        });
      }
      if (typeof v !== "number") {
        throw new SaddleError("parse", `expected a number, got ${describeValue(v)}`, {
          ...at(source),
          row: i,
          column: keys[j],
        });
      }
      data[i * d + j] = v;
    }
  }
  // Report non-finite values by column name, which records users know their data by.
  for (let i = 0; i < data.length; i++) {
    const v = data[i];
    if (v - v !== 0) {
      throw new SaddleError("non-finite", `value is ${v}; remove or impute it`, {
        ...at(source),
        row: Math.floor(i / d),
        column: keys[i % d],
      });
    }
  }
  return makeSamples(n, d, data, keys);
}

function checkDim(d: number): number {
  if (!Number.isInteger(d) || d < 1) {
    throw new SaddleError("invalid-argument", `d must be a positive integer, got ${d}`, {
      parameter: "d",
    });
  }
  return d;
}

function checkColumns(columns: readonly string[] | undefined, d: number, source?: string) {
  if (columns && columns.length !== d) {
    throw new SaddleError(
      "dimension-mismatch",
      `${columns.length} column names given for ${d} columns`,
      { ...at(source), parameter: "columns" },
    );
  }
}

function at(source: string | undefined): { file?: string } {
  return source === undefined ? {} : { file: source };
}

function describeValue(v: unknown): string {
  if (v === null) return "null";
  if (v === undefined) return "undefined";
  if (typeof v === "string") return `the string ${JSON.stringify(v.slice(0, 40))}`;
  if (Array.isArray(v)) return "an array";
  return typeof v === "object" ? "an object" : `${typeof v} ${String(v)}`;
}
