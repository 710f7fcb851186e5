import assert from "node:assert/strict";
import { compareGenerators, precisionRecall } from "../../lib/metrics/mod.ts";
import { plotGeneratorComparison, plotPrecisionRecall } from "../../lib/plot/mod.ts";
import { rng } from "../../lib/random/mod.ts";
import { fromBuffer } from "../../lib/samples/mod.ts";
import { all, assertStandalone, parseSvg, texts } from "./_svg.ts";

function cloud(n: number, d: number, seed: number, shift = 0) {
  const x = rng(seed).fillNormal(new Float64Array(n * d));
  for (let i = 0; i < n; i++) x[i * d] += shift;
  return fromBuffer(x, d);
}

// Kynkäänniemi et al. 2019, Fig. 1: each panel shows both sets, with the points outside the
// other set's manifold marked; every point is drawn once per panel.
Deno.test("plotPrecisionRecall: both panels draw every point; titles carry the two values", () => {
  const real = cloud(120, 5, 1), fake = cloud(80, 5, 2, 1.5);
  const pr = precisionRecall(real, fake, { replicates: 5 });
  const svg = plotPrecisionRecall(real, fake, pr).toSVG();
  assertStandalone(svg);
  const root = parseSvg(svg);
  const dots = all(root, 'g[aria-label="dot"] path').length +
    all(root, 'g[aria-label="dot"] circle').length;
  assert.equal(dots, 2 * (120 + 80));
  const t = texts(root).join(" | ");
  assert.match(t, new RegExp(`precision ${+pr.precision.value.toPrecision(3)}`));
  assert.match(t, /PC 1/);
  assert.throws(() => plotPrecisionRecall(fake, real, pr), /does not belong/);
});

Deno.test("plotGeneratorComparison: a panel per metric and a verdict per pair", () => {
  const real = cloud(150, 2, 3);
  const c = compareGenerators(real, { near: cloud(150, 2, 4, 0.1), far: cloud(150, 2, 5, 2) }, [
    "frechet",
    "coverage",
  ], { replicates: 10 });
  const root = parseSvg(plotGeneratorComparison(c).toSVG());
  const t = texts(root).join(" | ");
  assert.match(t, /frechet \(lower is better\)/);
  assert.match(t, /coverage \(higher is better\)/);
  assert.match(t, /frechet: near − far = .*near better/);
});
