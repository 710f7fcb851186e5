/**
 * JSON readers: an array of numbers, an array of rows, an array of records, or an object
 * holding such an array under a key (`{"real": [...], "fake": [...]}`).
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { type SampleRecord, type Samples, samples } from "./samples.ts";
import { type ColumnSelection, fileLoc, nameAndSelect } from "./column_selection.ts";
import { readText } from "./_io.ts";

/** Options of {@linkcode parseJson} and {@linkcode readJson}. */
export interface JsonOptions {
  /** For an object: the key of the array to read (may be left out if only one is an array). */
  key?: string;
  /** Columns to keep: field names for records, or 0-based indices. Default all numeric. */
  columns?: ColumnSelection;
  /** Names for the columns of unnamed rows (one per column, before selection). */
  names?: readonly string[];
  /** Name of the input in error messages (defaults to the path for files). */
  source?: string;
}

/**
 * Samples from JSON text. JSON has no NaN or Infinity: a `null` cell (what
 * `JSON.stringify` writes for them) is refused with its row and column, and so is Python's
 * non-standard `NaN` literal (`json.dumps(..., allow_nan=False)` avoids writing it).
 *
 * @example Records and an object of arrays
 * ```ts
 * import { parseJson } from "./json.ts";
 * import assert from "node:assert/strict";
 * const r = parseJson('[{"id": "a", "x": 1, "y": 2}, {"id": "b", "x": 3, "y": 4}]');
 * assert.deepEqual([r.n, r.d, r.columns], [2, 2, ["x", "y"]]);
 * const o = parseJson('{"real": [[1, 2], [3, 4]], "fake": [[5, 6]]}', { key: "fake" });
 * assert.deepEqual(Array.from(o.data), [5, 6]);
 * ```
 */
export function parseJson(text: string, options: JsonOptions = {}): Samples {
  const source = options.source;
  let value: unknown;
  try {
    value = JSON.parse(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  } catch (err) {
    const hint = /\bNaN\b|-?\bInfinity\b/.test(text)
      ? "; the text contains NaN or Infinity, which JSON cannot hold: remove those values"
      : "";
    throw new SaddleError(
      "parse",
      `not valid JSON (${(err as Error).message})${hint}`,
      fileLoc(source),
    );
  }
  let where = source;
  if (typeof value === "object" && value !== null && !Array.isArray(value)) {
    const obj = value as Record<string, unknown>;
    const arrays = Object.keys(obj).filter((k) => Array.isArray(obj[k]));
    const list = arrays.length ? arrays.map((k) => `"${k}"`).join(", ") : "none";
    let key = options.key;
    if (key === undefined) {
      if (arrays.length !== 1) {
        throw new SaddleError(
          "invalid-argument",
          `the JSON object holds ${arrays.length} arrays (${list}); choose one with { key: ... }`,
          { ...fileLoc(source), parameter: "key" },
        );
      }
      key = arrays[0];
    }
    if (!Object.hasOwn(obj, key)) {
      throw new SaddleError("not-found", `no key "${key}"; the arrays are ${list}`, {
        ...fileLoc(source),
        parameter: "key",
      });
    }
    if (!Array.isArray(obj[key])) {
      throw new SaddleError(
        "parse",
        `key "${key}" does not hold an array; the arrays are ${list}`,
        {
          ...fileLoc(source),
          parameter: "key",
        },
      );
    }
    value = obj[key];
    where = source === undefined ? `key "${key}"` : `${source} key "${key}"`;
  } else if (options.key !== undefined) {
    throw new SaddleError("invalid-argument", "key given but the JSON is not an object", {
      ...fileLoc(source),
      parameter: "key",
    });
  }
  if (!Array.isArray(value)) {
    throw new SaddleError(
      "parse",
      "expected an array of numbers, of rows or of records (or an object holding one)",
      fileLoc(source),
    );
  }
  const arr = value as unknown[];
  const first = arr[0];
  const isRecords = typeof first === "object" && first !== null && !Array.isArray(first);
  const cols = options.columns;
  if (isRecords && cols !== undefined) {
    // Choose fields by name (or by position among the first record's keys) before reading,
    // so that non-numeric fields left out do no harm.
    const keys = Object.keys(first as object);
    const chosen = cols.map((c) => {
      if (typeof c === "string") return c;
      if (!Number.isInteger(c) || c < 0 || c >= keys.length) {
        throw new SaddleError(
          "invalid-argument",
          `field index ${c} is outside 0..${keys.length - 1}`,
          {
            ...fileLoc(where),
            parameter: "columns",
          },
        );
      }
      return keys[c];
    });
    for (const k of chosen) {
      if (!Object.hasOwn(first as object, k)) {
        throw new SaddleError(
          "not-found",
          `no field "${k}" in the first record; fields are ${keys.map((x) => `"${x}"`).join(", ")}`,
          { ...fileLoc(where), row: 0, parameter: "columns" },
        );
      }
    }
    const s = samples(arr as SampleRecord[], { columns: chosen, ...src(where) });
    return nameAndSelect(s, undefined, options.names, where);
  }
  const s = samples(arr as number[], src(where));
  return nameAndSelect(s, cols, options.names, where);
}

function src(where: string | undefined): { source?: string } {
  return where === undefined ? {} : { source: where };
}

/**
 * Read a JSON file (see {@linkcode parseJson}).
 *
 * @example
 * ```ts
 * import { readJson } from "./json.ts";
 * import assert from "node:assert/strict";
 * const path = await Deno.makeTempFile({ suffix: ".json" });
 * await Deno.writeTextFile(path, JSON.stringify({ real: [1, 2, 3] }));
 * assert.deepEqual(Array.from((await readJson(path)).data), [1, 2, 3]);
 * await Deno.remove(path);
 * ```
 */
export async function readJson(path: string, options: JsonOptions = {}): Promise<Samples> {
  const source = options.source ?? path;
  return parseJson(await readText(path, source), { ...options, source });
}
