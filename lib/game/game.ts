/**
 * A parametric GAN game: data, a generator family with parameters θ and a discriminator
 * family with parameters φ; the value V(φ, θ), both players' losses and their gradients.
 *
 * @module
 */
import { logSigmoid, sigmoid } from "../math/mod.ts";
import { withDisplay } from "../display/mod.ts";
import { htmlTable, textTable } from "../display/mod.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import type { RandomSource } from "../random/rng.ts";
import { luSolve } from "../linalg/lu_solve.ts";
import { toParams } from "./_vectors.ts";
import {
  CENTRAL_DIFFERENCE_STEP,
  type DataDistribution,
  diracData,
  type DiscriminatorFamily,
  fmtVec,
  gaussianData,
  gaussianGenerator,
  type GeneratorFamily,
  type GeneratorNodes,
  logisticDiscriminator,
  type WeightedPoints,
} from "./families.ts";

/** A gradient penalty on the discriminator: R1 on real data, R2 on generated data. */
export interface Penalty {
  /** "r1" (E_data), "r2" (E_g) (Mescheder et al. 2018, Sec. 4.1). */
  readonly kind: "r1" | "r2";
  /** γ: the discriminator maximises V − (γ/2) E ||∇_x logit D||². */
  readonly weight: number;
}

/** The generator's loss: minimax E_g ln(1 − D) or non-saturating −E_g ln D. */
export type GeneratorLoss = "minimax" | "non-saturating";

/** A parametric game (see {@linkcode parametricGame}). */
export interface Game {
  /** A name for displays. */
  readonly name: string;
  /** The data distribution. */
  readonly data: DataDistribution;
  /** The generator family (θ). */
  readonly generator: GeneratorFamily;
  /** The discriminator family (φ). */
  readonly discriminator: DiscriminatorFamily;
  /** The default gradient penalty (none when undefined). */
  readonly penalty?: Penalty;
  /** The generator loss the simulation uses by default (default "minimax"). */
  readonly loss: GeneratorLoss;
  /** A known equilibrium (θ*, φ*). */
  readonly equilibrium?: { readonly theta: Float64Array; readonly phi: Float64Array };
}

/** Options of {@linkcode parametricGame}. */
export interface GameOptions {
  /** The data distribution. */
  data: DataDistribution;
  /** The generator family. */
  generator: GeneratorFamily;
  /** The discriminator family. */
  discriminator: DiscriminatorFamily;
  /** A gradient penalty. */
  penalty?: Penalty;
  /** Generator loss (default "minimax"). */
  loss?: GeneratorLoss;
  /** A known equilibrium. */
  equilibrium?: { theta: ArrayLike<number>; phi: ArrayLike<number> };
  /** A name (default from the families). */
  name?: string;
}

/**
 * A game from its three parts. V(φ, θ) = E_data[ln D_φ(x)] + E_{p_θ}[ln(1 − D_φ(x))]; the
 * discriminator ascends V (minus a penalty), the generator descends V (minimax) or
 * −E_{p_θ} ln D_φ (non-saturating).
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Eq. 1.
 *
 * @example
 * ```ts
 * import { parametricGame } from "./game.ts";
 * import { gaussianData, gaussianGenerator, logisticDiscriminator } from "./families.ts";
 * import assert from "node:assert/strict";
 * const game = parametricGame({
 *   data: gaussianData({ mean: 0 }),
 *   generator: gaussianGenerator(),
 *   discriminator: logisticDiscriminator(),
 * });
 * assert.equal(game.generator.names[0], "mu");
 * ```
 */
export function parametricGame(options: GameOptions): Game {
  const { data, generator, discriminator } = options;
  if (data.d !== generator.d || data.d !== discriminator.d) {
    throw new SaddleError(
      "dimension-mismatch",
      `data (d = ${data.d}), generator (d = ${generator.d}) and discriminator ` +
        `(d = ${discriminator.d}) must share a dimension`,
      { parameter: "generator" },
    );
  }
  if (options.penalty) checkPenalty(options.penalty);
  const game: Game = {
    name: options.name ?? `${generator.label} vs ${discriminator.label}`,
    data,
    generator,
    discriminator,
    ...(options.penalty && options.penalty.weight > 0 ? { penalty: options.penalty } : {}),
    loss: options.loss ?? "minimax",
    ...(options.equilibrium
      ? {
        equilibrium: {
          theta: toParams(options.equilibrium.theta, generator.names.length, "equilibrium.theta"),
          phi: toParams(options.equilibrium.phi, discriminator.names.length, "equilibrium.phi"),
        },
      }
      : {}),
  };
  return withDisplay(game, (g) => {
    const rows: [string, string][] = [
      ["data", g.data.label],
      ["generator", `${g.generator.label}; θ = (${g.generator.names.join(", ")})`],
      ["discriminator", `${g.discriminator.label}; φ = (${g.discriminator.names.join(", ")})`],
      ["expectations", `${g.data.expectation} (data), ${g.generator.expectation} (generator)`],
      ["gradients", `${g.generator.gradient} (θ), ${g.discriminator.gradient} (φ)`],
      ["penalty", g.penalty ? `${g.penalty.kind.toUpperCase()}, γ = ${g.penalty.weight}` : "none"],
      ["generator loss", g.loss],
      [
        "equilibrium",
        g.equilibrium ? `θ = ${fmtVec(g.equilibrium.theta)}, φ = ${fmtVec(g.equilibrium.phi)}` : "",
      ],
    ];
    return {
      "text/plain": `${g.name}\n${textTable(["part", ""], rows)}`,
      "text/html": htmlTable(["part", ""], rows, g.name),
    };
  });
}

function checkPenalty(p: Penalty): void {
  if (p.kind !== "r1" && p.kind !== "r2") {
    throw new SaddleError("invalid-argument", `penalty.kind must be "r1" or "r2", got ${p.kind}`, {
      parameter: "penalty",
    });
  }
  if (!(p.weight >= 0) || !Number.isFinite(p.weight)) {
    throw new SaddleError("invalid-argument", `penalty weight γ must be >= 0, got ${p.weight}`, {
      parameter: "penalty",
    });
  }
}

/**
 * The Dirac game (Mescheder, Geiger & Nowozin 2018, Sec. 2): data at 0, a point-mass
 * generator at θ, a linear discriminator D(x) = σ(ψ x). V = ln σ(0) + ln σ(−ψθ); the unique
 * equilibrium is (θ, ψ) = (0, 0), where the Jacobian of the gradient field has the
 * eigenvalues ±i f′(0) = ±i/2. `r1` (γ) adds the R1 penalty (γ/2) ψ², which moves them to
 * (−γ ± √(γ² − 1))/2.
 *
 * References: Mescheder, Geiger & Nowozin 2018, Which Training Methods for GANs do actually
 * Converge? (ICML), Sec. 2 and 4.1.
 *
 * @example
 * ```ts
 * import { diracGame } from "./game.ts";
 * import assert from "node:assert/strict";
 * const game = diracGame({ r1: 0.5 });
 * assert.equal(game.penalty?.weight, 0.5);
 * assert.deepEqual([...game.equilibrium!.theta, ...game.equilibrium!.phi], [0, 0]);
 * ```
 */
export function diracGame(options: { r1?: number; loss?: GeneratorLoss } = {}): Game {
  const r1 = options.r1 ?? 0;
  return parametricGame({
    name: `Dirac game${r1 > 0 ? ` with R1 (γ = ${r1})` : ""}`,
    data: diracData(0),
    generator: gaussianGenerator({ sd: 0 }),
    discriminator: logisticDiscriminator({ bias: false, names: ["psi"] }),
    penalty: { kind: "r1", weight: r1 },
    loss: options.loss ?? "minimax",
    equilibrium: { theta: [0], phi: [0] },
  });
}

/** Options of {@linkcode locationGame}. */
export interface LocationGameOptions {
  /** Mean of the Gaussian data (default 0). */
  mean?: number;
  /** Common sd of data and generator (default 1). */
  sd?: number;
  /** Discriminator features (default "linear": it contains D* here). */
  features?: "linear" | "quadratic";
  /** Penalty. */
  penalty?: Penalty;
  /** Generator loss (default "minimax"). */
  loss?: GeneratorLoss;
  /** Gauss–Hermite nodes (default 80). */
  quadrature?: number;
}

/**
 * The 1-D location game: data N(mean, sd²), generator N(θ, sd²), logistic discriminator.
 * The equilibrium is θ = mean with D = 1/2 (φ = 0) (Goodfellow et al. 2014, Thm. 1); for
 * equal variances D* is linear in x, so the linear family contains it.
 *
 * References: Goodfellow et al. 2014 (NeurIPS), Prop. 1 and Thm. 1.
 *
 * @example
 * ```ts
 * import { locationGame } from "./game.ts";
 * import assert from "node:assert/strict";
 * const game = locationGame({ mean: 1 });
 * assert.deepEqual([...game.equilibrium!.theta], [1]);
 * ```
 */
export function locationGame(options: LocationGameOptions = {}): Game {
  const mean = options.mean ?? 0, sd = options.sd ?? 1;
  const discriminator = logisticDiscriminator({ features: options.features ?? "linear" });
  return parametricGame({
    name: `1-D location game, data N(${mean}, ${sd}²)`,
    data: gaussianData({ mean, sd, quadrature: options.quadrature }),
    generator: gaussianGenerator({ sd, quadrature: options.quadrature }),
    discriminator,
    ...(options.penalty ? { penalty: options.penalty } : {}),
    loss: options.loss ?? "minimax",
    equilibrium: { theta: [mean], phi: new Array(discriminator.names.length).fill(0) },
  });
}

/** Options of {@linkcode gameGradients}. */
export interface GradientOptions {
  /** Generator loss (default the game's). */
  loss?: GeneratorLoss;
  /** Penalty (default the game's; `null` for none). */
  penalty?: Penalty | null;
  /** Weight decay λ on φ: the discriminator ascends V − (λ/2) |φ|² (default 0). */
  weightDecay?: number;
  /** Minibatch size m: gradients from m seeded draws of each side instead of expectations. */
  batchSize?: number;
  /** Seed of the minibatch. */
  seed?: RandomSource;
}

/** The value, the losses and both gradients at (φ, θ). */
export interface GameGradients {
  /** V(φ, θ). */
  readonly value: number;
  /** The discriminator's loss −V (binary cross-entropy, real + generated; 2 ln 2 at D = 1/2). */
  readonly dLoss: number;
  /** The generator's loss (minimax E ln(1 − D); non-saturating −E ln D, ln 2 at D = 1/2). */
  readonly gLoss: number;
  /** Mean D on the data and on generated points. */
  readonly meanDReal: number;
  /** Mean D on generated points. */
  readonly meanDFake: number;
  /** ∇_φ of the discriminator's objective V − penalty − decay (it ascends this). */
  readonly gradPhi: Float64Array;
  /** ∇_θ of the generator's loss (it descends this). */
  readonly gradTheta: Float64Array;
}

/**
 * Value, losses and gradients of both players at (φ, θ): exact over the families' nodes,
 * or from seeded minibatches with `batchSize`. Closed-form chain rule through the
 * families' derivatives (central differences where a family has no closed form).
 *
 * References: Goodfellow et al. 2014 (NeurIPS), Alg. 1 (minimax and non-saturating
 * losses); Mescheder et al. 2018 (ICML), Sec. 4.1 (R1, R2).
 *
 * @example The Dirac game: ∂V/∂ψ = −θ σ(ψθ)
 * ```ts
 * import { diracGame, gameGradients } from "./game.ts";
 * import assert from "node:assert/strict";
 * const g = gameGradients(diracGame(), Float64Array.of(0.3), Float64Array.of(1));
 * assert.ok(Math.abs(g.gradPhi[0] + 1 / (1 + Math.exp(-0.3))) < 1e-12);
 * ```
 */
export function gameGradients(
  game: Game,
  phi: Float64Array,
  theta: Float64Array,
  options: GradientOptions = {},
): GameGradients {
  const { data, generator: G, discriminator: D } = game;
  const p = G.names.length, q = D.names.length, d = data.d;
  const loss = options.loss ?? game.loss;
  const penalty = options.penalty === null ? undefined : options.penalty ?? game.penalty;
  let dn: WeightedPoints, gn: GeneratorNodes;
  if (options.batchSize !== undefined) {
    const m = options.batchSize;
    const seed = String(options.seed ?? 0);
    dn = { d, points: data.sample(m, `${seed}/data`), weights: new Float64Array(m).fill(1 / m) };
    gn = G.sample(theta, m, `${seed}/generator`);
  } else {
    dn = data.nodes;
    gn = G.nodes(theta);
  }
  const er = D.evaluate(phi, dn.points), ef = D.evaluate(phi, gn.points);
  let value = 0, gLoss = 0, meanDReal = 0, meanDFake = 0;
  const gradPhi = new Float64Array(q), gradTheta = new Float64Array(p);
  for (let i = 0; i < dn.weights.length; i++) {
    const w = dn.weights[i], l = er.logit[i];
    value += w * logSigmoid(l);
    meanDReal += w * sigmoid(l);
    const s = sigmoid(-l);
    for (let j = 0; j < q; j++) gradPhi[j] += w * s * er.dPhi[i * q + j];
  }
  for (let i = 0; i < gn.weights.length; i++) {
    const w = gn.weights[i], l = ef.logit[i];
    const lf = logSigmoid(-l), lr = logSigmoid(l), sl = sigmoid(l), sm = sigmoid(-l);
    value += w * lf;
    meanDFake += w * sl;
    gLoss += loss === "minimax" ? w * lf : -w * lr;
    for (let j = 0; j < q; j++) gradPhi[j] -= w * sl * ef.dPhi[i * q + j];
    // d(loss term)/dl: minimax ln σ(−l) → −σ(l); non-saturating −ln σ(l) → −σ(−l).
    const dl = loss === "minimax" ? -sl : -sm;
    const term = loss === "minimax" ? lf : -lr;
    for (let j = 0; j < p; j++) {
      let dx = 0;
      for (let k = 0; k < d; k++) dx += ef.dX[i * d + k] * gn.dPoints[(i * d + k) * p + j];
      gradTheta[j] += gn.dWeights[i * p + j] * term + w * dl * dx;
    }
  }
  if (penalty && penalty.weight > 0) {
    const at = penalty.kind === "r1" ? dn : gn;
    const { dPhi } = D.gradientNorm(phi, at.points);
    for (let i = 0; i < at.weights.length; i++) {
      for (let j = 0; j < q; j++) {
        gradPhi[j] -= 0.5 * penalty.weight * at.weights[i] * dPhi[i * q + j];
      }
    }
  }
  const decay = options.weightDecay ?? 0;
  if (decay) { for (let j = 0; j < q; j++) gradPhi[j] -= decay * phi[j]; }
  return { value, dLoss: -value, gLoss, meanDReal, meanDFake, gradPhi, gradTheta };
}

/**
 * The value V(φ, θ) alone.
 *
 * @example At D = 1/2 everywhere V = −ln 4
 * ```ts
 * import { gameValue, locationGame } from "./game.ts";
 * import assert from "node:assert/strict";
 * const v = gameValue(locationGame(), Float64Array.of(0, 0), Float64Array.of(3));
 * assert.ok(Math.abs(v + Math.log(4)) < 1e-12);
 * ```
 */
export function gameValue(game: Game, phi: Float64Array, theta: Float64Array): number {
  const dn = game.data.nodes, gn = game.generator.nodes(theta);
  const er = game.discriminator.evaluate(phi, dn.points);
  const ef = game.discriminator.evaluate(phi, gn.points);
  let v = 0;
  for (let i = 0; i < dn.weights.length; i++) v += dn.weights[i] * logSigmoid(er.logit[i]);
  for (let i = 0; i < gn.weights.length; i++) v += gn.weights[i] * logSigmoid(-ef.logit[i]);
  return v;
}

/**
 * Central-difference gradients of V in φ and of the generator's loss in θ, with step
 * h = step · max(1, |p|) (default {@linkcode CENTRAL_DIFFERENCE_STEP}); no penalty. For
 * checking the closed forms of {@linkcode gameGradients}.
 *
 * @example
 * ```ts
 * import { finiteDifferenceGradients, gameGradients, locationGame } from "./game.ts";
 * import assert from "node:assert/strict";
 * const game = locationGame({ mean: 1 });
 * const phi = Float64Array.of(0.2, -0.4), theta = Float64Array.of(0.3);
 * const fd = finiteDifferenceGradients(game, phi, theta);
 * const cf = gameGradients(game, phi, theta);
 * assert.ok(Math.abs(fd.gradTheta[0] - cf.gradTheta[0]) < 1e-8);
 * ```
 */
export function finiteDifferenceGradients(
  game: Game,
  phi: Float64Array,
  theta: Float64Array,
  options: { step?: number; loss?: GeneratorLoss } = {},
): { gradPhi: Float64Array; gradTheta: Float64Array } {
  const step = options.step ?? CENTRAL_DIFFERENCE_STEP;
  const opts = { penalty: null, loss: options.loss ?? game.loss } as const;
  const diff = (x: Float64Array, f: (y: Float64Array) => number) =>
    x.map((v, j) => {
      const h = step * Math.max(1, Math.abs(v));
      const a = Float64Array.from(x), b = Float64Array.from(x);
      a[j] += h;
      b[j] -= h;
      return (f(a) - f(b)) / (2 * h);
    });
  return {
    gradPhi: diff(phi, (y) => gameValue(game, y, theta)),
    gradTheta: diff(theta, (y) => gameGradients(game, phi, y, opts).gLoss),
  };
}

/**
 * The simultaneous gradient field v(θ, φ) = (−∇_θ L_G, +∇_φ objective_D) stacked as
 * [θ…, φ…]: the direction plain gradient steps move in.
 *
 * @example
 * ```ts
 * import { diracGame, gradientField } from "./game.ts";
 * import assert from "node:assert/strict";
 * assert.ok(gradientField(diracGame(), Float64Array.of(0, 0)).every((v) => v === 0));
 * // θ = 1, ψ = 0: v = (ψ σ(ψθ), −θ σ(ψθ)) = (0, −1/2)
 * assert.deepEqual([...gradientField(diracGame(), Float64Array.of(1, 0))].map(Math.abs), [0, 0.5]);
 * ```
 */
export function gradientField(
  game: Game,
  z: Float64Array,
  options: GradientOptions = {},
): Float64Array {
  const p = game.generator.names.length;
  const g = gameGradients(game, z.subarray(p), z.subarray(0, p), options);
  const out = new Float64Array(z.length);
  for (let j = 0; j < p; j++) out[j] = -g.gradTheta[j];
  out.set(g.gradPhi, p);
  return out;
}

/** Result of {@linkcode bestResponse}. */
export interface BestResponse {
  /** The maximising φ. */
  readonly phi: Float64Array;
  /** The objective there (V minus the penalty). */
  readonly value: number;
  /** Newton iterations used. */
  readonly iterations: number;
}

/**
 * The discriminator's numeric best response φ*(θ) = argmax_φ V(φ, θ) − penalty: Newton's
 * method on the (concave, for logistic families) objective with a central-difference
 * Hessian of the closed-form gradient and a backtracking step. Where the family contains
 * D* it lands on D* (Goodfellow et al. 2014, Prop. 1). Diverging iterates (no maximiser:
 * separable supports) throw a "numerical" error naming the cause.
 *
 * @example The location game: φ* expresses D*, logit = (μ − θ) x + (θ² − μ²)/2
 * ```ts
 * import { bestResponse, locationGame } from "./game.ts";
 * import assert from "node:assert/strict";
 * const br = bestResponse(locationGame({ mean: 1 }), { theta: [0] });
 * assert.ok(Math.abs(br.phi[0] - (-0.5)) < 1e-6 && Math.abs(br.phi[1] - 1) < 1e-6);
 * ```
 */
export function bestResponse(
  game: Game,
  options: { theta: ArrayLike<number>; start?: ArrayLike<number>; penalty?: Penalty | null },
): BestResponse {
  const q = game.discriminator.names.length;
  const theta = toParams(options.theta, game.generator.names.length, "theta");
  let phi = options.start ? toParams(options.start, q, "start") : new Float64Array(q);
  const pen = options.penalty === null ? undefined : options.penalty ?? game.penalty;
  const objective = (f: Float64Array) => {
    let v = gameValue(game, f, theta);
    if (pen && pen.weight > 0) {
      const at = pen.kind === "r1" ? game.data.nodes : game.generator.nodes(theta);
      const { sq } = game.discriminator.gradientNorm(f, at.points);
      for (let i = 0; i < sq.length; i++) v -= 0.5 * pen.weight * at.weights[i] * sq[i];
    }
    return v;
  };
  const grad = (f: Float64Array) => gameGradients(game, f, theta, { penalty: pen ?? null }).gradPhi;
  let f0 = objective(phi);
  for (let it = 1; it <= 100; it++) {
    const g = grad(phi);
    const gn = Math.hypot(...g);
    if (gn < 1e-11) return shown(game, { phi, value: f0, iterations: it - 1 });
    const H = new Float64Array(q * q);
    for (let j = 0; j < q; j++) {
      const h = 1e-5 * Math.max(1, Math.abs(phi[j]));
      const a = Float64Array.from(phi), b = Float64Array.from(phi);
      a[j] += h;
      b[j] -= h;
      const ga = grad(a), gb = grad(b);
      for (let i = 0; i < q; i++) H[i * q + j] = (ga[i] - gb[i]) / (2 * h);
    }
    // Newton direction −H⁻¹ g (H negative definite); fall back to the gradient.
    let dir = luSolve(H.map((v) => -v), g, q) ?? g;
    if (dot(dir, g) <= 0) dir = g;
    let t = 1, next = phi, fn = f0;
    for (let ls = 0; ls < 60; ls++) {
      next = phi.map((v, j) => v + t * dir[j]);
      fn = objective(next);
      if (fn >= f0 + 1e-4 * t * dot(dir, g)) break;
      t /= 2;
    }
    if (Math.hypot(...next) > 1e6) {
      throw new SaddleError(
        "numerical",
        "the discriminator's best response diverges (V increases without bound in φ): " +
          "the supports are separable for this family; add a penalty or weight decay",
        { parameter: "theta" },
      );
    }
    if (Math.abs(fn - f0) < 1e-15 && Math.hypot(...next.map((v, j) => v - phi[j])) < 1e-12) {
      return shown(game, { phi: next, value: fn, iterations: it });
    }
    phi = next;
    f0 = fn;
  }
  return shown(game, { phi, value: f0, iterations: 100 });
}

function shown(game: Game, r: BestResponse): BestResponse {
  return withDisplay(r, (b) => {
    const rows = game.discriminator.names.map((n, j) => [n, b.phi[j]]);
    const title = `Best response of the discriminator: objective ${b.value.toPrecision(6)} ` +
      `after ${b.iterations} Newton steps`;
    return {
      "text/plain": `${title}\n${textTable(["φ", "value"], rows)}`,
      "text/html": htmlTable(["φ", "value"], rows, title),
    };
  });
}

function dot(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}
