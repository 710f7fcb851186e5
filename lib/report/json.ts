/**
 * JSON values as summary.json holds them.
 *
 * @module
 */

/** A JSON value as written to summary.json. */
export type Json = null | boolean | number | string | Json[] | { [key: string]: Json };

/**
 * A number as JSON: finite numbers as they are, others as "Infinity", "-Infinity", "NaN".
 *
 * @example
 * ```ts
 * import { numberJson } from "./json.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual([numberJson(1.5), numberJson(-Infinity)], [1.5, "-Infinity"]);
 * ```
 */
export function numberJson(x: number): number | string {
  return Number.isFinite(x) ? x : String(x);
}
