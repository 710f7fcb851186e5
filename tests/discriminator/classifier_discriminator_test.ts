/**
 * The classifier estimate of D*: logistic regression against scikit-learn, the density-ratio
 * trick against the true log-ratio, cross-fitted log-loss against the Bayes value
 * ln 2 - JSD (the log-loss of D* itself: -V(D*, G)/2, Goodfellow et al. 2014, Thm. 1).
 */
import assert from "node:assert/strict";
import { assertClose } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";
import { gaussian, gaussianMixture, uniformBox } from "../../lib/density/mod.ts";
import {
  classifierDiscriminator,
  discriminatorGap,
  optimalDiscriminator,
} from "../../lib/discriminator/mod.ts";
import { displayBundle } from "../../lib/display/mod.ts";
import { logSigmoid } from "../../lib/math/mod.ts";
import { SaddleError } from "../../lib/errors/mod.ts";
import { samples } from "../../lib/samples/mod.ts";
import { optimumDecomposition, valueFunction } from "../../lib/value/mod.ts";

const rowsOf = (s: { n: number; d: number; data: Float64Array }) =>
  Array.from({ length: s.n }, (_, i) => Array.from(s.data.subarray(i * s.d, (i + 1) * s.d)));

Deno.test({
  name: "classifierDiscriminator: the linear fit equals scikit-learn's LogisticRegression",
  ignore: ignoreWithoutPython(["sklearn"]),
  async fn() {
    const pReal = gaussian([0, 0], [1, 0.3, 0.3, 1]),
      pFake = gaussian([0.8, -0.4], [1.2, 0, 0, 0.7]);
    const real = pReal.sample(400, 1), fake = pFake.sample(250, 2);
    const query = gaussian([0.4, 0], [2, 0, 0, 2]).sample(20, 3);
    const l2 = 0.01;
    const c = classifierDiscriminator(real, fake, { features: "linear", l2, seed: 4 });
    const ref = await runReference<{ logit: number[] }>("game_logistic.py", {
      real: rowsOf(real),
      fake: rowsOf(fake),
      l2,
      query: rowsOf(query),
    });
    const ours = c.logit(query);
    ref.logit.forEach((v, i) => assertClose(ours[i], v, { abs: 1e-8, rel: 1e-8 }, `query ${i}`));
    assert.equal(c.converged, true);
  },
});

Deno.test("classifierDiscriminator: recovers the log density ratio; log-loss near the Bayes value", () => {
  // Equal variances: ln p/q = 2x for N(1, 1) vs N(-1, 1) (by hand).
  const p = gaussian(1, 1), q = gaussian(-1, 1);
  const c = classifierDiscriminator(p.sample(3000, 1), q.sample(3000, 2), {
    seed: 5,
    features: "linear",
  });
  const l = c.logit(samples([-1, 0, 1]));
  assertClose(l[0], -2, { abs: 0.15 });
  assertClose(l[1], 0, { abs: 0.1 });
  assertClose(l[2], 2, { abs: 0.15 });
  const jsd = optimumDecomposition(p, q).jsd.value;
  const bayes = Math.LN2 - jsd;
  const ll = c.heldOutLogLoss;
  // Out of sample the loss cannot beat the Bayes value beyond noise, and a well-specified
  // model gets close to it.
  assert.ok(ll.value > bayes - 4 * ll.se!, `log-loss ${ll.value} below Bayes ${bayes}`);
  assert.ok(ll.value < bayes + 0.01, `log-loss ${ll.value} vs Bayes ${bayes}`);
  // The cross-fitted logits give V(D, G) = -2 x log-loss.
  const v = valueFunction({
    dReal: c.crossFitted.logitReal,
    dFake: c.crossFitted.logitFake,
    scale: "logit",
  });
  assertClose(v.value, -2 * ll.value, { rel: 1e-12 });
});

Deno.test("classifierDiscriminator: a variance difference needs quadratic or RBF features", () => {
  // ln N(x; 0, 1) - ln N(x; 0, 4) = ln 2 - 3x²/8: no linear classifier sees it.
  const p = gaussian(0, 1), q = gaussian(0, 4);
  const real = p.sample(2000, 1), fake = q.sample(2000, 2);
  const bayes = Math.LN2 - optimumDecomposition(p, q).jsd.value;
  const lin = classifierDiscriminator(real, fake, { seed: 1, features: "linear" });
  const quad = classifierDiscriminator(real, fake, { seed: 1, features: "quadratic" });
  const rff = classifierDiscriminator(real, fake, { seed: 1, features: "rff", randomFeatures: 32 });
  assert.ok(lin.heldOutLogLoss.value > Math.LN2 - 0.01, `linear ${lin.heldOutLogLoss.value}`);
  assert.ok(
    quad.heldOutLogLoss.value < bayes + 0.01,
    `quadratic ${quad.heldOutLogLoss.value} vs ${bayes}`,
  );
  assert.ok(rff.heldOutLogLoss.value < bayes + 0.02, `rff ${rff.heldOutLogLoss.value} vs ${bayes}`);
  const l = quad.logit(samples([0, 2]));
  assertClose(l[0], Math.LN2, { abs: 0.12 });
  assertClose(l[1], Math.LN2 - 1.5, { abs: 0.25 });
  assert.equal(quad.featureDimension, 2);
  // Reproducible bit for bit from the seed.
  const again = classifierDiscriminator(real, fake, {
    seed: 1,
    features: "rff",
    randomFeatures: 32,
  });
  assert.deepEqual(again.crossFitted.logitReal, rff.crossFitted.logitReal);
});

Deno.test("classifierDiscriminator: disjoint supports stay finite thanks to the ridge", () => {
  const c = classifierDiscriminator(
    uniformBox(0, 1).sample(200, 1),
    uniformBox(2, 3).sample(200, 2),
    {
      seed: 3,
    },
  );
  const l = c.logit(samples([0.5, 2.5]));
  assert.ok(Number.isFinite(l[0]) && l[0] > 3 && Number.isFinite(l[1]) && l[1] < -3);
  assert.ok(c.heldOutLogLoss.value < 0.05);
});

Deno.test("classifierDiscriminator: bad input", () => {
  const a = samples([1, 2, 3, 4, 5, 6]), b = samples([[1, 2], [3, 4], [5, 6], [7, 8], [9, 0]]);
  assert.throws(() => classifierDiscriminator(a, b), /real has d = 1 but fake has d = 2/);
  assert.throws(() => classifierDiscriminator(a, samples([1, 2])), /fewer than the 5 folds/);
  assert.throws(() => classifierDiscriminator(a, a, { folds: 1 }), SaddleError);
  assert.throws(() => classifierDiscriminator(a, a, { l2: -1 }), /l2 must be/);
  assert.throws(
    () => classifierDiscriminator(a, a, { features: "cubic" as "linear" }),
    /features must be/,
  );
});

Deno.test("classifierDiscriminator: `regularization` is the project's name for the ridge (`l2` kept)", () => {
  // DEVELOPERS.md: estimators share the parameter names seed, level, k, bandwidth, base,
  // regularization. The same penalty under either name gives the same bits.
  const r = gaussian(0, 1).sample(60, 1), f = gaussian(1, 1).sample(60, 2);
  const x = samples([-1, 0, 2]);
  const a = classifierDiscriminator(r, f, { regularization: 0.05, seed: 3 }).logit(x);
  const b = classifierDiscriminator(r, f, { l2: 0.05, seed: 3 }).logit(x);
  assert.deepEqual(Array.from(a), Array.from(b));
  assert.throws(
    () => classifierDiscriminator(r, f, { regularization: -1 }),
    /regularization must be >= 0/,
  );
  assert.throws(
    () => classifierDiscriminator(r, f, { regularization: 0.1, l2: 0.2 }),
    /regularization and l2/,
  );
});

Deno.test("classifierDiscriminator: tuned on a 2-D mode drop, held-out log-loss within 0.01 of D*'s", () => {
  // Four modes on a ring; the generator drops the fourth and re-weights the rest. D* is known
  // from the densities (Goodfellow et al. 2014, Prop. 1), so the optimal held-out log-loss is
  // its log-loss on the same points; every point's cross-fitted logit is out of sample.
  const c = [0.25, 0, 0, 0.25];
  const pData = gaussianMixture({
    weights: [0.25, 0.25, 0.25, 0.25],
    means: [[2, 0], [-2, 0], [0, 2], [0, -2]],
    covariances: [c, c, c, c],
  });
  const pModel = gaussianMixture({
    weights: [0.4, 0.3, 0.3],
    means: [[2, 0], [-2, 0], [0, 2]],
    covariances: [c, c, c],
  });
  const real = pData.sample(2000, 1), fake = pModel.sample(2000, 2);
  const dStar = optimalDiscriminator(pData, pModel);
  const lr = dStar.logit(real), lf = dStar.logit(fake);
  const mean = (a: Float64Array) => a.reduce((x, y) => x + y, 0) / a.length;
  const optimum = -0.5 * mean(lr.map(logSigmoid)) - 0.5 * mean(lf.map((l) => logSigmoid(-l)));
  const tuned = classifierDiscriminator(real, fake, { seed: 3 });
  const ll = tuned.heldOutLogLoss.value;
  assert.ok(ll < optimum + 0.01, `tuned ${ll} vs optimum ${optimum}`);
  // The fixed linear family cannot see the dropped mode (a non-linear ratio).
  const linear = classifierDiscriminator(real, fake, { seed: 3, features: "linear", tune: false });
  assert.ok(linear.heldOutLogLoss.value > optimum + 0.04, `linear ${linear.heldOutLogLoss.value}`);
  // The chosen values are reported, and are the best candidate of the tuning table.
  const t = tuned.tuning!;
  assert.equal(tuned.features, "rff");
  assert.equal(tuned.bandwidth, t.best.bandwidth);
  assert.equal(tuned.randomFeatures, t.best.randomFeatures);
  assert.equal(Math.min(...t.candidates.map((x) => x.logLoss)), t.best.logLoss);
  assert.ok(new Set(t.candidates.map((x) => x.randomFeatures)).size >= 3);
  assert.match(displayBundle(tuned)!["text/plain"], /bandwidth[\s\S]*regularization/);
  // ln 2 - log-loss <= JSD at equal priors (Goodfellow et al. 2014, Thm. 1): the bound sits
  // below the true JSD up to sampling noise, its interval is the log-loss's, mirrored.
  const jsd = optimumDecomposition(pData, pModel).jsd.value;
  const b = tuned.jsdLowerBound;
  assertClose(b.value, Math.LN2 - ll, { rel: 1e-12 });
  assertClose(b.ci![0], Math.LN2 - tuned.heldOutLogLoss.ci![1], { rel: 1e-12 });
  assert.ok(b.ci![0] < jsd && b.value > jsd - 0.02, `bound ${b.value} vs JSD ${jsd}`);
  // A slightly over-smoothed D* (logits x 0.8) is worse than D* by a small positive gap;
  // judged against the tuned reference the gap is no longer negative.
  const dReal = lr.map((v) => 0.8 * v), dFake = lf.map((v) => 0.8 * v);
  const g = discriminatorGap({ dReal, dFake, scale: "logit", real, fake, reference: tuned });
  assert.ok(g.gap!.value > 0, `gap ${g.gap!.value}`);
});
