/**
 * Several generators against one real set (`--fake A=path --fake B=path`): each metric for
 * each generator and each pairwise difference with a paired interval and a verdict.
 *
 * @module
 */
import { htmlTable } from "../display/mod.ts";
import type { Estimate } from "../estimate/mod.ts";
import { compareGenerators, type MetricName } from "../metrics/mod.ts";
import { plotGeneratorComparison } from "../plot/mod.ts";
import { estimateJson, formatShort } from "./estimate_json.ts";
import type { Json } from "./json.ts";
import { subsample } from "./_subsample.ts";
import type { ReportContext, ReportSection } from "./types.ts";

/** Metrics of the comparison, under their summary.json names. */
const METRICS: readonly { readonly key: string; readonly name: MetricName }[] = [
  { key: "frechet", name: "frechet" },
  { key: "mmd", name: "mmd" },
  { key: "precision", name: "precision" },
  { key: "recall", name: "recall" },
  { key: "density", name: "density" },
  { key: "coverage", name: "coverage" },
];

function names(ctx: ReportContext): string[] {
  return (ctx.inputs.generators ?? []).map((g) => g.name);
}

function pairs(list: readonly string[]): [string, string][] {
  const out: [string, string][] = [];
  for (let i = 0; i < list.length; i++) {
    for (let j = i + 1; j < list.length; j++) out.push([list[i], list[j]]);
  }
  return out;
}

/**
 * The comparison section: `compareGenerators` on the real set and every named generated
 * set (each on at most `plan.metricRows` rows, a seeded subsample), with
 * `plan.comparisonReplicates` half-sample replicates. Values go under
 * `comparison.values.<name>.<metric>` and paired differences under
 * `comparison.differences.<A>_vs_<B>.<metric>` (A − B, with `resolved` and `better`), so
 * that "A's Fréchet distance is lower than B's" is a claim between two paths (`than`) or,
 * sharper, on the paired difference against 0.
 *
 * References: Heusel et al. 2017 (Fréchet distance); Gretton et al. 2012 (MMD);
 * Kynkäänniemi et al. 2019 (precision, recall); Naeem et al. 2020 (density, coverage).
 *
 * @example
 * ```ts
 * import { comparisonSection } from "./section_comparison.ts";
 * import assert from "node:assert/strict";
 * const ctx = { inputs: { generators: [{ name: "A" }, { name: "B" }] } } as never;
 * assert.ok(comparisonSection.keys(ctx).includes("comparison.differences.A_vs_B.frechet.difference"));
 * ```
 */
export const comparisonSection: ReportSection = {
  id: "comparison",
  title: "Generators compared",
  applies(ctx) {
    const list = names(ctx);
    return list.length > 1
      ? true
      : "one generated set (give several with --fake A=FILE --fake B=FILE to compare them)";
  },
  keys(ctx) {
    const list = names(ctx);
    return [
      ...list.flatMap((g) => METRICS.map((m) => `comparison.values.${g}.${m.key}`)),
      ...pairs(list).flatMap(([a, b]) =>
        METRICS.map((m) => `comparison.differences.${a}_vs_${b}.${m.key}.difference`)
      ),
    ];
  },
  run(ctx, out) {
    const { plan } = ctx;
    const seed = `${plan.seed}:comparison`;
    const gens = ctx.inputs.generators!;
    const real = subsample(ctx.inputs.real.samples, plan.metricRows, `${seed}:real`);
    const fakes = gens.map((g) => subsample(g.samples, plan.metricRows, `${seed}:${g.name}`));
    const c = compareGenerators(real, fakes, METRICS.map((m) => m.name), {
      names: gens.map((g) => g.name),
      replicates: plan.comparisonReplicates,
      level: plan.level,
      seed,
      kPrecision: plan.metricK.precisionRecall,
      kDensity: plan.metricK.densityCoverage,
      onProgress: (done, total) => ctx.onProgress("generators compared", done / total),
    });
    const values: Record<string, Record<string, Json>> = {};
    const byName: Record<string, Record<string, Estimate>> = {};
    for (const v of c.values) {
      const key = METRICS.find((m) => m.name === v.metric)!.key;
      (values[v.generator] ??= {})[key] = estimateJson(v.estimate);
      (byName[v.generator] ??= {})[key] = v.estimate;
    }
    const differences: Record<string, Record<string, Json>> = {};
    for (const d of c.differences) {
      const key = METRICS.find((m) => m.name === d.metric)!.key;
      (differences[`${d.a}_vs_${d.b}`] ??= {})[key] = {
        difference: estimateJson(d.difference),
        resolved: d.resolved,
        better: d.better,
      };
    }
    out.data.comparison = {
      generators: gens.map((g) => g.name),
      better: Object.fromEntries(METRICS.map((m) => [m.key, c.better[m.name]])),
      values,
      differences,
    };
    out.methods.comparison = {
      metrics: METRICS.map((m) => m.key),
      rows: { real: real.n, generators: fakes.map((f) => f.n) },
      replicates: plan.comparisonReplicates,
      k: { ...plan.metricK },
      seed,
      interval: "half-sample replicates, paired across generators (the same real rows)",
    };
    out.html.push(htmlTable(
      ["generator", ...METRICS.map((m) => `${m.key} (${c.better[m.name]} is better)`)],
      gens.map((g) => [g.name, ...METRICS.map((m) => byName[g.name][m.key])]),
      `Each generator against the real set (${real.n} real rows)`,
    ));
    out.html.push(htmlTable(
      ["pair", "metric", "difference A − B", "verdict"],
      c.differences.map((d) => [
        `${d.a} vs ${d.b}`,
        d.metric,
        d.difference,
        d.resolved ? `${d.better} is better` : "not resolved at this sample size",
      ]),
      "Paired differences",
    ));
    const fd = c.differences.filter((d) => d.metric === "frechet");
    out.headlines.push(
      "Generators compared: " +
        fd.map((d) =>
          `Fréchet distance ${d.a} − ${d.b} = ${formatShort(d.difference)} (${
            d.resolved ? `${d.better} is better` : "not resolved"
          })`
        ).join("; ") + ".",
    );
    out.figures.push({
      name: "generator_comparison",
      figure: plotGeneratorComparison(c),
      caption: "Each metric for each generator with its interval.",
    });
  },
};
