/**
 * Figure builders: SVG structure (marks, labels, legend entries), geometry checked against
 * the formulas the figures draw, standalone output, PNG size and text rendering.
 */
import * as Plot from "@observablehq/plot";
import assert from "node:assert/strict";
import { unzlibSync } from "fflate";
import { gaussian } from "../../lib/density/gaussian.ts";
import { makeEstimate } from "../../lib/estimate/estimate.ts";
import { bootstrap } from "../../lib/estimate/bootstrap.ts";
import { displayBundle } from "../../lib/display/display.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import { samples } from "../../lib/samples/samples.ts";
import {
  cieLightness,
  composeFigure,
  dStarColor,
  Figure,
  PALETTE,
  plotBootstrap,
  plotDecomposition,
  plotDensities,
  plotDiscriminatorMap,
  plotDivergences,
  plotFigure,
  plotFit,
  plotGeneratorObjectives,
  plotObjective,
  plotReliability,
} from "../../lib/plot/mod.ts";
import { wilsonInterval } from "../../lib/estimate/wilson.ts";
import { FRAME } from "../../lib/plot/compose.ts";
import { roundGeometry, uniqueIds } from "../../lib/plot/svg_cleanup.ts";
import { discriminatorGap } from "../../lib/discriminator/discriminator_gap.ts";
import { generatorObjectives } from "../../lib/value/generator_objectives.ts";
import { grid2d, hdrThresholds } from "../../lib/plot/_grid.ts";
import { assertClose } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";
import {
  all,
  assertStandalone,
  countIn,
  layers,
  parseSvg,
  pathPoints,
  pngSize,
  texts,
} from "./_svg.ts";

const std = gaussian([0], [[1]]);
const shifted = gaussian([1], [[1]]);

Deno.test("palette: CIE L* of sRGB greys, and the roles stay apart in greyscale", () => {
  // sRGB #777777 has L* = 50.03 and #ffffff L* = 100 (CIE 15:2004 formula; 50.03 from memory,
  // recomputed: 119/255 -> linear 0.18448, L* = 116 Y^(1/3) - 16).
  assertClose(cieLightness("#777777"), 50.03, { abs: 0.02 });
  assertClose(cieLightness("#ffffff"), 100, { abs: 1e-9 });
  assertClose(cieLightness("#000000"), 0, { abs: 1e-9 });
  // A lightness gap of at least 15 L* keeps two colours apart in a greyscale print
  // (common practice, no source); real, generated and D* are the roles that must never merge.
  const L = (r: keyof typeof PALETTE) => cieLightness(PALETTE[r].color);
  for (
    const [a, b] of [["real", "generated"], ["real", "optimal"], ["generated", "optimal"]] as const
  ) {
    assert.ok(Math.abs(L(a) - L(b)) >= 15, `${a} vs ${b}: ${L(a)} vs ${L(b)}`);
  }
  const dashes = new Set(Object.values(PALETTE).map((s) => `${s.dash}/${s.strokeWidth}`));
  assert.equal(dashes.size, 5, "every role has its own line style");
  assert.equal(new Set(Object.values(PALETTE).map((s) => s.symbol)).size, 5);
  // The D* ramp is monotone in lightness on each side of 1/2.
  const ramp = [0, 0.25, 0.5].map((t) => cieLightness(dStarColor(t)));
  assert.ok(ramp[0] < ramp[1] && ramp[1] < ramp[2]);
  const ramp2 = [0.5, 0.75, 1].map((t) => cieLightness(dStarColor(t)));
  assert.ok(ramp2[0] > ramp2[1] && ramp2[1] > ramp2[2]);
  assert.throws(() => dStarColor(0.5, 0) && cieLightness("red"), SaddleError);
  const shown = displayBundle(PALETTE);
  assert.match(shown?.["text/html"] ?? "", /#1f6a88/);
  assert.match(shown?.["text/plain"] ?? "", /^role\s+label\s+colour\s+L\*/);
  assert.deepEqual(Object.keys(PALETTE), [
    "real",
    "generated",
    "optimal",
    "discriminator",
    "reference",
  ]);
});

Deno.test("compose: one standalone svg, legend drawn inside, layers share one origin", () => {
  const fig = composeFigure({
    title: "t",
    legend: [{ label: "real data", role: "real" }, { label: "D*", role: "optimal" }],
    panels: [{
      width: 300,
      height: 200,
      layers: [
        { marks: [Plot.lineY([1, 2, 3])] },
        { x: { axis: null, domain: [0, 2] }, y: { axis: "right" }, marks: [Plot.lineY([3, 1])] },
      ],
    }],
  });
  const svg = fig.toSVG();
  assertStandalone(svg);
  const root = parseSvg(svg);
  const ls = layers(root);
  assert.equal(ls.length, 2);
  assert.equal(ls[0].getAttribute("transform"), ls[1].getAttribute("transform"));
  const legendTexts = texts(all(root, 'g[aria-label="legend"]')[0]);
  assert.deepEqual(legendTexts, ["real data", "D*"]);
  assert.equal(fig.width, 300 + 2 * FRAME.pad);
  assert.equal(Number(root.getAttribute("width")), fig.width);
  assert.equal(Number(root.getAttribute("height")), fig.height);
  assert.throws(() => composeFigure({ panels: [] }), SaddleError);
  assert.throws(
    () => composeFigure({ panels: [{ width: NaN, height: 100, layers: [] }] }),
    (e) => e instanceof SaddleError && e.code === "invalid-argument",
  );
  assert.throws(() => plotDensities(std, shifted, { width: -5 }), SaddleError);
});

Deno.test("compose: geometry rounded to 0.01 px, text kept; clip ids unique per figure", () => {
  assert.equal(
    roundGeometry('<g transform="translate(1.23456,-0.0001)"><text x="2.5">0.123456</text></g>'),
    '<g transform="translate(1.23,0)"><text x="2.5">0.123456</text></g>',
  );
  const clipped = (k: number) =>
    composeFigure({
      panels: [{
        width: 200,
        height: 120,
        layers: [{ marks: [Plot.dot([[0, 0], [k, 1]], { clip: true })] }],
      }],
    }).toSVG();
  const a = clipped(1), b = clipped(2), a2 = clipped(1);
  const ids = (svg: string) => [...svg.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
  assert.equal(ids(a).length, 1);
  assert.notEqual(ids(a)[0], ids(b)[0], "two figures in one page must not share clip ids");
  assert.equal(a, a2, "the same figure gives the same markup");
  assertStandalone(a);
  assert.equal(uniqueIds("<svg></svg>"), "<svg></svg>");
});

Deno.test("plotFigure: a Plot <figure> with a swatch legend and title becomes one svg", () => {
  const data = [{ x: 1, y: 2, c: "alpha" }, { x: 2, y: 1, c: "beta" }];
  const fig = plotFigure({
    title: "mine",
    color: { legend: true, domain: ["alpha", "beta"], range: ["#111111", "#999999"] },
    marks: [Plot.dot(data, { x: "x", y: "y", fill: "c" })],
  });
  const svg = fig.toSVG();
  assertStandalone(svg);
  const root = parseSvg(svg);
  assert.equal(root.tagName.toLowerCase(), "svg");
  assert.equal(all(root, "figure, div, span, h2").length, 0);
  const legendTexts = texts(all(root, 'g[aria-label="legend"]')[0]);
  assert.deepEqual(legendTexts, ["alpha", "beta"]);
  assert.equal(countIn(root, "dot", "circle"), 2);
});

Deno.test("plotDensities: D* = 1/2 everywhere when p_g = p_data (Goodfellow et al. 2014, Prop. 1)", () => {
  const fig = plotDensities(std, gaussian([0], [[1]]), { domain: [-4, 4], points: 81 });
  const root = parseSvg(fig.toSVG());
  const dLayer = layers(root)[1];
  const rule = all(dLayer, 'g[aria-label="rule"] line')[0];
  const yHalf = Number(rule.getAttribute("y1"));
  const line = all(dLayer, 'g[aria-label="line"] path')[0];
  const pts = pathPoints(line.getAttribute("d") ?? "");
  assert.equal(pts.length, 81);
  for (const [, y] of pts) assertClose(y, yHalf, { abs: 1e-6 });
});

Deno.test("plotDensities: D* of N(0,1) vs N(1,1) falls through 1/2 at x = 1/2", () => {
  // log p - log q = 1/2 - x, so D* = logistic(1/2 - x): decreasing, 1/2 at x = 1/2.
  const width = 640;
  const fig = plotDensities(std, shifted, {
    domain: [-4, 5],
    points: 181,
    xLabel: "wind speed",
    xUnit: "m/s",
    samples: { real: std.sample(300, 1), generated: shifted.sample(200, 2) },
    width,
  });
  const root = parseSvg(fig.toSVG());
  const [dens, dStar] = layers(root);
  const yHalf = Number(all(dStar, 'g[aria-label="rule"] line')[0].getAttribute("y1"));
  const pts = pathPoints(all(dStar, 'g[aria-label="line"] path')[0].getAttribute("d") ?? "");
  for (let i = 1; i < pts.length; i++) {
    assert.ok(pts[i][1] >= pts[i - 1][1] - 1e-9, "decreasing D*");
  }
  const k = pts.findIndex(([, y]) => y >= yHalf);
  const left = FRAME.margin.left, right = 58;
  const xPixel = left + ((0.5 - -4) / 9) * (width - left - right);
  assertClose(pts[k][0], xPixel, { abs: 2 });
  // Two density curves and two shaded areas on the density layer.
  assert.equal(countIn(dens, "line", "path"), 2);
  assert.equal(countIn(dens, "area", "path"), 2);
  const t = texts(root);
  for (const s of ["wind speed (m/s)", "density (1/(m/s))", "n = 300 real, n = 200 generated"]) {
    assert.ok(t.includes(s), `missing label ${s}`);
  }
  for (const s of ["real data", "generated data", "D*(x), right axis"]) assert.ok(t.includes(s));
});

Deno.test("plotDensities: tabulated curves, D* = a / (a + b), zero mass gives 1/2", () => {
  const fig = plotDensities({ x: [0, 1, 2, 3], real: [0, 3, 1, 0], generated: [0, 1, 3, 1] });
  const root = parseSvg(fig.toSVG());
  const dStar = layers(root)[1];
  const yHalf = Number(all(dStar, 'g[aria-label="rule"] line')[0].getAttribute("y1"));
  const pts = pathPoints(all(dStar, 'g[aria-label="line"] path')[0].getAttribute("d") ?? "");
  const yTop = FRAME.margin.top, yBottom = 340 - FRAME.margin.bottom;
  const yOf = (p: number) => yBottom - p * (yBottom - yTop);
  assertClose(yOf(0.5), yHalf, { abs: 1e-6 });
  const expected = [0.5, 0.75, 0.25, 0];
  pts.forEach(([, y], i) => assertClose(y, yOf(expected[i]), { abs: 1e-6 }));
  assert.throws(
    () => plotDensities({ x: [0, 1], real: [1], generated: [1, 2] }),
    (e) => e instanceof SaddleError && e.code === "dimension-mismatch",
  );
});

Deno.test("plotDiscriminatorMap: points, contours at 1/4, 1/2, 3/4, subsample note", () => {
  const pData = gaussian([0, 0], [[1, 0], [0, 1]]), pModel = gaussian([1.5, 0], [[1, 0], [0, 1]]);
  const real = pData.sample(40, 1), generated = pModel.sample(900, 2);
  const fig = plotDiscriminatorMap({
    pData,
    pModel,
    real,
    generated,
    resolution: 40,
    maxPoints: 500,
    labels: ["wind speed", "vibration"],
    units: ["m/s", "mm/s"],
  });
  const svg = fig.toSVG();
  assertStandalone(svg);
  const root = parseSvg(svg);
  const dots = all(root, 'g[aria-label="dot"]');
  assert.equal(dots.length, 2);
  assert.equal(all(dots[0], "path").length, 500, "generated triangles, subsampled");
  assert.equal(all(dots[1], "circle").length, 40, "all real points");
  const contours = all(root, 'g[aria-label="contour"]');
  assert.equal(contours.length, 3, "filled bands, 1/4 + 3/4 lines, 1/2 line");
  // Two Gaussians with equal covariance: D* = 1/2 on the line x1 = 0.75; the bold contour
  // is vertical there (Goodfellow et al. 2014, Prop. 1 with a linear log-ratio).
  // The grid reaches beyond the frame (clipped), so look at the visible part only.
  const half = pathPoints(all(contours[2], "path")[0].getAttribute("d") ?? "");
  const inFrame = half.filter(([x, y]) =>
    x > FRAME.margin.left && x < 560 - FRAME.margin.right && y > FRAME.margin.top &&
    y < 460 - FRAME.margin.bottom
  );
  assert.ok(inFrame.length > 10);
  const xs = inFrame.map(([x]) => x);
  const [lo, hi] = fig.layers[0].x!.domain as [number, number];
  const x075 = FRAME.margin.left +
    ((0.75 - lo) / (hi - lo)) * (560 - FRAME.margin.left - FRAME.margin.right);
  assertClose(xs[0], x075, { abs: 2 });
  assert.ok(Math.max(...xs) - Math.min(...xs) < 3, "the 1/2 contour is a vertical line");
  const t = texts(root);
  assert.ok(t.includes("wind speed (m/s)") && t.includes("vibration (mm/s)"));
  assert.ok(t.some((s) => s.includes("500 of 900 generated points drawn")));
  assert.throws(() => plotDiscriminatorMap({ real }), SaddleError);
  assert.throws(
    () => plotDiscriminatorMap({ pData: std, pModel: shifted }),
    (e) => e instanceof SaddleError && e.code === "dimension-mismatch",
  );
});

Deno.test("plotDiscriminatorMap: a trained discriminator instead of D*", () => {
  const disc = {
    d: 2,
    prob: (x: { n: number; data: Float64Array }) =>
      Float64Array.from({ length: x.n }, (_, i) => 1 / (1 + Math.exp(x.data[2 * i]))),
    logit: (x: { n: number; data: Float64Array }) =>
      Float64Array.from({ length: x.n }, (_, i) => -x.data[2 * i]),
  };
  const fig = plotDiscriminatorMap({
    discriminator: disc,
    domain: [[-3, 3], [-3, 3]],
    resolution: 30,
  });
  const t = texts(parseSvg(fig.toSVG()));
  assert.ok(t.includes("D = 1/2") && t.includes("D(x)"));
});

Deno.test("plotObjective: maxima drawn at y* = a / (a + b) (Goodfellow et al. 2014, Prop. 1)", () => {
  const pairs = [{ a: 1, b: 1 }, { a: 3, b: 1 }, { a: 1, b: 4 }];
  const width = 600;
  const root = parseSvg(plotObjective(pairs, { width }).toSVG());
  const marks = all(root, 'g[aria-label="dot"] path');
  assert.equal(marks.length, 3);
  const left = FRAME.margin.left, right = FRAME.margin.right;
  marks.forEach((m, i) => {
    const [, x] = /translate\(([-\d.]+),/.exec(m.getAttribute("transform") ?? "") ?? [];
    const yStar = pairs[i].a / (pairs[i].a + pairs[i].b);
    assertClose(Number(x), left + yStar * (width - left - right), { abs: 1e-6 });
  });
  const t = texts(root);
  for (const s of ["y* = 0.5", "y* = 0.75", "y* = 0.2", "f(y) (nats)"]) assert.ok(t.includes(s), s);
  assert.equal(countIn(root, "line", "path"), 3);
  assert.throws(() => plotObjective([]), SaddleError);
});

const est = (value: number, half: number, n = 4000) =>
  makeEstimate({
    value,
    se: half / 2,
    ci: [value - half, value + half],
    method: "monte-carlo",
    n,
    unit: "nats",
  });

Deno.test("plotDecomposition: bar heights are the terms of -ln 4 + KL + KL (Goodfellow et al. 2014, Thm. 1)", () => {
  const k1 = 0.09, k2 = 0.12, v = -Math.log(4) + k1 + k2;
  const fig = plotDecomposition({
    value: est(v, 0.02),
    klRealMix: est(k1, 0.01),
    klFakeMix: est(k2, 0.015),
  });
  const svg = fig.toSVG();
  assertStandalone(svg);
  const root = parseSvg(svg);
  const rects = all(root, 'g[aria-label="bar"] rect');
  assert.equal(rects.length, 4);
  const h = rects.map((r) => Number(r.getAttribute("height")));
  assertClose(h[1] / h[0], k1 / Math.log(4), { rel: 1e-3 });
  assertClose(h[2] / h[0], k2 / Math.log(4), { rel: 1e-3 });
  assertClose(h[3] / h[0], -v / Math.log(4), { rel: 1e-3 });
  // Stacking: each KL bar starts where the previous one ended.
  const y = rects.map((r) => Number(r.getAttribute("y")));
  assertClose(y[1] + h[1], y[0] + h[0], { abs: 0.01 });
  assertClose(y[2] + h[2], y[1], { abs: 0.01 });
  assert.equal(countIn(root, "rule", "line") - 2, 3, "three whiskers besides two reference lines");
  const t = texts(root).join("|");
  for (const s of ["KL(p_data ‖ m)", "KL(p_g ‖ m)", "value (nats)", "95% CI", "−ln 4"]) {
    assert.ok(t.includes(s), s);
  }
});

Deno.test("plotDecomposition in bits: constant -log2 4 = -2 and the axis says bits", () => {
  const b = (value: number) =>
    makeEstimate({
      value,
      se: 0.001,
      ci: [value - 0.002, value + 0.002],
      method: "grid",
      n: 10,
      unit: "bits",
    });
  // JSD in bits of the demo-like case: 2 JSD_bits = KL + KL, V_bits = -2 + 2 JSD_bits.
  const fig = plotDecomposition({ value: b(-2 + 0.2), klRealMix: b(0.09), klFakeMix: b(0.11) });
  const root = parseSvg(fig.toSVG());
  const h = all(root, 'g[aria-label="bar"] rect').map((r) => Number(r.getAttribute("height")));
  assertClose(h[0] / h[3], 2 / 1.8, { rel: 1e-3 });
  const t = texts(root).join("|");
  assert.ok(t.includes("value (bits)") && t.includes("−log₂ 4") && !t.includes("−ln 4"));
});

Deno.test("plotDivergences: bar lengths proportional to the estimates, references drawn", () => {
  const fig = plotDivergences([
    { name: "KL", estimate: est(0.5, 0.05), reference: 0.5, referenceLabel: "closed form" },
    { name: "JSD", estimate: est(0.1, 0.01), reference: Math.LN2, referenceLabel: "ln 2 bound" },
    { name: "TV", estimate: 0.3 },
  ]);
  const root = parseSvg(fig.toSVG());
  const w = all(root, 'g[aria-label="bar"] rect').map((r) => Number(r.getAttribute("width")));
  assert.equal(w.length, 3);
  assertClose(w[1] / w[0], 0.2, { rel: 1e-3 });
  assertClose(w[2] / w[0], 0.6, { rel: 1e-3 });
  assert.ok(texts(root).includes("closed form / ln 2 bound"));
  assert.ok(texts(root).includes("divergence (nats)"));
  assert.throws(() => plotDivergences({}), SaddleError);
  const rec = plotDivergences({ a: 1, b: 2 });
  assert.equal(all(parseSvg(rec.toSVG()), 'g[aria-label="bar"] rect').length, 2);
});

Deno.test({
  name: "wilsonInterval matches scipy's binomtest(...).proportion_ci(method='wilson')",
  ignore: ignoreWithoutPython(["scipy"]),
  fn: async () => {
    const cases = [
      { k: 3, n: 10, level: 0.95 },
      { k: 0, n: 7, level: 0.9 },
      { k: 41, n: 41, level: 0.99 },
      { k: 250, n: 600, level: 0.95 },
    ];
    const ref = await runReference<{ intervals: [number, number][] }>("wilson_interval.py", {
      cases,
    });
    cases.forEach((c, i) => {
      const [lo, hi] = wilsonInterval(c.k / c.n, c.n, c.level);
      assertClose(lo, ref.intervals[i][0], { abs: 1e-12 });
      assertClose(hi, ref.intervals[i][1], { abs: 1e-12 });
    });
    assert.deepEqual(wilsonInterval(0.5, 0), [NaN, NaN]);
  },
});

Deno.test("plotReliability: one point per non-empty bin of discriminatorGap, D* when known", () => {
  const pData = gaussian([0], [[1]]), pModel = gaussian([1], [[1]]);
  const real = pData.sample(400, 1), fake = pModel.sample(400, 2);
  // A trained D that is D* sharpened: logit 1.5 * (1/2 - x).
  const d = (s: { data: Float64Array }) =>
    Array.from(s.data, (x) => 1 / (1 + Math.exp(-1.5 * (0.5 - x))));
  const gap = discriminatorGap({
    dReal: d(real),
    dFake: d(fake),
    scale: "prob",
    real,
    fake,
    pData,
    pModel,
    replicates: 50,
  });
  const fig = plotReliability(gap);
  const root = parseSvg(fig.toSVG());
  const dotGroups = all(root, 'g[aria-label="dot"]');
  assert.equal(dotGroups.length, 2);
  const nonEmpty = gap.bins.filter((b) => b.count > 0);
  assert.equal(all(dotGroups[0], "path").length, nonEmpty.length);
  assert.equal(all(dotGroups[1], "path").length, nonEmpty.length, "mean D* per bin");
  const heights = all(root, 'g[aria-label="rect"] rect').map((r) =>
    Number(r.getAttribute("height"))
  );
  assert.equal(heights.length, nonEmpty.length);
  // Bar heights follow the bin counts.
  const iMax = nonEmpty.reduce((k, b, i) => (b.count > nonEmpty[k].count ? i : k), 0);
  nonEmpty.forEach((b, i) =>
    assertClose(heights[i] / heights[iMax], b.count / nonEmpty[iMax].count, { rel: 1e-3 }) // heights rounded to 0.01 px
  );
  const t = texts(root);
  assert.ok(t.includes("count (n = 800)") && t.includes("mean D* per bin"));
  assert.ok(t.some((s) => s.startsWith("ECE (labels):")));
  assert.throws(() => plotReliability({ bins: [] }), SaddleError);
});

Deno.test("plotBootstrap: histogram of the replicates with estimate and interval", () => {
  const x = Float64Array.from({ length: 200 }, (_, i) => Math.sin(i * 1.3));
  const e = bootstrap(200, (idx) => idx.reduce((s, i) => s + x[i], 0) / idx.length, {
    seed: 3,
    replicates: 400,
    unit: "nats",
  });
  const fig = plotBootstrap(e, { name: "JSD", reference: 0, referenceLabel: "equilibrium" });
  const root = parseSvg(fig.toSVG());
  const heights = all(root, 'g[aria-label="rect"] rect').map((r) =>
    Number(r.getAttribute("height"))
  );
  // Rice rule for B = 400: about 2 * 400^(1/3) = 15 bins (Plot rounds to nice thresholds).
  assert.ok(heights.length >= 10 && heights.length <= 25, `${heights.length} bins`);
  // ruleY at 0, estimate, two CI ends, reference.
  assert.equal(countIn(root, "rule", "line"), 5);
  const t = texts(root);
  assert.ok(t.includes("JSD (nats)"));
  assert.ok(t.some((s) => s.startsWith("B = 400 replicates, n = 200")));
  assert.throws(() => plotBootstrap(est(1, 0.1)), SaddleError);
});

Deno.test("plotFit: 1-D histogram area is the share of samples in range; 2-D contours", () => {
  const s = std.sample(500, 4);
  const fig = plotFit({ density: std, samples: s }, {
    bins: 25,
    domain: [[-2, 2]],
    labels: ["wind speed"],
    units: ["m/s"],
  });
  const root = parseSvg(fig.toSVG());
  const rects = all(root, 'g[aria-label="rect"] rect');
  assert.equal(rects.length, 25);
  // Pixel area of the bars over the pixel area of one density unit x one x unit.
  const ml = FRAME.margin.left, mr = FRAME.margin.right;
  const pxPerX = (480 - ml - mr) / 4;
  const yTicks = all(root, 'g[aria-label="y-axis tick"] path').map((p) =>
    Number(/translate\([-\d.]+,([-\d.]+)\)/.exec(p.getAttribute("transform") ?? "")?.[1])
  );
  const yLabels = all(root, 'g[aria-label="y-axis tick label"] text').map((t) =>
    Number(t.textContent)
  );
  const pxPerY = (yTicks[0] - yTicks[1]) / (yLabels[1] - yLabels[0]);
  let area = 0;
  for (const r of rects) {
    area += (Number(r.getAttribute("width")) + 1) * Number(r.getAttribute("height"));
  }
  const inside = Array.from(s.data).filter((v) => v >= -2 && v < 2).length;
  assertClose(area / (pxPerX * pxPerY), inside / 500, { rel: 0.01 });
  assert.ok(texts(root).includes("density (1/(m/s))"));

  const p2 = gaussian([0, 0], [[1, 0.5], [0.5, 1]]);
  const fig2 = plotFit([
    { density: p2, samples: p2.sample(300, 1) },
    { density: p2, samples: p2.sample(200, 2), role: "generated" },
  ]);
  const root2 = parseSvg(fig2.toSVG());
  const contourGroups = all(root2, 'g[aria-label="contour"]');
  assert.equal(contourGroups.length, 2);
  assert.equal(all(contourGroups[0], "path").length, 4, "50/80/95/99% regions");
  assert.equal(countIn(root2, "dot", "circle"), 300);
  assert.ok(texts(root2).includes("generated data (n = 200)"));
  const p3 = gaussian([0, 0, 0], [[1, 0, 0], [0, 1, 0], [0, 0, 1]]);
  assert.throws(() => plotFit({ density: p3, samples: p3.sample(10, 1) }), SaddleError);
  assert.throws(() => plotFit({ density: std, samples: samples([[1, 2]]) }), SaddleError);
});

Deno.test("hdrThresholds: standard 2-D normal, level of the region holding mass f is (1 - f) / 2π", () => {
  // For N(0, I_2), p(x) >= t  <=>  |x|^2 <= -2 ln(2π t), and |x|^2 ~ χ²_2 has mass
  // 1 - exp(-r²/2) inside radius r, so the region of mass f has level t = (1 - f) / (2π)
  // (chi-square with 2 degrees of freedom; common practice, no source).
  const p = gaussian([0, 0], [[1, 0], [0, 1]]);
  const g = grid2d([-7, 7], [-7, 7], 400, 400);
  const values = Array.from(p.logPdf(g), Math.exp);
  const fractions = [0.5, 0.8, 0.95, 0.99];
  const t = hdrThresholds(values, fractions);
  fractions.forEach((f, i) => assertClose(t[i], (1 - f) / (2 * Math.PI), { rel: 5e-3 }));
  assert.throws(() => hdrThresholds(values, [1]), SaddleError);
});

Deno.test("plotGeneratorObjectives: gradients sigmoid(l) and sigmoid(-l), samples where D rejects them", () => {
  // A confident discriminator: the minimax gradient sigmoid(l) vanishes, the non-saturating
  // one sigmoid(-l) stays near 1 (Goodfellow et al. 2014, sec. 3).
  const res = generatorObjectives([-7.5, -6, -5.2, -4.4], { scale: "logit" });
  const width = 600;
  const root = parseSvg(plotGeneratorObjectives(res, { width, bins: 8 }).toSVG());
  const [top, bottom] = layers(root);
  const paths = all(top, 'g[aria-label="line"] path').map((p) =>
    pathPoints(p.getAttribute("d") ?? "")
  );
  assert.equal(paths.length, 2);
  const yTop = FRAME.margin.top, yBottom = 250 - 30;
  const yOf = (v: number) => yBottom - v * (yBottom - yTop);
  const lo = -8, hi = 8, left = FRAME.margin.left, right = FRAME.margin.right;
  const lOf = (x: number) => lo + ((x - left) / (width - left - right)) * (hi - lo);
  for (
    const [k, f] of [[0, (l: number) => 1 / (1 + Math.exp(l))], [
      1,
      (l: number) => 1 / (1 + Math.exp(-l)),
    ]] as const
  ) {
    for (const [x, y] of paths[k].filter((_, i) => i % 50 === 0)) {
      assertClose(y, yOf(f(lOf(x))), { abs: 6e-3 }); // paths are rounded to 0.01 px
    }
  }
  const xZero = left + (0 - lo) / (hi - lo) * (width - left - right);
  const rects = all(bottom, 'g[aria-label="rect"] rect');
  assert.ok(rects.length > 0);
  for (const r of rects) {
    assert.ok(Number(r.getAttribute("x")) + Number(r.getAttribute("width")) < xZero);
  }
  assert.ok(texts(root).includes("count (n = 4)"));
});

Deno.test("Figure: notebook display bundle, save to .svg/.png, unsupported extension", async () => {
  const fig = plotObjective([{ a: 1, b: 2 }]);
  const bundle = displayBundle(fig);
  assert.equal(bundle?.["image/svg+xml"], fig.toSVG());
  assert.match(bundle?.["text/plain"] ?? "", /^Figure \d+×\d+: Pointwise objective/);
  const dir = await Deno.makeTempDir();
  await fig.save(`${dir}/a.svg`);
  assert.equal(await Deno.readTextFile(`${dir}/a.svg`), fig.toSVG());
  await fig.save(`${dir}/a.png`, { scale: 1 });
  assert.deepEqual(pngSize(await Deno.readFile(`${dir}/a.png`)), {
    width: fig.width,
    height: fig.height,
  });
  await assert.rejects(
    () => fig.save(`${dir}/a.pdf`),
    (e) => e instanceof SaddleError && e.code === "unsupported",
  );
  await Deno.remove(dir, { recursive: true });
  assert.throws(() => new Figure("<div/>", { width: 1, height: 1 }), SaddleError);
});

Deno.test("PNG: IHDR size follows the scale, and text is rendered with the embedded font", async () => {
  const fig = plotDecomposition({ value: -1.2, klRealMix: 0.09, klFakeMix: 0.096 });
  for (const scale of [1, 2]) {
    const png = await fig.toPNG({ scale });
    assert.deepEqual(pngSize(png), {
      width: Math.round(fig.width * scale),
      height: Math.round(fig.height * scale),
    });
  }
  // A figure holding nothing but black text: some pixels must be dark, which happens only
  // when resvg found a font for the family list.
  const text = new Figure(
    '<svg xmlns="http://www.w3.org/2000/svg" width="120" height="30" viewBox="0 0 120 30" ' +
      'font-family="DejaVu Sans, sans-serif"><rect width="120" height="30" fill="white"/>' +
      '<text x="5" y="20" font-size="16" fill="black">V(D*, G)</text></svg>',
    { width: 120, height: 30 },
  );
  const dark = darkPixels(await text.toPNG({ scale: 1 }));
  assert.ok(dark > 50, `${dark} dark pixels`);
  await assert.rejects(() => text.toPNG({ scale: 0 }), SaddleError);
});

/** Count pixels darker than mid-grey in an 8-bit RGBA PNG (filters undone, PNG spec sec. 9). */
function darkPixels(png: Uint8Array): number {
  const { width, height } = pngSize(png);
  const v = new DataView(png.buffer, png.byteOffset);
  const idat: Uint8Array[] = [];
  let colorType = -1;
  for (let off = 8; off < png.length;) {
    const len = v.getUint32(off);
    const type = String.fromCharCode(...png.subarray(off + 4, off + 8));
    if (type === "IHDR") colorType = png[off + 8 + 9];
    if (type === "IDAT") idat.push(png.subarray(off + 8, off + 8 + len));
    off += 12 + len;
  }
  const bpp = colorType === 6 ? 4 : colorType === 2 ? 3 : 0;
  assert.ok(bpp > 0, `unexpected colour type ${colorType}`);
  const joined = new Uint8Array(idat.reduce((s, a) => s + a.length, 0));
  let o = 0;
  for (const a of idat) (joined.set(a, o), (o += a.length));
  const raw = unzlibSync(joined);
  const stride = width * bpp;
  const out = new Uint8Array(stride * height);
  for (let y = 0; y < height; y++) {
    const f = raw[y * (stride + 1)];
    for (let x = 0; x < stride; x++) {
      const r = raw[y * (stride + 1) + 1 + x];
      const a = x >= bpp ? out[y * stride + x - bpp] : 0;
      const b = y > 0 ? out[(y - 1) * stride + x] : 0;
      const c = x >= bpp && y > 0 ? out[(y - 1) * stride + x - bpp] : 0;
      const p = a + b - c, pa = Math.abs(p - a), pb = Math.abs(p - b), pc = Math.abs(p - c);
      const pred = f === 0
        ? 0
        : f === 1
        ? a
        : f === 2
        ? b
        : f === 3
        ? (a + b) >> 1
        : pa <= pb && pa <= pc
        ? a
        : pb <= pc
        ? b
        : c;
      out[y * stride + x] = (r + pred) & 255;
    }
  }
  let dark = 0;
  for (let i = 0; i < out.length; i += bpp) if (out[i] + out[i + 1] + out[i + 2] < 3 * 128) dark++;
  return dark;
}

Deno.test({
  name: "every builder's SVG is well-formed XML in the SVG namespace (Python's xml.etree)",
  ignore: ignoreWithoutPython(["xml.etree.ElementTree"]),
  fn: async () => {
    const p2 = gaussian([0, 0], [[1, 0], [0, 1]]), q2 = gaussian([1, 1], [[1, 0], [0, 1]]);
    const x = Float64Array.from({ length: 50 }, (_, i) => i % 7);
    const boot = bootstrap(50, (idx) => idx.reduce((s, i) => s + x[i], 0) / idx.length, {
      seed: 1,
      replicates: 100,
    });
    const figs = [
      plotDensities(std, shifted, { xLabel: "a < b & c", points: 50 }),
      plotDiscriminatorMap({
        pData: p2,
        pModel: q2,
        real: p2.sample(30, 1),
        generated: q2.sample(30, 2),
        resolution: 20,
      }),
      plotObjective(),
      plotDecomposition({
        value: est(-1.2, 0.02),
        klRealMix: est(0.09, 0.01),
        klFakeMix: est(0.096, 0.01),
      }),
      plotDivergences({ "KL(p ‖ q) <tail>": est(0.4, 0.02) }),
      plotReliability(
        discriminatorGap({ dReal: [0.9, 0.6], dFake: [0.1, 0.4], scale: "prob", replicates: 10 }),
      ),
      plotBootstrap(boot, { name: "mean" }),
      plotFit({ density: std, samples: std.sample(100, 1) }),
      plotFit({ density: p2, samples: p2.sample(100, 1) }),
    ];
    const { results } = await runReference<{
      results: { ok: boolean; error: string; root: string; namespace: string; texts: string[] }[];
    }>("parse_svg.py", { svgs: figs.map((f) => f.toSVG()) });
    results.forEach((r, i) => {
      assert.ok(r.ok, `figure ${i}: ${r.error}`);
      assert.equal(r.root, "svg");
      assert.equal(r.namespace, "http://www.w3.org/2000/svg");
      assertStandalone(figs[i].toSVG());
    });
    assert.ok(results[0].texts.includes("a < b & c"), "escaped text reads back");
    assert.ok(results[4].texts.includes("KL(p ‖ q) <tail>"));
  },
});
