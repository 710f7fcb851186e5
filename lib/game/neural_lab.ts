/**
 * A neural lab on the CPU: an MLP generator and an MLP discriminator trained by Alg. 1 on
 * low-dimensional samples, with the theory's view of every snapshot (D* from fitted
 * densities, the trained D's gap to it, the JSD, mode coverage).
 *
 * @module
 */
import { fitKde } from "../density/kde.ts";
import type { Density } from "../density/types.ts";
import { logSigmoid, sigmoid } from "../math/mod.ts";
import { type DiscriminatorGap, discriminatorGap } from "../discriminator/discriminator_gap.ts";
import type { Discriminator } from "../discriminator/types.ts";
import { fDivergence } from "../divergence/f_divergence.ts";
import { withDisplay } from "../display/mod.ts";
import type { Estimate } from "../estimate/estimate.ts";
import { formatNumber, htmlTable, type TableCell, textTable } from "../display/mod.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { type KnownModes, type ModeCoverage, modeCoverage } from "../metrics/mode_coverage.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import { fromBuffer, type Samples, samples, type SamplesInput } from "../samples/samples.ts";
import {
  type Activation,
  type Mlp,
  mlp,
  mlpBackward,
  mlpForward,
  mlpGradientPenalty,
} from "./mlp.ts";
import { Stepper } from "./_optimizer.ts";
import type { GeneratorLoss, Penalty } from "./game.ts";
import type { SyntheticSet } from "./synthetic_sets.ts";

/** Options of {@linkcode trainNeuralGan}. */
export interface NeuralLabOptions {
  /** Real samples, or a synthetic set (then its density and modes feed the snapshots). */
  data: SamplesInput | SyntheticSet;
  /** Generator steps (default 2000). */
  steps?: number;
  /** Discriminator steps per generator step (default 1). */
  k?: number;
  /** Minibatch size per side (default 64). */
  batchSize?: number;
  /** Hidden layer widths of both nets (default [32, 32]). */
  hidden?: readonly number[];
  /** Noise dimension (default the data's d). */
  noiseDim?: number;
  /** Hidden activation (default "tanh"). */
  activation?: Activation;
  /** Adam learning rates (default 1e-3 each). */
  learningRate?: number | { generator: number; discriminator: number };
  /** Adam β1 (default 0.5, common practice for GANs since Radford et al. 2016) and β2 (0.999). */
  beta1?: number;
  /** Adam β2 (default 0.999). */
  beta2?: number;
  /** Learning-rate schedule: "constant" (default) or "linear" decay to 0 at the last step. */
  schedule?: "constant" | "linear";
  /** Generator loss (default "non-saturating"). */
  loss?: GeneratorLoss;
  /**
   * A gradient penalty on the discriminator: R1 (γ/2) E_data ||∇_x logit D||² or R2 on
   * generated points (Mescheder et al. 2018), by double backpropagation (default none).
   */
  penalty?: Penalty;
  /** Weight decay on the discriminator's parameters (default 0). */
  weightDecay?: number;
  /** Snapshot every this many generator steps (default steps / 10). */
  recordEvery?: number;
  /** Points per side in a snapshot (default 500). */
  evalSize?: number;
  /** Known modes of the data for mode coverage (default: the synthetic set's). */
  modes?: KnownModes;
  /** Skip the density-based view of snapshots (D*, gap, JSD) for speed (default false). */
  theory?: boolean;
  /** Seed of everything (default 0). */
  seed?: RandomSource;
  /** Called at every snapshot with (step, steps). */
  onProgress?: (step: number, total: number) => void;
}

/** The state of training at one step, with the theory's view. */
export interface NeuralSnapshot {
  /** Generator steps done. */
  readonly step: number;
  /** Discriminator loss (BCE, real + generated) on the evaluation points; 2 ln 2 at equilibrium. */
  readonly dLoss: number;
  /** Non-saturating generator loss −E ln D on the evaluation points; ln 2 at equilibrium. */
  readonly gLoss: number;
  /** Mean D on real evaluation points. */
  readonly meanDReal: number;
  /** Mean D on generated evaluation points. */
  readonly meanDFake: number;
  /** Generated evaluation points (fixed noise across snapshots). */
  readonly generated: Samples;
  /** The discriminator at this step (a copy of its parameters). */
  readonly discriminator: Discriminator;
  /** The density fitted to the generated points (KDE), when the theory's view is on. */
  readonly pModel?: Density;
  /** JSD(p_data ‖ p_g) with p_g the KDE of the generated points (Monte Carlo). */
  readonly jsd?: Estimate;
  /** The trained D against D* = p_data / (p_data + p_g). */
  readonly gap?: DiscriminatorGap;
  /** Mode coverage of the generated points, when the modes are known. */
  readonly coverage?: ModeCoverage;
}

/** Result of {@linkcode trainNeuralGan}. */
export interface NeuralRun {
  /** Per generator step: the minibatch discriminator loss. */
  readonly dLoss: Float64Array;
  /** Per generator step: the minibatch generator loss (the chosen loss). */
  readonly gLoss: Float64Array;
  /** Per generator step: mean D on the real minibatch. */
  readonly meanDReal: Float64Array;
  /** Per generator step: mean D on the generated minibatch. */
  readonly meanDFake: Float64Array;
  /** Snapshots every `recordEvery` steps (and at step 0 and the end). */
  readonly snapshots: readonly NeuralSnapshot[];
  /** Real evaluation points. */
  readonly real: Samples;
  /** The data density used for D* (the synthetic set's, else a KDE of the data). */
  readonly pData?: Density;
  /** Known modes. */
  readonly modes?: KnownModes;
  /** The trained generator. */
  readonly generator: Mlp;
  /** The trained discriminator. */
  readonly discriminatorNet: Mlp;
  /** Draw `n` generated points from the trained generator. */
  generate(n: number, seed: RandomSource): Samples;
  /** The settings. */
  readonly settings: Readonly<Record<string, unknown>>;
}

function isSynthetic(x: unknown): x is SyntheticSet {
  return typeof x === "object" && x !== null && "sample" in x && "name" in x &&
    typeof (x as SyntheticSet).sample === "function";
}

/** A discriminator object over a copy of an MLP's parameters. */
function netDiscriminator(net: Mlp): Discriminator {
  const frozen: Mlp = {
    sizes: net.sizes,
    activation: net.activation,
    params: Float64Array.from(net.params),
  };
  const logit = (x: Samples) => {
    if (x.d !== frozen.sizes[0]) {
      throw new SaddleError(
        "dimension-mismatch",
        `points have d = ${x.d}, the discriminator takes ${frozen.sizes[0]}`,
        {
          parameter: "x",
        },
      );
    }
    return Float64Array.from(mlpForward(frozen, x.data, x.n).values.at(-1)!);
  };
  return { d: frozen.sizes[0], logit, prob: (x) => logit(x).map(sigmoid) };
}

/**
 * Train a small GAN on the CPU by Alg. 1 (k discriminator steps per generator step, Adam,
 * minibatches of `batchSize`): an MLP generator z ~ N(0, I) → x and an MLP discriminator,
 * with backpropagation on Float64Arrays. Everything is seeded: the same options give the
 * same bits. Every `recordEvery` steps a snapshot holds the losses and mean D on fixed
 * evaluation points and the theory's view: a KDE fitted to the generated points as p_g,
 * D* = p_data / (p_data + p_g), the trained D's gap to it (`discriminatorGap`), the JSD, and
 * mode coverage where the modes are known. At a good end, D → 1/2 and the JSD → 0; on the
 * ring a collapsed generator covers few of the 8 modes. Without a penalty the JSD of a
 * constant-rate run swings back up after reaching its low; `penalty: { kind: "r1", weight }`
 * (double backpropagation) or a `"linear"` learning-rate schedule settles it.
 *
 * References: Goodfellow et al. 2014 (NeurIPS), Alg. 1; Kingma & Ba 2015 (ICLR), Adam;
 * Mescheder, Geiger & Nowozin 2018 (ICML) for R1 and R2;
 * Radford, Metz & Chintala 2016 (ICLR) for β1 = 0.5; Metz et al. 2017 (ICLR) for the ring.
 *
 * @example A few steps on a 1-D Gaussian
 * ```ts
 * import { trainNeuralGan } from "./neural_lab.ts";
 * import { Rng } from "../random/rng.ts";
 * import assert from "node:assert/strict";
 * const r = new Rng(1);
 * const data = Array.from({ length: 500 }, () => r.normal(1, 0.5));
 * const run = trainNeuralGan({ data, steps: 50, hidden: [8], recordEvery: 25, theory: false, seed: 2 });
 * assert.equal(run.snapshots.length, 3);
 * assert.equal(run.dLoss.length, 50);
 * ```
 */
export function trainNeuralGan(options: NeuralLabOptions): NeuralRun {
  const synth = isSynthetic(options.data) ? options.data : undefined;
  const seed = String(options.seed ?? 0);
  const rng = toRng(`${seed}/train`);
  const dataSamples = synth
    ? synth.sample(10000, `${seed}/data`)
    : samples(options.data as SamplesInput, { source: "data" });
  const d = dataSamples.d, nData = dataSamples.n;
  const steps = options.steps ?? 2000, k = options.k ?? 1, m = options.batchSize ?? 64;
  for (const [name, v, min] of [["steps", steps, 1], ["k", k, 1], ["batchSize", m, 1]] as const) {
    if (!Number.isInteger(v) || v < min) {
      throw new SaddleError("invalid-argument", `${name} must be an integer >= ${min}, got ${v}`, {
        parameter: name,
      });
    }
  }
  const lrIn = options.learningRate ?? 1e-3;
  const lr = typeof lrIn === "number" ? { generator: lrIn, discriminator: lrIn } : lrIn;
  for (const [who, v] of Object.entries(lr)) {
    if (!(v > 0) || !Number.isFinite(v)) {
      throw new SaddleError("invalid-argument", `learningRate (${who}) must be > 0, got ${v}`, {
        parameter: "learningRate",
      });
    }
  }
  const hidden = options.hidden ?? [32, 32];
  const nz = options.noiseDim ?? d;
  const activation = options.activation ?? "tanh";
  const G = mlp({ sizes: [nz, ...hidden, d], activation, seed: `${seed}/G` });
  const D = mlp({ sizes: [d, ...hidden, 1], activation, seed: `${seed}/D` });
  const b1 = options.beta1 ?? 0.5, b2 = options.beta2 ?? 0.999;
  const optG = new Stepper(G.params.length, "adam", lr.generator, b1, b2);
  const optD = new Stepper(D.params.length, "adam", lr.discriminator, b1, b2);
  const loss = options.loss ?? "non-saturating";
  const decay = options.weightDecay ?? 0;
  const penalty = options.penalty && options.penalty.weight > 0 ? options.penalty : undefined;
  if (
    options.penalty && !(options.penalty.weight >= 0 && Number.isFinite(options.penalty.weight))
  ) {
    throw new SaddleError(
      "invalid-argument",
      `penalty weight γ must be >= 0, got ${options.penalty.weight}`,
      {
        parameter: "penalty",
      },
    );
  }
  const every = options.recordEvery ?? Math.max(1, Math.floor(steps / 10));
  const nEval = options.evalSize ?? 500;
  const theory = options.theory ?? true;
  const modes = options.modes ?? synth?.modes;
  // Fixed evaluation points: real ones and the noise behind generated ones.
  const evalIdx = toRng(`${seed}/eval`).permutation(nData).subarray(0, Math.min(nEval, nData));
  const real = fromBuffer(
    Float64Array.from(
      { length: evalIdx.length * d },
      (_, t) => dataSamples.data[evalIdx[Math.floor(t / d)] * d + (t % d)],
    ),
    d,
  );
  const zEval = toRng(`${seed}/zeval`).fillNormal(new Float64Array(nEval * nz));
  let pData: Density | undefined = synth?.density;
  if (!pData && theory) pData = fitKde(real);

  const gradG = new Float64Array(G.params.length), gradD = new Float64Array(D.params.length);
  const xr = new Float64Array(m * d), z = new Float64Array(m * nz);
  const dOut = new Float64Array(m);
  const dLossArr = new Float64Array(steps), gLossArr = new Float64Array(steps);
  const mR = new Float64Array(steps), mF = new Float64Array(steps);
  const snapshots: NeuralSnapshot[] = [];

  const snapshot = (step: number) => {
    const fake = fromBuffer(Float64Array.from(mlpForward(G, zEval, nEval).values.at(-1)!), d);
    const disc = netDiscriminator(D);
    const lr_ = disc.logit(real), lf = disc.logit(fake);
    let dl = 0, gl = 0, mr = 0, mf = 0;
    for (const l of lr_) {
      dl -= logSigmoid(l) / lr_.length;
      mr += sigmoid(l) / lr_.length;
    }
    for (const l of lf) {
      dl -= logSigmoid(-l) / lf.length;
      gl -= logSigmoid(l) / lf.length;
      mf += sigmoid(l) / lf.length;
    }
    let pModel: Density | undefined, jsd: Estimate | undefined, gap: DiscriminatorGap | undefined;
    if (theory && pData) {
      pModel = fitKde(fake);
      jsd = fDivergence(pData, pModel, "jensen-shannon", {
        method: "monte-carlo",
        n: 1000,
        seed: `${seed}/jsd/${step}`,
      });
      gap = discriminatorGap({
        dReal: lr_,
        dFake: lf,
        scale: "logit",
        real,
        fake,
        pData,
        pModel,
        replicates: 100,
        seed: `${seed}/gap/${step}`,
      });
    }
    const coverage = modes
      ? modeCoverage(fake, modes, { replicates: 100, seed: `${seed}/modes/${step}` })
      : undefined;
    snapshots.push({
      step,
      dLoss: dl,
      gLoss: gl,
      meanDReal: mr,
      meanDFake: mf,
      generated: fake,
      discriminator: disc,
      ...(pModel ? { pModel } : {}),
      ...(jsd ? { jsd } : {}),
      ...(gap ? { gap } : {}),
      ...(coverage ? { coverage } : {}),
    });
    options.onProgress?.(step, steps);
  };

  const drawReal = () => {
    for (let i = 0; i < m; i++) {
      const j = rng.integer(nData);
      for (let c = 0; c < d; c++) xr[i * d + c] = dataSamples.data[j * d + c];
    }
  };
  snapshot(0);
  const linear = options.schedule === "linear";
  for (let t = 0; t < steps; t++) {
    if (linear) {
      optG.lr = lr.generator * (1 - t / steps);
      optD.lr = lr.discriminator * (1 - t / steps);
    }
    let lastD = 0, lastR = 0, lastF = 0;
    for (let r = 0; r < k; r++) {
      drawReal();
      rng.fillNormal(z);
      const xf = mlpForward(G, z, m).values.at(-1)!;
      gradD.fill(0);
      const tr = mlpForward(D, xr, m), lr_ = tr.values.at(-1)!;
      let dl = 0, sr = 0, sf = 0;
      for (let i = 0; i < m; i++) {
        dl -= logSigmoid(lr_[i]) / m;
        sr += sigmoid(lr_[i]) / m;
        dOut[i] = -sigmoid(-lr_[i]) / m;
      }
      mlpBackward(D, tr, dOut, gradD);
      const tf = mlpForward(D, xf, m), lf = tf.values.at(-1)!;
      if (penalty) mlpGradientPenalty(D, penalty.kind === "r1" ? tr : tf, penalty.weight, gradD);
      for (let i = 0; i < m; i++) {
        dl -= logSigmoid(-lf[i]) / m;
        sf += sigmoid(lf[i]) / m;
        dOut[i] = sigmoid(lf[i]) / m;
      }
      mlpBackward(D, tf, dOut, gradD);
      for (let i = 0; i < gradD.length; i++) gradD[i] = -gradD[i] - decay * D.params[i];
      optD.apply(D.params, gradD);
      lastD = dl;
      lastR = sr;
      lastF = sf;
    }
    rng.fillNormal(z);
    const tg = mlpForward(G, z, m), xf = tg.values.at(-1)!;
    const tf = mlpForward(D, xf, m), lf = tf.values.at(-1)!;
    let gl = 0;
    for (let i = 0; i < m; i++) {
      if (loss === "minimax") {
        gl += logSigmoid(-lf[i]) / m;
        dOut[i] = -sigmoid(lf[i]) / m;
      } else {
        gl -= logSigmoid(lf[i]) / m;
        dOut[i] = -sigmoid(-lf[i]) / m;
      }
    }
    const scratch = new Float64Array(D.params.length);
    const dx = mlpBackward(D, tf, dOut, scratch);
    gradG.fill(0);
    mlpBackward(G, tg, dx, gradG);
    for (let i = 0; i < gradG.length; i++) gradG[i] = -gradG[i];
    optG.apply(G.params, gradG);
    if (!G.params.every(Number.isFinite) || !D.params.every(Number.isFinite)) {
      throw new SaddleError(
        "numerical",
        `the networks' parameters became non-finite at step ${t + 1}; lower the learning rate`,
        {
          parameter: "learningRate",
        },
      );
    }
    dLossArr[t] = lastD;
    gLossArr[t] = gl;
    mR[t] = lastR;
    mF[t] = lastF;
    if ((t + 1) % every === 0 || t + 1 === steps) snapshot(t + 1);
  }
  const run: NeuralRun = {
    dLoss: dLossArr,
    gLoss: gLossArr,
    meanDReal: mR,
    meanDFake: mF,
    snapshots,
    real,
    ...(pData ? { pData } : {}),
    ...(modes ? { modes } : {}),
    generator: G,
    discriminatorNet: D,
    generate: (n, s) =>
      fromBuffer(
        Float64Array.from(
          mlpForward(G, toRng(s).fillNormal(new Float64Array(n * nz)), n).values.at(-1)!,
        ),
        d,
      ),
    settings: {
      data: synth?.name ?? `${nData} samples (d = ${d})`,
      steps,
      k,
      batchSize: m,
      hidden: [...hidden],
      noiseDim: nz,
      activation,
      learningRate: lr,
      schedule: linear ? "linear" : "constant",
      loss,
      weightDecay: decay,
      penalty: penalty ? `${penalty.kind.toUpperCase()}, γ = ${penalty.weight}` : "none",
      seed,
    },
  };
  return withDisplay(run, (r) => {
    const head = [
      "step",
      "D loss",
      "G loss (NS)",
      "mean D real",
      "mean D fake",
      "JSD",
      "gap to D*",
      "modes hit",
    ];
    const rows: TableCell[][] = r.snapshots.map((s) => [
      s.step,
      s.dLoss,
      s.gLoss,
      s.meanDReal,
      s.meanDFake,
      s.jsd ?? null,
      s.gap?.gap ?? null,
      s.coverage ? `${s.coverage.modesHit.value} of ${s.coverage.modes}` : null,
    ]);
    const title =
      `Neural lab: ${r.settings.data}, ${r.settings.steps} G steps, k = ${r.settings.k} ` +
      `(equilibrium: D loss ${formatNumber(2 * Math.LN2)}, mean D 0.5, NS G loss ${
        formatNumber(Math.LN2)
      })`;
    return {
      "text/plain": `${title}\n${textTable(head, rows)}`,
      "text/html": htmlTable(head, rows, title),
    };
  });
}
