/**
 * Gaussian mixtures fitted by expectation–maximisation: full, diagonal or spherical
 * covariances, k-means++ initialisation, restarts, a covariance floor, responsibilities in
 * log space.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { linalgBackend } from "../linalg/backend.ts";
import { symmetricEigen } from "../linalg/eigen.ts";
import { covariance as sampleCovariance } from "../linalg/moments.ts";
import { type RandomSource, type Rng, toRng } from "../random/rng.ts";
import { type Samples, samples, type SamplesInput } from "../samples/samples.ts";
import { type MatrixInput, toMatrix, toVector } from "./_common.ts";
import { EmEngine } from "./_em_engine.ts";
import { addMoments, type PassStats } from "./_em_pass.ts";
import { kmeansPlusPlus } from "./_kmeans.ts";
import { gaussian } from "./gaussian.ts";
import { type GaussianMixtureDensity, mixtureFromComponents } from "./gaussian_mixture.ts";

/** Covariance structure of the components. */
export type CovarianceType = "full" | "diag" | "spherical";

/** Explicit starting parameters (all components); covariances default to the data's. */
export interface MixtureInit {
  /** Initial weights (default equal). */
  readonly weights?: ArrayLike<number>;
  /** Initial means, one per component. */
  readonly means: readonly (number | ArrayLike<number>)[];
  /** Initial covariances (default: the data covariance for every component). */
  readonly covariances?: readonly MatrixInput[];
}

/** Options of {@linkcode fitGaussianMixture}. */
export interface GaussianMixtureFitOptions {
  /** Number of components (default 1). */
  components?: number;
  /** Covariance structure (default "full"). */
  covariance?: CovarianceType;
  /** Seed of the k-means++ initialisation (default 0). */
  seed?: RandomSource;
  /** Independent k-means++ starts; the best final log-likelihood wins (default 3). */
  restarts?: number;
  /** Added to every covariance diagonal at each M-step: the covariance floor (default 1e-6). */
  regularization?: number;
  /** Stop when the mean log-likelihood changes by less than this (default 1e-6 nats). */
  tol?: number;
  /** Maximum EM iterations per start (default 200). */
  maxIter?: number;
  /** Start from these parameters instead of k-means++ (then `restarts` is 1). */
  init?: MixtureInit;
  /**
   * Web Workers sharing the E-step (default: cores - 1 when n k d² >= 2e7, else 0; 0 from
   * d = 32 on the native linear-algebra backend, whose kernels use every core). The result
   * has the same bits whatever the number of workers.
   */
  workers?: number;
}

/** A fitted mixture: the density plus what the fit found. */
export interface GaussianMixtureFit extends GaussianMixtureDensity {
  /** Mean log-likelihood per sample at the fitted parameters (nats). */
  readonly logLikelihood: number;
  /** EM iterations of the winning start. */
  readonly iterations: number;
  /**
   * Whether the winning start met `tol` within `maxIter` with no degenerate component
   * (false when a component collapsed, even if EM met `tol`: see `degenerate`).
   */
  readonly converged: boolean;
  /**
   * Components (0-based) that collapsed: fewer than d + 1 effective points (n w_j), or a
   * covariance whose smallest eigenvalue is within 10x of the `regularization` floor.
   */
  readonly degenerate: readonly number[];
  /** Free parameters of the model. */
  readonly nParameters: number;
  /** Bayesian information criterion `-2 LL + p ln n` (Schwarz 1978); lower is better. */
  readonly bic: number;
  /** Akaike information criterion `-2 LL + 2 p` (Akaike 1974); lower is better. */
  readonly aic: number;
  /** Covariance structure fitted. */
  readonly covarianceType: CovarianceType;
}

interface Params {
  w: Float64Array; // k
  mu: Float64Array; // k x d
  cov: Float64Array; // k x d x d
}

interface Run {
  params: Params;
  ll: number;
  iterations: number;
  converged: boolean;
}

/**
 * Fit a Gaussian mixture by EM. Each start seeds the means by k-means++ (Arthur &
 * Vassilvitskii 2007) plus Lloyd steps, takes weights and covariances from the hard
 * assignment, then alternates E-steps (responsibilities by log-sum-exp relative to the
 * largest term) and M-steps (covariances floored by `regularization` on the diagonal)
 * until the mean log-likelihood moves by less than `tol`. A component that loses all its
 * responsibility is re-seeded once at the worst-explained point; a component that cannot
 * be kept positive definite throws a `numerical` SaddleError (raise `regularization`, or
 * use fewer components).
 *
 * References: Dempster, Laird & Rubin 1977 (EM); Arthur & Vassilvitskii 2007 (k-means++);
 * Schwarz 1978 (BIC); Akaike 1974 (AIC).
 *
 * @example Two clusters in 1-D
 * ```ts
 * import { fitGaussianMixture } from "./gaussian_mixture_fit.ts";
 * import { Rng } from "../random/rng.ts";
 * import assert from "node:assert/strict";
 * const r = new Rng(1);
 * const x = Array.from({ length: 400 }, (_, i) => r.normal(i % 2 ? -4 : 4, 1));
 * const fit = fitGaussianMixture(x, { components: 2, seed: 1 });
 * const means = fit.components.map((c) => c.mean[0]).sort((a, b) => a - b);
 * assert.ok(Math.abs(means[0] + 4) < 0.3 && Math.abs(means[1] - 4) < 0.3);
 * assert.ok(fit.converged);
 * ```
 */
export function fitGaussianMixture(
  input: SamplesInput,
  options: GaussianMixtureFitOptions = {},
): GaussianMixtureFit {
  const s = samples(input);
  const n = s.n;
  const k = options.components ?? options.init?.means.length ?? 1;
  const type = options.covariance ?? "full";
  const reg = options.regularization ?? 1e-6;
  const tol = options.tol ?? 1e-6;
  const maxIter = options.maxIter ?? 200;
  const restarts = options.init ? 1 : options.restarts ?? 3;
  checkOptions({ n, k, type, reg, tol, maxIter, restarts });
  const rng = toRng(options.seed ?? 0);
  const d = s.d;
  const cores = Math.min(8, navigator.hardwareConcurrency ?? 1);
  // From d = 32 on, the native BLAS kernels of a block run on their own threads: Web
  // Workers on top would only compete with them for the cores.
  const blasThreads = d >= 32 && linalgBackend().name === "native";
  const workers = options.workers ?? (n * k * d * d >= 2e7 && !blasThreads ? cores - 1 : 0);
  if (!Number.isInteger(workers) || workers < 0) {
    throw new SaddleError("invalid-argument", `workers must be an integer >= 0, got ${workers}`, {
      parameter: "workers",
    });
  }
  const engine = new EmEngine({ data: s.data, n, d, k, full: type === "full", workers });
  let best: Run | undefined;
  let lastError: unknown;
  try {
    for (let r = 0; r < restarts; r++) {
      try {
        const start = options.init
          ? initFromParams(s, k, type, options.init)
          : initKmeans(s, k, type, reg, rng.fork(`start-${r}`));
        const run = em({ s, engine, start, type, reg, tol, maxIter });
        if (!best || run.ll > best.ll) best = run;
      } catch (e) {
        if (!(e instanceof SaddleError) || restarts === 1) throw e;
        lastError = e;
      }
    }
  } finally {
    engine.close();
  }
  if (!best) throw lastError;
  return toFit(best, s, type, reg, restarts);
}

function checkOptions(
  { n, k, type, reg, tol, maxIter, restarts }: {
    n: number;
    k: number;
    type: string;
    reg: number;
    tol: number;
    maxIter: number;
    restarts: number;
  },
): void {
  const bad = (p: string, msg: string) =>
    new SaddleError("invalid-argument", msg, { parameter: p });
  if (!Number.isInteger(k) || k < 1) {
    throw bad("components", `components must be an integer >= 1, got ${k}`);
  }
  if (n < 2 || n < k) {
    throw new SaddleError(
      "too-few-samples",
      `a ${k}-component mixture needs at least max(2, ${k}) points, got ${n}`,
      { parameter: "samples" },
    );
  }
  if (type !== "full" && type !== "diag" && type !== "spherical") {
    throw bad("covariance", `covariance must be "full", "diag" or "spherical", got "${type}"`);
  }
  if (!(reg >= 0) || !Number.isFinite(reg)) {
    throw bad("regularization", `regularization must be >= 0, got ${reg}`);
  }
  if (!(tol >= 0)) throw bad("tol", `tol must be >= 0, got ${tol}`);
  if (!Number.isInteger(maxIter) || maxIter < 1) {
    throw bad("maxIter", `maxIter must be an integer >= 1, got ${maxIter}`);
  }
  if (!Number.isInteger(restarts) || restarts < 1) {
    throw bad("restarts", `restarts must be an integer >= 1, got ${restarts}`);
  }
}

function initKmeans(s: Samples, k: number, type: CovarianceType, reg: number, rng: Rng): Params {
  const { n, d, data } = s;
  const { labels } = kmeansPlusPlus({ x: data, n, d, k, rng });
  const resp = new Float64Array(n * k);
  for (let i = 0; i < n; i++) resp[i * k + labels[i]] = 1;
  const global = sampleCovariance(data, n, d, { ddof: 0 });
  const p = mStep(s, resp, k, type, reg);
  // A cluster of fewer than 2 points has no spread: give it the data covariance instead.
  const counts = new Float64Array(k);
  for (let i = 0; i < n; i++) counts[labels[i]]++;
  for (let j = 0; j < k; j++) {
    if (counts[j] < 2) {
      for (let a = 0; a < d * d; a++) {
        p.cov[j * d * d + a] = global[a] + (a % (d + 1) === 0 ? reg : 0);
      }
      if (counts[j] === 0) p.w[j] = 1 / n;
    }
  }
  normalise(p.w);
  return p;
}

function initFromParams(
  s: Samples,
  k: number,
  type: CovarianceType,
  init: MixtureInit,
): Params {
  const d = s.d;
  if (init.means.length !== k) {
    throw new SaddleError(
      "dimension-mismatch",
      `init has ${init.means.length} means for ${k} components`,
      { parameter: "init" },
    );
  }
  const w = init.weights ? toVector(init.weights, "init.weights") : new Float64Array(k).fill(1 / k);
  normalise(w);
  const mu = new Float64Array(k * d);
  init.means.forEach((m, j) => {
    const v = toVector(m, "init.means");
    if (v.length !== d) {
      throw new SaddleError(
        "dimension-mismatch",
        `init mean ${j} has ${v.length} entries, data d = ${d}`,
        {
          parameter: "init",
        },
      );
    }
    mu.set(v, j * d);
  });
  const cov = new Float64Array(k * d * d);
  const global = init.covariances ? null : sampleCovariance(s.data, s.n, d, { ddof: 0 });
  for (let j = 0; j < k; j++) {
    const c = init.covariances ? toMatrix(init.covariances[j], d, "init.covariances") : global!;
    cov.set(c, j * d * d);
  }
  if (type !== "full") constrain(cov, k, d, type);
  return { w, mu, cov };
}

function normalise(w: Float64Array): void {
  let t = 0;
  for (let j = 0; j < w.length; j++) t += w[j];
  for (let j = 0; j < w.length; j++) w[j] /= t;
}

/** Zero the off-diagonal (diag) or also average the diagonal (spherical). */
function constrain(cov: Float64Array, k: number, d: number, type: CovarianceType): void {
  for (let j = 0; j < k; j++) {
    const o = j * d * d;
    let tr = 0;
    for (let a = 0; a < d; a++) {
      tr += cov[o + a * d + a];
      for (let b = 0; b < d; b++) if (a !== b) cov[o + a * d + b] = 0;
    }
    if (type === "spherical") { for (let a = 0; a < d; a++) cov[o + a * d + a] = tr / d; }
  }
}

/** Sufficient statistics of one pass, about the current means (shifted for accuracy). */
type Stats = PassStats;

/** New parameters from the pass statistics; collapsed components are reported by index. */
function update(
  { p, st, k, d, n, type, reg }: {
    p: Params;
    st: Stats;
    k: number;
    d: number;
    n: number;
    type: CovarianceType;
    reg: number;
  },
): { params: Params; collapsed: number[] } {
  const w = new Float64Array(k), mu = new Float64Array(k * d), cov = new Float64Array(k * d * d);
  const collapsed: number[] = [];
  for (let j = 0; j < k; j++) {
    const nk = st.nk[j];
    const mo = j * d, co = j * d * d;
    if (!(nk > 1e-10 * n)) {
      collapsed.push(j);
      continue;
    }
    w[j] = nk / n;
    for (let a = 0; a < d; a++) mu[mo + a] = p.mu[mo + a] + st.s1[mo + a] / nk;
    for (let a = 0; a < d; a++) {
      const da = st.s1[mo + a] / nk;
      for (let b = a; b < d; b++) {
        if (type === "full" || a === b) {
          const c = st.s2[co + a * d + b] / nk - da * (st.s1[mo + b] / nk);
          cov[co + a * d + b] = c;
          cov[co + b * d + a] = c;
        }
      }
    }
  }
  if (type === "spherical") constrain(cov, k, d, type);
  for (let j = 0; j < k; j++) for (let a = 0; a < d; a++) cov[j * d * d + a * d + a] += reg;
  return { params: { w, mu, cov }, collapsed };
}

/** M-step from hard or soft responsibilities (initialisation only). */
function mStep(
  s: Samples,
  resp: Float64Array,
  k: number,
  type: CovarianceType,
  reg: number,
): Params {
  const { n, d, data } = s;
  const zero: Params = {
    w: new Float64Array(k),
    mu: new Float64Array(k * d),
    cov: new Float64Array(k * d * d),
  };
  // Means first (shift), then moments about them, through the same update as EM.
  const st: Stats = {
    nk: new Float64Array(k),
    s1: new Float64Array(k * d),
    s2: new Float64Array(k * d * d),
  };
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < k; j++) {
      const r = resp[i * k + j];
      if (r === 0) continue;
      st.nk[j] += r;
      for (let a = 0; a < d; a++) st.s1[j * d + a] += r * data[i * d + a];
    }
  }
  for (let j = 0; j < k; j++) {
    for (let a = 0; a < d; a++) zero.mu[j * d + a] = st.nk[j] > 0 ? st.s1[j * d + a] / st.nk[j] : 0;
  }
  st.s1.fill(0);
  st.nk.fill(0);
  // Scatter about the means as in EM: blocks of rows, one syrk per component and block.
  addMoments({ data, n, d, k, mu: zero.mu, resp, full: type === "full", stats: st });
  const { params } = update({ p: zero, st, k, d, n, type, reg });
  return params;
}

function em(
  { s, engine, start, type, reg, tol, maxIter }: {
    s: Samples;
    engine: EmEngine;
    start: Params;
    type: CovarianceType;
    reg: number;
    tol: number;
    maxIter: number;
  },
): Run {
  const k = start.w.length;
  const { n, d } = s;
  const ll = engine.ll;
  const st: Stats = {
    nk: new Float64Array(k),
    s1: new Float64Array(k * d),
    s2: new Float64Array(k * d * d),
  };
  const reseeded = new Uint8Array(k);
  let p = start;
  let prev = NaN;
  let converged = false;
  let it = 0;
  while (it < maxIter) {
    st.nk.fill(0);
    st.s1.fill(0);
    st.s2.fill(0);
    const cur = engine.pass(p, st);
    checkFinite(cur);
    const up = update({ p, st, k, d, n, type, reg });
    for (const j of up.collapsed) {
      if (reseeded[j]) {
        throw new SaddleError(
          "numerical",
          `mixture component ${j} lost all its responsibility twice (it was re-seeded once): ` +
            "the data do not support this many components; use fewer components",
          { parameter: "components" },
        );
      }
      reseeded[j] = 1;
      reseed({ s, p: up.params, j, ll, start, reg });
    }
    if (up.collapsed.length) normalise(up.params.w);
    p = up.params;
    it++;
    if (Math.abs(cur - prev) < tol) {
      converged = true;
      break;
    }
    prev = cur;
  }
  const final = engine.pass(p, null);
  checkFinite(final);
  return { params: p, ll: final, iterations: it, converged };
}

function checkFinite(v: number): void {
  if (!Number.isFinite(v)) {
    throw new SaddleError(
      "numerical",
      "the mixture log-likelihood is not finite: a component collapsed; raise `regularization`",
      { parameter: "regularization" },
    );
  }
}

/** Put a collapsed component at the worst-explained point with the starting spread. */
function reseed(
  { s, p, j, ll, start, reg }: {
    s: Samples;
    p: Params;
    j: number;
    ll: Float64Array;
    start: Params;
    reg: number;
  },
) {
  const { n, d, data } = s;
  let worst = 0;
  for (let i = 1; i < n; i++) if (ll[i] < ll[worst]) worst = i;
  ll[worst] = Infinity;
  for (let a = 0; a < d; a++) p.mu[j * d + a] = data[worst * d + a];
  const co = j * d * d;
  for (let a = 0; a < d * d; a++) p.cov[co + a] = start.cov[co + a];
  for (let a = 0; a < d; a++) p.cov[co + a * d + a] += reg;
  p.w[j] = 1 / n;
}

/**
 * Free parameters of a k-component mixture in d dimensions: `k - 1` weights, `k d` means and
 * `k d (d + 1) / 2` (full), `k d` (diag) or `k` (spherical) covariance entries.
 *
 * @example
 * ```ts
 * import { mixtureParameterCount } from "./gaussian_mixture_fit.ts";
 * import assert from "node:assert/strict";
 * assert.equal(mixtureParameterCount(3, 2, "full"), 2 + 6 + 9);
 * ```
 */
export function mixtureParameterCount(k: number, d: number, type: CovarianceType): number {
  const covParams = type === "full" ? (k * d * (d + 1)) / 2 : type === "diag" ? k * d : k;
  return k - 1 + k * d + covParams;
}

/** Components with fewer than d + 1 effective points or a covariance at the floor. */
function degenerateComponents(p: Params, n: number, d: number, reg: number): number[] {
  const out: number[] = [];
  for (let j = 0; j < p.w.length; j++) {
    const cov = p.cov.subarray(j * d * d, (j + 1) * d * d);
    const minEig = Math.min(...symmetricEigen(cov, d).values);
    if (n * p.w[j] < d + 1 || minEig <= 10 * reg) out.push(j);
  }
  return out;
}

function toFit(
  run: Run,
  s: Samples,
  type: CovarianceType,
  reg: number,
  restarts: number,
): GaussianMixtureFit {
  const { n, d } = s;
  const k = run.params.w.length;
  const comps = Array.from({ length: k }, (_, j) =>
    gaussian(
      run.params.mu.subarray(j * d, (j + 1) * d),
      run.params.cov.subarray(j * d * d, (j + 1) * d * d),
    ));
  const p = mixtureParameterCount(k, d, type);
  const total = run.ll * n;
  const bic = -2 * total + p * Math.log(n);
  const aic = -2 * total + 2 * p;
  const notes: string[] = [];
  if (!run.converged) notes.push(`EM stopped at maxIter = ${run.iterations} before meeting tol`);
  const degenerate = degenerateComponents(run.params, n, d, reg);
  if (degenerate.length > 0) {
    notes.push(
      `component${degenerate.length > 1 ? "s" : ""} ${degenerate.join(", ")} collapsed ` +
        `(fewer than d + 1 = ${d + 1} effective points, or a covariance at the ` +
        `regularization floor ${reg}): the fit is not trustworthy (converged: false); use ` +
        "fewer components",
    );
  }
  const fitted = {
    covarianceType: type,
    logLikelihood: run.ll,
    iterations: run.iterations,
    converged: run.converged && degenerate.length === 0,
    degenerate,
    nParameters: p,
    bic,
    aic,
  };
  const info = { ...fitted, restarts, regularization: reg, n };
  return Object.assign(mixtureFromComponents(run.params.w, comps, info, notes), fitted);
}
