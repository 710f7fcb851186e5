/**
 * The report end to end on generated data with known answers: two samples of one Gaussian
 * (JSD 0 and V(D*, G) = -ln 4, Goodfellow et al. 2014, Thm. 1), two Gaussians with known
 * parameters (closed-form KL, Kullback 1959, and Fréchet distance, Dowson & Landau 1982),
 * claims with all three verdicts; summary.json validates against its schema and the same
 * seed gives the same bytes.
 */
import assert from "node:assert/strict";
import {
  checkClaims,
  prepareAnalysis,
  runAnalysis,
  SUMMARY_SCHEMA,
  validateJson,
} from "../../lib/report/mod.ts";
import type { Json } from "../../lib/report/mod.ts";
import { claimsFile, gaussianPair } from "./_report.ts";

interface E {
  value: number;
  ci: [number, number];
  n: number;
}
const est = (
  s: Json,
  group: string,
  key: string,
) => ((s as unknown as { estimates: Record<string, Record<string, E>> }).estimates[group][key]);
const contains = (e: E, x: number) => e.ci[0] <= x && x <= e.ci[1];

Deno.test("same Gaussian on both sides: JSD ≈ 0 and V(D*, G) ≈ -ln 4 within the intervals; same seed, same bytes", async () => {
  const { dir, real, fake } = await gaussianPair({ n: 500, mean: 0, sd: 1, seed: 31 });
  const claims = await claimsFile(dir, [
    {
      statement: "JSD at most 0.02",
      path: "estimates.optimum.jsd",
      comparison: "<=",
      threshold: 0.02,
    },
    {
      statement: "V within 0.01 of -ln 4",
      path: "estimates.optimum.value",
      comparison: "within",
      threshold: -Math.log(4),
      tolerance: 0.01,
    },
  ]);
  const options = { real, fake, claims, replicates: 30, seed: 4 };
  const a = await runAnalysis(await prepareAnalysis(options));
  // Goodfellow et al. 2014, Thm. 1: at p_g = p_data, JSD = 0 and V(D*, G) = -ln 4.
  const jsd = est(a.summary, "optimum", "jsd"), value = est(a.summary, "optimum", "value");
  assert.ok(contains(jsd, 0), `JSD interval ${jsd.ci}`);
  assert.ok(jsd.ci[1] < 0.02, `JSD interval ${jsd.ci} is not near 0`);
  assert.ok(contains(value, -Math.log(4)), `V interval ${value.ci}`);
  assert.deepEqual(a.claims.map((c) => c.verdict), ["holds", "holds"]);
  assert.deepEqual(validateJson(a.summary, SUMMARY_SCHEMA), []);
  const b = await runAnalysis(await prepareAnalysis(options));
  assert.equal(b.summaryText, a.summaryText, "the same seed must give the same summary.json bytes");
  const c = await runAnalysis(await prepareAnalysis({ ...options, seed: 5 }));
  assert.notEqual(c.summaryText, a.summaryText);
  await Deno.remove(dir, { recursive: true });
});

Deno.test("two known Gaussians: closed-form KL and Fréchet distance within the intervals; holds, fails and undecided claims", async () => {
  // N(0, 1) against N(1, 1.5²).
  const { dir, real, fake } = await gaussianPair({ n: 800, mean: 1, sd: 1.5, seed: 7 });
  // KL(N(μ1, σ1²) || N(μ2, σ2²)) = ln(σ2/σ1) + (σ1² + (μ1 − μ2)²)/(2σ2²) − 1/2 (Kullback 1959).
  const kl = Math.log(1.5) + (1 + 1) / (2 * 2.25) - 0.5;
  // Fréchet distance² in 1-D: (μ1 − μ2)² + (σ1 − σ2)² (Dowson & Landau 1982).
  const frechet = 1 + 0.25;
  const claims = await claimsFile(dir, [
    { statement: "KL above 0.1", path: "estimates.gaussian.kl", comparison: ">", threshold: 0.1 },
    { statement: "KL below 0.05", path: "estimates.gaussian.kl", comparison: "<", threshold: 0.05 },
    {
      statement: "KL at most its true value",
      path: "estimates.gaussian.kl",
      comparison: "<=",
      threshold: kl,
    },
    {
      statement: "KL lower than the reverse KL",
      path: "estimates.gaussian.kl",
      comparison: "<",
      than: "estimates.gaussian.reverseKl",
    },
  ]);
  const report = await runAnalysis(
    await prepareAnalysis({ real, fake, claims, replicates: 20, seed: 3 }),
  );
  const s = report.summary;
  assert.ok(
    contains(est(s, "gaussian", "kl"), kl),
    `KL ${JSON.stringify(est(s, "gaussian", "kl"))} vs ${kl}`,
  );
  assert.ok(contains(est(s, "gaussian", "frechet"), frechet));
  // Reverse KL: ln(σ1/σ2) + (σ2² + (μ1 − μ2)²)/(2σ1²) − 1/2.
  assert.ok(contains(est(s, "gaussian", "reverseKl"), Math.log(1 / 1.5) + (2.25 + 1) / 2 - 0.5));
  const verdicts = report.claims.map((c) => c.verdict);
  assert.deepEqual(verdicts, ["holds", "fails", "undecided", "holds"]);
  const undecided = report.claims[2];
  assert.ok(undecided.moreSamples && undecided.moreSamples.factor > 1);
  assert.ok(undecided.moreSamples.n > est(s, "gaussian", "kl").n);
  assert.match(undecided.evidence, /straddles/);
  assert.deepEqual(validateJson(s, SUMMARY_SCHEMA), []);
  await Deno.remove(dir, { recursive: true });
});

Deno.test("claim verdicts follow the interval; the sample size for an undecided claim scales as 1/√n", () => {
  const summary = {
    estimates: {
      g: {
        a: { value: 0.5, se: 0.05, ci: [0.4, 0.6], level: 0.95, n: 1000 },
        b: { value: 0.1, se: null, ci: null, level: 0.95, n: 0 },
      },
    },
  };
  const [w1, w2, w3, w4, w5] = checkClaims(summary, [
    { statement: "", path: "estimates.g.a", comparison: "within", threshold: 0.5, tolerance: 0.2 },
    { statement: "", path: "estimates.g.a", comparison: "within", threshold: 1, tolerance: 0.2 },
    { statement: "", path: "estimates.g.a", comparison: "within", threshold: 0.5, tolerance: 0.05 },
    { statement: "", path: "estimates.g.b", comparison: ">=", threshold: 0.1 },
    { statement: "", path: "estimates.g.a", comparison: ">", threshold: 0.55 },
  ]);
  assert.deepEqual([w1.verdict, w2.verdict, w3.verdict, w4.verdict], [
    "holds",
    "fails",
    "undecided",
    "holds",
  ]);
  // Half-width 0.1 must shrink to 0.05 to fit inside [0.45, 0.55]: 4 times the rows.
  assert.deepEqual(w3.moreSamples, { factor: 4, n: 4000 });
  assert.equal(w5.verdict, "undecided");
  assert.equal(w5.moreSamples!.factor, 4); // |0.5 − 0.55| = 0.05 = half of 0.1
});

Deno.test("discriminator outputs: one file a side (--d-real, --d-fake), logits recognised, lengths checked", async () => {
  const { dir, real, fake } = await gaussianPair({ n: 50, mean: 0, sd: 1, seed: 9 });
  const { samples, writeNpy } = await import("../../lib/samples/mod.ts");
  await writeNpy(`${dir}/dr.npy`, samples(Array.from({ length: 50 }, (_, i) => Math.sin(i) * 3)));
  await writeNpy(`${dir}/df.npy`, samples(Array.from({ length: 50 }, (_, i) => Math.cos(i) * 3)));
  const prep = await prepareAnalysis({
    real,
    fake,
    dReal: `${dir}/dr.npy`,
    dFake: `${dir}/df.npy`,
  });
  assert.equal(prep.inputs.scores?.scale, "logit");
  assert.ok(prep.keys.includes("estimates.discriminator.value"));
  assert.ok(prep.sections.every((s) => s.section.id !== "discriminator" || s.applies === true));
  await writeNpy(`${dir}/short.npy`, samples([0.5, 0.5]));
  await assert.rejects(
    prepareAnalysis({ real, fake, dReal: `${dir}/short.npy`, dFake: `${dir}/df.npy` }),
    /short\.npy.*2 discriminator outputs on the real side but the real file has 50 rows/,
  );
  await assert.rejects(
    prepareAnalysis({ real, fake, dReal: `${dir}/dr.npy` }),
    /--d-fake is missing/,
  );
  await Deno.remove(dir, { recursive: true });
});
