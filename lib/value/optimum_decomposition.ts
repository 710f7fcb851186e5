/**
 * The value of the game at the optimal discriminator and its split
 * `V(D*, G) = -ln 4 + KL(p_data || m) + KL(p_g || m) = -ln 4 + 2 JSD(p_data, p_g)`.
 *
 * @module
 */
import type { Density } from "../density/types.ts";
import { logSigmoid } from "../math/log_space.ts";
import { DECOMPOSITION_WEIGHTS } from "../divergence/refit_quantities.ts";
import {
  combineMeans,
  drawBoth,
  gridEstimate,
  integrateGrid,
  type IntegrationOptions,
  logRatios,
  resolveMethod,
} from "../divergence/integration.ts";
import { clipToRange, logBase, rangeNote, scaleEstimate, unitOf } from "../estimate/units.ts";
import { withDisplay } from "../display/display.ts";
import { type Estimate, exact, makeEstimate } from "../estimate/estimate.ts";
import { htmlTable, textTable } from "../display/table.ts";
import { assertSameDimension } from "../samples/samples.ts";
import { valueFunction } from "./value_function.ts";

/** Options of {@linkcode optimumDecomposition}. */
export interface DecompositionOptions extends IntegrationOptions {
  /** Log base: 2 reports every term in bits (default e, nats). */
  base?: number;
  /** Bootstrap replicates of the Monte Carlo value's interval (default 1000). */
  replicates?: number;
}

/** The terms of the decomposition at the optimum, each an Estimate. */
export interface OptimumDecomposition {
  /** `V(D*, G) = E_data[ln D*] + E_g[ln(1 - D*)]`, computed on its own. */
  readonly value: Estimate;
  /** `JSD(p_data, p_g) = ½ KL(p_data || m) + ½ KL(p_g || m)`, in [0, ln 2]. */
  readonly jsd: Estimate;
  /** `KL(p_data || m)` with m = (p_data + p_g)/2. */
  readonly klRealMix: Estimate;
  /** `KL(p_g || m)`. */
  readonly klFakeMix: Estimate;
  /** `-ln 4` (exact; -2 in bits). */
  readonly constant: Estimate;
  /** `value - (constant + klRealMix + klFakeMix)`: zero up to rounding when all is well. */
  readonly residual: Estimate;
  /** "grid" or "monte-carlo". */
  readonly method: "grid" | "monte-carlo";
  /** Caveats gathered from the terms. */
  readonly notes: readonly string[];
}

const W_VALUE = DECOMPOSITION_WEIGHTS.value;
const W_KL_REAL = DECOMPOSITION_WEIGHTS.klRealMix;
const W_KL_FAKE = DECOMPOSITION_WEIGHTS.klFakeMix;

/**
 * The value of the game at the optimal discriminator split into its terms (Goodfellow et
 * al. 2014, Thm. 1): `V(D*, G) = -ln 4 + KL(p_data || m) + KL(p_g || m) = -ln 4 +
 * 2 JSD(p_data, p_g)`, m = (p_data + p_g)/2. Every term is an Estimate with an interval; the
 * value is computed on its own (from D* itself), so `residual` checks the identity.
 *
 * `method: "grid"` (default for d <= 2): midpoint quadrature over a range found from draws
 * of both densities, error bar from a grid twice as fine plus the mass outside the range.
 * `method: "monte-carlo"` (default for d > 2): `n` draws from each density, KL(p || m) =
 * E_p[ln(p/m)] with ln m = logaddexp(ln p, ln q) - ln 2, se from the per-draw terms; the
 * value comes from {@linkcode valueFunction} at D* (se and bootstrap interval). The two
 * methods agree within their error bars. JSD estimates outside [0, ln 2] (Lin 1991) by more
 * than their error are flagged. `base: 2` reports bits (the constant is then -2).
 *
 * References: Goodfellow et al. 2014, Generative Adversarial Nets (NeurIPS), Thm. 1; Lin
 * 1991 (IEEE T-IT); Arjovsky & Bottou 2017 (ICLR) for disjoint supports (JSD = ln 2).
 *
 * @example Two identical densities: V(D*, G) = -ln 4
 * ```ts
 * import { optimumDecomposition } from "./optimum_decomposition.ts";
 * import type { Density } from "../density/types.ts";
 * import { samples } from "../samples/samples.ts";
 * import assert from "node:assert/strict";
 * const unit: Density = {
 *   d: 1,
 *   logPdf: (x) => x.data.map((v) => (v >= 0 && v <= 1 ? 0 : -Infinity)),
 *   sample: (n) => samples(Array.from({ length: n }, (_, i) => (i + 0.5) / n)),
 *   describe: () => ({ kind: "uniform", d: 1, parameters: {}, notes: [] }),
 * };
 * const dec = optimumDecomposition(unit, unit, { method: "grid" });
 * assert.ok(Math.abs(dec.value.value + Math.log(4)) < 1e-12);
 * assert.ok(Math.abs(dec.jsd.value) < 1e-12);
 * ```
 */
export function optimumDecomposition(
  pData: Density,
  pModel: Density,
  options: DecompositionOptions = {},
): OptimumDecomposition {
  assertSameDimension(pData, pModel, "pData", "pModel");
  const method = resolveMethod(pData.d, options.method);
  const c = logBase(options.base);
  const unit = unitOf(options.base);
  const level = options.level ?? 0.95;
  let value: Estimate, klRealMix: Estimate, klFakeMix: Estimate, jsd: Estimate;
  const notes: string[] = [];
  if (method === "grid") {
    const g = integrateGrid(pData, pModel, [W_VALUE, W_KL_REAL, W_KL_FAKE], options);
    notes.push(...g.notes);
    const [v, k1, k2] = g.values;
    const [e0, e1, e2] = g.errors;
    const f = { level, unit: "nats" as const };
    value = gridEstimate(v, e0, g.cells, f);
    klRealMix = gridEstimate(k1, e1, g.cells, f);
    klFakeMix = gridEstimate(k2, e2, g.cells, f);
    jsd = gridEstimate(0.5 * (k1 + k2), 0.5 * (e1 + e2), g.cells, f);
  } else {
    const dr = drawBoth(pData, pModel, options);
    const rP = logRatios(dr.lpAtP, dr.lqAtP), rQ = logRatios(dr.lpAtQ, dr.lqAtQ);
    const tReal = rP.map((r) => Math.LN2 + logSigmoid(r));
    const tFake = rQ.map((r) => Math.LN2 + logSigmoid(-r));
    const f = { level, unit: "nats" as const, method: "monte-carlo" };
    klRealMix = combineMeans(tReal, undefined, 1, 0, f);
    klFakeMix = combineMeans(tFake, undefined, 1, 0, f);
    jsd = combineMeans(tReal, tFake, 0.5, 0.5, f);
    value = valueFunction({
      dReal: rP,
      dFake: rQ,
      scale: "logit",
      level,
      seed: options.seed ?? 0,
      replicates: options.replicates,
    });
    notes.push(`Monte Carlo over ${dr.xP.n} draws from each density`);
  }
  const constant = exact(-Math.log(4) / c, unit);
  const sum = -Math.log(4) + klRealMix.value + klFakeMix.value;
  const residual = makeEstimate({
    value: value.value === sum ? 0 : value.value - sum,
    level,
    method: "identity residual",
    n: value.n,
    unit: "nats",
    notes: ["value - (-ln 4 + KL(p_data || m) + KL(p_g || m)); only rounding is expected"],
  });
  const jsdOut = scaleEstimate(jsd, c, unit);
  const flag = rangeNote(jsdOut, 0, Math.LN2 / c, "JSD");
  if (flag) notes.push(flag);
  // Each term has a known range (Lin 1991): V in [-ln 4, 0], KL(. || m) in [0, ln 2],
  // JSD in [0, ln 2]; intervals are kept inside them.
  const ln2 = Math.LN2 / c;
  const out: OptimumDecomposition = {
    value: clipToRange(scaleEstimate(value, c, unit), -2 * ln2, 0, "V(D*, G)"),
    jsd: clipToRange(flag ? scaleEstimate(jsdOut, 1, unit, [flag]) : jsdOut, 0, ln2, "JSD"),
    klRealMix: clipToRange(scaleEstimate(klRealMix, c, unit), 0, ln2, "KL(p_data || m)"),
    klFakeMix: clipToRange(scaleEstimate(klFakeMix, c, unit), 0, ln2, "KL(p_g || m)"),
    constant,
    residual: scaleEstimate(residual, c, unit),
    method,
    notes,
  };
  return optimumDecompositionOf(out);
}

/**
 * An {@linkcode OptimumDecomposition} from its terms, with its notebook display (for
 * decompositions computed elsewhere, such as the plug-in of a refit bootstrap).
 *
 * @example
 * ```ts
 * import { optimumDecompositionOf } from "./optimum_decomposition.ts";
 * import { exact } from "../estimate/estimate.ts";
 * import assert from "node:assert/strict";
 * const t = exact(0);
 * const d = optimumDecompositionOf({
 *   value: exact(-Math.log(4)), jsd: t, klRealMix: t, klFakeMix: t,
 *   constant: exact(-Math.log(4)), residual: t, method: "grid", notes: [],
 * });
 * assert.equal(d.jsd.value, 0);
 * assert.ok(Symbol.for("Jupyter.display") in d);
 * ```
 */
export function optimumDecompositionOf(terms: OptimumDecomposition): OptimumDecomposition {
  return withDisplay({ ...terms }, decompositionBundle);
}

function decompositionBundle(d: OptimumDecomposition): Record<string, string> {
  const rows: [string, Estimate, string][] = [
    ["V(D*, G)", d.value, "value at the optimal discriminator"],
    ["-ln 4", d.constant, "value when p_g = p_data"],
    ["KL(p_data ‖ m)", d.klRealMix, "m = (p_data + p_g) / 2"],
    ["KL(p_g ‖ m)", d.klFakeMix, ""],
    ["JSD(p_data, p_g)", d.jsd, "in [0, ln 2]"],
    ["residual", d.residual, "V - (-ln 4 + KL + KL)"],
  ];
  const header = ["term", "estimate", "note"];
  const caption = `Decomposition at the optimum (${d.method}, ${d.value.unit ?? "nats"})`;
  return {
    "text/plain": `${caption}\n${textTable(header, rows)}` +
      (d.notes.length ? `\n${d.notes.join("\n")}` : ""),
    "text/html": htmlTable(header, rows, caption),
  };
}
