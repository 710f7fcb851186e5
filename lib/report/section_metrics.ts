/**
 * Feature-space metrics of the report: the Fréchet distance of the Gaussian fits, MMD,
 * energy distance and sliced Wasserstein distance from the samples directly; k-NN
 * precision, recall, density and coverage; and two-sample tests with p-values. They run for
 * every d, and alone for high d where the density route does not.
 *
 * @module
 */
import { htmlTable } from "../display/mod.ts";
import { energyDistance, frechetDistance, mmd, slicedWasserstein } from "../divergence/mod.ts";
import type { Estimate } from "../estimate/mod.ts";
import { classifierTest, densityCoverage, mmdTest, precisionRecall } from "../metrics/mod.ts";
import { formatShort } from "./estimate_json.ts";
import { subsample } from "./_subsample.ts";
import type { ReportContext, ReportSection, SectionRecord } from "./types.ts";

const METRICS = [
  "frechet",
  "mmd",
  "energy",
  "slicedWasserstein",
  "precision",
  "recall",
  "density",
  "coverage",
] as const;
const LABELS: Record<(typeof METRICS)[number], string> = {
  frechet: "Fréchet distance² of the Gaussian fits (all rows)",
  mmd: "MMD² (Gaussian kernel, median bandwidth)",
  energy: "energy distance",
  slicedWasserstein: "sliced Wasserstein distance",
  precision: "precision (k = 3): generated points inside the real manifold",
  recall: "recall (k = 3): real points inside the generated manifold",
  density: "density (k = 5)",
  coverage: "coverage (k = 5)",
};
/**
 * The logistic classifier's Newton steps take at most 600 features (linear features are
 * d + 1): the classifier test runs for d below this, the MMD test for every d.
 */
const CLASSIFIER_MAX_D = 598;
const testsFor = (d: number | undefined): readonly string[] =>
  d !== undefined && d > CLASSIFIER_MAX_D ? ["mmd"] : ["mmd", "classifier"];

/**
 * The metrics section: sample-based distances and k-NN metrics between the two sides, and
 * two-sample tests of "both come from one distribution", with intervals and p-values. The
 * pairwise ones use at most `plan.metricRows` rows a side (a seeded subsample).
 *
 * References: Heusel et al. 2017 and Dowson & Landau 1982 (Fréchet distance); Gretton et
 * al. 2012 (MMD and its permutation test); Székely & Rizzo 2013 (energy distance); Bonneel
 * et al. 2015 (sliced Wasserstein); Kynkäänniemi et al. 2019 (precision and recall); Naeem
 * et al. 2020 (density and coverage); Lopez-Paz & Oquab 2017 (classifier test).
 *
 * @example
 * ```ts
 * import { metricsSection } from "./section_metrics.ts";
 * import assert from "node:assert/strict";
 * assert.ok(metricsSection.keys({} as never).includes("tests.mmd.pValue"));
 * ```
 */
export const metricsSection: ReportSection = {
  id: "metrics",
  title: "Feature-space metrics and two-sample tests",
  applies(ctx) {
    const m = Math.min(ctx.plan.n.real, ctx.plan.n.fake);
    return m > 10 ? true : `a side has ${m} rows; the k-NN metrics need more than 10`;
  },
  keys(ctx) {
    return [
      ...METRICS.map((k) => `estimates.metrics.${k}`),
      ...testsFor(ctx?.plan?.d).flatMap((k) => [`tests.${k}.statistic`, `tests.${k}.pValue`]),
    ];
  },
  run(ctx, out) {
    runMetrics(ctx, out);
  },
};

function runMetrics(ctx: ReportContext, out: SectionRecord): void {
  const { plan } = ctx;
  const seed = `${plan.seed}:metrics`;
  const level = plan.level;
  const all = { real: ctx.inputs.real.samples, fake: ctx.inputs.fake.samples };
  const real = subsample(all.real, plan.metricRows, `${seed}:real`);
  const fake = subsample(all.fake, plan.metricRows, `${seed}:fake`);
  let t = performance.now();
  const lap = (step: string) => {
    const now = performance.now();
    out.timings.push({ step, seconds: (now - t) / 1000 });
    t = now;
  };
  const m: Record<string, Estimate> = {};
  const names = testsFor(plan.d);
  ctx.onProgress("metrics: Fréchet distance", 0);
  m.frechet = frechetDistance(all.real, all.fake, {
    replicates: plan.frechetReplicates,
    level,
    seed,
  });
  lap("frechet");
  ctx.onProgress("metrics: MMD, energy, sliced Wasserstein", 0.25);
  m.mmd = mmd(real, fake, { level, seed });
  m.energy = energyDistance(real, fake, { level });
  m.slicedWasserstein = slicedWasserstein(real, fake, { level, seed });
  lap("mmd, energy, sliced wasserstein");
  ctx.onProgress("metrics: precision, recall, density, coverage", 0.5);
  const k = plan.metricK;
  const replicates = plan.sampleReplicates;
  const pr = precisionRecall(real, fake, { k: k.precisionRecall, replicates, level, seed });
  const dc = densityCoverage(real, fake, { k: k.densityCoverage, replicates, level, seed });
  Object.assign(m, {
    precision: pr.precision,
    recall: pr.recall,
    density: dc.density,
    coverage: dc.coverage,
  });
  lap("k-nn metrics");
  ctx.onProgress("metrics: two-sample tests", 0.75);
  const tests = {
    mmd: mmdTest(real, fake, { permutations: plan.permutations, seed, level }),
    ...(names.includes("classifier")
      ? { classifier: classifierTest(real, fake, { seed, level }) }
      : {}),
  };
  lap("tests");
  if (!names.includes("classifier")) {
    out.notes.push(
      `No classifier test at d = ${plan.d}: its logistic fit takes at most ` +
        `${CLASSIFIER_MAX_D} columns; the MMD test ran.`,
    );
  }
  out.estimates.metrics = m;
  for (const [k, r] of Object.entries(tests)) {
    out.tests[k] = {
      method: r.method,
      statistic: r.statistic,
      pValue: r.pValue,
      permutations: r.permutations,
      notes: [...r.notes],
    };
  }
  out.methods.metrics = {
    rows: { real: real.n, fake: fake.n },
    frechetRows: { real: all.real.n, fake: all.fake.n },
    frechetReplicates: plan.frechetReplicates,
    replicates: plan.sampleReplicates,
    permutations: plan.permutations,
    k: { ...k },
    tests: [...names],
    seed,
  };
  out.html.push(
    htmlTable(
      ["metric", "estimate"],
      METRICS.map((k) => [LABELS[k], m[k]]),
      `Between the samples directly (pairwise metrics on ${real.n} real and ${fake.n} ` +
        "generated rows)",
    ),
    htmlTable(
      ["test", "statistic", "p-value", "notes"],
      Object.values(tests).map((t) => [
        t.method,
        t.statistic,
        t.pValue,
        t.notes.slice(0, 1).join(""),
      ]),
      'Two-sample tests of "both sides come from one distribution" (a small p-value says ' +
        "they differ; a large one does not say they are equal)",
    ),
  );
  out.headlines.push(
    `Feature space: Fréchet distance² ${formatShort(m.frechet)}, precision ` +
      `${formatShort(m.precision)}, recall ${formatShort(m.recall)}, coverage ` +
      `${formatShort(m.coverage)}; MMD test p = ${tests.mmd.pValue.toPrecision(2)}.`,
  );
  out.notes.push(
    "k-NN metrics and MMD depend on the feature space and on the number of rows; compare " +
      "generators on equal sample sizes.",
  );
}
