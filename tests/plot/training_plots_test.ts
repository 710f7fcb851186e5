/**
 * Training figures read back from their SVG: equilibrium lines at 2 ln 2, ln 2 and 1/2
 * (Goodfellow et al. 2014, Prop. 1, Thm. 1), one shaded span per flagged span, the
 * periodogram's peak at the flag's period, interval bands of checkpoint metrics.
 */
import assert from "node:assert/strict";
import { gaussian } from "../../lib/density/gaussian.ts";
import {
  plotCheckpointMetrics,
  plotDiscriminatorOutputs,
  plotLossCurves,
  plotPeriodogram,
} from "../../lib/plot/mod.ts";
import { checkpointSeries } from "../../lib/training/checkpoint_series.ts";
import { diagnoseTraining } from "../../lib/training/diagnose_training.ts";
import { trainingLog } from "../../lib/training/training_log.ts";
import { syntheticLog } from "../_training_logs.ts";
import { all, assertStandalone, countIn, parseSvg, texts } from "./_svg.ts";

const diagnosis = diagnoseTraining(
  trainingLog(syntheticLog({ seed: 2, period: 25, collapseAt: 330 })),
);

Deno.test("plotLossCurves: equilibrium lines at 2 ln 2 and ln 2, flagged spans shaded once", () => {
  const svg = plotLossCurves(diagnosis).toSVG();
  assertStandalone(svg);
  const root = parseSvg(svg);
  const t = texts(root).join("|");
  assert.match(t, /equilibrium D loss = 1\.386/);
  assert.match(t, /equilibrium G loss = 0\.6931/);
  // Oscillation (d_loss and g_loss, the same span) and collapse (both losses, one step).
  const spans = new Set(
    diagnosis.flags.filter((f) => f.series === "d_loss" || f.series === "g_loss")
      .map((f) => `${f.kind}|${f.step}|${f.end}`),
  );
  assert.equal(spans.size, 2);
  assert.equal(countIn(root, "rect", "rect"), spans.size);
  assert.match(t, /oscillation \(period 2\d\d\)/);
  assert.match(t, /flag: collapse/);
});

Deno.test("plotDiscriminatorOutputs: D(real), D(fake) and the line at 1/2 on a [0, 1] axis", () => {
  const root = parseSvg(plotDiscriminatorOutputs(diagnosis).toSVG());
  const t = texts(root).join("|");
  assert.match(t, /D\(real\) \("d_real"\)/);
  assert.match(t, /equilibrium D\(real\), D\(fake\) = 0\.5/);
  assert.ok(texts(root).includes("1.0") && texts(root).includes("0.0"));
  const losses = syntheticLog({ seed: 1, n: 40 });
  const lossOnly = trainingLog({ step: losses.step, d_loss: losses.d_loss });
  assert.throws(() => plotDiscriminatorOutputs(lossOnly), /none of the columns/);
});

Deno.test("plotPeriodogram: the peak is labelled with the flag's period", () => {
  const osc = diagnosis.flags.find((f) => f.kind === "oscillation")!;
  const root = parseSvg(plotPeriodogram(diagnosis).toSVG());
  const label = texts(root).find((s) => /^period [\d.]+ steps/.test(s))!;
  assert.equal(Number(/period ([\d.]+) steps/.exec(label)![1]), Number(osc.period!.toPrecision(3)));
  assert.equal(countIn(root, "dot", "circle"), 1);
});

Deno.test("plotCheckpointMetrics: one panel per output, bands from the intervals", async () => {
  const real = gaussian(0, 1).sample(120, 1);
  const s = await checkpointSeries(
    real,
    [2, 1, 0].map((mu, k) => ({ step: 500 * k, samples: gaussian(mu, 1).sample(120, 3 + k) })),
    { replicates: 10 },
  );
  const root = parseSvg(plotCheckpointMetrics(s).toSVG());
  const t = texts(root).join("|");
  assert.match(t, /JSD\(p_data, p_g\)/);
  assert.match(t, /V\(D\*, G\)/);
  assert.equal(all(root, 'g[aria-label="area"] path').length, 2);
  assert.throws(() => plotCheckpointMetrics(s, { outputs: ["fid"] }), /no output "fid"/);
});

Deno.test("plotLossCurves: after a divergence the frame keeps the earlier values readable", () => {
  const d = diagnoseTraining(trainingLog(syntheticLog({ seed: 3, divergeAt: 300 })));
  const root = parseSvg(plotLossCurves(d).toSVG());
  assert.ok(texts(root).some((t) => /leave the frame and are clipped/.test(t)));
  // The y ticks stay within the pre-divergence range (about 0.5 to 2.5), not the blow-up's 10^3.
  const ticks = all(root, 'g[aria-label="y-axis tick label"] text').map((t) =>
    Number(t.textContent)
  );
  assert.ok(Math.max(...ticks) < 5, `ticks ${ticks}`);
});
