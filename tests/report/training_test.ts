/**
 * The training run in the report: the demo log diagnosed (its planted oscillation of about
 * 400 steps and its restart, scripts/make_demo_training.ts), flags with evidence in
 * summary.json and a claim on them; a checkpoint series from a known family, N(μ_t, 1)
 * against N(0, 1) with μ_t → 0, whose JSD falls; bad checkpoint input named up front.
 */
import assert from "node:assert/strict";
import {
  checkpointsSection,
  inputsSection,
  prepareAnalysis,
  runAnalysis,
  SUMMARY_SCHEMA,
  trainingSection,
  validateJson,
} from "../../lib/report/mod.ts";
import { gaussian } from "../../lib/density/mod.ts";
import { writeNpy } from "../../lib/samples/mod.ts";
import { claimsFile, gaussianPair } from "./_report.ts";

const DEMO = new URL("../../data/demo/", import.meta.url).pathname;
const sections = [inputsSection, trainingSection, checkpointsSection];

interface Flag {
  kind: string;
  step: number;
  period: number | null;
  evidence: { statistic: string };
}

Deno.test("training log: the demo's planted oscillation flagged with its period and evidence; a claim on the flag count; figures", async () => {
  const { dir, real, fake } = await gaussianPair({ n: 100, mean: 0, sd: 1, seed: 1 });
  const claims = await claimsFile(dir, [
    {
      statement: "training raised no flag",
      path: "training.flagCount",
      comparison: "<=",
      threshold: 0,
    },
  ]);
  const report = await runAnalysis(
    await prepareAnalysis({
      real,
      fake,
      claims,
      log: `${DEMO}training/train_log.csv`,
      sections,
    }),
  );
  const t = (report.summary as unknown as { training: { flags: Flag[]; flagCount: number } })
    .training;
  // The demo oscillates with a period of about 400 steps from step 1500 (its generator
  // script); the periodogram's resolution at ~300 records of 20 steps is a few percent.
  const osc = t.flags.find((f) => f.kind === "oscillation");
  assert.ok(osc, JSON.stringify(t.flags));
  assert.ok(Math.abs(osc.period! - 400) <= 60, `period ${osc.period}`);
  assert.ok(osc.evidence.statistic.length > 0);
  assert.equal(t.flagCount, t.flags.length);
  assert.deepEqual(report.claims.map((c) => c.verdict), ["fails"]);
  assert.deepEqual(
    report.figures.map((f) => f.name),
    ["loss_curves", "d_outputs", "periodogram"],
  );
  assert.match(report.html, /oscillation/);
  assert.deepEqual(validateJson(report.summary, SUMMARY_SCHEMA), []);
  await Deno.remove(dir, { recursive: true });
});

Deno.test("checkpoints: N(μ_t, 1) against N(0, 1) with μ_t → 0 gives a JSD that falls, with intervals; bad checkpoints named up front", async () => {
  const dir = await Deno.makeTempDir({ prefix: "saddlekit-report-" });
  await writeNpy(`${dir}/real.npy`, gaussian(0, 1).sample(300, 1));
  await writeNpy(`${dir}/fake.npy`, gaussian(0, 1).sample(300, 2));
  await Deno.mkdir(`${dir}/ck`);
  const mus = [2, 1, 0.3, 0];
  for (const [i, mu] of mus.entries()) {
    await writeNpy(`${dir}/ck/step_${(i + 1) * 1000}.npy`, gaussian(mu, 1).sample(300, 10 + i));
  }
  await Deno.writeTextFile(`${dir}/ck/README.txt`, "not a checkpoint");
  const progress: string[] = [];
  const report = await runAnalysis(
    await prepareAnalysis({
      real: `${dir}/real.npy`,
      fake: `${dir}/fake.npy`,
      checkpoints: `${dir}/ck`,
      checkpointReplicates: 10,
      sections,
      onProgress: (s) => progress.push(s),
    }),
  );
  interface P {
    step: number;
    estimates: Record<string, { value: number; ci: [number, number] }>;
  }
  const ck = (report.summary as unknown as { checkpoints: { points: P[]; skipped: string[] } })
    .checkpoints;
  assert.deepEqual(ck.points.map((p) => p.step), [1000, 2000, 3000, 4000]);
  assert.deepEqual(ck.skipped, ["README.txt"]);
  const jsd = ck.points.map((p) => p.estimates.jsd);
  // For equal-variance Gaussians the JSD grows with |μ1 − μ2| and is 0 at μ1 = μ2
  // (Goodfellow et al. 2014, Thm. 1 for the zero; common practice, no source, for the
  // monotonicity): the first intervals lie above the later ones and the last is near 0.
  assert.ok(jsd[0].ci[0] > jsd[1].ci[1], JSON.stringify(jsd));
  assert.ok(jsd[1].ci[0] > jsd[3].ci[1], JSON.stringify(jsd));
  assert.ok(jsd[3].value < 0.05, JSON.stringify(jsd[3]));
  assert.ok(progress.includes("checkpoints: 4 of 4"), progress.join("|"));
  assert.deepEqual(report.figures.map((f) => f.name), ["checkpoint_metrics"]);
  assert.deepEqual(validateJson(report.summary, SUMMARY_SCHEMA), []);

  // Bad input, before any computation: a checkpoint of the wrong dimension, a missing
  // folder, a missing log.
  await writeNpy(`${dir}/ck/step_5000.npy`, gaussian([0, 0], [[1, 0], [0, 1]]).sample(50, 3));
  const base = { real: `${dir}/real.npy`, fake: `${dir}/fake.npy`, sections };
  await assert.rejects(
    prepareAnalysis({ ...base, checkpoints: `${dir}/ck` }),
    (e: Error) => /step_5000\.npy/.test(e.message) && /d = 2/.test(e.message),
  );
  await assert.rejects(
    prepareAnalysis({ ...base, checkpoints: `${dir}/nope` }),
    /--checkpoints.*nope|nope.*--checkpoints/s,
  );
  await assert.rejects(prepareAnalysis({ ...base, log: `${dir}/nope.csv` }), /--log.*not found/s);
  await Deno.remove(dir, { recursive: true });
});
