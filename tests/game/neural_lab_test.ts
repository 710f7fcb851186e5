/**
 * The neural lab: backpropagation against central differences, a good run on a 1-D Gaussian
 * ending at the equilibrium the theory predicts, a collapsed generator on the ring, seeded
 * reproducibility, and bad input.
 */
import assert from "node:assert/strict";
import {
  mlp,
  mlpBackward,
  mlpForward,
  mlpGradientPenalty,
  ringOfGaussians,
  SaddleError,
  trainNeuralGan,
} from "../../mod.ts";
import { Rng } from "../../lib/random/mod.ts";

Deno.test("MLP backpropagation and the R1 penalty's double backpropagation match central differences to 1e-6 relative (common practice, no source)", () => {
  for (const activation of ["tanh", "leaky-relu"] as const) {
    const net = mlp({ sizes: [2, 5, 4, 1], activation, seed: 1 });
    const r = new Rng(3), m = 6;
    const x = r.fillNormal(new Float64Array(m * 2)), c = r.fillNormal(new Float64Array(m));
    // A smooth scalar loss of the outputs: sum c_i sin(out_i).
    const f = (p: Float64Array, xx = x) => {
      const o = mlpForward(net, xx, m, p).values.at(-1)!;
      return o.reduce((s, v, i) => s + c[i] * Math.sin(v), 0);
    };
    const trace = mlpForward(net, x, m);
    const dOut = trace.values.at(-1)!.map((v, i) => c[i] * Math.cos(v));
    const grad = new Float64Array(net.params.length);
    const dx = mlpBackward(net, trace, dOut, grad);
    const check = (analytic: Float64Array, base: Float64Array, fn: (v: Float64Array) => number) => {
      for (let j = 0; j < base.length; j++) {
        const h = 1e-6, a = Float64Array.from(base), b = Float64Array.from(base);
        a[j] += h;
        b[j] -= h;
        const fd = (fn(a) - fn(b)) / (2 * h);
        // Relative error with a floor of 1e-3 for entries near 0.
        const rel = Math.abs(fd - analytic[j]) / Math.max(Math.abs(fd), 1e-3);
        assert.ok(rel < 1e-6, `${activation} entry ${j}: ${analytic[j]} vs ${fd}`);
      }
    };
    check(grad, net.params, (p) => f(p));
    check(dx, x, (xx) => f(net.params, xx));
    // The R1 penalty's double backpropagation (Mescheder et al. 2018, Sec. 4.1).
    const scalar = mlp({ sizes: [2, 5, 4, 1], activation, seed: 4 });
    const penalty = (p: Float64Array) =>
      mlpGradientPenalty(scalar, mlpForward(scalar, x, m, p), 1.7, new Float64Array(p.length), p);
    const pGrad = new Float64Array(scalar.params.length);
    mlpGradientPenalty(scalar, mlpForward(scalar, x, m), 1.7, pGrad);
    check(pGrad, scalar.params, penalty);
  }
});

Deno.test("neural lab on a 1-D Gaussian: without a penalty the JSD swings back up; with R1 the run settles at mean D within 0.05 of 1/2 and JSD near 0 (Mescheder et al. 2018; Goodfellow et al. 2014, Thm. 1)", () => {
  const r = new Rng(1);
  const data = Array.from({ length: 2000 }, () => r.normal(1, 0.5));
  const base = {
    data,
    steps: 1500,
    hidden: [16, 16],
    activation: "leaky-relu",
    learningRate: 1e-3,
    recordEvery: 150,
    seed: 2,
  } as const;
  const lateJsd = (run: ReturnType<typeof trainNeuralGan>) =>
    Math.max(...run.snapshots.filter((s) => s.step >= 1000).map((s) => s.jsd!.value));
  const plain = trainNeuralGan(base);
  const r1 = trainNeuralGan({ ...base, penalty: { kind: "r1", weight: 1 } });
  // JSD of two KDEs of 500 points each from one Gaussian is ~0.002 (measured): "near 0" is a
  // small multiple of that, against ~0.5 at the start.
  assert.ok(lateJsd(plain) > 0.05, `without a penalty: late JSD ${lateJsd(plain)}`);
  assert.ok(lateJsd(r1) < 0.03, `with R1: late JSD ${lateJsd(r1)}`);
  const first = r1.snapshots[0], last = r1.snapshots.at(-1)!;
  assert.ok(first.jsd!.value > 0.2);
  assert.ok(Math.abs(last.meanDReal - 0.5) < 0.05 && Math.abs(last.meanDFake - 0.5) < 0.05);
  // The trained D is close to D* of the fitted densities: a small value gap.
  assert.ok(last.gap!.gap!.value < 0.05, `gap ${last.gap!.gap!.value}`);
  // Equilibrium discriminator loss 2 ln 2 (Goodfellow et al. 2014, Thm. 1).
  assert.ok(Math.abs(last.dLoss - 2 * Math.LN2) < 0.02);
});

Deno.test("neural lab on the ring of 8 Gaussians: a collapsed generator covers fewer than 8 modes; runs are bit-reproducible", () => {
  const ring = ringOfGaussians({ sd: 0.1 });
  const opts = {
    data: ring,
    steps: 1500,
    hidden: [16, 16],
    activation: "leaky-relu",
    // A fast generator against a slow discriminator: the generator hops between few modes.
    learningRate: { generator: 5e-3, discriminator: 5e-4 },
    recordEvery: 500,
    theory: false,
    seed: 3,
  } as const;
  const run = trainNeuralGan(opts);
  const last = run.snapshots.at(-1)!;
  assert.ok(last.coverage!.modesHit.value < 8, `${last.coverage!.modesHit.value} modes hit`);
  const again = trainNeuralGan({ ...opts, steps: 100, recordEvery: 50 });
  const twice = trainNeuralGan({ ...opts, steps: 100, recordEvery: 50 });
  assert.deepEqual(again.dLoss, twice.dLoss);
  assert.deepEqual(again.snapshots.at(-1)!.generated.data, twice.snapshots.at(-1)!.generated.data);
});

Deno.test("neural lab: bad input names the parameter", () => {
  const data = [0, 1, 2, 3];
  const is = (re: RegExp) => (e: unknown) => e instanceof SaddleError && re.test(e.message);
  assert.throws(() => trainNeuralGan({ data, k: 0 }), is(/k must be an integer >= 1/));
  assert.throws(() => trainNeuralGan({ data, learningRate: 0 }), is(/learningRate/));
  assert.throws(() => trainNeuralGan({ data: [0, NaN] }), is(/row 1/));
  assert.throws(() => mlp({ sizes: [2] }), is(/sizes/));
});
