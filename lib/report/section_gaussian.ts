/**
 * Gaussian fits of both sides compared in closed form (KL both ways, Fréchet distance,
 * Bhattacharyya distance), with bootstrap intervals over the rows of both sides.
 *
 * @module
 */
import { percentileInterval } from "../estimate/mod.ts";
import { makeEstimate, meanVariance } from "../estimate/mod.ts";
import type { Estimate } from "../estimate/mod.ts";
import { htmlTable } from "../display/mod.ts";
import {
  gaussianBhattacharyya,
  gaussianFrechet,
  gaussianKl,
  type GaussianMoments,
} from "../divergence/mod.ts";
import { columnMeans, covariance } from "../linalg/mod.ts";
import { rng } from "../random/mod.ts";
import type { Samples } from "../samples/mod.ts";
import { takeRows } from "../samples/mod.ts";
import { SaddleError } from "../errors/mod.ts";
import { formatShort } from "./estimate_json.ts";
import type { ReportSection } from "./types.ts";

const QUANTITIES = {
  kl: { label: "KL(N_real ‖ N_gen)", unit: "nats", f: (a, b) => gaussianKl(a, b) },
  reverseKl: { label: "KL(N_gen ‖ N_real)", unit: "nats", f: (a, b) => gaussianKl(b, a) },
  frechet: {
    label: "Fréchet distance² ‖μ_r − μ_g‖² + tr(Σ_r + Σ_g − 2(Σ_r Σ_g)^½)",
    unit: "none",
    f: (a, b) => gaussianFrechet(a, b),
  },
  bhattacharyya: {
    label: "Bhattacharyya distance",
    unit: "none",
    f: (a, b) => gaussianBhattacharyya(a, b),
  },
} as const satisfies Record<
  string,
  {
    label: string;
    unit: Estimate["unit"];
    f: (a: GaussianMoments, b: GaussianMoments) => number;
  }
>;
type Quantity = keyof typeof QUANTITIES;
const NAMES = Object.keys(QUANTITIES) as Quantity[];

function moments(s: Samples): GaussianMoments {
  return { mean: columnMeans(s.data, s.n, s.d), cov: covariance(s.data, s.n, s.d) };
}

function all(a: Samples, b: Samples): Float64Array | undefined {
  try {
    const ma = moments(a), mb = moments(b);
    return Float64Array.from(NAMES.map((k) => QUANTITIES[k].f(ma, mb)));
  } catch (e) {
    if (e instanceof SaddleError) return undefined; // a singular resample
    throw e;
  }
}

/**
 * The Gaussian section: each side summarised by its mean and covariance, the two Gaussians
 * compared in closed form; intervals from resampling the rows of each side (percentile
 * bootstrap). The Fréchet distance between Gaussian fits is the statistic of the Fréchet
 * Inception Distance when the columns are features.
 *
 * References: Kullback 1959 (KL); Dowson & Landau 1982 and Heusel et al. 2017 (Fréchet
 * distance); Bhattacharyya 1943; Efron & Tibshirani 1993 (bootstrap).
 *
 * @example
 * ```ts
 * import { gaussianSection } from "./section_gaussian.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(gaussianSection.keys({} as never), ["estimates.gaussian.kl",
 *   "estimates.gaussian.reverseKl", "estimates.gaussian.frechet", "estimates.gaussian.bhattacharyya"]);
 * ```
 */
export const gaussianSection: ReportSection = {
  id: "gaussian",
  title: "Gaussian fits compared in closed form",
  applies(ctx) {
    const { d, n } = ctx.plan;
    if (d > ctx.plan.gaussianMaxD) {
      return `d = ${d} > ${ctx.plan.gaussianMaxD}: covariance fits are slow and noisy here`;
    }
    if (Math.min(n.real, n.fake) <= d + 1) {
      return `a side has ${Math.min(n.real, n.fake)} rows, not more than d + 1 = ${d + 1}: ` +
        "its covariance is singular";
    }
    return true;
  },
  keys() {
    return NAMES.map((k) => `estimates.gaussian.${k}`);
  },
  run(ctx, out) {
    const { plan } = ctx;
    const real = ctx.inputs.real.samples, fake = ctx.inputs.fake.samples;
    const seed = `${plan.seed}:gaussian`;
    const plug = all(real, fake);
    if (!plug) {
      throw new SaddleError(
        "singular",
        "a covariance of the data is singular (a constant or duplicated column); drop it with --columns",
        { parameter: "--columns" },
      );
    }
    const B = plan.sampleReplicates;
    const r = rng(seed);
    const reps = NAMES.map(() => new Float64Array(B));
    let kept = 0;
    const ir = new Uint32Array(real.n), jf = new Uint32Array(fake.n);
    for (let b = 0; b < B; b++) {
      if (b % 20 === 0) ctx.onProgress("gaussian fits: bootstrap", b / B);
      r.bootstrapIndices(real.n, real.n, ir);
      r.bootstrapIndices(fake.n, fake.n, jf);
      const v = all(takeRows(real, ir), takeRows(fake, jf));
      if (!v) continue;
      NAMES.forEach((_, k) => (reps[k][kept] = v[k]));
      kept++;
    }
    const estimates: Record<string, Estimate> = {};
    NAMES.forEach((k, i) => {
      const x = reps[i].subarray(0, kept);
      const q = QUANTITIES[k];
      estimates[k] = makeEstimate({
        value: plug[i],
        se: Math.sqrt(meanVariance(x).variance),
        ci: percentileInterval(x, plan.level),
        level: plan.level,
        method: "bootstrap-percentile",
        n: real.n + fake.n,
        unit: q.unit,
        notes: [
          `closed form between the Gaussian fits; ${kept} of ${B} bootstrap replicates`,
        ],
      });
    });
    out.estimates.gaussian = estimates;
    out.methods.gaussian = {
      fit: "sample mean and unbiased covariance of each side",
      replicates: B,
      kept,
      seed,
      interval: "percentile bootstrap over the rows of each side",
    };
    out.html.push(htmlTable(
      ["quantity", "estimate"],
      NAMES.map((k) => [QUANTITIES[k].label, estimates[k]]),
      "Gaussian fits N(mean, covariance) of each side, compared in closed form",
    ));
    out.headlines.push(
      `Gaussian fits: KL(N_real ‖ N_gen) ${formatShort(estimates.kl)} nats, Fréchet ` +
        `distance² ${formatShort(estimates.frechet)}.`,
    );
    out.notes.push(
      "The Gaussian closed forms compare the means and covariances only: two different " +
        "distributions with equal moments give 0.",
    );
  },
};
