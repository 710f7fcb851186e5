/**
 * Reading the two sample sets of a sample-based distance.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import {
  assertSameDimension,
  isSamples,
  type Samples,
  samples,
  type SamplesInput,
} from "../samples/mod.ts";

/** `x` as Samples (validated when it is not Samples already). */
export function asSamples(x: SamplesInput, name: string): Samples {
  return isSamples(x) ? x : samples(x, { source: name });
}

/** Both inputs as Samples of one dimension, each with at least `min` rows. */
export function samplePair(
  a: SamplesInput,
  b: SamplesInput,
  min = 1,
  names: readonly [string, string] = ["a", "b"],
): [Samples, Samples] {
  const x = asSamples(a, names[0]), y = asSamples(b, names[1]);
  assertSameDimension(x, y, names[0], names[1]);
  for (const [s, name] of [[x, names[0]], [y, names[1]]] as const) {
    if (s.n < min) {
      throw new SaddleError(
        "too-few-samples",
        `${name} has ${s.n} rows but this estimator needs at least ${min}; give more points`,
        { parameter: name },
      );
    }
  }
  return [x, y];
}
