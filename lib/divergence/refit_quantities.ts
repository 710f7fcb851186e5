/**
 * The quantities a refit bootstrap can compute from two fitted densities: the terms of the
 * decomposition at the optimum and every f-divergence, each an expectation under the
 * mixture m = (p + q) / 2 of a function of the log-ratio r = log p - log q.
 *
 * @module
 */
import { logSigmoid, sigmoid } from "../math/log_space.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import {
  type FDivergenceName,
  type FDivergenceSpec,
  fDivergenceSpec,
  mixtureWeightOf,
} from "./f_divergence_table.ts";
import type { MixtureWeight } from "./integration.ts";

/** The terms of the decomposition at the optimum, in their canonical order. */
export type DecompositionTerm = "value" | "jsd" | "klRealMix" | "klFakeMix" | "residual";

/** The decomposition terms, in the order `decompositionFromSamples` reports them. */
export const DECOMPOSITION_TERMS: readonly DecompositionTerm[] = Object.freeze([
  "value",
  "jsd",
  "klRealMix",
  "klFakeMix",
  "residual",
]);

/**
 * A quantity of the refit bootstrap: a decomposition term, an f-divergence, or "gap" (the
 * value gap `V(D*, G) - V(D, G)` of a trained discriminator, given its outputs).
 */
export type RefitQuantity = DecompositionTerm | "gap" | FDivergenceName | FDivergenceSpec;

/** `σ(r) ln σ(r)`, 0 at r = -Infinity (where σ → 0 faster than ln σ → -∞). */
function xLogSigmoid(r: number): number {
  return r === -Infinity ? 0 : sigmoid(r) * logSigmoid(r);
}

/**
 * Integrands of the decomposition per unit of the mixture m, as functions of
 * r = ln p_data - ln p_g: `V(D*, G)` (p ln D* / m + q ln(1 - D*) / m), `KL(p_data || m)`
 * (p ln(p/m) / m) and `KL(p_g || m)` (q ln(q/m) / m). All three are bounded (|w| <= 2 ln 2),
 * defined at r = ±Infinity (disjoint supports).
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Thm. 1.
 *
 * @example At r = 0 (p = q): V integrand -ln 4, both KL integrands 0
 * ```ts
 * import { DECOMPOSITION_WEIGHTS } from "./refit_quantities.ts";
 * import assert from "node:assert/strict";
 * assert.ok(Math.abs(DECOMPOSITION_WEIGHTS.value(0) + Math.log(4)) < 1e-15);
 * assert.ok(Math.abs(DECOMPOSITION_WEIGHTS.klRealMix(0)) < 1e-15);
 * assert.equal(DECOMPOSITION_WEIGHTS.klRealMix(Infinity), 2 * Math.LN2);
 * ```
 */
export const DECOMPOSITION_WEIGHTS: Readonly<{
  value: MixtureWeight;
  klRealMix: MixtureWeight;
  klFakeMix: MixtureWeight;
}> = Object.freeze({
  value: (r: number) => 2 * (xLogSigmoid(r) + xLogSigmoid(-r)),
  klRealMix: (r: number) => 2 * (sigmoid(r) * Math.LN2 + xLogSigmoid(r)),
  klFakeMix: (r: number) => 2 * (sigmoid(-r) * Math.LN2 + xLogSigmoid(-r)),
});

/** A requested quantity, resolved. */
export interface ResolvedQuantity {
  /** Key of the quantity in results: the term name or the divergence's `name`. */
  readonly key: string;
  /** Human-readable label. */
  readonly label: string;
  /** The f-divergence row, for divergences. */
  readonly spec?: FDivergenceSpec;
  /** Whether the integrand is bounded (binned evaluation applies). */
  readonly bounded: boolean;
}

const TERM_LABELS: Record<DecompositionTerm, string> = {
  value: "V(D*, G)",
  jsd: "JSD(p_data, p_g)",
  klRealMix: "KL(p_data || m)",
  klFakeMix: "KL(p_g || m)",
  residual: "residual V - (-ln 4 + KL + KL)",
};

/**
 * Resolve quantity names (decomposition terms, f-divergence names or rows) into keys,
 * labels and whether their integrand is bounded; "alpha" takes `alpha`. Duplicates and
 * unknown names throw.
 *
 * @example
 * ```ts
 * import { resolveQuantities } from "./refit_quantities.ts";
 * import assert from "node:assert/strict";
 * const q = resolveQuantities(["jsd", "kl", "jensen-shannon"]);
 * assert.deepEqual(q.map((x) => x.key), ["jsd", "kl", "jensen-shannon"]);
 * assert.deepEqual(q.map((x) => x.bounded), [true, false, true]);
 * ```
 */
export function resolveQuantities(
  names: readonly RefitQuantity[],
  options: { alpha?: number } = {},
): ResolvedQuantity[] {
  if (!Array.isArray(names) || names.length === 0) {
    throw new SaddleError("invalid-argument", "quantities must be a non-empty array of names", {
      parameter: "quantities",
    });
  }
  const out: ResolvedQuantity[] = [];
  for (const n of names) {
    let q: ResolvedQuantity;
    if (typeof n === "string" && (DECOMPOSITION_TERMS as readonly string[]).includes(n)) {
      q = { key: n, label: TERM_LABELS[n as DecompositionTerm], bounded: true };
    } else if (n === "gap") {
      q = { key: n, label: "value gap V(D*, G) - V(D, G)", bounded: true };
    } else {
      let spec: FDivergenceSpec;
      try {
        spec = fDivergenceSpec(n as FDivergenceName | FDivergenceSpec, options);
      } catch (e) {
        throw new SaddleError(
          "invalid-argument",
          `unknown quantity ${JSON.stringify(n)}: use a decomposition term (${
            DECOMPOSITION_TERMS.join(", ")
          }), "gap" or an f-divergence name`,
          { parameter: "quantities" },
          { cause: e },
        );
      }
      const bounded = Number.isFinite(spec.fAtZero) && Number.isFinite(spec.slopeAtInfinity);
      q = { key: spec.name, label: spec.label, spec, bounded };
    }
    if (out.some((o) => o.key === q.key)) {
      throw new SaddleError("invalid-argument", `quantity ${q.key} is requested twice`, {
        parameter: "quantities",
      });
    }
    out.push(q);
  }
  return out;
}

/** The integrand of a resolved f-divergence (a bounded one enters the binned sums). */
export function weightOf(q: ResolvedQuantity): MixtureWeight {
  if (!q.spec) throw new SaddleError("invalid-argument", `${q.key} is not an f-divergence`);
  return mixtureWeightOf(q.spec);
}
