/**
 * Phase snapshots of a neural-lab run: small multiples of p_data, p_g and D at chosen steps.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { fitKde } from "../density/kde.ts";
import type { Density } from "../density/types.ts";
import { optimalDiscriminator } from "../discriminator/optimal_discriminator.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import type { NeuralRun, NeuralSnapshot } from "../game/neural_lab.ts";
import { dotStyle, EQUILIBRIUM_VALUES, lineStyle, referenceY } from "./axes.ts";
import { composeFigure, type PanelSpec } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { type AxisRange, grid1d, grid2d, plottingRange, subsampleRows } from "./_grid.ts";
import { dStarColor, PALETTE } from "./palette.ts";

/** Options of {@linkcode plotPhaseSnapshots}. */
export interface PhaseSnapshotsPlotOptions {
  /** Steps to show (snapshots at or just before them; default up to 4 spread over the run). */
  steps?: readonly number[];
  /** Plotting range per dimension (default from the real and generated points). */
  domain?: readonly AxisRange[];
  /** Title. */
  title?: string;
  /** Panel width in px (default 260). */
  width?: number;
  /** Panel height in px (default 230). */
  height?: number;
}

function pick(run: NeuralRun, steps?: readonly number[]): NeuralSnapshot[] {
  const snaps = run.snapshots;
  if (!steps) {
    const k = Math.min(4, snaps.length);
    return Array.from(
      { length: k },
      (_, i) => snaps[Math.round((i * (snaps.length - 1)) / Math.max(1, k - 1))],
    );
  }
  return steps.map((s) => {
    let best = snaps[0];
    for (const x of snaps) if (x.step <= s) best = x;
    return best;
  });
}

/**
 * Phases of training as small multiples (the picture of Goodfellow et al. 2014, Fig. 1): in
 * 1-D the data density, the density of the generated points (KDE) and the trained D(x) with
 * D* on a second axis; in 2-D real and generated points over the map of the trained D with
 * its D = 1/2 contour. At a good end, p_g lies on p_data and D is 1/2 everywhere.
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Fig. 1, Alg. 1.
 *
 * @example
 * ```ts
 * import { plotPhaseSnapshots } from "./phase_snapshots_plot.ts";
 * import { trainNeuralGan } from "../game/mod.ts";
 * import assert from "node:assert/strict";
 * const data = Array.from({ length: 300 }, (_, i) => Math.sin(i) + 1);
 * const run = trainNeuralGan({ data, steps: 40, hidden: [8], recordEvery: 20, theory: false, seed: 1 });
 * assert.match(plotPhaseSnapshots(run).toSVG(), /step 40/);
 * ```
 */
export function plotPhaseSnapshots(
  run: NeuralRun,
  options: PhaseSnapshotsPlotOptions = {},
): Figure {
  const d = run.real.d;
  if (d > 2) {
    throw new SaddleError(
      "invalid-argument",
      `phase snapshots show 1-D or 2-D data, got d = ${d}`,
      {
        parameter: "run",
      },
    );
  }
  const snaps = pick(run, options.steps);
  const w = options.width ?? 260, h = options.height ?? 230;
  const domain = options.domain ?? plottingRange([run.real, ...snaps.map((s) => s.generated)]);
  const panels: PanelSpec[] = [];
  const pData: Density = run.pData ?? fitKde(run.real);
  if (d === 1) {
    const g = grid1d(domain[0], 241);
    const xs = Array.from(g.data);
    const pd = pData.logPdf(g).map(Math.exp);
    let top = Math.max(...pd);
    const rows = snaps.map((s) => {
      const pModel = s.pModel ?? fitKde(s.generated);
      const pg = pModel.logPdf(g).map(Math.exp);
      top = Math.max(top, ...pg);
      return {
        s,
        pg,
        dx: s.discriminator.prob(g),
        ds: optimalDiscriminator(pData, pModel).prob(g),
      };
    });
    for (const r of rows) {
      const pts = xs.map((x, i) => ({ x, p: pd[i], q: r.pg[i], D: r.dx[i], Ds: r.ds[i] }));
      panels.push({
        width: w,
        height: h,
        title: `step ${r.s.step}`,
        margin: { right: 40 },
        layers: [
          {
            x: { domain: domain[0], label: "x" },
            y: { domain: [0, top * 1.05], label: "density" },
            marks: [
              Plot.line(pts, { x: "x", y: "p", ...lineStyle("real") }),
              Plot.line(pts, { x: "x", y: "q", ...lineStyle("generated") }),
            ],
          },
          {
            x: { domain: domain[0], axis: null },
            y: { domain: [0, 1], axis: "right", label: "D(x)" },
            marks: [
              ...referenceY(EQUILIBRIUM_VALUES.dStar),
              Plot.line(pts, { x: "x", y: "Ds", ...lineStyle("optimal"), strokeWidth: 1.5 }),
              Plot.line(pts, { x: "x", y: "D", ...lineStyle("discriminator") }),
            ],
          },
        ],
      });
    }
  } else {
    const n = 60;
    const [xr, yr] = domain;
    // The grid reaches two cells beyond the frame, so contours closing along its edge stay
    // out of sight (as in plotDiscriminatorMap).
    const ex = (2 * (xr[1] - xr[0])) / n, ey = (2 * (yr[1] - yr[0])) / n;
    const gx: AxisRange = [xr[0] - ex, xr[1] + ex], gy: AxisRange = [yr[0] - ey, yr[1] + ey];
    const g = grid2d(gx, gy, n + 4, n + 4);
    for (const s of snaps) {
      const values = Array.from(s.discriminator.prob(g));
      const base = {
        width: n + 4,
        height: n + 4,
        x1: gx[0],
        x2: gx[1],
        y1: gy[0],
        y2: gy[1],
        value: Plot.identity,
        clip: true,
      };
      const sub = (set: typeof run.real, tag: string) => subsampleRows(set, 300, `phase:${tag}`);
      const realRows = sub(run.real, "real"), fakeRows = sub(s.generated, `fake${s.step}`);
      panels.push({
        width: w,
        height: h,
        title: `step ${s.step}`,
        layers: [{
          x: { domain: xr, label: "x1" },
          y: { domain: yr, label: "x2" },
          marks: [
            Plot.contour(values, {
              ...base,
              thresholds: [0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9],
              fill: (c: { value: number }) => dStarColor(c.value + 0.05, 0.4),
              stroke: "none",
            }),
            Plot.contour(values, {
              ...base,
              thresholds: [0.5],
              stroke: PALETTE.discriminator.color,
              strokeWidth: 1.5,
            }),
            Plot.dot(realRows, {
              x: (i: number) => run.real.data[2 * i],
              y: (i: number) => run.real.data[2 * i + 1],
              ...dotStyle("real"),
              r: 1.6,
              clip: true,
            }),
            Plot.dot(fakeRows, {
              x: (i: number) => s.generated.data[2 * i],
              y: (i: number) => s.generated.data[2 * i + 1],
              ...dotStyle("generated"),
              r: 1.6,
              clip: true,
            }),
          ],
        }],
      });
    }
  }
  return composeFigure({
    title: options.title ?? `Phases of training: ${run.settings.data}`,
    subtitle: snaps.map((s) =>
      `step ${s.step}: mean D ${s.meanDReal.toFixed(2)} / ${s.meanDFake.toFixed(2)}` +
      (s.jsd ? `, JSD ${s.jsd.value.toFixed(3)}` : "") +
      (s.coverage ? `, ${s.coverage.modesHit.value} of ${s.coverage.modes} modes` : "")
    ).join("; "),
    legend: d === 1
      ? [
        { label: "p_data", role: "real" },
        { label: "p_g (KDE of generated points)", role: "generated" },
        { label: "trained D(x), right axis", role: "discriminator" },
        { label: "D* = p_data / (p_data + p_g)", role: "optimal" },
      ]
      : [
        { label: "real data", role: "real", shape: "dot" },
        { label: "generated data", role: "generated", shape: "dot" },
        { label: "trained D = 1/2", role: "discriminator", dash: "none" },
        { shape: "ramp", label: "D(x)", domain: [0, 1], color: (t: number) => dStarColor(t, 0.4) },
      ],
    panels,
    columns: Math.min(4, panels.length),
  });
}
