/**
 * Claim checks: statements about summary.json (a path, a comparison and a threshold, or a
 * second path, or a tolerance around a value), each settled three ways from the interval.
 *
 * @module
 */
import { SaddleError } from "../errors/mod.ts";
import { normalCritical } from "../estimate/mod.ts";
import { type Json, numberJson } from "./json.ts";

/** Comparisons a claim may make. */
export type ClaimComparison = "<" | "<=" | ">" | ">=" | "within";

/**
 * One statement. `path` is a dotted path to an estimate in summary.json (such as
 * `estimates.optimum.jsd`). With `threshold`: the estimate compared to a number. With
 * `than`: compared to another estimate's value (their difference, with both errors). With
 * `"within"`: `|value − threshold| ≤ tolerance`.
 */
export interface Claim {
  /** The statement in words (shown in the report). */
  readonly statement: string;
  /** Dotted path to an estimate in summary.json. */
  readonly path: string;
  /** The comparison. */
  readonly comparison: ClaimComparison;
  /** The number compared against (or the centre for "within"). */
  readonly threshold?: number;
  /** A second estimate's path, compared against instead of a threshold. */
  readonly than?: string;
  /** Half-width of the band for "within". */
  readonly tolerance?: number;
}

/** Three-way verdict of a claim. */
export type ClaimVerdict = "holds" | "fails" | "undecided";

/** A claim with its verdict and the evidence. */
export interface ClaimResult {
  /** The claim as given. */
  readonly claim: Claim;
  /** holds: the whole interval satisfies it; fails: the whole interval violates it. */
  readonly verdict: ClaimVerdict;
  /** The estimate (or difference) compared, its interval and n. */
  readonly estimate: {
    readonly value: number;
    readonly ci: readonly [number, number];
    readonly level: number;
    readonly n: number;
  };
  /** One sentence: the interval against the claim. */
  readonly evidence: string;
  /**
   * For undecided claims: how many times the current sample size would settle it, and the
   * sample size, assuming the interval narrows as 1/√n around the same centre (null when
   * no sample size would, or the claim is decided).
   */
  readonly moreSamples: { readonly factor: number; readonly n: number } | null;
}

const COMPARISONS: readonly ClaimComparison[] = ["<", "<=", ">", ">=", "within"];
const FIELDS = new Set(["statement", "path", "comparison", "threshold", "than", "tolerance", "id"]);

/**
 * Parse a claims file's text: `{ "claims": [ ... ] }` or a bare array of claims. Throws a
 * `SaddleError` naming the file, the claim and the fix for a malformed claim, and for a
 * path not in `known` (the estimate paths this run will write).
 *
 * @example
 * ```ts
 * import { parseClaims } from "./claims.ts";
 * import assert from "node:assert/strict";
 * const text = '{"claims":[{"statement":"JSD small","path":"estimates.optimum.jsd","comparison":"<=","threshold":0.05}]}';
 * assert.equal(parseClaims(text, "c.json", ["estimates.optimum.jsd"])[0].threshold, 0.05);
 * assert.throws(() => parseClaims(text, "c.json", ["estimates.gaussian.kl"]), /unknown path/);
 * ```
 */
export function parseClaims(text: string, file: string, known: readonly string[]): Claim[] {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    throw new SaddleError("parse", `not valid JSON (${(e as Error).message})`, { file });
  }
  const list = Array.isArray(json) ? json : (json as { claims?: unknown } | null)?.claims;
  if (!Array.isArray(list)) {
    throw new SaddleError(
      "parse",
      'expected { "claims": [ ... ] } (or an array of claims); see README, "Claims"',
      { file },
    );
  }
  return list.map((c, i) => checkClaim(c, i, file, known));
}

function checkClaim(c: unknown, i: number, file: string, known: readonly string[]): Claim {
  const bad = (msg: string): never => {
    throw new SaddleError("parse", `claim ${i + 1}: ${msg}`, { file, row: i });
  };
  if (!c || typeof c !== "object" || Array.isArray(c)) return bad("must be an object");
  const o = c as Record<string, unknown>;
  for (const k of Object.keys(o)) {
    if (!FIELDS.has(k)) bad(`unknown field "${k}" (fields: ${[...FIELDS].join(", ")})`);
  }
  if (typeof o.path !== "string") {
    return bad('"path" must be a dotted path such as "estimates.optimum.jsd"');
  }
  if (!COMPARISONS.includes(o.comparison as ClaimComparison)) {
    return bad(
      `"comparison" must be one of ${COMPARISONS.map((x) => `"${x}"`).join(", ")}, got ${
        JSON.stringify(o.comparison)
      }`,
    );
  }
  const cmp = o.comparison as ClaimComparison;
  const num = (k: string) => {
    if (typeof o[k] !== "number" || !Number.isFinite(o[k])) bad(`"${k}" must be a finite number`);
    return o[k] as number;
  };
  const checkPath = (p: string) => {
    if (!known.includes(p)) {
      bad(
        `unknown path "${p}"; this run writes ${known.length ? known.join(", ") : "no estimates"}`,
      );
    }
  };
  checkPath(o.path);
  const out: { -readonly [K in keyof Claim]: Claim[K] } = {
    statement: typeof o.statement === "string" ? o.statement : `${o.path} ${cmp}`,
    path: o.path,
    comparison: cmp,
  };
  if (cmp === "within") {
    out.threshold = num("threshold");
    out.tolerance = num("tolerance");
    if (out.tolerance < 0) bad('"tolerance" must be >= 0');
    if (o.than !== undefined) bad('"within" takes "threshold" and "tolerance", not "than"');
  } else if (o.than !== undefined) {
    if (typeof o.than !== "string") bad('"than" must be a path');
    if (o.threshold !== undefined) bad('give "threshold" or "than", not both');
    checkPath(o.than as string);
    out.than = o.than as string;
  } else {
    out.threshold = num("threshold");
  }
  if (typeof o.statement !== "string") bad('"statement" must say the claim in words');
  return out;
}

/** The value at a dotted path of a JSON object, or undefined. */
export function jsonAt(root: Json, path: string): Json | undefined {
  let cur: Json | undefined = root;
  for (const part of path.split(".")) {
    if (cur === null || typeof cur !== "object" || Array.isArray(cur)) return undefined;
    cur = (cur as Record<string, Json>)[part];
  }
  return cur;
}

function asNumber(x: Json | undefined): number {
  return typeof x === "number" ? x : typeof x === "string" ? Number(x) : NaN;
}

interface Interval {
  value: number;
  lo: number;
  hi: number;
  level: number;
  n: number;
  se: number;
}

function intervalOf(e: Json | undefined): Interval | undefined {
  // A plain number (a p-value) is exact: its interval is the value itself.
  if (typeof e === "number") return { value: e, lo: e, hi: e, level: 1, n: 0, se: 0 };
  if (!e || typeof e !== "object" || Array.isArray(e)) return undefined;
  const o = e as Record<string, Json>;
  const value = asNumber(o.value);
  const level = asNumber(o.level);
  const se = o.se === null ? 0 : asNumber(o.se);
  let lo = value, hi = value;
  if (Array.isArray(o.ci)) [lo, hi] = [asNumber(o.ci[0]), asNumber(o.ci[1])];
  else if (o.se !== null) {
    [lo, hi] = [value - normalCritical(level) * se, value + normalCritical(level) * se];
  }
  return { value, lo, hi, level, n: asNumber(o.n), se };
}

/**
 * Settle each claim against a summary: holds when the whole interval satisfies it, fails
 * when the whole interval violates it, undecided when the interval straddles the
 * threshold. For undecided claims, the sample size that would settle it is estimated by
 * assuming the interval's half-width shrinks as 1/√n around the same centre. A comparison
 * of two estimates uses their difference with se √(se_a² + se_b²) and a normal interval
 * (treating them as independent, which overstates the error when both rest on the same
 * rows). An estimate the run did not produce (its section was skipped or failed) leaves
 * the claim undecided.
 *
 * @example
 * ```ts
 * import { checkClaims } from "./claims.ts";
 * import assert from "node:assert/strict";
 * const summary = { estimates: { x: { value: 0.04, se: 0.01, ci: [0.03, 0.05], level: 0.95, n: 100 } } };
 * const [a, b] = checkClaims(summary, [
 *   { statement: "x ≤ 0.1", path: "estimates.x", comparison: "<=", threshold: 0.1 },
 *   { statement: "x ≤ 0.045", path: "estimates.x", comparison: "<=", threshold: 0.045 },
 * ]);
 * assert.equal(a.verdict, "holds");
 * assert.equal(b.verdict, "undecided");
 * assert.equal(b.moreSamples!.factor, 4); // half-width 0.01 must become 0.005
 * ```
 */
export function checkClaims(summary: Json, claims: readonly Claim[]): ClaimResult[] {
  return claims.map((claim) => {
    const a = intervalOf(jsonAt(summary, claim.path));
    const b = claim.than ? intervalOf(jsonAt(summary, claim.than)) : undefined;
    if (!a || (claim.than && !b) || Number.isNaN(a.value)) {
      return {
        claim,
        verdict: "undecided" as const,
        estimate: { value: NaN, ci: [NaN, NaN] as const, level: 0, n: 0 },
        evidence: `${claim.than && !b ? claim.than : claim.path} was not computed in this run ` +
          "(see the sections' status)",
        moreSamples: null,
      };
    }
    let x = a;
    if (b) {
      const z = normalCritical(a.level);
      const sa = a.se || (a.hi - a.lo) / (2 * z), sb = b.se || (b.hi - b.lo) / (2 * z);
      const se = Math.hypot(sa, sb), value = a.value - b.value;
      x = {
        value,
        lo: value - z * se,
        hi: value + z * se,
        level: a.level,
        n: Math.min(a.n, b.n),
        se,
      };
    }
    const t = b ? 0 : claim.threshold!;
    const { lo, hi } = x;
    let verdict: ClaimVerdict, needHalf: number;
    const centre = (lo + hi) / 2, half = (hi - lo) / 2;
    switch (claim.comparison) {
      case "<":
        verdict = hi < t ? "holds" : lo >= t ? "fails" : "undecided";
        needHalf = Math.abs(centre - t);
        break;
      case "<=":
        verdict = hi <= t ? "holds" : lo > t ? "fails" : "undecided";
        needHalf = Math.abs(centre - t);
        break;
      case ">":
        verdict = lo > t ? "holds" : hi <= t ? "fails" : "undecided";
        needHalf = Math.abs(centre - t);
        break;
      case ">=":
        verdict = lo >= t ? "holds" : hi < t ? "fails" : "undecided";
        needHalf = Math.abs(centre - t);
        break;
      case "within": {
        const eps = claim.tolerance!, bandLo = t - eps, bandHi = t + eps;
        verdict = lo >= bandLo && hi <= bandHi
          ? "holds"
          : hi < bandLo || lo > bandHi
          ? "fails"
          : "undecided";
        needHalf = centre >= bandLo && centre <= bandHi
          ? Math.min(centre - bandLo, bandHi - centre)
          : Math.min(Math.abs(centre - bandLo), Math.abs(centre - bandHi));
        break;
      }
    }
    const r = (v: number) => Number(v.toPrecision(4)).toString();
    const pct = `${Math.round(x.level * 1000) / 10}%`;
    const what = b
      ? `${claim.path} − ${claim.than} = ${r(x.value)}`
      : `${claim.path} = ${r(x.value)}`;
    const target = claim.comparison === "within"
      ? `[${r(t - claim.tolerance!)}, ${r(t + claim.tolerance!)}]`
      : `${claim.comparison} ${r(t)}`;
    const side = (c: ClaimComparison): [string, string] =>
      c === "<"
        ? ["below", "at or above"]
        : c === "<="
        ? ["at or below", "above"]
        : c === ">"
        ? ["above", "at or below"]
        : ["at or above", "below"];
    const interval = `${pct} interval [${r(lo)}, ${r(hi)}]`;
    let evidence: string;
    if (claim.comparison === "within") {
      evidence = `${what}, ${interval} ${
        verdict === "holds"
          ? "lies entirely inside"
          : verdict === "fails"
          ? "lies entirely outside"
          : "straddles an edge of"
      } ${target}`;
    } else {
      const [yes, no] = side(claim.comparison);
      evidence = `${what}, ${interval} ${
        verdict === "holds"
          ? `lies entirely ${yes}`
          : verdict === "fails"
          ? `lies entirely ${no}`
          : "straddles"
      } ${r(t)}`;
    }
    if (b) evidence += " (difference of two estimates, treated as independent)";
    let moreSamples: ClaimResult["moreSamples"] = null;
    if (verdict === "undecided" && needHalf > 0 && half > 0 && x.n > 0) {
      const factor = (half / needHalf) ** 2;
      moreSamples = { factor: Number(factor.toPrecision(3)), n: Math.ceil(x.n * factor) };
    }
    return {
      claim,
      verdict,
      estimate: { value: x.value, ci: [lo, hi] as const, level: x.level, n: x.n },
      evidence,
      moreSamples,
    };
  });
}

/**
 * A claim result as summary.json holds it.
 *
 * @example
 * ```ts
 * import { claimJson } from "./claims.ts";
 * import assert from "node:assert/strict";
 * const j = claimJson({ claim: { statement: "s", path: "p", comparison: "<", threshold: 1 },
 *   verdict: "holds", estimate: { value: 0, ci: [-1, 0.5], level: 0.95, n: 10 }, evidence: "e", moreSamples: null });
 * assert.equal((j as { verdict: string }).verdict, "holds");
 * ```
 */
export function claimJson(r: ClaimResult): Json {
  const num = numberJson;
  return {
    statement: r.claim.statement,
    path: r.claim.path,
    comparison: r.claim.comparison,
    threshold: r.claim.threshold ?? null,
    than: r.claim.than ?? null,
    tolerance: r.claim.tolerance ?? null,
    verdict: r.verdict,
    value: num(r.estimate.value),
    ci: [num(r.estimate.ci[0]), num(r.estimate.ci[1])],
    level: r.estimate.level,
    n: r.estimate.n,
    evidence: r.evidence,
    more_samples: r.moreSamples ? { factor: r.moreSamples.factor, n: r.moreSamples.n } : null,
  };
}
