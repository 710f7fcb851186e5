/**
 * Refit-bootstrap cases of `deno task bench:compare`: the decomposition from 2e5 x 2
 * points a side with 200 refit replicates (binned KDE route), against scipy's
 * gaussian_kde.evaluate of the same two KDEs once on a 100 x 100 grid.
 *
 * @module
 */
import { decompositionFromSamples } from "../lib/value/sample_decomposition.ts";
import { fromBuffer } from "../lib/samples/samples.ts";
import { runReference } from "../tests/_reference.ts";
import { shiftedNormalData } from "../tests/_data.ts";
import { registerCase, timed } from "./_compare_registry.ts";

registerCase({
  name: "refit-decomposition-2e5",
  python: ["numpy", "scipy"],
  target: 1.0,
  async run(reference) {
    const n = 2e5, d = 2;
    const real = shiftedNormalData(n, d, 31), fake = shiftedNormalData(n, d, 32);
    for (let i = 0; i < n; i++) fake[i * d + 1] += 0.3; // the model is off by 0.3 in y
    let last = 0;
    const ours = await timed(() =>
      decompositionFromSamples(fromBuffer(real, d), fromBuffer(fake, d), {
        replicates: 200,
        seed: 1,
        onProgress: (k, total) => {
          if (k === total || k - last >= 50) {
            last = k;
            console.error(`  refit-decomposition-2e5: replicate ${k}/${total}`);
          }
        },
      })
    );
    console.error(`  refit-decomposition-2e5: saddlekit ${ours.seconds.toFixed(1)} s`);
    if (!reference) return { saddlekit_s: ours.seconds, reference_s: null, max_rel_err: null };
    const lower = [Infinity, Infinity], upper = [-Infinity, -Infinity];
    for (const x of [real, fake]) {
      for (let i = 0; i < n; i++) {
        for (let c = 0; c < d; c++) {
          lower[c] = Math.min(lower[c], x[i * d + c]);
          upper[c] = Math.max(upper[c], x[i * d + c]);
        }
      }
    }
    const ref = await runReference<{ jsd: number; seconds: number }>("refit_grid_evaluate.py", {
      real,
      fake,
      lower,
      upper,
      size: 100,
    });
    return {
      saddlekit_s: ours.seconds,
      reference_s: ref.seconds,
      max_rel_err: Math.abs(ours.value.jsd.value - ref.jsd) / ref.jsd,
      note: "decompositionFromSamples (200 refit replicates, all terms) vs scipy gaussian_kde " +
        "fit + evaluate of both KDEs once on 100 x 100 nodes; error: plug-in JSD vs the JSD " +
        "of scipy's grid values by the midpoint rule (coarse grid: its quadrature error " +
        "dominates)",
    };
  },
});
