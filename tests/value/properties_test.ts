/**
 * Property tests (fast-check, fixed seed) on random Gaussian pairs and random points, each
 * within the estimate's own error:
 * - D*(x) = p / (p + q) lies in [0, 1] (Goodfellow et al. 2014, Prop. 1), never NaN, even
 *   at far points where both densities underflow;
 * - JSD lies in [0, ln 2] (Lin 1991), its interval too;
 * - KL >= 0 (Gibbs' inequality; Cover & Thomas 2006, Thm. 2.6.3);
 * - V(D*, G) >= -ln 4, and V(D*, G) >= V(D, G) for any D (Goodfellow et al. 2014, Prop. 1
 *   and Thm. 1), the gap paired on the same samples.
 */
import assert from "node:assert/strict";
import fc from "fast-check";
import { gaussian } from "../../lib/density/mod.ts";
import { discriminatorGap, optimalDiscriminator } from "../../lib/discriminator/mod.ts";
import { fDivergence } from "../../lib/divergence/mod.ts";
import { samples } from "../../lib/samples/mod.ts";
import { optimumDecomposition } from "../../lib/value/mod.ts";

const SEED = 20261202;
const LN2 = Math.LN2;

/** A 1-D Gaussian: mean in [-50, 50], standard deviation in [0.05, 20]. */
const normal = fc.record({
  mean: fc.double({ min: -50, max: 50, noNaN: true }),
  sd: fc.double({ min: 0.05, max: 20, noNaN: true }),
});
const density = (g: { mean: number; sd: number }) => gaussian(g.mean, g.sd * g.sd);

Deno.test("property: D* lies in [0, 1] at any point, near or far", () => {
  fc.assert(
    fc.property(
      normal,
      normal,
      fc.array(fc.double({ min: -1e250, max: 1e250, noNaN: true }), {
        minLength: 1,
        maxLength: 20,
      }),
      (a, b, xs) => {
        const d = optimalDiscriminator(density(a), density(b));
        for (const v of d.prob(samples(xs))) assert.ok(v >= 0 && v <= 1, `D* = ${v}`);
      },
    ),
    { seed: SEED, numRuns: 200 },
  );
});

Deno.test("property: JSD in [0, ln 2] and KL >= 0, within their error", () => {
  fc.assert(
    fc.property(normal, normal, (a, b) => {
      const p = density(a), q = density(b);
      const jsd = fDivergence(p, q, "jensen-shannon");
      assert.ok(jsd.value >= -jsd.se! && jsd.value <= LN2 + jsd.se!, `JSD ${jsd.value}`);
      assert.ok(jsd.ci![0] >= 0 && jsd.ci![1] <= LN2, `JSD interval ${jsd.ci}`);
      const kl = fDivergence(p, q, "kl");
      assert.ok(kl.value >= -(kl.se ?? 0), `KL ${kl.value} ± ${kl.se}`);
    }),
    { seed: SEED, numRuns: 25 },
  );
});

Deno.test("property: V(D*, G) >= -ln 4 and V(D*, G) >= V(D, G) for any D, within error", () => {
  fc.assert(
    fc.property(
      normal,
      normal,
      fc.double({ min: -5, max: 5, noNaN: true }),
      fc.double({ min: -5, max: 5, noNaN: true }),
      fc.integer({ min: 1, max: 1e6 }),
      (a, b, slope, intercept, seed) => {
        const p = density(a), q = density(b);
        const dec = optimumDecomposition(p, q);
        assert.ok(dec.value.value >= -Math.log(4) - dec.value.se!, `V(D*, G) ${dec.value.value}`);
        // Any D: a logistic discriminator with a random slope and intercept.
        const real = p.sample(300, seed), fake = q.sample(300, seed + 1);
        const logit = (x: { data: Float64Array }) => x.data.map((v) => slope * v + intercept);
        const g = discriminatorGap({
          dReal: logit(real),
          dFake: logit(fake),
          scale: "logit",
          real,
          fake,
          pData: p,
          pModel: q,
          replicates: 20,
          seed,
        });
        const gap = g.gap!;
        // The paired gap is >= 0 in expectation; 4 se covers the sampling noise.
        assert.ok(gap.value >= -4 * (gap.se ?? 0), `gap ${gap.value} ± ${gap.se}`);
      },
    ),
    { seed: SEED, numRuns: 25 },
  );
});
