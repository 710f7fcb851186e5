/**
 * Diagnosis on seeded synthetic logs with planted faults, and the false-alarm rate on
 * clean logs. The equilibrium values are those of Goodfellow et al. 2014 (Prop. 1, Thm. 1).
 */
import assert from "node:assert/strict";
import { displayBundle } from "../../lib/display/display.ts";
import {
  diagnoseTraining,
  TRAINING_EQUILIBRIUM,
  TRAINING_FALSE_ALARM_RATE,
  type TrainingFlag,
} from "../../lib/training/diagnose_training.ts";
import { trainingLog } from "../../lib/training/training_log.ts";
import { syntheticLog, type SyntheticLogOptions } from "../_training_logs.ts";

const diagnose = (o: SyntheticLogOptions) => diagnoseTraining(trainingLog(syntheticLog(o)));
const kinds = (flags: readonly TrainingFlag[]) => [...new Set(flags.map((f) => f.kind))].sort();

Deno.test("equilibrium values: 2 ln 2, ln 2, 1/2 (Goodfellow et al. 2014, Prop. 1, Thm. 1)", () => {
  // At D = 1/2: -ln(1/2) - ln(1 - 1/2) = 2 ln 2 and -ln(1/2) = ln 2.
  assert.equal(TRAINING_EQUILIBRIUM.dLoss, -Math.log(0.5) - Math.log(1 - 0.5));
  assert.equal(TRAINING_EQUILIBRIUM.gLoss, -Math.log(0.5));
  assert.deepEqual([TRAINING_EQUILIBRIUM.dReal, TRAINING_EQUILIBRIUM.dFake], [0.5, 0.5]);
});

Deno.test("a clean converging log raises no flag", () => {
  for (const seed of [1, 2, 3]) assert.deepEqual(diagnose({ seed }).flags, []);
});

Deno.test("a planted period is found within one frequency bin", () => {
  for (const [seed, period] of [[11, 25], [12, 40], [13, 9]]) {
    const d = diagnose({ seed, period, amplitude: 0.1 });
    const osc = d.flags.filter((f) => f.kind === "oscillation");
    assert.ok(osc.length >= 2, `period ${period}: ${d.flags.map((f) => f.message)}`);
    assert.deepEqual(kinds(d.flags), ["oscillation"]);
    for (const f of osc) {
      // The window after the 10% warm-up holds 360 records of 10 steps: bin k = 360 / period.
      const kFound = 3600 / f.period!, kTrue = 360 / period;
      assert.ok(Math.abs(kFound - kTrue) <= 1, `period ${period}: found ${f.period} steps`);
      assert.ok(f.evidence.value < f.evidence.threshold);
      // Present from the first record: the span starts at the warm-up's end, within the
      // demodulation window (whole periods covering 20 records or more).
      assert.ok(f.step - 400 <= 10 * period * Math.ceil(20 / period), `starts at ${f.step}`);
    }
  }
});

Deno.test("an oscillation starting late is placed within half a window (here 10 records); big swings are no collapse", () => {
  const d = diagnose({ seed: 14, period: 20, oscillationFrom: 200, amplitude: 0.3 });
  assert.deepEqual(kinds(d.flags), ["oscillation"], d.flags.map((f) => f.message).join("; "));
  for (const f of d.flags) {
    assert.ok(Math.abs(f.step - 2000) <= 100, `${f.series} starts at ${f.step}, planted 2000`);
    assert.equal(f.end, 3990);
  }
});

Deno.test("a planted divergence is flagged at its onset (tolerance 10 records = 100 steps)", () => {
  for (const [seed, at] of [[21, 300], [22, 200]]) {
    const d = diagnose({ seed, divergeAt: at });
    const div = d.flags.filter((f) => f.kind === "divergence");
    assert.deepEqual(kinds(d.flags), ["divergence"], d.flags.map((f) => f.message).join("; "));
    for (const f of div) {
      assert.ok(Math.abs(f.step - 10 * at) <= 100, `${f.series} onset ${f.step} vs ${10 * at}`);
      assert.ok(f.evidence.value > f.evidence.threshold);
    }
  }
  // A logged NaN is a divergence at its step.
  const cols = syntheticLog({ seed: 23 });
  cols.g_loss[250] = NaN;
  const f = diagnoseTraining(trainingLog(cols)).flags;
  assert.deepEqual(f.map((x) => [x.kind, x.series, x.step]), [["divergence", "g_loss", 2500]]);
});

Deno.test("a planted collapse is flagged at its step (tolerance 2 records = 20 steps)", () => {
  for (const [seed, at] of [[31, 250], [32, 120]]) {
    const d = diagnose({ seed, collapseAt: at });
    assert.deepEqual(kinds(d.flags), ["collapse"], d.flags.map((f) => f.message).join("; "));
    assert.equal(d.flags.length, 4);
    for (const f of d.flags) assert.ok(Math.abs(f.step - 10 * at) <= 20, `${f.series} ${f.step}`);
  }
});

Deno.test("a winning discriminator and a plateau away from equilibrium", () => {
  const n = 300, step = Array.from({ length: n }, (_, i) => 10 * i);
  const wave = (i: number, a: number) => a * Math.sin(i * 2.39996) * Math.cos(i * 0.7);
  const win = diagnoseTraining(trainingLog({
    step,
    d_loss: step.map((_, i) => 0.02 + 1.3 * Math.exp(-i / 40) + wave(i, 0.005)),
    d_fake: step.map((_, i) => 0.01 + 0.45 * Math.exp(-i / 40) + Math.abs(wave(i, 0.004))),
  }));
  const w = win.flags.filter((f) => f.kind === "discriminator-winning");
  assert.equal(w.length, 1, win.flags.map((f) => f.message).join("; "));
  assert.ok(w[0].evidence.value < w[0].evidence.threshold);
  assert.ok(w[0].step > 0 && w[0].step < 2990);
  // G loss stuck at 1.6 (far from ln 2), D loss converging: one plateau flag on g_loss.
  const flat = diagnoseTraining(trainingLog({
    step,
    g_loss: step.map((_, i) => 1.6 + 1.0 * Math.exp(-i / 20) + wave(i, 0.03)),
    d_loss: step.map((_, i) => 2 * Math.LN2 - 0.5 * Math.exp(-i / 40) + wave(i, 0.03)),
  }));
  assert.deepEqual(flat.flags.map((f) => [f.kind, f.series]), [["plateau", "g_loss"]]);
  assert.ok(Math.abs(flat.flags[0].evidence.value - (1.6 - Math.LN2)) < 0.01);
});

Deno.test(`false-alarm rate over 200 seeded clean logs <= ${TRAINING_FALSE_ALARM_RATE}`, () => {
  let alarms = 0;
  for (let seed = 0; seed < 200; seed++) {
    if (diagnose({ seed: 5000 + seed, noise: 0.03 + 0.0005 * seed }).flags.length) alarms++;
  }
  assert.ok(alarms / 200 <= TRAINING_FALSE_ALARM_RATE, `${alarms} of 200 clean logs flagged`);
});

Deno.test("options are checked; the display lists the flags with their evidence", () => {
  const d = diagnose({ seed: 41, collapseAt: 200 });
  const shown = displayBundle(d)!;
  assert.match(shown["text/html"], /collapse/);
  assert.match(shown["text/plain"], /jump of the median/);
  assert.throws(() => diagnoseTraining(d.log, { window: 4 }), /odd positive integer/);
  assert.throws(() => diagnoseTraining(d.log, { run: "nope" }), /no run named "nope"/);
  assert.throws(() => diagnoseTraining(d.log, { metrics: ["fid"] }), /no metric column "fid"/);
});

Deno.test("several runs are diagnosed apart; flags name their run", () => {
  const a = syntheticLog({ seed: 51, n: 200 }),
    b = syntheticLog({ seed: 52, n: 200, divergeAt: 150 });
  const records = [a, b].flatMap((c, r) =>
    c.step.map((s, i) => ({
      run: r ? "lr-high" : "lr-low",
      step: s,
      d_loss: c.d_loss[i],
      g_loss: c.g_loss[i],
    }))
  );
  const d = diagnoseTraining(trainingLog(records));
  assert.deepEqual([...new Set(d.flags.map((f) => f.run))], ["lr-high"]);
  assert.equal(d.series.length, 4);
  assert.deepEqual(diagnoseTraining(d.log, { run: "lr-low" }).flags, []);
});

Deno.test("a long log is read in block means: the period comes out in steps", () => {
  const d = diagnose({ seed: 61, n: 12000, period: 600 });
  assert.ok(d.notes.some((n) => /means of blocks of 3/.test(n)));
  const osc = d.flags.filter((f) => f.kind === "oscillation");
  assert.equal(osc.length, 4);
  // 12000 records of 10 steps in blocks of 3; the window after the warm-up: 3600 blocks.
  for (const f of osc) assert.ok(Math.abs(108000 / f.period! - 108000 / 6000) <= 1, `${f.period}`);
});
