/**
 * A small multilayer perceptron on `Float64Array`s with hand-written backpropagation: enough
 * for generators and discriminators of a few thousand parameters on the CPU.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { type RandomSource, toRng } from "../random/rng.ts";

/** Hidden-layer activation. */
export type Activation = "tanh" | "leaky-relu";

/** An MLP: layer sizes, activation and all parameters in one buffer. */
export interface Mlp {
  /** Sizes from input to output, e.g. [2, 32, 32, 1]. */
  readonly sizes: readonly number[];
  /** Hidden activation (the output layer is linear). */
  readonly activation: Activation;
  /** Weights (out x in, row-major) then biases, layer by layer. */
  readonly params: Float64Array;
}

/** Activations of a forward pass (kept for the backward pass). */
export interface MlpTrace {
  /** Rows in the batch. */
  readonly m: number;
  /** Layer inputs and outputs: `values[l]` is m x sizes[l] (after the activation). */
  readonly values: Float64Array[];
}

/**
 * A new MLP with weights drawn N(0, 1/fan_in) (LeCun normal) and zero biases.
 *
 * References: LeCun, Bottou, Orr & Müller 1998, Efficient BackProp.
 *
 * @example
 * ```ts
 * import { mlp } from "./mlp.ts";
 * import assert from "node:assert/strict";
 * const net = mlp({ sizes: [2, 8, 1], seed: 1 });
 * assert.equal(net.params.length, 2 * 8 + 8 + 8 + 1);
 * ```
 */
export function mlp(
  options: { sizes: readonly number[]; activation?: Activation; seed?: RandomSource },
): Mlp {
  const sizes = [...options.sizes];
  if (sizes.length < 2 || !sizes.every((s) => Number.isInteger(s) && s >= 1)) {
    throw new SaddleError(
      "invalid-argument",
      `sizes must list >= 2 positive integers (input, ..., output), got [${sizes}]`,
      { parameter: "sizes" },
    );
  }
  const activation = options.activation ?? "tanh";
  if (activation !== "tanh" && activation !== "leaky-relu") {
    throw new SaddleError("invalid-argument", `activation must be tanh or leaky-relu`, {
      parameter: "activation",
    });
  }
  let total = 0;
  for (let l = 0; l + 1 < sizes.length; l++) total += sizes[l] * sizes[l + 1] + sizes[l + 1];
  const params = new Float64Array(total);
  const r = toRng(options.seed ?? 0);
  let o = 0;
  for (let l = 0; l + 1 < sizes.length; l++) {
    const nin = sizes[l], nout = sizes[l + 1], s = 1 / Math.sqrt(nin);
    for (let i = 0; i < nin * nout; i++) params[o + i] = s * r.normal();
    o += nin * nout + nout;
  }
  return { sizes, activation, params };
}

const LEAK = 0.2;

/** Where each layer's weights start in the parameter buffer (biases follow the weights). */
function layerOffsets(sizes: readonly number[]): number[] {
  const out: number[] = [];
  let o = 0;
  for (let l = 0; l + 1 < sizes.length; l++) {
    out.push(o);
    o += sizes[l] * sizes[l + 1] + sizes[l + 1];
  }
  return out;
}

/**
 * Forward pass of `m` rows (row-major m x sizes[0]); the output is `trace.values.at(-1)`.
 *
 * @example
 * ```ts
 * import { mlp, mlpForward } from "./mlp.ts";
 * import assert from "node:assert/strict";
 * const net = mlp({ sizes: [1, 4, 1], seed: 2 });
 * const t = mlpForward(net, new Float64Array([0.5, -0.5]), 2);
 * assert.equal(t.values.at(-1)!.length, 2);
 * ```
 */
export function mlpForward(
  net: Mlp,
  x: Float64Array,
  m: number,
  params: Float64Array = net.params,
): MlpTrace {
  const { sizes } = net;
  if (x.length !== m * sizes[0]) {
    throw new SaddleError(
      "dimension-mismatch",
      `input has ${x.length} values, expected ${m} rows of ${sizes[0]}`,
      { parameter: "x" },
    );
  }
  const values: Float64Array[] = [x];
  let o = 0;
  const L = sizes.length - 1;
  for (let l = 0; l < L; l++) {
    const nin = sizes[l], nout = sizes[l + 1], inp = values[l];
    const out = new Float64Array(m * nout);
    const b = o + nin * nout;
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < nout; j++) {
        let s = params[b + j];
        const w = o + j * nin;
        for (let k = 0; k < nin; k++) s += params[w + k] * inp[i * nin + k];
        out[i * nout + j] = l === L - 1
          ? s
          : net.activation === "tanh"
          ? Math.tanh(s)
          : s > 0
          ? s
          : LEAK * s;
      }
    }
    values.push(out);
    o = b + nout;
  }
  return { m, values };
}

/**
 * Backward pass: given ∂loss/∂output (m x out), add ∂loss/∂params into `grad` and return
 * ∂loss/∂input (m x in).
 *
 * @example Gradient of the sum of outputs of a linear layer y = w x + b
 * ```ts
 * import { mlpBackward, mlpForward, type Mlp } from "./mlp.ts";
 * import assert from "node:assert/strict";
 * const net: Mlp = { sizes: [1, 1], activation: "tanh", params: Float64Array.of(3, 1) };
 * const t = mlpForward(net, Float64Array.of(2), 1);
 * const grad = new Float64Array(2);
 * const dx = mlpBackward(net, t, Float64Array.of(1), grad);
 * assert.deepEqual([...grad, ...dx], [2, 1, 3]);
 * ```
 */
export function mlpBackward(
  net: Mlp,
  trace: MlpTrace,
  dOut: Float64Array,
  grad: Float64Array,
  params: Float64Array = net.params,
): Float64Array {
  const { sizes } = net, { m, values } = trace;
  const L = sizes.length - 1;
  const offsets = layerOffsets(sizes);
  let delta = Float64Array.from(dOut);
  for (let l = L - 1; l >= 0; l--) {
    const nin = sizes[l], nout = sizes[l + 1], w0 = offsets[l], b0 = w0 + nin * nout;
    const out = values[l + 1], inp = values[l];
    if (l < L - 1) {
      // Through the activation of this layer's output.
      for (let i = 0; i < m * nout; i++) {
        const y = out[i];
        delta[i] *= net.activation === "tanh" ? 1 - y * y : y > 0 ? 1 : LEAK;
      }
    }
    const dIn = new Float64Array(m * nin);
    for (let i = 0; i < m; i++) {
      for (let j = 0; j < nout; j++) {
        const dj = delta[i * nout + j];
        if (dj === 0) continue;
        grad[b0 + j] += dj;
        const w = w0 + j * nin;
        for (let k = 0; k < nin; k++) {
          grad[w + k] += dj * inp[i * nin + k];
          dIn[i * nin + k] += dj * params[w + k];
        }
      }
    }
    delta = dIn;
  }
  return delta;
}

/**
 * The gradient penalty `(weight / 2) · mean_i ||∇_x f(x_i)||²` of a scalar-output MLP at the
 * rows of a forward trace (R1 on real rows, R2 on generated ones): returns its value and adds
 * its gradient in the parameters into `grad` (double backpropagation: the input gradient's
 * backward pass differentiated once more).
 *
 * References: Mescheder, Geiger & Nowozin 2018 (ICML), Sec. 4.1 (R1, R2); Drucker & LeCun
 * 1992 (double backpropagation).
 *
 * @example A linear unit f(x) = w·x + b: the penalty is (γ/2) |w|², its gradient γ w
 * ```ts
 * import { mlpForward, mlpGradientPenalty, type Mlp } from "./mlp.ts";
 * import assert from "node:assert/strict";
 * const net: Mlp = { sizes: [2, 1], activation: "tanh", params: Float64Array.of(3, 4, 1) };
 * const grad = new Float64Array(3);
 * const p = mlpGradientPenalty(net, mlpForward(net, Float64Array.of(1, 2), 1), 2, grad);
 * assert.equal(p, 25);
 * assert.deepEqual([...grad], [6, 8, 0]);
 * ```
 */
export function mlpGradientPenalty(
  net: Mlp,
  trace: MlpTrace,
  weight: number,
  grad: Float64Array,
  params: Float64Array = net.params,
): number {
  const { sizes } = net, { m, values } = trace;
  const L = sizes.length - 1;
  if (sizes[L] !== 1) {
    throw new SaddleError("invalid-argument", "the gradient penalty needs a scalar output", {
      parameter: "net",
    });
  }
  const off = layerOffsets(sizes);
  const tanh = net.activation === "tanh";
  const W = (l: number, j: number, k: number) => params[off[l] + j * sizes[l] + k];
  // Layer l (0-based) maps values[l] (size sizes[l]) to values[l + 1]; hidden outputs are
  // values[1..L-1]. s[l] = φ'(z) at hidden output l (1..L-1).
  let total = 0;
  // Work buffers, allocated once: s = φ'(z), g = ∂f/∂z, and the adjoints, per layer.
  const buf = () => sizes.map((n) => new Float64Array(n));
  const s = buf(), g = buf(), gBar = buf(), zBar = buf(), deltaBar = buf(), carry = buf();
  const d0 = sizes[0], n1 = sizes[1];
  const u = new Float64Array(d0), uBar = new Float64Array(d0);
  g[L][0] = 1;
  for (let i = 0; i < m; i++) {
    for (let l = 1; l < L; l++) {
      const n = sizes[l];
      for (let j = 0; j < n; j++) {
        const a = values[l][i * n + j];
        s[l][j] = tanh ? 1 - a * a : a > 0 ? 1 : LEAK;
      }
    }
    // Backward pass for ∇_x f: g[l] = ∂f/∂z at layer output l (g[L] = 1), u = W_0ᵀ g[1].
    for (let l = L - 1; l >= 1; l--) {
      const n = sizes[l], nUp = sizes[l + 1];
      for (let j = 0; j < n; j++) {
        let d = 0;
        for (let t = 0; t < nUp; t++) d += W(l, t, j) * g[l + 1][t];
        g[l][j] = d * s[l][j];
      }
    }
    let sq = 0;
    for (let k = 0; k < d0; k++) {
      let d = 0;
      for (let j = 0; j < n1; j++) d += W(0, j, k) * g[1][j];
      u[k] = d;
      sq += d * d;
      uBar[k] = (weight * d) / m;
    }
    total += (0.5 * weight * sq) / m;
    // Adjoints, through u = W_0ᵀ g[1].
    for (let j = 0; j < n1; j++) {
      let d = 0;
      for (let k = 0; k < d0; k++) {
        grad[off[0] + j * d0 + k] += g[1][j] * uBar[k];
        d += W(0, j, k) * uBar[k];
      }
      gBar[1][j] = d;
    }
    // Through g[l] = (W_lᵀ g[l+1]) ⊙ s[l], upwards; s[l] = φ'(z) feeds z̄ via φ''.
    for (let l = 1; l < L; l++) {
      const n = sizes[l], nUp = sizes[l + 1];
      for (let j = 0; j < n; j++) {
        deltaBar[l][j] = gBar[l][j] * s[l][j];
        zBar[l][j] = 0;
        if (tanh) {
          // s = 1 − a², ds/dz = −2 a s: z̄ = s̄ ds/dz with s̄ = ḡ δ.
          const a = values[l][i * n + j];
          let delta = 0;
          for (let t = 0; t < nUp; t++) delta += W(l, t, j) * g[l + 1][t];
          zBar[l][j] = gBar[l][j] * delta * (-2 * a * s[l][j]);
        }
      }
      for (let t = 0; t < nUp; t++) {
        let d = 0;
        for (let j = 0; j < n; j++) {
          grad[off[l] + t * n + j] += g[l + 1][t] * deltaBar[l][j];
          d += W(l, t, j) * deltaBar[l][j];
        }
        gBar[l + 1][t] = d;
      }
    }
    // z̄ of the hidden layers back through the forward pass (the output's z̄ is 0).
    for (let l = L - 1; l >= 1; l--) {
      const n = sizes[l], nUp = sizes[l + 1], zb = carry[l];
      for (let j = 0; j < n; j++) {
        let a = 0;
        if (l < L - 1) { for (let t = 0; t < nUp; t++) a += W(l, t, j) * carry[l + 1][t]; }
        zb[j] = zBar[l][j] + a * s[l][j];
      }
      const nin = sizes[l - 1], b0 = off[l - 1] + nin * n;
      for (let j = 0; j < n; j++) {
        grad[b0 + j] += zb[j];
        for (let k = 0; k < nin; k++) {
          grad[off[l - 1] + j * nin + k] += zb[j] * values[l - 1][i * nin + k];
        }
      }
    }
  }
  return total;
}
