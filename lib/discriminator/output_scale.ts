/**
 * Scales of a discriminator's outputs (probabilities or logits) and their conversion to
 * logits with the documented clipping of saturated probabilities.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { isSamples, type Samples } from "../samples/samples.ts";

/** Scale of a discriminator's outputs: probabilities in [0, 1] or logits in R. */
export type OutputScale = "prob" | "logit";

/**
 * Probabilities of exactly 0 or 1 are moved to `OUTPUT_EPSILON` and `1 - OUTPUT_EPSILON`
 * before taking logs (1e-7, the usual float32 guard of deep-learning frameworks; common
 * practice, no source). Logits need no clipping.
 *
 * @example
 * ```ts
 * import { OUTPUT_EPSILON, outputsToLogits } from "./output_scale.ts";
 * import assert from "node:assert/strict";
 * const { logit } = outputsToLogits([1], "prob", "dReal");
 * assert.equal(logit[0], Math.log1p(-OUTPUT_EPSILON) - Math.log(OUTPUT_EPSILON));
 * ```
 */
export const OUTPUT_EPSILON = 1e-7;

/**
 * Validate outputs and return their logits, clipping probabilities of exactly 0 or 1 at
 * `epsilon`; `name` is used in error messages. Returns the number clipped. Probabilities
 * outside [0, 1] and NaN throw; logits of ±Infinity are kept.
 *
 * @example
 * ```ts
 * import { outputsToLogits } from "./output_scale.ts";
 * import assert from "node:assert/strict";
 * const { logit, clipped } = outputsToLogits([0.5, 1], "prob", "dReal");
 * assert.equal(logit[0], 0);
 * assert.equal(clipped, 1);
 * assert.throws(() => outputsToLogits([2], "prob", "dReal"), /outside \[0, 1\]/);
 * ```
 */
export function outputsToLogits(
  outputs: ArrayLike<number> | Samples,
  scale: OutputScale,
  name: string,
  epsilon: number = OUTPUT_EPSILON,
): { logit: Float64Array; clipped: number } {
  const values = outputColumn(outputs, name);
  if (scale !== "prob" && scale !== "logit") {
    throw new SaddleError("invalid-argument", `scale must be "prob" or "logit", got ${scale}`, {
      parameter: "scale",
    });
  }
  if (!(epsilon > 0 && epsilon < 0.5)) {
    throw new SaddleError("invalid-argument", `epsilon must be in (0, 0.5), got ${epsilon}`, {
      parameter: "epsilon",
    });
  }
  if (values.length === 0) {
    throw new SaddleError("empty", `${name} is empty: give the outputs on at least one point`, {
      parameter: name,
    });
  }
  const out = new Float64Array(values.length);
  let clipped = 0;
  const lo = Math.log(epsilon) - Math.log1p(-epsilon);
  for (let i = 0; i < values.length; i++) {
    const v = values[i] as unknown;
    if (typeof v !== "number") {
      throw new SaddleError(
        "invalid-argument",
        `${name}[${i}] is ${describeValue(v)}, not a number; every output must be a number ` +
          "(convert strings with Number(...), drop missing entries)",
        { parameter: name, row: i },
      );
    }
    if (Number.isNaN(v)) {
      throw new SaddleError("non-finite", `${name} is NaN; drop or fix that output`, {
        parameter: name,
        row: i,
      });
    }
    if (scale === "logit") {
      out[i] = v;
      continue;
    }
    if (!(v >= 0 && v <= 1)) {
      throw new SaddleError(
        "invalid-argument",
        `${name} is ${v}, outside [0, 1]; pass scale: "logit" if these are logits`,
        { parameter: name, row: i },
      );
    }
    if (v === 0) {
      out[i] = lo;
      clipped++;
    } else if (v === 1) {
      out[i] = -lo;
      clipped++;
    } else out[i] = Math.log(v) - Math.log1p(-v);
  }
  return { logit: out, clipped };
}

/**
 * The outputs as an array-like of one value per point: a one-column Samples (what
 * `readSamples` returns for a file of scores) gives its column; anything else that is not
 * array-like, or a Samples of several columns, is refused saying what to pass.
 */
function outputColumn(values: unknown, name: string): ArrayLike<unknown> {
  if (isSamples(values)) {
    if (values.d === 1) return values.data;
    throw new SaddleError(
      "dimension-mismatch",
      `${name} is Samples of ${values.d} columns; pass one output per point: one column ` +
        "(selectColumns(s, [j]).data) or an array of numbers",
      { parameter: name },
    );
  }
  if (
    values === null || typeof values !== "object" ||
    typeof (values as ArrayLike<unknown>).length !== "number"
  ) {
    throw new SaddleError(
      "invalid-argument",
      `${name} is ${describeValue(values)}; pass the discriminator's outputs as an array of ` +
        "numbers, a Float64Array or a one-column Samples",
      { parameter: name },
    );
  }
  return values as ArrayLike<unknown>;
}

function describeValue(v: unknown): string {
  if (v === null || v === undefined) return String(v);
  if (typeof v === "string") return `the string ${JSON.stringify(v.slice(0, 40))}`;
  if (typeof v === "number") return String(v);
  return `a ${typeof v} (${String(v).slice(0, 40)})`;
}
