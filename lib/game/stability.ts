/**
 * Local stability of a game at an equilibrium: the Jacobian of the gradient field, its
 * eigenvalues, and the spectral radius of the update map of simultaneous and alternating
 * gradient steps at given learning rates.
 *
 * @module
 */
import { withDisplay } from "../display/mod.ts";
import { formatNumber, htmlTable, textTable } from "../display/mod.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { luSolve } from "../linalg/lu_solve.ts";
import { type Complex, eigenvalues } from "../linalg/general_eigen.ts";
import { fmtVec } from "./families.ts";
import { type Game, type GeneratorLoss, gradientField, type Penalty } from "./game.ts";
import {
  checkK,
  type GamePoint,
  type LearningRate,
  learningRates,
  stackPoint,
} from "./_parameters.ts";

/** Options of {@linkcode stability}. */
export interface StabilityOptions {
  /** The point (default: the game's equilibrium, else one located from the origin). */
  at?: GamePoint;
  /** Learning rates for the update maps (default 0.1). */
  learningRate?: LearningRate;
  /** Discriminator steps per generator step (default 1). */
  k?: number;
  /** Generator loss (default the game's). */
  loss?: GeneratorLoss;
  /** Penalty (default the game's; null for none). */
  penalty?: Penalty | null;
  /** Central-difference step of the Jacobian (default 1e-5). */
  step?: number;
}

/** An update rule's linearisation at the point. */
export interface UpdateMap {
  /** Row-major n x n matrix of the map z ↦ z' (one generator step with its k D-steps). */
  readonly matrix: Float64Array;
  /** Its eigenvalues. */
  readonly eigenvalues: readonly Complex[];
  /** max |eigenvalue|: < 1 locally convergent, > 1 unstable, = 1 neutral (cycles). */
  readonly spectralRadius: number;
  /** "convergent", "neutral" or "unstable". */
  readonly verdict: "convergent" | "neutral" | "unstable";
}

/** Result of {@linkcode stability}. */
export interface Stability {
  /** The point, stacked [θ…, φ…]. */
  readonly at: Float64Array;
  /** Parameter names in the same order. */
  readonly names: readonly string[];
  /** |v(at)|: ≈ 0 at an equilibrium. */
  readonly fieldNorm: number;
  /** Row-major Jacobian of the gradient field v = (−∇_θ L_G, ∇_φ objective_D). */
  readonly jacobian: Float64Array;
  /** Its eigenvalues as { re, im } pairs (sorted by real part). */
  readonly eigenvalues: readonly Complex[];
  /** The learning rates of the update maps. */
  readonly learningRate: { readonly generator: number; readonly discriminator: number };
  /** Discriminator steps per generator step. */
  readonly k: number;
  /** Simultaneous steps: (I + H J)(I + h_φ P_φ J)^(k−1). */
  readonly simultaneous: UpdateMap;
  /** Alternating steps, discriminator first: (I + h_θ P_θ J)(I + h_φ P_φ J)^k. */
  readonly alternating: UpdateMap;
  /** Caveats. */
  readonly notes: readonly string[];
}

/**
 * Central-difference Jacobian of the gradient field at z (row-major).
 *
 * @example The Dirac game at (0, 0): [[0, 1/2], [−1/2, 0]]
 * ```ts
 * import { fieldJacobian } from "./stability.ts";
 * import { diracGame } from "./game.ts";
 * import assert from "node:assert/strict";
 * const J = fieldJacobian(diracGame(), Float64Array.of(0, 0));
 * [0, 0.5, -0.5, 0].forEach((v, i) => assert.ok(Math.abs(J[i] - v) < 1e-9));
 * ```
 */
export function fieldJacobian(
  game: Game,
  z: Float64Array,
  options: { loss?: GeneratorLoss; penalty?: Penalty | null; step?: number } = {},
): Float64Array {
  const n = z.length, J = new Float64Array(n * n);
  const step = options.step ?? 1e-5;
  for (let j = 0; j < n; j++) {
    const h = step * Math.max(1, Math.abs(z[j]));
    const a = Float64Array.from(z), b = Float64Array.from(z);
    a[j] += h;
    b[j] -= h;
    const fa = gradientField(game, a, options), fb = gradientField(game, b, options);
    for (let i = 0; i < n; i++) J[i * n + j] = (fa[i] - fb[i]) / (2 * h);
  }
  return J;
}

/**
 * An equilibrium (a zero of the gradient field) near `start` by Newton's method with a
 * central-difference Jacobian and step halving on |v|.
 *
 * @example
 * ```ts
 * import { locateEquilibrium } from "./stability.ts";
 * import { locationGame } from "./game.ts";
 * import assert from "node:assert/strict";
 * const z = locateEquilibrium(locationGame({ mean: 1 }), { start: [0.5, 0.1, -0.1] });
 * assert.ok(Math.abs(z![0] - 1) < 1e-8);
 * ```
 */
export function locateEquilibrium(
  game: Game,
  options: { start: GamePoint; loss?: GeneratorLoss; penalty?: Penalty | null },
): Float64Array | undefined {
  let z = stackPoint(game, options.start, "start");
  const n = z.length;
  const norm = (v: Float64Array) => Math.hypot(...v);
  let v = gradientField(game, z, options), nv = norm(v);
  for (let it = 0; it < 60 && nv > 1e-12; it++) {
    const J = fieldJacobian(game, z, options);
    const dz = luSolve(J, v.map((x) => -x), n);
    if (!dz) return undefined;
    let t = 1, next = z, nn = Infinity;
    for (let ls = 0; ls < 40; ls++) {
      next = z.map((x, i) => x + t * dz[i]);
      try {
        nn = norm(gradientField(game, next, options));
      } catch {
        nn = Infinity;
      }
      if (nn < nv) break;
      t /= 2;
    }
    if (!(nn < nv)) break;
    z = next;
    v = gradientField(game, z, options);
    nv = nn;
  }
  return nv < 1e-8 ? z : undefined;
}

function mapOf(J: Float64Array, n: number, p: number, h: { g: number; d: number }, k: number) {
  // Step matrices: S(hθ, hφ) = I + diag(hθ on θ rows, hφ on φ rows) J.
  const S = (hg: number, hd: number) => {
    const m = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      const hi = i < p ? hg : hd;
      for (let j = 0; j < n; j++) m[i * n + j] = (i === j ? 1 : 0) + hi * J[i * n + j];
    }
    return m;
  };
  const mul = (a: Float64Array, b: Float64Array) => {
    const c = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      for (let l = 0; l < n; l++) {
        const x = a[i * n + l];
        for (let j = 0; j < n; j++) c[i * n + j] += x * b[l * n + j];
      }
    }
    return c;
  };
  const dStep = S(0, h.d);
  let dPow = S(0, 0); // the identity
  for (let r = 0; r < k - 1; r++) dPow = mul(dStep, dPow);
  const sim = mul(S(h.g, h.d), dPow);
  const alt = mul(S(h.g, 0), mul(dStep, dPow));
  return { sim, alt };
}

function updateMap(matrix: Float64Array, n: number): UpdateMap {
  const ev = eigenvalues(matrix, n);
  const rho = Math.max(...ev.map((e) => Math.hypot(e.re, e.im)));
  const verdict = Math.abs(rho - 1) <= 1e-9 ? "neutral" : rho < 1 ? "convergent" : "unstable";
  return { matrix, eigenvalues: ev, spectralRadius: rho, verdict };
}

/**
 * Local stability analysis at a point of the game (default: its equilibrium): the Jacobian
 * J of the gradient field v = (−∇_θ L_G, +∇_φ objective_D) by central differences of the
 * closed-form gradients, its eigenvalues, and the linearised update maps of simultaneous
 * and alternating gradient steps at the given learning rates with their spectral radii.
 * Eigenvalues of J with negative real part make continuous-time dynamics converge;
 * simultaneous steps converge iff every |1 + hλ| < 1 (equal rates). Purely imaginary
 * eigenvalues (the Dirac game) give ρ > 1 for simultaneous and ρ = 1 for alternating steps.
 *
 * References: Mescheder, Nowozin & Geiger 2017, The Numerics of GANs (NeurIPS); Mescheder,
 * Geiger & Nowozin 2018 (ICML), Sec. 2–3; Heusel et al. 2017 (NeurIPS) for separate rates.
 *
 * @example The Dirac game: eigenvalues ±i/2
 * ```ts
 * import { stability } from "./stability.ts";
 * import { diracGame } from "./game.ts";
 * import assert from "node:assert/strict";
 * const s = stability(diracGame(), { at: { theta: [0], phi: [0] }, learningRate: 0.1 });
 * assert.ok(s.eigenvalues.every((e) => Math.abs(e.re) < 1e-9 && Math.abs(Math.abs(e.im) - 0.5) < 1e-9));
 * assert.ok(s.simultaneous.spectralRadius > 1);
 * ```
 */
export function stability(game: Game, options: StabilityOptions = {}): Stability {
  const p = game.generator.names.length, q = game.discriminator.names.length, n = p + q;
  const notes: string[] = [];
  let at: Float64Array;
  if (options.at !== undefined) at = stackPoint(game, options.at, "at");
  else if (game.equilibrium) {
    at = new Float64Array(n);
    at.set(game.equilibrium.theta);
    at.set(game.equilibrium.phi, p);
  } else {
    const z = locateEquilibrium(game, {
      start: new Float64Array(n).map((_, i) => (i < p ? game.data.mean[i % game.data.d] : 0)),
      ...(options.loss ? { loss: options.loss } : {}),
      ...(options.penalty !== undefined ? { penalty: options.penalty } : {}),
    });
    if (!z) {
      throw new SaddleError("numerical", "no equilibrium found; pass `at` explicitly", {
        parameter: "at",
      });
    }
    at = z;
    notes.push(`equilibrium located by Newton's method at ${fmtVec(z)}`);
  }
  const lr = learningRates(options.learningRate ?? 0.1);
  const k = checkK(options.k ?? 1);
  const fopts = {
    ...(options.loss ? { loss: options.loss } : {}),
    ...(options.penalty !== undefined ? { penalty: options.penalty } : {}),
  };
  const v = gradientField(game, at, fopts);
  const fieldNorm = Math.hypot(...v);
  if (fieldNorm > 1e-6) {
    notes.push(`|v| = ${formatNumber(fieldNorm)} at this point: it is not an equilibrium`);
  }
  const jacobian = fieldJacobian(game, at, { ...fopts, step: options.step });
  const { sim, alt } = mapOf(jacobian, n, p, { g: lr.generator, d: lr.discriminator }, k);
  const result: Stability = {
    at,
    names: [...game.generator.names, ...game.discriminator.names],
    fieldNorm,
    jacobian,
    eigenvalues: eigenvalues(jacobian, n),
    learningRate: lr,
    k,
    simultaneous: updateMap(sim, n),
    alternating: updateMap(alt, n),
    notes,
  };
  return withDisplay(result, (s) => {
    const c = (e: Complex) =>
      `${formatNumber(e.re)} ${e.im < 0 ? "−" : "+"} ${formatNumber(Math.abs(e.im))}i`;
    const rows = [
      ["point", `${s.names.join(", ")} = ${fmtVec(s.at)}`],
      ["eigenvalues of J", s.eigenvalues.map(c).join(", ")],
      ["max real part", formatNumber(Math.max(...s.eigenvalues.map((e) => e.re)))],
      [
        `simultaneous, h = ${s.learningRate.generator}/${s.learningRate.discriminator}, k = ${s.k}`,
        `ρ = ${formatNumber(s.simultaneous.spectralRadius, 6)} (${s.simultaneous.verdict})`,
      ],
      [
        `alternating, h = ${s.learningRate.generator}/${s.learningRate.discriminator}, k = ${s.k}`,
        `ρ = ${formatNumber(s.alternating.spectralRadius, 6)} (${s.alternating.verdict})`,
      ],
      ...s.notes.map((t) => ["note", t]),
    ];
    const title = `Stability of ${game.name}`;
    return {
      "text/plain": `${title}\n${textTable(["", ""], rows)}`,
      "text/html": htmlTable(["", ""], rows, title),
    };
  });
}
