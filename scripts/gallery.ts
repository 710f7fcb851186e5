/**
 * Regenerates docs/gallery/*.svg: every figure saddlekit draws, on the bundled demo data of
 * the wind-farm scenario (data/demo) or on small seeded toy densities. Run with
 * `deno task gallery`; `--png` also writes a PNG beside each SVG (for a quick look, not
 * committed); `--out DIR` writes to another folder (the tests use it).
 *
 * @module
 */
import * as sk from "../mod.ts";
import { assessTrained, loadDemo } from "./_demo.ts";

const outArg = Deno.args.indexOf("--out");
const out = outArg >= 0
  ? new URL(`file://${Deno.realPathSync(Deno.args[outArg + 1])}/`)
  : new URL("../docs/gallery/", import.meta.url);
const png = Deno.args.includes("--png");
const SEED = 2026;

/** The demo data and the fits every figure below draws on. */
export async function demoSetup() {
  const data = await loadDemo();
  const fit = (s: sk.Samples) => sk.fitGaussianMixture(s, { components: 3, seed: SEED });
  return { ...data, pData: fit(data.real), pModel: fit(data.fake), fit };
}

async function write(name: string, fig: sk.Figure): Promise<void> {
  await fig.save(new URL(`${name}.svg`, out).pathname);
  if (png) await fig.save(new URL(`${name}.png`, out).pathname);
  console.log(`${new URL(`${name}.svg`, out).pathname}  ${fig.width}×${fig.height}`);
}

if (import.meta.main) {
  await Deno.mkdir(out, { recursive: true });
  const setup = await demoSetup();
  const { real, fake, scores, pData, pModel, fit } = setup;
  const labels = ["wind speed", "vibration"], units = ["m/s", "mm/s"];

  // 1-D: the wind-speed column of both sides.
  const wReal = sk.selectColumns(real, [0]), wFake = sk.selectColumns(fake, [0]);
  const w1 = fit(wReal), w2 = fit(wFake);
  await write(
    "densities_1d",
    sk.plotDensities(w1, w2, {
      xLabel: "wind speed",
      xUnit: "m/s",
      samples: { real: wReal, generated: wFake },
      subtitle: `Gaussian-mixture fits (3 components), n = ${real.n} real, n = ${fake.n} ` +
        "generated turbine readings",
    }),
  );
  await write(
    "discriminator_map",
    sk.plotDiscriminatorMap({ pData, pModel, real, generated: fake, labels, units, seed: SEED }),
  );
  await write("objective", sk.plotObjective());

  const dec = sk.optimumDecomposition(pData, pModel, { method: "grid", seed: SEED });
  await write("decomposition", sk.plotDecomposition(dec));

  const names = [
    ["KL(p_data ‖ p_g)", "kl"],
    ["KL(p_g ‖ p_data)", "reverse-kl"],
    ["JSD", "jensen-shannon"],
    ["squared Hellinger", "squared-hellinger"],
    ["total variation", "total-variation"],
  ] as const;
  await write(
    "divergences",
    sk.plotDivergences(
      names.map(([label, name]) => ({
        name: label,
        estimate: sk.fDivergence(pData, pModel, name, { seed: SEED }),
        ...(name === "jensen-shannon"
          ? { reference: Math.LN2, referenceLabel: "upper bound ln 2" }
          : {}),
      })),
      { title: "Divergences between the fitted real and generated densities" },
    ),
  );

  // V(D, G) of the trained discriminator (its bootstrap resamples each side on its own) and
  // its gap to D*.
  const { value: vBoot, gap } = assessTrained(setup, { pData, pModel }, SEED, 2000);
  await write("reliability", sk.plotReliability(gap));
  await write(
    "bootstrap",
    sk.plotBootstrap(vBoot, {
      name: "V(D, G) of the trained discriminator",
      reference: -Math.log(4),
      referenceLabel: "equilibrium −ln 4",
    }),
  );

  await write(
    "generator_objectives",
    sk.plotGeneratorObjectives(sk.generatorObjectives(scores.fake, { scale: "prob" })),
  );

  await write(
    "fit_1d",
    sk.plotFit([
      { density: sk.fitKde(wReal, { bandwidth: "scott" }), samples: wReal },
      { density: sk.fitKde(wFake, { bandwidth: "scott" }), samples: wFake, role: "generated" },
    ], { labels: ["wind speed"], units: ["m/s"], title: "KDE fits (Scott) against histograms" }),
  );
  await write(
    "fit_2d",
    sk.plotFit([
      { density: pData, samples: real },
      { density: pModel, samples: fake, role: "generated" },
    ], { labels, units, seed: SEED, title: "Gaussian-mixture fits against the samples" }),
  );

  // Games and training dynamics: the Dirac game (Mescheder et al. 2018) and a small GAN on
  // the ring of 8 Gaussians.
  const dirac = sk.diracGame();
  const axes = {
    x: { parameter: "theta", range: [-2, 2], points: 41 },
    y: { parameter: "psi", range: [-2, 2], points: 41 },
  } as const;
  const runs = (["simultaneous", "alternating"] as const).map((updates) =>
    sk.simulateTraining(dirac, {
      start: { theta: [1], phi: [0] },
      steps: 400,
      learningRate: 0.2,
      updates,
      k: 1,
    })
  );
  await write(
    "value_surface",
    sk.plotValueSurface(sk.valueSurface(dirac, axes), { trajectories: [runs[0]] }),
  );
  await write(
    "gradient_field",
    sk.plotGradientField(
      sk.gradientFieldGrid(dirac, {
        ...axes,
        x: { ...axes.x, points: 15 },
        y: { ...axes.y, points: 15 },
      }),
      {
        trajectories: runs,
      },
    ),
  );
  await write(
    "eigenvalues",
    sk.plotEigenvalues(sk.stability(sk.diracGame({ r1: 0.6 }), { learningRate: 0.3 })),
  );
  const ring = sk.ringOfGaussians({ sd: 0.1 });
  const lab = sk.trainNeuralGan({
    data: ring,
    steps: 600,
    hidden: [16, 16],
    activation: "leaky-relu",
    learningRate: 2e-3,
    recordEvery: 200,
    theory: false,
    seed: SEED,
  });
  await write("training_curves", sk.plotTrainingCurves(lab));
  await write("phase_snapshots", sk.plotPhaseSnapshots(lab));
  await write("mode_coverage", sk.plotModeCoverage(lab.snapshots.at(-1)!.coverage!));

  // Feature space: the spectrum embeddings of the fleet and of generators A and B.
  const spectra = async (f: string) =>
    await sk.readNpy(new URL(`../data/demo/spectra_${f}.npy`, import.meta.url).pathname);
  const [sReal, sA, sB] = [await spectra("real"), await spectra("gen_a"), await spectra("gen_b")];
  const prB = sk.precisionRecall(sReal, sB, { seed: SEED, replicates: 50 });
  await write("precision_recall", sk.plotPrecisionRecall(sReal, sB, prB, { title: "Generator B" }));
  const comparison = sk.compareGenerators(sReal, { A: sA, B: sB }, [
    "frechet",
    "recall",
    "coverage",
  ], {
    replicates: 10,
    seed: SEED,
  });
  await write("generator_comparison", sk.plotGeneratorComparison(comparison));

  // The demo training run: its diagnosis, and the first 300 real rows against each checkpoint.
  const runDir = new URL("../data/demo/training/", import.meta.url).pathname;
  const diagnosis = sk.diagnoseTraining(
    await sk.readTrainingLog(`${runDir}train_log.csv`, {
      source: "data/demo/training/train_log.csv",
    }),
  );
  await write("loss_curves", sk.plotLossCurves(diagnosis));
  await write("discriminator_outputs", sk.plotDiscriminatorOutputs(diagnosis));
  await write("periodogram", sk.plotPeriodogram(diagnosis));
  const head = sk.takeRows(real, Uint32Array.from({ length: 300 }, (_, i) => i));
  const series = await sk.checkpointSeries(head, `${runDir}checkpoints`, {
    replicates: 20,
    seed: SEED,
  });
  await write("checkpoint_metrics", sk.plotCheckpointMetrics(series));
}
