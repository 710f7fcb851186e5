/**
 * Column naming and selection applied by the readers after parsing.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import type { Samples } from "./samples.ts";
import { selectColumns } from "./transform.ts";
import { makeSamples } from "./_make.ts";

/** Columns to keep: 0-based indices, or names when the data have names. */
export type ColumnSelection = readonly (number | string)[];

/**
 * Give `s` the column `names` (when set), then keep the `columns` chosen (when set).
 * Errors name `source`.
 */
export function nameAndSelect(
  s: Samples,
  columns: ColumnSelection | undefined,
  names: readonly string[] | undefined,
  source: string | undefined,
): Samples {
  let out = s;
  if (names !== undefined) {
    if (names.length !== s.d) {
      throw new SaddleError(
        "dimension-mismatch",
        `${names.length} names given for ${s.d} columns; give one name per column`,
        { ...(source !== undefined ? { file: source } : {}), parameter: "names" },
      );
    }
    out = makeSamples(s.n, s.d, s.data, names);
  }
  if (columns === undefined) return out;
  try {
    return selectColumns(out, columns);
  } catch (err) {
    if (err instanceof SaddleError && source !== undefined) {
      throw new SaddleError(err.code, err.message, { file: source });
    }
    throw err;
  }
}

/** `{ file: source }`, or `{}` when there is no source name. */
export function fileLoc(source: string | undefined): { file?: string } {
  return source === undefined ? {} : { file: source };
}
