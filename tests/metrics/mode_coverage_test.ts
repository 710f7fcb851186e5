/**
 * Mode coverage: the chi-square test against scipy.stats.chisquare, modes hit on a
 * collapsed and a covering generator of the ring of 8 Gaussians, Mahalanobis distances with
 * full covariances, and bad input.
 */
import assert from "node:assert/strict";
import { modeCoverage, ringOfGaussians, SaddleError } from "../../mod.ts";
import { assertClose } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";

Deno.test({
  name: "modeCoverage: chi-square statistic and p-value equal scipy.stats.chisquare",
  ignore: ignoreWithoutPython(["scipy"]),
  fn: async () => {
    const ring = ringOfGaussians();
    // Unequal weights, so the expected counts differ per mode.
    const weights = [1, 2, 1, 2, 1, 2, 1, 2];
    const modes = { means: ring.modes!.means, sd: ring.modes!.sd, weights };
    const fake = ringOfGaussians({ weights: [1, 2, 1, 2, 2, 2, 1, 1] }).sample(800, 3);
    const c = modeCoverage(fake, modes, { replicates: 50 });
    const ref = await runReference<{ statistic: number; pvalue: number }>("metrics_chisquare.py", {
      observed: c.perMode.map((m) => m.count),
      expected: c.perMode.map((m) => m.expected),
    });
    assertClose(c.chiSquare.value, ref.statistic, { rel: 1e-12 });
    assertClose(c.pValue, ref.pvalue, { rel: 1e-9, abs: 1e-15 });
    assert.ok(c.pValue < 0.01);
    assert.equal(c.modesHit.value, 8);
  },
});

Deno.test("modeCoverage: a generator on the ring's data distribution covers all 8 modes with ~all samples within 3 sd; a collapsed one hits 2 (Srivastava et al. 2017, from memory)", () => {
  const ring = ringOfGaussians();
  const good = modeCoverage(ring.sample(2000, 1), ring.modes!, { replicates: 100, seed: 2 });
  assert.equal(good.modesHit.value, 8);
  // P(chi² with 2 df <= 9) = 1 − e^{−4.5} = 0.98889 of a 2-D Gaussian lies within 3 sd.
  const p3 = 1 - Math.exp(-4.5);
  assert.ok(Math.abs(good.shareWithin.value - p3) < 3 * Math.sqrt(p3 * (1 - p3) / 2000));
  assert.ok(
    good.shareWithin.ci![0] <= good.shareWithin.value &&
      good.shareWithin.value <= good.shareWithin.ci![1],
  );
  assert.ok(good.pValue > 0.001);
  const collapsed = ringOfGaussians({ weights: [1, 0, 0, 0, 1, 0, 0, 0] }).sample(500, 4);
  const bad = modeCoverage(collapsed, ring.modes!, { replicates: 100 });
  assert.equal(bad.modesHit.value, 2);
  assert.deepEqual(bad.perMode.map((m) => m.hit), [
    true,
    false,
    false,
    false,
    true,
    false,
    false,
    false,
  ]);
  assert.ok(bad.pValue < 1e-12);
});

Deno.test("modeCoverage: Mahalanobis distance with full covariances", () => {
  // A point 2.9 sd out along a stretched axis is near; the same Euclidean distance across it is not.
  const modes = { means: [[0, 0]], covariances: [[[4, 0], [0, 0.25]]] };
  const c = modeCoverage([[5.8, 0], [0, 1.45], [0, 1.6]], modes, { replicates: 20 });
  assert.equal(c.perMode[0].count, 2);
  assertClose(c.shareWithin.value, 2 / 3);
});

Deno.test("modeCoverage: bad input names the parameter", () => {
  const is = (re: RegExp) => (e: unknown) => e instanceof SaddleError && re.test(e.message);
  assert.throws(() => modeCoverage([[0, 0]], { means: [] }), is(/at least one mode/));
  assert.throws(
    () => modeCoverage([[0, 0]], { means: [[0, 0, 0]], sd: 1 }),
    is(/means\[0\] has 3 entries/),
  );
  assert.throws(() => modeCoverage([[0, 0]], { means: [[0, 0]] }), is(/sd > 0/));
  assert.throws(() => modeCoverage([[0, NaN]], { means: [[0, 0]], sd: 1 }), is(/row 0, column 1/));
  assert.throws(
    () => modeCoverage([[0, 0]], { means: [[0, 0]], sd: 1, weights: [-1] }),
    is(/weights/),
  );
});
