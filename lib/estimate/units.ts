/**
 * Units of information-valued estimates (divergences, entropies, the value of the game):
 * nats by default, bits or another log base on request.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { type Estimate, type EstimateUnit, makeEstimate } from "./estimate.ts";

/** The divisor that turns nats into `base` units (ln base), checking `base`. */
export function logBase(base: number | undefined): number {
  if (base === undefined) return 1;
  if (!(base > 0 && base !== 1 && Number.isFinite(base))) {
    throw new SaddleError("invalid-argument", `base must be > 0 and != 1, got ${base}`, {
      parameter: "base",
    });
  }
  return Math.log(base);
}

/** The unit label for a log base (bits for 2, nats for e, "none" otherwise). */
export function unitOf(base: number | undefined): EstimateUnit {
  if (base === undefined || base === Math.E) return "nats";
  return base === 2 ? "bits" : "none";
}

/** `e` with value, se and interval divided by `c` and the unit replaced. */
export function scaleEstimate(
  e: Estimate,
  c: number,
  unit: EstimateUnit,
  extraNotes: readonly string[] = [],
): Estimate {
  if (c === 1 && e.unit === unit && extraNotes.length === 0) return e;
  return makeEstimate({
    value: e.value / c,
    ...(e.se !== undefined ? { se: e.se / c } : {}),
    ...(e.ci ? { ci: [e.ci[0] / c, e.ci[1] / c] as const } : {}),
    level: e.level,
    method: e.method,
    n: e.n,
    unit,
    notes: [...e.notes, ...extraNotes],
  });
}

/**
 * A note when an estimate lies outside the known range `[lo, hi]` of its quantity by more
 * than its error (half-width of its interval, or 0 for exact values).
 */
export function rangeNote(e: Estimate, lo: number, hi: number, what: string): string | undefined {
  if (!Number.isFinite(e.value)) return undefined;
  const err = e.ci ? Math.max(e.value - e.ci[0], e.ci[1] - e.value) : 0;
  if (e.value < lo - err || e.value > hi + err) {
    return `${what} estimate ${e.value} lies outside its range [${lo}, ${hi}] by more than ` +
      "its error: the densities may be misspecified or the integration inaccurate";
  }
  return undefined;
}
