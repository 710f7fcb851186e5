/**
 * The bundled demo run (data/demo/training/, made by scripts/make_demo_training.ts): what
 * its generator planted is what the diagnosis and the checkpoint series report.
 */
import assert from "node:assert/strict";
import { readSamples } from "../../lib/samples/read.ts";
import { takeRows } from "../../lib/samples/transform.ts";
import { checkpointSeries } from "../../lib/training/checkpoint_series.ts";
import { diagnoseTraining } from "../../lib/training/diagnose_training.ts";
import { readTrainingLog } from "../../lib/training/training_log.ts";

const dir = new URL("../../data/demo/", import.meta.url).pathname;

Deno.test("demo log: the restart is kept once, the oscillation of about 400 steps is flagged", async () => {
  const log = await readTrainingLog(`${dir}training/train_log.csv`);
  assert.deepEqual(log.roles, {
    step: "step",
    dLoss: "loss_D",
    gLoss: "loss_G",
    dReal: "D_x",
    dFake: "D_G_z",
  });
  assert.deepEqual(log.metrics, ["lr"]);
  assert.equal(log.runs[0].replaced, 10);
  assert.equal(log.runs[0].steps.length, 301);
  const d = diagnoseTraining(log);
  assert.deepEqual([...new Set(d.flags.map((f) => f.kind))], ["oscillation"]);
  for (const f of d.flags) {
    // Planted: period 400 steps from step 1500, fading after 4500 (half amplitude at ~4700).
    // The window after the warm-up holds 270 records of 20 steps: one bin is 5400/k - 5400/(k+1).
    assert.ok(Math.abs(5400 / f.period! - 5400 / 400) <= 1, `period ${f.period}`);
    assert.ok(
      Math.abs(f.step - 1500) <= 200 && Math.abs(f.end - 4700) <= 300,
      `${f.step}-${f.end}`,
    );
  }
});

Deno.test("demo checkpoints: six files in step order, JSD falling", async () => {
  const real = takeRows(
    await readSamples(`${dir}turbine_real.csv`),
    Uint32Array.from({ length: 200 }, (_, i) => i),
  );
  const s = await checkpointSeries(real, `${dir}training/checkpoints`, { replicates: 2 });
  assert.deepEqual(s.checkpoints.map((c) => c.step), [1000, 2000, 3000, 4000, 5000, 6000]);
  const jsd = s.checkpoints.map((c) => c.metrics.jsd.value);
  assert.ok(jsd[0] > jsd[2] && jsd[2] > jsd[5], jsd.join(", "));
});
