/**
 * The coverage study of the refit-bootstrap intervals (shared by bench/coverage_study.ts,
 * which runs it, and tests/divergence/coverage_cell_test.ts, which reproduces a small
 * cell): seeded trials with known truth, one refit bootstrap per trial, and whether each
 * interval method's interval covers the true JSD.
 *
 * Truth: N(0, 1) against N(1, 1) in 1-D; in 2-D, four modes at (±1.5, ±1.5) with
 * covariance 0.5 I and equal weights against the same modes with covariance 0.6 I and
 * weights 0.4, 0.3, 0.2, 0.1. Mixture fits: 1 component in 1-D, 4 in 2-D, one EM start
 * (seed 1) per fit. The true JSD of each pair is computed by grid quadrature of
 * the analytic densities (error bar below 1e-9).
 *
 * @module
 */
import { gaussian } from "../lib/density/gaussian.ts";
import { gaussianMixture } from "../lib/density/gaussian_mixture.ts";
import { fitGaussianMixture } from "../lib/density/gaussian_mixture_fit.ts";
import type { Density } from "../lib/density/types.ts";
import { refitBootstrap } from "../lib/divergence/refit_bootstrap.ts";
import { integrateGrid } from "../lib/divergence/integration.ts";
import { DECOMPOSITION_WEIGHTS as W } from "../lib/divergence/refit_quantities.ts";
import {
  bootstrapInterval,
  type BootstrapIntervalMethod,
} from "../lib/estimate/bootstrap_interval.ts";
import type { Samples } from "../lib/samples/samples.ts";

/** One cell of the study. */
export interface CoverageCell {
  readonly d: 1 | 2;
  readonly fit: "kde" | "mixture";
  readonly n: number;
  /** Refit replicates per trial. */
  readonly replicates: number;
}

/** One trial's outcome. */
export interface CoverageTrial {
  readonly trial: number;
  readonly value: number;
  readonly se: number;
  readonly intervals: Readonly<Record<string, readonly [number, number]>>;
  readonly covered: Readonly<Record<string, boolean>>;
}

/** Cell name, e.g. "2d-kde-n500-B100". */
export function cellName(c: CoverageCell): string {
  return `${c.d}d-${c.fit}-n${c.n}-B${c.replicates}`;
}

/** The pair of true densities of a dimension. */
export function truePair(d: 1 | 2): [Density, Density] {
  if (d === 1) return [gaussian(0, 1), gaussian(1, 1)];
  const means = [[-1.5, -1.5], [-1.5, 1.5], [1.5, -1.5], [1.5, 1.5]];
  const cov = (v: number) => Array(4).fill([v, 0, 0, v]);
  return [
    gaussianMixture({ weights: [1, 1, 1, 1], means, covariances: cov(0.5) }),
    gaussianMixture({ weights: [0.4, 0.3, 0.2, 0.1], means, covariances: cov(0.6) }),
  ];
}

const TRUTH = new Map<number, number>();

/** The true JSD (nats) of a dimension's pair, by fine grid quadrature of the densities. */
export function trueJsd(d: 1 | 2): number {
  let v = TRUTH.get(d);
  if (v === undefined) {
    const [p, q] = truePair(d);
    const g = integrateGrid(p, q, [W.klRealMix, W.klFakeMix], {
      gridSize: d === 1 ? 4000 : 400,
      bounds: d === 1 ? [[-9, 10]] : [[-6, 6], [-6, 6]],
    });
    v = 0.5 * (g.values[0] + g.values[1]);
    TRUTH.set(d, v);
  }
  return v;
}

/** Interval methods scored in every trial ("bca" only where its jackknife is cheap: KDE). */
export function methodsOf(c: CoverageCell): BootstrapIntervalMethod[] {
  return c.fit === "kde" ? ["percentile", "basic", "bc", "bca"] : ["percentile", "basic", "bc"];
}

/**
 * Trial `t` of a cell: data drawn with seeds `coverage/<cell>/<t>/real|fake`, one refit
 * bootstrap of the JSD (seed `coverage/<cell>/<t>`), every interval method applied to the
 * same replicates at level 0.95.
 */
export function coverageTrial(c: CoverageCell, t: number): CoverageTrial {
  const [p, q] = truePair(c.d);
  const tag = `coverage/${c.d}d-${c.fit}-n${c.n}/${t}`;
  const real: Samples = p.sample(c.n, `${tag}/real`);
  const fake: Samples = q.sample(c.n, `${tag}/fake`);
  const components = c.d === 1 ? 1 : 4;
  const fit = c.fit === "mixture"
    ? (s: Samples) => fitGaussianMixture(s, { components, seed: 1, restarts: 1 })
    : undefined;
  const methods = methodsOf(c);
  const r = refitBootstrap(real, fake, {
    quantities: ["jsd"],
    replicates: c.replicates,
    seed: tag,
    interval: methods.includes("bca") ? "bca" : "percentile",
    ...(fit ? { fit } : {}),
  });
  const e = r.estimates.jsd;
  const truth = trueJsd(c.d);
  const intervals: Record<string, readonly [number, number]> = {};
  const covered: Record<string, boolean> = {};
  for (const m of methods) {
    const ci = m === "bca" ? e.ci! : bootstrapInterval(e.replicates, { value: e.value, method: m });
    intervals[m] = ci;
    covered[m] = ci[0] <= truth && truth <= ci[1];
  }
  return { trial: t, value: e.value, se: e.se ?? NaN, intervals, covered };
}
