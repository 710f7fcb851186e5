/**
 * f-divergences between two sample sets with intervals that include the sampling error of
 * the data: fit a density to each side, compute the plug-in divergence, and bootstrap the
 * whole pipeline (resample, refit, recompute).
 *
 * @module
 */
import type { BootstrapEstimate } from "../estimate/bootstrap.ts";
import type { Estimate } from "../estimate/estimate.ts";
import { withHidden } from "../estimate/hidden.ts";
import { escapeHtml, htmlTable, textTable } from "../display/table.ts";
import type { Samples, SamplesInput } from "../samples/samples.ts";
import {
  refitBootstrap,
  type RefitBootstrapOptions,
  type RefitOptions,
} from "./refit_bootstrap.ts";
import { makeEstimate } from "../estimate/estimate.ts";

export type { RefitOptions };
import type { FDivergenceOptions } from "./f_divergence.ts";
import {
  type FDivergenceName,
  type FDivergenceSpec,
  fDivergenceSpec,
} from "./f_divergence_table.ts";

/**
 * Options of {@linkcode divergenceFromSamples}: the integration options of
 * {@linkcode fDivergence} plus the refit bootstrap. Defaults differ from fDivergence's to
 * keep replicates cheap: grid with 500 cells (1-D) or 48 x 48 (2-D), Monte Carlo with 2000
 * draws a density for d > 2.
 */
export interface SampleDivergenceOptions
  extends
    FDivergenceOptions,
    RefitOptions,
    Pick<RefitBootstrapOptions, "interval" | "onProgress" | "workers"> {}

/**
 * A divergence from samples: the plug-in value between the two fits, with the standard
 * error and percentile interval of the refit bootstrap.
 */
export interface SampleDivergence extends BootstrapEstimate, RefitDetail {}

/**
 * The detail a sample divergence carries beside its JSON fields (non-enumerable). Declared
 * as accessors so that a spread copy, which loses them, loses them in its type too.
 */
declare class RefitDetail {
  /** The plug-in divergence between the fits, with its numerical error bar only (hidden). */
  get plugIn(): Estimate;
  /** Replicates whose fit or recomputation failed (hidden). */
  get failed(): number;
}
// Type-only: the class exists for the types alone (no runtime value to import).
export type { RefitDetail };

/**
 * The f-divergence `D_f(P || Q)` between the distributions behind two sample sets, with an
 * interval that includes the sampling error of the data, not only the numerical error.
 *
 * A density is fitted to each side with `fit` (default: Gaussian KDE, Scott's rule) and the
 * divergence between the fits computed (the plug-in value). Then, `replicates` times, each
 * sample set is resampled with replacement on its own, both densities are refitted and the
 * divergence recomputed; the standard deviation of the replicates is the se and the
 * interval comes from them by `interval`. This is a view of {@linkcode refitBootstrap}
 * with one quantity (same seed, same numbers): to get several divergences from one set of
 * fits, call that instead. With the default KDE in 1-D or 2-D, the divergences with a
 * bounded integrand (JS, total variation, squared Hellinger, GAN) take the binned route (a
 * replicate is a reweighted binning); the others are refitted point by point and
 * integrated with {@linkcode fDivergence}'s machinery. The notes say how much of the
 * variance is numerical, how many replicates failed, and give the bootstrap bias estimate
 * with its direction as measured on these data. The replicates (finite ones, in draw
 * order) are the non-enumerable `replicates`, so `plotBootstrap` accepts the result. Any
 * name of {@linkcode F_DIVERGENCES} or "alpha" (with `alpha`) works; `base: 2` gives bits.
 *
 * References: Efron 1979, Bootstrap methods: another look at the jackknife (Ann. Stat.);
 * Efron & Tibshirani 1993, An Introduction to the Bootstrap (ch. 6, 10, 13); Nowozin,
 * Cseke & Tomioka 2016, f-GAN (NeurIPS) for the divergence table.
 *
 * @example KL between two Gaussian samples (closed form 0.5 nats)
 * ```ts
 * import { divergenceFromSamples } from "./divergence_from_samples.ts";
 * import { gaussian } from "../density/gaussian.ts";
 * import assert from "node:assert/strict";
 * const real = gaussian(0, 1).sample(200, 1), fake = gaussian(1, 1).sample(200, 2);
 * const kl = divergenceFromSamples(real, fake, "kl", { replicates: 40, seed: 3 });
 * assert.equal(kl.method, "bootstrap-percentile (refit)");
 * assert.equal(kl.replicates.length, 40);
 * assert.ok(kl.ci![0] < kl.value && kl.value < kl.ci![1]);
 * // The sampling error of 2 x 200 points dwarfs the quadrature error of the plug-in.
 * assert.ok(kl.se! > 10 * kl.plugIn.se!);
 * ```
 */
export function divergenceFromSamples(
  real: Samples | SamplesInput,
  fake: Samples | SamplesInput,
  name: FDivergenceName | FDivergenceSpec,
  options: SampleDivergenceOptions = {},
): SampleDivergence {
  const spec = fDivergenceSpec(name, options);
  const all = refitBootstrap(real, fake, { ...options, quantities: [spec] });
  const est = all.estimates[spec.name];
  const plugIn = all.plugIn[spec.name];
  const notes = [spec.label, ...est.notes, ...all.notes];
  for (const n of plugIn.notes) if (!notes.includes(n)) notes.push(`plug-in: ${n}`);
  const withNotes = makeEstimate({ ...est, notes });
  const out = withHidden(
    withNotes,
    { plugIn, failed: all.failed, replicates: est.replicates },
    () => divergenceBundle(out, spec.label),
  ) as SampleDivergence;
  return out;
}

function divergenceBundle(e: SampleDivergence, label: string): Record<string, string> {
  const pct = `${Math.round(e.level * 1000) / 10}%`;
  const header = ["estimate", `value ± se [${pct} interval]`, "error included"];
  const rows: [string, Estimate, string][] = [
    [label, e, "sampling error of the data + numerical (refit bootstrap)"],
    ["plug-in, fits as given", e.plugIn, `numerical only (${e.plugIn.method})`],
  ];
  const caption = `${label} from samples (${e.replicates.length} finite refit replicates, ` +
    `${e.unit ?? "nats"})`;
  return {
    "text/plain": `${caption}\n${textTable(header, rows)}\n${e.notes.join("\n")}`,
    "text/html": htmlTable(header, rows, caption) +
      `<ul style="font-size:smaller">${
        e.notes.map((n) => `<li>${escapeHtml(n)}</li>`).join("")
      }</ul>`,
  };
}
