/**
 * Small input types shared by the figure builders: axis ranges, estimates or plain
 * numbers, axis labels and units.
 *
 * @module
 */
import type { Estimate } from "../estimate/estimate.ts";

/** A closed interval `[lo, hi]`. */
export type AxisRange = readonly [number, number];

/** An Estimate, or a plain number (exact, no interval). */
export type EstimateOrNumber = Estimate | number;

/** Labels and units of the two axes of a 2-D figure. */
export interface ColumnLabelOptions {
  /** Names of the coordinates (default: the samples' column names, or "x1", "x2"). */
  labels?: readonly string[];
  /** Units of the coordinates, e.g. ["m/s", "mm/s"]. */
  units?: readonly (string | undefined)[];
}
