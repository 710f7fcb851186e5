/**
 * 2-D scatter of both sides over a heat map of D* (or of a trained discriminator) with its
 * 1/4, 1/2 and 3/4 contours.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { Density } from "../density/types.ts";
import { optimalDiscriminator } from "../discriminator/optimal_discriminator.ts";
import type { Discriminator } from "../discriminator/types.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import type { RandomSource } from "../random/rng.ts";
import type { Samples } from "../samples/samples.ts";
import { dotStyle } from "./axes.ts";
import { columnLabel, type ColumnLabelOptions } from "./_axis_labels.ts";
import { composeFigure } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { type AxisRange, grid2d, plottingRange, requireDimension, subsampleRows } from "./_grid.ts";
import { dStarColor, PALETTE } from "./palette.ts";

/** Input of {@linkcode plotDiscriminatorMap}. */
export interface DiscriminatorMapInput extends ColumnLabelOptions {
  /** Real samples to scatter (2-D). */
  real?: Samples;
  /** Generated samples to scatter (2-D). */
  generated?: Samples;
  /** Data density: with `pModel`, the map shows D* = p_data / (p_data + p_g). */
  pData?: Density;
  /** Model density. */
  pModel?: Density;
  /** Or any discriminator (e.g. a trained one) to map instead of D*. */
  discriminator?: Discriminator;
  /** Name of the mapped function in labels (default "D*" or "D"). */
  name?: string;
  /** Ranges of the two axes (default: from the samples or density draws). */
  domain?: readonly [AxisRange, AxisRange];
  /** Grid cells per axis (default 90). */
  resolution?: number;
  /** At most this many points of each side are drawn (default 700). */
  maxPoints?: number;
  /** Seed of the subsample of drawn points (default 0). */
  seed?: RandomSource;
  /** Title. */
  title?: string;
  /** Panel width in px (default 560). */
  width?: number;
  /** Panel height in px (default 460). */
  height?: number;
}

const TINT = 0.4;
const BANDS = [0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9];

/**
 * Scatter both sides of a 2-D problem over the map of D*(x) = p_data / (p_data + p_g)
 * (from two Densities) or of a given discriminator, with contours at 1/4, 1/2 (bold: the
 * decision boundary, and the value everywhere at the equilibrium) and 3/4.
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Prop. 1.
 *
 * @example
 * ```ts
 * import { plotDiscriminatorMap } from "./discriminator_map.ts";
 * import { gaussian } from "../density/gaussian.ts";
 * import assert from "node:assert/strict";
 * const pData = gaussian([0, 0], [[1, 0], [0, 1]]), pModel = gaussian([1, 1], [[1, 0], [0, 1]]);
 * const fig = plotDiscriminatorMap({
 *   pData, pModel, real: pData.sample(50, 1), generated: pModel.sample(50, 2), resolution: 30,
 * });
 * assert.equal((fig.toSVG().match(/<circle/g) ?? []).length, 50 + 1); // real points + legend
 * ```
 */
export function plotDiscriminatorMap(input: DiscriminatorMapInput): Figure {
  const { real, generated } = input;
  let disc: Discriminator;
  if (input.discriminator) disc = input.discriminator;
  else if (input.pData && input.pModel) disc = optimalDiscriminator(input.pData, input.pModel);
  else {
    throw new SaddleError(
      "invalid-argument",
      "give both densities (pData and pModel) for D*, or a discriminator",
      { parameter: "discriminator" },
    );
  }
  requireDimension(disc, 2, input.discriminator ? "discriminator" : "pData");
  if (real) requireDimension(real, 2, "real");
  if (generated) requireDimension(generated, 2, "generated");
  const name = input.name ?? (input.discriminator ? "D" : "D*");
  const sets = [real, generated].filter((s): s is Samples => !!s);
  const dens = [input.pData, input.pModel].filter((p): p is Density => !!p);
  const [xr, yr] = input.domain ?? plottingRange(sets, dens);
  const res = input.resolution ?? 90;
  // The grid reaches two cells beyond the frame and the contours are clipped to it, so that
  // contour lines closing along the grid's edge stay out of sight.
  const ex = (2 * (xr[1] - xr[0])) / res, ey = (2 * (yr[1] - yr[0])) / res;
  const gx: AxisRange = [xr[0] - ex, xr[1] + ex], gy: AxisRange = [yr[0] - ey, yr[1] + ey];
  const n = res + 4;
  const g = grid2d(gx, gy, n, n);
  const values = Array.from(disc.prob(g));
  const contourBase = {
    width: n,
    height: n,
    x1: gx[0],
    x2: gx[1],
    y1: gy[0],
    y2: gy[1],
    clip: true,
  };
  const heat = Plot.contour(values, {
    ...contourBase,
    value: Plot.identity,
    thresholds: BANDS,
    fill: (c: { value: number }) => dStarColor(c.value + 0.05, TINT),
    stroke: "none",
  });
  const lines = [
    Plot.contour(values, {
      ...contourBase,
      value: Plot.identity,
      thresholds: [0.25, 0.75],
      stroke: PALETTE.optimal.color,
      strokeWidth: 0.9,
      strokeDasharray: "4 3",
    }),
    Plot.contour(values, {
      ...contourBase,
      value: Plot.identity,
      thresholds: [0.5],
      stroke: PALETTE.optimal.color,
      strokeWidth: 2,
    }),
  ];
  const seed = input.seed ?? 0;
  const max = input.maxPoints ?? 700;
  const caption: string[] = [];
  const points: Plot.Markish[] = [];
  for (const [role, s] of [["generated", generated], ["real", real]] as const) {
    if (!s) continue;
    const rows = subsampleRows(s, max, `${String(seed)}:${role}`);
    if (rows.length < s.n) caption.push(`${rows.length} of ${s.n} ${role} points drawn.`);
    points.push(
      Plot.dot(rows, {
        x: (i: number) => s.data[2 * i],
        y: (i: number) => s.data[2 * i + 1],
        ...dotStyle(role),
        r: 2.3,
        fillOpacity: 0.85,
        stroke: "white",
        strokeWidth: 0.5,
        clip: true,
      }),
    );
  }
  const sizes = [
    real ? `n = ${real.n} real` : "",
    generated ? `n = ${generated.n} generated` : "",
  ].filter(Boolean).join(", ");
  const marks = [heat, ...lines, ...points];
  return composeFigure({
    title: input.title ??
      (input.discriminator
        ? `Discriminator map with both sides`
        : "Optimal discriminator D* with both sides"),
    ...(sizes ? { subtitle: sizes } : {}),
    legend: [
      ...(real
        ? [{ label: PALETTE.real.label, role: "real" as const, shape: "dot" as const }]
        : []),
      ...(generated
        ? [{ label: PALETTE.generated.label, role: "generated" as const, shape: "dot" as const }]
        : []),
      { label: `${name} = 1/2`, role: "optimal", dash: "none", strokeWidth: 2 },
      { label: `${name} = 1/4, 3/4`, role: "optimal", dash: "4 3", strokeWidth: 0.9 },
      {
        shape: "ramp",
        label: `${name}(x)`,
        domain: [0, 1],
        color: (t: number) => dStarColor(t, TINT),
        ticks: [0, 0.25, 0.5, 0.75, 1],
      },
    ],
    panels: [{
      width: input.width ?? 560,
      height: input.height ?? 460,
      layers: [{
        x: { domain: xr, label: columnLabel(0, input, sets) },
        y: { domain: yr, label: columnLabel(1, input, sets) },
        marks,
      }],
    }],
    ...(caption.length ? { caption: caption.join(" ") } : {}),
    marks,
  });
}
