/**
 * Axis labels of sample columns: names from the options, the samples' column names, or
 * "x1", "x2"; units appended.
 *
 * @module
 */
import type { Samples } from "../samples/samples.ts";
import { axisLabel } from "./axes.ts";

/** Labels and units of the two axes of a 2-D figure. */
export interface ColumnLabelOptions {
  /** Names of the coordinates (default: the samples' column names, or "x1", "x2"). */
  labels?: readonly string[];
  /** Units of the coordinates, e.g. ["m/s", "mm/s"]. */
  units?: readonly (string | undefined)[];
}

/** The axis label of coordinate `j`. */
export function columnLabel(
  j: number,
  options: ColumnLabelOptions,
  sets: readonly (Samples | undefined)[],
): string {
  const name = options.labels?.[j] ?? sets.find((s) => s?.columns?.[j])?.columns?.[j] ??
    `x${j + 1}`;
  return axisLabel(name, { unit: options.units?.[j] });
}
