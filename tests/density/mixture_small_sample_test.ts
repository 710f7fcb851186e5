/**
 * Gaussian mixtures on small samples (issue 9): counts the data cannot support are not
 * tried (a k-component model with as many free parameters as points has an unbounded
 * likelihood: Day 1969; McLachlan & Peel 2000, sec. 3.8), collapsed components are flagged
 * and never reported as converged, and one Gaussian's points select one component by BIC
 * (Schwarz 1978).
 */
import assert from "node:assert/strict";
import { fitGaussianMixture, gaussian, selectGaussianMixture } from "../../lib/density/mod.ts";
import { displayBundle } from "../../lib/display/mod.ts";
import { samples } from "../../lib/samples/mod.ts";

Deno.test("selectGaussianMixture: 12, 20 and 40 points of one 2-D Gaussian select 1", () => {
  for (const n of [12, 20, 40]) {
    const x = gaussian([0, 0], [1, 0, 0, 1]).sample(n, n);
    const sel = selectGaussianMixture(x, { seed: 1 });
    assert.equal(sel.components, 1, `${n} points: ${displayBundle(sel)!["text/plain"]}`);
    assert.ok(sel.best.converged);
    assert.deepEqual(sel.best.degenerate, []);
  }
  const sel = selectGaussianMixture(gaussian([0, 0], [1, 0, 0, 1]).sample(12, 12), { seed: 1 });
  // 2-D full: 6k - 1 parameters; 12 points allow k <= 2.
  assert.equal(sel.table.length, 2);
  assert.ok(sel.notes.some((m) => /support at most 2 components/.test(m)), sel.notes.join("\n"));
});

Deno.test("fitGaussianMixture: a component collapsed onto repeated points is flagged, not converged", () => {
  // 25 spread points plus 6 copies of one point: a component sits on the copies with a
  // covariance at the regularization floor.
  const spread = gaussian([0, 0], [4, 0, 0, 4]).sample(25, 3);
  const rows = [
    ...Array.from({ length: 25 }, (_, i) => [spread.data[2 * i], spread.data[2 * i + 1]]),
  ];
  for (let k = 0; k < 6; k++) rows.push([10, 10]);
  const fit = fitGaussianMixture(samples(rows), { components: 2, seed: 2 });
  assert.equal(fit.degenerate.length, 1);
  assert.equal(fit.converged, false);
  assert.ok(fit.describe().notes.some((m) => /collapsed/.test(m)));
});
