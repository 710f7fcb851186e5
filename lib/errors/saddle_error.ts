/**
 * The single error family of saddlekit.
 *
 * Every failure that a user can cause (bad input file, bad parameter, a fit that cannot
 * proceed) throws a {@linkcode SaddleError} whose `code` is one of
 * {@linkcode SaddleErrorCode} and whose message names the input and the position (file,
 * row, column) or the parameter, and says what would fix it.
 *
 * @module
 */

/** Machine-readable reason for a {@linkcode SaddleError}. */
export type SaddleErrorCode =
  /** A parameter is outside its domain (negative bandwidth, k < 1, unknown name...). */
  | "invalid-argument"
  /** Input data contain NaN or ±Infinity. */
  | "non-finite"
  /** Input data are empty (no rows or no columns). */
  | "empty"
  /** Rows of unequal length, or two inputs whose dimensions disagree. */
  | "dimension-mismatch"
  /** A file could not be parsed (CSV cell, NPY header, NPZ entry...). */
  | "parse"
  /** A file format or dtype that saddlekit does not read. */
  | "unsupported"
  /** A file or array was not found. */
  | "not-found"
  /** A matrix that must be positive definite is not (even after the documented floor). */
  | "singular"
  /** An iterative method failed beyond repair (collapsed mixture component...). */
  | "numerical"
  /** Too few samples for the requested method (n < 2, n <= k...). */
  | "too-few-samples"
  /** A file could not be written (permission denied, read-only or full disk). */
  | "io";

/** Where in an input a problem was found; every field is optional. */
export interface SaddleErrorLocation {
  /** File path, when the input came from a file. */
  file?: string;
  /** 1-based line in a text file. */
  line?: number;
  /** 0-based row of the data (after any header). */
  row?: number;
  /** 0-based column index, or the column's name. */
  column?: number | string;
  /** Name of the parameter at fault. */
  parameter?: string;
}

/**
 * Error thrown by every saddlekit function for problems the caller can fix.
 *
 * @example Catching by code
 * ```ts
 * import { SaddleError } from "./saddle_error.ts";
 * import assert from "node:assert/strict";
 *
 * const err = new SaddleError("non-finite", "value is NaN", { row: 3, column: 1 });
 * assert.equal(err.code, "non-finite");
 * assert.equal(err.message, "row 3, column 1: value is NaN");
 * assert.equal(err.detail, "value is NaN");
 * assert.ok(err instanceof Error);
 * ```
 *
 * @example Wrapping an error as the cause of another
 * ```ts
 * import { SaddleError } from "./saddle_error.ts";
 * import assert from "node:assert/strict";
 *
 * const inner = new SaddleError("singular", "covariance is singular", { column: 0 });
 * const outer = new SaddleError("singular", `fitting the real samples: ${inner.detail}`, {
 *   parameter: "real",
 * }, { cause: inner });
 * assert.equal(outer.cause, inner);
 * assert.equal(outer.message, 'parameter "real": fitting the real samples: covariance is singular');
 * ```
 */
export class SaddleError extends Error {
  /** Machine-readable reason. */
  readonly code: SaddleErrorCode;
  /** Where the problem is, when known. */
  readonly location: SaddleErrorLocation;
  /** The message as given, without the location prefix. */
  readonly detail: string;

  /**
   * Make an error; the message is the formatted location, a colon, then `message`.
   *
   * @param code Machine-readable reason.
   * @param message What is wrong and what would fix it; the location is put before it.
   * @param location Where the problem was found.
   * @param options `cause`: the error this one wraps (ES2022 `ErrorOptions`).
   */
  constructor(
    code: SaddleErrorCode,
    message: string,
    location: SaddleErrorLocation = {},
    options?: ErrorOptions,
  ) {
    const where = formatLocation(location);
    super(where ? `${where}: ${message}` : message, options);
    this.name = "SaddleError";
    this.code = code;
    this.location = location;
    this.detail = message;
  }
}

function formatLocation(loc: SaddleErrorLocation): string {
  const parts: string[] = [];
  if (loc.file !== undefined) parts.push(loc.file);
  if (loc.line !== undefined) parts.push(`line ${loc.line}`);
  if (loc.row !== undefined) parts.push(`row ${loc.row}`);
  if (loc.column !== undefined) {
    parts.push(typeof loc.column === "number" ? `column ${loc.column}` : `column "${loc.column}"`);
  }
  if (loc.parameter !== undefined) parts.push(`parameter "${loc.parameter}"`);
  return parts.join(", ");
}
