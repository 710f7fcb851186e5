/**
 * Games and training dynamics: parametric GAN games (data, generator family θ,
 * discriminator family φ), value surfaces with saddle points and best responses, the
 * optimal-discriminator profile, gradient fields, simulated training by Alg. 1 with a
 * verdict, local stability, and a small neural lab on the CPU.
 *
 * @example A value surface with its saddle, and a simulation with k D-steps
 * ```ts
 * import { diracGame, simulateTraining, stability, valueSurface } from "./mod.ts";
 * import assert from "node:assert/strict";
 * const game = diracGame();
 * const surface = valueSurface(game, {
 *   x: { parameter: "theta", range: [-2, 2], points: 21 },
 *   y: { parameter: "psi", range: [-2, 2], points: 21 },
 * });
 * const sim = simulateTraining(game, {
 *   start: { theta: [1], phi: [0] }, steps: 500, learningRate: 0.1, updates: "simultaneous", k: 1,
 * });
 * assert.equal(surface.saddles.length, 1);
 * assert.equal(sim.verdict, "diverged");
 * assert.ok(stability(game).eigenvalues.every((e) => Math.abs(e.re) < 1e-9));
 * ```
 *
 * @module
 */
export * from "./families.ts";
export * from "./game.ts";
export * from "./value_surface.ts";
export * from "./gradient_field_grid.ts";
export * from "./simulate_training.ts";
export * from "./stability.ts";
export type { GamePoint, GridAxis, LearningRate, ParameterRef } from "./_parameters.ts";
// Types of other folders that this folder's API mentions, re-exported so the module documents alone.
export type { RandomSource, Rng } from "../random/rng.ts";
export type { Samples } from "../samples/samples.ts";
export type { Density, DensityDescription } from "../density/types.ts";
export type { Estimate, EstimateUnit } from "../estimate/estimate.ts";
export type { Complex } from "../linalg/general_eigen.ts";
export * from "./synthetic_sets.ts";
export * from "./mlp.ts";
export * from "./neural_lab.ts";
