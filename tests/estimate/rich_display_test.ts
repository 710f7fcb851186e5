/**
 * Every result a notebook user looks at shows itself in a cell: a MIME bundle with
 * text/plain and text/html, whose numbers are the result's own.
 */
import assert from "node:assert/strict";
import * as sk from "../../mod.ts";

function bundleOf(x: unknown): Readonly<Record<string, string>> {
  const b = sk.displayBundle(x);
  assert.ok(b, "no rich display");
  assert.equal(typeof b["text/plain"], "string");
  assert.match(b["text/html"] ?? "", /<table|<p>/);
  return b;
}

Deno.test("display: Samples show n, d, head rows and column means, not their buffer", async () => {
  const s = sk.samples([[1, 10], [2, 20], [3, 30], [4, 40], [5, 50], [6, 60]], {
    columns: ["a", "b"],
  });
  const text = bundleOf(s)["text/plain"];
  assert.match(text, /n = 6, d = 2/);
  // Means 3.5 and 35 by hand; row 5 is beyond the 5 head rows.
  assert.match(text, /mean\s+3\.5\s+35/);
  assert.doesNotMatch(text, /row 5/);
  // Helpers and readers keep the display; JSON stays plain.
  bundleOf(sk.takeRows(s, [0, 2]));
  bundleOf(sk.standardize(s).samples);
  bundleOf(await sk.readSamples("data/demo/turbine_real.csv"));
  assert.equal(JSON.stringify(sk.samples([1, 2])), '{"n":2,"d":1,"data":{"0":1,"1":2}}');
});

Deno.test("display: density objects show their description", () => {
  const g = sk.gaussian(0, 4);
  assert.match(bundleOf(g)["text/plain"], /gaussian/);
  const kde = sk.fitKde(sk.samples([0, 1, 2, 4, 7]));
  assert.match(bundleOf(kde)["text/plain"], /kde/);
  bundleOf(sk.uniformBox([0], [1]));
  bundleOf(sk.gaussianMixture({ weights: [1, 1], means: [0, 3], covariances: [1, 1] }));
});

Deno.test("display: the f-divergence table lists its rows", () => {
  const text = bundleOf(sk.F_DIVERGENCES)["text/plain"];
  for (const name of Object.keys(sk.F_DIVERGENCES)) assert.match(text, new RegExp(name));
  assert.equal(Object.keys(sk.F_DIVERGENCES).length, 8);
});

Deno.test("display: generator objectives and D* describe themselves", () => {
  // A confident discriminator (logit -8): the minimax gradient sigmoid(-8) = 1 / (1 + e^8) = 0.00033535.
  const g = sk.generatorObjectives([-8, -8], { scale: "logit" });
  assert.match(bundleOf(g)["text/plain"], /0\.0003354/);
  const dstar = sk.optimalDiscriminator(sk.gaussian(0, 1), sk.gaussian(1, 1));
  assert.match(bundleOf(dstar)["text/plain"], /gaussian density \(data\)/);
});
