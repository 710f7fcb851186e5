/**
 * The pieces of a parametric game: a data distribution, a generator family p_g(·; θ) and a
 * discriminator family D(·; φ). Expectations are weighted sums over nodes: Gauss–Hermite
 * quadrature where the distribution is Gaussian (exact for the smooth integrands here up to
 * the quadrature order), or a fixed set of draws (Monte Carlo with common random numbers),
 * so a value surface over θ stays smooth.
 *
 * @module
 */
import { gaussian } from "../density/gaussian.ts";
import { gaussianMixture } from "../density/gaussian_mixture.ts";
import type { Density } from "../density/types.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { symmetricEigen } from "../linalg/eigen.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import type { Samples } from "../samples/samples.ts";
import { toParams } from "./_vectors.ts";

/** Points `m x d` (row-major) with weights summing to 1: an expectation is a weighted sum. */
export interface WeightedPoints {
  /** Dimension of the points. */
  readonly d: number;
  /** Row-major `m x d` points. */
  readonly points: Float64Array;
  /** `m` weights, summing to 1. */
  readonly weights: Float64Array;
}

/** The generator's nodes at θ and their derivatives with respect to θ (p parameters). */
export interface GeneratorNodes extends WeightedPoints {
  /** `∂x_ik / ∂θ_j` at `[(i * d + k) * p + j]`. */
  readonly dPoints: Float64Array;
  /** `∂w_i / ∂θ_j` at `[i * p + j]`. */
  readonly dWeights: Float64Array;
}

/** How a family's gradients are obtained. */
export type GradientSource = "closed-form" | "central-difference";

/** A distribution of real data with the nodes of its expectations. */
export interface DataDistribution {
  /** Dimension. */
  readonly d: number;
  /** A short description. */
  readonly label: string;
  /** Nodes and weights of `E_data[·]`. */
  readonly nodes: WeightedPoints;
  /** "quadrature", "monte-carlo" (fixed draws) or "exact" (finitely many atoms). */
  readonly expectation: "quadrature" | "monte-carlo" | "exact";
  /** The density, when known (for D*, the JSD profile and figures). */
  readonly density?: Density;
  /** Its mean. */
  readonly mean: Float64Array;
  /** Draw `m` points (minibatches). */
  sample(m: number, seed: RandomSource): Float64Array;
}

/** A generator family p_g(·; θ). */
export interface GeneratorFamily {
  /** Dimension of the generated points. */
  readonly d: number;
  /** Names of the parameters θ. */
  readonly names: readonly string[];
  /** A short description. */
  readonly label: string;
  /** Closed-form or central-difference derivatives of the nodes. */
  readonly gradient: GradientSource;
  /** "quadrature", "monte-carlo" (common random numbers) or "exact" (atoms). */
  readonly expectation: "quadrature" | "monte-carlo" | "exact";
  /** Nodes of `E_θ[·]` with their derivatives. Throws on θ outside the family. */
  nodes(theta: Float64Array): GeneratorNodes;
  /** The density at θ, when known. */
  density?(theta: Float64Array): Density;
  /**
   * `m` draws at θ with their derivatives (a minibatch): reparameterised where the family
   * has a sampler, else resampled nodes with score-function weight derivatives.
   */
  sample(theta: Float64Array, m: number, seed: RandomSource): GeneratorNodes;
}

/** A discriminator's logits at `m` points, with the derivatives asked for. */
export interface DiscriminatorEvaluation {
  /** `l_i = logit D(x_i; φ)`. */
  readonly logit: Float64Array;
  /** `∂l_i / ∂φ_j` at `[i * q + j]`. */
  readonly dPhi: Float64Array;
  /** `∂l_i / ∂x_ik` at `[i * d + k]`. */
  readonly dX: Float64Array;
}

/** A discriminator family D(·; φ) = σ(l(·; φ)). */
export interface DiscriminatorFamily {
  /** Dimension of the points. */
  readonly d: number;
  /** Names of the parameters φ. */
  readonly names: readonly string[];
  /** A short description. */
  readonly label: string;
  /** Closed-form or central-difference derivatives. */
  readonly gradient: GradientSource;
  /** Logits and their derivatives at `m` points (row-major `m x d`). */
  evaluate(phi: Float64Array, points: Float64Array): DiscriminatorEvaluation;
  /**
   * `s_i = ||∇_x l(x_i; φ)||²` and `∂s_i / ∂φ_j` at `[i * q + j]`: the R1/R2 penalty terms.
   */
  gradientNorm(phi: Float64Array, points: Float64Array): { sq: Float64Array; dPhi: Float64Array };
  /** The parameters expressing D*(x) = p_data / (p_data + p_g) exactly, when the family can. */
  express?(data: DataDistribution, generator: GeneratorFamily, theta: Float64Array):
    | Float64Array
    | undefined;
}

/** Default step of central differences: `h = STEP * max(1, |p|)`. */
export const CENTRAL_DIFFERENCE_STEP = 1e-5;

// ---------------------------------------------------------------------------------------
// Gauss–Hermite nodes

const hermiteCache = new Map<number, { z: Float64Array; w: Float64Array }>();

/**
 * Nodes and weights of `E[f(Z)]`, Z ~ N(0, 1), by Gauss–Hermite quadrature of order `m`
 * (probabilists' Hermite polynomials; Golub–Welsch: the eigenvalues of the Jacobi matrix
 * with off-diagonal √k, weights the squared first eigenvector components). Exact for
 * polynomials of degree up to 2m − 1.
 *
 * References: Golub & Welsch 1969, Calculation of Gauss quadrature rules (Math. Comp.).
 *
 * @example E[Z²] = 1, E[Z⁴] = 3
 * ```ts
 * import { gaussHermite } from "./families.ts";
 * import assert from "node:assert/strict";
 * const { z, w } = gaussHermite(8);
 * const m = (p: number) => z.reduce((s, x, i) => s + w[i] * x ** p, 0);
 * assert.ok(Math.abs(m(2) - 1) < 1e-12 && Math.abs(m(4) - 3) < 1e-12);
 * ```
 */
export function gaussHermite(m: number): { z: Float64Array; w: Float64Array } {
  if (!Number.isInteger(m) || m < 1 || m > 200) {
    throw new SaddleError("invalid-argument", `quadrature order must be in 1..200, got ${m}`, {
      parameter: "quadrature",
    });
  }
  const hit = hermiteCache.get(m);
  if (hit) return hit;
  const a = new Float64Array(m * m);
  for (let k = 1; k < m; k++) a[k * m + k - 1] = a[(k - 1) * m + k] = Math.sqrt(k);
  const { values, vectors } = symmetricEigen(a, m);
  const w = new Float64Array(m);
  for (let k = 0; k < m; k++) w[k] = vectors[k] ** 2;
  let s = 0;
  for (const v of w) s += v;
  for (let k = 0; k < m; k++) w[k] /= s;
  const out = { z: Float64Array.from(values), w };
  hermiteCache.set(m, out);
  return out;
}

/** Standard normal nodes in d dimensions: a tensor Gauss–Hermite grid or fixed draws. */
function baseNodes(d: number, e: ExpectationOptions): { z: Float64Array; w: Float64Array } {
  if (e.monteCarlo !== undefined) {
    const n = e.monteCarlo;
    if (!Number.isInteger(n) || n < 1) {
      throw new SaddleError("invalid-argument", `monteCarlo must be a draw count >= 1, got ${n}`, {
        parameter: "monteCarlo",
      });
    }
    const r = toRng(e.seed ?? 0);
    return { z: r.fillNormal(new Float64Array(n * d)), w: new Float64Array(n).fill(1 / n) };
  }
  const q = gaussHermite(e.quadrature ?? (d === 1 ? 80 : 24));
  const m = q.z.length;
  if (d === 1) return { z: q.z, w: q.w };
  const total = m ** d;
  const z = new Float64Array(total * d), w = new Float64Array(total);
  for (let i = 0; i < total; i++) {
    let rest = i, wi = 1;
    for (let k = 0; k < d; k++) {
      const j = rest % m;
      rest = (rest - j) / m;
      z[i * d + k] = q.z[j];
      wi *= q.w[j];
    }
    w[i] = wi;
  }
  return { z, w };
}

/** How expectations over a Gaussian are computed. */
export interface ExpectationOptions {
  /** Gauss–Hermite nodes per dimension (default 80 in 1-D, 24 in 2-D). */
  quadrature?: number;
  /** Instead: this many fixed standard normal draws (Monte Carlo, common random numbers). */
  monteCarlo?: number;
  /** Seed of the draws (default 0). */
  seed?: RandomSource;
}

function vec(x: number | ArrayLike<number>, name: string, d?: number): Float64Array {
  return toParams(x, d, name);
}

function positive(v: Float64Array, name: string): void {
  for (const [i, t] of v.entries()) {
    if (!(t > 0)) {
      throw new SaddleError("invalid-argument", `${name}[${i}] must be > 0, got ${t}`, {
        parameter: name,
      });
    }
  }
}

function diagCov(sd: Float64Array): number[][] {
  return Array.from(sd, (s, i) => Array.from(sd, (_, j) => (i === j ? s * s : 0)));
}

/** Resample nodes by weight; score-function derivatives keep the weights' gradient. */
function resampleNodes(
  n: GeneratorNodes,
  p: number,
  m: number,
  seed: RandomSource,
): GeneratorNodes {
  const d = n.d, draw = toRng(seed).categoricalSampler(n.weights);
  const points = new Float64Array(m * d), weights = new Float64Array(m).fill(1 / m);
  const dPoints = new Float64Array(m * d * p), dWeights = new Float64Array(m * p);
  for (let s = 0; s < m; s++) {
    const i = draw();
    for (let k = 0; k < d; k++) {
      points[s * d + k] = n.points[i * d + k];
      for (let j = 0; j < p; j++) dPoints[(s * d + k) * p + j] = n.dPoints[(i * d + k) * p + j];
    }
    for (let j = 0; j < p; j++) dWeights[s * p + j] = n.dWeights[i * p + j] / n.weights[i] / m;
  }
  return { d, points, weights, dPoints, dWeights };
}

// ---------------------------------------------------------------------------------------
// Data distributions

/**
 * Gaussian data N(mean, diag(sd²)) in 1-D or 2-D; expectations by Gauss–Hermite quadrature
 * (or fixed draws with `monteCarlo`).
 *
 * @example
 * ```ts
 * import { gaussianData } from "./families.ts";
 * import assert from "node:assert/strict";
 * const data = gaussianData({ mean: 2, sd: 0.5 });
 * const { points, weights } = data.nodes;
 * assert.ok(Math.abs(points.reduce((s, x, i) => s + weights[i] * x, 0) - 2) < 1e-12);
 * ```
 */
export function gaussianData(
  options:
    & { mean: number | ArrayLike<number>; sd?: number | ArrayLike<number> }
    & ExpectationOptions,
): DataDistribution {
  const mean = vec(options.mean, "mean");
  const d = mean.length;
  const sdIn = options.sd ?? 1;
  const sd = typeof sdIn === "number" ? new Float64Array(d).fill(sdIn) : vec(sdIn, "sd", d);
  positive(sd, "sd");
  const { z, w } = baseNodes(d, options);
  const m = w.length, points = new Float64Array(m * d);
  for (let i = 0; i < m; i++) {
    for (let k = 0; k < d; k++) points[i * d + k] = mean[k] + sd[k] * z[i * d + k];
  }
  const density = gaussian(mean, diagCov(sd));
  return {
    d,
    label: `N(${fmtVec(mean)}, sd ${fmtVec(sd)})`,
    nodes: { d, points, weights: w },
    expectation: options.monteCarlo !== undefined ? "monte-carlo" : "quadrature",
    density,
    mean,
    sample: (n, seed) => density.sample(n, seed).data,
  };
}

/**
 * Data at a single point (a Dirac mass), as in the Dirac game of Mescheder et al. 2018.
 *
 * @example
 * ```ts
 * import { diracData } from "./families.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual([...diracData(0).nodes.points], [0]);
 * ```
 */
export function diracData(at: number | ArrayLike<number> = 0): DataDistribution {
  const mean = vec(at, "at");
  const d = mean.length;
  return {
    d,
    label: `δ(${fmtVec(mean)})`,
    nodes: { d, points: Float64Array.from(mean), weights: Float64Array.of(1) },
    expectation: "exact",
    mean,
    sample: (n) => {
      const out = new Float64Array(n * d);
      for (let i = 0; i < n; i++) out.set(mean, i * d);
      return out;
    },
  };
}

/** Modes of a Gaussian mixture with isotropic components. */
export interface MixtureSpec {
  /** Component means (numbers in 1-D, vectors in d-D). */
  means: readonly (number | ArrayLike<number>)[];
  /** Common isotropic standard deviation of the components. */
  sd: number;
  /** Component weights (default equal). */
  weights?: ArrayLike<number>;
}

function mixtureParts(spec: MixtureSpec): { means: Float64Array[]; d: number; w: Float64Array } {
  if (spec.means.length === 0) {
    throw new SaddleError("empty", "a mixture needs at least one mean", { parameter: "means" });
  }
  const means = spec.means.map((m, i) => vec(m, `means[${i}]`));
  const d = means[0].length;
  means.forEach((m, i) => vec(m, `means[${i}]`, d));
  positive(Float64Array.of(spec.sd), "sd");
  const w = spec.weights
    ? vec(spec.weights, "weights", means.length)
    : new Float64Array(means.length).fill(1);
  for (const [i, t] of w.entries()) {
    if (!(t >= 0)) {
      throw new SaddleError("invalid-argument", `weights[${i}] must be >= 0, got ${t}`, {
        parameter: "weights",
      });
    }
  }
  const s = w.reduce((a, b) => a + b, 0);
  if (!(s > 0)) {
    throw new SaddleError("invalid-argument", "weights are all 0", { parameter: "weights" });
  }
  return { means, d, w: w.map((t) => t / s) };
}

function mixtureDensity(means: Float64Array[], sd: number, w: Float64Array): Density {
  const d = means[0].length;
  return gaussianMixture({
    weights: w,
    means,
    covariances: means.map(() => (d === 1 ? sd * sd : diagCov(new Float64Array(d).fill(sd)))),
  });
}

/**
 * Data from a mixture of isotropic Gaussians; expectations by quadrature per component.
 *
 * @example
 * ```ts
 * import { mixtureData } from "./families.ts";
 * import assert from "node:assert/strict";
 * const data = mixtureData({ means: [-2, 2], sd: 0.5 });
 * assert.ok(Math.abs(data.mean[0]) < 1e-12);
 * ```
 */
export function mixtureData(spec: MixtureSpec & ExpectationOptions): DataDistribution {
  const { means, d, w } = mixtureParts(spec);
  const { z, w: zw } = baseNodes(d, spec);
  const m = zw.length, K = means.length;
  const points = new Float64Array(K * m * d), weights = new Float64Array(K * m);
  const mean = new Float64Array(d);
  for (let c = 0; c < K; c++) {
    for (let k = 0; k < d; k++) mean[k] += w[c] * means[c][k];
    for (let i = 0; i < m; i++) {
      weights[c * m + i] = w[c] * zw[i];
      for (let k = 0; k < d; k++) {
        points[(c * m + i) * d + k] = means[c][k] + spec.sd * z[i * d + k];
      }
    }
  }
  const density = mixtureDensity(means, spec.sd, w);
  return {
    d,
    label: `mixture of ${K} Gaussians (sd ${spec.sd})`,
    nodes: { d, points, weights },
    expectation: spec.monteCarlo !== undefined ? "monte-carlo" : "quadrature",
    density,
    mean,
    sample: (n, seed) => density.sample(n, seed).data,
  };
}

/**
 * Data given as samples: expectations are sample means.
 *
 * @example
 * ```ts
 * import { samplesData } from "./families.ts";
 * import { samples } from "../samples/samples.ts";
 * import assert from "node:assert/strict";
 * assert.equal(samplesData(samples([1, 2, 3])).mean[0], 2);
 * ```
 */
export function samplesData(s: Samples): DataDistribution {
  const d = s.d, n = s.n, mean = new Float64Array(d);
  for (let i = 0; i < n; i++) for (let k = 0; k < d; k++) mean[k] += s.data[i * d + k] / n;
  return {
    d,
    label: `${n} samples`,
    nodes: { d, points: s.data, weights: new Float64Array(n).fill(1 / n) },
    expectation: "monte-carlo",
    mean,
    sample: (m, seed) => {
      const r = toRng(seed), out = new Float64Array(m * d);
      for (let i = 0; i < m; i++) {
        const j = r.integer(n);
        for (let k = 0; k < d; k++) out[i * d + k] = s.data[j * d + k];
      }
      return out;
    },
  };
}

// ---------------------------------------------------------------------------------------
// Generator families

/** Options of {@linkcode gaussianGenerator}. */
export interface GaussianGeneratorOptions extends ExpectationOptions {
  /** Dimension, 1 or 2 (default 1). */
  d?: 1 | 2;
  /** "location" (θ = mean, sd fixed) or "location-scale" (θ = mean and sd per coordinate). */
  family?: "location" | "location-scale";
  /** The fixed sd of the "location" family (default 1; 0 gives a point mass, the Dirac game). */
  sd?: number;
}

/**
 * Gaussian generators x = μ + σ z, z ~ N(0, I): θ = μ ("location", σ fixed) or θ = (μ, σ)
 * ("location-scale", diagonal σ). Closed-form derivatives (∂x/∂μ = 1, ∂x/∂σ = z).
 * `sd: 0` in the location family is a point mass at θ (Mescheder et al. 2018).
 *
 * @example
 * ```ts
 * import { gaussianGenerator } from "./families.ts";
 * import assert from "node:assert/strict";
 * const g = gaussianGenerator({ family: "location-scale" });
 * assert.deepEqual(g.names, ["mu", "sigma"]);
 * assert.throws(() => g.nodes(Float64Array.of(0, -1)), /sigma/);
 * ```
 */
export function gaussianGenerator(options: GaussianGeneratorOptions = {}): GeneratorFamily {
  const d = options.d ?? 1;
  if (d !== 1 && d !== 2) {
    throw new SaddleError("invalid-argument", `d must be 1 or 2, got ${d}`, { parameter: "d" });
  }
  const scale = (options.family ?? "location") === "location-scale";
  const fixedSd = options.sd ?? 1;
  if (!(fixedSd >= 0) || !Number.isFinite(fixedSd)) {
    throw new SaddleError("invalid-argument", `sd must be >= 0, got ${fixedSd}`, {
      parameter: "sd",
    });
  }
  const point = !scale && fixedSd === 0;
  const idx = (s: string) => (d === 1 ? [s] : [`${s}1`, `${s}2`]);
  const names = scale ? [...idx("mu"), ...idx("sigma")] : idx(point ? "theta" : "mu");
  const p = names.length;
  const base = point ? { z: new Float64Array(d), w: Float64Array.of(1) } : baseNodes(d, options);
  const split = (theta: Float64Array) => {
    const t = vec(theta, "theta", p);
    const mu = t.subarray(0, d);
    const sd = scale ? t.subarray(d) : new Float64Array(d).fill(fixedSd);
    if (scale) positive(sd, "theta (sigma)");
    return { mu, sd };
  };
  const build = (theta: Float64Array, z: Float64Array, w: Float64Array): GeneratorNodes => {
    const { mu, sd } = split(theta);
    const m = w.length;
    const points = new Float64Array(m * d), dPoints = new Float64Array(m * d * p);
    for (let i = 0; i < m; i++) {
      for (let k = 0; k < d; k++) {
        points[i * d + k] = mu[k] + sd[k] * z[i * d + k];
        dPoints[(i * d + k) * p + k] = 1;
        if (scale) dPoints[(i * d + k) * p + d + k] = z[i * d + k];
      }
    }
    return { d, points, weights: w, dPoints, dWeights: new Float64Array(m * p) };
  };
  return {
    d,
    names,
    label: point
      ? `point mass at θ (${d}-D)`
      : scale
      ? `Gaussian location-scale (${d}-D)`
      : `Gaussian location, sd ${fixedSd} (${d}-D)`,
    gradient: "closed-form",
    expectation: point ? "exact" : options.monteCarlo !== undefined ? "monte-carlo" : "quadrature",
    nodes: (theta) => build(theta, base.z, base.w),
    ...(point ? {} : {
      density: (theta: Float64Array) => {
        const { mu, sd } = split(theta);
        return gaussian(mu, diagCov(sd));
      },
    }),
    sample: (theta, m, seed) =>
      point ? build(theta, new Float64Array(m * d), new Float64Array(m).fill(1 / m)) : build(
        theta,
        toRng(seed).fillNormal(new Float64Array(m * d)),
        new Float64Array(m).fill(1 / m),
      ),
  };
}

/**
 * A mixture-weight generator: fixed isotropic Gaussian components, θ = the weights of
 * components 2..K (the first takes the rest). Closed-form derivatives of the weights.
 *
 * @example
 * ```ts
 * import { mixtureWeightGenerator } from "./families.ts";
 * import assert from "node:assert/strict";
 * const g = mixtureWeightGenerator({ means: [-2, 2], sd: 0.5 });
 * assert.deepEqual(g.names, ["w2"]);
 * const n = g.nodes(Float64Array.of(0.25));
 * assert.ok(Math.abs(n.weights.reduce((a, b) => a + b, 0) - 1) < 1e-12);
 * ```
 */
export function mixtureWeightGenerator(
  spec: Omit<MixtureSpec, "weights"> & ExpectationOptions,
): GeneratorFamily {
  const { means, d } = mixtureParts(spec);
  const K = means.length, p = K - 1;
  if (p < 1) {
    throw new SaddleError("invalid-argument", "a mixture-weight generator needs >= 2 means", {
      parameter: "means",
    });
  }
  const { z, w: zw } = baseNodes(d, spec);
  const m = zw.length;
  const points = new Float64Array(K * m * d);
  for (let c = 0; c < K; c++) {
    for (let i = 0; i < m; i++) {
      for (let k = 0; k < d; k++) {
        points[(c * m + i) * d + k] = means[c][k] + spec.sd * z[i * d + k];
      }
    }
  }
  const weightsOf = (theta: Float64Array) => {
    const t = vec(theta, "theta", p);
    const sum = t.reduce((a, b) => a + b, 0);
    const w = Float64Array.of(1 - sum, ...t);
    for (const [i, x] of w.entries()) {
      if (!(x >= 0 && x <= 1)) {
        throw new SaddleError(
          "invalid-argument",
          `mixture weight ${i + 1} is ${x}; θ must keep every weight in [0, 1]`,
          { parameter: "theta" },
        );
      }
    }
    return w;
  };
  const dPoints = new Float64Array(K * m * d * p);
  const dWeights = new Float64Array(K * m * p);
  for (let i = 0; i < m; i++) {
    for (let j = 0; j < p; j++) {
      dWeights[i * p + j] = -zw[i];
      dWeights[((j + 1) * m + i) * p + j] = zw[i];
    }
  }
  const nodes = (theta: Float64Array): GeneratorNodes => {
    const w = weightsOf(theta);
    const weights = new Float64Array(K * m);
    for (let c = 0; c < K; c++) for (let i = 0; i < m; i++) weights[c * m + i] = w[c] * zw[i];
    return { d, points, weights, dPoints, dWeights };
  };
  return {
    d,
    names: Array.from({ length: p }, (_, j) => `w${j + 2}`),
    label: `mixture weights of ${K} Gaussians (sd ${spec.sd})`,
    gradient: "closed-form",
    expectation: spec.monteCarlo !== undefined ? "monte-carlo" : "quadrature",
    nodes,
    density: (theta) => mixtureDensity(means, spec.sd, weightsOf(theta)),
    sample: (theta, n, seed) => resampleNodes(nodes(theta), p, n, seed),
  };
}

/** Options of {@linkcode customGenerator}: a reparameterised sampler or a log-density. */
export interface CustomGeneratorOptions {
  /** Dimension of the points. */
  d: number;
  /** Names of θ. */
  names: readonly string[];
  /** Description (default "custom generator"). */
  label?: string;
  /** x = g(θ, z) for a standard normal z of `noiseDim` entries (written into `out`). */
  sample?: (theta: Float64Array, z: Float64Array, out: Float64Array) => void;
  /** Noise dimension of `sample` (default d). */
  noiseDim?: number;
  /** Draws of z (common random numbers; default 2000). */
  draws?: number;
  /** Or: log p_θ(x) for one point, integrated on a grid over `bounds`. */
  logPdf?: (theta: Float64Array, x: Float64Array) => number;
  /** Grid range per dimension for `logPdf`. */
  bounds?: readonly (readonly [number, number])[];
  /** Grid points per dimension for `logPdf` (default 400 in 1-D, 60 in 2-D). */
  gridSize?: number;
  /** Central-difference step factor (default {@linkcode CENTRAL_DIFFERENCE_STEP}). */
  step?: number;
  /** Seed of the z draws (default 0). */
  seed?: RandomSource;
}

/**
 * A user's generator family, from a reparameterised sampler x = g(θ, z) (Monte Carlo over
 * fixed draws of z: common random numbers) or from a log-density (quadrature on a grid).
 * Derivatives with respect to θ by central differences with step h = step · max(1, |θ_j|).
 *
 * @example A shifted exponential, by its sampler
 * ```ts
 * import { customGenerator } from "./families.ts";
 * import assert from "node:assert/strict";
 * const g = customGenerator({
 *   d: 1, names: ["shift"], draws: 500,
 *   sample: (t, z, out) => { out[0] = t[0] + z[0] * z[0]; },
 * });
 * const n = g.nodes(Float64Array.of(1));
 * assert.ok(Math.abs(n.dPoints[0] - 1) < 1e-8);
 * ```
 */
export function customGenerator(options: CustomGeneratorOptions): GeneratorFamily {
  const { d, names } = options;
  const p = names.length;
  const step = options.step ?? CENTRAL_DIFFERENCE_STEP;
  if (!Number.isInteger(d) || d < 1) {
    throw new SaddleError("invalid-argument", `d must be a positive integer, got ${d}`, {
      parameter: "d",
    });
  }
  let raw: (theta: Float64Array) => WeightedPoints;
  let density: ((theta: Float64Array) => Density) | undefined;
  if (options.sample) {
    const f = options.sample, nz = options.noiseDim ?? d, m = options.draws ?? 2000;
    const z = toRng(options.seed ?? 0).fillNormal(new Float64Array(m * nz));
    const w = new Float64Array(m).fill(1 / m);
    raw = (theta) => {
      const points = new Float64Array(m * d);
      for (let i = 0; i < m; i++) {
        f(theta, z.subarray(i * nz, (i + 1) * nz), points.subarray(i * d, (i + 1) * d));
      }
      return { d, points, weights: w };
    };
  } else if (options.logPdf && options.bounds) {
    const lp = options.logPdf, b = options.bounds;
    if (b.length !== d) {
      throw new SaddleError("dimension-mismatch", `bounds needs ${d} ranges`, {
        parameter: "bounds",
      });
    }
    const g = options.gridSize ?? (d === 1 ? 400 : 60);
    const m = g ** d, points = new Float64Array(m * d);
    for (let i = 0; i < m; i++) {
      let r = i;
      for (let k = 0; k < d; k++) {
        const j = r % g;
        r = (r - j) / g;
        points[i * d + k] = b[k][0] + ((j + 0.5) * (b[k][1] - b[k][0])) / g;
      }
    }
    raw = (theta) => {
      const l = new Float64Array(m);
      let top = -Infinity;
      for (let i = 0; i < m; i++) {
        l[i] = lp(theta, points.subarray(i * d, (i + 1) * d));
        if (l[i] > top) top = l[i];
      }
      if (!(top > -Infinity) || !Number.isFinite(top)) {
        throw new SaddleError("numerical", "logPdf has no finite mass on the grid; widen bounds", {
          parameter: "logPdf",
        });
      }
      let s = 0;
      for (let i = 0; i < m; i++) s += l[i] = Math.exp(l[i] - top);
      for (let i = 0; i < m; i++) l[i] /= s;
      return { d, points, weights: l };
    };
  } else {
    throw new SaddleError("invalid-argument", "give sample(θ, z, out), or logPdf with bounds", {
      parameter: "sample",
    });
  }
  const nodes = (theta: Float64Array): GeneratorNodes => {
    const t = vec(theta, "theta", p);
    const c = raw(t), m = c.weights.length;
    const dPoints = new Float64Array(m * d * p), dWeights = new Float64Array(m * p);
    for (let j = 0; j < p; j++) {
      const h = step * Math.max(1, Math.abs(t[j]));
      const tp = Float64Array.from(t), tm = Float64Array.from(t);
      tp[j] += h;
      tm[j] -= h;
      const a = raw(tp), bb = raw(tm);
      for (let i = 0; i < m; i++) {
        dWeights[i * p + j] = (a.weights[i] - bb.weights[i]) / (2 * h);
        for (let k = 0; k < d; k++) {
          dPoints[(i * d + k) * p + j] = (a.points[i * d + k] - bb.points[i * d + k]) / (2 * h);
        }
      }
    }
    return { d, points: c.points, weights: c.weights, dPoints, dWeights };
  };
  return {
    d,
    names: [...names],
    label: options.label ?? "custom generator",
    gradient: "central-difference",
    expectation: options.sample ? "monte-carlo" : "quadrature",
    nodes,
    ...(density ? { density } : {}),
    sample: (theta, m, seed) => resampleNodes(nodes(theta), p, m, seed),
  };
}

// ---------------------------------------------------------------------------------------
// Discriminator families

/** Options of {@linkcode logisticDiscriminator}. */
export interface LogisticDiscriminatorOptions {
  /** Dimension, 1 or 2 (default 1). */
  d?: 1 | 2;
  /** "linear" (x) or "quadratic" (x and its products) features (default "linear"). */
  features?: "linear" | "quadratic";
  /** Include a bias term (default true). */
  bias?: boolean;
  /** Parameter names (default b, w…, a…). */
  names?: readonly string[];
}

/**
 * Logistic discriminators D(x; φ) = σ(φ · f(x)) on linear features f = (1, x) or quadratic
 * ones f = (1, x, products of x), with closed-form derivatives in φ and x and of the
 * squared input-gradient norm (the R1/R2 penalty). The quadratic family contains D* of two
 * Gaussians (their log-ratio is quadratic); the linear one that of two Gaussians with equal
 * covariance.
 *
 * @example
 * ```ts
 * import { logisticDiscriminator } from "./families.ts";
 * import assert from "node:assert/strict";
 * const D = logisticDiscriminator({ features: "quadratic" });
 * assert.deepEqual(D.names, ["b", "w", "a"]);
 * const e = D.evaluate(Float64Array.of(0, 1, 1), Float64Array.of(2));
 * assert.equal(e.logit[0], 6); // 0 + 2 + 4
 * assert.equal(e.dX[0], 5); // 1 + 2 * 2
 * ```
 */
export function logisticDiscriminator(
  options: LogisticDiscriminatorOptions = {},
): DiscriminatorFamily {
  const d = options.d ?? 1;
  if (d !== 1 && d !== 2) {
    throw new SaddleError("invalid-argument", `d must be 1 or 2, got ${d}`, { parameter: "d" });
  }
  const quad = (options.features ?? "linear") === "quadratic";
  const bias = options.bias ?? true;
  // Feature list: [bias], x_k, then x_a x_b for a <= b.
  const pairs: [number, number][] = [];
  if (quad) { for (let a = 0; a < d; a++) for (let b = a; b < d; b++) pairs.push([a, b]); }
  const o = bias ? 1 : 0;
  const q = o + d + pairs.length;
  const defaults = [
    ...(bias ? ["b"] : []),
    ...(d === 1 ? ["w"] : ["w1", "w2"]),
    ...pairs.map(([a, b]) => (d === 1 ? "a" : `a${a + 1}${b + 1}`)),
  ];
  const names = options.names ? [...options.names] : defaults;
  if (names.length !== q) {
    throw new SaddleError("dimension-mismatch", `names needs ${q} entries, got ${names.length}`, {
      parameter: "names",
    });
  }
  /** Gradient of the logit in x at one point, into g. */
  const gradX = (phi: Float64Array, x: Float64Array, i: number, g: Float64Array) => {
    for (let k = 0; k < d; k++) g[k] = phi[o + k];
    pairs.forEach(([a, b], t) => {
      const c = phi[o + d + t];
      g[a] += c * x[i * d + b];
      g[b] += c * x[i * d + a];
    });
  };
  const check = (phi: Float64Array) => vec(phi, "phi", q);
  return {
    d,
    names,
    label: `logistic on ${quad ? "quadratic" : "linear"} features${
      bias ? "" : ", no bias"
    } (${d}-D)`,
    gradient: "closed-form",
    evaluate: (phiIn, x) => {
      const phi = check(phiIn);
      const m = x.length / d;
      const logit = new Float64Array(m),
        dPhi = new Float64Array(m * q),
        dX = new Float64Array(m * d);
      const g = new Float64Array(d);
      for (let i = 0; i < m; i++) {
        let l = 0;
        if (bias) {
          l += phi[0];
          dPhi[i * q] = 1;
        }
        for (let k = 0; k < d; k++) {
          l += phi[o + k] * x[i * d + k];
          dPhi[i * q + o + k] = x[i * d + k];
        }
        pairs.forEach(([a, b], t) => {
          const f = x[i * d + a] * x[i * d + b];
          l += phi[o + d + t] * f;
          dPhi[i * q + o + d + t] = f;
        });
        logit[i] = l;
        gradX(phi, x, i, g);
        dX.set(g, i * d);
      }
      return { logit, dPhi, dX };
    },
    gradientNorm: (phiIn, x) => {
      const phi = check(phiIn);
      const m = x.length / d;
      const sq = new Float64Array(m), dPhi = new Float64Array(m * q), g = new Float64Array(d);
      for (let i = 0; i < m; i++) {
        gradX(phi, x, i, g);
        let s = 0;
        for (let k = 0; k < d; k++) {
          s += g[k] * g[k];
          dPhi[i * q + o + k] = 2 * g[k];
        }
        sq[i] = s;
        pairs.forEach(([a, b], t) => {
          dPhi[i * q + o + d + t] = 2 * (g[a] * x[i * d + b] + g[b] * x[i * d + a]);
        });
      }
      return { sq, dPhi };
    },
    express: (data, gen, theta) => {
      // D* of two Gaussians: logit = ln p_data - ln p_g, a quadratic in x; linear when the
      // quadratic part vanishes.
      const pd = data.density, pg = gen.density?.(theta);
      if (!pd || !pg || pd.describe().kind !== "gaussian" || pg.describe().kind !== "gaussian") {
        return undefined;
      }
      const coef = fitQuadratic(pd, pg, d);
      const out = new Float64Array(q);
      if (bias) out[0] = coef.c;
      else if (Math.abs(coef.c) > 1e-9) return undefined;
      for (let k = 0; k < d; k++) out[o + k] = coef.lin[k];
      const used = new Set<number>();
      for (const [t, [a, b]] of pairs.entries()) {
        out[o + d + t] = a === b ? coef.quad[a * d + a] : 2 * coef.quad[a * d + b];
        used.add(a * d + b);
      }
      for (let a = 0; a < d; a++) {
        for (let b = a; b < d; b++) {
          if (!used.has(a * d + b) && Math.abs(coef.quad[a * d + b]) > 1e-9) return undefined;
        }
      }
      return out;
    },
  };
}

/** ln p(x) - ln q(x) = c + lin·x + xᵀ Q x, read off by evaluating at a few points. */
function fitQuadratic(p: Density, q: Density, d: number) {
  const at = (x: number[]) => {
    const s = { n: 1, d, data: Float64Array.from(x) } as Samples;
    return p.logPdf(s)[0] - q.logPdf(s)[0];
  };
  const zero = new Array(d).fill(0);
  const c = at(zero);
  const lin = new Float64Array(d), quad = new Float64Array(d * d);
  for (let k = 0; k < d; k++) {
    const e = zero.slice();
    e[k] = 1;
    const fp = at(e);
    e[k] = -1;
    const fm = at(e);
    lin[k] = (fp - fm) / 2;
    quad[k * d + k] = (fp + fm) / 2 - c;
  }
  for (let a = 0; a < d; a++) {
    for (let b = a + 1; b < d; b++) {
      const e = zero.slice();
      e[a] = 1;
      e[b] = 1;
      const v = at(e) - c - lin[a] - lin[b] - quad[a * d + a] - quad[b * d + b];
      quad[a * d + b] = quad[b * d + a] = v / 2;
    }
  }
  return { c, lin, quad };
}

/** Options of {@linkcode customDiscriminator}. */
export interface CustomDiscriminatorOptions {
  /** Dimension of the points. */
  d: number;
  /** Names of φ. */
  names: readonly string[];
  /** The logit l(x; φ) at one point. */
  logit: (phi: Float64Array, x: Float64Array) => number;
  /** Description (default "custom discriminator"). */
  label?: string;
  /** Central-difference step factor (default {@linkcode CENTRAL_DIFFERENCE_STEP}). */
  step?: number;
}

/**
 * A user's discriminator family from its logit function; derivatives in φ and x by central
 * differences with step h = step · max(1, |value|) (and of the squared input-gradient norm
 * by central differences of those).
 *
 * @example
 * ```ts
 * import { customDiscriminator } from "./families.ts";
 * import assert from "node:assert/strict";
 * const D = customDiscriminator({ d: 1, names: ["s"], logit: (p, x) => Math.tanh(p[0] * x[0]) });
 * const e = D.evaluate(Float64Array.of(0.5), Float64Array.of(1));
 * assert.ok(Math.abs(e.dPhi[0] - (1 - Math.tanh(0.5) ** 2)) < 1e-8);
 * ```
 */
export function customDiscriminator(options: CustomDiscriminatorOptions): DiscriminatorFamily {
  const { d, names, logit: f } = options;
  const q = names.length, step = options.step ?? CENTRAL_DIFFERENCE_STEP;
  const evaluate = (phiIn: Float64Array, x: Float64Array): DiscriminatorEvaluation => {
    const phi = vec(phiIn, "phi", q);
    const m = x.length / d;
    const logit = new Float64Array(m), dPhi = new Float64Array(m * q), dX = new Float64Array(m * d);
    const xi = new Float64Array(d), pp = Float64Array.from(phi);
    for (let i = 0; i < m; i++) {
      xi.set(x.subarray(i * d, (i + 1) * d));
      logit[i] = f(phi, xi);
      for (let j = 0; j < q; j++) {
        const h = step * Math.max(1, Math.abs(phi[j]));
        pp[j] = phi[j] + h;
        const a = f(pp, xi);
        pp[j] = phi[j] - h;
        const b = f(pp, xi);
        pp[j] = phi[j];
        dPhi[i * q + j] = (a - b) / (2 * h);
      }
      for (let k = 0; k < d; k++) {
        const v = xi[k], h = step * Math.max(1, Math.abs(v));
        xi[k] = v + h;
        const a = f(phi, xi);
        xi[k] = v - h;
        const b = f(phi, xi);
        xi[k] = v;
        dX[i * d + k] = (a - b) / (2 * h);
      }
    }
    return { logit, dPhi, dX };
  };
  const sqNorm = (phi: Float64Array, x: Float64Array) => {
    const { dX } = evaluate(phi, x);
    const m = x.length / d, sq = new Float64Array(m);
    for (let i = 0; i < m; i++) for (let k = 0; k < d; k++) sq[i] += dX[i * d + k] ** 2;
    return sq;
  };
  return {
    d,
    names: [...names],
    label: options.label ?? "custom discriminator",
    gradient: "central-difference",
    evaluate,
    gradientNorm: (phi, x) => {
      const m = x.length / d, sq = sqNorm(phi, x), dPhi = new Float64Array(m * q);
      const pp = Float64Array.from(phi);
      // The nested differences need a larger outer step to stay above rounding.
      for (let j = 0; j < q; j++) {
        const h = Math.sqrt(step) * Math.max(1, Math.abs(phi[j]));
        pp[j] = phi[j] + h;
        const a = sqNorm(pp, x);
        pp[j] = phi[j] - h;
        const b = sqNorm(pp, x);
        pp[j] = phi[j];
        for (let i = 0; i < m; i++) dPhi[i * q + j] = (a[i] - b[i]) / (2 * h);
      }
      return { sq, dPhi };
    },
  };
}

/** Short text of a vector. */
export function fmtVec(v: ArrayLike<number>): string {
  const s = Array.from(v, (x) => String(Math.round(x * 1e4) / 1e4));
  return s.length === 1 ? s[0] : `(${s.join(", ")})`;
}
