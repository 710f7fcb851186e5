/**
 * Change points and the periodogram test, against brute force and known distributions.
 *
 * - PELT (Killick, Fearnhead & Eckley 2012) must reach the optimum of the penalised cost,
 *   which optimal partitioning by dynamic programming (Jackson et al. 2005) computes
 *   exactly; both are checked against the minimum over every segmentation of short series.
 * - Fisher's g test (Fisher 1929): its closed form for m = 2 and 3 ordinates, and the
 *   uniformity of its p-values under Gaussian white noise (rejection rate at 5%).
 * No textbook change-point example with published numbers is used (none recalled reliably).
 */
import assert from "node:assert/strict";
import { rng } from "../../lib/random/rng.ts";
import { changePoints, differenceSigma } from "../../lib/training/change_points.ts";
import { fisherG, periodogram } from "../../lib/training/periodogram.ts";
import { exponentialMovingAverage, movingMedian } from "../../lib/training/smoothing.ts";
import { assertClose } from "../_assert.ts";

/** Minimum penalised cost over all segmentations with segments >= m (2^(n-1) subsets). */
function bruteForce(x: number[], beta: number, m: number, variance: number) {
  const n = x.length;
  let best = Infinity, bestCps: number[] = [];
  for (let mask = 0; mask < 1 << (n - 1); mask++) {
    const cps: number[] = [];
    for (let i = 1; i < n; i++) if (mask & (1 << (i - 1))) cps.push(i);
    const bounds = [0, ...cps, n];
    let cost = 0, ok = true;
    for (let j = 0; j + 1 < bounds.length; j++) {
      const seg = x.slice(bounds[j], bounds[j + 1]);
      if (seg.length < m) {
        ok = false;
        break;
      }
      const mean = seg.reduce((a, b) => a + b, 0) / seg.length;
      cost += seg.reduce((a, b) => a + (b - mean) ** 2, 0) / variance;
    }
    cost += beta * (bounds.length - 1) - beta;
    if (ok && cost < best - 1e-12) [best, bestCps] = [cost, cps];
  }
  return { cost: best, cps: bestCps };
}

function series(seed: number, n: number, shifts: number): number[] {
  const r = rng(seed);
  const at = new Set(Array.from({ length: shifts }, () => 1 + r.integer(n - 1)));
  let level = 0;
  return Array.from({ length: n }, (_, i) => {
    if (at.has(i)) level += 3 * r.normal();
    return level + r.normal();
  });
}

Deno.test("PELT and optimal partitioning reach the brute-force optimum on short series", () => {
  for (let seed = 0; seed < 40; seed++) {
    const n = 8 + (seed % 7); // up to 14 points: 8192 segmentations
    const x = series(seed, n, 1 + (seed % 3));
    const m = 1 + (seed % 3);
    const beta = [0.5, 2 * Math.log(n), 8][seed % 3];
    const variance = 1;
    const bf = bruteForce(x, beta, m, variance);
    for (const method of ["pelt", "exact"] as const) {
      const cp = changePoints(x, { penalty: beta, minSegment: m, variance, method });
      // The DP counts the penalty per segment; the brute force per change: same optimum.
      assertClose(
        cp.cost + beta,
        bf.cost + beta,
        { rel: 1e-9, abs: 1e-9 },
        `${method} seed ${seed}`,
      );
      assert.deepEqual(cp.changePoints, bf.cps, `${method} seed ${seed}`);
    }
  }
});

Deno.test("PELT equals optimal partitioning on longer series, and segment means are right", () => {
  for (let seed = 100; seed < 120; seed++) {
    const x = series(seed, 300, 4);
    const m = 1 + (seed % 6);
    const a = changePoints(x, { minSegment: m, method: "pelt" });
    const b = changePoints(x, { minSegment: m, method: "exact" });
    assert.deepEqual(a.changePoints, b.changePoints, `seed ${seed}`);
    assertClose(a.cost, b.cost, { rel: 1e-9 });
    const bounds = [0, ...a.changePoints, x.length];
    a.means.forEach((mu, j) => {
      const seg = x.slice(bounds[j], bounds[j + 1]);
      assertClose(mu, seg.reduce((s, v) => s + v, 0) / seg.length, { rel: 1e-9, abs: 1e-12 });
    });
  }
  assert.throws(() => changePoints([1, NaN, 2]), /value 1 is NaN/);
  assert.throws(() => changePoints([1, 2], { minSegment: 0 }), /minSegment/);
});

Deno.test("robust noise sd: 1.4826 MAD of differences / sqrt 2 is about sd for white noise", () => {
  const r = rng(7);
  const x = Array.from({ length: 20000 }, (_, i) => (i > 10000 ? 5 : 0) + 0.3 * r.normal());
  assertClose(differenceSigma(x), 0.3, { rel: 0.03 });
});

Deno.test("Fisher's g: closed form for m = 2 (Fisher 1929) and uniform p-values under noise", () => {
  // m = 2: g = max(E1, E2) / (E1 + E2) with E1 / (E1 + E2) uniform, so g is uniform on [1/2, 1].
  assertClose(fisherG(0.7, 2), 2 * 0.3, { rel: 1e-12 });
  assertClose(fisherG(0.5, 2), 1, { rel: 1e-12 });
  const r = rng(3);
  let rejected = 0;
  const trials = 2000;
  for (let k = 0; k < trials; k++) {
    const x = Array.from({ length: 64 }, () => r.normal());
    if (periodogram(x, { detrendDegree: 0, minCycles: 1 }).pValue < 0.05) rejected++;
  }
  // Binomial(2000, 0.05): sd 0.0049; allow 3 sd.
  assert.ok(Math.abs(rejected / trials - 0.05) < 0.015, `rejection rate ${rejected / trials}`);
});

Deno.test("periodogram ordinates match the DFT definition (Parseval-type check)", () => {
  const r = rng(9);
  const x = Array.from({ length: 101 }, () => r.normal());
  const p = periodogram(x, { detrendDegree: 0, minCycles: 1 });
  // With the mean removed, sum_t x_t^2 = (2 / n) sum over k = 1..(n-1)/2 of n I_k for odd n.
  const mean = x.reduce((a, b) => a + b, 0) / x.length;
  const ss = x.reduce((a, b) => a + (b - mean) ** 2, 0);
  assertClose(2 * p.power.reduce((a, b) => a + b, 0), ss, { rel: 1e-9 });
});

Deno.test("smoothing keeps the raw series and skips NaN", () => {
  const x = new Float64Array([1, 2, NaN, 4, 100, 6]);
  const copy = x.slice();
  const m = movingMedian(x, 3), e = exponentialMovingAverage(x, { alpha: 1 });
  assert.deepEqual(Array.from(m), [1.5, 1.5, 3, 52, 6, 53]);
  assert.deepEqual(Array.from(e), [1, 2, 2, 4, 100, 6]);
  assert.deepEqual(Array.from(x).map(String), Array.from(copy).map(String));
});
