/**
 * Smoothing of logged series for reading trends: the exponential moving average and the
 * centred moving median. Both return new arrays; the raw series is never changed.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";

/** Options of {@linkcode exponentialMovingAverage}. */
export interface EmaOptions {
  /** Weight of the newest value, in (0, 1] (default: from `halfLife`). */
  alpha?: number;
  /** Records after which an old value's weight has halved (default 10): alpha = 1 - 2^(-1/halfLife). */
  halfLife?: number;
  /** Divide by the weight seen so far, so the start is not pulled toward 0 (default true). */
  debias?: boolean;
}

/**
 * Exponential moving average `m_t = (1 - alpha) m_{t-1} + alpha x_t`, bias-corrected at the
 * start by default (divided by `1 - (1 - alpha)^t`). A NaN or infinite value is skipped:
 * the average carries over and that position gets the current average.
 *
 * @example
 * ```ts
 * import { exponentialMovingAverage } from "./smoothing.ts";
 * import assert from "node:assert/strict";
 * const m = exponentialMovingAverage([1, 1, NaN, 1], { alpha: 0.5 });
 * assert.deepEqual(Array.from(m), [1, 1, 1, 1]);
 * ```
 */
export function exponentialMovingAverage(
  x: ArrayLike<number>,
  options: EmaOptions = {},
): Float64Array {
  const half = options.halfLife ?? 10;
  const alpha = options.alpha ?? 1 - Math.pow(2, -1 / half);
  if (!(alpha > 0 && alpha <= 1)) {
    throw new SaddleError("invalid-argument", `alpha must be in (0, 1], got ${alpha}`, {
      parameter: options.alpha !== undefined ? "alpha" : "halfLife",
    });
  }
  const debias = options.debias ?? true;
  const out = new Float64Array(x.length);
  let m = 0, w = 0;
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    if (Number.isFinite(v)) {
      m = (1 - alpha) * m + alpha * v;
      w = (1 - alpha) * w + alpha;
    }
    out[i] = w > 0 ? (debias ? m / w : m) : NaN;
  }
  return out;
}

/**
 * Centred moving median over `window` records (odd; shrunk at both ends), over the finite
 * values in the window (NaN where there is none). Robust to single spikes, unlike the mean.
 *
 * @example
 * ```ts
 * import { movingMedian } from "./smoothing.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(Array.from(movingMedian([1, 9, 1, 1, 1], 3)), [5, 1, 1, 1, 1]);
 * ```
 */
export function movingMedian(x: ArrayLike<number>, window = 11): Float64Array {
  if (!Number.isInteger(window) || window < 1) {
    throw new SaddleError("invalid-argument", `window must be a positive integer, got ${window}`, {
      parameter: "window",
    });
  }
  const h = window >> 1, n = x.length;
  const out = new Float64Array(n);
  const buf = new Float64Array(2 * h + 1);
  for (let i = 0; i < n; i++) {
    let k = 0;
    for (let j = Math.max(0, i - h); j <= Math.min(n - 1, i + h); j++) {
      if (Number.isFinite(x[j])) buf[k++] = x[j];
    }
    if (k === 0) {
      out[i] = NaN;
      continue;
    }
    const s = buf.subarray(0, k).sort();
    out[i] = k % 2 ? s[k >> 1] : (s[(k >> 1) - 1] + s[k >> 1]) / 2;
  }
  return out;
}
