/**
 * The decomposition of the value at the optimum from two sample sets, with intervals that
 * include the sampling error of the data: fit, decompose, and bootstrap the whole pipeline.
 *
 * @module
 */
import {
  fitBoth,
  integrationText,
  prepareRefit,
  refitEstimate,
  refitIntegration,
  refitNotes,
  runReplicates,
  sameIntegration,
} from "../divergence/refit_bootstrap.ts";
import type { RefitOptions } from "../divergence/divergence_from_samples.ts";
import type { BootstrapEstimate } from "../estimate/bootstrap.ts";
import { withDisplay } from "../display/display.ts";
import type { Estimate } from "../estimate/estimate.ts";
import { escapeHtml, htmlTable, type TableCell, textTable } from "../display/table.ts";
import type { Samples, SamplesInput } from "../samples/samples.ts";
import {
  type DecompositionOptions,
  type OptimumDecomposition,
  optimumDecomposition,
} from "./optimum_decomposition.ts";

/**
 * Options of {@linkcode decompositionFromSamples}: the integration options of
 * {@linkcode optimumDecomposition} (method, n, gridSize, bounds, margin, base) plus the
 * refit bootstrap (fit, replicates, seed, level). Defaults differ from
 * optimumDecomposition's to keep replicates cheap: grid with 500 cells (1-D) or 48 x 48
 * (2-D), Monte Carlo with 2000 draws a density for d > 2.
 */
export interface SampleDecompositionOptions
  extends Omit<DecompositionOptions, "replicates">, RefitOptions {}

/** The terms that are bootstrapped, in the order of the replicate columns. */
export type SampleDecompositionTerm = "value" | "jsd" | "klRealMix" | "klFakeMix" | "residual";

const TERMS: readonly SampleDecompositionTerm[] = [
  "value",
  "jsd",
  "klRealMix",
  "klFakeMix",
  "residual",
];

/**
 * The replicates a sample decomposition carries beside its JSON fields (non-enumerable).
 * Declared as an accessor so that a spread copy, which loses them, loses them in its type
 * too.
 */
declare class DecompositionReplicates {
  /**
   * Every replicate's terms in draw order, NaN where the replicate failed (non-enumerable,
   * for plotting one term against another). Each term's finite replicates are also its
   * estimate's `replicates`.
   */
  get replicates(): Readonly<Record<SampleDecompositionTerm, Float64Array>>;
}
// Type-only: the class exists for the types alone (no runtime value to import).
export type { DecompositionReplicates };

/**
 * The decomposition at the optimum from samples: each term is the plug-in value between
 * the two fits with the se and percentile interval of the refit bootstrap.
 */
export interface SampleDecomposition extends DecompositionReplicates {
  /** `V(D*, G)`. */
  readonly value: BootstrapEstimate;
  /** `JSD(p_data, p_g)`. */
  readonly jsd: BootstrapEstimate;
  /** `KL(p_data || m)`, m = (p_data + p_g)/2. */
  readonly klRealMix: BootstrapEstimate;
  /** `KL(p_g || m)`. */
  readonly klFakeMix: BootstrapEstimate;
  /** `-ln 4` (exact, -2 in bits): the same in every replicate. */
  readonly constant: Estimate;
  /** `value - (constant + klRealMix + klFakeMix)`: rounding, or Monte Carlo noise. */
  readonly residual: BootstrapEstimate;
  /** Integration method of the plug-in and of every replicate. */
  readonly method: "grid" | "monte-carlo";
  /** The plug-in decomposition of the two fits, with its numerical error bars only. */
  readonly plugIn: OptimumDecomposition;
  /** Replicates whose fit or recomputation failed (left out). */
  readonly failed: number;
  /** What was done, failures, the numerical share and the bias caveat. */
  readonly notes: readonly string[];
}

/**
 * The value at the optimum and its split `V(D*, G) = -ln 4 + KL(p_data || m) + KL(p_g ||
 * m) = -ln 4 + 2 JSD` (Goodfellow et al. 2014, Thm. 1) from two sample sets, with error
 * bars that include the sampling error of the data.
 *
 * A density is fitted to each side with `fit` (default: Gaussian KDE, Scott's rule) and
 * {@linkcode optimumDecomposition} run on the fits (the plug-in values, kept in `plugIn`
 * with their numerical error bars). Then, `replicates` times (default 200), each sample set
 * is resampled with replacement on its own, both densities are refitted and the
 * decomposition recomputed with fresh integration draws; each term's se is the standard
 * deviation of its replicates and its interval their percentiles (method
 * "bootstrap-percentile (refit)"). Replicate b depends only on the seed and b, so the same
 * seed gives the same bits. Failed replicates (a SaddleError from the fitter or the
 * integration) are left out and counted.
 *
 * Plug-in divergences between fitted densities are biased upward on small samples: two
 * fits to samples of the same distribution still differ, so JSD comes out positive and
 * V(D*, G) above -ln 4 on average. The interval does not remove that bias and need not
 * contain the true value 0 when p_g = p_data; each term's notes give the bootstrap bias
 * estimate (mean of replicates - plug-in) and the share of the variance that is numerical.
 * The result goes straight into `plotDecomposition`; its terms into `plotBootstrap`.
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Thm. 1, for
 * the decomposition; Efron 1979 (Ann. Stat.) and Efron & Tibshirani 1993, An Introduction
 * to the Bootstrap (ch. 6, 10, 13), for the bootstrap, its bias estimate and percentile
 * intervals.
 *
 * @example Two Gaussian samples one standard deviation apart
 * ```ts
 * import { decompositionFromSamples } from "./sample_decomposition.ts";
 * import { gaussian } from "../density/gaussian.ts";
 * import assert from "node:assert/strict";
 * const real = gaussian(0, 1).sample(200, 1), fake = gaussian(1, 1).sample(200, 2);
 * const dec = decompositionFromSamples(real, fake, { replicates: 30, seed: 5 });
 * assert.ok(Math.abs(dec.value.value - (-Math.log(4) + 2 * dec.jsd.value)) < 1e-9);
 * assert.equal(dec.jsd.method, "bootstrap-percentile (refit)");
 * assert.equal(dec.jsd.replicates.length, 30);
 * // The interval is far wider than the quadrature error of the plug-in alone.
 * assert.ok(dec.jsd.se! > 10 * dec.plugIn.jsd.se!);
 * ```
 */
export function decompositionFromSamples(
  real: Samples | SamplesInput,
  fake: Samples | SamplesInput,
  options: SampleDecompositionOptions = {},
): SampleDecomposition {
  const setup = prepareRefit(real, fake, options);
  const { fit: _fit, replicates: _b, ...rest } = options;
  const integ = refitIntegration(setup.real.d, { ...rest, seed: setup.seed, level: setup.level });
  const [p, q] = fitBoth(setup, setup.real, setup.fake);
  // The plug-in is computed once, at optimumDecomposition's own defaults (a finer grid, or
  // more draws) unless the options fix them, so its numerical se is the one it reports on
  // its own; the replicates' coarser integration gives the numerical share of the variance.
  const plugIn = optimumDecomposition(p, q, { ...rest, seed: setup.seed, level: setup.level });
  const coarse = sameIntegration(rest) ? plugIn : optimumDecomposition(p, q, integ);
  const run = runReplicates(setup, TERMS.length, (pb, qb, r) => {
    // The inner bootstrap of the Monte Carlo value's interval is not needed: 2 replicates.
    const d = optimumDecomposition(pb, qb, { ...integ, seed: r, replicates: 2 });
    return TERMS.map((t) => d[t].value);
  });
  const est = (t: SampleDecompositionTerm, k: number) =>
    refitEstimate(setup, run.columns[k], {
      what: t,
      plugIn: plugIn[t],
      replicateError: coarse[t],
      failed: run.failed,
      bias: t !== "residual",
      ...(plugIn[t].unit ? { unit: plugIn[t].unit } : {}),
    });
  const replicates = Object.fromEntries(TERMS.map((t, k) => [t, run.columns[k]])) as Record<
    SampleDecompositionTerm,
    Float64Array
  >;
  const notes = [
    ...refitNotes(setup, run, "the decomposition", integrationText(integ)),
    ...plugIn.notes.map((n) => `plug-in: ${n}`),
  ];
  const out: SampleDecomposition = {
    value: est("value", 0),
    jsd: est("jsd", 1),
    klRealMix: est("klRealMix", 2),
    klFakeMix: est("klFakeMix", 3),
    constant: plugIn.constant,
    residual: est("residual", 4),
    method: plugIn.method,
    plugIn,
    failed: run.failed,
    replicates,
    notes,
  };
  Object.defineProperty(out, "replicates", { value: replicates, enumerable: false });
  return Object.freeze(withDisplay(out, (d) => bundle(d, setup.fitName)));
}

/** Mean of the finite replicates minus the plug-in value. */
function biasOf(e: BootstrapEstimate): number {
  const r = e.replicates;
  if (r.length === 0 || !Number.isFinite(e.value)) return NaN;
  let m = 0;
  for (let i = 0; i < r.length; i++) m += (r[i] - m) / (i + 1);
  return m - e.value;
}

function bundle(d: SampleDecomposition, fitName: string): Record<string, string> {
  const pct = `${Math.round(d.value.level * 1000) / 10}%`;
  const row = (
    name: string,
    e: BootstrapEstimate,
    num: Estimate,
    note: string,
  ): TableCell[] => [name, e, num.se ?? null, biasOf(e), note];
  const rows: TableCell[][] = [
    row("V(D*, G)", d.value, d.plugIn.value, "value at the optimal discriminator"),
    ["-ln 4", d.constant, null, null, "value when p_g = p_data (exact)"],
    row("KL(p_data ‖ m)", d.klRealMix, d.plugIn.klRealMix, "m = (p_data + p_g) / 2"),
    row("KL(p_g ‖ m)", d.klFakeMix, d.plugIn.klFakeMix, ""),
    row("JSD(p_data, p_g)", d.jsd, d.plugIn.jsd, "in [0, ln 2]; biased upward"),
    row("residual", d.residual, d.plugIn.residual, "V - (-ln 4 + KL + KL)"),
  ];
  const header = [
    "term",
    `plug-in ± bootstrap se [${pct} interval]`,
    "numerical se",
    "bias estimate",
    "note",
  ];
  const B = d.replicates.value.length;
  const caption = `Decomposition at the optimum from samples (refit bootstrap, B = ${B}` +
    `${d.failed ? `, ${d.failed} failed` : ""}; ${fitName}; ${d.method}; ` +
    `${d.value.unit ?? "nats"})`;
  return {
    "text/plain": `${caption}\n${textTable(header, rows)}\n${d.notes.join("\n")}`,
    "text/html": htmlTable(header, rows, caption) +
      `<ul style="font-size:smaller">${
        d.notes.map((n) => `<li>${escapeHtml(n)}</li>`).join("")
      }</ul>`,
  };
}
