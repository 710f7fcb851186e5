/**
 * Discriminator outputs are type-checked (issue 9): null, undefined, strings and booleans
 * are refused naming the index and the parameter, never read as 0, NaN or -Infinity; a
 * one-column Samples (what readSamples returns for a scores file) is accepted.
 */
import assert from "node:assert/strict";
import { SaddleError } from "../../lib/errors/mod.ts";
import { parseCsv, samples } from "../../lib/samples/mod.ts";
import { discriminatorGap } from "../../lib/discriminator/mod.ts";
import { generatorObjectives, valueFunction } from "../../lib/value/mod.ts";

const BAD: unknown[] = [null, undefined, "0.5", true, false, {}];

Deno.test("outputs: null, undefined, strings and booleans are refused naming index and parameter", () => {
  for (const scale of ["prob", "logit"] as const) {
    for (const bad of BAD) {
      const dReal = [0.4, bad, 0.6] as unknown as number[];
      const call = () => valueFunction({ dReal, dFake: [0.3, 0.2], scale });
      assert.throws(
        call,
        (e: unknown) =>
          e instanceof SaddleError && e.code === "invalid-argument" &&
          e.location.parameter === "dReal" && e.location.row === 1 &&
          /dReal\[1\]/.test(e.message),
        `${scale} ${String(bad)}`,
      );
    }
  }
  assert.throws(
    () => generatorObjectives([0.1, null] as unknown as number[], { scale: "prob" }),
    (e: unknown) => e instanceof SaddleError && /dFake\[1\] is null/.test(e.message),
  );
  assert.throws(
    () => discriminatorGap({ dReal: ["1"] as unknown as number[], dFake: [0.5], scale: "prob" }),
    (e: unknown) => e instanceof SaddleError && /dReal\[0\] is the string "1"/.test(e.message),
  );
  assert.throws(
    () => valueFunction({ dReal: null as unknown as number[], dFake: [0.5], scale: "prob" }),
    (e: unknown) => e instanceof SaddleError && e.location.parameter === "dReal",
  );
});

Deno.test("outputs: a one-column Samples is read as its column; two columns say what to pass", () => {
  const dReal = parseCsv("score\n0.9\n0.7\n0.8\n"), dFake = samples([0.2, 0.4, 0.1]);
  const fromSamples = valueFunction({ dReal, dFake, scale: "prob", seed: 1 });
  const fromArrays = valueFunction({
    dReal: [0.9, 0.7, 0.8],
    dFake: [0.2, 0.4, 0.1],
    scale: "prob",
    seed: 1,
  });
  assert.equal(fromSamples.value, fromArrays.value);
  assert.deepEqual(fromSamples.ci, fromArrays.ci);
  const gap = discriminatorGap({ dReal, dFake, scale: "prob" });
  assert.equal(
    gap.brier.value,
    discriminatorGap({
      dReal: [0.9, 0.7, 0.8],
      dFake: [0.2, 0.4, 0.1],
      scale: "prob",
    }).brier.value,
  );
  assert.throws(
    () => valueFunction({ dReal: samples([[0.1, 0.2]]), dFake, scale: "prob" }),
    (e: unknown) => e instanceof SaddleError && /one column/.test(e.message),
  );
});

Deno.test("generatorObjectives without options: a SaddleError saying which scale to give", () => {
  assert.throws(
    () => (generatorObjectives as unknown as (d: number[]) => unknown)([0.1, 0.2]),
    (e: unknown) => e instanceof SaddleError && /scale: "prob"/.test(e.message),
  );
});
