/**
 * How far a trained discriminator is from the optimal one: the value gap
 * `V(D*, G) - V(D, G)` and calibration (reliability bins, ECE, Brier score).
 *
 * @module
 */
import type { Density } from "../density/types.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { bootstrap } from "../estimate/bootstrap.ts";
import { withDisplay } from "../display/display.ts";
import { type Estimate, meanEstimate } from "../estimate/estimate.ts";
import { clipToRange } from "../estimate/units.ts";
import { escapeHtml, htmlTable, type TableCell, textTable } from "../display/table.ts";
import type { RandomSource } from "../random/rng.ts";
import { assertSameDimension, isSamples, type Samples } from "../samples/samples.ts";
import { twoSampleSum } from "../estimate/two_sample.ts";
import { OUTPUT_EPSILON, type OutputScale, outputsToLogits } from "./output_scale.ts";
import { logSigmoid, sigmoid } from "../math/log_space.ts";
import { optimalDiscriminator } from "./optimal_discriminator.ts";
import type { Discriminator } from "./types.ts";

/** Input of {@linkcode discriminatorGap}. */
export interface DiscriminatorGapInput {
  /** The trained discriminator's outputs on the real samples (or a one-column Samples). */
  dReal: ArrayLike<number> | Samples;
  /** Its outputs on the generated samples. */
  dFake: ArrayLike<number> | Samples;
  /** Whether the outputs are probabilities or logits. */
  scale: OutputScale;
  /** The real points the outputs were computed on (needed with densities or a reference). */
  real?: Samples;
  /** The generated points the outputs were computed on. */
  fake?: Samples;
  /** Data density: with `pModel`, D* = p_data / (p_data + p_g) is the reference. */
  pData?: Density;
  /** Model density. */
  pModel?: Density;
  /** Another reference discriminator (e.g. a classifier estimate of D*) when no densities. */
  reference?: Discriminator;
  /** Equal-width reliability bins on [0, 1] (default 10). */
  bins?: number;
  /** Confidence level (default 0.95). */
  level?: number;
  /** Seed of the bootstrap intervals (default 0). */
  seed?: RandomSource;
  /** Bootstrap replicates (default 500). */
  replicates?: number;
  /** Clip for probabilities of exactly 0 or 1 (default 1e-7). */
  epsilon?: number;
}

/** One reliability bin; weights give each side half the mass (equal priors). */
export interface ReliabilityBin {
  /** Lower edge (open, except 0 for the first bin). */
  readonly lo: number;
  /** Upper edge (closed): the bin is (lo, hi], as in Guo et al. 2017. */
  readonly hi: number;
  /** Points (real + generated) in the bin. */
  readonly count: number;
  /** Share of the equal-prior weight in the bin. */
  readonly weight: number;
  /** Mean D in the bin (NaN when empty). */
  readonly meanD: number;
  /** Weighted fraction of real points: the observed frequency to compare with meanD. */
  readonly fractionReal: number;
  /** Mean of the reference D* in the bin, when a reference is known. */
  readonly meanOptimal?: number;
}

/** Result of {@linkcode discriminatorGap}. */
export interface DiscriminatorGap {
  /** `V(D, G)` of the trained discriminator on the given outputs. */
  readonly value: Estimate;
  /** `V(D*, G)` on the same points, when a reference is known. */
  readonly optimalValue?: Estimate;
  /** `V(D*, G) - V(D, G)` (>= 0 in expectation), paired on the same points. */
  readonly gap?: Estimate;
  /** Reliability-diagram bins. */
  readonly bins: readonly ReliabilityBin[];
  /** Expected calibration error against the labels (Guo et al. 2017), equal priors. */
  readonly ece: Estimate;
  /** Weighted mean |meanD - meanD*| over the bins: calibration against D*. */
  readonly eceVsOptimal?: Estimate;
  /** Brier score `½ mean_real (1 - D)² + ½ mean_fake D²`. */
  readonly brier: Estimate;
  /** Mean |D - D*| on the real and on the generated points. */
  readonly meanAbsDiff?: { readonly real: Estimate; readonly fake: Estimate };
  /**
   * What the comparison is against: `"D*"` (from the two densities), `"reference"` (a given
   * discriminator, e.g. a classifier estimate of D*), or `"none"`. The tables name the
   * rows after it: a reference is not D*, and a negative gap shows it is not.
   */
  readonly against: "D*" | "reference" | "none";
  /** The gap's interval lies below 0: the reference does not describe the samples. */
  readonly negativeGap: boolean;
  /** Caveats. */
  readonly notes: readonly string[];
}

/**
 * Compare a trained discriminator with the optimal one. From its outputs on real and
 * generated samples: `V(D, G)`, and, when the densities (or a `reference` discriminator)
 * and the points are given, `V(D*, G)` on the same points and the gap `V(D*, G) - V(D, G)`
 * with a paired two-sample se and bootstrap interval — non-negative in expectation, since
 * D* maximises V pointwise (Goodfellow et al. 2014, Prop. 1). Calibration: equal-width
 * reliability bins of D with the observed real fraction (each side weighted ½, i.e. equal
 * priors), the expected calibration error of Guo et al. 2017 for the probability of "real"
 * (the positive-class form: weighted mean over bins of |mean D - real fraction|, with a
 * seeded bootstrap interval), its version against D*
 * (weighted mean |mean D - mean D*| per bin), the Brier score, and mean |D - D*| per side.
 * A negative gap whose interval excludes 0 means the densities do not describe the samples.
 *
 * References: Goodfellow et al. 2014 (NeurIPS), Prop. 1; Guo, Pleiss, Sun & Weinberger
 * 2017, On Calibration of Modern Neural Networks (ICML); Brier 1950 (Monthly Weather Rev.).
 *
 * @example A perfectly calibrated constant discriminator
 * ```ts
 * import { discriminatorGap } from "./discriminator_gap.ts";
 * import assert from "node:assert/strict";
 * const g = discriminatorGap({ dReal: [0.5, 0.5], dFake: [0.5, 0.5], scale: "prob" });
 * assert.equal(g.ece.value, 0);
 * assert.equal(g.brier.value, 0.25);
 * ```
 */
export function discriminatorGap(input: DiscriminatorGapInput): DiscriminatorGap {
  const eps = input.epsilon ?? OUTPUT_EPSILON;
  const level = input.level ?? 0.95;
  const seed = input.seed ?? 0;
  const replicates = input.replicates ?? 500;
  const nb = input.bins ?? 10;
  if (!Number.isInteger(nb) || nb < 1) {
    throw new SaddleError("invalid-argument", `bins must be a positive integer, got ${nb}`, {
      parameter: "bins",
    });
  }
  const r = outputsToLogits(input.dReal, input.scale, "dReal", eps);
  const f = outputsToLogits(input.dFake, input.scale, "dFake", eps);
  const notes: string[] = [];
  if (r.clipped + f.clipped > 0) {
    notes.push(`${r.clipped + f.clipped} outputs were exactly 0 or 1 and were clipped at ${eps}`);
  }
  const lr = r.logit, lf = f.logit;
  const nr = lr.length, nf = lf.length;
  const tR = lr.map(logSigmoid), tF = lf.map((l) => logSigmoid(-l));
  const opts = { level, seed, replicates, unit: "nats" as const };
  const value = twoSampleSum(tR, tF, opts);

  let ref: Discriminator | undefined = input.reference;
  if (input.pData || input.pModel) {
    if (!input.pData || !input.pModel) {
      throw new SaddleError("invalid-argument", "give both pData and pModel, or neither", {
        parameter: input.pData ? "pModel" : "pData",
      });
    }
    ref = optimalDiscriminator(input.pData, input.pModel);
  }
  let sr: Float64Array | undefined, sf: Float64Array | undefined;
  if (ref) {
    if (!input.real || !input.fake) {
      throw new SaddleError(
        "invalid-argument",
        "comparing with D* needs the points: pass `real` and `fake` with the outputs",
        { parameter: input.real ? "fake" : "real" },
      );
    }
    assertSameDimension(input.real, input.fake, "real", "fake");
    for (const [s, n, name] of [[input.real, nr, "real"], [input.fake, nf, "fake"]] as const) {
      if (s.n !== n) {
        throw new SaddleError(
          "dimension-mismatch",
          `${name} has ${s.n} points but ${n} outputs were given for it`,
          { parameter: name },
        );
      }
    }
    sr = ref.logit(input.real);
    sf = ref.logit(input.fake);
  }
  let optimalValue: Estimate | undefined, gap: Estimate | undefined;
  let meanAbsDiff: DiscriminatorGap["meanAbsDiff"];
  if (sr && sf) {
    const oR = sr.map(logSigmoid), oF = sf.map((l) => logSigmoid(-l));
    optimalValue = twoSampleSum(oR, oF, opts);
    // Where D and D* agree the point adds 0, including where both terms are -Infinity
    // (both saturated the same way), which plain subtraction would make NaN.
    const diff = (a: number, b: number) => (a === b ? 0 : a - b);
    const gR = oR.map((v, i) => diff(v, tR[i])), gF = oF.map((v, i) => diff(v, tF[i]));
    gap = twoSampleSum(gR, gF, opts);
    if (gap.ci && gap.ci[1] < 0) {
      notes.push(
        `V(${input.pData ? "D*" : "D_ref"}, G) - V(D, G) is significantly negative: the ` +
          `${input.pData ? "densities do" : "reference discriminator does"} not describe ` +
          "these samples (at D* the gap is >= 0 in expectation)",
      );
    }
    const absR = lr.map((l, i) => Math.abs(sigmoid(l) - sigmoid(sr![i])));
    const absF = lf.map((l, i) => Math.abs(sigmoid(l) - sigmoid(sf![i])));
    // Probabilities: intervals kept inside [0, 1].
    const mean = (v: Float64Array, what: string) =>
      clipToRange(
        meanEstimate(v, { level, unit: "probability", method: "sample mean" }),
        0,
        1,
        what,
      );
    meanAbsDiff = {
      real: mean(absR, "mean |D - D*| (real)"),
      fake: mean(absF, "mean |D - D*| (generated)"),
    };
  }

  // Probabilities as given (not through the clipped logit and back, which moves outputs
  // on a bin edge by rounding); from logits, the logistic.
  const asGiven = (v: ArrayLike<number> | Samples) => Float64Array.from(isSamples(v) ? v.data : v);
  const pR = input.scale === "prob" ? asGiven(input.dReal) : lr.map(sigmoid);
  const pF = input.scale === "prob" ? asGiven(input.dFake) : lf.map(sigmoid);
  const oPR = sr?.map(sigmoid), oPF = sf?.map(sigmoid);
  // Right-closed bins (edge[b], edge[b + 1]] as Guo et al. 2017 and sklearn's
  // calibration_curve (searchsorted on the inner edges); 0 goes to the first bin. The edges
  // are numpy's linspace(0, 1, nb + 1), b * (1 / nb) and 1 at the end, so an output such as
  // 0.1 + 0.2 = 0.30000000000000004 = 3 * 0.1 lands in (0.2, 0.3] as it does there.
  const edges = reliabilityEdges(nb);
  const binIndex = (p: number) => {
    let b = Math.min(nb - 1, Math.max(0, Math.ceil(p * nb) - 1));
    while (b > 0 && p <= edges[b]) b--;
    while (b < nb - 1 && p > edges[b + 1]) b++;
    return b;
  };
  const calib = (ir: ArrayLike<number>, iF: ArrayLike<number>) => {
    const w = new Float64Array(nb), sD = new Float64Array(nb), sY = new Float64Array(nb);
    const sO = new Float64Array(nb), cnt = new Uint32Array(nb);
    const wr = 0.5 / ir.length, wf = 0.5 / iF.length;
    for (let k = 0; k < ir.length; k++) {
      const i = ir[k], b = binIndex(pR[i]);
      w[b] += wr;
      sD[b] += wr * pR[i];
      sY[b] += wr;
      if (oPR) sO[b] += wr * oPR[i];
      cnt[b]++;
    }
    for (let k = 0; k < iF.length; k++) {
      const i = iF[k], b = binIndex(pF[i]);
      w[b] += wf;
      sD[b] += wf * pF[i];
      if (oPF) sO[b] += wf * oPF[i];
      cnt[b]++;
    }
    let ece = 0, eceO = 0;
    for (let b = 0; b < nb; b++) {
      if (w[b] === 0) continue;
      ece += Math.abs(sD[b] - sY[b]);
      eceO += Math.abs(sD[b] - sO[b]);
    }
    return { w, sD, sY, sO, cnt, ece, eceO };
  };
  const id = (n: number) => Uint32Array.from({ length: n }, (_, i) => i);
  const base = calib(id(nr), id(nf));
  const bins: ReliabilityBin[] = [];
  for (let b = 0; b < nb; b++) {
    const wb = base.w[b];
    bins.push({
      lo: edges[b],
      hi: edges[b + 1],
      count: base.cnt[b],
      weight: wb,
      meanD: wb > 0 ? base.sD[b] / wb : NaN,
      fractionReal: wb > 0 ? base.sY[b] / wb : NaN,
      ...(oPR ? { meanOptimal: wb > 0 ? base.sO[b] / wb : NaN } : {}),
    });
  }
  const bopts = { level, seed, replicates, unit: "probability" as const };
  const ece = bootstrap([nr, nf], (a, b) => calib(a, b).ece, bopts);
  const eceVsOptimal = oPR ? bootstrap([nr, nf], (a, b) => calib(a, b).eceO, bopts) : undefined;
  const brier = twoSampleSum(pR.map((p) => (1 - p) ** 2), pF.map((p) => p * p), {
    ...opts,
    unit: "probability",
    weights: [0.5, 0.5],
  });
  if (!ref) notes.push("no densities or reference given: the gap to D* is not computed");
  const out: DiscriminatorGap = {
    against: input.pData ? "D*" : ref ? "reference" : "none",
    negativeGap: gap?.ci !== undefined && gap.ci[1] < 0,
    value,
    ...(optimalValue ? { optimalValue } : {}),
    ...(gap ? { gap } : {}),
    bins,
    ece,
    ...(eceVsOptimal ? { eceVsOptimal } : {}),
    brier,
    ...(meanAbsDiff ? { meanAbsDiff } : {}),
    notes,
  };
  return withDisplay(out, gapBundle);
}

/** Bin edges as numpy's `linspace(0, 1, nb + 1)`: `b * (1 / nb)`, and exactly 1 last. */
function reliabilityEdges(nb: number): Float64Array {
  const step = 1 / nb;
  const e = Float64Array.from({ length: nb + 1 }, (_, b) => b * step);
  e[nb] = 1;
  return e;
}

function gapBundle(g: DiscriminatorGap): Record<string, string> {
  // A reference discriminator is named as such, never as D*; a significantly negative gap
  // is flagged in the table itself, not only in the notes.
  const R = g.against === "reference" ? "D_ref" : "D*";
  const warn = g.negativeGap ? " (negative: the reference does not describe the samples)" : "";
  const rows: TableCell[][] = [["V(D, G)", g.value]];
  if (g.optimalValue) rows.push([`V(${R}, G)`, g.optimalValue]);
  if (g.gap) rows.push([`gap V(${R}, G) - V(D, G)${warn}`, g.gap]);
  rows.push(["ECE (labels)", g.ece]);
  if (g.eceVsOptimal) rows.push([`ECE against ${R}`, g.eceVsOptimal]);
  rows.push(["Brier score", g.brier]);
  if (g.meanAbsDiff) {
    rows.push([`mean |D - ${R}| (real)`, g.meanAbsDiff.real]);
    rows.push([`mean |D - ${R}| (generated)`, g.meanAbsDiff.fake]);
  }
  // Right-closed, as the bins are built: (lo, hi], with 0 in the first bin [0, hi].
  const binRows: TableCell[][] = g.bins.map((b, i) => [
    `${i === 0 ? "[" : "("}${b.lo.toFixed(2)}, ${b.hi.toFixed(2)}]`,
    b.count,
    b.meanD,
    b.fractionReal,
    b.meanOptimal ?? null,
  ]);
  const bh = ["bin", "count", "mean D", "real fraction", `mean ${R}`];
  const caption = g.against === "reference"
    ? "Discriminator against a reference discriminator (not the exact D*)"
    : "Discriminator against the optimum";
  const warning = g.negativeGap
    ? `<p style="color:#b00020"><strong>warning:</strong> V(${R}, G) - V(D, G) is ` +
      "significantly negative: the reference does not describe these samples, so the " +
      "comparison says nothing about the optimum</p>"
    : "";
  return {
    "text/plain": `${textTable(["quantity", "estimate"], rows)}\n\n${textTable(bh, binRows)}` +
      (g.notes.length ? `\n${g.notes.join("\n")}` : ""),
    "text/html": warning + htmlTable(["quantity", "estimate"], rows, caption) +
      htmlTable(bh, binRows, "Reliability bins (equal priors)") +
      (g.notes.length
        ? `<ul style="font-size:smaller">${
          g.notes.map((n) => `<li>${escapeHtml(n)}</li>`).join("")
        }</ul>`
        : ""),
  };
}
