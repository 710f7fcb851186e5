/**
 * The gradient field of a parametric game as arrows, with simulated trajectories over it.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { GradientFieldGrid } from "../game/gradient_field_grid.ts";
import type { Simulation } from "../game/simulate_training.ts";
import { dotStyle } from "./axes.ts";
import { composeFigure, type LegendItem } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { PALETTE } from "./palette.ts";
import { trajectoryPath } from "./_trajectory.ts";

/** Options of {@linkcode plotGradientField}. */
export interface GradientFieldPlotOptions {
  /** Simulated runs to draw over the field (each labelled by its settings). */
  trajectories?: readonly Simulation[];
  /** Title. */
  title?: string;
  /** Panel width in px (default 480). */
  width?: number;
  /** Panel height in px (default 440). */
  height?: number;
}

const RUN_COLORS = [
  PALETTE.discriminator.color,
  PALETTE.real.color,
  PALETTE.optimal.color,
  "#6b8e23",
];

/**
 * Arrows of the gradient field v = (−∇_θ L_G, +∇_φ objective_D) on its grid (direction in
 * screen space, length growing with |v|), and simulated trajectories over it, so the
 * rotation around the Dirac game's equilibrium and the spiral of each update rule show.
 *
 * References: Mescheder, Geiger & Nowozin 2018 (ICML), Fig. 1.
 *
 * @example
 * ```ts
 * import { plotGradientField } from "./gradient_field_plot.ts";
 * import { diracGame, gradientFieldGrid } from "../game/mod.ts";
 * import assert from "node:assert/strict";
 * const f = gradientFieldGrid(diracGame(), {
 *   x: { parameter: "theta", range: [-2, 2] }, y: { parameter: "psi", range: [-2, 2] },
 * });
 * assert.match(plotGradientField(f).toSVG(), /<svg/);
 * ```
 */
export function plotGradientField(
  field: GradientFieldGrid,
  options: GradientFieldPlotOptions = {},
): Figure {
  const { xs, ys, u, v } = field;
  const nx = xs.length, ny = ys.length;
  const width = options.width ?? 480, height = options.height ?? 440;
  // Pixels per unit of each axis (inside the default margins), for screen-space directions.
  const sx = (width - 84) / (xs[nx - 1] - xs[0]), sy = (height - 64) / (ys[ny - 1] - ys[0]);
  let top = 0;
  for (let i = 0; i < u.length; i++) top = Math.max(top, Math.hypot(u[i] * sx, v[i] * sy));
  const cell = Math.min((width - 84) / nx, (height - 64) / ny) * 0.9;
  const rows: { x: number; y: number; length: number; rotate: number }[] = [];
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const k = j * nx + i, px = u[k] * sx, py = v[k] * sy, m = Math.hypot(px, py);
      rows.push({
        x: xs[i],
        y: ys[j],
        length: top > 0 ? cell * Math.sqrt(m / top) : 0,
        rotate: (Math.atan2(px, py) * 180) / Math.PI,
      });
    }
  }
  const marks: Plot.Markish[] = [
    Plot.vector(rows, {
      x: "x",
      y: "y",
      length: "length",
      rotate: "rotate",
      stroke: "#6d6d6d",
      strokeWidth: 1,
      anchor: "middle",
    }),
  ];
  const legend: LegendItem[] = [{
    label: "v = (−∇θ L_G, ∇φ V)",
    color: "#6d6d6d",
    dash: "none",
    strokeWidth: 1,
  }];
  for (const [i, sim] of (options.trajectories ?? []).entries()) {
    const pts = trajectoryPath(sim, field.x.stacked, field.y.stacked);
    const color = RUN_COLORS[i % RUN_COLORS.length];
    marks.push(Plot.line(pts, { x: "x", y: "y", stroke: color, strokeWidth: 1.6, clip: true }));
    marks.push(
      Plot.dot([pts[0]], { x: "x", y: "y", ...dotStyle("discriminator"), fill: color, r: 3.5 }),
    );
    const s = sim.settings;
    legend.push({
      label: `${s.updates}, k = ${s.k}, h = ${s.learningRate.generator}${
        s.penalty ? `, ${s.penalty.kind.toUpperCase()} γ = ${s.penalty.weight}` : ""
      }: ${sim.verdict}`,
      color,
      dash: "none",
    });
  }
  return composeFigure({
    title: options.title ?? `Gradient field of ${field.game}`,
    subtitle: `${field.x.name} × ${field.y.name}; arrow length ∝ √|v|`,
    legend,
    panels: [{
      width,
      height,
      layers: [{
        x: {
          domain: [xs[0], xs[nx - 1]],
          label: `${field.x.name} (${field.x.player === "generator" ? "θ" : "φ"})`,
        },
        y: {
          domain: [ys[0], ys[ny - 1]],
          label: `${field.y.name} (${field.y.player === "generator" ? "θ" : "φ"})`,
        },
        marks,
      }],
    }],
    marks,
  });
}
