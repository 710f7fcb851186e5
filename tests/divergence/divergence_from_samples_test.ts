/**
 * f-divergences from samples with the refit bootstrap: coverage of the closed-form
 * Gaussian KL (Kullback 1959) in repeated seeded trials, reproducibility, the interval
 * against the numerical-only one, failures and bad input.
 */
import assert from "node:assert/strict";
import { assertClose } from "../_assert.ts";
import { fitKde, gaussian } from "../../lib/density/mod.ts";
import {
  divergenceFromSamples,
  fDivergence,
  gaussianKl,
  type SampleDivergence,
} from "../../lib/divergence/mod.ts";
import { SaddleError } from "../../lib/errors/mod.ts";
import { displayBundle } from "../../lib/display/mod.ts";
import { columnMeans, covariance } from "../../lib/linalg/mod.ts";
import { type Samples, samples } from "../../lib/samples/mod.ts";
import { decompositionFromSamples } from "../../lib/value/mod.ts";

/** Maximum-likelihood-style Gaussian fit: sample mean and (n - 1) covariance. */
const gaussianFit = (s: Samples) =>
  gaussian(columnMeans(s.data, s.n, s.d), covariance(s.data, s.n, s.d));

const A = { mean: [0], cov: [1] }, B = { mean: [0.5], cov: [2.25] };
const P = gaussian(A.mean, A.cov), Q = gaussian(B.mean, B.cov);

function sameBits(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

Deno.test("divergenceFromSamples: the 95% interval of KL covers the closed-form Gaussian KL at about the nominal rate", () => {
  // KL(N(0, 1) || N(0.5, 1.5²)) = ln 1.5 + (1 + 0.25) / (2 · 2.25) - 1/2 (Kullback 1959).
  const truth = gaussianKl(A, B);
  assertClose(truth, Math.log(1.5) + 1.25 / 4.5 - 0.5, { rel: 1e-14 });
  const trials = 100;
  let covered = 0, truthBelow = 0;
  for (let t = 0; t < trials; t++) {
    const real = P.sample(100, `real/${t}`), fake = Q.sample(100, `fake/${t}`);
    const kl = divergenceFromSamples(real, fake, "kl", {
      fit: gaussianFit,
      replicates: 100,
      seed: t,
      gridSize: 200,
    });
    const [lo, hi] = kl.ci!;
    if (lo <= truth && truth <= hi) covered++;
    else if (truth < lo) truthBelow++;
  }
  // Binomial(100, 0.95): P(X <= 88) = 0.004. Seeded, so the count is fixed (95 here); the
  // bound says how far below 0.95 a correct interval may plausibly fall. Over 200 trials
  // with these settings the coverage measured 0.93.
  assert.ok(covered >= 89, `covered ${covered} of ${trials}`);
  // The misses lean to the side of the upward bias of plug-in divergences (the interval
  // above the truth), as documented; no more than a handful on the other side.
  assert.ok(trials - covered - truthBelow <= truthBelow + 3, `misses above: ${truthBelow}`);
});

Deno.test("divergenceFromSamples: same seed gives the same bits, another seed differs", () => {
  const real = P.sample(120, 1), fake = Q.sample(90, 2);
  const run = (seed: number) =>
    divergenceFromSamples(real, fake, "squared-hellinger", { replicates: 25, seed });
  const a = run(7), b = run(7), c = run(8);
  assert.ok(Object.is(a.value, b.value) && Object.is(a.se, b.se));
  assert.deepEqual(a.ci, b.ci);
  assert.ok(sameBits(a.replicates, b.replicates));
  assert.equal(JSON.stringify(a), JSON.stringify(b));
  assert.ok(!sameBits(a.replicates, c.replicates));
  assert.notEqual(a.se, c.se);
  assert.equal(a.replicates.length, 25);
});

Deno.test("divergenceFromSamples: the interval is wider than the numerical-only interval of fDivergence on the same fits", () => {
  const real = P.sample(300, 3), fake = Q.sample(300, 4);
  for (const method of ["grid", "monte-carlo"] as const) {
    const opts = { method, seed: 5, n: 4000, gridSize: 300 };
    const kl = divergenceFromSamples(real, fake, "kl", { ...opts, replicates: 60 });
    const direct = fDivergence(fitKde(real), fitKde(fake), "kl", opts);
    // The plug-in is exactly fDivergence on the fits with the same options.
    assert.equal(kl.value, direct.value, method);
    assert.equal(kl.plugIn.se, direct.se, method);
    const width = (e: { ci?: readonly [number, number] }) => e.ci![1] - e.ci![0];
    assert.ok(width(kl) > 2 * width(direct), `${method}: ${width(kl)} vs ${width(direct)}`);
    assert.ok(kl.se! > kl.plugIn.se!, method);
    assert.match(kl.notes.join("\n"), /of the bootstrap variance/);
  }
});

Deno.test("divergenceFromSamples: JSD agrees with the decomposition's JSD replicate by replicate", () => {
  const real = P.sample(80, 5), fake = Q.sample(80, 6);
  const opts = { replicates: 12, seed: 9, gridSize: 400 };
  const js = divergenceFromSamples(real, fake, "jensen-shannon", opts);
  const dec = decompositionFromSamples(real, fake, opts);
  // Same resamples and fits (same seed forks); two quadratures of the same integral.
  assertClose(js.value, dec.jsd.value, { rel: 1e-8 });
  for (let b = 0; b < 12; b++) {
    assertClose(js.replicates[b], dec.jsd.replicates[b], { rel: 1e-8 }, `replicate ${b}`);
  }
});

Deno.test("divergenceFromSamples: units, every table row, rich display, hidden fields", () => {
  const real = P.sample(60, 7), fake = Q.sample(60, 8);
  const nats = divergenceFromSamples(real, fake, "kl", { replicates: 10, seed: 1 });
  const bits = divergenceFromSamples(real, fake, "kl", { replicates: 10, seed: 1, base: 2 });
  assertClose(bits.value, nats.value / Math.LN2, { rel: 1e-12 });
  assert.equal(bits.unit, "bits");
  for (const name of ["total-variation", "pearson", "gan", "reverse-kl"] as const) {
    const e = divergenceFromSamples(real, fake, name, { replicates: 5, seed: 2 });
    assert.ok(Number.isFinite(e.value) && e.se! >= 0, name);
  }
  const alpha = divergenceFromSamples(real, fake, "alpha", { alpha: 0.5, replicates: 5 });
  assert.ok(alpha.value > 0);
  const show = displayBundle(nats)!;
  assert.match(show["text/html"], /<table/);
  assert.match(show["text/html"], /numerical only/);
  assert.match(show["text/plain"], /refit bootstrap/);
  // JSON keeps the Estimate shape; plugIn, failed and replicates are non-enumerable.
  assert.deepEqual(
    Object.keys(JSON.parse(JSON.stringify(nats))).sort(),
    ["ci", "level", "method", "n", "notes", "se", "unit", "value"],
  );
  assert.equal(nats.failed, 0);
  assert.equal(nats.n, 120);
  assert.match(
    nats.notes.join("\n"),
    /bootstrap bias estimate .*(biased upward here|biased downward here|no bias distinguishable)/,
  );
});

Deno.test("divergenceFromSamples: failed replicates are counted and left out; other errors propagate", () => {
  const real = P.sample(40, 9), fake = Q.sample(40, 10);
  let calls = 0;
  const flaky = (s: Samples) => {
    calls++;
    // Fail on every 5th fit after the two plug-in fits, as a fitter that cannot converge.
    if (calls > 2 && calls % 5 === 0) {
      throw new SaddleError("numerical", "did not converge", { parameter: "fit" });
    }
    return gaussianFit(s);
  };
  const e: SampleDivergence = divergenceFromSamples(real, fake, "kl", {
    fit: flaky,
    replicates: 20,
    seed: 3,
  });
  assert.ok(e.failed > 0 && e.failed < 20, `failed ${e.failed}`);
  assert.equal(e.replicates.length, 20 - e.failed);
  assert.match(e.notes.join("\n"), /replicates failed and were left out.*first error: .*converge/);
  const buggy = (s: Samples) => {
    if (s.data[0] > 1e9) return gaussianFit(s);
    throw new TypeError("a bug in the fitter");
  };
  assert.throws(() => divergenceFromSamples(real, fake, "kl", { fit: buggy }), TypeError);
});

Deno.test("divergenceFromSamples: bad input names the parameter", () => {
  const one = P.sample(50, 1), two = gaussian([0, 0], [1, 0, 0, 1]).sample(50, 2);
  const bad = (f: () => unknown, code: string, parameter: string) =>
    assert.throws(f, (e: unknown) => {
      assert.ok(e instanceof SaddleError, String(e));
      assert.equal(e.code, code);
      assert.equal(e.location.parameter, parameter);
      return true;
    });
  bad(() => divergenceFromSamples(one, two, "kl"), "dimension-mismatch", "fake");
  bad(() => divergenceFromSamples(samples([1]), one, "kl"), "too-few-samples", "real");
  bad(() => divergenceFromSamples(one, samples([2]), "kl"), "too-few-samples", "fake");
  bad(
    () => divergenceFromSamples(one, one, "kl", { replicates: 1 }),
    "invalid-argument",
    "replicates",
  );
  bad(
    () => divergenceFromSamples(one, one, "kl", { replicates: 2.5 }),
    "invalid-argument",
    "replicates",
  );
  bad(() => divergenceFromSamples(one, one, "kl", { level: 1 }), "invalid-argument", "level");
  bad(
    () => divergenceFromSamples(one, one, "kl", { fit: () => gaussian([0, 0], [1, 0, 0, 1]) }),
    "invalid-argument",
    "fit",
  );
  bad(() => divergenceFromSamples(one, one, "pearson", { base: 2 }), "invalid-argument", "base");
  assert.throws(() => divergenceFromSamples(one, one, "no-such" as "kl"), SaddleError);
  bad(
    () => divergenceFromSamples(one, one, "kl", { method: "monte-carlo", n: 1, replicates: 2 }),
    "invalid-argument",
    "n",
  );
});

Deno.test("divergenceFromSamples: a fit that fails on one side says which side", () => {
  // Constant fake data: the default KDE cannot scale a bandwidth from a zero variance. The
  // error must say it was the fake side and keep the column of the fitter's error.
  const one = P.sample(50, 1);
  const constant = samples(new Array(20).fill(1));
  assert.throws(() => divergenceFromSamples(one, constant, "kl"), (e: unknown) => {
    assert.ok(e instanceof SaddleError, String(e));
    assert.equal(e.location.parameter, "fake");
    assert.equal(e.location.column, 0);
    assert.match(e.message, /fitting the fake samples: column 0 has zero variance/);
    assert.doesNotMatch(e.message, /parameter "samples"/);
    // The fitter's own error is kept whole as the cause (ES2022 error cause).
    assert.ok(e.cause instanceof SaddleError);
    assert.equal(e.cause.code, e.code);
    assert.equal(e.cause.location.column, 0);
    return true;
  });
});
