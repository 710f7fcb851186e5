/**
 * Shared integration machinery for divergences between two densities p and q: midpoint
 * quadrature on a grid (d <= 2) with a refinement error, and Monte Carlo draws from both.
 *
 * Integrands are written as `m(x) · w(r(x))`, with `m = (p + q) / 2` the mixture and
 * `r = log p - log q` the log-ratio, so every divergence is an expectation under the
 * mixture of a function of the log-ratio: `w` is evaluated in log space and defined at
 * `r = ±Infinity` (where one density vanishes), and points where both vanish contribute 0.
 *
 * @module
 */
import type { Density } from "../density/types.ts";
import { logAddExp } from "../math/log_space.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { type Estimate, makeEstimate, meanVariance, normalCritical } from "../estimate/estimate.ts";
import type { EstimateUnit } from "../estimate/estimate.ts";
import { toRng } from "../random/rng.ts";
import { assertSameDimension, type Samples } from "../samples/samples.ts";
import type { IntegrationOptions } from "./integration_options.ts";

export type { IntegrationOptions };

/** A function of the log-ratio `r = log p - log q`, defined on [-Infinity, Infinity]. */
export type MixtureWeight = (r: number) => number;

/** The method a call resolves to. */
export function resolveMethod(
  d: number,
  method: IntegrationOptions["method"],
): "grid" | "monte-carlo" {
  const m = method ?? (d <= 2 ? "grid" : "monte-carlo");
  if (m !== "grid" && m !== "monte-carlo") {
    throw new SaddleError("invalid-argument", `method must be "grid" or "monte-carlo", got ${m}`, {
      parameter: "method",
    });
  }
  if (m === "grid" && d > 2) {
    throw new SaddleError(
      "invalid-argument",
      `grid quadrature is for d <= 2 but the densities have d = ${d}; use method "monte-carlo"`,
      { parameter: "method" },
    );
  }
  return m;
}

/** Log-density of the mixture `(p + q) / 2` from the two log-densities. */
export function logMixture(lp: number, lq: number): number {
  return logAddExp(lp, lq) - Math.LN2;
}

/** The grid result: one value and error per weight function. */
export interface GridResult {
  /** Integral of `m · w_k` (fine and shifted grids averaged), per weight. */
  readonly values: Float64Array;
  /** `|fine - coarse| + |fine - shifted|` plus the estimated contribution beyond the range. */
  readonly errors: Float64Array;
  /** Mass of p and q outside the range (1 - integral on the fine grid, floored at 0). */
  readonly massOutside: { readonly p: number; readonly q: number };
  /** The integration range (the first box when there are two). */
  readonly bounds: readonly (readonly [number, number])[];
  /** The integration boxes: one, or one around each density when they lie apart. */
  readonly boxes: readonly (readonly (readonly [number, number])[])[];
  /** Cells of the fine grid and its shift together. */
  readonly cells: number;
  /** Caveats. */
  readonly notes: readonly string[];
}

type Box = readonly (readonly [number, number])[];

function checkBounds(d: number, bounds: readonly (readonly [number, number])[]): Box {
  if (bounds.length !== d) {
    throw new SaddleError(
      "dimension-mismatch",
      `bounds has ${bounds.length} ranges for d = ${d}`,
      { parameter: "bounds" },
    );
  }
  bounds.forEach(([lo, hi], j) => {
    if (!(Number.isFinite(lo) && Number.isFinite(hi) && hi > lo)) {
      throw new SaddleError("invalid-argument", `bounds[${j}] = [${lo}, ${hi}] is not a range`, {
        parameter: "bounds",
      });
    }
  });
  return bounds.map(([lo, hi]) => [lo, hi] as const);
}

/** The range of each coordinate over some draws, widened by `margin` times its span. */
function drawBox(draws: readonly Samples[], d: number, margin: number): Box {
  const out: (readonly [number, number])[] = [];
  for (let j = 0; j < d; j++) {
    let lo = Infinity, hi = -Infinity;
    for (const s of draws) {
      for (let i = 0; i < s.n; i++) {
        const v = s.data[i * d + j];
        if (v < lo) lo = v;
        if (v > hi) hi = v;
      }
    }
    const span = hi - lo > 0 ? hi - lo : Math.max(Math.abs(lo), 1);
    out.push([lo - margin * span, hi + margin * span]);
  }
  return out;
}

/** Whether two boxes are apart along at least one coordinate (they share no volume). */
function apart(a: Box, b: Box): boolean {
  return a.some(([lo, hi], j) => hi <= b[j][0] || b[j][1] <= lo);
}

/**
 * The integration boxes: `bounds` when given; otherwise one box around draws of both
 * densities, or, when the boxes around each density's own draws are apart (supports far
 * from each other, where one box would be mostly empty and its cells wider than either
 * density), one box around each, so that each side's mass is resolved on its own grid.
 */
function gridBoxes(p: Density, q: Density, options: IntegrationOptions): Box[] {
  const d = p.d;
  if (options.bounds) return [checkBounds(d, options.bounds)];
  const margin = options.margin ?? 0.5;
  if (!(margin >= 0)) {
    throw new SaddleError("invalid-argument", `margin must be >= 0, got ${margin}`, {
      parameter: "margin",
    });
  }
  const rng = toRng(options.seed ?? 0);
  const draws = [p.sample(2000, rng.fork("range-p")), q.sample(2000, rng.fork("range-q"))];
  const boxP = drawBox([draws[0]], d, margin), boxQ = drawBox([draws[1]], d, margin);
  if (apart(boxP, boxQ)) return [boxP, boxQ];
  return [drawBox(draws, d, margin)];
}

/** Boxes doubled about their centres; boxes that come to overlap merge into their hull. */
function widen(boxes: readonly Box[]): Box[] {
  const out = boxes.map((b) =>
    b.map(([lo, hi]) => {
      const c = 0.5 * (lo + hi), r = hi - lo;
      return [c - r, c + r] as const;
    })
  );
  if (out.length === 2 && !apart(out[0], out[1])) {
    return [
      out[0].map(([lo, hi], j) =>
        [Math.min(lo, out[1][j][0]), Math.max(hi, out[1][j][1])] as const
      ),
    ];
  }
  return out;
}

/** Midpoint sums of m·w (times the cell volume) over one box of g cells per dimension. */
function gridPass(
  { p, q, weights, bounds, g, offset = 0 }: {
    p: Density;
    q: Density;
    weights: readonly MixtureWeight[];
    bounds: readonly (readonly [number, number])[];
    g: number;
    offset?: number;
  },
): {
  sumsP: Float64Array;
  sumsQ: Float64Array;
  massP: number;
  massQ: number;
  rim: { pm: number[]; w: number[][] };
} {
  const d = p.d;
  const h = bounds.map(([lo, hi]) => (hi - lo) / g);
  const vol = d === 1 ? h[0] : h[0] * h[1];
  const sumsP = new Float64Array(weights.length), sumsQ = new Float64Array(weights.length);
  // m and every w on the rim cells, for the tail estimate once the mean is known.
  const rim = { pm: [] as number[], w: weights.map(() => [] as number[]) };
  let massP = 0, massQ = 0;
  // Evaluate in row blocks so the batch buffers stay small.
  const rowsPerBlock = d === 1 ? g : Math.max(1, Math.floor(65536 / g));
  const blockRows = d === 1 ? 1 : Math.ceil(g / rowsPerBlock);
  for (let b = 0; b < blockRows; b++) {
    const r0 = b * rowsPerBlock;
    const r1 = d === 1 ? 1 : Math.min(g, r0 + rowsPerBlock);
    const m = d === 1 ? g : (r1 - r0) * g;
    const data = new Float64Array(m * d);
    for (let k = 0; k < m; k++) {
      if (d === 1) data[k] = bounds[0][0] + (k + 0.5 + offset) * h[0];
      else {
        const i = r0 + Math.floor(k / g), j = k % g;
        data[2 * k] = bounds[0][0] + (i + 0.5 + offset) * h[0];
        data[2 * k + 1] = bounds[1][0] + (j + 0.5 + offset) * h[1];
      }
    }
    const x: Samples = { n: m, d, data };
    const lp = p.logPdf(x), lq = q.logPdf(x);
    for (let k = 0; k < m; k++) {
      const a = lp[k], c = lq[k];
      if (Number.isNaN(a) || Number.isNaN(c)) {
        throw new SaddleError("non-finite", "a density returned NaN on the integration grid", {
          parameter: Number.isNaN(a) ? "p" : "q",
        });
      }
      if (a === -Infinity && c === -Infinity) continue;
      const pm = Math.exp(logMixture(a, c));
      // m underflows to 0 in the far tails: a finite integrand contributes 0 there, and an
      // integrand that overflows there (w = Infinity from a huge ratio) must not give 0 · ∞.
      if (pm === 0) continue;
      const ep = Math.exp(a), eq = Math.exp(c);
      massP += ep;
      massQ += eq;
      const r = a === c ? 0 : a - c;
      let onRim: boolean;
      if (d === 1) onRim = k === 0 || k === g - 1;
      else {
        const i = r0 + Math.floor(k / g), j = k % g;
        onRim = i === 0 || j === 0 || i === g - 1 || j === g - 1;
      }
      if (onRim) rim.pm.push(pm);
      for (let w = 0; w < weights.length; w++) {
        const wv = weights[w](r);
        // m w = (p w + q w) / 2; a side that vanishes here adds nothing (not 0 · ∞).
        if (ep > 0) sumsP[w] += ep * wv;
        if (eq > 0) sumsQ[w] += eq * wv;
        if (onRim) rim.w[w].push(wv);
      }
    }
  }
  for (let w = 0; w < weights.length; w++) {
    sumsP[w] *= vol;
    sumsQ[w] *= vol;
  }
  return { sumsP, sumsQ, massP: massP * vol, massQ: massQ * vol, rim };
}

/** One pass over every box: sums of m·w and of m, p, q, each cell weighted by its volume. */
function gridPasses(
  { p, q, weights, boxes, g, offset = 0 }: {
    p: Density;
    q: Density;
    weights: readonly MixtureWeight[];
    boxes: readonly Box[];
    g: number;
    offset?: number;
  },
): { sums: Float64Array; massP: number; massQ: number; tail: Float64Array } {
  const sums = new Float64Array(weights.length), tail = new Float64Array(weights.length);
  const sumsP = new Float64Array(weights.length), sumsQ = new Float64Array(weights.length);
  let massP = 0, massQ = 0;
  const passes = boxes.map((box) => gridPass({ p, q, weights, bounds: box, g, offset }));
  for (const r of passes) {
    massP += r.massP;
    massQ += r.massQ;
    for (let w = 0; w < weights.length; w++) {
      sumsP[w] += r.sumsP[w];
      sumsQ[w] += r.sumsQ[w];
    }
  }
  if (!(massP > 0 && massQ > 0)) {
    throw new SaddleError(
      "non-finite",
      `the integration grid found no mass of ${massP > 0 ? "q" : "p"} (a density narrower ` +
        "than the grid cells, or outside the range): pass `bounds` around both densities, " +
        'raise gridSize, or use method "monte-carlo"',
      { parameter: massP > 0 ? "q" : "p" },
    );
  }
  // Self-normalised per side: E_m[w] = (E_p[w] + E_q[w]) / 2, each mean taken over the
  // cells with that density's grid mass as the weight, so a constant integrand is exact and
  // the discretisation error of each density's mass cancels on its own (two densities with
  // disjoint supports on separate grids keep their equal weights of 1/2).
  for (let w = 0; w < weights.length; w++) {
    sums[w] = 0.5 * (sumsP[w] / massP + sumsQ[w] / massQ);
  }
  // The tail beyond a box changes a self-normalised mean by the missing mass times the
  // integrand's departure from that mean: estimated as the box volume times the largest
  // m |w - mean| on its rim (so a constant part of w, such as -ln 4, adds no tail).
  passes.forEach((r, b) => {
    const volume = boxes[b].reduce((v, [lo, hi]) => v * (hi - lo), 1);
    for (let w = 0; w < weights.length; w++) {
      let h = 0;
      const ws = r.rim.w[w];
      for (let i = 0; i < ws.length; i++) {
        const dev = ws[i] === sums[w] ? 0 : r.rim.pm[i] * Math.abs(ws[i] - sums[w]);
        if (dev > h) h = dev;
      }
      tail[w] += h * volume;
    }
  });
  return { sums, massP, massQ, tail };
}

/**
 * Midpoint quadrature of `E_m[w_k] = ∫ m(x) w_k(r(x)) dx` for each weight on a coarse and a
 * fine grid (twice the cells per dimension) over a range found from 2000 draws of each
 * density, widened by `margin`. The sums are self-normalised by the grid mass of m (a
 * constant integrand is exact). The reported value averages the fine grid and the fine grid
 * shifted by half a cell (a midpoint rule of half the spacing); its error is
 * |fine - coarse| + |fine - shifted| (the second catches kinks such as those of |p - q|,
 * which can hide from refinement alone) plus the tail beyond the range, estimated as the
 * largest |m w| on the grid's rim
 * times the volume of the box, plus a rounding allowance of 1e-12 |value|. When that tail
 * matters and no `bounds` were given, the range is doubled (up to four times).
 */
export function integrateGrid(
  p: Density,
  q: Density,
  weights: readonly MixtureWeight[],
  options: IntegrationOptions = {},
): GridResult {
  assertSameDimension(p, q, "p", "q");
  const d = p.d;
  resolveMethod(d, "grid");
  const g = options.gridSize ?? (d === 1 ? 2000 : 160);
  if (!Number.isInteger(g) || g < 4) {
    throw new SaddleError("invalid-argument", `gridSize must be an integer >= 4, got ${g}`, {
      parameter: "gridSize",
    });
  }
  let boxes = gridBoxes(p, q, options);
  const passes = () =>
    [
      gridPasses({ p, q, weights, boxes, g }),
      gridPasses({ p, q, weights, boxes, g: 2 * g }),
      gridPasses({ p, q, weights, boxes, g: 2 * g, offset: 0.5 }),
    ] as const;
  let [coarse, fine, shifted] = passes();
  const notes: string[] = [];
  if (boxes.length === 2) {
    notes.push(
      `the two densities lie apart: one grid around each (${fmtBounds(boxes[0])} and ` +
        `${fmtBounds(boxes[1])})`,
    );
  }
  // Integrands with heavier tails than m (χ² with a wider q, say) are still large on the rim:
  // the tail beyond the range is estimated as rim height x box volume; while it matters and
  // the range was not given, double the range about its centre (at most 4 times).
  for (let k = 0; k < 4 && !options.bounds; k++) {
    const big = fine.sums.some((v, w) =>
      Number.isFinite(v) && fine.tail[w] > 1e-11 * Math.max(Math.abs(v), 1e-3)
    );
    if (!big) break;
    boxes = widen(boxes);
    [coarse, fine, shifted] = passes();
    notes.push(
      `the integrand is heavy-tailed: range widened to ${boxes.map(fmtBounds).join(" and ")}`,
    );
  }
  const tail = fine.tail;
  if (
    !options.bounds &&
    fine.sums.some((v, w) => Number.isFinite(v) && tail[w] > 1e-6 * Math.max(Math.abs(v), 1e-3))
  ) {
    notes.push(
      "the integrand is still large on the rim after widening the range: the integral may " +
        "diverge (an infinite divergence); treat the value as a lower bound",
    );
  }
  const outP = Math.max(0, 1 - fine.massP), outQ = Math.max(0, 1 - fine.massQ);
  // The fine grid and its half-cell shift together are a midpoint rule of half the spacing.
  const values = fine.sums.map((v, w) => 0.5 * (v + shifted.sums[w]));
  const errors = new Float64Array(weights.length);
  for (let w = 0; w < weights.length; w++) {
    const v = values[w];
    errors[w] = Number.isFinite(v)
      ? Math.abs(fine.sums[w] - coarse.sums[w]) + Math.abs(fine.sums[w] - shifted.sums[w]) +
        tail[w] + 1e-12 * Math.abs(v)
      : 0;
  }
  if (outP > 1e-3 || outQ > 1e-3) {
    notes.push(
      `the grid misses mass ${outP.toExponential(2)} of p and ${outQ.toExponential(2)} of q: ` +
        "widen `bounds` or `margin`",
    );
  }
  notes.push(
    `midpoint quadrature on ${boxes.length === 2 ? "2 x " : ""}${2 * g}${
      d === 2 ? ` x ${2 * g}` : ""
    } cells and their half-cell shift; error bar = ` +
      "|fine - coarse grid| + |fine - shifted fine grid| + estimated tail beyond the range",
  );
  return {
    values,
    errors,
    massOutside: { p: outP, q: outQ },
    bounds: boxes[0],
    boxes,
    cells: boxes.length * (d === 1 ? 4 * g : 8 * g * g),
    notes,
  };
}

function fmtBounds(b: readonly (readonly [number, number])[]): string {
  return b.map(([lo, hi]) => `[${Number(lo.toPrecision(7))}, ${Number(hi.toPrecision(7))}]`)
    .join(" x ");
}

/** Log-densities of both densities at draws from p and at draws from q. */
export interface MonteCarloDraws {
  /** The draws from p. */
  readonly xP: Samples;
  /** The draws from q. */
  readonly xQ: Samples;
  /** `log p` and `log q` at the draws from p. */
  readonly lpAtP: Float64Array;
  /** `log q` at the draws from p. */
  readonly lqAtP: Float64Array;
  /** `log p` at the draws from q. */
  readonly lpAtQ: Float64Array;
  /** `log q` at the draws from q. */
  readonly lqAtQ: Float64Array;
}

/** `n` seeded draws from each density (independent streams) and both log-densities there. */
export function drawBoth(
  p: Density,
  q: Density,
  options: IntegrationOptions = {},
): MonteCarloDraws {
  assertSameDimension(p, q, "p", "q");
  const n = options.n ?? 20000;
  if (!Number.isInteger(n) || n < 2) {
    throw new SaddleError("invalid-argument", `n must be an integer >= 2, got ${n}`, {
      parameter: "n",
    });
  }
  const rng = toRng(options.seed ?? 0);
  const xP = p.sample(n, rng.fork("p")), xQ = q.sample(n, rng.fork("q"));
  return {
    xP,
    xQ,
    lpAtP: p.logPdf(xP),
    lqAtP: q.logPdf(xP),
    lpAtQ: p.logPdf(xQ),
    lqAtQ: q.logPdf(xQ),
  };
}

/** Log-ratios `log p - log q` (0 where both are equal, including both -Infinity). */
export function logRatios(lp: Float64Array, lq: Float64Array): Float64Array {
  const r = new Float64Array(lp.length);
  for (let i = 0; i < lp.length; i++) r[i] = lp[i] === lq[i] ? 0 : lp[i] - lq[i];
  return r;
}

/**
 * Heavy-tail warning: a note when one draw carries more than 1% of the total absolute mass
 * of its terms (with at least 1000 draws), a sign that the variance may be infinite.
 */
export function heavyTailNote(terms: Float64Array, label: string): string | undefined {
  if (terms.length < 1000) return undefined;
  let sum = 0, max = 0;
  for (let i = 0; i < terms.length; i++) {
    const a = Math.abs(terms[i]);
    sum += a;
    if (a > max) max = a;
  }
  if (sum > 0 && max / sum > 0.01) {
    return `one draw from ${label} carries ${(100 * max / sum).toFixed(1)}% of the sum of the ` +
      "terms: the density ratio is heavy-tailed and the Monte Carlo variance may be infinite " +
      "(check with another seed or use the grid)";
  }
  return undefined;
}

/**
 * `c_a mean(a) + c_b mean(b)` of per-draw terms from two independent samples, with se and a
 * normal interval; an infinite term makes the value infinite (no se).
 */
export function combineMeans(
  a: Float64Array,
  b: Float64Array | undefined,
  ca: number,
  cb: number,
  fields: { level?: number; unit?: EstimateUnit; notes?: readonly string[]; method?: string },
): Estimate {
  const level = fields.level ?? 0.95;
  const ma = meanVariance(a);
  const mb = b ? meanVariance(b) : { mean: 0, variance: 0 };
  const value = ca * ma.mean + (b ? cb * mb.mean : 0);
  const n = a.length + (b ? b.length : 0);
  const method = fields.method ?? "monte-carlo";
  const unit = fields.unit ? { unit: fields.unit } : {};
  if (!Number.isFinite(value)) {
    return makeEstimate({ value, level, method, n, notes: fields.notes ?? [], ...unit });
  }
  const se = Math.sqrt(
    ca * ca * ma.variance / a.length + (b ? cb * cb * mb.variance / b.length : 0),
  );
  const z = normalCritical(level);
  return makeEstimate({
    value,
    se,
    ci: [value - z * se, value + z * se],
    level,
    method,
    n,
    notes: fields.notes ?? [],
    ...unit,
  });
}

/**
 * An Estimate from a grid value and its refinement error. A quadrature between two
 * densities rests on no sample, so `n` is 0; the number of cells goes into the notes.
 */
export function gridEstimate(
  value: number,
  error: number,
  cells: number,
  fields: { level?: number; unit?: EstimateUnit; notes?: readonly string[] },
): Estimate {
  const unit = fields.unit ? { unit: fields.unit } : {};
  const level = fields.level ?? 0.95;
  const notes = [
    ...(fields.notes ?? []),
    `quadrature over ${cells} cells; n = 0 because the value rests on no sample`,
  ];
  const interval = Number.isFinite(value)
    ? { se: error, ci: [value - error, value + error] as const }
    : {};
  return makeEstimate({
    value,
    ...interval,
    level,
    method: "grid-quadrature",
    n: 0,
    notes,
    ...unit,
  });
}
