/**
 * The game figures draw what their results hold: a saddle marker, best-response curves,
 * equilibrium lines at 2 ln 2, 1/2 and ln 2, eigenvalues and the unit circle, per-mode bars.
 */
import assert from "node:assert/strict";
import {
  diracGame,
  gradientFieldGrid,
  locationGame,
  modeCoverage,
  plotEigenvalues,
  plotGradientField,
  plotModeCoverage,
  plotPhaseSnapshots,
  plotTrainingCurves,
  plotValueSurface,
  ringOfGaussians,
  simulateTraining,
  stability,
  trainNeuralGan,
  valueSurface,
} from "../../mod.ts";
import { all, parseSvg } from "./_svg.ts";

const texts = (svg: string) => all(parseSvg(svg), "text").map((t) => t.textContent ?? "");

Deno.test("figures: value surface, gradient field and training curves of the Dirac and location games", () => {
  const game = diracGame();
  const surface = valueSurface(game, {
    x: { parameter: "theta", range: [-2, 2], points: 21 },
    y: { parameter: "psi", range: [-2, 2], points: 21 },
  });
  const sim = simulateTraining(game, {
    start: { theta: [1], phi: [0] },
    steps: 400,
    learningRate: 0.1,
    updates: "simultaneous",
    k: 1,
  });
  const t1 = texts(plotValueSurface(surface, { trajectories: [sim] }).toSVG());
  assert.ok(t1.some((t) => /saddle at \(0, 0\)/.test(t)), t1.join("|"));
  assert.ok(t1.some((t) => /best response/.test(t)));
  const field = gradientFieldGrid(game, {
    x: { parameter: "theta", range: [-2, 2] },
    y: { parameter: "psi", range: [-2, 2] },
  });
  const svg = plotGradientField(field, { trajectories: [sim] }).toSVG();
  assert.ok(texts(svg).some((t) => /simultaneous, k = 1, h = 0.1: diverged/.test(t)));
  const loc = simulateTraining(locationGame(), {
    start: { theta: [2], phi: [0, 0] },
    steps: 300,
    learningRate: 0.1,
    k: 3,
    loss: "non-saturating",
  });
  const t3 = texts(plotTrainingCurves(loc).toSVG());
  for (const label of ["2 ln 2", "1/2", "ln 2"]) assert.ok(t3.includes(label), label);
});

Deno.test("figures: eigenvalues with the stability region, mode coverage bars, phase snapshots", () => {
  const s = stability(diracGame({ r1: 0.5 }), { learningRate: 0.2 });
  const t = texts(plotEigenvalues(s).toSVG());
  assert.ok(t.some((x) => /alternating ρ = /.test(x)));
  const ring = ringOfGaussians();
  const c = modeCoverage(
    ringOfGaussians({ weights: [1, 1, 0, 0, 1, 1, 0, 0] }).sample(300, 1),
    ring.modes!,
    {
      replicates: 30,
    },
  );
  const tc = texts(plotModeCoverage(c).toSVG());
  assert.equal(tc.filter((x) => x === "missed").length, 4);
  const run = trainNeuralGan({
    data: ring,
    steps: 30,
    hidden: [8],
    recordEvery: 10,
    theory: false,
    seed: 1,
  });
  const tp = texts(plotPhaseSnapshots(run, { steps: [0, 30] }).toSVG());
  assert.ok(tp.includes("step 0") && tp.includes("step 30"));
});
