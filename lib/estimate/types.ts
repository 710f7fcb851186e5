/**
 * The `Estimate` type and its fields: every number saddlekit estimates carries its error.
 *
 * @module
 */

/** Units an estimate may carry. Divergences are in nats unless `{ base: 2 }` was asked. */
export type EstimateUnit = "nats" | "bits" | "probability" | "distance" | "none";

/**
 * An estimated number with its uncertainty. Exact results say `method: "exact"` and carry
 * no `se` or `ci`.
 */
export interface Estimate {
  /** The point estimate. */
  readonly value: number;
  /** Standard error, when one is available. */
  readonly se?: number;
  /** Confidence interval `[lo, hi]` at `level`. */
  readonly ci?: readonly [number, number];
  /** Confidence level of `ci` (e.g. 0.95). */
  readonly level: number;
  /** How the value was obtained ("exact", "monte-carlo", "bootstrap-percentile", ...). */
  readonly method: string;
  /** Number of samples the estimate rests on (0 for exact results). */
  readonly n: number;
  /** Unit of `value`. */
  readonly unit?: EstimateUnit;
  /** Caveats: clipped values, non-convergence, a value outside its known range... */
  readonly notes: readonly string[];
}

/** Fields accepted by {@linkcode makeEstimate}; `level` defaults to 0.95, `notes` to []. */
export interface EstimateFields {
  /** The point estimate. */
  value: number;
  /** Standard error. */
  se?: number;
  /** Confidence interval at `level`. */
  ci?: readonly [number, number];
  /** Confidence level (default 0.95). */
  level?: number;
  /** How the value was obtained. */
  method: string;
  /** Number of samples behind the estimate. */
  n: number;
  /** Unit of the value. */
  unit?: EstimateUnit;
  /** Caveats (default none). */
  notes?: readonly string[];
}
