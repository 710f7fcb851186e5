/**
 * The main job on the bundled demo data (`deno task demo`): load both sample files and the
 * trained discriminator's scores, fit both densities, compute D*, the value of the game and
 * its split at the optimum, f-divergences, closed forms of Gaussian fits, and the trained
 * discriminator's gap and calibration. Prints the tables and writes figures and a
 * summary.json to `out/demo/` (or the folder given as the first argument).
 *
 * Usage: deno run -A scripts/demo.ts [out-dir] [--data data/demo]
 *
 * @module
 */
import * as sk from "../mod.ts";
import { assessTrained, DEMO_DIR, loadDemo } from "./_demo.ts";

const args = [...Deno.args];
const dataFlag = args.indexOf("--data");
const dataDir = dataFlag >= 0 ? args.splice(dataFlag, 2)[1] : DEMO_DIR;
const outDir = args[0] ?? "out/demo";
const SEED = 7;
const t0 = performance.now();
const say = (s = "") => console.log(s);
const section = (title: string) => say(`\n== ${title}`);

section("Samples");
const demo = await loadDemo(dataDir);
const { real, fake } = demo;
say(sk.textTable(["side", "file", "n", "d", "columns"], [
  ["real", "turbine_real.csv", real.n, real.d, (real.columns ?? []).join(", ")],
  ["generated", "turbine_fake.npy", fake.n, fake.d, (fake.columns ?? []).join(", ")],
]));

section("Densities (Gaussian KDE, Scott's rule)");
const pData = sk.fitKde(real, { bandwidth: "scott" });
const pModel = sk.fitKde(fake, { bandwidth: "scott" });
for (const [name, p] of [["real", pData], ["generated", pModel]] as const) {
  const desc = p.describe();
  say(`${name}: ${desc.kind}, d = ${desc.d}; ${JSON.stringify(desc.parameters, numbersOnly)}`);
}

section("Value of the game at the optimum: V(D*, G) = -ln 4 + KL(p_data||m) + KL(p_g||m)");
const grid = sk.optimumDecomposition(pData, pModel, { method: "grid" });
const mc = sk.optimumDecomposition(pData, pModel, { method: "monte-carlo", seed: SEED, n: 20000 });
const termRows = (d: sk.OptimumDecomposition) => [
  ["constant -ln 4", d.constant],
  ["KL(p_data || m)", d.klRealMix],
  ["KL(p_g || m)", d.klFakeMix],
  ["V(D*, G)", d.value],
  ["JSD", d.jsd],
  ["residual", d.residual],
];
say(sk.textTable(
  ["term (nats)", "grid quadrature", "Monte Carlo"],
  termRows(grid).map((r, i) => [
    r[0] as string,
    r[1] as sk.Estimate,
    termRows(mc)[i][1] as sk.Estimate,
  ]),
));
for (const note of [...grid.notes, ...mc.notes]) say(`note: ${note}`);

section("The same split with the data's sampling error (refit bootstrap)");
// The intervals above are numerical error only; refitting both densities on bootstrap
// resamples of the data puts the sampling error of the 2000 + 2000 rows in the intervals.
const refit = sk.decompositionFromSamples(real, fake, {
  replicates: 100,
  seed: SEED,
  onProgress: (k, total) => {
    if (k % 25 === 0 || k === total) console.error(`refit bootstrap: replicate ${k}/${total}`);
  },
});
say(sk.textTable(["term (nats)", "refit bootstrap"], [
  ["KL(p_data || m)", refit.klRealMix],
  ["KL(p_g || m)", refit.klFakeMix],
  ["V(D*, G)", refit.value],
  ["JSD", refit.jsd],
]));
for (const note of refit.jsd.notes) {
  if (note.startsWith("bootstrap bias estimate")) say(`note (JSD): ${note}`);
}

section("f-divergences between the fitted densities (grid quadrature)");
const divergences: Record<string, sk.Estimate> = {};
for (const name of Object.keys(sk.F_DIVERGENCES) as (keyof typeof sk.F_DIVERGENCES)[]) {
  divergences[name] = sk.fDivergence(pData, pModel, name, { method: "grid" });
}
say(sk.textTable(
  ["divergence", "estimate (nats)", "notes"],
  Object.entries(divergences).map(
    ([k, e]) => [k, e, (Number.isFinite(e.value) ? e.notes.slice(0, 1) : e.notes).join("; ")],
  ),
));

section("Gaussian fits of both sides (closed forms)");
const gaussFit = (s: sk.Samples) =>
  sk.gaussian(sk.columnMeans(s.data, s.n, s.d), sk.covariance(s.data, s.n, s.d));
const gReal = gaussFit(real), gFake = gaussFit(fake);
say(sk.textTable(["quantity", "value"], [
  ["KL(N_real || N_gen), nats", sk.gaussianKl(gReal, gFake)],
  ["Bhattacharyya distance", sk.gaussianBhattacharyya(gReal, gFake)],
  ["Hellinger distance", sk.gaussianHellinger(gReal, gFake)],
  ["Fréchet distance² (W2²)", sk.gaussianFrechet(gReal, gFake)],
]));

section("The trained discriminator (scores in disc_scores.json)");
const { value, gap } = assessTrained(demo, { pData, pModel }, SEED);
say(sk.textTable(["quantity", "estimate"], [
  ["V(D, G) of the trained D", value],
  ["V(D*, G) - V(D, G) (gap)", gap.gap],
  ["expected calibration error vs D*", gap.eceVsOptimal],
  ["Brier score", gap.brier],
]));

section("Figures");
await Deno.mkdir(outDir, { recursive: true });
const figures: Record<string, sk.Figure> = {
  "discriminator_map": sk.plotDiscriminatorMap({
    real,
    generated: fake,
    pData,
    pModel,
    seed: SEED,
    title: "D* between real and generated turbine readings",
  }),
  "decomposition": sk.plotDecomposition(grid),
  "divergences": sk.plotDivergences(divergences),
  "reliability": sk.plotReliability(gap),
  "fit_real": sk.plotFit({ density: pData, samples: real, role: "real" }),
};
const formats = Deno.env.get("SADDLEKIT_DEMO_PNG") === "1" ? ["svg", "png"] : ["svg"];
for (const [name, fig] of Object.entries(figures)) {
  for (const ext of formats) {
    await fig.save(`${outDir}/${name}.${ext}`);
    say(`wrote ${outDir}/${name}.${ext}`);
  }
}

const summary = {
  data: { real: { n: real.n, d: real.d }, generated: { n: fake.n, d: fake.d } },
  seed: SEED,
  decomposition: { grid, monteCarlo: mc, refitBootstrap: refit },
  divergences,
  gaussianFits: {
    kl: sk.gaussianKl(gReal, gFake),
    frechetSquared: sk.gaussianFrechet(gReal, gFake),
  },
  trainedDiscriminator: { value, gap: gap.gap, eceVsOptimal: gap.eceVsOptimal, brier: gap.brier },
};
await Deno.writeTextFile(`${outDir}/summary.json`, JSON.stringify(summary, null, 2) + "\n");
say(`wrote ${outDir}/summary.json`);
say(
  `\ndone in ${((performance.now() - t0) / 1000).toFixed(1)} s. Every estimate carries sampling ` +
    "error: read the intervals, not only the values.",
);

function numbersOnly(_key: string, v: unknown): unknown {
  if (ArrayBuffer.isView(v)) return Array.from(v as Float64Array, (x) => Number(x.toPrecision(4)));
  if (typeof v === "number") return Number(v.toPrecision(4));
  return v;
}
