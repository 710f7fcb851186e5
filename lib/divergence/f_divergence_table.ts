/**
 * The f-divergence table: generator f, convex conjugate f*, optimal critic T* = f'(p/q),
 * the domain of f* and an output activation mapping R onto it.
 *
 * `D_f(P || Q) = ∫ q(x) f(p(x) / q(x)) dx` (Csiszár 1967), and for every critic T,
 * `D_f(P || Q) >= E_P[T] - E_Q[f*(T)]` with equality at T* = f'(p/q) (Nguyen, Wainwright &
 * Jordan 2010; Nowozin, Cseke & Tomioka 2016).
 *
 * @module
 */
import { logSigmoid, sigmoid, softplus } from "../math/log_space.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { type MimeBundle, withDisplay } from "../display/display.ts";
import { formatNumber, htmlTable, textTable } from "../display/table.ts";

/** One row of the f-divergence table. All functions are written for stable evaluation. */
export interface FDivergenceSpec {
  /** Short name used by {@linkcode F_DIVERGENCES} ("kl", "pearson", ...). */
  readonly name: string;
  /** Human-readable name. */
  readonly label: string;
  /** The generator `f(u)` at a density ratio `u = p/q >= 0` (convex, f(1) = 0 except "gan"). */
  f(u: number): number;
  /** `f(e^r)` at a log-ratio r, stable for large |r|. */
  fLog(r: number): number;
  /** The perspective `e^-r f(e^r)` at a log-ratio r, stable for large r. */
  fPerspectiveLog(r: number): number;
  /** `f(0+)`: the integrand per unit of q where p vanishes (may be Infinity). */
  readonly fAtZero: number;
  /** `lim f(u) / u` as u → ∞: per unit of p where q vanishes (Infinity: divergence infinite). */
  readonly slopeAtInfinity: number;
  /** The convex conjugate `f*(t) = sup_u (t u - f(u))`; Infinity outside its domain. */
  conjugate(t: number): number;
  /** The optimal critic `T* = f'(e^r)` at a log-ratio r = log p - log q. */
  criticFromLogRatio(r: number): number;
  /** Interval of t where `f*(t)` is finite: `[lo, hi]`, ends may be open (see domainText). */
  readonly domain: readonly [number, number];
  /** The domain in words ("t < 0", "R", "|t| <= 1/2"). */
  readonly domainText: string;
  /** An output activation from R onto the domain (Nowozin et al. 2016, Table 2). */
  activation(v: number): number;
  /** Known range of the divergence `[lo, hi]`, used to flag estimates outside it. */
  readonly range: readonly [number, number];
  /** Where the row comes from. */
  readonly reference: string;
}

const NOWOZIN = "Nowozin, Cseke & Tomioka 2016, f-GAN (NeurIPS), Tables 1-2";
const expm1 = Math.expm1;

function spec(s: FDivergenceSpec): FDivergenceSpec {
  return Object.freeze(s);
}

/** Kullback–Leibler KL(P || Q): f(u) = u ln u. */
const kl = spec({
  name: "kl",
  label: "Kullback–Leibler KL(P || Q)",
  f: (u) => (u === 0 ? 0 : u * Math.log(u)),
  fLog: (r) => (r === -Infinity ? 0 : Math.exp(r) * r),
  fPerspectiveLog: (r) => r,
  fAtZero: 0,
  slopeAtInfinity: Infinity,
  conjugate: (t) => Math.exp(t - 1),
  criticFromLogRatio: (r) => 1 + r,
  domain: [-Infinity, Infinity],
  domainText: "R",
  activation: (v) => v,
  range: [0, Infinity],
  reference: NOWOZIN,
});

/** Reverse Kullback–Leibler KL(Q || P): f(u) = -ln u. */
const reverseKl = spec({
  name: "reverse-kl",
  label: "reverse Kullback–Leibler KL(Q || P)",
  f: (u) => -Math.log(u),
  fLog: (r) => -r,
  fPerspectiveLog: (r) => (r === Infinity ? 0 : -r * Math.exp(-r)),
  fAtZero: Infinity,
  slopeAtInfinity: 0,
  conjugate: (t) => (t < 0 ? -1 - Math.log(-t) : Infinity),
  criticFromLogRatio: (r) => -Math.exp(-r),
  domain: [-Infinity, 0],
  domainText: "t < 0",
  activation: (v) => -Math.exp(-v),
  range: [0, Infinity],
  reference: NOWOZIN,
});

/**
 * Jensen–Shannon JSD(P, Q) = ½ KL(P || M) + ½ KL(Q || M): f(u) = ½[u ln u - (u + 1) ln((u +
 * 1)/2)]. This is half of Nowozin et al.'s generator, so that D_f is the JSD itself, in
 * [0, ln 2] (Lin 1991); its conjugate is f*(t) = -½ ln(2 - e^{2t}).
 */
const jensenShannon = spec({
  name: "jensen-shannon",
  label: "Jensen–Shannon JSD(P, Q)",
  f: (u) => jsLog(Math.log(u)),
  fLog: jsLog,
  // JSD is symmetric: u f(1/u) = f(u), so the perspective at r is f at -r.
  fPerspectiveLog: (r) => jsLog(-r),
  fAtZero: 0.5 * Math.LN2,
  slopeAtInfinity: 0.5 * Math.LN2,
  conjugate: (t) => (t < 0.5 * Math.LN2 ? -0.5 * Math.log(2 - Math.exp(2 * t)) : Infinity),
  criticFromLogRatio: (r) => 0.5 * (Math.LN2 + logSigmoid(r)),
  domain: [-Infinity, 0.5 * Math.LN2],
  domainText: "t < ln(2)/2",
  activation: (v) => 0.5 * (Math.LN2 - softplus(-v)),
  range: [0, Math.LN2],
  reference: `${NOWOZIN} (generator halved); Lin 1991 for the range`,
});

/** `f_JS(e^r)` for r <= 0 directly; for r > 0 through the symmetry (no cancellation). */
function jsLog(r: number): number {
  if (r === -Infinity) return 0.5 * Math.LN2;
  if (r > 0) {
    // e^r f(e^-r) with f(e^-r) evaluated at a non-positive log-ratio.
    return r === Infinity ? Infinity : Math.exp(r) * jsLog(-r);
  }
  const u = Math.exp(r);
  // ½[u r - (u + 1)(ln(1 + u) - ln 2)]
  return 0.5 * (u * r - (u + 1) * (Math.log1p(u) - Math.LN2));
}

/**
 * The GAN objective: f(u) = u ln u - (u + 1) ln(u + 1), so D_f = 2 JSD - ln 4 (Goodfellow
 * et al. 2014; Nowozin et al. 2016). Its optimal critic is ln D*.
 */
const gan = spec({
  name: "gan",
  label: "GAN objective 2 JSD - ln 4",
  f: (u) => ganLog(Math.log(u)),
  fLog: ganLog,
  fPerspectiveLog: (r) => {
    if (r === Infinity) return 0;
    if (r <= 0) return Math.exp(-r) * ganLog(r);
    // r - (1 + e^-r) softplus(r) = -r e^-r - (1 + e^-r) log1p(e^-r)
    const e = Math.exp(-r);
    return -r * e - (1 + e) * Math.log1p(e);
  },
  fAtZero: 0,
  slopeAtInfinity: 0,
  conjugate: (t) => (t < 0 ? -Math.log(-expm1(t)) : Infinity),
  criticFromLogRatio: logSigmoid,
  domain: [-Infinity, 0],
  domainText: "t < 0",
  activation: (v) => -softplus(-v),
  range: [-Math.log(4), 0],
  reference: `${NOWOZIN}; Goodfellow et al. 2014`,
});

function ganLog(r: number): number {
  if (r === -Infinity) return 0;
  if (r > 0) {
    const e = Math.exp(-r);
    if (r === Infinity) return -Infinity;
    return Math.exp(r) * (-r * e - (1 + e) * Math.log1p(e));
  }
  const u = Math.exp(r);
  return u * r - (u + 1) * Math.log1p(u);
}

/** Pearson χ²: f(u) = (u - 1)². */
const pearson = spec({
  name: "pearson",
  label: "Pearson χ²(P || Q)",
  f: (u) => (u - 1) ** 2,
  fLog: (r) => expm1(r) ** 2,
  fPerspectiveLog: (r) => (r > 700 ? Infinity : expm1(r) ** 2 * Math.exp(-r)),
  fAtZero: 1,
  slopeAtInfinity: Infinity,
  conjugate: (t) => 0.25 * t * t + t,
  criticFromLogRatio: (r) => 2 * expm1(r),
  domain: [-Infinity, Infinity],
  domainText: "R",
  activation: (v) => v,
  range: [0, Infinity],
  reference: NOWOZIN,
});

/** Neyman χ²: f(u) = (1 - u)² / u. */
const neyman = spec({
  name: "neyman",
  label: "Neyman χ²(P || Q)",
  f: (u) => (1 - u) ** 2 / u,
  fLog: (r) => (r < -700 ? Infinity : expm1(r) ** 2 * Math.exp(-r)),
  fPerspectiveLog: (r) => expm1(-r) ** 2,
  fAtZero: Infinity,
  slopeAtInfinity: 1,
  conjugate: (t) => (t < 1 ? 2 - 2 * Math.sqrt(1 - t) : Infinity),
  criticFromLogRatio: (r) => -expm1(-2 * r),
  domain: [-Infinity, 1],
  domainText: "t < 1",
  activation: (v) => -expm1(v),
  range: [0, Infinity],
  reference: NOWOZIN,
});

/**
 * Squared Hellinger in Nowozin et al.'s convention: f(u) = (√u - 1)², so D_f = ∫ (√p - √q)²
 * = 2 (1 - BC) in [0, 2], twice the H² of {@linkcode gaussianHellinger}.
 */
const squaredHellinger = spec({
  name: "squared-hellinger",
  label: "squared Hellinger ∫(√p - √q)²",
  f: (u) => (Math.sqrt(u) - 1) ** 2,
  fLog: (r) => expm1(r / 2) ** 2,
  fPerspectiveLog: (r) => expm1(-r / 2) ** 2,
  fAtZero: 1,
  slopeAtInfinity: 1,
  conjugate: (t) => (t < 1 ? t / (1 - t) : Infinity),
  criticFromLogRatio: (r) => -expm1(-r / 2),
  domain: [-Infinity, 1],
  domainText: "t < 1",
  activation: (v) => -expm1(v),
  range: [0, 2],
  reference: NOWOZIN,
});

/** Total variation ½ ∫ |p - q|: f(u) = ½ |u - 1|. */
const totalVariation = spec({
  name: "total-variation",
  label: "total variation ½∫|p - q|",
  f: (u) => 0.5 * Math.abs(u - 1),
  fLog: (r) => 0.5 * Math.abs(expm1(r)),
  fPerspectiveLog: (r) => 0.5 * Math.abs(expm1(-r)),
  fAtZero: 0.5,
  slopeAtInfinity: 0.5,
  conjugate: (t) => (Math.abs(t) <= 0.5 ? t : Infinity),
  // A subgradient; 0 where the densities agree.
  criticFromLogRatio: (r) => 0.5 * Math.sign(r),
  domain: [-0.5, 0.5],
  domainText: "|t| <= 1/2",
  activation: (v) => 0.5 * Math.tanh(v),
  range: [0, 1],
  reference: NOWOZIN,
});

/**
 * The fixed rows of the f-divergence table, by name: "kl", "reverse-kl", "jensen-shannon",
 * "gan", "pearson", "neyman", "squared-hellinger", "total-variation". The α family is
 * {@linkcode alphaDivergence}. Each row has the generator, its conjugate, the optimal critic
 * and the conjugate's domain with an output activation onto it.
 *
 * References: Nguyen, Wainwright & Jordan 2010, Estimating divergence functionals and the
 * likelihood ratio by convex risk minimization (IEEE T-IT); Nowozin, Cseke & Tomioka 2016,
 * f-GAN (NeurIPS), Tables 1-2.
 *
 * @example The KL row
 * ```ts
 * import { F_DIVERGENCES } from "./f_divergence_table.ts";
 * import assert from "node:assert/strict";
 * const kl = F_DIVERGENCES.kl;
 * assert.equal(kl.f(1), 0);
 * assert.equal(kl.criticFromLogRatio(0), 1); // T* = 1 + ln(p/q)
 * assert.equal(kl.conjugate(1), 1); // f*(t) = exp(t - 1)
 * assert.equal(Object.keys(F_DIVERGENCES).length, 8);
 * ```
 */
export const F_DIVERGENCES: Readonly<{
  kl: FDivergenceSpec;
  "reverse-kl": FDivergenceSpec;
  "jensen-shannon": FDivergenceSpec;
  gan: FDivergenceSpec;
  pearson: FDivergenceSpec;
  neyman: FDivergenceSpec;
  "squared-hellinger": FDivergenceSpec;
  "total-variation": FDivergenceSpec;
}> = Object.freeze(withDisplay({
  kl,
  "reverse-kl": reverseKl,
  "jensen-shannon": jensenShannon,
  gan,
  pearson,
  neyman,
  "squared-hellinger": squaredHellinger,
  "total-variation": totalVariation,
}, tableBundle));

/** The table as a notebook cell shows it: one row per divergence. */
function tableBundle(table: Readonly<Record<string, FDivergenceSpec>>): MimeBundle {
  const header = ["name", "divergence", "f(0+)", "lim f(u)/u", "domain of T", "range", "source"];
  const rows = Object.values(table).map((s) => [
    s.name,
    s.label,
    s.fAtZero,
    s.slopeAtInfinity,
    s.domainText,
    `[${formatNumber(s.range[0])}, ${formatNumber(s.range[1])}]`,
    s.reference,
  ]);
  const caption = "f-divergences D_f(P || Q) = E_Q[f(p/q)]; α family via alphaDivergence(α)";
  return {
    "text/plain": `${caption}\n${textTable(header, rows)}`,
    "text/html": htmlTable(header, rows, caption),
  };
}

/**
 * The divergences measured in units of information (nats, or bits with `base: 2`): the
 * ones whose generator is a logarithm.
 *
 * @example
 * ```ts
 * import { LOGARITHMIC_DIVERGENCES } from "./f_divergence_table.ts";
 * import assert from "node:assert/strict";
 * assert.ok(LOGARITHMIC_DIVERGENCES.has("kl") && !LOGARITHMIC_DIVERGENCES.has("pearson"));
 * ```
 */
export const LOGARITHMIC_DIVERGENCES: ReadonlySet<string> = new Set([
  "kl",
  "reverse-kl",
  "jensen-shannon",
  "gan",
]);

/** Names of the fixed table rows, plus "alpha" for the α family. */
export type FDivergenceName = keyof typeof F_DIVERGENCES | "alpha";

/**
 * The α-divergence row (Amari's α family in the form of Cichocki & Amari 2010):
 * f(u) = (u^α - 1 - α(u - 1)) / (α(α - 1)), f*(t) = ((1 + (α - 1)t)^{α/(α-1)} - 1) / α on
 * its domain, T* = (u^{α-1} - 1)/(α - 1). α = 2 gives ½ Pearson χ², α = ½ gives
 * 2 ∫(√p - √q)²; α → 1 is KL and α → 0 reverse KL (those two are returned as such).
 *
 * References: Cichocki & Amari 2010, Families of Alpha- Beta- and Gamma-Divergences
 * (Entropy); Nowozin et al. 2016, f-GAN (NeurIPS).
 *
 * @example
 * ```ts
 * import { alphaDivergence } from "./f_divergence_table.ts";
 * import assert from "node:assert/strict";
 * const a2 = alphaDivergence(2);
 * assert.ok(Math.abs(a2.f(3) - 2) < 1e-14); // ½ (3 - 1)²
 * ```
 */
export function alphaDivergence(alpha: number): FDivergenceSpec {
  if (!Number.isFinite(alpha)) {
    throw new SaddleError("invalid-argument", `alpha must be finite, got ${alpha}`, {
      parameter: "alpha",
    });
  }
  if (alpha === 1) return kl;
  if (alpha === 0) return reverseKl;
  const a = alpha, c = 1 / (a * (a - 1));
  const fLog = (r: number): number => {
    if (r === -Infinity) return a > 0 ? 1 / a : Infinity;
    return c * (expm1(a * r) - a * expm1(r));
  };
  const fPerspectiveLog = (r: number): number => {
    if (r === Infinity) return a > 1 ? Infinity : 1 / (1 - a);
    // e^-r f(e^r) = c (e^{(a-1) r} - e^-r - a (1 - e^-r))
    return c * (Math.exp((a - 1) * r) - Math.exp(-r) + a * expm1(-r));
  };
  const hi = a < 1 ? 1 / (1 - a) : Infinity;
  return spec({
    name: "alpha",
    label: `α-divergence (α = ${a})`,
    f: (u) => fLog(Math.log(u)),
    fLog,
    fPerspectiveLog,
    fAtZero: a > 0 ? 1 / a : Infinity,
    slopeAtInfinity: a > 1 ? Infinity : 1 / (1 - a),
    conjugate: (t) => {
      if (a < 1 && t >= hi) return Infinity;
      const s = 1 + (a - 1) * t;
      // For α > 1, below t = -1/(α - 1) the supremum sits at u = 0: f*(t) = -f(0) = -1/α.
      if (s <= 0) return -1 / a;
      return (Math.pow(s, a / (a - 1)) - 1) / a;
    },
    criticFromLogRatio: (r) => expm1((a - 1) * r) / (a - 1),
    domain: [-Infinity, hi],
    domainText: a < 1 ? `t < ${hi}` : "R",
    activation: a < 1 ? (v) => hi - softplus(-v) : (v) => v,
    range: [0, Infinity],
    reference: "Cichocki & Amari 2010 (Entropy); Nowozin et al. 2016 (NeurIPS)",
  });
}

/**
 * The table row for a name (with `alpha` for the α family), or the row itself.
 *
 * @example
 * ```ts
 * import { fDivergenceSpec } from "./f_divergence_table.ts";
 * import assert from "node:assert/strict";
 * assert.equal(fDivergenceSpec("pearson").f(3), 4);
 * assert.throws(() => fDivergenceSpec("chi"), /unknown f-divergence "chi"/);
 * ```
 */
export function fDivergenceSpec(
  name: FDivergenceName | FDivergenceSpec | string,
  options: { alpha?: number } = {},
): FDivergenceSpec {
  if (typeof name !== "string") return name;
  if (name === "alpha") {
    if (options.alpha === undefined) {
      throw new SaddleError("invalid-argument", 'the "alpha" divergence needs options.alpha', {
        parameter: "alpha",
      });
    }
    return alphaDivergence(options.alpha);
  }
  const row = (F_DIVERGENCES as Readonly<Record<string, FDivergenceSpec>>)[name];
  if (!row) {
    throw new SaddleError(
      "invalid-argument",
      `unknown f-divergence "${name}"; choose one of ${
        [...Object.keys(F_DIVERGENCES), "alpha"].join(", ")
      }`,
      { parameter: "name" },
    );
  }
  return row;
}

/**
 * The integrand of `D_f` per unit of the mixture m = (p + q)/2 at log-ratio r:
 * `q f(p/q) / m = 2 sigmoid(-r) f(e^r)`, written with the perspective for r > 0 so that
 * neither factor overflows; at r = +Infinity it is 2 lim f(u)/u, at -Infinity 2 f(0).
 * `D_f(P || Q) = E_m[w(log p - log q)]`: the form behind {@linkcode fDivergence}.
 *
 * @example Disjoint supports: the JSD integrand is ln 2 on both sides
 * ```ts
 * import { F_DIVERGENCES, mixtureWeightOf } from "./f_divergence_table.ts";
 * import assert from "node:assert/strict";
 * const w = mixtureWeightOf(F_DIVERGENCES["jensen-shannon"]);
 * assert.equal(w(Infinity), Math.LN2);
 * assert.equal(w(-Infinity), Math.LN2);
 * assert.equal(w(0), 0);
 * ```
 */
export function mixtureWeightOf(s: FDivergenceSpec): (r: number) => number {
  return (r: number): number => {
    if (r === Infinity) return 2 * s.slopeAtInfinity;
    if (r === -Infinity) return 2 * s.fAtZero;
    return r <= 0 ? 2 * sigmoid(-r) * s.fLog(r) : 2 * sigmoid(r) * s.fPerspectiveLog(r);
  };
}
