/**
 * V(D, G) = E_data[ln D] + E_g[ln(1 - D)] (Goodfellow et al. 2014, eq. 1) and the generator
 * objectives.
 */
import assert from "node:assert/strict";
import { assertClose } from "../_assert.ts";
import { gaussian, uniformBox } from "../../lib/density/mod.ts";
import { optimalDiscriminator } from "../../lib/discriminator/mod.ts";
import { SaddleError } from "../../lib/errors/mod.ts";
import { samples } from "../../lib/samples/mod.ts";
import { Rng } from "../../lib/random/mod.ts";
import { generatorObjectives, valueFunction } from "../../lib/value/mod.ts";
import { OUTPUT_EPSILON } from "../../lib/discriminator/mod.ts";

Deno.test("valueFunction: -ln 4 exactly at D = 1/2 (Goodfellow et al. 2014, Thm. 1)", () => {
  const v = valueFunction({
    dReal: new Float64Array(50),
    dFake: new Float64Array(70),
    scale: "logit",
  });
  assert.equal(v.value, -Math.log(4));
  assert.equal(v.se, 0);
  const g = gaussian(0, 1);
  const w = valueFunction({
    real: g.sample(100, 1),
    fake: g.sample(80, 2),
    discriminator: optimalDiscriminator(g, g),
  });
  assert.equal(w.value, -Math.log(4));
});

Deno.test("valueFunction: mean and two-sample se by hand; probabilities and logits agree", () => {
  const pr = [0.9, 0.6, 0.75, 0.3], pf = [0.2, 0.5, 0.1];
  const tr = pr.map(Math.log), tf = pf.map((p) => Math.log(1 - p));
  const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
  const svar = (a: number[]) => {
    const m = mean(a);
    return a.reduce((s, v) => s + (v - m) ** 2, 0) / (a.length - 1);
  };
  const v = valueFunction({ dReal: pr, dFake: pf, scale: "prob", seed: 4 });
  assertClose(v.value, mean(tr) + mean(tf), { rel: 1e-14 });
  assertClose(v.se!, Math.sqrt(svar(tr) / 4 + svar(tf) / 3), { rel: 1e-12 });
  assert.ok(v.ci![0] <= v.value && v.value <= v.ci![1]);
  assert.equal(v.unit, "nats");
  const logit = (p: number) => Math.log(p / (1 - p));
  const w = valueFunction({ dReal: pr.map(logit), dFake: pf.map(logit), scale: "logit", seed: 4 });
  assertClose(w.value, v.value, { rel: 1e-13 });
  // Same seed, same interval, bit for bit.
  assert.deepEqual(valueFunction({ dReal: pr, dFake: pf, scale: "prob", seed: 4 }).ci, v.ci);
});

Deno.test("valueFunction: saturated outputs — probabilities clipped and counted, logits kept", () => {
  const v = valueFunction({ dReal: [1, 0.9, 0], dFake: [0, 1], scale: "prob" });
  assert.match(v.notes[0], /2 real and 2 generated outputs were exactly 0 or 1/);
  const eps = OUTPUT_EPSILON;
  const expected = (Math.log(1 - eps) + Math.log(0.9) + Math.log(eps)) / 3 +
    (Math.log(1 - eps) + Math.log(eps)) / 2;
  assertClose(v.value, expected, { rel: 1e-9 });
  // A logit of -800 has ln D = -800, where the probability would have rounded to 0.
  const w = valueFunction({ dReal: [-800], dFake: [-800], scale: "logit" });
  assertClose(w.value, -800, { rel: 1e-15 });
  const inf = valueFunction({ dReal: [0, 0], dFake: [Infinity, 0], scale: "logit" });
  assert.equal(inf.value, -Infinity);
  assert.match(inf.notes.join(" "), /infinite/);
});

Deno.test("valueFunction: bad input names what is wrong", () => {
  assert.throws(
    () => valueFunction({ dReal: [0.5, 1.2], dFake: [0.5], scale: "prob" }),
    /row 1, parameter "dReal": dReal is 1\.2, outside \[0, 1\]/,
  );
  assert.throws(
    () => valueFunction({ dReal: [0.5], dFake: [-0.1], scale: "prob" }),
    /outside \[0, 1\]/,
  );
  assert.throws(
    () => valueFunction({ dReal: [0, NaN], dFake: [0], scale: "logit" }),
    (e: unknown) => e instanceof SaddleError && e.code === "non-finite" && /row 1/.test(e.message),
  );
  assert.throws(() => valueFunction({ dReal: [], dFake: [0.5], scale: "prob" }), /dReal is empty/);
  const g = gaussian(0, 1);
  assert.throws(
    () =>
      valueFunction({
        real: samples([1, 2]),
        fake: samples([[1, 2]]),
        discriminator: optimalDiscriminator(g, g),
      }),
    /real has d = 1 but fake has d = 2/,
  );
  assert.throws(() => valueFunction({ dReal: [0], dFake: [0], scale: "odds" as "prob" }), /scale/);
  assert.throws(
    () => valueFunction({ real: samples([1, 2]), fake: samples([1]), discriminator: () => [0.5] }),
    /returned 1 outputs for 2 real points/,
  );
});

Deno.test("generatorObjectives: values, gradients vs finite differences, saturation (Goodfellow et al. 2014, sec. 3)", () => {
  const logits = [-9, -2, 0, 1.5, 6];
  const g = generatorObjectives(logits, { scale: "logit" });
  // -ln sigmoid(l) = ln(1 + e^-l) and ln(1 - sigmoid(l)) = -ln(1 + e^l).
  const ns = (l: number) => Math.log1p(Math.exp(-l));
  const mm = (l: number) => -Math.log1p(Math.exp(l));
  assertClose(g.nonSaturating.value, logits.map(ns).reduce((a, b) => a + b) / 5, { rel: 1e-12 });
  assertClose(g.minimax.value, logits.map(mm).reduce((a, b) => a + b) / 5, { rel: 1e-12 });
  logits.forEach((l, i) => {
    const h = 1e-6;
    assertClose(g.gradNonSaturating[i], (ns(l + h) - ns(l - h)) / (2 * h), { abs: 1e-8 });
    assertClose(g.gradMinimax[i], (mm(l + h) - mm(l - h)) / (2 * h), { abs: 1e-8 });
  });
  // A discriminator that rejects generated points with logit -9: the minimax gradient is
  // sigmoid(-9) = 1.2e-4 while the non-saturating one is about -1.
  assertClose(g.gradMinimax[0], -1 / (1 + Math.exp(9)), { rel: 1e-12 });
  assert.ok(g.gradNonSaturating[0] < -0.9998);
  const p = generatorObjectives([0.5, 1], { scale: "prob" });
  assert.equal(p.notes.length, 1);
});

Deno.test("valueFunction: points outside both supports under D* are counted in the notes", () => {
  const dStar = optimalDiscriminator(uniformBox(0, 1), uniformBox(0, 2));
  const v = valueFunction({ real: samples([0.5, 5]), fake: samples([1.5]), discriminator: dStar });
  assert.match(v.notes.join(" "), /real: 1 of 2 points lie outside both supports/);
  // ln D*(0.5) = ln(1 / (1 + 1/2)), ln D*(5) = ln ½ (set to 1/2), ln(1 - D*(1.5)) = 0.
  assertClose(v.value, (Math.log(2 / 3) + Math.log(0.5)) / 2, { rel: 1e-14 });
});

Deno.test("generatorObjectives: a logit of ±Infinity (kept, not clipped) gives an infinite loss, not NaN", () => {
  // Goodfellow et al. 2014, eq. 1 and sec. 3: with D(G(z)) = 1 (logit +Infinity) the minimax
  // term ln(1 - D) is -Infinity; with D(G(z)) = 0 (logit -Infinity) the non-saturating loss
  // -ln D is +Infinity. The mean of terms containing one infinity is that infinity.
  const up = generatorObjectives([Infinity, 0, 1], { scale: "logit" });
  assert.equal(up.minimax.value, -Infinity);
  assert.ok(Number.isFinite(up.nonSaturating.value));
  const down = generatorObjectives([-Infinity, 0, 1], { scale: "logit" });
  assert.equal(down.nonSaturating.value, Infinity);
  assert.ok(Number.isFinite(down.minimax.value));
});

Deno.test("valueFunction: bootstrap replicates stay attached and agree with the analytic se", () => {
  // Common practice, no source: the bootstrap sd of a two-sample mean sum approaches
  // sqrt(s_r²/n_r + s_f²/n_f).
  const r = new Rng(4);
  const dReal = Array.from({ length: 400 }, () => 1 / (1 + Math.exp(-r.normal(0.5, 1))));
  const dFake = Array.from({ length: 300 }, () => 1 / (1 + Math.exp(-r.normal(-0.5, 1))));
  const v = valueFunction({ dReal, dFake, scale: "prob", seed: 3, replicates: 800 });
  const reps = (v as typeof v & { replicates: Float64Array }).replicates;
  assert.equal(reps.length, 800);
  const mean = reps.reduce((a, b) => a + b, 0) / reps.length;
  const sd = Math.sqrt(reps.reduce((a, b) => a + (b - mean) ** 2, 0) / (reps.length - 1));
  assertClose(sd, v.se!, { rel: 0.15 });
  assert.equal("replicates" in JSON.parse(JSON.stringify(v)), false);
});
