/**
 * Axis labels of sample columns: names from the options, the samples' column names, or
 * "x1", "x2"; units appended.
 *
 * @module
 */
import type { Samples } from "../samples/samples.ts";
import { axisLabel } from "./axes.ts";
import type { ColumnLabelOptions } from "./input_types.ts";

export type { ColumnLabelOptions };

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
