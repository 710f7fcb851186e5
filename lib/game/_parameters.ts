/**
 * Reading a point of a game (θ and φ) from user input, and the learning rates.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import type { Game } from "./game.ts";
import { toParams } from "./_vectors.ts";

/** A point of the game: `{ theta, phi }`, or both stacked as [θ…, φ…]. */
export type GamePoint =
  | { readonly theta: ArrayLike<number> | number; readonly phi: ArrayLike<number> | number }
  | ArrayLike<number>;

/** The stacked vector [θ…, φ…] of a point, checked. */
export function stackPoint(game: Game, at: GamePoint, name: string): Float64Array {
  const p = game.generator.names.length, q = game.discriminator.names.length;
  if (typeof at === "object" && at !== null && "theta" in at && "phi" in at) {
    const out = new Float64Array(p + q);
    out.set(toParams(at.theta, p, `${name}.theta`));
    out.set(toParams(at.phi, q, `${name}.phi`), p);
    return out;
  }
  return toParams(at as ArrayLike<number>, p + q, name);
}

/** Learning rates of both players: one number for both, or one each. */
export type LearningRate = number | { readonly generator: number; readonly discriminator: number };

/** The two learning rates, checked > 0. */
export function learningRates(lr: LearningRate): { generator: number; discriminator: number } {
  const r = typeof lr === "number" ? { generator: lr, discriminator: lr } : lr;
  for (const [who, v] of Object.entries(r)) {
    if (!(v > 0) || !Number.isFinite(v)) {
      throw new SaddleError(
        "invalid-argument",
        `learningRate (${who}) must be a finite number > 0, got ${v}`,
        { parameter: "learningRate" },
      );
    }
  }
  return { generator: r.generator, discriminator: r.discriminator };
}

/** k, the discriminator steps per generator step: an integer >= 1. */
export function checkK(k: number): number {
  if (!Number.isInteger(k) || k < 1) {
    throw new SaddleError(
      "invalid-argument",
      `k (discriminator steps per generator step) must be an integer >= 1, got ${k}`,
      { parameter: "k" },
    );
  }
  return k;
}

/** A parameter of the game located by name. */
export interface ParameterRef {
  /** The name as given. */
  readonly name: string;
  /** Whose parameter. */
  readonly player: "generator" | "discriminator";
  /** Index within the player's vector. */
  readonly index: number;
  /** Index in the stacked [θ…, φ…] vector. */
  readonly stacked: number;
}

/**
 * A parameter by name: a generator (θ) or discriminator (φ) name, or "theta.name" /
 * "phi.name" when both players use it.
 */
export function resolveParameter(game: Game, name: string, what: string): ParameterRef {
  const p = game.generator.names.length;
  const [prefix, bare] = name.includes(".") ? name.split(".", 2) : ["", name];
  const inG = game.generator.names.indexOf(bare), inD = game.discriminator.names.indexOf(bare);
  const wantG = prefix === "theta" || (prefix === "" && inG >= 0 && inD < 0);
  const wantD = prefix === "phi" || (prefix === "" && inD >= 0 && inG < 0);
  if (prefix === "" && inG >= 0 && inD >= 0) {
    throw new SaddleError(
      "invalid-argument",
      `${what}: "${name}" names a generator and a discriminator parameter; write theta.${name} or phi.${name}`,
      { parameter: what },
    );
  }
  if (wantG && inG >= 0) return { name, player: "generator", index: inG, stacked: inG };
  if (wantD && inD >= 0) return { name, player: "discriminator", index: inD, stacked: p + inD };
  throw new SaddleError(
    "invalid-argument",
    `${what}: no parameter "${name}"; θ = (${game.generator.names.join(", ")}), ` +
      `φ = (${game.discriminator.names.join(", ")})`,
    { parameter: what },
  );
}

/** An axis of a grid over one parameter. */
export interface GridAxis {
  /** The parameter's name (see {@linkcode resolveParameter}). */
  readonly parameter: string;
  /** `[lo, hi]`. */
  readonly range: readonly [number, number];
  /** Grid points, >= 2 (default 41). */
  readonly points?: number;
}

/** The values of an axis, checked. */
export function axisValues(axis: GridAxis, what: string): Float64Array {
  const m = axis.points ?? 41;
  if (!Number.isInteger(m) || m < 2) {
    throw new SaddleError(
      "invalid-argument",
      `${what}.points must be an integer >= 2 (a grid needs points), got ${m}`,
      { parameter: `${what}.points` },
    );
  }
  const [lo, hi] = axis.range ?? [];
  if (!Number.isFinite(lo) || !Number.isFinite(hi) || !(hi > lo)) {
    throw new SaddleError(
      "invalid-argument",
      `${what}.range must be finite [lo, hi] with lo < hi, got [${lo}, ${hi}]`,
      { parameter: `${what}.range` },
    );
  }
  return Float64Array.from({ length: m }, (_, i) => lo + ((hi - lo) * i) / (m - 1));
}

/** The base point of a grid: `at`, else the game's equilibrium, else the origin. */
export function basePoint(game: Game, at: GamePoint | undefined): Float64Array {
  const p = game.generator.names.length, q = game.discriminator.names.length;
  if (at !== undefined) return stackPoint(game, at, "at");
  const z = new Float64Array(p + q);
  if (game.equilibrium) {
    z.set(game.equilibrium.theta);
    z.set(game.equilibrium.phi, p);
  }
  return z;
}
