/**
 * The value V(φ, θ) of a parametric game on a grid of two parameters, best-response curves,
 * located saddle points, and the optimal-discriminator profile V(D*_θ, θ) = −ln 4 + 2 JSD.
 *
 * @module
 */
import { withDisplay } from "../display/mod.ts";
import type { Estimate } from "../estimate/estimate.ts";
import { formatNumber, htmlTable, type TableCell, textTable } from "../display/mod.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { luSolve } from "../linalg/lu_solve.ts";
import { optimumDecomposition } from "../value/optimum_decomposition.ts";
import { bestResponse, type Game, gameGradients, gameValue, type Penalty } from "./game.ts";
import {
  axisValues,
  basePoint,
  type GamePoint,
  type GridAxis,
  type ParameterRef,
  resolveParameter,
} from "./_parameters.ts";

/** Options of {@linkcode valueSurface}. */
export interface ValueSurfaceOptions {
  /** The horizontal axis: a parameter, its range and grid points. */
  x: GridAxis;
  /** The vertical axis. */
  y: GridAxis;
  /** Values of the other parameters (default: the equilibrium, else 0). */
  at?: GamePoint;
}

/** A located saddle point of the surface. */
export interface SaddlePoint {
  /** The x parameter's value. */
  readonly x: number;
  /** The y parameter's value. */
  readonly y: number;
  /** V there. */
  readonly value: number;
  /** Whether it is a max over the discriminator's axis and a min over the generator's. */
  readonly minimax: boolean;
}

/** A best-response curve: for each grid value of one axis, the other axis' best value. */
export interface BestResponseCurve {
  /** "discriminator" (φ*(θ), argmax of V) or "generator" (θ*(φ), argmin of V). */
  readonly player: "generator" | "discriminator";
  /** Values of the conditioning axis. */
  readonly given: Float64Array;
  /** The responding parameter's best value (grid argmax/argmin, parabola-refined). */
  readonly best: Float64Array;
  /** Whether the optimum lies on the grid's edge (the true one may lie beyond). */
  readonly atEdge: readonly boolean[];
}

/** Result of {@linkcode valueSurface}. */
export interface ValueSurface {
  /** The x parameter. */
  readonly x: ParameterRef;
  /** The y parameter. */
  readonly y: ParameterRef;
  /** Grid values of x. */
  readonly xs: Float64Array;
  /** Grid values of y. */
  readonly ys: Float64Array;
  /** V at (xs[i], ys[j]) at `[j * xs.length + i]`. */
  readonly values: Float64Array;
  /** The base point (the other parameters' values), stacked [θ…, φ…]. */
  readonly at: Float64Array;
  /** "quadrature" (exact expectations over the families' nodes) or "monte-carlo" (common random numbers). */
  readonly method: "quadrature" | "monte-carlo";
  /** φ*(θ) and θ*(φ), when one axis belongs to each player. */
  readonly bestResponses: readonly BestResponseCurve[];
  /** Stationary points of V restricted to the two axes, inside the grid. */
  readonly saddles: readonly SaddlePoint[];
  /** The game's name. */
  readonly game: string;
  /** Caveats. */
  readonly notes: readonly string[];
}

/**
 * V(φ, θ) on a grid of any two parameters (the others held at `at`), with expectations
 * exact by quadrature over the families' nodes where the distributions are known and by
 * Monte Carlo over fixed draws (common random numbers, so the surface is smooth) otherwise.
 * When one axis is the generator's and the other the discriminator's, also the best-response
 * curves φ*(θ) (argmax of V) and θ*(φ) (argmin), and the saddle points: zeros of the two
 * partial derivatives, found by Newton's method from every grid cell where both change sign.
 *
 * References: Goodfellow et al. 2014 (NeurIPS), Eq. 1; von Neumann 1928 for saddle points.
 *
 * @example The Dirac game's saddle at (0, 0)
 * ```ts
 * import { valueSurface } from "./value_surface.ts";
 * import { diracGame } from "./game.ts";
 * import assert from "node:assert/strict";
 * const s = valueSurface(diracGame(), {
 *   x: { parameter: "theta", range: [-1, 1], points: 21 },
 *   y: { parameter: "psi", range: [-1, 1], points: 21 },
 * });
 * assert.equal(s.saddles.length, 1);
 * assert.ok(Math.abs(s.saddles[0].x) < 1e-9 && Math.abs(s.saddles[0].y) < 1e-9);
 * ```
 */
export function valueSurface(game: Game, options: ValueSurfaceOptions): ValueSurface {
  const x = resolveParameter(game, options.x?.parameter, "x.parameter");
  const y = resolveParameter(game, options.y?.parameter, "y.parameter");
  if (x.stacked === y.stacked) {
    throw new SaddleError("invalid-argument", "x and y must be two different parameters", {
      parameter: "y.parameter",
    });
  }
  const xs = axisValues(options.x, "x"), ys = axisValues(options.y, "y");
  const at = basePoint(game, options.at);
  const p = game.generator.names.length;
  const V = (zx: number, zy: number) => {
    const z = Float64Array.from(at);
    z[x.stacked] = zx;
    z[y.stacked] = zy;
    return gameValue(game, z.subarray(p), z.subarray(0, p));
  };
  const nx = xs.length, ny = ys.length;
  const values = new Float64Array(nx * ny);
  for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) values[j * nx + i] = V(xs[i], ys[j]);
  const notes: string[] = [];
  const mc = game.data.expectation === "monte-carlo" ||
    game.generator.expectation === "monte-carlo";
  const bestResponses: BestResponseCurve[] = [];
  const saddles: SaddlePoint[] = [];
  if (x.player !== y.player) {
    const dIsX = x.player === "discriminator";
    // φ*(θ): along the discriminator's axis, maximise; θ*(φ): along the generator's, minimise.
    bestResponses.push(curve(values, xs, ys, dIsX ? "x" : "y", "max", "discriminator"));
    bestResponses.push(curve(values, xs, ys, dIsX ? "y" : "x", "min", "generator"));
    saddles.push(...findSaddles(game, at, x, y, xs, ys, values));
    if (bestResponses.some((c) => c.atEdge.some(Boolean))) {
      notes.push("some best responses lie on the grid's edge: the true optimum may lie beyond it");
    }
  }
  const result: ValueSurface = {
    x,
    y,
    xs,
    ys,
    values,
    at,
    method: mc ? "monte-carlo" : "quadrature",
    bestResponses,
    saddles,
    game: game.name,
    notes,
  };
  return withDisplay(result, (s) => {
    let lo = Infinity, hi = -Infinity;
    for (const v of s.values) {
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
    }
    const rows: TableCell[][] = [
      ["grid", `${s.x.name} × ${s.y.name}: ${s.xs.length} × ${s.ys.length} (${s.method})`],
      ["V range", `${formatNumber(lo)} to ${formatNumber(hi)}`],
      ...s.saddles.map((d, i): TableCell[] => [
        `saddle ${i + 1}`,
        `${s.x.name} = ${formatNumber(d.x, 6)}, ${s.y.name} = ${formatNumber(d.y, 6)}, V = ${
          formatNumber(d.value, 6)
        }${d.minimax ? "" : " (not min-max)"}`,
      ]),
      ...s.notes.map((n): TableCell[] => ["note", n]),
    ];
    const title = `Value surface of ${s.game}`;
    return {
      "text/plain": `${title}\n${textTable(["", ""], rows)}`,
      "text/html": htmlTable(["", ""], rows, title),
    };
  });
}

/** Best response along one axis for each value of the other. */
function curve(
  values: Float64Array,
  xs: Float64Array,
  ys: Float64Array,
  along: "x" | "y",
  sense: "max" | "min",
  player: "generator" | "discriminator",
): BestResponseCurve {
  const nx = xs.length;
  const given = along === "x" ? ys : xs, axis = along === "x" ? xs : ys;
  const best = new Float64Array(given.length), atEdge: boolean[] = [];
  const sgn = sense === "max" ? 1 : -1;
  for (let g = 0; g < given.length; g++) {
    const at = (a: number) => sgn * (along === "x" ? values[g * nx + a] : values[a * nx + g]);
    let b = 0;
    for (let a = 1; a < axis.length; a++) if (at(a) > at(b)) b = a;
    const edge = b === 0 || b === axis.length - 1;
    atEdge.push(edge);
    if (edge) best[g] = axis[b];
    else {
      // Vertex of the parabola through the three points around the grid optimum.
      const f0 = at(b - 1), f1 = at(b), f2 = at(b + 1), h = axis[b + 1] - axis[b];
      const den = f0 - 2 * f1 + f2;
      best[g] = axis[b] + (den < 0 ? (h * (f0 - f2)) / (2 * den) : 0);
    }
  }
  return { player, given, best, atEdge };
}

/** Newton's method on the two partial derivatives from every cell where both change sign. */
function findSaddles(
  game: Game,
  at: Float64Array,
  x: ParameterRef,
  y: ParameterRef,
  xs: Float64Array,
  ys: Float64Array,
  values: Float64Array,
): SaddlePoint[] {
  const p = game.generator.names.length;
  const grad = (zx: number, zy: number) => {
    const z = Float64Array.from(at);
    z[x.stacked] = zx;
    z[y.stacked] = zy;
    const g = gameGradients(game, z.subarray(p), z.subarray(0, p), {
      penalty: null,
      loss: "minimax",
    });
    const pick = (r: ParameterRef) =>
      r.player === "generator" ? g.gradTheta[r.index] : g.gradPhi[r.index];
    return [pick(x), pick(y), g.value] as const;
  };
  const nx = xs.length, ny = ys.length;
  // Sign of each partial at the grid points from finite differences of the grid values.
  const gx = (i: number, j: number) =>
    values[j * nx + Math.min(i + 1, nx - 1)] - values[j * nx + Math.max(i - 1, 0)];
  const gy = (i: number, j: number) =>
    values[Math.min(j + 1, ny - 1) * nx + i] - values[Math.max(j - 1, 0) * nx + i];
  const found: SaddlePoint[] = [];
  const hx = xs[1] - xs[0], hy = ys[1] - ys[0];
  for (let j = 0; j < ny - 1; j++) {
    for (let i = 0; i < nx - 1; i++) {
      const cx = [gx(i, j), gx(i + 1, j), gx(i, j + 1), gx(i + 1, j + 1)];
      const cy = [gy(i, j), gy(i + 1, j), gy(i, j + 1), gy(i + 1, j + 1)];
      const change = (c: number[]) => Math.min(...c) <= 0 && Math.max(...c) >= 0;
      if (!change(cx) || !change(cy)) continue;
      let zx = xs[i] + hx / 2, zy = ys[j] + hy / 2, ok = false;
      for (let it = 0; it < 50; it++) {
        const [a, b] = grad(zx, zy);
        if (Math.hypot(a, b) < 1e-12) {
          ok = true;
          break;
        }
        const e = 1e-6;
        const [ax, bx] = grad(zx + e, zy), [ax2, bx2] = grad(zx - e, zy);
        const [ay, by] = grad(zx, zy + e), [ay2, by2] = grad(zx, zy - e);
        const H = Float64Array.of(
          (ax - ax2) / (2 * e),
          (ay - ay2) / (2 * e),
          (bx - bx2) / (2 * e),
          (by - by2) / (2 * e),
        );
        const d = luSolve(H, [-a, -b], 2);
        if (!d) break;
        zx += d[0];
        zy += d[1];
        if (!Number.isFinite(zx + zy)) break;
      }
      const inside = zx >= xs[0] - 1e-9 && zx <= xs[nx - 1] + 1e-9 && zy >= ys[0] - 1e-9 &&
        zy <= ys[ny - 1] + 1e-9;
      if (!ok || !inside) continue;
      if (
        found.some((s) =>
          Math.abs(s.x - zx) < 1e-6 * (1 + Math.abs(zx)) &&
          Math.abs(s.y - zy) < 1e-6 * (1 + Math.abs(zy))
        )
      ) {
        continue;
      }
      // Second derivatives along each axis: V concave in φ and convex in θ at a min-max saddle.
      const e = 1e-4;
      const [ax1] = grad(zx + e, zy), [ax0] = grad(zx - e, zy);
      const [, by1] = grad(zx, zy + e), [, by0] = grad(zx, zy - e);
      const vxx = (ax1 - ax0) / (2 * e), vyy = (by1 - by0) / (2 * e);
      const ok2 = (
        r: ParameterRef,
        c: number,
      ) => (r.player === "discriminator" ? c <= 1e-9 : c >= -1e-9);
      found.push({ x: zx, y: zy, value: grad(zx, zy)[2], minimax: ok2(x, vxx) && ok2(y, vyy) });
    }
  }
  return found;
}

/** Options of {@linkcode optimalProfile}. */
export interface OptimalProfileOptions {
  /** The generator parameter to vary, its range and grid points. */
  theta: GridAxis;
  /** Values of the other generator parameters (default: the equilibrium, else 0). */
  at?: GamePoint;
  /** Grid cells of the JSD quadrature (default 400 in 1-D, 60 in 2-D). */
  gridSize?: number;
  /** Also the family's best response max_φ V(φ, θ) at each θ (default true). */
  restricted?: boolean;
  /** Penalty of the restricted best response (default none). */
  penalty?: Penalty | null;
}

/** Result of {@linkcode optimalProfile}. */
export interface OptimalProfile {
  /** The parameter varied. */
  readonly parameter: ParameterRef;
  /** Its grid values. */
  readonly thetas: Float64Array;
  /** V(D*_θ, θ) at each θ, from D* itself (grid quadrature Estimates). */
  readonly value: readonly Estimate[];
  /** JSD(p_data ‖ p_θ) at each θ (Estimates, nats). */
  readonly jsd: readonly Estimate[];
  /** `−ln 4 + 2 JSD` at each θ. */
  readonly fromJsd: Float64Array;
  /** max_φ V(φ, θ) within the discriminator family (≤ the profile; equal where it contains D*). */
  readonly restricted?: Float64Array;
  /** The grid θ of the smallest profile value. */
  readonly argmin: number;
  /** The smallest profile value (−ln 4 when p_θ can equal p_data). */
  readonly min: number;
}

/**
 * The optimal-discriminator profile V(D*_θ, θ) along one generator parameter: the value
 * with the discriminator at its optimum D* = p_data / (p_data + p_θ), which equals
 * −ln 4 + 2 JSD(p_data ‖ p_θ) and is minimal (−ln 4) where p_θ = p_data (Goodfellow et al.
 * 2014, Thm. 1). Computed with saddlekit's decomposition at the optimum
 * ({@linkcode optimumDecomposition}: V from D* on its own, the JSD from the KL terms, both
 * by grid quadrature with error bars). Needs the densities of data and generator. With
 * `restricted`, also the family's own best response max_φ V (Newton's method).
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Prop. 1, Thm. 1.
 *
 * @example Minimum −ln 4 at the data mean
 * ```ts
 * import { optimalProfile } from "./value_surface.ts";
 * import { locationGame } from "./game.ts";
 * import assert from "node:assert/strict";
 * const pr = optimalProfile(locationGame({ mean: 1 }), {
 *   theta: { parameter: "mu", range: [-1, 3], points: 5 }, restricted: false,
 * });
 * assert.equal(pr.argmin, 1);
 * assert.ok(Math.abs(pr.min + Math.log(4)) < 1e-9);
 * ```
 */
export function optimalProfile(game: Game, options: OptimalProfileOptions): OptimalProfile {
  const ref = resolveParameter(game, options.theta?.parameter, "theta.parameter");
  if (ref.player !== "generator") {
    throw new SaddleError(
      "invalid-argument",
      `theta.parameter must be a generator parameter, got ${ref.name}`,
      {
        parameter: "theta.parameter",
      },
    );
  }
  const pData = game.data.density, gd = game.generator.density;
  if (!pData || !gd) {
    throw new SaddleError(
      "invalid-argument",
      "the profile needs the densities of data and generator; this game has none for " +
        (pData ? "the generator" : "the data"),
      { parameter: "game" },
    );
  }
  const thetas = axisValues(options.theta, "theta");
  const base = basePoint(game, options.at);
  const p = game.generator.names.length;
  const value: Estimate[] = [], jsd: Estimate[] = [];
  const fromJsd = new Float64Array(thetas.length);
  const restricted = options.restricted === false ? undefined : new Float64Array(thetas.length);
  let start: Float64Array | undefined;
  for (const [i, t] of thetas.entries()) {
    const theta = Float64Array.from(base.subarray(0, p));
    theta[ref.index] = t;
    const dec = optimumDecomposition(pData, gd(theta), {
      method: "grid",
      gridSize: options.gridSize ?? (game.data.d === 1 ? 400 : 60),
    });
    value.push(dec.value);
    jsd.push(dec.jsd);
    fromJsd[i] = -Math.log(4) + 2 * dec.jsd.value;
    if (restricted) {
      const br = bestResponseOrNaN(game, theta, start, options.penalty);
      restricted[i] = br.value;
      start = br.phi;
    }
  }
  let argmin = 0;
  for (let i = 1; i < thetas.length; i++) if (value[i].value < value[argmin].value) argmin = i;
  const result: OptimalProfile = {
    parameter: ref,
    thetas,
    value,
    jsd,
    fromJsd,
    ...(restricted ? { restricted } : {}),
    argmin: thetas[argmin],
    min: value[argmin].value,
  };
  return withDisplay(result, (r) => {
    const header = [
      r.parameter.name,
      "V(D*, θ)",
      "JSD",
      "−ln 4 + 2 JSD",
      ...(r.restricted ? ["max_φ V"] : []),
    ];
    const rows: TableCell[][] = [...r.thetas].map((t, i) => [
      t,
      r.value[i],
      r.jsd[i],
      r.fromJsd[i],
      ...(r.restricted ? [r.restricted[i]] : []),
    ]);
    const title = `Optimal-discriminator profile along ${r.parameter.name}: minimum ${
      formatNumber(r.min, 6)
    } at ${formatNumber(r.argmin)}`;
    return {
      "text/plain": `${title}\n${textTable(header, rows)}`,
      "text/html": htmlTable(header, rows, title),
    };
  });
}

function bestResponseOrNaN(
  game: Game,
  theta: Float64Array,
  start: Float64Array | undefined,
  penalty: Penalty | null | undefined,
): { value: number; phi: Float64Array | undefined } {
  try {
    const br = bestResponse(game, {
      theta,
      ...(start ? { start } : {}),
      penalty: penalty ?? null,
    });
    return { value: br.value, phi: br.phi };
  } catch (e) {
    if (e instanceof SaddleError && e.code === "numerical") return { value: NaN, phi: undefined };
    throw e;
  }
}
