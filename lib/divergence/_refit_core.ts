/**
 * The replicate engine of the shared refit bootstrap (private; the worker runs it too):
 * what a replicate computes from its resample, on the binned route (bootstrap counts as
 * KDE weights) and on the refit route (fit each resample, integrate).
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { Rng } from "../random/rng.ts";
import type { Density } from "../density/types.ts";
import { logSigmoid } from "../math/log_space.ts";
import {
  countsOf,
  type PairData,
  pairDensities,
  type PairPlan,
  pairSums,
  scottBandwidth,
} from "./_binned_pair.ts";
import {
  combineMeans,
  drawBoth,
  gridEstimate,
  integrateGrid,
  logRatios,
  type MixtureWeight,
} from "./integration.ts";
import type { IntegrationOptions } from "./integration_options.ts";
import { fDivergence } from "./f_divergence.ts";
import { fDivergenceSpec } from "./f_divergence_table.ts";
import { DECOMPOSITION_WEIGHTS, type ResolvedQuantity, weightOf } from "./refit_quantities.ts";
import { type Estimate, makeEstimate } from "../estimate/estimate.ts";

/** A quantity as the worker receives it (no functions): its key and, for a divergence, a name. */
export interface QuantityWire {
  readonly key: string;
  readonly name?: string;
  readonly alpha?: number;
}

/** Weights of the binned route: the three decomposition integrands, then bounded divergences. */
export function binnedWeights(quantities: readonly QuantityWire[]): MixtureWeight[] {
  const w: MixtureWeight[] = [
    DECOMPOSITION_WEIGHTS.value,
    DECOMPOSITION_WEIGHTS.klRealMix,
    DECOMPOSITION_WEIGHTS.klFakeMix,
  ];
  for (const q of quantities) {
    if (q.name !== undefined) {
      const spec = fDivergenceSpec(q.name as "kl", q.alpha !== undefined ? { alpha: q.alpha } : {});
      w.push(weightOf({ key: q.key, label: spec.label, spec, bounded: true }));
    }
  }
  return w;
}

/**
 * Values of the requested quantities (in nats) from the expectations of the binned weights:
 * value, KL terms, JSD = (KL + KL)/2, residual = value - (-ln 4 + KL + KL), divergences.
 */
export function valuesFromSums(
  quantities: readonly QuantityWire[],
  e: ArrayLike<number>,
  vD = NaN,
) {
  const out = new Float64Array(quantities.length);
  let k = 3;
  quantities.forEach((q, i) => {
    switch (q.key) {
      case "value":
        out[i] = e[0];
        break;
      case "klRealMix":
        out[i] = e[1];
        break;
      case "klFakeMix":
        out[i] = e[2];
        break;
      case "jsd":
        out[i] = 0.5 * (e[1] + e[2]);
        break;
      case "gap":
        out[i] = e[0] - vD;
        break;
      case "residual": {
        const sum = -Math.log(4) + e[1] + e[2];
        out[i] = e[0] === sum ? 0 : e[0] - sum;
        break;
      }
      default:
        out[i] = e[k++];
    }
  });
  return out;
}

/** ln D on the real points and ln(1 - D) on the fake points of a trained discriminator. */
export interface DiscriminatorTerms {
  readonly logD: Float64Array;
  readonly log1mD: Float64Array;
}

/**
 * `V(D, G) = mean ln D over real + mean ln(1 - D) over fake`, on a resample given by
 * counts (null: every point once).
 */
export function valueOfD(
  t: DiscriminatorTerms,
  cReal: Uint32Array | null,
  cFake: Uint32Array | null,
): number {
  let a = 0, na = 0, b = 0, nb = 0;
  for (let i = 0; i < t.logD.length; i++) {
    const c = cReal ? cReal[i] : 1;
    a += c * t.logD[i];
    na += c;
  }
  for (let i = 0; i < t.log1mD.length; i++) {
    const c = cFake ? cFake[i] : 1;
    b += c * t.log1mD[i];
    nb += c;
  }
  return a / na + b / nb;
}

/** What a binned replicate needs, all transferable to a worker. */
export interface BinnedJob {
  readonly data: PairData;
  readonly plan: PairPlan;
  readonly quantities: readonly QuantityWire[];
  readonly seed: string;
  /** The discriminator's terms, when the gap is requested. */
  readonly discriminator?: DiscriminatorTerms;
}

/**
 * Binned replicates `from .. to - 1` into `out` (row b - from, one column per quantity,
 * NaN where a replicate failed); failure messages are collected. Replicate b draws its
 * real indices from fork `refit/b/real` of the seed and its fake indices from
 * `refit/b/fake`, exactly as the refit route does, so both see the same resamples.
 */
export function binnedReplicates(
  job: BinnedJob,
  from: number,
  to: number,
  out: Float64Array,
  onDone?: () => void,
): string[] {
  const { data, plan, quantities } = job;
  const base = new Rng(job.seed);
  const weights = binnedWeights(quantities);
  const Q = quantities.length;
  const iR = new Uint32Array(data.nReal), iF = new Uint32Array(data.nFake);
  const cR = new Uint32Array(data.nReal), cF = new Uint32Array(data.nFake);
  const failures: string[] = [];
  for (let b = from; b < to; b++) {
    const rb = base.fork(`refit/${b}`);
    rb.fork("real").bootstrapIndices(data.nReal, data.nReal, iR);
    rb.fork("fake").bootstrapIndices(data.nFake, data.nFake, iF);
    try {
      countsOf(iR, cR);
      countsOf(iF, cF);
      const hR = scottBandwidth(data.real, data.nReal, data.d, cR);
      const hF = scottBandwidth(data.fake, data.nFake, data.d, cF);
      const dens = pairDensities(data, plan, hR, hF, { real: cR, fake: cF });
      const vD = job.discriminator ? valueOfD(job.discriminator, cR, cF) : NaN;
      const v = valuesFromSums(quantities, pairSums(plan, dens, weights, false).fine, vD);
      for (let t = 0; t < Q; t++) out[(b - from) * Q + t] = v[t];
    } catch (err) {
      if (!(err instanceof SaddleError)) throw err;
      for (let t = 0; t < Q; t++) out[(b - from) * Q + t] = NaN;
      failures.push(err.message);
    }
    onDone?.();
  }
  return failures;
}

/**
 * The refit route for one pair of densities: every requested quantity, each computed on
 * its own (the decomposition terms together, each divergence alone) so that a quantity's
 * number does not depend on what else is requested. Values in nats, with the numerical
 * error as the estimate's se (grid refinement, or Monte Carlo).
 */
export function refitQuantities(
  p: Density,
  q: Density,
  quantities: readonly ResolvedQuantity[],
  integ: IntegrationOptions & { method: "grid" | "monte-carlo" },
  vD = NaN,
): Estimate[] {
  const out: (Estimate | undefined)[] = quantities.map(() => undefined);
  const terms = quantities.filter((x) => !x.spec);
  if (terms.length > 0) {
    const dec = decompositionTerms(p, q, integ);
    quantities.forEach((x, i) => {
      if (x.key === "gap") {
        const v = dec.value;
        out[i] = makeEstimate({
          value: v.value - vD,
          ...(v.se !== undefined ? { se: v.se } : {}),
          ...(v.ci ? { ci: [v.ci[0] - vD, v.ci[1] - vD] as const } : {}),
          level: v.level,
          method: v.method,
          n: v.n,
          unit: "nats",
          notes: ["V(D*, G) of the fits minus V(D, G) of the discriminator's outputs", ...v.notes],
        });
      } else if (!x.spec) out[i] = dec[x.key as keyof typeof dec];
    });
  }
  quantities.forEach((x, i) => {
    if (x.spec) out[i] = fDivergence(p, q, x.spec, integ);
  });
  return out as Estimate[];
}

/** The decomposition terms in nats between two densities, each with its numerical error. */
function decompositionTerms(
  p: Density,
  q: Density,
  integ: IntegrationOptions & { method: "grid" | "monte-carlo" },
): Record<string, Estimate> {
  const level = integ.level ?? 0.95;
  const f = { level, unit: "nats" as const };
  let value: Estimate, k1: Estimate, k2: Estimate, jsd: Estimate;
  const W = DECOMPOSITION_WEIGHTS;
  if (integ.method === "grid") {
    const g = integrateGrid(p, q, [W.value, W.klRealMix, W.klFakeMix], integ);
    const notes = { ...f, notes: g.notes };
    value = gridEstimate(g.values[0], g.errors[0], g.cells, notes);
    k1 = gridEstimate(g.values[1], g.errors[1], g.cells, notes);
    k2 = gridEstimate(g.values[2], g.errors[2], g.cells, notes);
    jsd = gridEstimate(
      0.5 * (g.values[1] + g.values[2]),
      0.5 * (g.errors[1] + g.errors[2]),
      g.cells,
      notes,
    );
  } else {
    const dr = drawBoth(p, q, integ);
    const rP = logRatios(dr.lpAtP, dr.lqAtP), rQ = logRatios(dr.lpAtQ, dr.lqAtQ);
    const tReal = rP.map((r) => Math.LN2 + logSigmoid(r));
    const tFake = rQ.map((r) => Math.LN2 + logSigmoid(-r));
    const mc = { ...f, method: "monte-carlo", notes: [`Monte Carlo over ${dr.xP.n} draws each`] };
    k1 = combineMeans(tReal, undefined, 1, 0, mc);
    k2 = combineMeans(tFake, undefined, 1, 0, mc);
    jsd = combineMeans(tReal, tFake, 0.5, 0.5, mc);
    // V(D*, G) = E_p[ln σ(r)] + E_q[ln σ(-r)] = -ln 4 + KL + KL term by term.
    value = combineMeans(
      rP.map((r) => logSigmoid(r)),
      rQ.map((r) => logSigmoid(-r)),
      1,
      1,
      mc,
    );
  }
  const sum = -Math.log(4) + k1.value + k2.value;
  const residual = makeEstimate({
    value: value.value === sum ? 0 : value.value - sum,
    level,
    method: "identity residual",
    n: value.n,
    unit: "nats",
    notes: ["value - (-ln 4 + KL(p_data || m) + KL(p_g || m)); only rounding is expected"],
  });
  return { value, jsd, klRealMix: k1, klFakeMix: k2, residual };
}
