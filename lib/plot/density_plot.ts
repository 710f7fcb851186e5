/**
 * Densities of both sides on one axis and the optimal discriminator D* on a second axis
 * (1-D), with the D* = 1/2 line.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { Density } from "../density/types.ts";
import { optimalDiscriminator } from "../discriminator/optimal_discriminator.ts";
import { pointwiseMaximiser } from "../discriminator/pointwise_objective.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import type { Samples } from "../samples/samples.ts";
import { axisLabel, EQUILIBRIUM_VALUES, lineStyle, referenceY } from "./axes.ts";
import { composeFigure } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { type AxisRange, grid1d, plottingRange, requireDimension } from "./_grid.ts";
import { PALETTE } from "./palette.ts";

/** Density values of both sides tabulated on a common grid (not log values). */
export interface DensityCurves {
  /** Grid points, increasing. */
  x: ArrayLike<number>;
  /** p_data at each grid point. */
  real: ArrayLike<number>;
  /** p_g at each grid point. */
  generated: ArrayLike<number>;
}

/** Options of {@linkcode plotDensities}. */
export interface DensityPlotOptions {
  /** x range (default: from the samples, or from draws of the densities). */
  domain?: AxisRange;
  /** Grid points (default 401). */
  points?: number;
  /** Name of the variable (default "x"). */
  xLabel?: string;
  /** Unit of the variable, e.g. "m/s"; the density axis then reads 1/(unit). */
  xUnit?: string;
  /** Samples behind the densities: they set the range and the sample sizes shown. */
  samples?: { real?: Samples; generated?: Samples };
  /** Legend labels (default "real data", "generated data"). */
  labels?: { real?: string; generated?: string };
  /** Title (default "Densities of both sides and the optimal discriminator"). */
  title?: string;
  /** Subtitle (default: the sample sizes, when known). */
  subtitle?: string;
  /** Width and height of the plot area's panel in px (default 640 x 340). */
  width?: number;
  /** Panel height in px. */
  height?: number;
}

/**
 * Plot p_data and p_g of a 1-D problem and D*(x) = p_data / (p_data + p_g) on a second
 * axis, with the equilibrium line D* = 1/2. From two Densities (D* through
 * `optimalDiscriminator`, in log space) or from tabulated density values.
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Prop. 1.
 *
 * @example
 * ```ts
 * import { plotDensities } from "./density_plot.ts";
 * import { gaussian } from "../density/gaussian.ts";
 * import assert from "node:assert/strict";
 * const fig = plotDensities(gaussian([0], [[1]]), gaussian([1], [[1]]), { domain: [-4, 5] });
 * assert.match(fig.toSVG(), /D\* = 1\/2/);
 * assert.equal(fig.marks.length, 4);
 * ```
 */
export function plotDensities(
  pData: Density | DensityCurves,
  pModel?: Density | DensityPlotOptions,
  options: DensityPlotOptions = {},
): Figure {
  let x: Float64Array, p: Float64Array, q: Float64Array, dStar: Float64Array;
  let opts: DensityPlotOptions;
  if (isCurves(pData)) {
    opts = (pModel as DensityPlotOptions | undefined) ?? {};
    ({ x, p, q, dStar } = fromCurves(pData));
  } else {
    if (!pModel || !("logPdf" in pModel)) {
      throw new SaddleError("invalid-argument", "give two Densities or one DensityCurves", {
        parameter: "pModel",
      });
    }
    opts = options;
    requireDimension(pData, 1, "pData");
    requireDimension(pModel, 1, "pModel");
    const sets = [opts.samples?.real, opts.samples?.generated].filter((s): s is Samples => !!s);
    const domain = opts.domain ?? plottingRange(sets, [pData, pModel])[0];
    const g = grid1d(domain, opts.points ?? 401);
    x = g.data;
    p = pData.logPdf(g).map(Math.exp);
    q = pModel.logPdf(g).map(Math.exp);
    dStar = optimalDiscriminator(pData, pModel).prob(g);
  }
  const labels = { real: PALETTE.real.label, generated: PALETTE.generated.label, ...opts.labels };
  const nReal = opts.samples?.real?.n, nGen = opts.samples?.generated?.n;
  const sizes = [
    nReal !== undefined ? `n = ${nReal} real` : "",
    nGen !== undefined ? `n = ${nGen} generated` : "",
  ].filter(Boolean).join(", ");
  const domain: AxisRange = [x[0], x[x.length - 1]];
  const xLabel = axisLabel(opts.xLabel ?? "x", { unit: opts.xUnit });
  const rows = Array.from(x, (v, i) => ({ x: v, p: p[i], q: q[i], d: dStar[i] }));
  const densityMarks: Plot.Markish[] = [
    Plot.areaY(rows, { x: "x", y: "p", fill: PALETTE.real.color, fillOpacity: 0.12 }),
    Plot.areaY(rows, { x: "x", y: "q", fill: PALETTE.generated.color, fillOpacity: 0.16 }),
    Plot.lineY(rows, { x: "x", y: "p", ...lineStyle("real") }),
    Plot.lineY(rows, { x: "x", y: "q", ...lineStyle("generated") }),
  ];
  const dStarMarks: Plot.Markish[] = [
    ...referenceY(EQUILIBRIUM_VALUES.dStar, { label: "D* = 1/2" }),
    Plot.lineY(rows, { x: "x", y: "d", ...lineStyle("optimal") }),
  ];
  const width = opts.width ?? 640, height = opts.height ?? 340;
  return composeFigure({
    title: opts.title ?? "Densities of both sides and the optimal discriminator",
    ...(opts.subtitle ?? sizes ? { subtitle: opts.subtitle ?? sizes } : {}),
    legend: [
      { label: labels.real, role: "real", shape: "band" },
      { label: labels.generated, role: "generated", shape: "band" },
      { label: "D*(x), right axis", role: "optimal" },
      { label: "D* = 1/2 (p_g = p_data)", role: "reference" },
    ],
    panels: [{
      width,
      height,
      margin: { right: 58 },
      layers: [
        {
          x: { domain, label: xLabel },
          y: {
            label: axisLabel("density", { unit: opts.xUnit ? `1/(${opts.xUnit})` : undefined }),
            grid: true,
            zero: true,
          },
          marks: densityMarks,
        },
        {
          x: { domain, axis: null },
          y: { domain: [0, 1], axis: "right", label: "D*(x) = p_data / (p_data + p_g)" },
          marks: dStarMarks,
        },
      ],
    }],
    marks: densityMarks,
  });
}

function isCurves(v: unknown): v is DensityCurves {
  return typeof v === "object" && v !== null && "x" in v && "real" in v && "generated" in v;
}

function fromCurves(c: DensityCurves) {
  const m = c.x.length;
  if (m < 2 || c.real.length !== m || c.generated.length !== m) {
    throw new SaddleError(
      "dimension-mismatch",
      `x, real and generated need the same length >= 2 (got ${m}, ${c.real.length}, ` +
        `${c.generated.length})`,
      { parameter: "curves" },
    );
  }
  const x = Float64Array.from(c.x),
    p = Float64Array.from(c.real),
    q = Float64Array.from(c.generated);
  const dStar = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    // Both densities 0: no evidence either way, D* = 1/2 as optimalDiscriminator documents.
    dStar[i] = p[i] + q[i] > 0 ? pointwiseMaximiser(p[i], q[i]) : EQUILIBRIUM_VALUES.dStar;
  }
  return { x, p, q, dStar };
}
