/**
 * The gap V(D*, G) - V(D, G) >= 0 (Goodfellow et al. 2014, Prop. 1) and calibration: ECE as
 * defined by Guo et al. 2017 (weighted mean |accuracy - confidence| over equal-width bins;
 * the equation number is not quoted, from memory), here for the probability of "real", and
 * the Brier score (Brier 1950), checked on hand-computed examples.
 */
import assert from "node:assert/strict";
import { assertClose } from "../_assert.ts";
import { gaussian } from "../../lib/density/mod.ts";
import {
  classifierDiscriminator,
  discriminatorGap,
  optimalDiscriminator,
} from "../../lib/discriminator/mod.ts";
import { displayBundle } from "../../lib/estimate/mod.ts";

const pData = gaussian(0, 1), pModel = gaussian(1, 1);
const real = pData.sample(4000, 1), fake = pModel.sample(4000, 2);
const dStar = optimalDiscriminator(pData, pModel);

Deno.test("discriminatorGap: zero gap and zero distance for D = D*", () => {
  const g = discriminatorGap({
    dReal: dStar.logit(real),
    dFake: dStar.logit(fake),
    scale: "logit",
    real,
    fake,
    pData,
    pModel,
  });
  assert.equal(g.gap!.value, 0);
  assert.equal(g.meanAbsDiff!.real.value, 0);
  assert.equal(g.eceVsOptimal!.value, 0);
  assertClose(g.optimalValue!.value, g.value.value, { rel: 0 });
  // D* is calibrated: its label ECE is small, within sampling noise.
  assert.ok(g.ece.value < 0.03, `ECE of D* ${g.ece.value}`);
});

Deno.test("discriminatorGap: a shifted or overconfident D has a positive gap with an interval above 0", () => {
  const l = dStar.logit(real), m = dStar.logit(fake);
  for (
    const [name, f] of [["shifted", (x: number) => x + 1], [
      "overconfident",
      (x: number) => 3 * x,
    ]] as const
  ) {
    const g = discriminatorGap({
      dReal: l.map(f),
      dFake: m.map(f),
      scale: "logit",
      real,
      fake,
      pData,
      pModel,
      seed: 3,
    });
    assert.ok(g.gap!.value > 0.05, `${name}: gap ${g.gap!.value}`);
    assert.ok(g.gap!.ci![0] > 0, `${name}: interval ${g.gap!.ci}`);
    assertClose(g.gap!.value, g.optimalValue!.value - g.value.value, { rel: 1e-10 });
    assert.ok(g.eceVsOptimal!.value > 0.05 && g.meanAbsDiff!.real.value > 0.05, name);
    assert.ok(g.ece.value > 0.05, `${name}: ECE ${g.ece.value}`);
  }
});

Deno.test("discriminatorGap: ECE and Brier by hand (Guo et al. 2017; Brier 1950)", () => {
  // Two bins: [0, 0.5) and [0.5, 1). Real outputs 0.8, 0.6, 0.2; generated 0.3, 0.7.
  // Equal priors: each real point weighs 1/6, each generated 1/4.
  const g = discriminatorGap({ dReal: [0.8, 0.6, 0.2], dFake: [0.3, 0.7], scale: "prob", bins: 2 });
  // Bin 0: real 0.2 (1/6), fake 0.3 (1/4): weight 5/12, conf (0.2/6 + 0.3/4)/(5/12) = 0.26,
  //   real fraction (1/6)/(5/12) = 0.4. Bin 1: real 0.8, 0.6 (1/6 each), fake 0.7 (1/4):
  //   weight 7/12, conf (1.4/6 + 0.7/4)/(7/12) = 0.7, real fraction (2/6)/(7/12) = 4/7.
  const ece = (5 / 12) * Math.abs(0.26 - 0.4) + (7 / 12) * Math.abs(0.7 - 4 / 7);
  assertClose(g.ece.value, ece, { rel: 1e-12 });
  assertClose(g.bins[0].meanD, 0.26, { rel: 1e-12 });
  assertClose(g.bins[1].fractionReal, 4 / 7, { rel: 1e-12 });
  assert.deepEqual(g.bins.map((b) => b.count), [2, 3]);
  const brier = 0.5 * (0.04 + 0.16 + 0.64) / 3 + 0.5 * (0.09 + 0.49) / 2;
  assertClose(g.brier.value, brier, { rel: 1e-12 });
  assert.equal(g.gap, undefined);
  assert.match(g.notes.join(" "), /no densities or reference/);
});

Deno.test("discriminatorGap: against a classifier reference; swapped densities flag a negative gap", () => {
  const ref = classifierDiscriminator(real, fake, { seed: 1 });
  const g = discriminatorGap({
    dReal: new Float64Array(real.n).fill(0.5),
    dFake: new Float64Array(fake.n).fill(0.5),
    scale: "prob",
    real,
    fake,
    reference: ref,
  });
  assert.ok(g.gap!.ci![0] > 0);
  // D = D* of the right densities judged against the swapped pair: significantly negative.
  const h = discriminatorGap({
    dReal: dStar.logit(real),
    dFake: dStar.logit(fake),
    scale: "logit",
    real,
    fake,
    pData: pModel,
    pModel: pData,
  });
  assert.ok(h.gap!.value < 0);
  assert.match(h.notes.join(" "), /significantly negative/);
  assert.match(displayBundle(h)!["text/html"], /Reliability bins/);
});

Deno.test("discriminatorGap: bad input", () => {
  assert.throws(
    () => discriminatorGap({ dReal: [0.5], dFake: [2], scale: "prob" }),
    /outside \[0, 1\]/,
  );
  assert.throws(() => discriminatorGap({ dReal: [NaN], dFake: [0], scale: "logit" }), /NaN/);
  assert.throws(() => discriminatorGap({ dReal: [], dFake: [0], scale: "logit" }), /empty/);
  assert.throws(
    () => discriminatorGap({ dReal: [0], dFake: [0], scale: "logit", pData, pModel }),
    /needs the points/,
  );
  assert.throws(
    () => discriminatorGap({ dReal: [0], dFake: [0], scale: "logit", pData, real, fake }),
    /both pData and pModel/,
  );
  assert.throws(
    () => discriminatorGap({ dReal: [0], dFake: [0], scale: "logit", pData, pModel, real, fake }),
    /4000 points but 1 outputs/,
  );
});
