/**
 * Makes the demo training run in data/demo/training/ with a fixed seed (run:
 * `deno task demo:training`).
 *
 * The scenario (invented for saddlekit, the same wind-farm operator as data/demo/): the GAN
 * that synthesises turbine readings (hub wind speed m/s, tower vibration mm/s) was trained
 * for 6000 steps. Its log records every 20 steps the discriminator's summed binary
 * cross-entropy, the non-saturating generator loss, D's mean output on real and generated
 * batches, and the learning rate. The job crashed after step 3000 and was resumed from the
 * checkpoint of step 2800, so steps 2820-3000 appear twice (the resumed rows are the ones
 * to keep). From step 1500 the two players oscillate with a period of about 400 steps (the
 * learning rate was too high until the schedule lowered it at step 4500). Generated
 * samples were saved every 1000 steps: early ones cover only the rated regime, later ones
 * approach the generator under review in data/demo/turbine_fake.npy (its mixture is
 * the end point of generatorAt below).
 *
 * Files:
 * - train_log.csv                 the log: step,loss_D,loss_G,D_x,D_G_z,lr
 * - checkpoints/step_00NNNN.csv   400 generated rows each, header wind_speed_ms,vibration_mm_s
 *
 * @module
 */
import { gaussianMixture } from "../lib/density/mod.ts";
import { rng } from "../lib/random/mod.ts";

const SEED = 20261213;
const out = new URL("../data/demo/training/", import.meta.url);

/** The generator at a share `t` in [0, 1] of the way from the early one to the final one. */
function generatorAt(t: number) {
  // Early: everything in the rated regime, with too little spread.
  const w0 = [0.02, 0.96, 0.02], w1 = [0.34, 0.56, 0.1];
  const m0 = [[9, 2.8], [10, 3], [11, 3.2]], m1 = [[4.2, 1.45], [10.4, 3.0], [15.5, 5.2]];
  const lerp = (a: number, b: number) => a + t * (b - a);
  return gaussianMixture({
    weights: w0.map((w, k) => lerp(w, w1[k])),
    means: m0.map((m, k) => m.map((v, j) => lerp(v, m1[k][j]))),
    covariances: [
      [[lerp(0.5, 1.1), lerp(0.02, 0.1)], [lerp(0.02, 0.1), lerp(0.04, 0.06)]],
      [[lerp(1.0, 2.0), lerp(0.1, 0.3)], [lerp(0.1, 0.3), lerp(0.1, 0.2)]],
      [[lerp(0.5, 3.0), lerp(0.1, 0.6)], [lerp(0.1, 0.6), lerp(0.3, 0.7)]],
    ],
  });
}

if (import.meta.main) {
  const r = rng(SEED);
  await Deno.mkdir(new URL("checkpoints/", out), { recursive: true });
  const noise = r.fork("log");
  const row = (step: number) => {
    const decay = Math.exp(-step / 1200);
    const lrHigh = step < 4500;
    const amp = step < 1500 ? 0 : lrHigh ? 0.2 : 0.2 * Math.exp(-(step - 4500) / 300);
    const wave = amp * Math.sin((2 * Math.PI * step) / 400);
    const dLoss = 2 * Math.LN2 - 0.7 * decay + wave + noise.normal(0, 0.04);
    const gLoss = Math.LN2 + 1.4 * decay - wave + noise.normal(0, 0.05);
    const dx = 0.5 + 0.3 * decay + 0.3 * wave + noise.normal(0, 0.015);
    const dgz = 0.5 - 0.3 * decay - 0.3 * wave + noise.normal(0, 0.015);
    const lr = lrHigh ? 2e-4 : 5e-5;
    return [step, dLoss, gLoss, dx, dgz].map((v, j) => (j === 0 ? String(v) : v.toFixed(5)))
      .concat(lr.toExponential(0)).join(",");
  };
  const lines = ["step,loss_D,loss_G,D_x,D_G_z,lr"];
  for (let s = 0; s <= 3000; s += 20) lines.push(row(s));
  for (let s = 2820; s <= 6000; s += 20) lines.push(row(s)); // resumed from step 2800
  await Deno.writeTextFile(new URL("train_log.csv", out), lines.join("\n") + "\n");

  for (let step = 1000; step <= 6000; step += 1000) {
    const g = generatorAt(step / 6000);
    const s = g.sample(400, r.fork(`checkpoint/${step}`));
    const rows = ["wind_speed_ms,vibration_mm_s"];
    for (let i = 0; i < s.n; i++) {
      rows.push(`${s.data[2 * i].toFixed(4)},${s.data[2 * i + 1].toFixed(4)}`);
    }
    const name = `checkpoints/step_${String(step).padStart(6, "0")}.csv`;
    await Deno.writeTextFile(new URL(name, out), rows.join("\n") + "\n");
  }
  console.log(`wrote the training log and 6 checkpoints to ${out.pathname}`);
}
