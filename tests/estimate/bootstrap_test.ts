/**
 * The bootstrap (Efron 1979; Efron & Tibshirani 1993): its standard error of a mean
 * against the plug-in formula, percentile-interval coverage over repeated seeds, and the
 * bookkeeping (seeds, dropped replicates, errors).
 */
import assert from "node:assert/strict";
import { bootstrap, quantileSorted } from "../../lib/estimate/bootstrap.ts";
import { meanVariance } from "../../lib/estimate/estimate.ts";
import { Rng } from "../../lib/random/rng.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import { assertClose, assertWithinSe } from "../_assert.ts";

function meanOf(x: Float64Array) {
  return (idx: Uint32Array) => {
    let s = 0;
    for (let i = 0; i < idx.length; i++) s += x[idx[i]];
    return s / idx.length;
  };
}

Deno.test("bootstrap se of a mean is the plug-in s * sqrt((n-1)/n) / sqrt(n)", () => {
  // The ideal bootstrap variance of the mean is the plug-in variance / n (Efron &
  // Tibshirani 1993, sec. 5.2); B replicates estimate an sd with relative error about
  // 1 / sqrt(2(B - 1)) (common practice, no source).
  const x = new Rng("boot-se").fillNormal(new Float64Array(80));
  const n = x.length, B = 4000;
  const e = bootstrap(n, meanOf(x), { seed: 11, replicates: B });
  const s = Math.sqrt(meanVariance(x).variance);
  const ideal = (s * Math.sqrt((n - 1) / n)) / Math.sqrt(n);
  assertWithinSe(e.se!, ideal, ideal / Math.sqrt(2 * (B - 1)), 5, "bootstrap se");
  assertClose(e.value, meanVariance(x).mean, { rel: 1e-13 });
  assert.equal(e.replicates.length, B);
  assert.equal(e.method, "bootstrap-percentile");
  assert.equal(e.n, n);
  // The interval is the 2.5% and 97.5% quantiles of the replicates.
  const sorted = e.replicates.slice().sort();
  const alpha = (1 - 0.95) / 2;
  assert.deepEqual(e.ci, [quantileSorted(sorted, alpha), quantileSorted(sorted, 1 - alpha)]);
});

Deno.test("two samples resample independently: se of a difference of means", () => {
  const r = new Rng("two");
  const a = Float64Array.from({ length: 60 }, () => r.normal(0, 1));
  const b = Float64Array.from({ length: 120 }, () => r.normal(0, 3));
  const B = 3000;
  const e = bootstrap([a.length, b.length], (ia, ib) => meanOf(a)(ia) - meanOf(b)(ib), {
    seed: 2,
    replicates: B,
  });
  const va = meanVariance(a).variance * (a.length - 1) / a.length;
  const vb = meanVariance(b).variance * (b.length - 1) / b.length;
  const ideal = Math.sqrt(va / a.length + vb / b.length);
  assertWithinSe(e.se!, ideal, ideal / Math.sqrt(2 * (B - 1)), 5, "se of difference");
  assert.equal(e.n, 180);
});

Deno.test("percentile 95% intervals cover the true mean about 95% of the time", () => {
  // 300 data sets of n = 60 from Exp(1)-free N(2, 1); coverage within 5 binomial se of the
  // level. The percentile interval undercovers slightly at small n (Efron & Tibshirani
  // 1993, ch. 13), well inside this band at n = 60.
  const trials = 300, n = 60;
  const gen = new Rng("coverage");
  let covered = 0;
  for (let t = 0; t < trials; t++) {
    const x = Float64Array.from({ length: n }, () => gen.normal(2, 1));
    const e = bootstrap(n, meanOf(x), { seed: `trial-${t}`, replicates: 400 });
    if (e.ci![0] <= 2 && 2 <= e.ci![1]) covered++;
  }
  assertWithinSe(covered / trials, 0.95, Math.sqrt(0.95 * 0.05 / trials), 5, "coverage");
  // And a 50% interval covers about half the time: the level is honoured, not fixed.
  let half = 0;
  for (let t = 0; t < trials; t++) {
    const x = Float64Array.from({ length: n }, () => gen.normal(2, 1));
    const e = bootstrap(n, meanOf(x), { seed: t, replicates: 400, level: 0.5 });
    if (e.ci![0] <= 2 && 2 <= e.ci![1]) half++;
  }
  assertWithinSe(half / trials, 0.5, Math.sqrt(0.25 / trials), 5, "50% coverage");
});

Deno.test("same seed, same replicates; another seed, others", () => {
  const x = Float64Array.from({ length: 30 }, (_, i) => i * i);
  const a = bootstrap(30, meanOf(x), { seed: "s", replicates: 50 });
  const b = bootstrap(30, meanOf(x), { seed: "s", replicates: 50 });
  const c = bootstrap(30, meanOf(x), { seed: "t", replicates: 50 });
  assert.deepEqual(a.replicates, b.replicates);
  assert.notDeepEqual(a.replicates, c.replicates);
  assert.equal(JSON.stringify(a), JSON.stringify(b));
  assert.ok(!("replicates" in JSON.parse(JSON.stringify(a))));
});

Deno.test("non-finite replicates are dropped and counted in the notes", () => {
  const x = new Float64Array([0, 0, 0, 1]);
  // log of the mean is -Infinity whenever the resample holds only zeros.
  const e = bootstrap(4, (idx) => Math.log(meanOf(x)(idx)), { seed: 1, replicates: 200 });
  const dropped = 200 - e.replicates.length;
  assert.ok(dropped > 0);
  // P(all four draws are zeros) = (3/4)^4 = 0.316; binomial 5 se band.
  assertWithinSe(dropped / 200, 0.75 ** 4, Math.sqrt(0.316 * 0.684 / 200), 5, "dropped share");
  assert.ok(e.notes.some((s) => s.includes(`${dropped} replicates gave a non-finite`)));
});

Deno.test("bootstrap refuses bad sizes and replicate counts", () => {
  const f = () => 0;
  assert.throws(
    () => bootstrap(0, f),
    (e: unknown) => e instanceof SaddleError && e.code === "too-few-samples",
  );
  assert.throws(() => bootstrap([5, 0], f), SaddleError);
  assert.throws(() => bootstrap(5, f, { replicates: 1 }), /replicates/);
  assert.throws(() => bootstrap(5, f, { level: 1 }), /level/);
});

Deno.test("quantileSorted is numpy's default linear interpolation (type 7)", () => {
  // numpy.quantile([1, 2, 3, 4], q) gives 1.75, 2.5, 3.25 (numpy's default, from memory).
  assert.equal(quantileSorted([1, 2, 3, 4], 0.25), 1.75);
  assert.equal(quantileSorted([1, 2, 3, 4], 0.5), 2.5);
  assert.equal(quantileSorted([1, 2, 3, 4], 0.75), 3.25);
  assert.equal(quantileSorted([1, 2, 3, 4], 0), 1);
  assert.equal(quantileSorted([1, 2, 3, 4], 1), 4);
  assert.equal(quantileSorted([7], 0.3), 7);
  assert.ok(Number.isNaN(quantileSorted([], 0.5)));
});
