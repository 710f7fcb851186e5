/**
 * Hidden fields of frozen estimates (bootstrap replicates, the plug-in and failure count of
 * a refit bootstrap) are never lost silently: JSON keeps the Estimate shape, and a spread
 * copy, which cannot carry non-enumerable fields, does not type-check as the result type.
 * The `@ts-expect-error` lines are the check: if a spread copy type-checked again, this
 * file would stop compiling (common practice, no source: TypeScript drops class accessors
 * from spread types).
 */
import assert from "node:assert/strict";
import { gaussian } from "../../lib/density/gaussian.ts";
import {
  divergenceFromSamples,
  type SampleDivergence,
} from "../../lib/divergence/divergence_from_samples.ts";
import { bootstrap, type BootstrapEstimate } from "../../lib/estimate/bootstrap.ts";
import { twoSampleSum } from "../../lib/estimate/two_sample.ts";
import {
  decompositionFromSamples,
  type SampleDecomposition,
} from "../../lib/value/sample_decomposition.ts";

Deno.test("hidden fields: a spread copy of a bootstrap estimate is not a BootstrapEstimate", () => {
  const b = bootstrap(20, (idx) => idx[0], { seed: 1, replicates: 30 });
  assert.equal(b.replicates.length, 30);
  // @ts-expect-error the spread loses `replicates`, and its type says so
  const c: BootstrapEstimate = { ...b };
  assert.equal((c as Partial<BootstrapEstimate>).replicates, undefined);
  assert.deepEqual(Object.keys(JSON.parse(JSON.stringify(b))).sort(), Object.keys(b).sort());
  const s = twoSampleSum(Float64Array.from([1, 2, 3]), Float64Array.from([2, 3]), {
    seed: 2,
    replicates: 20,
  }) as BootstrapEstimate;
  assert.equal(s.replicates.length, 20);
});

Deno.test("hidden fields: refit results keep plug-in, failures and replicates on the result only", () => {
  const g = gaussian(0, 1), h = gaussian(0.5, 1);
  const real = g.sample(40, 1), fake = h.sample(40, 2);
  const kl = divergenceFromSamples(real, fake, "kl", { replicates: 4 });
  assert.equal(kl.failed, 0);
  assert.ok(Number.isFinite(kl.plugIn.value));
  // @ts-expect-error plugIn and failed are not carried by a spread
  const copy: SampleDivergence = { ...kl };
  assert.equal((copy as Partial<SampleDivergence>).plugIn, undefined);
  assert.equal("plugIn" in JSON.parse(JSON.stringify(kl)), false);
  const dec = decompositionFromSamples(real, fake, { replicates: 4 });
  assert.equal(dec.replicates.jsd.length, 4);
  // @ts-expect-error the replicates table is not carried by a spread
  const d2: SampleDecomposition = { ...dec };
  assert.equal((d2 as Partial<SampleDecomposition>).replicates, undefined);
});
