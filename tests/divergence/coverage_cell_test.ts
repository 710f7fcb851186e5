/**
 * The coverage study (bench/coverage_study.ts) reproduces: the first trials of its
 * smallest cell, recomputed here from their seeds, give the recorded plug-in values,
 * intervals and hits (bench/coverage/1d-kde-n500-B100.jsonl, written by the study).
 */
import assert from "node:assert/strict";
import { assertClose } from "../_assert.ts";
import { type CoverageTrial, coverageTrial, trueJsd } from "../_coverage.ts";

Deno.test("coverage study: the first 8 trials of cell 1d-kde-n500-B100 reproduce", () => {
  const recorded: CoverageTrial[] = Deno.readTextFileSync(
    new URL("../../bench/coverage/1d-kde-n500-B100.jsonl", import.meta.url),
  ).split("\n").filter((l) => l.trim()).map((l) => JSON.parse(l));
  assert.equal(recorded.length, 200);
  // JSD of N(0, 1) and N(1, 1): 0.1114 nats (quadrature of the analytic densities here).
  assertClose(trueJsd(1), 0.1114, { abs: 5e-5 });
  const cell = { d: 1, fit: "kde", n: 500, replicates: 100 } as const;
  for (let t = 0; t < 8; t++) {
    const now = coverageTrial(cell, t), then = recorded.find((r) => r.trial === t)!;
    assertClose(now.value, then.value, { rel: 1e-12 }, `trial ${t}`);
    for (const m of Object.keys(then.intervals)) {
      assertClose(now.intervals[m][0], then.intervals[m][0], { rel: 1e-10 }, `${t} ${m}`);
      assertClose(now.intervals[m][1], then.intervals[m][1], { rel: 1e-10 }, `${t} ${m}`);
      assert.equal(now.covered[m], then.covered[m], `trial ${t}, ${m}`);
    }
  }
});
