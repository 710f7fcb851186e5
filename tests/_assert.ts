/**
 * Small tolerance assertions for numeric tests (JSR's std/assert is unreachable here).
 *
 * @module
 */
import { AssertionError } from "node:assert/strict";

/** Tolerances: pass when `|a - e| <= abs + rel * |e|`. */
export interface Tolerance {
  /** Relative tolerance (default 1e-12). */
  rel?: number;
  /** Absolute tolerance (default 0). */
  abs?: number;
}

/** Assert that `actual` is within tolerance of `expected`; equal infinities pass. */
export function assertClose(
  actual: number,
  expected: number,
  tol: Tolerance = {},
  message = "",
): void {
  const rel = tol.rel ?? 1e-12, abs = tol.abs ?? 0;
  if (actual === expected) return;
  const err = Math.abs(actual - expected);
  if (!(err <= abs + rel * Math.abs(expected))) {
    throw new AssertionError({
      message: `${message ? message + ": " : ""}${actual} is not close to ${expected} ` +
        `(|diff| = ${err}, allowed ${abs + rel * Math.abs(expected)})`,
      actual,
      expected,
    });
  }
}

/** Assert element-wise closeness of two arrays of equal length; names the first bad index. */
export function assertAllClose(
  actual: ArrayLike<number>,
  expected: ArrayLike<number>,
  tol: Tolerance = {},
  message = "",
): void {
  if (actual.length !== expected.length) {
    throw new AssertionError({
      message: `${message ? message + ": " : ""}length ${actual.length} != ${expected.length}`,
    });
  }
  for (let i = 0; i < actual.length; i++) {
    assertClose(actual[i], expected[i], tol, `${message ? message + ", " : ""}index ${i}`);
  }
}

/** Largest relative error `|a - e| / max(|e|, tiny)` over two arrays. */
export function maxRelError(actual: ArrayLike<number>, expected: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < actual.length; i++) {
    const e = Math.abs(actual[i] - expected[i]) / Math.max(Math.abs(expected[i]), 1e-300);
    if (e > m) m = e;
  }
  return m;
}

/**
 * Assert that `actual` lies within `k` standard errors of `expected` (for Monte Carlo and
 * sampling checks).
 */
export function assertWithinSe(
  actual: number,
  expected: number,
  se: number,
  k = 5,
  message = "",
): void {
  if (!(Math.abs(actual - expected) <= k * se)) {
    throw new AssertionError({
      message: `${message ? message + ": " : ""}${actual} is ${
        (Math.abs(actual - expected) / se).toFixed(2)
      } standard errors (se ${se}) from ${expected}; allowed ${k}`,
      actual,
      expected,
    });
  }
}
