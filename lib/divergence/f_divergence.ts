/**
 * f-divergences between two densities by grid quadrature (d <= 2) or Monte Carlo, the
 * optimal critic, and the variational lower bound of any critic.
 *
 * @module
 */
import type { Density } from "../density/types.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import type { Estimate } from "../estimate/estimate.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import { assertSameDimension, isSamples, type Samples } from "../samples/samples.ts";
import {
  combineMeans,
  drawBoth,
  gridEstimate,
  heavyTailNote,
  integrateGrid,
  type IntegrationOptions,
  logRatios,
  resolveMethod,
} from "./integration.ts";
import { clipToRange, logBase, rangeNote, scaleEstimate, unitOf } from "../estimate/units.ts";
import {
  type FDivergenceName,
  type FDivergenceSpec,
  fDivergenceSpec,
  LOGARITHMIC_DIVERGENCES,
  mixtureWeightOf,
} from "./f_divergence_table.ts";

/** Options of {@linkcode fDivergence}. */
export interface FDivergenceOptions extends IntegrationOptions {
  /** α of the "alpha" family. */
  alpha?: number;
  /** Log base for the logarithmic divergences (kl, reverse-kl, jensen-shannon, gan): 2 for bits. */
  base?: number;
}

const LOGARITHMIC = LOGARITHMIC_DIVERGENCES;

/**
 * The f-divergence `D_f(P || Q) = ∫ q f(p/q)` between two densities, as an Estimate.
 *
 * Written as an expectation under the mixture m = (p + q)/2 of a function of the log-ratio
 * `r = log p - log q` (see {@linkcode mixtureWeightOf}), so it works in log space and where
 * either density vanishes. `method: "grid"` (default for d <= 2) is midpoint quadrature on
 * two grids, with the refinement difference plus the mass outside the range as the error
 * bar; `"monte-carlo"` (default for d > 2) averages over `n` draws from each density (the
 * mixture, stratified), se from the per-draw terms. Infinite divergences (support of p not
 * inside that of q for KL or χ², disjoint supports) come out as Infinity with a note; a
 * heavy-tailed ratio, where the Monte Carlo variance may be infinite (χ², reverse KL in the
 * tails), is flagged. An estimate outside the divergence's range (JSD in [0, ln 2]) by more
 * than its error is flagged too. `base: 2` gives bits for the logarithmic divergences.
 *
 * References: Csiszár 1967; Nguyen, Wainwright & Jordan 2010 (IEEE T-IT); Nowozin, Cseke &
 * Tomioka 2016, f-GAN (NeurIPS); Lin 1991 for the JSD range.
 *
 * @example Total variation of two intervals
 * ```ts
 * import { fDivergence } from "./f_divergence.ts";
 * import type { Density } from "../density/types.ts";
 * import { samples } from "../samples/samples.ts";
 * import assert from "node:assert/strict";
 * // Uniform on [a, a + 1], inline for the example.
 * const unif = (a: number): Density => ({
 *   d: 1,
 *   logPdf: (x) => x.data.map((v) => (v >= a && v <= a + 1 ? 0 : -Infinity)),
 *   sample: (n) => samples(Array.from({ length: n }, (_, i) => a + (i + 0.5) / n)),
 *   describe: () => ({ kind: "uniform", d: 1, parameters: { a }, notes: [] }),
 * });
 * const tv = fDivergence(unif(0), unif(0.5), "total-variation", { bounds: [[-1, 2.5]] });
 * assert.ok(Math.abs(tv.value - 0.5) < 1e-3);
 * ```
 */
export function fDivergence(
  p: Density,
  q: Density,
  name: FDivergenceName | FDivergenceSpec,
  options: FDivergenceOptions = {},
): Estimate {
  assertSameDimension(p, q, "p", "q");
  const s = fDivergenceSpec(name, options);
  const c = logBase(options.base);
  if (options.base !== undefined && !LOGARITHMIC.has(s.name)) {
    throw new SaddleError(
      "invalid-argument",
      `base applies to the logarithmic divergences only, not to "${s.name}"`,
      { parameter: "base" },
    );
  }
  const unit = LOGARITHMIC.has(s.name) ? unitOf(options.base) : "none";
  const w = mixtureWeightOf(s);
  const method = resolveMethod(p.d, options.method);
  let est: Estimate;
  const notes: string[] = [`${s.label}`];
  if (method === "grid") {
    const g = integrateGrid(p, q, [w], options);
    const value = g.values[0];
    if (!Number.isFinite(value)) notes.push(infiniteNote(s));
    est = gridEstimate(value, g.errors[0], g.cells, {
      level: options.level,
      notes: [...notes, ...g.notes],
    });
  } else {
    const dr = drawBoth(p, q, options);
    const wP = logRatios(dr.lpAtP, dr.lqAtP).map(w);
    const wQ = logRatios(dr.lpAtQ, dr.lqAtQ).map(w);
    const finite = wP.every(Number.isFinite) && wQ.every(Number.isFinite);
    if (!finite) notes.push(infiniteNote(s));
    else {
      for (const [t, label] of [[wP, "p"], [wQ, "q"]] as const) {
        const h = heavyTailNote(t, label);
        if (h) notes.push(h);
      }
    }
    notes.push(`Monte Carlo over ${dr.xP.n} draws from each density (mixture, stratified)`);
    est = combineMeans(wP, wQ, 0.5, 0.5, { level: options.level, notes, method: "monte-carlo" });
  }
  const out = scaleEstimate(est, c, unit);
  const flag = rangeNote(out, s.range[0] / c, s.range[1] / c, s.label);
  return clipToRange(
    flag ? scaleEstimate(out, 1, unit, [flag]) : out,
    s.range[0] / c,
    s.range[1] / c,
    s.label,
  );
}

function infiniteNote(s: FDivergenceSpec): string {
  return `${s.name} is infinite: one density has mass where the other has none ` +
    `(f(0) = ${s.fAtZero}, lim f(u)/u = ${s.slopeAtInfinity}), or the integral diverges in ` +
    "the tails";
}

/**
 * The optimal critic `T*(x) = f'(p(x)/q(x))` of an f-divergence, as a function of a batch,
 * computed from the log-ratio (Nguyen, Wainwright & Jordan 2010). Where both densities
 * vanish the ratio is taken as 1.
 *
 * References: Nguyen, Wainwright & Jordan 2010 (IEEE T-IT); Nowozin et al. 2016 (NeurIPS).
 *
 * @example T* of KL is 1 + log(p/q)
 * ```ts
 * import { optimalCritic } from "./f_divergence.ts";
 * import type { Density } from "../density/types.ts";
 * import { samples } from "../samples/samples.ts";
 * import assert from "node:assert/strict";
 * const normal = (mu: number): Density => ({
 *   d: 1,
 *   logPdf: (x) => x.data.map((v) => -0.5 * (v - mu) ** 2 - 0.5 * Math.log(2 * Math.PI)),
 *   sample: () => { throw new Error("not needed"); },
 *   describe: () => ({ kind: "normal", d: 1, parameters: { mu }, notes: [] }),
 * });
 * const t = optimalCritic(normal(0), normal(1), "kl");
 * assert.deepEqual(Array.from(t(samples([0.5]))), [1]);
 * ```
 */
export function optimalCritic(
  p: Density,
  q: Density,
  name: FDivergenceName | FDivergenceSpec,
  options: { alpha?: number } = {},
): (x: Samples) => Float64Array {
  assertSameDimension(p, q, "p", "q");
  const s = fDivergenceSpec(name, options);
  return (x) => logRatios(p.logPdf(x), q.logPdf(x)).map(s.criticFromLogRatio);
}

/** Options of {@linkcode variationalBound}. */
export interface VariationalBoundOptions {
  /** α of the "alpha" family. */
  alpha?: number;
  /** Draws from each side when it is given as a Density (default 20000). */
  n?: number;
  /** Seed of those draws (default 0). */
  seed?: RandomSource;
  /** Confidence level (default 0.95). */
  level?: number;
  /** Pass the critic's raw outputs v through the row's output activation first. */
  activation?: boolean;
}

/**
 * The variational lower bound `E_P[T] - E_Q[f*(T)] <= D_f(P || Q)` for a user critic T
 * (Nguyen, Wainwright & Jordan 2010; Nowozin et al. 2016, eq. 4), as a Monte Carlo
 * Estimate (se from the two independent sample means): the gap to the divergence shows how
 * loose the critic is; the bound is tight at {@linkcode optimalCritic}. `real` and `fake`
 * are samples of P and Q or densities to draw `n` points from. A critic value outside the
 * domain of f* makes the bound `-Infinity` (noted); `activation: true` maps raw outputs
 * onto the domain first.
 *
 * References: Nguyen, Wainwright & Jordan 2010 (IEEE T-IT); Nowozin, Cseke & Tomioka 2016,
 * f-GAN (NeurIPS).
 *
 * @example A constant critic gives a trivial bound
 * ```ts
 * import { variationalBound } from "./f_divergence.ts";
 * import { samples } from "../samples/samples.ts";
 * import assert from "node:assert/strict";
 * const real = samples([0, 1, 2]), fake = samples([1, 2, 3]);
 * // KL: T = 1 gives 1 - exp(0) = 0.
 * const b = variationalBound(real, fake, (x) => new Float64Array(x.n).fill(1), "kl");
 * assert.equal(b.value, 0);
 * ```
 */
export function variationalBound(
  real: Samples | Density,
  fake: Samples | Density,
  critic: (x: Samples) => ArrayLike<number>,
  name: FDivergenceName | FDivergenceSpec,
  options: VariationalBoundOptions = {},
): Estimate {
  const s = fDivergenceSpec(name, options);
  const rng = toRng(options.seed ?? 0);
  const n = options.n ?? 20000;
  const xP = asSamples(real, n, rng.fork("p"), "real");
  const xQ = asSamples(fake, n, rng.fork("q"), "fake");
  assertSameDimension(xP, xQ, "real", "fake");
  const tP = criticValues(critic, xP, "real");
  const tQ = criticValues(critic, xQ, "fake");
  if (options.activation) {
    for (let i = 0; i < tP.length; i++) tP[i] = s.activation(tP[i]);
    for (let i = 0; i < tQ.length; i++) tQ[i] = s.activation(tQ[i]);
  }
  const fStar = tQ.map(s.conjugate);
  let outside = 0;
  for (const v of fStar) if (v === Infinity) outside++;
  const notes = [`variational bound of ${s.label}: E_P[T] - E_Q[f*(T)]`];
  if (outside > 0) {
    notes.push(
      `the critic leaves the domain of f* (${s.domainText}) on ${outside} generated points: ` +
        "the bound is -Infinity; use activation: true",
    );
  }
  const unit = LOGARITHMIC.has(s.name) ? "nats" : "none";
  return combineMeans(tP, fStar, 1, -1, {
    level: options.level,
    unit,
    notes,
    method: "monte-carlo",
  });
}

function asSamples(x: Samples | Density, n: number, seed: RandomSource, name: string): Samples {
  if (isSamples(x)) {
    if (x.n === 0) throw new SaddleError("empty", `${name} has no points`, { parameter: name });
    return x;
  }
  if (!Number.isInteger(n) || n < 2) {
    throw new SaddleError("invalid-argument", `n must be an integer >= 2, got ${n}`, {
      parameter: "n",
    });
  }
  return x.sample(n, seed);
}

function criticValues(
  critic: (x: Samples) => ArrayLike<number>,
  x: Samples,
  name: string,
): Float64Array {
  const t = Float64Array.from(critic(x));
  if (t.length !== x.n) {
    throw new SaddleError(
      "dimension-mismatch",
      `the critic returned ${t.length} values for ${x.n} ${name} points`,
      { parameter: "critic" },
    );
  }
  for (let i = 0; i < t.length; i++) {
    if (Number.isNaN(t[i])) {
      throw new SaddleError("non-finite", `the critic returned NaN on ${name} point ${i}`, {
        parameter: "critic",
        row: i,
      });
    }
  }
  return t;
}
