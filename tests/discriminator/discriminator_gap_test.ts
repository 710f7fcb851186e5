/**
 * The gap V(D*, G) - V(D, G) >= 0 (Goodfellow et al. 2014, Prop. 1) and calibration: ECE as
 * defined by Guo et al. 2017 (weighted mean |accuracy - confidence| over equal-width bins;
 * the equation number is not quoted, from memory), here for the probability of "real", and
 * the Brier score (Brier 1950), checked on hand-computed examples.
 */
import assert from "node:assert/strict";
import { assertClose } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";
import { gaussian, uniformBox } from "../../lib/density/mod.ts";
import {
  classifierDiscriminator,
  discriminatorGap,
  optimalDiscriminator,
} from "../../lib/discriminator/mod.ts";
import { displayBundle } from "../../lib/display/mod.ts";
import { samples } from "../../lib/samples/mod.ts";

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
  // Two bins: [0, 0.5] and (0.5, 1]. Real outputs 0.8, 0.6, 0.2; generated 0.3, 0.7.
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

Deno.test("discriminatorGap: D = D* with saturated logits (disjoint supports) has gap 0, not NaN", () => {
  // Uniform data on [0, 1] and model on [2, 3]: D* is 1 on the data and 0 on the model
  // (Goodfellow et al. 2014, Prop. 1), logits ±Infinity. A D equal to D* has gap 0 by
  // definition; a real point where D and D* both say 0 (2.5, fed on purpose) must not turn
  // the per-point difference (-Infinity) - (-Infinity) into NaN.
  const pD = uniformBox([0], [1]), pG = uniformBox([2], [3]);
  const realX = samples([0.2, 0.7]), fakeX = samples([2.2, 2.7]);
  const g = discriminatorGap({
    dReal: [Infinity, Infinity],
    dFake: [-Infinity, -Infinity],
    scale: "logit",
    real: realX,
    fake: fakeX,
    pData: pD,
    pModel: pG,
    replicates: 20,
  });
  assert.equal(g.gap!.value, 0);
  assert.equal(g.value.value, 0);
  // A "real" point inside the model support: D and D* both give logit -Infinity there.
  const h = discriminatorGap({
    dReal: [Infinity, -Infinity],
    dFake: [-Infinity, -Infinity],
    scale: "logit",
    real: samples([0.2, 2.5]),
    fake: fakeX,
    pData: pD,
    pModel: pG,
    replicates: 20,
  });
  assert.equal(h.gap!.value, 0);
  assert.equal(h.value.value, -Infinity);
});

Deno.test({
  name:
    "discriminatorGap: reliability bins are right-closed ((m-1)/M, m/M], as Guo et al. 2017 and sklearn's calibration_curve",
  ignore: ignoreWithoutPython(["sklearn"]),
  async fn() {
    // Outputs rounded to one decimal sit on the bin edges: an output of exactly 0.5 belongs
    // to (0.4, 0.5], not to [0.5, 0.6). Equal numbers of real and generated points make the
    // equal-prior weights uniform, so the bins are sklearn's unweighted ones.
    const dReal = [0.5, 0.6, 0.7, 0.8, 0.9, 1, 0.5, 0.3, 0.2, 0.9];
    const dFake = [0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.5, 0.6, 0.1, 0.7];
    const g = await binsMatchSklearn(dReal, dFake);
    // The four outputs of 0.5 are in bin 4, (0.4, 0.5]; the 0.4 is in bin 3.
    assert.equal(g.bins[4].count, 4);
    assert.equal(g.bins[3].count, 1);
  },
});

Deno.test({
  name:
    "discriminatorGap: bin edges as numpy's linspace, so 0.1 + 0.2 and 0.1 * 7 fall where sklearn puts them; labels (lo, hi]",
  ignore: ignoreWithoutPython(["sklearn"]),
  async fn() {
    // 0.1 + 0.2 = 0.30000000000000004 = linspace(0, 1, 11)[3]; 0.1 * 7 = 0.7000000000000001
    // = linspace(0, 1, 11)[7]: both sit exactly on an edge and belong to the bin below it.
    const dReal = [0.1 + 0.2, 0.1 * 7, 0.1 * 7, 0.95, 0.55];
    const dFake = [0.1 + 0.2, 0.1 + 0.2, 0.05, 0.1 * 7, 0.45];
    const g = await binsMatchSklearn(dReal, dFake);
    assert.equal(g.bins[2].count, 3, "0.1 + 0.2 in (0.2, 0.3]");
    assert.equal(g.bins[6].count, 3, "0.1 * 7 in (0.6, 0.7]");
    const text = displayBundle(g)!["text/plain"];
    assert.match(text, /\[0\.00, 0\.10\]/);
    assert.match(text, /\(0\.40, 0\.50\]/);
    assert.doesNotMatch(text, /0\.50\)/);
  },
});

/** The gap's 10 reliability bins, after checking them against sklearn's calibration_curve. */
async function binsMatchSklearn(dReal: number[], dFake: number[]) {
  const g = discriminatorGap({ dReal, dFake, scale: "prob", bins: 10, replicates: 20 });
  const ref = await runReference<{ prob_true: number[]; prob_pred: number[] }>(
    "discriminator_calibration.py",
    { y: [...dReal.map(() => 1), ...dFake.map(() => 0)], p: [...dReal, ...dFake], bins: 10 },
  );
  const full = g.bins.filter((b) => b.count > 0);
  assert.equal(full.length, ref.prob_true.length);
  full.forEach((b, i) => {
    assertClose(b.meanD, ref.prob_pred[i], { rel: 1e-12, abs: 1e-15 }, `meanD ${i}`);
    assertClose(b.fractionReal, ref.prob_true[i], { rel: 1e-12, abs: 1e-15 }, `fraction ${i}`);
  });
  return g;
}
