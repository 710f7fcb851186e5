/**
 * Choice of the number of mixture components by an information criterion.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { withDisplay } from "../display/display.ts";
import { escapeHtml, htmlTable, textTable } from "../display/table.ts";
import { samples, type SamplesInput } from "../samples/samples.ts";
import {
  fitGaussianMixture,
  type GaussianMixtureFit,
  type GaussianMixtureFitOptions,
  mixtureParameterCount,
} from "./gaussian_mixture_fit.ts";

/** Options of {@linkcode selectGaussianMixture}: a range of counts plus the fit options. */
export interface GaussianMixtureSelectOptions
  extends Omit<GaussianMixtureFitOptions, "components" | "init"> {
  /** Inclusive range `[from, to]` of component counts (default [1, 6]). */
  components?: readonly [number, number];
  /** Criterion to minimise (default "bic"). */
  criterion?: "bic" | "aic";
}

/** One row of the selection table. */
export interface GaussianMixtureSelectRow {
  /** Number of components. */
  readonly components: number;
  /** Mean log-likelihood per sample (nats). */
  readonly logLikelihood: number;
  /** Free parameters. */
  readonly nParameters: number;
  /** BIC (Schwarz 1978). */
  readonly bic: number;
  /** AIC (Akaike 1974). */
  readonly aic: number;
  /** EM iterations. */
  readonly iterations: number;
  /** Whether EM converged with no degenerate component. */
  readonly converged: boolean;
  /** Components that collapsed (see {@linkcode GaussianMixtureFit.degenerate}). */
  readonly degenerate: readonly number[];
}

/** Result of {@linkcode selectGaussianMixture}: the table and the chosen fit. */
export interface GaussianMixtureSelection {
  /** The criterion minimised. */
  readonly criterion: "bic" | "aic";
  /** Components of the chosen model. */
  readonly components: number;
  /** The chosen fit. */
  readonly best: GaussianMixtureFit;
  /** Every count tried, in order. */
  readonly table: readonly GaussianMixtureSelectRow[];
  /** Counts whose fit failed (collapsed components), with the reason. */
  readonly failed: readonly { readonly components: number; readonly reason: string }[];
  /** Counts left out because the data cannot support them, and fits passed over. */
  readonly notes: readonly string[];
}

/**
 * Fit mixtures with `from..to` components (same seed and options for each) and choose the
 * count with the smallest BIC (default) or AIC. Counts whose fit collapses are listed in
 * `failed` rather than aborting the scan. Shows its table in a notebook.
 *
 * References: Schwarz 1978, Estimating the dimension of a model (BIC); Akaike 1974 (AIC).
 *
 * @example
 * ```ts
 * import { selectGaussianMixture } from "./gaussian_mixture_select.ts";
 * import { Rng } from "../random/rng.ts";
 * import assert from "node:assert/strict";
 * const r = new Rng(2);
 * const x = Array.from({ length: 600 }, (_, i) => r.normal([-6, 0, 6][i % 3], 1));
 * const sel = selectGaussianMixture(x, { components: [1, 4], seed: 3 });
 * assert.equal(sel.components, 3);
 * assert.equal(sel.table.length, 4);
 * ```
 */
export function selectGaussianMixture(
  input: SamplesInput,
  options: GaussianMixtureSelectOptions = {},
): GaussianMixtureSelection {
  const s = samples(input);
  const [from, to] = options.components ?? [1, 6];
  const criterion = options.criterion ?? "bic";
  if (!Number.isInteger(from) || !Number.isInteger(to) || from < 1 || to < from) {
    throw new SaddleError(
      "invalid-argument",
      `components must be an integer range [from, to] with 1 <= from <= to, got [${from}, ${to}]`,
      { parameter: "components" },
    );
  }
  if (criterion !== "bic" && criterion !== "aic") {
    throw new SaddleError(
      "invalid-argument",
      `criterion must be "bic" or "aic", got "${criterion}"`,
      {
        parameter: "criterion",
      },
    );
  }
  const table: GaussianMixtureSelectRow[] = [];
  const failed: { components: number; reason: string }[] = [];
  const notes: string[] = [];
  let best: GaussianMixtureFit | undefined, bestDegenerate: GaussianMixtureFit | undefined;
  // A model with at least as many free parameters as points cannot be estimated (its
  // likelihood is unbounded as components shrink onto points): such counts are not tried.
  const type = options.covariance ?? "full";
  let top = Math.min(to, s.n);
  while (top > from && mixtureParameterCount(top, s.d, type) >= s.n) top--;
  if (top < Math.min(to, s.n)) {
    notes.push(
      `${s.n} points support at most ${top} component${top > 1 ? "s" : ""} here (a ` +
        `${top + 1}-component ${type} mixture in d = ${s.d} has ` +
        `${mixtureParameterCount(top + 1, s.d, type)} free parameters, not fewer than the ` +
        `points): counts ${top + 1}..${to} were not tried`,
    );
  }
  for (let k = from; k <= top; k++) {
    let fit: GaussianMixtureFit;
    try {
      fit = fitGaussianMixture(s, { ...options, components: k });
    } catch (e) {
      if (e instanceof SaddleError && e.code === "numerical") {
        failed.push({ components: k, reason: e.message });
        continue;
      }
      throw e;
    }
    table.push({
      components: k,
      logLikelihood: fit.logLikelihood,
      nParameters: fit.nParameters,
      bic: fit.bic,
      aic: fit.aic,
      iterations: fit.iterations,
      converged: fit.converged,
      degenerate: fit.degenerate,
    });
    if (fit.degenerate.length > 0) {
      if (!bestDegenerate || fit[criterion] < bestDegenerate[criterion]) bestDegenerate = fit;
    } else if (!best || fit[criterion] < best[criterion]) best = fit;
  }
  const passed = table.filter((t) => t.degenerate.length > 0).map((t) => t.components);
  if (passed.length > 0 && best) {
    notes.push(
      `fits with ${passed.join(", ")} components have collapsed components and were not ` +
        "chosen",
    );
  } else if (!best && bestDegenerate) {
    best = bestDegenerate;
    notes.push(
      "every fit has a collapsed component: the least bad one is returned; the data are too " +
        "few (or too discrete) for a mixture",
    );
  }
  if (!best) {
    throw new SaddleError(
      "numerical",
      `every fit in [${from}, ${to}] failed: ${failed.map((f) => f.reason).join("; ")}`,
      { parameter: "components" },
    );
  }
  const result: GaussianMixtureSelection = {
    criterion,
    components: best.components.length,
    best,
    table,
    failed,
    notes,
  };
  return withDisplay(result, (r) => {
    const header = [
      "components",
      "log-lik / n",
      "parameters",
      "BIC",
      "AIC",
      "iterations",
      "converged",
      "collapsed",
      "",
    ];
    const rows = r.table.map((t) => [
      t.components,
      t.logLikelihood,
      t.nParameters,
      t.bic,
      t.aic,
      t.iterations,
      t.converged ? "yes" : "no",
      t.degenerate.length ? t.degenerate.join(", ") : "",
      t.components === r.components ? `← min ${r.criterion.toUpperCase()}` : "",
    ]);
    const caption =
      `Gaussian mixture selection by ${r.criterion.toUpperCase()}: ${r.components} components`;
    return {
      "text/plain": `${caption}\n${textTable(header, rows)}` +
        (r.notes.length ? `\n${r.notes.join("\n")}` : ""),
      "text/html": htmlTable(header, rows, caption) +
        r.notes.map((n) => `<p>${escapeHtml(n)}</p>`).join(""),
    };
  });
}
