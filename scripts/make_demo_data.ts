/**
 * Makes the bundled demo data in data/demo/ with a fixed seed (run: `deno task demo:data`).
 *
 * The scenario (invented for saddlekit): a wind-farm operator trains a GAN to synthesise
 * turbine sensor readings — hub wind speed (m/s) and tower vibration (mm/s RMS) — to
 * stress-test a fault detector. The real fleet runs in three regimes (calm, rated, storm);
 * the generator under review reproduces calm and rated operation fairly well but
 * under-produces storms and makes vibration a little too tame. A discriminator was trained
 * against it on other rows; its outputs on the rows of both files are in disc_scores.json.
 *
 * Files:
 * - turbine_real.csv   2000 real rows, header wind_speed_ms,vibration_mm_s
 * - turbine_fake.npy   2000 generated rows, float32, shape (2000, 2)
 * - disc_scores.json   {"real": [...], "fake": [...]}: the trained discriminator's
 *                      probability "real" on each row of turbine_real.csv and of
 *                      turbine_fake.npy, in file order (rows it did not train on)
 *
 * @module
 */
import { gaussianMixture } from "../lib/density/mod.ts";
import { rng } from "../lib/random/mod.ts";
import { writeNpy } from "../lib/samples/mod.ts";

const SEED = 20261202;
const out = new URL("../data/demo/", import.meta.url);

/** The real fleet: calm, rated and storm regimes (wind m/s, vibration mm/s). */
export const realFleet = gaussianMixture({
  weights: [0.3, 0.5, 0.2],
  means: [[4.0, 1.4], [10.0, 3.2], [17.0, 6.0]],
  covariances: [
    [[1.0, 0.12], [0.12, 0.09]],
    [[2.25, 0.45], [0.45, 0.36]],
    [[4.0, 1.2], [1.2, 1.44]],
  ],
});

/** The generator under review: too few storms, too little vibration spread. */
export const generator = gaussianMixture({
  weights: [0.34, 0.56, 0.1],
  means: [[4.2, 1.45], [10.4, 3.0], [15.5, 5.2]],
  covariances: [
    [[1.1, 0.1], [0.1, 0.06]],
    [[2.0, 0.3], [0.3, 0.2]],
    [[3.0, 0.6], [0.6, 0.7]],
  ],
});

if (import.meta.main) {
  const r = rng(SEED);
  await Deno.mkdir(out, { recursive: true });

  const real = realFleet.sample(2000, r.fork("real"));
  const lines = ["wind_speed_ms,vibration_mm_s"];
  for (let i = 0; i < real.n; i++) {
    lines.push(`${real.data[2 * i].toFixed(4)},${real.data[2 * i + 1].toFixed(4)}`);
  }
  await Deno.writeTextFile(new URL("turbine_real.csv", out), lines.join("\n") + "\n");

  const fake = generator.sample(2000, r.fork("fake"));
  await writeNpy(new URL("turbine_fake.npy", out).pathname, fake, { dtype: "<f4" });

  // The "trained" discriminator: the optimal logit log p_data - log p_g, shrunk (it is
  // under-confident), shifted (it favours "real") and blurred by its own estimation noise.
  const noise = r.fork("noise");
  const score = (x: typeof real) => {
    const lp = realFleet.logPdf(x), lq = generator.logPdf(x);
    return Array.from(lp, (v, i) => {
      const logit = 0.7 * (v - lq[i]) + 0.25 + noise.normal(0, 0.35);
      return Number((1 / (1 + Math.exp(-logit))).toFixed(6));
    });
  };
  await Deno.writeTextFile(
    new URL("disc_scores.json", out),
    JSON.stringify({ real: score(real), fake: score(fake) }) + "\n",
  );
  console.log(
    `wrote ${real.n} real rows, ${fake.n} generated rows and their discriminator scores to ${out.pathname}`,
  );
}
