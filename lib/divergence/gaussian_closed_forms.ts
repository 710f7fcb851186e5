/**
 * Closed forms between Gaussians: KL, Bhattacharyya, Hellinger, Fréchet (W2) and the
 * entropy. Parameters are plain `{ mean, cov }` objects (cov row-major d x d, or the
 * variance in 1-D); the Gaussians of lib/density satisfy this.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { cholesky, choleskySolve, logDetCholesky, solveLower, trsm } from "../linalg/cholesky.ts";
import { sqrtSymmetric, traceSqrtProduct } from "../linalg/eigen.ts";
import { toMatrix } from "../linalg/matrix_input.ts";
import { logBase } from "../estimate/units.ts";

/** Mean and covariance of a Gaussian; d is inferred from `mean.length`. */
export interface GaussianMoments {
  /** Mean vector (length d). */
  readonly mean: ArrayLike<number>;
  /** Covariance, row-major d x d (a number is the variance of a 1-D Gaussian). */
  readonly cov: ArrayLike<number> | number;
}

interface Checked {
  d: number;
  mean: Float64Array;
  cov: Float64Array;
  /** Cholesky factor; empty when only positive semi-definiteness was asked for. */
  L: Float64Array;
}

/**
 * Validate one Gaussian. `definite` (default) factors the covariance (positive definite
 * needed); without it the covariance only has to be symmetric, and the caller checks that it
 * is positive semi-definite (the Fréchet distance is defined for singular covariances).
 */
function check(g: GaussianMoments, name: string, definite = true): Checked {
  const d = g.mean.length;
  if (d === 0) throw new SaddleError("empty", `${name}.mean is empty`, { parameter: name });
  const cov = typeof g.cov === "number" ? new Float64Array([g.cov]) : Float64Array.from(g.cov);
  if (cov.length !== d * d) {
    throw new SaddleError(
      "dimension-mismatch",
      `${name}.cov has ${cov.length} entries but a ${d} x ${d} covariance needs ${d * d}`,
      { parameter: name },
    );
  }
  const mean = Float64Array.from(g.mean);
  for (const v of [...mean, ...cov]) {
    if (!Number.isFinite(v)) {
      throw new SaddleError("non-finite", `${name} has a non-finite parameter`, {
        parameter: name,
      });
    }
  }
  // Symmetric, with the same check and message as the density constructors.
  toMatrix(cov, d, `${name}.cov`);
  return {
    d,
    mean,
    cov,
    L: definite ? cholesky(cov, d, { name: `${name}.cov` }) : new Float64Array(0),
  };
}

function pair(a: GaussianMoments, b: GaussianMoments, definite = true): [Checked, Checked] {
  const ca = check(a, "a", definite), cb = check(b, "b", definite);
  if (ca.d !== cb.d) {
    throw new SaddleError(
      "dimension-mismatch",
      `a has d = ${ca.d} but b has d = ${cb.d}; both Gaussians must live in the same space`,
      { parameter: "b" },
    );
  }
  return [ca, cb];
}

/** Options of the closed forms that return information quantities. */
export interface LogBaseOption {
  /** Log base: 2 for bits (default e, nats). */
  base?: number;
}

/**
 * `KL(N(μ_a, Σ_a) || N(μ_b, Σ_b)) = ½[tr(Σ_b⁻¹Σ_a) + (μ_b - μ_a)ᵀΣ_b⁻¹(μ_b - μ_a) - d +
 * ln det Σ_b - ln det Σ_a]`, in nats (bits with `base: 2`). Throws `singular` for a
 * covariance that is not positive definite.
 *
 * References: Kullback 1959, Information Theory and Statistics; the formula is standard
 * (e.g. Duchi, Derivations for Linear Algebra and Optimization, from memory).
 *
 * @example
 * ```ts
 * import { gaussianKl } from "./gaussian_closed_forms.ts";
 * import assert from "node:assert/strict";
 * // 1-D: ln(s_b/s_a) + (s_a² + (m_a - m_b)²)/(2 s_b²) - 1/2
 * const kl = gaussianKl({ mean: [0], cov: [1] }, { mean: [1], cov: [4] });
 * assert.ok(Math.abs(kl - (Math.log(2) + 2 / 8 - 0.5)) < 1e-15);
 * ```
 */
export function gaussianKl(
  a: GaussianMoments,
  b: GaussianMoments,
  options: LogBaseOption = {},
): number {
  const [A, B] = pair(a, b);
  const d = A.d;
  // tr(Σ_b⁻¹ Σ_a) = ||L_b⁻¹ L_a||_F²: one triangular solve with d right-hand sides.
  const y = trsm(B.L, A.L, { m: d, n: d });
  let trace = 0;
  for (let i = 0; i < d * d; i++) trace += y[i] * y[i];
  const diff = new Float64Array(d);
  for (let i = 0; i < d; i++) diff[i] = B.mean[i] - A.mean[i];
  const z = solveLower(B.L, d, diff);
  let maha = 0;
  for (let i = 0; i < d; i++) maha += z[i] * z[i];
  const kl = 0.5 * (trace + maha - d + logDetCholesky(B.L, d) - logDetCholesky(A.L, d));
  return Math.max(0, kl) / logBase(options.base);
}

/**
 * Bhattacharyya distance `D_B = ⅛ Δᵀ Σ⁻¹ Δ + ½ ln(det Σ / √(det Σ_a det Σ_b))` with
 * Σ = (Σ_a + Σ_b)/2 and Δ = μ_a - μ_b; the Bhattacharyya coefficient is `exp(-D_B)`.
 *
 * References: Bhattacharyya 1943 (Bull. Calcutta Math. Soc.); Kailath 1967, The Divergence
 * and Bhattacharyya Distance Measures in Signal Selection (IEEE T-COM).
 *
 * @example
 * ```ts
 * import { gaussianBhattacharyya } from "./gaussian_closed_forms.ts";
 * import assert from "node:assert/strict";
 * // Equal variances: Δ² / (8 σ²)
 * assert.ok(Math.abs(gaussianBhattacharyya({ mean: [0], cov: 1 }, { mean: [2], cov: 1 }) - 0.5) < 1e-15);
 * ```
 */
export function gaussianBhattacharyya(a: GaussianMoments, b: GaussianMoments): number {
  const [A, B] = pair(a, b);
  const d = A.d;
  const avg = new Float64Array(d * d);
  for (let i = 0; i < d * d; i++) avg[i] = 0.5 * (A.cov[i] + B.cov[i]);
  const L = cholesky(avg, d, { name: "(a.cov + b.cov) / 2" });
  const diff = new Float64Array(d);
  for (let i = 0; i < d; i++) diff[i] = A.mean[i] - B.mean[i];
  const x = choleskySolve(L, d, diff);
  let maha = 0;
  for (let i = 0; i < d; i++) maha += diff[i] * x[i];
  const logDet = logDetCholesky(L, d) - 0.5 * (logDetCholesky(A.L, d) + logDetCholesky(B.L, d));
  return Math.max(0, maha / 8 + 0.5 * logDet);
}

/**
 * Hellinger distance `H = √(1 - BC)` in [0, 1] with BC = exp(-D_B) the Bhattacharyya
 * coefficient (so H² = 1 - ∫√(pq); the "squared-hellinger" f-divergence ∫(√p - √q)² is 2H²).
 *
 * References: Hellinger 1909; Kailath 1967 (IEEE T-COM) for the Gaussian coefficient.
 *
 * @example
 * ```ts
 * import { gaussianHellinger } from "./gaussian_closed_forms.ts";
 * import assert from "node:assert/strict";
 * const h = gaussianHellinger({ mean: [0], cov: 1 }, { mean: [2], cov: 1 });
 * assert.ok(Math.abs(h * h - (1 - Math.exp(-0.5))) < 1e-15);
 * ```
 */
export function gaussianHellinger(a: GaussianMoments, b: GaussianMoments): number {
  return Math.sqrt(-Math.expm1(-gaussianBhattacharyya(a, b)));
}

/**
 * Squared Fréchet (2-Wasserstein) distance between Gaussians,
 * `||μ_a - μ_b||² + tr(Σ_a + Σ_b - 2 (Σ_a^{1/2} Σ_b Σ_a^{1/2})^{1/2})`, through symmetric
 * square roots (no complex parts from a non-symmetric sqrtm). Take `Math.sqrt` for W2.
 * Covariances need only be positive semi-definite: singular ones (features with fewer
 * samples than dimensions, a constant feature) are fine; a clearly negative eigenvalue throws.
 *
 * References: Dowson & Landau 1982, The Fréchet distance between multivariate normal
 * distributions (J. Multivariate Anal.); Heusel et al. 2017 (NeurIPS).
 *
 * @example
 * ```ts
 * import { gaussianFrechet } from "./gaussian_closed_forms.ts";
 * import assert from "node:assert/strict";
 * // 1-D: (m_a - m_b)² + (s_a - s_b)²
 * const f = gaussianFrechet({ mean: [0], cov: 1 }, { mean: [3], cov: 4 });
 * assert.ok(Math.abs(f - 10) < 1e-12);
 * ```
 */
export function gaussianFrechet(a: GaussianMoments, b: GaussianMoments): number {
  const [A, B] = pair(a, b, false);
  const d = A.d;
  // b.cov must be PSD: a Cholesky factorisation proves it cheaply in the usual definite
  // case; only a singular b.cov pays for an eigendecomposition.
  try {
    cholesky(B.cov, d, { name: "b.cov" });
  } catch {
    psdRoot(B.cov, d, "b.cov");
  }
  // tr((Σ_a^½ Σ_b Σ_a^½)^½) from symmetric eigendecompositions (lib/linalg); a.cov is
  // checked to be PSD there.
  let cross: number;
  try {
    cross = traceSqrtProduct(A.cov, B.cov, d);
  } catch (e) {
    if (!(e instanceof SaddleError) || e.code !== "singular") throw e;
    const name = e.location.parameter === "a" ? "a.cov" : "a.cov^½ b.cov a.cov^½";
    throw notPsd(name, e);
  }
  let tr = 0, dist = 0;
  for (let i = 0; i < d; i++) {
    tr += A.cov[i * d + i] + B.cov[i * d + i];
    dist += (A.mean[i] - B.mean[i]) ** 2;
  }
  return Math.max(0, dist + tr - 2 * cross);
}

/** The PSD square root, its error naming the covariance. */
function psdRoot(m: Float64Array, d: number, name: string): Float64Array {
  try {
    return sqrtSymmetric(m, d);
  } catch (e) {
    if (!(e instanceof SaddleError)) throw e;
    throw notPsd(name, e);
  }
}

function notPsd(name: string, cause: SaddleError): SaddleError {
  return new SaddleError(
    cause.code,
    `${name} is not positive semi-definite (it has a clearly negative eigenvalue), so it ` +
      "is not a covariance; check how it was computed",
    { parameter: name },
    { cause },
  );
}

/**
 * Differential entropy of a Gaussian, `½ ln det(2πe Σ)` in nats (bits with `base: 2`).
 *
 * References: Cover & Thomas 2006, Elements of Information Theory, Thm. 8.4.1.
 *
 * @example
 * ```ts
 * import { gaussianEntropy } from "./gaussian_closed_forms.ts";
 * import assert from "node:assert/strict";
 * assert.ok(Math.abs(gaussianEntropy({ mean: [0], cov: 1 }) - 0.5 * Math.log(2 * Math.PI * Math.E)) < 1e-15);
 * ```
 */
export function gaussianEntropy(g: GaussianMoments, options: LogBaseOption = {}): number {
  const G = check(g, "g");
  return 0.5 * (G.d * (1 + Math.log(2 * Math.PI)) + logDetCholesky(G.L, G.d)) /
    logBase(options.base);
}
