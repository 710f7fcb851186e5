/**
 * The feature-space metrics section end to end: the Fréchet distance² of two Gaussians with
 * known parameters within its interval (Dowson & Landau 1982 closed form), claims on a test's
 * p-value and on a k-NN metric, and a d = 64 run where only the feature-space routes run.
 */
import assert from "node:assert/strict";
import {
  prepareAnalysis,
  runAnalysis,
  SUMMARY_SCHEMA,
  validateJson,
} from "../../lib/report/mod.ts";
import type { Json } from "../../lib/report/mod.ts";
import { claimsFile, gaussianPair } from "./_report.ts";

interface E {
  value: number;
  ci: [number, number];
}
const metric = (s: Json, key: string) =>
  (s as unknown as { estimates: { metrics: Record<string, E> } }).estimates.metrics[key];

Deno.test("feature-space metrics: Fréchet distance² of two known Gaussians within its interval; p-value claims; d = 64 runs the metrics without the density route", async () => {
  // N(0, 1) against N(1, 1.5²): Fréchet distance² = (μ1 − μ2)² + (σ1 − σ2)² = 1 + 0.25 = 1.25
  // (Dowson & Landau 1982, the 1-D case of ‖Δμ‖² + tr(Σ1 + Σ2 − 2(Σ1Σ2)^½)).
  const { dir, real, fake } = await gaussianPair({ n: 800, mean: 1, sd: 1.5, seed: 7 });
  const claims = await claimsFile(dir, [
    {
      statement: "the MMD test rejects at 5%",
      path: "tests.mmd.pValue",
      comparison: "<",
      threshold: 0.05,
    },
    {
      statement: "precision at least 0.99",
      path: "estimates.metrics.precision",
      comparison: ">=",
      threshold: 0.99,
    },
  ]);
  const report = await runAnalysis(
    await prepareAnalysis({ real, fake, claims, replicates: 10, seed: 3 }),
  );
  const s = report.summary;
  const fd = metric(s, "frechet");
  assert.ok(fd.ci[0] <= 1.25 && 1.25 <= fd.ci[1], JSON.stringify(fd));
  // A mean shift of one standard deviation at n = 800: the permutation test's smallest
  // p-value is 1/(permutations + 1), and the shifted, wider side puts many generated points
  // outside the real k-NN balls, so precision is well below 0.99.
  assert.deepEqual(report.claims.map((c) => c.verdict), ["holds", "fails"]);
  const plan = (s as unknown as { plan: Record<string, Json> }).plan;
  assert.deepEqual(plan.metricK, { precisionRecall: 3, densityCoverage: 5 });
  assert.equal(plan.metricRows, 2000);
  assert.deepEqual(validateJson(s, SUMMARY_SCHEMA), []);
  await Deno.remove(dir, { recursive: true });

  // d = 64: above the density route's limit (d ≤ 10); Gaussian closed forms and metrics run.
  const hi = await gaussianPair({ n: 200, mean: 0.5, sd: 1, seed: 2, d: 64 });
  const r64 = await runAnalysis(
    await prepareAnalysis({ real: hi.real, fake: hi.fake, seed: 1, replicates: 10 }),
  );
  const status = (r64.summary as unknown as { sections: { id: string; status: string }[] })
    .sections;
  assert.deepEqual(status.map((x) => [x.id, x.status]), [
    ["inputs", "ran"],
    ["density", "skipped"],
    ["gaussian", "ran"],
    ["metrics", "ran"],
    ["comparison", "skipped"],
    ["discriminator", "skipped"],
    ["training", "skipped"],
    ["checkpoints", "skipped"],
  ]);
  // The first coordinate's mean differs by 0.5, the covariances are equal: FD² = 0.25 plus
  // the finite-sample bias tr(Σ)-terms of order d/n (Chong & Forsyth 2020), so it is positive.
  assert.ok(metric(r64.summary, "frechet").value > 0.25);
  assert.deepEqual(validateJson(r64.summary, SUMMARY_SCHEMA), []);
  await Deno.remove(hi.dir, { recursive: true });
});
