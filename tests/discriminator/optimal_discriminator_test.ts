/**
 * The optimal discriminator D* = p_data / (p_data + p_g) (Goodfellow et al. 2014, Prop. 1)
 * and the pointwise objective a ln y + b ln(1 - y).
 */
import assert from "node:assert/strict";
import fc from "fast-check";
import { assertClose } from "../_assert.ts";
import { gaussian, uniformBox } from "../../lib/density/mod.ts";
import {
  optimalDiscriminator,
  pointwiseMaximiser,
  pointwiseObjective,
} from "../../lib/discriminator/mod.ts";
import { SaddleError } from "../../lib/errors/mod.ts";
import { samples } from "../../lib/samples/mod.ts";

Deno.test("D* = 1/2 exactly everywhere when p_g = p_data (Goodfellow et al. 2014, Thm. 1)", () => {
  const g = gaussian([0, 1], [1, 0.3, 0.3, 2]);
  const x = g.sample(500, 1);
  const dStar = optimalDiscriminator(g, g);
  assert.ok(dStar.prob(x).every((v) => v === 0.5));
  assert.ok(dStar.logit(x).every((v) => v === 0));
});

Deno.test("D* logit is the log-density ratio: 1-D Gaussians, including far tails", () => {
  // ln N(x; 0, 1) - ln N(x; 1, 1) = 1/2 - x (by hand).
  const dStar = optimalDiscriminator(gaussian(0, 1), gaussian(1, 1));
  const xs = [-3, 0, 0.5, 2, 60, -60];
  const ev = dStar.evaluate(samples(xs));
  xs.forEach((x, i) => {
    assertClose(ev.logit[i], 0.5 - x, { rel: 1e-12, abs: 1e-12 });
    assertClose(ev.prob[i], 1 / (1 + Math.exp(x - 0.5)), { rel: 1e-12 });
  });
  // At x = 60 both densities underflow to 0 but D* is a positive number, not 0/0.
  assert.ok(ev.prob[4] > 0 && ev.prob[4] < 1e-25);
  assert.equal(ev.undefinedCount, 0);
});

Deno.test("D* on disjoint supports: 1 on the data side, 0 on the model side, 1/2 outside both", () => {
  const dStar = optimalDiscriminator(uniformBox(0, 1), uniformBox(2, 3));
  const ev = dStar.evaluate(samples([0.5, 2.5, 1.5, -4]));
  assert.deepEqual(Array.from(ev.prob), [1, 0, 0.5, 0.5]);
  assert.deepEqual(Array.from(ev.logit), [Infinity, -Infinity, 0, 0]);
  assert.equal(ev.undefinedCount, 2);
  assert.match(ev.notes[0], /2 of 4 points lie outside both supports/);
});

Deno.test("optimalDiscriminator: dimensions must agree", () => {
  assert.throws(
    () => optimalDiscriminator(gaussian(0, 1), gaussian([0, 0], [1, 0, 0, 1])),
    SaddleError,
  );
  const d = optimalDiscriminator(gaussian(0, 1), gaussian(1, 1));
  assert.throws(() => d.prob(samples([[1, 2]])), /d = 2/);
});

/** Maximiser of a concave function on [lo, hi] by golden-section search. */
function goldenArgmax(g: (x: number) => number, lo: number, hi: number): number {
  const phi = (Math.sqrt(5) - 1) / 2;
  let a = lo, b = hi;
  for (let i = 0; i < 200; i++) {
    const c = b - phi * (b - a), d = a + phi * (b - a);
    if (g(c) > g(d)) b = d;
    else a = c;
  }
  return 0.5 * (a + b);
}

Deno.test("pointwise objective: the maximiser of a ln y + b ln(1 - y) is a/(a+b) (Goodfellow et al. 2014, Prop. 1)", () => {
  fc.assert(
    fc.property(
      fc.double({ min: 1e-3, max: 1e3, noNaN: true }),
      fc.double({ min: 1e-3, max: 1e3, noNaN: true }),
      (a, b) => {
        const numeric = goldenArgmax((y) => pointwiseObjective(a, b, y), 1e-12, 1 - 1e-12);
        assertClose(numeric, pointwiseMaximiser(a, b), { abs: 1e-7 });
      },
    ),
    { seed: 2014, numRuns: 300 },
  );
});

Deno.test("pointwise objective: edge values and bad input", () => {
  assert.equal(pointwiseObjective(2, 0, 1), 0);
  assert.equal(pointwiseObjective(2, 1, 0), -Infinity);
  assert.deepEqual(Array.from(pointwiseObjective(1, 1, [0.5, 0.5])), [
    -2 * Math.LN2,
    -2 * Math.LN2,
  ]);
  assert.equal(pointwiseMaximiser(0, 5), 0);
  assert.throws(() => pointwiseObjective(1, 1, 1.5), /\[0, 1\]/);
  assert.throws(() => pointwiseObjective(-1, 1, 0.5), /a must be/);
  assert.throws(() => pointwiseMaximiser(0, 0), /both 0/);
  assert.throws(() => pointwiseObjective(1, 1, [0.2, NaN]), /row 1/);
});
