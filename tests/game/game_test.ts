/**
 * Parametric games: the Dirac game against Mescheder et al. 2018, the location game's
 * optimal-discriminator profile against Goodfellow et al. 2014 and scipy's quad, best
 * responses against D*, closed-form gradients against central differences, bad input.
 */
import assert from "node:assert/strict";
import {
  bestResponse,
  customDiscriminator,
  customGenerator,
  diracGame,
  finiteDifferenceGradients,
  gameGradients,
  gameValue,
  gaussianData,
  gaussianGenerator,
  gradientFieldGrid,
  locationGame,
  logisticDiscriminator,
  mixtureData,
  mixtureWeightGenerator,
  optimalProfile,
  parametricGame,
  SaddleError,
  simulateTraining,
  stability,
  valueSurface,
} from "../../mod.ts";
import { assertClose, maxRelError } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";

const f64 = (...x: number[]) => Float64Array.from(x);

Deno.test("Dirac game: equilibrium (0, 0), Jacobian eigenvalues ±i f'(0) = ±i/2 (Mescheder et al. 2018, Sec. 2)", () => {
  const game = diracGame();
  assert.deepEqual([...game.equilibrium!.theta, ...game.equilibrium!.phi], [0, 0]);
  const s = stability(game, { at: { theta: [0], phi: [0] }, learningRate: 0.1 });
  assert.ok(s.fieldNorm < 1e-15);
  assert.equal(s.eigenvalues.length, 2);
  for (const e of s.eigenvalues) {
    assertClose(e.re, 0, { abs: 1e-9 });
    assertClose(Math.abs(e.im), 0.5, { abs: 1e-9 });
  }
  // Simultaneous steps: |1 ± i h/2| = sqrt(1 + h²/4) > 1; alternating: on the unit circle.
  assertClose(s.simultaneous.spectralRadius, Math.sqrt(1 + 0.01 / 4), { rel: 1e-8 });
  assertClose(s.alternating.spectralRadius, 1, { rel: 1e-8 });
  assert.equal(s.simultaneous.verdict, "unstable");
  assert.equal(s.alternating.verdict, "neutral");
});

Deno.test("Dirac game: simultaneous steps spiral out, alternating steps do not converge (Mescheder et al. 2018, Sec. 2.2)", () => {
  const game = diracGame();
  const opts = { start: { theta: [1], phi: [0] }, steps: 1000, learningRate: 0.1, k: 1 } as const;
  const sim = simulateTraining(game, { ...opts, updates: "simultaneous" });
  assert.equal(sim.verdict, "diverged", sim.reason);
  const d = sim.trajectory.distance;
  assert.ok(d[d.length - 1] > 1.5 * d[0]);
  const alt = simulateTraining(game, { ...opts, updates: "alternating" });
  assert.equal(alt.verdict, "cycling", alt.reason);
  assert.ok(alt.finalDistance > 0.5);
  // Linearised period 2π / acos(1 − h² f'(0)² / 2) ≈ 125.7 generator steps at h = 0.1.
  assertClose(alt.period, (2 * Math.PI) / Math.acos(1 - 0.01 / 8), { rel: 0.1 });
});

Deno.test("Dirac game with R1 (γ > 0): eigenvalues (−γ ± sqrt(γ² − 1))/2 with negative real part, training converges (Mescheder et al. 2018, Thm. 4.1)", () => {
  for (const gamma of [0.3, 1, 2]) {
    const game = diracGame({ r1: gamma });
    const s = stability(game);
    const disc = gamma * gamma - 1;
    const expected = disc >= 0
      ? [{ re: (-gamma - Math.sqrt(disc)) / 2, im: 0 }, {
        re: (-gamma + Math.sqrt(disc)) / 2,
        im: 0,
      }]
      : [{ re: -gamma / 2, im: -Math.sqrt(-disc) / 2 }, {
        re: -gamma / 2,
        im: Math.sqrt(-disc) / 2,
      }];
    for (const [i, e] of s.eigenvalues.entries()) {
      assert.ok(e.re < 0);
      // A double root (γ = 1) splits by ~sqrt(rounding) under finite differences.
      assertClose(e.re, expected[i].re, { abs: gamma === 1 ? 1e-4 : 1e-8 });
      assertClose(e.im, expected[i].im, { abs: gamma === 1 ? 1e-4 : 1e-8 });
    }
    for (const updates of ["simultaneous", "alternating"] as const) {
      const sim = simulateTraining(game, {
        start: { theta: [1], phi: [0] },
        steps: 1500,
        learningRate: 0.1,
        updates,
        k: 1,
      });
      assert.equal(sim.verdict, "converged", `γ = ${gamma}, ${updates}: ${sim.reason}`);
      assert.ok(sim.finalDistance < 1e-3);
    }
  }
});

Deno.test({
  name:
    "location game: V(D*_θ, θ) has its minimum −ln 4 at the data mean (Goodfellow et al. 2014, Thm. 1) and equals −ln 4 + 2 JSD by scipy quad",
  ignore: ignoreWithoutPython(["numpy", "scipy"]),
  fn: async () => {
    const game = locationGame({ mean: 1.5, sd: 0.8 });
    const pr = optimalProfile(game, {
      theta: { parameter: "mu", range: [-1.5, 4.5], points: 13 },
    });
    assert.equal(pr.argmin, 1.5);
    assertClose(pr.min, -Math.log(4), { abs: 1e-9 });
    const ref = await runReference<{ profile: number[] }>("game_profile.py", {
      mean: 1.5,
      sd: 0.8,
      thetas: pr.thetas,
    });
    for (const [i, v] of ref.profile.entries()) {
      assertClose(pr.value[i].value, v, { abs: 2e-6 }, `V(D*) at θ = ${pr.thetas[i]}`);
      assertClose(pr.fromJsd[i], v, { abs: 2e-6 }, `−ln 4 + 2 JSD at θ = ${pr.thetas[i]}`);
      // The linear family contains D* (equal variances): its best response reaches the profile.
      assertClose(pr.restricted![i], v, { abs: 2e-6 }, `max_φ V at θ = ${pr.thetas[i]}`);
    }
  },
});

Deno.test("best response maximises V and equals D* where the family expresses it (Goodfellow et al. 2014, Prop. 1)", () => {
  // 2-D location-scale generator against quadratic logistic D: log p_data − log p_g is quadratic.
  const game = parametricGame({
    data: gaussianData({ mean: [0.5, -0.3], sd: [1, 0.7] }),
    generator: gaussianGenerator({ d: 2, family: "location-scale" }),
    discriminator: logisticDiscriminator({ d: 2, features: "quadratic" }),
  });
  const theta = f64(-0.2, 0.4, 1.3, 0.9);
  const br = bestResponse(game, { theta });
  const dStar = game.discriminator.express!(game.data, game.generator, theta)!;
  // 24 x 24 Gauss–Hermite nodes: the quadrature error of V moves the optimum by ~1e-6.
  for (const [j, v] of dStar.entries()) assertClose(br.phi[j], v, { abs: 1e-5 }, `φ[${j}]`);
  for (let j = 0; j < br.phi.length; j++) {
    for (const s of [-1e-3, 1e-3]) {
      const phi = Float64Array.from(br.phi);
      phi[j] += s;
      assert.ok(gameValue(game, phi, theta) < br.value);
    }
  }
  // A family that cannot express D* (linear features, unequal variances) still maximises V,
  // and stays below the optimal value V(D*, G).
  const lin = parametricGame({
    data: gaussianData({ mean: 0, sd: 1 }),
    generator: gaussianGenerator({ family: "location-scale" }),
    discriminator: logisticDiscriminator(),
  });
  const t = f64(1, 2);
  const brl = bestResponse(lin, { theta: t });
  assert.equal(lin.discriminator.express!(lin.data, lin.generator, t), undefined);
  const full = optimalProfile(lin, {
    theta: { parameter: "mu", range: [1, 2], points: 2 },
    at: { theta: [1, 2], phi: [0, 0] },
    restricted: false,
  });
  assert.ok(brl.value < full.value[0].value - 1e-3);
});

Deno.test("closed-form gradients match central differences to 1e-6 relative (common practice, no source)", () => {
  const cases = [
    {
      game: parametricGame({
        data: gaussianData({ mean: [0.5, -0.3], sd: [1, 0.7] }),
        generator: gaussianGenerator({ d: 2, family: "location-scale" }),
        discriminator: logisticDiscriminator({ d: 2, features: "quadratic" }),
      }),
      phi: f64(0.1, -0.4, 0.3, -0.2, 0.15, -0.1),
      theta: f64(-0.2, 0.4, 1.3, 0.9),
    },
    {
      game: parametricGame({
        data: mixtureData({ means: [-2, 2], sd: 0.6, weights: [0.3, 0.7] }),
        generator: mixtureWeightGenerator({ means: [-2, 2], sd: 0.6 }),
        discriminator: logisticDiscriminator({ features: "quadratic" }),
      }),
      phi: f64(0.2, 0.5, -0.1),
      theta: f64(0.4),
    },
    { game: locationGame({ mean: 1 }), phi: f64(0.3, -0.7), theta: f64(-0.5) },
  ];
  for (const { game, phi, theta } of cases) {
    for (const loss of ["minimax", "non-saturating"] as const) {
      const cf = gameGradients(game, phi, theta, { loss, penalty: null });
      const fd = finiteDifferenceGradients(game, phi, theta, { loss, step: 1e-5 });
      assert.ok(maxRelError(fd.gradPhi, cf.gradPhi) < 1e-6, `${game.name} φ ${loss}`);
      assert.ok(maxRelError(fd.gradTheta, cf.gradTheta) < 1e-6, `${game.name} θ ${loss}`);
    }
  }
  // A user's families (central differences inside) reproduce the closed forms.
  const custom = parametricGame({
    data: gaussianData({ mean: 1 }),
    generator: customGenerator({
      d: 1,
      names: ["mu"],
      logPdf: (t, x) => -0.5 * (x[0] - t[0]) ** 2,
      bounds: [[-12, 12]],
      gridSize: 4000,
    }),
    discriminator: customDiscriminator({
      d: 1,
      names: ["b", "w"],
      logit: (p, x) => p[0] + p[1] * x[0],
    }),
  });
  const ref = locationGame({ mean: 1 });
  const a = gameGradients(custom, f64(0.3, -0.7), f64(-0.5));
  const b = gameGradients(ref, f64(0.3, -0.7), f64(-0.5));
  assert.ok(maxRelError(a.gradPhi, b.gradPhi) < 1e-6);
  assert.ok(maxRelError(a.gradTheta, b.gradTheta) < 1e-6);
  // The R1 penalty's gradient: γ ψ for the Dirac game (Mescheder et al. 2018, Sec. 4.1).
  const g = gameGradients(diracGame({ r1: 2 }), f64(0.5), f64(0));
  assertClose(g.gradPhi[0], -0 - 2 * 0.5, { abs: 1e-15 });
});

Deno.test("value surface: saddle of the location game at (mean, D = 1/2), best responses cross there", () => {
  const game = locationGame({ mean: 1 });
  const s = valueSurface(game, {
    x: { parameter: "mu", range: [-1, 3], points: 41 },
    y: { parameter: "w", range: [-2, 2], points: 41 },
  });
  assert.equal(s.method, "quadrature");
  assert.equal(s.saddles.length, 1);
  assertClose(s.saddles[0].x, 1, { abs: 1e-8 });
  assertClose(s.saddles[0].y, 0, { abs: 1e-8 });
  assertClose(s.saddles[0].value, -Math.log(4), { abs: 1e-12 });
  assert.ok(s.saddles[0].minimax);
  const dBest = s.bestResponses.find((c) => c.player === "discriminator")!;
  // With the bias fixed at 0 the slope's best response changes sign at θ = mean.
  const at1 = dBest.given.findIndex((t) => Math.abs(t - 1) < 1e-12);
  assertClose(dBest.best[at1], 0, { abs: 1e-3 });
  // Monte Carlo surface with common random numbers: smooth in θ (second differences small).
  const mc = parametricGame({
    data: gaussianData({ mean: 1, monteCarlo: 2000, seed: 1 }),
    generator: gaussianGenerator({ monteCarlo: 2000, seed: 2 }),
    discriminator: logisticDiscriminator(),
  });
  const sm = valueSurface(mc, {
    x: { parameter: "mu", range: [-1, 3], points: 21 },
    y: { parameter: "w", range: [-2, 2], points: 5 },
  });
  assert.equal(sm.method, "monte-carlo");
  for (let i = 1; i < 20; i++) {
    const v = sm.values;
    assert.ok(Math.abs(v[4 * 21 + i - 1] - 2 * v[4 * 21 + i] + v[4 * 21 + i + 1]) < 0.05);
  }
  const f = gradientFieldGrid(game, {
    x: { parameter: "mu", range: [-1, 3], points: 5 },
    y: { parameter: "w", range: [-2, 2], points: 5 },
  });
  assertClose(f.u[2 * 5 + 2], 0, { abs: 1e-12 }); // zero at the saddle
});

Deno.test("simulation: Alg. 1 with k D-steps, Adam, minibatches is seeded and reproducible", () => {
  const game = locationGame({ mean: 1 });
  const opts = {
    start: { theta: [-1], phi: [0, 0] },
    steps: 300,
    learningRate: { generator: 0.02, discriminator: 0.05 },
    updates: "alternating",
    k: 3,
    optimizer: "adam",
    batchSize: 32,
    seed: 5,
    loss: "non-saturating",
  } as const;
  const a = simulateTraining(game, opts), b = simulateTraining(game, opts);
  assert.deepEqual(a.trajectory.theta, b.trajectory.theta);
  assert.notDeepEqual(
    a.trajectory.theta,
    simulateTraining(game, { ...opts, seed: 6 }).trajectory.theta,
  );
  // Exact gradients, k = 5: the location game converges to its equilibrium (D = 1/2, D loss 2 ln 2).
  const ex = simulateTraining(game, {
    start: { theta: [-1], phi: [0, 0] },
    steps: 800,
    learningRate: 0.1,
    k: 5,
  });
  assert.equal(ex.verdict, "converged", ex.reason);
  const last = ex.trajectory.length - 1;
  assertClose(ex.trajectory.dLoss[last], 2 * Math.LN2, { abs: 1e-6 });
  assertClose(ex.trajectory.meanDReal[last], 0.5, { abs: 1e-6 });
});

Deno.test("bad input: zero-point grid, non-finite parameters, learning rate <= 0, k = 0", () => {
  const game = diracGame();
  const is = (code: string, re: RegExp) => (e: unknown) =>
    e instanceof SaddleError && e.code === code && re.test(e.message);
  assert.throws(
    () =>
      valueSurface(game, {
        x: { parameter: "theta", range: [-1, 1], points: 0 },
        y: { parameter: "psi", range: [-1, 1] },
      }),
    is("invalid-argument", /x\.points must be an integer >= 2/),
  );
  assert.throws(
    () =>
      valueSurface(game, {
        x: { parameter: "nope", range: [0, 1] },
        y: { parameter: "psi", range: [0, 1] },
      }),
    is("invalid-argument", /no parameter "nope"/),
  );
  const base = { start: { theta: [1], phi: [0] }, steps: 10, learningRate: 0.1, k: 1 };
  assert.throws(
    () => simulateTraining(game, { ...base, start: { theta: [NaN], phi: [0] } }),
    is("non-finite", /start\.theta\[0\] is NaN/),
  );
  assert.throws(
    () => simulateTraining(game, { ...base, learningRate: 0 }),
    is("invalid-argument", /learningRate/),
  );
  assert.throws(
    () => simulateTraining(game, { ...base, learningRate: { generator: 0.1, discriminator: -1 } }),
    is("invalid-argument", /discriminator/),
  );
  assert.throws(
    () => simulateTraining(game, { ...base, k: 0 }),
    is("invalid-argument", /k \(discriminator steps/),
  );
  assert.throws(() => stability(game, { k: 0 }), is("invalid-argument", /k/));
  assert.throws(() => stability(game, { at: [0, Infinity] }), is("non-finite", /at\[1\]/));
  assert.throws(
    () => gaussianGenerator({ family: "location-scale" }).nodes(f64(0, 0)),
    is("invalid-argument", /sigma/),
  );
});

Deno.test("the spectral radius of the update map predicts the simulation's verdict: mixture-weight game, ρ > 1 at h = 0.2 (a period-2 cycle), ρ < 1 at h = 0.1 (Mescheder et al. 2017, linearised update maps)", () => {
  const game = parametricGame({
    data: mixtureData({ means: [-2, 2], sd: 0.6, weights: [0.3, 0.7] }),
    generator: mixtureWeightGenerator({ means: [-2, 2], sd: 0.6 }),
    discriminator: logisticDiscriminator({ features: "quadratic" }),
  });
  // No equilibrium given: located by Newton's method at w2 = 0.7 (the data's weight), D = 1/2.
  const at = stability(game, { learningRate: 0.2 });
  assertClose(at.at[0], 0.7, { abs: 1e-9 });
  assert.ok(at.alternating.spectralRadius > 1);
  const opts = { start: { theta: [0.2], phi: [0, 0, 0] }, steps: 800, k: 1 } as const;
  const fast = simulateTraining(game, { ...opts, learningRate: 0.2 });
  assert.equal(fast.verdict, "cycling", fast.reason);
  assertClose(fast.period, 2, { abs: 0.01 });
  assert.ok(stability(game, { learningRate: 0.1 }).alternating.spectralRadius < 1);
  const slow = simulateTraining(game, { ...opts, learningRate: 0.1 });
  assert.equal(slow.verdict, "converged", slow.reason);
});
