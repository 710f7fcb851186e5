/**
 * Reading the real and generated sets of a metric.
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

/** Both sets as Samples of one dimension, each with more than `k` rows. */
export function metricPair(
  real: SamplesInput,
  fake: SamplesInput,
  k: number,
  names: readonly [string, string] = ["real", "fake"],
): [Samples, Samples] {
  if (!Number.isInteger(k) || k < 1) {
    throw new SaddleError("invalid-argument", `k must be an integer >= 1, got ${k}`, {
      parameter: "k",
    });
  }
  const r = isSamples(real) ? real : samples(real, { source: names[0] });
  const f = isSamples(fake) ? fake : samples(fake, { source: names[1] });
  assertSameDimension(r, f, names[0], names[1]);
  for (const [s, name] of [[r, names[0]], [f, names[1]]] as const) {
    if (s.n <= k) {
      throw new SaddleError(
        "too-few-samples",
        `${name} has ${s.n} rows but k = ${k} needs more than k; lower k or give more points`,
        { parameter: name },
      );
    }
  }
  return [r, f];
}
