/**
 * Eigenvalues of a game's Jacobian in the complex plane with the stability region of the
 * update rule, and the eigenvalues of the update maps against the unit circle.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { Stability } from "../game/stability.ts";
import { lineStyle } from "./axes.ts";
import { composeFigure } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { PALETTE } from "./palette.ts";

/** Options of {@linkcode plotEigenvalues}. */
export interface EigenvaluePlotOptions {
  /** Title. */
  title?: string;
  /** Panel size in px (default 320). */
  size?: number;
}

function circle(cx: number, cy: number, r: number): { x: number; y: number }[] {
  return Array.from({ length: 181 }, (_, i) => {
    const t = (2 * Math.PI * i) / 180;
    return { x: cx + r * Math.cos(t), y: cy + r * Math.sin(t) };
  });
}

/**
 * Two panels: (1) the eigenvalues λ of the Jacobian of the gradient field, with the region
 * where simultaneous gradient steps of rate h converge, |1 + hλ| < 1 (the disc of radius
 * 1/h around −1/h; one disc per distinct rate), and the imaginary axis that continuous-time
 * dynamics must stay left of; (2) the eigenvalues of the simultaneous and alternating update
 * maps against the unit circle (inside: locally convergent).
 *
 * References: Mescheder, Nowozin & Geiger 2017, The Numerics of GANs (NeurIPS); Mescheder,
 * Geiger & Nowozin 2018 (ICML), Sec. 2–3.
 *
 * @example
 * ```ts
 * import { plotEigenvalues } from "./eigenvalue_plot.ts";
 * import { diracGame, stability } from "../game/mod.ts";
 * import assert from "node:assert/strict";
 * assert.match(plotEigenvalues(stability(diracGame(), { learningRate: 0.5 })).toSVG(), /unit circle/);
 * ```
 */
export function plotEigenvalues(s: Stability, options: EigenvaluePlotOptions = {}): Figure {
  const size = options.size ?? 320;
  const rates = [...new Set([s.learningRate.generator, s.learningRate.discriminator])];
  const ev = s.eigenvalues.map((e) => ({ x: e.re, y: e.im }));
  const reach = Math.max(1e-3, ...ev.map((e) => Math.hypot(e.x, e.y))) * 1.4;
  const left = Math.min(-reach, ...rates.map((h) => -2 / h)) * 1.05;
  // Keep the plane square around the eigenvalues, widened to show the discs.
  const half = Math.max(reach, -left / 2);
  const jMarks: Plot.Markish[] = [
    Plot.ruleX([0], { stroke: "#999", strokeWidth: 1 }),
    Plot.ruleY([0], { stroke: "#ccc", strokeWidth: 1 }),
    ...rates.map((h) =>
      Plot.line(circle(-1 / h, 0, 1 / h), {
        x: "x",
        y: "y",
        ...lineStyle("reference"),
        fill: PALETTE.real.color,
        fillOpacity: 0.07,
        clip: true,
      })
    ),
    Plot.dot(ev, { x: "x", y: "y", symbol: "diamond", r: 6, fill: PALETTE.optimal.color }),
  ];
  const maps = [
    ...s.simultaneous.eigenvalues.map((e) => ({ x: e.re, y: e.im, rule: "simultaneous" })),
    ...s.alternating.eigenvalues.map((e) => ({ x: e.re, y: e.im, rule: "alternating" })),
  ];
  const mReach = Math.max(1.2, ...maps.map((e) => Math.hypot(e.x, e.y) * 1.1));
  const mMarks: Plot.Markish[] = [
    Plot.line(circle(0, 0, 1), { x: "x", y: "y", ...lineStyle("reference") }),
    Plot.ruleX([0], { stroke: "#ddd" }),
    Plot.ruleY([0], { stroke: "#ddd" }),
    Plot.dot(maps.filter((m) => m.rule === "simultaneous"), {
      x: "x",
      y: "y",
      symbol: "square",
      r: 5,
      fill: PALETTE.discriminator.color,
    }),
    Plot.dot(maps.filter((m) => m.rule === "alternating"), {
      x: "x",
      y: "y",
      symbol: "circle",
      r: 5,
      fill: "none",
      stroke: PALETTE.real.color,
      strokeWidth: 2,
    }),
  ];
  const hText = rates.length === 1 ? `h = ${rates[0]}` : `h = ${rates.join(", ")}`;
  return composeFigure({
    title: options.title ?? "Local stability: Jacobian eigenvalues and update maps",
    subtitle:
      `simultaneous ρ = ${
        s.simultaneous.spectralRadius.toPrecision(5)
      } (${s.simultaneous.verdict}), ` +
      `alternating ρ = ${
        s.alternating.spectralRadius.toPrecision(5)
      } (${s.alternating.verdict}); ${hText}, k = ${s.k}`,
    legend: [
      { label: "eigenvalues of J", color: PALETTE.optimal.color, shape: "dot" },
      {
        label: `|1 + hλ| < 1: simultaneous steps converge (${hText})`,
        color: PALETTE.real.color,
        shape: "band",
      },
      { label: "simultaneous map", color: PALETTE.discriminator.color, shape: "dot" },
      { label: "alternating map", color: PALETTE.real.color, shape: "dot" },
      { label: "unit circle", role: "reference" },
    ],
    panels: [
      {
        width: size,
        height: size,
        title: "Jacobian of the gradient field",
        layers: [{
          x: { domain: [Math.min(left, -half), half], label: "Re λ" },
          y: { domain: [-half, half], label: "Im λ" },
          marks: jMarks,
        }],
      },
      {
        width: size,
        height: size,
        title: "update maps (G step + its D steps)",
        layers: [{
          x: { domain: [-mReach, mReach], label: "Re μ" },
          y: { domain: [-mReach, mReach], label: "Im μ" },
          marks: mMarks,
        }],
      },
    ],
    caption: s.notes.length ? [...s.notes] : undefined,
    marks: jMarks,
  });
}
