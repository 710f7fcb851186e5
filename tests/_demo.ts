/**
 * The bundled demo data (data/demo/, made by scripts/make_demo_data.ts) read the way the
 * notebooks read it, and the assessment of the trained discriminator the notebooks record:
 * the notebook tests recompute the notebooks' numbers with these. Tests never import
 * scripts/; scripts/_demo.ts does the same for the demo command and the gallery.
 *
 * @module
 */
import * as sk from "../mod.ts";

/** Folder of the bundled demo data. */
export const DEMO_DIR: string = new URL("../data/demo/", import.meta.url).pathname;

/** Both sample sets and the trained discriminator's probabilities on their rows. */
export interface DemoData {
  /** turbine_real.csv. */
  readonly real: sk.Samples;
  /** turbine_fake.npy, with the real file's column names. */
  readonly fake: sk.Samples;
  /** disc_scores.json: probability "real" on each row of both files, in file order. */
  readonly scores: { readonly real: number[]; readonly fake: number[] };
}

/** Read the three demo files from `dir` (default the bundled folder). */
export async function loadDemo(dir: string = DEMO_DIR): Promise<DemoData> {
  const real = await sk.readSamples(`${dir}/turbine_real.csv`);
  const fake = await sk.readSamples(`${dir}/turbine_fake.npy`, { names: real.columns });
  const scores = JSON.parse(await Deno.readTextFile(`${dir}/disc_scores.json`)) as {
    real: number[];
    fake: number[];
  };
  return { real, fake, scores };
}

/** V(D, G) of the trained discriminator and its gap to D* of the given fits. */
export function assessTrained(
  data: DemoData,
  fits: { pData: sk.Density; pModel: sk.Density },
  seed: number,
  replicates?: number,
): { value: sk.Estimate; gap: sk.DiscriminatorGap } {
  const outputs = { dReal: data.scores.real, dFake: data.scores.fake, scale: "prob" as const };
  return {
    value: sk.valueFunction({ ...outputs, seed, ...(replicates ? { replicates } : {}) }),
    gap: sk.discriminatorGap({ ...outputs, real: data.real, fake: data.fake, ...fits, seed }),
  };
}
