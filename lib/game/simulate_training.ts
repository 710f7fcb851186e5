/**
 * Simulated training of a parametric game by Goodfellow et al.'s Alg. 1 (k discriminator
 * steps per generator step), with alternating or simultaneous updates, two time-scales,
 * SGD / momentum / Adam, penalties, minibatch noise, and a verdict with its evidence.
 *
 * @module
 */
import { withDisplay } from "../display/mod.ts";
import { formatNumber, htmlTable, textTable } from "../display/mod.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import type { RandomSource } from "../random/rng.ts";
import { fmtVec } from "./families.ts";
import { type Game, gameGradients, type GeneratorLoss, type Penalty } from "./game.ts";
import { locateEquilibrium } from "./stability.ts";
import { type Optimizer, Stepper } from "./_optimizer.ts";
import {
  checkK,
  type GamePoint,
  type LearningRate,
  learningRates,
  stackPoint,
} from "./_parameters.ts";

export type { Optimizer };

/** Options of {@linkcode simulateTraining}. */
export interface SimulationOptions {
  /** The start: `{ theta, phi }` or [θ…, φ…]. */
  start: GamePoint;
  /** Generator steps (iterations of Alg. 1). */
  steps: number;
  /** Learning rate of both players, or `{ generator, discriminator }` (two time-scales). */
  learningRate: LearningRate;
  /** "alternating" (default: D steps, then G at the new D) or "simultaneous". */
  updates?: "simultaneous" | "alternating";
  /** Discriminator steps per generator step (default 1). */
  k?: number;
  /** "sgd" (default), "momentum" or "adam". */
  optimizer?: Optimizer;
  /** Momentum coefficient (default 0.9) or Adam's β1 (default 0.9). */
  beta1?: number;
  /** Adam's β2 (default 0.999). */
  beta2?: number;
  /** Generator loss (default the game's). */
  loss?: GeneratorLoss;
  /** Penalty (default the game's; null for none). */
  penalty?: Penalty | null;
  /** Weight decay on φ (default 0). */
  weightDecay?: number;
  /** Minibatch size m: seeded noise in every gradient (default: exact expectations). */
  batchSize?: number;
  /** Seed of the minibatches (default 0). */
  seed?: RandomSource;
  /** Convergence tolerance on the distance to the equilibrium (default 1e-3). */
  tolerance?: number;
  /** The equilibrium to measure distances to (default: the game's, else located). */
  equilibrium?: GamePoint;
  /** Called every 100 generator steps with (done, total). */
  onProgress?: (done: number, total: number) => void;
}

/** Per-step records; row t is the state after t generator steps (row 0: the start). */
export interface Trajectory {
  /** Rows (steps + 1). */
  readonly length: number;
  /** θ, row-major (length x p). */
  readonly theta: Float64Array;
  /** φ, row-major (length x q). */
  readonly phi: Float64Array;
  /** V(φ, θ). */
  readonly value: Float64Array;
  /** The discriminator's loss −V (2 ln 2 at the equilibrium). */
  readonly dLoss: Float64Array;
  /** The generator's loss. */
  readonly gLoss: Float64Array;
  /** Mean D on the data. */
  readonly meanDReal: Float64Array;
  /** Mean D on generated points. */
  readonly meanDFake: Float64Array;
  /** Euclidean distance of (θ, φ) to the equilibrium (NaN when none is known). */
  readonly distance: Float64Array;
}

/** The verdict and what it rests on. */
export interface Verdict {
  /** "converged", "cycling" or "diverged". */
  readonly verdict: "converged" | "cycling" | "diverged";
  /** One sentence of evidence. */
  readonly reason: string;
  /** Distance to the equilibrium at the end. */
  readonly finalDistance: number;
  /** The tolerance. */
  readonly tolerance: number;
  /** Mean distance over the last quarter / mean over the second quarter. */
  readonly growth: number;
  /** Period of the oscillation in generator steps (NaN when none is seen). */
  readonly period: number;
  /** Half the range of the distance over the last quarter. */
  readonly amplitude: number;
}

/** Result of {@linkcode simulateTraining}. */
export interface Simulation extends Verdict {
  /** Per-step records. */
  readonly trajectory: Trajectory;
  /** Parameter names, θ then φ. */
  readonly names: readonly string[];
  /** The equilibrium distances are measured to, stacked [θ…, φ…]. */
  readonly equilibrium?: Float64Array;
  /** The settings, for displays and figures. */
  readonly settings: {
    readonly updates: "simultaneous" | "alternating";
    readonly k: number;
    readonly learningRate: { readonly generator: number; readonly discriminator: number };
    readonly optimizer: Optimizer;
    readonly loss: GeneratorLoss;
    readonly penalty?: Penalty;
    readonly batchSize?: number;
  };
}

/**
 * Simulate training (Goodfellow et al. 2014, Alg. 1): every generator step is preceded by k
 * discriminator steps. "alternating": each step uses the other player's latest parameters;
 * "simultaneous": k − 1 discriminator steps, then both players step from the same point.
 * Separate learning rates give the two time-scale rule (Heusel et al. 2017). Gradients are
 * exact expectations, or seeded minibatches of `batchSize` per side.
 *
 * The verdict reads the distance r_t to the equilibrium: "diverged" when r grows (the last
 * quarter's mean exceeds the second quarter's by 10 %, or r becomes non-finite); "converged"
 * when r ends within `tolerance`, or decays (last/second quarter < 0.9), or the iterates
 * stop moving; otherwise "cycling" (bounded, not decaying), with the period from the mean
 * crossings of the coordinate that varies most over the second half.
 *
 * References: Goodfellow et al. 2014 (NeurIPS), Alg. 1; Heusel et al. 2017 (NeurIPS);
 * Mescheder, Geiger & Nowozin 2018 (ICML); Kingma & Ba 2015 (ICLR) for Adam; Polyak 1964
 * for momentum.
 *
 * @example Alternating steps cycle around the Dirac game's equilibrium
 * ```ts
 * import { simulateTraining } from "./simulate_training.ts";
 * import { diracGame } from "./game.ts";
 * import assert from "node:assert/strict";
 * const sim = simulateTraining(diracGame(), {
 *   start: { theta: [1], phi: [0] }, steps: 600, learningRate: 0.2, updates: "alternating", k: 1,
 * });
 * assert.equal(sim.verdict, "cycling");
 * assert.ok(sim.period > 50 && sim.period < 80); // 2π / acos(1 − h²/8) ≈ 63
 * ```
 */
export function simulateTraining(game: Game, options: SimulationOptions): Simulation {
  const p = game.generator.names.length, q = game.discriminator.names.length;
  const z = stackPoint(game, options.start, "start");
  const steps = options.steps;
  if (!Number.isInteger(steps) || steps < 4) {
    throw new SaddleError("invalid-argument", `steps must be an integer >= 4, got ${steps}`, {
      parameter: "steps",
    });
  }
  const lr = learningRates(options.learningRate);
  const k = checkK(options.k ?? 1);
  const updates = options.updates ?? "alternating";
  if (updates !== "alternating" && updates !== "simultaneous") {
    throw new SaddleError(
      "invalid-argument",
      `updates must be "alternating" or "simultaneous", got ${updates}`,
      { parameter: "updates" },
    );
  }
  const optimizer = options.optimizer ?? "sgd";
  if (!["sgd", "momentum", "adam"].includes(optimizer)) {
    throw new SaddleError("invalid-argument", `optimizer must be sgd, momentum or adam`, {
      parameter: "optimizer",
    });
  }
  const bs = options.batchSize;
  if (bs !== undefined && (!Number.isInteger(bs) || bs < 1)) {
    throw new SaddleError("invalid-argument", `batchSize must be an integer >= 1, got ${bs}`, {
      parameter: "batchSize",
    });
  }
  const tol = options.tolerance ?? 1e-3;
  const loss = options.loss ?? game.loss;
  const penalty = options.penalty === null ? undefined : options.penalty ?? game.penalty;
  const b1 = options.beta1 ?? 0.9, b2 = options.beta2 ?? 0.999;
  const sG = new Stepper(p, optimizer, lr.generator, b1, b2);
  const sD = new Stepper(q, optimizer, lr.discriminator, b1, b2);
  const theta = z.slice(0, p), phi = z.slice(p);
  let eq: Float64Array | undefined;
  if (options.equilibrium !== undefined) eq = stackPoint(game, options.equilibrium, "equilibrium");
  else if (game.equilibrium) {
    eq = Float64Array.of(...game.equilibrium.theta, ...game.equilibrium.phi);
  } else eq = locateEquilibrium(game, { start: z, loss, penalty: penalty ?? null });
  const gopts = {
    loss,
    penalty: penalty ?? null,
    weightDecay: options.weightDecay ?? 0,
    ...(bs !== undefined ? { batchSize: bs } : {}),
  };
  const seed = String(options.seed ?? 0);
  let calls = 0;
  const grads = () =>
    gameGradients(
      game,
      phi,
      theta,
      bs !== undefined ? { ...gopts, seed: `${seed}/${calls++}` } : gopts,
    );
  const N = steps + 1;
  const tr = {
    length: N,
    theta: new Float64Array(N * p),
    phi: new Float64Array(N * q),
    value: new Float64Array(N),
    dLoss: new Float64Array(N),
    gLoss: new Float64Array(N),
    meanDReal: new Float64Array(N),
    meanDFake: new Float64Array(N),
    distance: new Float64Array(N),
  };
  const exactOpts = { loss, penalty: null } as const;
  let rows = 0;
  const record = (t: number) => {
    tr.theta.set(theta, t * p);
    tr.phi.set(phi, t * q);
    let dist = NaN;
    if (eq) {
      let s = 0;
      for (let j = 0; j < p; j++) s += (theta[j] - eq[j]) ** 2;
      for (let j = 0; j < q; j++) s += (phi[j] - eq[p + j]) ** 2;
      dist = Math.sqrt(s);
    }
    tr.distance[t] = dist;
    let g;
    try {
      g = gameGradients(game, phi, theta, exactOpts);
    } catch {
      g = undefined;
    }
    tr.value[t] = g?.value ?? NaN;
    tr.dLoss[t] = g?.dLoss ?? NaN;
    tr.gLoss[t] = g?.gLoss ?? NaN;
    tr.meanDReal[t] = g?.meanDReal ?? NaN;
    tr.meanDFake[t] = g?.meanDFake ?? NaN;
    rows = t + 1;
  };
  record(0);
  let broke = "";
  for (let t = 1; t <= steps; t++) {
    try {
      const dSteps = updates === "alternating" ? k : k - 1;
      for (let r = 0; r < dSteps; r++) sD.apply(phi, grads().gradPhi);
      const g = grads();
      if (updates === "simultaneous") sD.apply(phi, g.gradPhi);
      sG.apply(theta, g.gradTheta.map((x) => -x));
    } catch (e) {
      broke = e instanceof Error ? e.message : String(e);
    }
    if (broke || ![...theta, ...phi].every(Number.isFinite)) {
      broke ||= "parameters became non-finite";
      break;
    }
    record(t);
    if (options.onProgress && t % 100 === 0) options.onProgress(t, steps);
  }
  const trajectory: Trajectory = rows === N ? tr : truncate(tr, rows, p, q);
  const verdict = judge(trajectory, p, q, eq, tol, broke, steps);
  const sim: Simulation = {
    ...verdict,
    trajectory,
    names: [...game.generator.names, ...game.discriminator.names],
    ...(eq ? { equilibrium: eq } : {}),
    settings: {
      updates,
      k,
      learningRate: lr,
      optimizer,
      loss,
      ...(penalty ? { penalty } : {}),
      ...(bs !== undefined ? { batchSize: bs } : {}),
    },
  };
  return withDisplay(sim, (s) => {
    const last = s.trajectory.length - 1;
    const at = (t: number) => [
      ...Array.from(s.trajectory.theta.subarray(t * p, (t + 1) * p)),
      ...Array.from(s.trajectory.phi.subarray(t * q, (t + 1) * q)),
    ];
    const rowsOut = [
      ["verdict", s.verdict],
      ["evidence", s.reason],
      ["updates", `${s.settings.updates}, k = ${s.settings.k}, ${s.settings.optimizer}`],
      [
        "learning rates (G / D)",
        `${s.settings.learningRate.generator} / ${s.settings.learningRate.discriminator}`,
      ],
      ["generator loss", s.settings.loss],
      [
        "penalty",
        s.settings.penalty
          ? `${s.settings.penalty.kind.toUpperCase()}, γ = ${s.settings.penalty.weight}`
          : "none",
      ],
      ["start", `${s.names.join(", ")} = ${fmtVec(at(0))}`],
      [`end (step ${last})`, fmtVec(at(last))],
      ["distance to equilibrium (end)", formatNumber(s.finalDistance)],
      ["V at the end", formatNumber(s.trajectory.value[last])],
      ["period (G steps)", Number.isFinite(s.period) ? formatNumber(s.period) : "none seen"],
    ];
    const title = `Simulated training: ${game.name}`;
    return {
      "text/plain": `${title}\n${textTable(["", ""], rowsOut)}`,
      "text/html": htmlTable(["", ""], rowsOut, title),
    };
  });
}

function truncate(tr: Trajectory, rows: number, p: number, q: number): Trajectory {
  return {
    length: rows,
    theta: tr.theta.slice(0, rows * p),
    phi: tr.phi.slice(0, rows * q),
    value: tr.value.slice(0, rows),
    dLoss: tr.dLoss.slice(0, rows),
    gLoss: tr.gLoss.slice(0, rows),
    meanDReal: tr.meanDReal.slice(0, rows),
    meanDFake: tr.meanDFake.slice(0, rows),
    distance: tr.distance.slice(0, rows),
  };
}

function mean(x: Float64Array, from: number, to: number): number {
  let s = 0;
  for (let i = from; i < to; i++) s += x[i];
  return s / Math.max(1, to - from);
}

function judge(
  tr: Trajectory,
  p: number,
  q: number,
  eq: Float64Array | undefined,
  tol: number,
  broke: string,
  steps: number,
): Verdict {
  const N = tr.length;
  // Without an equilibrium, the movement per step stands in for the distance.
  const r = eq ? tr.distance : movement(tr, p, q);
  const fin = r[N - 1];
  const base = { finalDistance: eq ? fin : NaN, tolerance: tol };
  if (broke || N < steps + 1) {
    return {
      ...base,
      verdict: "diverged",
      reason: `stopped at step ${N - 1} of ${steps}: ${broke}`,
      growth: Infinity,
      period: NaN,
      amplitude: NaN,
    };
  }
  const q1 = Math.floor(N / 4), q2 = Math.floor(N / 2), q3 = Math.floor((3 * N) / 4);
  const mid = mean(r, q1, q2), late = mean(r, q3, N);
  const growth = late / Math.max(mid, 1e-300);
  let lo = Infinity, hi = -Infinity;
  for (let i = q3; i < N; i++) {
    lo = Math.min(lo, r[i]);
    hi = Math.max(hi, r[i]);
  }
  const amplitude = (hi - lo) / 2;
  // Period from the crossings of its mean, over the second half, by the coordinate that
  // varies most there.
  const period = oscillationPeriod(tr, p, q, q2);
  const out = (verdict: Verdict["verdict"], reason: string): Verdict => ({
    ...base,
    verdict,
    reason,
    growth,
    period: verdict === "cycling" ? period : NaN,
    amplitude,
  });
  const f = (x: number) => formatNumber(x, 3);
  const what = eq ? "distance to the equilibrium" : "movement per step";
  if (eq && fin <= tol) {
    return out("converged", `${what} ${f(fin)} <= tolerance ${f(tol)} at the end`);
  }
  if (!eq && fin <= tol * 1e-3) {
    return out(
      "converged",
      `the iterates stopped moving (${f(fin)} per step); no equilibrium known`,
    );
  }
  if (growth > 1.1) {
    return out(
      "diverged",
      `${what} grows: last quarter's mean is ${f(growth)}x the second quarter's`,
    );
  }
  if (growth < 0.9) {
    return out(
      "converged",
      `${what} decays (last quarter's mean is ${f(growth)}x the second quarter's), ` +
        `${f(fin)} at the end; not yet within tolerance ${f(tol)}: run longer to reach it`,
    );
  }
  return out(
    "cycling",
    `${what} stays bounded without decaying (last/second quarter ${f(growth)}, between ` +
      `${f(lo)} and ${f(hi)})${Number.isFinite(period) ? `, period ≈ ${f(period)} steps` : ""}`,
  );
}

function oscillationPeriod(tr: Trajectory, p: number, q: number, from: number): number {
  const N = tr.length, n = p + q;
  const at = (t: number, c: number) => (c < p ? tr.theta[t * p + c] : tr.phi[t * q + c - p]);
  let best = -1, bestVar = 0, bestMean = 0;
  for (let c = 0; c < n; c++) {
    let m = 0;
    for (let t = from; t < N; t++) m += at(t, c) / (N - from);
    let v = 0;
    for (let t = from; t < N; t++) v += (at(t, c) - m) ** 2;
    if (v > bestVar) {
      bestVar = v;
      best = c;
      bestMean = m;
    }
  }
  if (best < 0) return NaN;
  const crossings: number[] = [];
  let prev = at(from, best) - bestMean;
  for (let t = from + 1; t < N; t++) {
    const cur = at(t, best) - bestMean;
    if ((cur > 0) !== (prev > 0) && cur !== 0) crossings.push(t);
    prev = cur;
  }
  return crossings.length >= 3
    ? (2 * (crossings[crossings.length - 1] - crossings[0])) / (crossings.length - 1)
    : NaN;
}

function movement(tr: Trajectory, p: number, q: number): Float64Array {
  const out = new Float64Array(tr.length);
  for (let t = 1; t < tr.length; t++) {
    let s = 0;
    for (let j = 0; j < p; j++) s += (tr.theta[t * p + j] - tr.theta[(t - 1) * p + j]) ** 2;
    for (let j = 0; j < q; j++) s += (tr.phi[t * q + j] - tr.phi[(t - 1) * q + j]) ** 2;
    out[t] = Math.sqrt(s);
  }
  out[0] = out[1];
  return out;
}
