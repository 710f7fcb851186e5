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
 * - spectra_real.npy, spectra_gen_a.npy, spectra_gen_b.npy
 *                      feature embeddings: 1500 rows each, float32, shape (1500, 128), the
 *                      log vibration spectrum of a reading in 128 frequency bins (rotor
 *                      harmonics that move with wind speed up to rated, scaled by the
 *                      vibration level, plus a turbulence floor in storms). Real readings
 *                      come from the fleet; generator A is a retrained model that covers all
 *                      three regimes (slightly off in place and spread); generator B drops the storm
 *                      regime (mode collapse onto calm and rated operation).
 *
 * @module
 */
import { gaussianMixture } from "../lib/density/mod.ts";
import { rng } from "../lib/random/mod.ts";
import { fromBuffer, writeNpy } from "../lib/samples/mod.ts";

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

/** Generator A: all three regimes, a little off in place and spread. */
export const generatorA = gaussianMixture({
  weights: [0.31, 0.49, 0.2],
  means: [[4.1, 1.42], [10.1, 3.15], [16.8, 5.9]],
  covariances: [
    [[1.05, 0.12], [0.12, 0.1]],
    [[2.3, 0.45], [0.45, 0.38]],
    [[4.2, 1.2], [1.2, 1.5]],
  ],
});

/** Generator B: the storm regime is gone (mode collapse). */
export const generatorB = gaussianMixture({
  weights: [0.38, 0.62],
  means: [[4.0, 1.4], [10.0, 3.2]],
  covariances: [
    [[1.0, 0.12], [0.12, 0.09]],
    [[2.25, 0.45], [0.45, 0.36]],
  ],
});

/** Frequency bins of the spectrum embeddings. */
export const SPECTRUM_BINS = 128;

/**
 * Log vibration spectra (rows of `SPECTRUM_BINS`, float32 values) of readings (wind m/s,
 * vibration mm/s): rotor harmonics at multiples of a rotor frequency that rises with wind
 * up to rated (12 m/s), amplitude from the vibration level, peak width `width` bins, a
 * turbulence floor above rated, and measurement noise.
 */
export function spectra(
  readings: { n: number; data: Float64Array },
  noise: { normal(mean?: number, sd?: number): number },
  width = 1.5,
): Float32Array {
  const B = SPECTRUM_BINS, out = new Float32Array(readings.n * B);
  for (let i = 0; i < readings.n; i++) {
    const w = readings.data[2 * i], v = Math.max(readings.data[2 * i + 1], 0.05);
    const f0 = 6 + 30 * Math.min(Math.max(w / 12, 0.2), 1);
    const floor = 1e-3 + 0.02 * Math.max(w - 12, 0);
    for (let b = 0; b < B; b++) {
      let s = floor * (1 + b / B);
      for (let h = 1; h <= 3; h++) {
        const z = (b - h * f0) / (width * h);
        s += (v / h) * Math.exp(-0.5 * z * z);
      }
      out[i * B + b] = Math.log(s) + noise.normal(0, 0.05);
    }
  }
  return out;
}

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
  const emb = r.fork("spectra");
  const sets = [
    ["spectra_real.npy", realFleet, 1.5],
    ["spectra_gen_a.npy", generatorA, 1.5],
    ["spectra_gen_b.npy", generatorB, 1.5],
  ] as const;
  for (const [file, model, width] of sets) {
    const readings = model.sample(1500, emb.fork(`${file}/readings`));
    const x = spectra(readings, emb.fork(`${file}/noise`), width);
    await writeNpy(new URL(file, out).pathname, fromBuffer(Float64Array.from(x), SPECTRUM_BINS), {
      dtype: "<f4",
    });
  }
  console.log(
    `wrote ${real.n} real rows, ${fake.n} generated rows and their discriminator scores, ` +
      `and 3 x 1500 spectrum embeddings to ${out.pathname}`,
  );
}
