/**
 * The simultaneous gradient field (−∇_θ L_G, +∇_φ objective_D) of a game on a grid of two
 * parameters: the arrows plain gradient steps follow.
 *
 * @module
 */
import { withDisplay } from "../display/mod.ts";
import { formatNumber, htmlTable, textTable } from "../display/mod.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { type Game, type GeneratorLoss, gradientField, type Penalty } from "./game.ts";
import {
  axisValues,
  basePoint,
  type GamePoint,
  type GridAxis,
  type ParameterRef,
  resolveParameter,
} from "./_parameters.ts";

/** Options of {@linkcode gradientFieldGrid}. */
export interface GradientFieldGridOptions {
  /** The horizontal axis (default 15 points). */
  x: GridAxis;
  /** The vertical axis (default 15 points). */
  y: GridAxis;
  /** Values of the other parameters (default: the equilibrium, else 0). */
  at?: GamePoint;
  /** Generator loss (default the game's). */
  loss?: GeneratorLoss;
  /** Penalty (default the game's; null for none). */
  penalty?: Penalty | null;
}

/** Result of {@linkcode gradientFieldGrid}. */
export interface GradientFieldGrid {
  /** The x parameter. */
  readonly x: ParameterRef;
  /** The y parameter. */
  readonly y: ParameterRef;
  /** Grid values of x. */
  readonly xs: Float64Array;
  /** Grid values of y. */
  readonly ys: Float64Array;
  /** The field's x component at `[j * xs.length + i]`. */
  readonly u: Float64Array;
  /** The field's y component. */
  readonly v: Float64Array;
  /** The base point, stacked [θ…, φ…]. */
  readonly at: Float64Array;
  /** The game's name. */
  readonly game: string;
}

/**
 * The gradient field v = (−∇_θ L_G, +∇_φ objective_D) on a grid of two parameters (the
 * others held at `at`): each player's steepest improvement, the vector field simultaneous
 * gradient steps integrate. Around the Dirac game's equilibrium it rotates (Mescheder et al.
 * 2018, Fig. 1); an R1 penalty makes it spiral inwards.
 *
 * References: Mescheder, Geiger & Nowozin 2018 (ICML), Sec. 2.
 *
 * @example The Dirac game's field rotates around (0, 0)
 * ```ts
 * import { gradientFieldGrid } from "./gradient_field_grid.ts";
 * import { diracGame } from "./game.ts";
 * import assert from "node:assert/strict";
 * const f = gradientFieldGrid(diracGame(), {
 *   x: { parameter: "theta", range: [-1, 1], points: 3 },
 *   y: { parameter: "psi", range: [-1, 1], points: 3 },
 * });
 * // At (θ, ψ) = (1, 0): v = (0, −1/2), pointing down.
 * assert.ok(Math.abs(f.u[5]) < 1e-12 && Math.abs(f.v[5] + 0.5) < 1e-12);
 * ```
 */
export function gradientFieldGrid(
  game: Game,
  options: GradientFieldGridOptions,
): GradientFieldGrid {
  const x = resolveParameter(game, options.x?.parameter, "x.parameter");
  const y = resolveParameter(game, options.y?.parameter, "y.parameter");
  if (x.stacked === y.stacked) {
    throw new SaddleError("invalid-argument", "x and y must be two different parameters", {
      parameter: "y.parameter",
    });
  }
  const xs = axisValues({ points: 15, ...options.x }, "x");
  const ys = axisValues({ points: 15, ...options.y }, "y");
  const at = basePoint(game, options.at);
  const nx = xs.length, ny = ys.length;
  const u = new Float64Array(nx * ny), v = new Float64Array(nx * ny);
  const fo = {
    ...(options.loss ? { loss: options.loss } : {}),
    ...(options.penalty !== undefined ? { penalty: options.penalty } : {}),
  };
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const z = Float64Array.from(at);
      z[x.stacked] = xs[i];
      z[y.stacked] = ys[j];
      const f = gradientField(game, z, fo);
      u[j * nx + i] = f[x.stacked];
      v[j * nx + i] = f[y.stacked];
    }
  }
  return withDisplay({ x, y, xs, ys, u, v, at, game: game.name }, (g) => {
    let top = 0;
    for (let i = 0; i < g.u.length; i++) top = Math.max(top, Math.hypot(g.u[i], g.v[i]));
    const rows = [
      ["grid", `${g.x.name} × ${g.y.name}: ${g.xs.length} × ${g.ys.length}`],
      ["largest |v|", formatNumber(top)],
    ];
    const title = `Gradient field of ${g.game}`;
    return {
      "text/plain": `${title}\n${textTable(["", ""], rows)}`,
      "text/html": htmlTable(["", ""], rows, title),
    };
  });
}
