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

/**
 * `e` kept inside the known range `[lo, hi]` of its quantity: the interval is clipped to
 * the range, and a value outside it by no more than its error (rounding, quadrature or
 * Monte Carlo error) is moved onto the nearest bound; each change is noted. A value outside
 * by more than its error is left as it is (see {@linkcode rangeNote}).
 *
 * @example A JSD interval past ln 2 is clipped to it
 * ```ts
 * import { clipToRange } from "./units.ts";
 * import { makeEstimate } from "./estimate.ts";
 * import assert from "node:assert/strict";
 * const e = makeEstimate({ value: 0.6931, ci: [0.6918, 0.6944], method: "grid", n: 0 });
 * const c = clipToRange(e, 0, Math.LN2, "JSD");
 * assert.deepEqual(c.ci, [0.6918, Math.LN2]);
 * assert.equal(c.value, 0.6931);
 * ```
 */
export function clipToRange(e: Estimate, lo: number, hi: number, what: string): Estimate {
  if (!Number.isFinite(e.value)) return e;
  const err = e.ci ? Math.max(e.value - e.ci[0], e.ci[1] - e.value) : 0;
  let value = e.value;
  const notes: string[] = [];
  if ((value < lo && value >= lo - err) || (value > hi && value <= hi + err)) {
    value = value < lo ? lo : hi;
    notes.push(`${what} estimate ${e.value} moved onto its bound ${value} (within its error)`);
  }
  let ci = e.ci;
  if (ci && (ci[0] < lo || ci[1] > hi)) {
    ci = [Math.min(Math.max(ci[0], lo), hi), Math.max(Math.min(ci[1], hi), lo)];
    notes.push(
      `${what} interval [${e.ci![0]}, ${e.ci![1]}] clipped to the range [${lo}, ${hi}] of ` +
        `the quantity`,
    );
  }
  if (notes.length === 0) return e;
  return makeEstimate({
    value,
    ...(e.se !== undefined ? { se: e.se } : {}),
    ...(ci ? { ci } : {}),
    level: e.level,
    method: e.method,
    n: e.n,
    ...(e.unit ? { unit: e.unit } : {}),
    notes: [...e.notes, ...notes],
  });
}
