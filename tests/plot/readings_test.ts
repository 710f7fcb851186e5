/**
 * Readings that must not mislead (issue 9): unitless divergences are not labelled in nats,
 * and a comparison against a reference discriminator whose gap is significantly negative
 * warns in the HTML table and never calls the reference D*. The gap V(D*, G) - V(D, G) is
 * non-negative in expectation (Goodfellow et al. 2014, Prop. 1), so a significantly
 * negative one means the reference is not D*.
 */
import assert from "node:assert/strict";
import { gaussian } from "../../lib/density/mod.ts";
import { type Discriminator, discriminatorGap } from "../../lib/discriminator/mod.ts";
import { fDivergence } from "../../lib/divergence/mod.ts";
import { displayBundle } from "../../lib/display/mod.ts";
import { plotDivergences } from "../../lib/plot/mod.ts";

const p = gaussian(0, 1), q = gaussian(1, 1);

Deno.test("plotDivergences: TV and squared Hellinger are not labelled in nats", () => {
  const tv = fDivergence(p, q, "total-variation"), h2 = fDivergence(p, q, "squared-hellinger");
  const kl = fDivergence(p, q, "kl");
  const unitless = plotDivergences({ TV: tv, "squared Hellinger": h2 }).toSVG();
  assert.doesNotMatch(unitless, /nats/);
  const mixed = plotDivergences({ KL: kl, TV: tv, "squared Hellinger": h2 }).toSVG();
  // Only the KL value carries "nats"; the axis does not claim one unit for all.
  assert.equal(mixed.match(/nats/g)?.length, 1, mixed.match(/[^<>]*nats[^<>]*/g)?.join(" | "));
  assert.match(mixed, /units on each value/);
  assert.match(plotDivergences({ KL: kl }).toSVG(), /divergence \(nats\)/);
});

Deno.test("discriminatorGap: a negative gap against a reference warns in HTML; rows say D_ref", () => {
  const real = p.sample(400, 1), fake = q.sample(400, 2);
  // The trained D is D* itself; the "reference" is D* reversed, so the gap is very negative.
  const logit = (x: { data: Float64Array }) => x.data.map((v) => 0.5 - v);
  const reversed: Discriminator = {
    d: 1,
    logit: (x) => x.data.map((v) => v - 0.5),
    prob: (x) => x.data.map((v) => 1 / (1 + Math.exp(0.5 - v))),
  };
  const outputs = {
    dReal: logit(real),
    dFake: logit(fake),
    scale: "logit" as const,
    real,
    fake,
    replicates: 50,
  };
  const g = discriminatorGap({ ...outputs, reference: reversed });
  assert.equal(g.against, "reference");
  assert.equal(g.negativeGap, true);
  const html = displayBundle(g)!["text/html"];
  assert.match(html, /warning/);
  assert.match(html, /V\(D_ref, G\)/);
  assert.doesNotMatch(html, /V\(D\*|D - D\*|mean D\*|against D\*/);
  assert.match(displayBundle(g)!["text/plain"], /negative: the reference does not describe/);
  // With the densities, the rows do say D*.
  const withDensities = discriminatorGap({ ...outputs, pData: p, pModel: q });
  assert.equal(withDensities.against, "D*");
  assert.equal(withDensities.negativeGap, false);
  assert.match(displayBundle(withDensities)!["text/html"], /V\(D\*, G\)/);
});

Deno.test("discriminatorGap: probability intervals stay in [0, 1] (mean |D - D*| near 0)", () => {
  // D equals D* except on one real point: the normal interval of mean |D - D*| on the real
  // side would dip below 0.
  const real = p.sample(40, 3), fake = q.sample(40, 4);
  const dStar = (x: { data: Float64Array }) => x.data.map((v) => 0.5 - v); // logit of D*
  const dReal = dStar(real);
  dReal[0] += 0.5;
  const densities = { real, fake, pData: p, pModel: q, replicates: 20 };
  const g = discriminatorGap({ dReal, dFake: dStar(fake), scale: "logit", ...densities });
  const m = g.meanAbsDiff!.real;
  assert.ok(m.ci![0] >= 0, `interval ${m.ci}`);
  assert.ok(m.notes.some((n) => /clipped/.test(n)), m.notes.join("\n"));
});
