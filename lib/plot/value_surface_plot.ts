/**
 * The value surface V(φ, θ) of a parametric game: filled contours, the best-response curves
 * φ*(θ) and θ*(φ), the saddle points, and optionally simulated trajectories over it.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { formatNumber } from "../display/mod.ts";
import type { Simulation } from "../game/simulate_training.ts";
import type { ValueSurface } from "../game/value_surface.ts";
import { dotStyle, lineStyle } from "./axes.ts";
import { composeFigure, type LegendItem } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { PALETTE } from "./palette.ts";
import { trajectoryPath } from "./_trajectory.ts";

/** Options of {@linkcode plotValueSurface}. */
export interface ValueSurfacePlotOptions {
  /** Simulated training runs to draw over the surface. */
  trajectories?: readonly Simulation[];
  /** Number of contour bands (default 14). */
  bands?: number;
  /** Title. */
  title?: string;
  /** Panel width in px (default 520). */
  width?: number;
  /** Panel height in px (default 440). */
  height?: number;
}

/** A coordinate for text: rounding noise below 1e-9 of the axis span shows as 0. */
function snap(v: number, span: number): string {
  return formatNumber(Math.abs(v) < 1e-9 * span ? 0 : v);
}

/** A light-to-dark ramp from the generated colour's side (low V) to the real one's (high V). */
function valueColor(t: number): string {
  const a = [0xf0, 0xb4, 0x4c], m = [0xf5, 0xf2, 0xec], b = [0x1f, 0x6a, 0x88];
  const [from, to, s] = t < 0.5 ? [a, m, t * 2] : [m, b, (t - 0.5) * 2];
  const c = from.map((v, i) => Math.round(v + (to[i] - v) * s));
  return `rgb(${c[0]},${c[1]},${c[2]})`;
}

/**
 * Draw a value surface ({@linkcode valueSurface}'s result): V as filled contours (the
 * generator's colour where V is low, the data's where it is high), contour lines, the
 * discriminator's best response φ*(θ) (argmax V, solid) and the generator's θ*(φ)
 * (argmin V, dashed), the saddle points as diamonds, and simulated trajectories.
 *
 * References: Goodfellow et al. 2014 (NeurIPS), Eq. 1; Mescheder et al. 2018 (ICML), Fig. 1.
 *
 * @example
 * ```ts
 * import { plotValueSurface } from "./value_surface_plot.ts";
 * import { diracGame, valueSurface } from "../game/mod.ts";
 * import assert from "node:assert/strict";
 * const s = valueSurface(diracGame(), {
 *   x: { parameter: "theta", range: [-2, 2], points: 21 },
 *   y: { parameter: "psi", range: [-2, 2], points: 21 },
 * });
 * assert.match(plotValueSurface(s).toSVG(), /saddle/);
 * ```
 */
export function plotValueSurface(
  surface: ValueSurface,
  options: ValueSurfacePlotOptions = {},
): Figure {
  const { xs, ys, values } = surface;
  const nx = xs.length, ny = ys.length;
  const hx = (xs[nx - 1] - xs[0]) / (nx - 1), hy = (ys[ny - 1] - ys[0]) / (ny - 1);
  let lo = Infinity, hi = -Infinity;
  for (const v of values) {
    if (Number.isFinite(v)) {
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
    }
  }
  const bands = options.bands ?? 14;
  const thresholds = Array.from(
    { length: bands - 1 },
    (_, i) => lo + ((hi - lo) * (i + 1)) / bands,
  );
  const base = {
    width: nx,
    height: ny,
    x1: xs[0] - hx / 2,
    x2: xs[nx - 1] + hx / 2,
    y1: ys[0] - hy / 2,
    y2: ys[ny - 1] + hy / 2,
    value: Plot.identity,
    clip: true,
  };
  const marks: Plot.Markish[] = [
    Plot.contour(Array.from(values), {
      ...base,
      thresholds: [lo - 1, ...thresholds],
      fill: (c: { value: number }) =>
        valueColor(hi > lo ? (c.value - lo) / (hi - lo) + 0.5 / bands : 0.5),
      stroke: "none",
    }),
    Plot.contour(Array.from(values), {
      ...base,
      thresholds,
      stroke: "#555",
      strokeWidth: 0.5,
      strokeOpacity: 0.6,
    }),
  ];
  const legend: LegendItem[] = [];
  for (const c of surface.bestResponses) {
    // The curve: the best value of the responding axis against the conditioning axis.
    const respondsOnX = (c.player === "discriminator") === (surface.x.player === "discriminator");
    const pts = Array.from(c.given, (g, i) => respondsOnX ? [c.best[i], g] : [g, c.best[i]]);
    const style = c.player === "discriminator"
      ? lineStyle("optimal")
      : { ...lineStyle("optimal"), strokeDasharray: "5 3" };
    marks.push(
      Plot.line(pts, {
        x: (d: number[]) => d[0],
        y: (d: number[]) => d[1],
        ...style,
        strokeWidth: 1.8,
        clip: true,
      }),
    );
    legend.push(
      c.player === "discriminator"
        ? { label: "φ*(θ): the discriminator's best response", role: "optimal", strokeWidth: 1.8 }
        : {
          label: "θ*(φ): the generator's best response",
          role: "optimal",
          dash: "5 3",
          strokeWidth: 1.8,
        },
    );
  }
  for (const [i, sim] of (options.trajectories ?? []).entries()) {
    const pts = trajectoryPath(sim, surface.x.stacked, surface.y.stacked);
    marks.push(
      Plot.line(pts, {
        x: "x",
        y: "y",
        ...lineStyle("discriminator"),
        strokeWidth: 1.3,
        clip: true,
      }),
    );
    marks.push(Plot.dot([pts[0]], { x: "x", y: "y", ...dotStyle("discriminator"), r: 3.5 }));
    if (i === 0) {
      legend.push({ label: "simulated training (start: square)", role: "discriminator" });
    }
  }
  if (surface.saddles.length) {
    marks.push(
      Plot.dot(surface.saddles, {
        x: "x",
        y: "y",
        symbol: "diamond",
        r: 6,
        fill: "white",
        stroke: PALETTE.optimal.color,
        strokeWidth: 2,
      }),
    );
    legend.push({ label: "saddle point", role: "optimal", shape: "dot" });
  }
  legend.push({
    shape: "ramp",
    label: "V(φ, θ)",
    domain: [lo, hi],
    color: (v: number) => valueColor(hi > lo ? (v - lo) / (hi - lo) : 0.5),
  });
  const saddle = surface.saddles[0];
  return composeFigure({
    title: options.title ?? `Value surface of ${surface.game}`,
    subtitle:
      `V(φ, θ) over ${surface.x.name} × ${surface.y.name} (${surface.method}, ${nx} × ${ny} grid)` +
      (saddle
        ? `; saddle at (${snap(saddle.x, xs[nx - 1] - xs[0])}, ${
          snap(saddle.y, ys[ny - 1] - ys[0])
        }), V = ${formatNumber(saddle.value)}`
        : ""),
    legend,
    panels: [{
      width: options.width ?? 520,
      height: options.height ?? 440,
      layers: [{
        x: {
          domain: [xs[0], xs[nx - 1]],
          label: `${surface.x.name} (${surface.x.player === "generator" ? "θ" : "φ"})`,
        },
        y: {
          domain: [ys[0], ys[ny - 1]],
          label: `${surface.y.name} (${surface.y.player === "generator" ? "θ" : "φ"})`,
        },
        marks,
      }],
    }],
    caption: surface.notes.length ? [...surface.notes] : undefined,
    marks,
  });
}
