/**
 * The shared refit bootstrap: the binned route against the exact evaluator (1-D, 2-D,
 * far-apart supports), the views against the shared call, workers, progress, intervals.
 */
import assert from "node:assert/strict";
import { assertClose } from "../_assert.ts";
import { fitKde, gaussian } from "../../lib/density/mod.ts";
import {
  DECOMPOSITION_WEIGHTS as W,
  divergenceFromSamples,
  refitBootstrap,
} from "../../lib/divergence/mod.ts";
import { integrateGrid } from "../../lib/divergence/integration.ts";
import { decompositionFromSamples } from "../../lib/value/mod.ts";
import { fromBuffer, type Samples } from "../../lib/samples/mod.ts";
import { Rng } from "../../lib/random/mod.ts";

function normals(n: number, d: number, shift: number, seed: number): Samples {
  const r = new Rng(seed);
  return fromBuffer(Float64Array.from({ length: n * d }, () => r.normal() + shift), d);
}

for (const d of [1, 2] as const) {
  Deno.test(`refitBootstrap: binned plug-in agrees with the exact KDEs within its error bar (${d}-D)`, () => {
    const n = d === 1 ? 400 : 300;
    const real = normals(n, d, 0, 1), fake = normals(n, d, 0.8, 2);
    const r = refitBootstrap(real, fake, {
      quantities: ["value", "klRealMix", "klFakeMix", "jsd", "total-variation"],
      replicates: 2,
      seed: 1,
    });
    assert.equal(r.route.jsd, "binned");
    // The exact evaluator (fitKde, Scott) under the project's midpoint quadrature.
    const p = fitKde(real), q = fitKde(fake);
    const g = integrateGrid(p, q, [W.value, W.klRealMix, W.klFakeMix], {
      gridSize: d === 1 ? 1000 : 100,
    });
    const exact = { value: g.values[0], klRealMix: g.values[1], klFakeMix: g.values[2] };
    const errs = { value: g.errors[0], klRealMix: g.errors[1], klFakeMix: g.errors[2] };
    for (const k of ["value", "klRealMix", "klFakeMix"] as const) {
      const b = r.plugIn[k];
      assert.ok(b.se! > 0 && b.se! < 1e-2, `${k} error bar ${b.se}`);
      assert.ok(
        Math.abs(b.value - exact[k]) <= b.se! + errs[k],
        `${k}: binned ${b.value} ± ${b.se} vs exact ${exact[k]} ± ${errs[k]}`,
      );
    }
    assert.match(r.notes.join("\n"), /against the exact evaluator at \d+ check nodes/);
  });

  Deno.test(`refitBootstrap: far-apart supports give JSD = ln 2 and TV = 1 (${d}-D)`, () => {
    // Arjovsky & Bottou 2017: disjoint supports give JSD = ln 2 (Lin 1991 bound).
    const real = normals(200, d, 0, 3), fake = normals(200, d, 1000, 4);
    const r = refitBootstrap(real, fake, {
      quantities: ["jsd", "value", "total-variation"],
      replicates: 4,
      seed: 2,
    });
    assertClose(r.estimates.jsd.value, Math.LN2, { abs: 1e-9 });
    assertClose(r.estimates.value.value, 0, { abs: 1e-8 });
    assertClose(r.estimates["total-variation"].value, 1, { abs: 1e-9 });
    for (const v of r.estimates.jsd.replicates) assertClose(v, Math.LN2, { abs: 1e-9 });
    // 1-D affords one grid over both; in 2-D one grid per side keeps the spacing fine.
    if (d === 2) assert.match(r.notes.join("\n"), /lie apart: one grid around each/);
  });
}

Deno.test("refitBootstrap: the views give the same numbers as one shared call (same seed)", () => {
  const real = gaussian(0, 1).sample(150, 5), fake = gaussian(0.7, 1.3).sample(150, 6);
  const opts = { replicates: 6, seed: 9 };
  const all = refitBootstrap(real, fake, {
    ...opts,
    quantities: ["value", "jsd", "klRealMix", "klFakeMix", "residual", "kl", "total-variation"],
  });
  const dec = decompositionFromSamples(real, fake, opts);
  for (const t of ["value", "jsd", "klRealMix", "klFakeMix", "residual"] as const) {
    assert.equal(dec[t].value, all.estimates[t].value, t);
    assert.deepEqual(dec[t].ci, all.estimates[t].ci, t);
    assert.deepEqual(Array.from(dec.replicates[t]), Array.from(all.columns[t]), t);
  }
  for (const name of ["kl", "total-variation"] as const) {
    const one = divergenceFromSamples(real, fake, name, opts);
    assert.equal(one.value, all.estimates[name].value, name);
    assert.equal(one.se, all.estimates[name].se, name);
    assert.deepEqual(Array.from(one.replicates), Array.from(all.estimates[name].replicates));
  }
  assert.equal(all.route.kl, "refit"); // unbounded integrand: point-level refit
  assert.equal(all.route["total-variation"], "binned");
});

Deno.test("refitBootstrap: 1 and 2 workers give the same bits; progress is reported", () => {
  const real = normals(3000, 2, 0, 7), fake = normals(3000, 2, 0.5, 8);
  const seen: number[] = [];
  const opts = { quantities: ["jsd", "value"] as const, replicates: 6, seed: "w" };
  const one = refitBootstrap(real, fake, {
    ...opts,
    workers: 1,
    onProgress: (k, total) => {
      assert.equal(total, 6);
      seen.push(k);
    },
  });
  const two = refitBootstrap(real, fake, { ...opts, workers: 2 });
  assert.deepEqual(seen, [1, 2, 3, 4, 5, 6]);
  assert.deepEqual(Array.from(one.columns.jsd), Array.from(two.columns.jsd));
  assert.deepEqual(Array.from(one.columns.value), Array.from(two.columns.value));
});

Deno.test("refitBootstrap: interval methods; the bias note follows the measured direction", () => {
  const real = gaussian(0, 1).sample(200, 11), fake = gaussian(0, 1).sample(200, 12);
  const base = { quantities: ["jsd"] as const, replicates: 40, seed: 4 };
  const pct = refitBootstrap(real, fake, { ...base, interval: "percentile" }).estimates.jsd;
  const basic = refitBootstrap(real, fake, { ...base, interval: "basic" }).estimates.jsd;
  const bca = refitBootstrap(real, fake, { ...base, interval: "bca" }).estimates.jsd;
  // Same replicates, different intervals (Davison & Hinkley 1997, eq. 5.6: basic reflects).
  assert.deepEqual(Array.from(pct.replicates), Array.from(basic.replicates));
  assertClose(basic.ci![0], 2 * pct.value - pct.ci![1], { abs: 1e-15 });
  assertClose(basic.ci![1], 2 * pct.value - pct.ci![0], { abs: 1e-15 });
  assert.equal(bca.method, "bootstrap-bca (refit)");
  // Equal distributions: the replicates sit above the plug-in (noise adds divergence).
  const mean = pct.replicates.reduce((a, b) => a + b, 0) / pct.replicates.length;
  const note = pct.notes.find((n) => n.startsWith("bootstrap bias estimate"))!;
  assert.ok(mean > pct.value);
  assert.match(note, /biased upward here|no bias distinguishable/);
  assert.throws(
    () => refitBootstrap(real, fake, { ...base, interval: "nope" as "bc" }),
    /interval/,
  );
});

Deno.test("refitBootstrap: the gap resamples the discriminator's outputs with the data", () => {
  const real = gaussian(0, 1).sample(300, 21), fake = gaussian(1, 1).sample(300, 22);
  // A discriminator that is the logistic D*(x) = σ(0.5 - x) of N(0,1) against N(1,1),
  // shrunk towards 1/2 (a weaker D): logit 0.8 (0.5 - x).
  const logit = (s: Samples) => Float64Array.from(s.data, (x) => 0.8 * (0.5 - x));
  const lsig = (z: number) => -Math.log1p(Math.exp(-z));
  const dReal = logit(real), dFake = logit(fake);
  let vD = 0;
  for (const z of dReal) vD += lsig(z) / dReal.length;
  for (const z of dFake) vD += lsig(-z) / dFake.length;
  for (const fit of [undefined, (s: Samples) => fitKde(s)]) {
    const r = refitBootstrap(real, fake, {
      quantities: ["value", "gap"],
      discriminator: { dReal, dFake, scale: "logit" },
      replicates: 8,
      seed: 3,
      ...(fit ? { fit } : {}),
    });
    // Goodfellow et al. 2014, Prop. 1: D* maximises V, so the gap of another D is >= 0.
    assertClose(r.plugIn.gap.value, r.plugIn.value.value - vD, { abs: 1e-12 });
    assert.ok(r.estimates.gap.value > 0);
    const shifted = r.columns.gap.some((g, b) => Math.abs(g - (r.columns.value[b] - vD)) > 1e-6);
    assert.ok(shifted, "V(D, G) is recomputed on each resample");
  }
  assert.throws(
    () => refitBootstrap(real, fake, { quantities: ["gap"], replicates: 2 }),
    /needs the discriminator's outputs/,
  );
});
