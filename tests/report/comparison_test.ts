/**
 * Several generators in one report: `--fake A=FILE --fake B=FILE` through the command's
 * argument parsing, compareGenerators' paired differences in summary.json, and claims
 * between two summary paths. A generator from the data's own distribution against one
 * shifted by two standard deviations: A's Fréchet distance is lower (holds); A against a
 * copy-distribution twin C: undecided (Fréchet distance² of N(0, 1) and N(2, 1) is 4,
 * of equal Gaussians 0; Dowson & Landau 1982).
 */
import assert from "node:assert/strict";
import {
  comparisonSection,
  generatorList,
  inputsSection,
  parseCli,
  prepareAnalysis,
  runAnalysis,
  SUMMARY_SCHEMA,
  validateJson,
} from "../../lib/report/mod.ts";
import { gaussian } from "../../lib/density/mod.ts";
import { writeNpy } from "../../lib/samples/mod.ts";
import { claimsFile } from "./_report.ts";

Deno.test("generators A vs B: paired differences in summary.json; a claim between two paths holds, another is undecided", async () => {
  const dir = await Deno.makeTempDir({ prefix: "saddlekit-report-" });
  await writeNpy(`${dir}/real.npy`, gaussian(0, 1).sample(300, 1));
  await writeNpy(`${dir}/a.npy`, gaussian(0, 1).sample(300, 2));
  await writeNpy(`${dir}/b.npy`, gaussian(2, 1).sample(300, 3));
  await writeNpy(`${dir}/c.npy`, gaussian(0, 1).sample(300, 4));
  const { lists } = parseCli([
    "--real",
    `${dir}/real.npy`,
    "--fake",
    `A=${dir}/a.npy`,
    "--fake",
    `B=${dir}/b.npy`,
    "--fake",
    `C=${dir}/c.npy`,
  ]);
  const generators = generatorList(lists.fake);
  assert.deepEqual(generators.map((g) => g.name), ["A", "B", "C"]);
  const claims = await claimsFile(dir, [
    {
      statement: "generator A's Fréchet distance is lower than generator B's",
      path: "comparison.values.A.frechet",
      comparison: "<",
      than: "comparison.values.B.frechet",
    },
    {
      statement: "generator A's Fréchet distance is lower than generator C's (paired)",
      path: "comparison.differences.A_vs_C.frechet.difference",
      comparison: "<",
      threshold: 0,
    },
  ]);
  const report = await runAnalysis(
    await prepareAnalysis({
      real: `${dir}/real.npy`,
      generators,
      claims,
      comparisonReplicates: 20,
      sections: [inputsSection, comparisonSection],
    }),
  );
  assert.deepEqual(report.claims.map((c) => c.verdict), ["holds", "undecided"]);
  interface D {
    difference: { value: number };
    resolved: boolean;
    better: string | null;
  }
  const s = report.summary as unknown as {
    inputs: { fake: { path: string }; generators: { name: string }[] };
    comparison: { differences: Record<string, Record<string, D>> };
  };
  assert.equal(s.inputs.fake.path, `${dir}/a.npy`);
  assert.deepEqual(s.inputs.generators.map((g) => g.name), ["A", "B", "C"]);
  const ab = s.comparison.differences.A_vs_B.frechet;
  assert.equal(ab.better, "A");
  // Near FD²(N(0,1), N(2,1)) = 4 in magnitude (A − B ≈ 0 − 4).
  assert.ok(ab.difference.value < -3 && ab.difference.value > -5, JSON.stringify(ab));
  assert.equal(s.comparison.differences.A_vs_C.frechet.resolved, false);
  assert.ok(report.figures.some((f) => f.name === "generator_comparison"));
  assert.deepEqual(validateJson(report.summary, SUMMARY_SCHEMA), []);
  // A bad name is refused before any work, naming the file.
  await assert.rejects(
    prepareAnalysis({
      real: `${dir}/real.npy`,
      generators: [{ name: "A", path: `${dir}/a.npy` }, { name: "A", path: `${dir}/b.npy` }],
    }),
    /two generators named "A"/,
  );
  await Deno.remove(dir, { recursive: true });
});
