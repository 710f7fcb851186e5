/**
 * Feature-space metrics in a checkpoint series (d > 2): the defaults are the registered
 * feature metrics; the Fréchet distance of N(mu, I) against N(0, I) is |mu|^2 (Dowson &
 * Landau 1982), so it falls with |mu|.
 */
import assert from "node:assert/strict";
import { gaussian } from "../../lib/density/gaussian.ts";
import { checkpointSeries } from "../../lib/training/checkpoint_series.ts";

Deno.test("d = 8: Fréchet, MMD and precision/recall by default, Fréchet falling as |mu|^2", async () => {
  const d = 8;
  const g = (shift: number) =>
    gaussian(
      new Array(d).fill(shift / Math.sqrt(d)),
      Array.from({ length: d }, (_, i) => Array.from({ length: d }, (_, j) => (i === j ? 1 : 0))),
    );
  const real = g(0).sample(300, 1);
  const s = await checkpointSeries(
    real,
    [2, 1, 0].map((mu, k) => ({ step: 100 * k, samples: g(mu).sample(300, 5 + k) })),
    { replicates: 10 },
  );
  assert.deepEqual(s.metrics, ["frechet", "mmd", "precision-recall"]);
  const fd = s.checkpoints.map((c) => c.metrics.frechet);
  assert.ok(fd[0].value > fd[1].value && fd[1].value > fd[2].value);
  // |mu|^2 = 4 and 1, plus the c/n bias of the plug-in (about d(d+1)/n... here < 0.5).
  assert.ok(
    Math.abs(fd[0].value - 4) < 0.8 && Math.abs(fd[1].value - 1) < 0.6,
    `${fd.map((e) => e.value)}`,
  );
});
