/**
 * The seeded Rng: regression anchors, agreement with seedrandom's xor4096 stream, moment
 * checks within 5 standard errors (common practice, no source), frequencies, permutations,
 * reproducibility and fork independence.
 */
import assert from "node:assert/strict";
// @ts-types="npm:@types/seedrandom@3.0.8"
import seedrandom from "seedrandom";
import quantile from "@stdlib/stats-base-dists-normal-quantile";
import { Rng, rng, toRng } from "../../lib/random/rng.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import { assertWithinSe } from "../_assert.ts";

/** Mean, variance, skewness and excess kurtosis (population moments about the mean). */
function moments(x: Float64Array) {
  const n = x.length;
  let m = 0;
  for (const v of x) m += v;
  m /= n;
  let m2 = 0, m3 = 0, m4 = 0;
  for (const v of x) {
    const d = v - m, d2 = d * d;
    m2 += d2;
    m3 += d2 * d;
    m4 += d2 * d2;
  }
  m2 /= n;
  m3 /= n;
  m4 /= n;
  return { mean: m, variance: m2, skewness: m3 / m2 ** 1.5, kurtosis: m4 / (m2 * m2) - 3 };
}

Deno.test("regression anchors: seed 42 gives these first values", () => {
  // Regression anchor, recorded once from this implementation (seedrandom 3.0.5 xor4096,
  // Marsaglia polar normals): a change here means every seeded result in saddlekit changed.
  const r = new Rng(42);
  assert.deepEqual([r.uniform(), r.uniform(), r.uniform()], [
    0.5198396780528832,
    0.6490345226846735,
    0.0353657622584419,
  ]);
  const s = new Rng(42);
  assert.deepEqual([s.normal(), s.normal(), s.normal()], [
    0.2893022225096337,
    2.1732216888001665,
    -0.48309258499094065,
  ]);
  assert.deepEqual(Array.from(new Rng(1).permutation(8)), [2, 1, 4, 6, 0, 5, 7, 3]);
  assert.deepEqual(Array.from(new Rng(1).bootstrapIndices(10)), [4, 5, 8, 1, 9, 0, 8, 7, 5, 4]);
  const q = new Rng("abc");
  assert.deepEqual(Array.from({ length: 5 }, () => q.integer(1000)), [738, 940, 403, 47, 535]);
  assert.equal(new Rng(42).fork("a").uniform(), 0.39931753986234564);
});

Deno.test("uniform draws are seedrandom's xor4096 double() stream, bit for bit", () => {
  for (const seed of ["0", "42", "saddle", "-1.5"]) {
    const ref = seedrandom.xor4096(seed);
    const r = new Rng(seed);
    for (let i = 0; i < 1000; i++) assert.equal(r.uniform(), ref.double(), `${seed} draw ${i}`);
  }
  // Numbers are seeded by their string form.
  assert.equal(new Rng(42).uniform(), new Rng("42").uniform());
});

Deno.test("normal: mean, variance, skewness, excess kurtosis of 1e6 draws match N(0,1)", () => {
  const n = 1_000_000;
  const x = new Rng("normal-moments").fillNormal(new Float64Array(n));
  const m = moments(x);
  // Standard errors (common practice, no source): mean 1/sqrt(n), variance sqrt(2/n),
  // skewness sqrt(6/n), excess kurtosis sqrt(24/n).
  assertWithinSe(m.mean, 0, 1 / Math.sqrt(n), 5, "mean");
  assertWithinSe(m.variance, 1, Math.sqrt(2 / n), 5, "variance");
  assertWithinSe(m.skewness, 0, Math.sqrt(6 / n), 5, "skewness");
  assertWithinSe(m.kurtosis, 0, Math.sqrt(24 / n), 5, "excess kurtosis");
  // Tails: the share beyond the 0.999 quantile (@stdlib's normal quantile) is 0.001.
  const q = quantile(0.999, 0, 1);
  let above = 0, below = 0;
  for (const v of x) {
    if (v > q) above++;
    if (v < -q) below++;
  }
  const se = Math.sqrt(0.001 * 0.999 / n);
  assertWithinSe(above / n, 0.001, se, 5, "upper tail");
  assertWithinSe(below / n, 0.001, se, 5, "lower tail");
  // Location and scale.
  const r = new Rng("shift");
  const y = Float64Array.from({ length: 100_000 }, () => r.normal(3, 2));
  const my = moments(y);
  assertWithinSe(my.mean, 3, 2 / Math.sqrt(y.length), 5, "shifted mean");
  assertWithinSe(my.variance, 4, 4 * Math.sqrt(2 / y.length), 5, "scaled variance");
});

Deno.test("uniform: range, mean 1/2, variance 1/12, flat histogram", () => {
  const n = 1_000_000;
  const x = new Rng("uniform-moments").fillUniform(new Float64Array(n));
  const m = moments(x);
  let lo = 1, hi = 0;
  const bins = new Float64Array(20);
  for (const v of x) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
    bins[Math.floor(v * 20)]++;
  }
  assert.ok(lo >= 0 && hi < 1);
  // Var of U(0,1) is 1/12; of (U - 1/2)^2 it is 1/80 - 1/144 = 1/180 (common practice).
  assertWithinSe(m.mean, 0.5, Math.sqrt(1 / 12 / n), 5, "mean");
  assertWithinSe(m.variance, 1 / 12, Math.sqrt(1 / 180 / n), 5, "variance");
  assertWithinSe(m.skewness, 0, Math.sqrt(6 / n), 5, "skewness");
  const se = Math.sqrt(0.05 * 0.95 / n);
  bins.forEach((c, b) => assertWithinSe(c / n, 0.05, se, 5, `bin ${b}`));
  const r = new Rng(3);
  for (let i = 0; i < 1000; i++) {
    const v = r.uniform(-2, 5);
    assert.ok(v >= -2 && v < 5);
  }
});

Deno.test("categorical frequencies match the weights; zero weights never drawn", () => {
  const w = [1, 2, 0, 3, 4, 0];
  const total = 10, n = 200_000;
  const draw = new Rng("cat").categoricalSampler(w);
  const counts = new Float64Array(w.length);
  for (let i = 0; i < n; i++) counts[draw()]++;
  w.forEach((wi, k) => {
    const p = wi / total;
    if (p === 0) assert.equal(counts[k], 0, `weight ${k} is 0`);
    else assertWithinSe(counts[k] / n, p, Math.sqrt(p * (1 - p) / n), 5, `category ${k}`);
  });
  // A leading zero weight, and the one-shot form.
  const r = new Rng(5);
  for (let i = 0; i < 1000; i++) assert.equal(r.categorical([0, 0, 1]), 2);
  assert.throws(() => r.categorical([]), SaddleError);
  assert.throws(() => r.categorical([0, 0]), /all weights are 0/);
  assert.throws(() => r.categorical([1, -1]), /weight 1/);
  assert.throws(() => r.categorical([1, NaN]), /weight 1/);
});

Deno.test("permutation is a permutation, and all 6 orders of 3 are equally likely", () => {
  const r = new Rng("perm");
  for (const n of [0, 1, 2, 17, 1000]) {
    const p = r.permutation(n);
    assert.deepEqual(Array.from(p).sort((a, b) => a - b), Array.from({ length: n }, (_, i) => i));
  }
  const counts = new Map<string, number>();
  const N = 60_000;
  for (let i = 0; i < N; i++) {
    const k = r.permutation(3).join("");
    counts.set(k, (counts.get(k) ?? 0) + 1);
  }
  assert.equal(counts.size, 6);
  for (const [k, c] of counts) assertWithinSe(c / N, 1 / 6, Math.sqrt((1 / 6) * (5 / 6) / N), 5, k);
});

Deno.test("integer and bootstrapIndices are uniform on 0..n-1", () => {
  const r = new Rng("int");
  const n = 7, N = 140_000;
  const a = new Float64Array(n), b = new Float64Array(n);
  for (let i = 0; i < N; i++) a[r.integer(n)]++;
  for (const i of r.bootstrapIndices(n, N)) b[i]++;
  const se = Math.sqrt((1 / n) * (1 - 1 / n) / N);
  for (let k = 0; k < n; k++) {
    assertWithinSe(a[k] / N, 1 / n, se, 5, `integer ${k}`);
    assertWithinSe(b[k] / N, 1 / n, se, 5, `bootstrap ${k}`);
  }
  assert.throws(() => r.integer(0), SaddleError);
  assert.throws(() => r.integer(2.5), SaddleError);
  assert.throws(
    () => r.bootstrapIndices(0),
    (e: unknown) => e instanceof SaddleError && e.code === "too-few-samples",
  );
  assert.throws(() => new Rng(NaN), SaddleError);
});

Deno.test("same seed, same bits, for every method in any mix", () => {
  const run = (r: Rng) => {
    const out: number[] = [];
    out.push(r.uniform(), r.normal(), r.uniform(-3, 3), r.normal(1, 2), r.integer(97));
    out.push(r.categorical([1, 5, 2]), ...r.permutation(9), ...r.bootstrapIndices(13, 5));
    out.push(...r.fillNormal(new Float64Array(7)), ...r.fillUniform(new Float64Array(3)));
    const c = r.categoricalSampler([3, 1]);
    out.push(c(), c(), r.fork("x").normal(), r.normal());
    return new Float64Array(out);
  };
  for (const seed of [0, 1, "run-7", 123456789]) {
    const a = run(new Rng(seed)), b = run(rng(seed));
    assert.deepEqual(new Uint32Array(a.buffer), new Uint32Array(b.buffer), String(seed));
  }
  assert.notDeepEqual(run(new Rng(1)), run(new Rng(2)));
  // fillNormal is the same stream as repeated normal().
  const f = new Rng(9).fillNormal(new Float64Array(5));
  const g = new Rng(9);
  assert.deepEqual(Array.from(f), Array.from({ length: 5 }, () => g.normal()));
  const r = new Rng(4);
  assert.equal(toRng(r), r);
  assert.equal(toRng("4").uniform(), new Rng(4).uniform());
});

Deno.test("fork: reproducible, independent of the parent's position, uncorrelated", () => {
  const parent = new Rng("p");
  parent.uniform();
  parent.normal();
  const a = parent.fork("a");
  assert.equal(a.uniform(), new Rng("p").fork("a").uniform()); // position does not matter
  assert.equal(new Rng("p").fork(3).uniform(), new Rng("p/3").uniform());
  // Forking does not consume the parent's stream.
  const x = new Rng("q"), y = new Rng("q");
  x.fork("z");
  assert.equal(x.uniform(), y.uniform());
  // Correlation between parent, fork "a" and fork "b" streams: 0 within 5 / sqrt(n).
  const n = 100_000;
  const streams = [new Rng("c"), new Rng("c").fork("a"), new Rng("c").fork("b")].map((r) =>
    r.fillNormal(new Float64Array(n))
  );
  for (const [i, j] of [[0, 1], [0, 2], [1, 2]]) {
    let s = 0;
    for (let k = 0; k < n; k++) s += streams[i][k] * streams[j][k];
    assertWithinSe(s / n, 0, 1 / Math.sqrt(n), 5, `corr ${i},${j}`);
  }
});

Deno.test("bad sizes and seeds give SaddleErrors naming the parameter, not RangeError or a shared seed", () => {
  const named = (f: () => unknown, parameter: string) =>
    assert.throws(f, (e: unknown) => {
      assert.ok(e instanceof SaddleError, String(e));
      assert.equal(e.location.parameter, parameter);
      return true;
    });
  named(() => rng(1).permutation(-1), "n");
  named(() => rng(1).permutation(2.5), "n");
  assert.equal(rng(1).permutation(0).length, 0);
  // Every object stringifies to "[object Object]": two different objects would share a seed.
  named(() => rng({} as unknown as number), "seed");
  named(() => toRng(null as unknown as number), "seed");
  named(() => rng(1).bootstrapIndices(3, 5, new Uint32Array(2)), "size");
});
