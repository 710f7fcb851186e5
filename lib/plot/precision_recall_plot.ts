/**
 * The k-NN picture of precision and recall on a 2-D projection of the two sets.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { SaddleError } from "../errors/saddle_error.ts";
import { symmetricEigen } from "../linalg/mod.ts";
import type { PrecisionRecall } from "../metrics/mod.ts";
import { isSamples, type Samples, samples, type SamplesInput } from "../samples/mod.ts";
import { composeFigure, type LegendItem } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { subsampleRows } from "./_grid.ts";
import { short } from "./_text.ts";
import { PALETTE } from "./palette.ts";

/** Options of {@linkcode plotPrecisionRecall}. */
export interface PrecisionRecallPlotOptions {
  /** Title. */
  title?: string;
  /** Points drawn at most per set (default 1500, a seeded subsample). */
  maxPoints?: number;
  /** Seed of the subsample (default 0). */
  seed?: number | string;
  /** Width of each panel in px (default 330). */
  panelWidth?: number;
}

/**
 * Two panels on the first two principal components of the pooled points (the points
 * themselves when d = 2): left, generated points inside the real k-NN manifold (counted by
 * precision) and outside it; right, real points inside the generated manifold (recall) and
 * outside it. Points outside are drawn bold so missing modes and off-manifold samples stand
 * out. `result` must come from `precisionRecall(real, fake)` on the same sets.
 *
 * References: Kynkäänniemi et al. 2019 (NeurIPS), Fig. 1; Pearson 1901 (principal
 * components).
 *
 * @example
 * ```ts
 * import { plotPrecisionRecall } from "./precision_recall_plot.ts";
 * import { precisionRecall } from "../metrics/mod.ts";
 * import assert from "node:assert/strict";
 * const real = Array.from({ length: 40 }, (_, i) => [Math.cos(i), Math.sin(i), i % 3]);
 * const fake = real.slice(0, 20).map(([x, y, z]) => [x, y + 0.05, z]);
 * const fig = plotPrecisionRecall(real, fake, precisionRecall(real, fake, { replicates: 5 }));
 * assert.match(fig.toSVG(), /recall/);
 * ```
 */
export function plotPrecisionRecall(
  real: SamplesInput,
  fake: SamplesInput,
  result: PrecisionRecall,
  options: PrecisionRecallPlotOptions = {},
): Figure {
  const r = isSamples(real) ? real : samples(real, { source: "real" });
  const f = isSamples(fake) ? fake : samples(fake, { source: "fake" });
  if (result.realInFake.length !== r.n || result.fakeInReal.length !== f.n || r.d !== f.d) {
    throw new SaddleError(
      "dimension-mismatch",
      "the result does not belong to these sets; pass the same real and fake as to precisionRecall",
      { parameter: "result" },
    );
  }
  const project = projector(r, f);
  const max = options.maxPoints ?? 1500, seed = options.seed ?? 0;
  const pts = (s: Samples, inside: Uint8Array, rows: number[]) =>
    rows.map((i) => {
      const [x, y] = project(s, i);
      return { x, y, inside: inside[i] === 1 };
    });
  const realPts = pts(r, result.realInFake, subsampleRows(r, max, `${seed}/real`));
  const fakePts = pts(f, result.fakeInReal, subsampleRows(f, max, `${seed}/fake`));
  const axis = r.d === 2 ? ["x₁", "x₂"] : ["PC 1", "PC 2"];
  const xs = [...realPts, ...fakePts].map((p) => p.x),
    ys = [...realPts, ...fakePts].map((p) => p.y);
  const xDomain = [Math.min(...xs), Math.max(...xs)], yDomain = [Math.min(...ys), Math.max(...ys)];
  const faint = (data: typeof realPts, color: string) =>
    Plot.dot(data, { x: "x", y: "y", r: 1.6, fill: color, fillOpacity: 0.25 });
  const bold = (data: typeof realPts, color: string, symbol: string) =>
    Plot.dot(data, {
      x: "x",
      y: "y",
      r: 3,
      fill: color,
      stroke: "#222222",
      strokeWidth: 0.5,
      symbol,
    });
  const left: Plot.Markish[] = [
    faint(realPts, PALETTE.real.color),
    faint(fakePts.filter((p) => p.inside), PALETTE.generated.color),
    bold(fakePts.filter((p) => !p.inside), PALETTE.generated.color, "triangle"),
  ];
  const right: Plot.Markish[] = [
    faint(fakePts, PALETTE.generated.color),
    faint(realPts.filter((p) => p.inside), PALETTE.real.color),
    bold(realPts.filter((p) => !p.inside), PALETTE.real.color, "circle"),
  ];
  const width = options.panelWidth ?? 330;
  const layer = (marks: Plot.Markish[]) => ({
    x: { domain: xDomain, label: axis[0] },
    y: { domain: yDomain, label: axis[1] },
    marks,
  });
  const legend: LegendItem[] = [
    { label: "real", role: "real", shape: "dot" },
    { label: "generated", role: "generated", shape: "dot" },
    { label: "bold: outside the other set's k-NN manifold", color: "#222222", shape: "dot" },
  ];
  return composeFigure({
    title: options.title ?? `k-NN precision and recall (k = ${result.k})`,
    subtitle: `${axis[0]}–${axis[1]} projection; n = ${r.n} real, ${f.n} generated`,
    legend,
    panels: [
      {
        width,
        height: width,
        title: `precision ${short(result.precision.value, 3)}: generated in real manifold`,
        layers: [layer(left)],
      },
      {
        width,
        height: width,
        title: `recall ${short(result.recall.value, 3)}: real in generated manifold`,
        layers: [layer(right)],
      },
    ],
    marks: [...left, ...right],
  });
}

/** The first two principal components of the pooled sets (identity when d = 2). */
function projector(a: Samples, b: Samples): (s: Samples, i: number) => [number, number] {
  const d = a.d;
  if (d === 1) return (s, i) => [s.data[i], 0];
  if (d === 2) return (s, i) => [s.data[2 * i], s.data[2 * i + 1]];
  const n = a.n + b.n, mean = new Float64Array(d);
  for (const s of [a, b]) {
    for (let i = 0; i < s.n; i++) for (let t = 0; t < d; t++) mean[t] += s.data[i * d + t] / n;
  }
  const cov = new Float64Array(d * d);
  for (const s of [a, b]) {
    for (let i = 0; i < s.n; i++) {
      for (let p = 0; p < d; p++) {
        const vp = s.data[i * d + p] - mean[p];
        for (let q = p; q < d; q++) cov[p * d + q] += vp * (s.data[i * d + q] - mean[q]);
      }
    }
  }
  for (let p = 0; p < d; p++) for (let q = 0; q < p; q++) cov[p * d + q] = cov[q * d + p];
  const { vectors } = symmetricEigen(cov, d);
  const c1 = d - 1, c2 = d - 2;
  return (s, i) => {
    let x = 0, y = 0;
    for (let t = 0; t < d; t++) {
      const v = s.data[i * d + t] - mean[t];
      x += v * vectors[t * d + c1];
      y += v * vectors[t * d + c2];
    }
    return [x, y];
  };
}
