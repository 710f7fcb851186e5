/**
 * The validated linear-algebra operations over one set of {@linkcode Kernels}. Validation
 * and error messages live here, so every backend fails alike.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import type { Kernels } from "./_kernels.ts";

/** Options of {@linkcode Linalg.gemm}: `C = alpha op(A) op(B) + beta C`, all row-major. */
export interface GemmOptions {
  /** Rows of `op(A)` and of `C`. */
  m: number;
  /** Columns of `op(B)` and of `C`. */
  n: number;
  /** Columns of `op(A)` = rows of `op(B)`. */
  k: number;
  /** Use `Aᵀ` (then `a` is stored `k x m`); default false (`a` is `m x k`). */
  transposeA?: boolean;
  /** Use `Bᵀ` (then `b` is stored `n x k`); default false (`b` is `k x n`). */
  transposeB?: boolean;
  /** Scale of the product (default 1). */
  alpha?: number;
  /** Scale of the incoming `c` (default 0; ignored without `c`). */
  beta?: number;
  /** `m x n` output, updated in place and returned; default a new zero matrix. */
  c?: Float64Array;
}

/** Options of {@linkcode Linalg.syrk}. */
export interface SyrkOptions {
  /** Rows of `a`. */
  n: number;
  /** Columns of `a`. */
  d: number;
  /** Compute `A Aᵀ` (`n x n`) instead of `AᵀA` (`d x d`); default false. */
  outer?: boolean;
  /** Scale of the product (default 1). */
  alpha?: number;
  /** Scale of the incoming `c` (default 0; ignored without `c`). */
  beta?: number;
  /**
   * Symmetric output (`d x d`, or `n x n` with `outer`), updated in place to
   * `alpha AᵀA + beta C` and returned; only its lower triangle is read, both are written.
   * Default a new matrix.
   */
  c?: Float64Array;
}

/**
 * Options of {@linkcode Linalg.trsm}: solve `op(L) X = B` (side "left", `L` is `m x m`) or
 * `X op(L) = B` (side "right", `L` is `n x n`) for lower-triangular `L`; `B` and `X` are
 * row-major `m x n`.
 */
export interface TrsmOptions {
  /** Rows of `B`. */
  m: number;
  /** Columns of `B`. */
  n: number;
  /** "left" (default): `op(L) X = B`; "right": `X op(L) = B`. */
  side?: "left" | "right";
  /** Use `op(L) = Lᵀ` (default false). */
  transpose?: boolean;
  /** Output `m x n` (may be `b` itself, solved in place); default a new matrix. */
  out?: Float64Array;
}

/** Options of {@linkcode Linalg.cholesky}. */
export interface CholeskyOptions {
  /** Name of the matrix in error messages (default "matrix"). */
  name?: string;
}

/** Options of {@linkcode Linalg.symmetricEigen}. */
export interface SymmetricEigenOptions {
  /** Also compute the eigenvectors (default true); values only is faster. */
  vectors?: boolean;
}

/** Eigenvalues (ascending) of a symmetric matrix. */
export interface SymmetricEigenValues {
  /** Eigenvalues in ascending order. */
  readonly values: Float64Array;
}

/** Eigenvalues (ascending) and eigenvectors (column `k` of the row-major `vectors`). */
export interface SymmetricEigen extends SymmetricEigenValues {
  /** Row-major `d x d`; column `k` is the unit eigenvector of `values[k]`. */
  readonly vectors: Float64Array;
}

/** Options of {@linkcode Linalg.traceSqrtProduct}. */
export interface TraceSqrtProductOptions {
  /**
   * Relative tolerance for negative eigenvalues (default 1e-10): eigenvalues of `A` and of
   * `A^½ B A^½` above `-tolerance · λ_max` are rounding and count as 0; below it the matrix
   * is not positive semi-definite and a `singular` SaddleError is thrown.
   */
  tolerance?: number;
}

/** Every linear-algebra operation of saddlekit, bound to one backend. */
export interface Linalg {
  /** The backend's name. */
  readonly name: "native" | "typescript";
  /** `C = alpha op(A) op(B) + beta C` (row-major). */
  gemm(a: ArrayLike<number>, b: ArrayLike<number>, options: GemmOptions): Float64Array;
  /** `alpha AᵀA + beta C` (`d x d`) or `alpha AAᵀ + beta C` (`n x n`), both triangles. */
  syrk(a: ArrayLike<number>, options: SyrkOptions): Float64Array;
  /** Triangular solve with a block of right-hand sides: `op(L) X = B` or `X op(L) = B`. */
  trsm(L: ArrayLike<number>, b: ArrayLike<number>, options: TrsmOptions): Float64Array;
  /** Lower Cholesky factor `L` with `A = L Lᵀ`. */
  cholesky(a: ArrayLike<number>, d: number, options?: CholeskyOptions): Float64Array;
  /** Solve `L y = b`, into `out`. */
  solveLower(
    L: ArrayLike<number>,
    d: number,
    b: ArrayLike<number>,
    out?: Float64Array,
  ): Float64Array;
  /** Solve `Lᵀ x = y`, into `out`. */
  solveLowerTransposed(
    L: ArrayLike<number>,
    d: number,
    y: ArrayLike<number>,
    out?: Float64Array,
  ): Float64Array;
  /** Solve `A x = b` from the Cholesky factor of `A`. */
  choleskySolve(L: ArrayLike<number>, d: number, b: ArrayLike<number>): Float64Array;
  /** `A⁻¹` from the Cholesky factor of `A`. */
  choleskyInverse(L: ArrayLike<number>, d: number): Float64Array;
  /** `log det A` from the Cholesky factor of `A`. */
  logDetCholesky(L: ArrayLike<number>, d: number): number;
  /** Symmetric eigendecomposition (values ascending). */
  symmetricEigen(a: ArrayLike<number>, d: number, options?: { vectors?: true }): SymmetricEigen;
  /** Symmetric eigenvalues only (ascending). */
  symmetricEigen(
    a: ArrayLike<number>,
    d: number,
    options: { vectors: false },
  ): SymmetricEigenValues;
  /** Symmetric eigendecomposition, vectors when `options.vectors` is not false. */
  symmetricEigen(
    a: ArrayLike<number>,
    d: number,
    options?: SymmetricEigenOptions,
  ): SymmetricEigen | SymmetricEigenValues;
  /** Positive semi-definite square root. */
  sqrtSymmetric(a: ArrayLike<number>, d: number, tolerance?: number): Float64Array;
  /** `tr((A^½ B A^½)^½)` for symmetric positive semi-definite `A`, `B`. */
  traceSqrtProduct(
    a: ArrayLike<number>,
    b: ArrayLike<number>,
    d: number,
    options?: TraceSqrtProductOptions,
  ): number;
}

function f64(x: ArrayLike<number>): Float64Array {
  return x instanceof Float64Array ? x : Float64Array.from(x);
}

function checkSize(op: string, name: string, x: ArrayLike<number>, size: number, shape: string) {
  if (x.length !== size) {
    throw new SaddleError(
      "dimension-mismatch",
      `${op}: ${name} must have ${size} entries (${shape}), got ${x.length}`,
      { parameter: name },
    );
  }
}

function checkDim(op: string, name: string, v: number) {
  if (!Number.isInteger(v) || v < 0) {
    throw new SaddleError("invalid-argument", `${op}: ${name} must be an integer >= 0, got ${v}`, {
      parameter: name,
    });
  }
}

function checkFinite(
  op: string,
  name: string,
  x: ArrayLike<number>,
  cols: number,
  code: "non-finite" | "singular" = "non-finite",
) {
  if (x instanceof Float64Array) {
    // One tight pass: x · 0 is NaN exactly when x is not finite.
    let probe = 0;
    for (let i = 0; i < x.length; i++) probe += x[i] * 0;
    if (probe === 0) return;
  }
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i])) {
      const where = cols > 1 ? `row ${Math.floor(i / cols)}, column ${i % cols}` : `entry ${i}`;
      throw new SaddleError(
        code,
        `${op}: ${name} has a non-finite entry (${where} is ${x[i]}); ` +
          "check the data or parameters it was computed from",
        { parameter: name },
      );
    }
  }
}

/** A usable triangular factor: finite, with a non-zero diagonal. */
function checkFactor(op: string, L: ArrayLike<number>, d: number) {
  checkSize(op, "L", L, d * d, `${d} x ${d}`);
  for (let i = 0; i < d; i++) {
    const v = L[i * d + i];
    if (!(Number.isFinite(v) && v !== 0)) {
      throw new SaddleError(
        "singular",
        `${op}: the triangular factor L has diagonal entry ${i} = ${v}; ` +
          "pass the factor returned by cholesky() of a positive definite matrix",
        { parameter: "L" },
      );
    }
  }
}

/** The operations over `k`. */
export function makeLinalg(k: Kernels): Linalg {
  function gemm(a: ArrayLike<number>, b: ArrayLike<number>, o: GemmOptions): Float64Array {
    const { m, n, k: kk } = o;
    for (const [nm, v] of [["m", m], ["n", n], ["k", kk]] as const) checkDim("gemm", nm, v);
    const ta = o.transposeA ?? false, tb = o.transposeB ?? false;
    checkSize("gemm", "a", a, m * kk, ta ? `${kk} x ${m}` : `${m} x ${kk}`);
    checkSize("gemm", "b", b, kk * n, tb ? `${n} x ${kk}` : `${kk} x ${n}`);
    checkFinite("gemm", "a", a, ta ? m : kk);
    checkFinite("gemm", "b", b, tb ? kk : n);
    const alpha = o.alpha ?? 1, beta = o.c ? o.beta ?? 0 : 0;
    checkFinite("gemm", "alpha and beta", [alpha, beta], 1);
    const c = o.c ?? new Float64Array(m * n);
    checkSize("gemm", "c", c, m * n, `${m} x ${n}`);
    if (beta !== 0) checkFinite("gemm", "c", c, n);
    k.gemm({ m, n, k: kk, transposeA: ta, transposeB: tb, alpha, beta, a: f64(a), b: f64(b), c });
    return c;
  }

  function syrk(a: ArrayLike<number>, o: SyrkOptions): Float64Array {
    checkDim("syrk", "n", o.n);
    checkDim("syrk", "d", o.d);
    checkSize("syrk", "a", a, o.n * o.d, `${o.n} x ${o.d}`);
    checkFinite("syrk", "a", a, o.d);
    const alpha = o.alpha ?? 1, beta = o.c ? o.beta ?? 0 : 0;
    checkFinite("syrk", "alpha and beta", [alpha, beta], 1);
    const size = o.outer ? o.n : o.d;
    const c = o.c ?? new Float64Array(size * size);
    checkSize("syrk", "c", c, size * size, `${size} x ${size}`);
    if (beta !== 0) checkFinite("syrk", "c", c, size);
    k.syrk({ a: f64(a), n: o.n, d: o.d, outer: o.outer ?? false, alpha, beta, c });
    return c;
  }

  function trsm(L: ArrayLike<number>, b: ArrayLike<number>, o: TrsmOptions): Float64Array {
    const { m, n } = o;
    checkDim("trsm", "m", m);
    checkDim("trsm", "n", n);
    const right = (o.side ?? "left") === "right";
    if (!right && o.side !== undefined && o.side !== "left") {
      throw new SaddleError("invalid-argument", `trsm: side must be "left" or "right"`, {
        parameter: "side",
      });
    }
    checkFactor("trsm", L, right ? n : m);
    checkSize("trsm", "b", b, m * n, `${m} x ${n}`);
    checkFinite("trsm", "b", b, n);
    const out = o.out ?? new Float64Array(m * n);
    checkSize("trsm", "out", out, m * n, `${m} x ${n}`);
    if (out !== b) out.set(b);
    k.trsm({ L: f64(L), b: out, m, n, right, transposed: o.transpose ?? false });
    return out;
  }

  function cholesky(a: ArrayLike<number>, d: number, options: CholeskyOptions = {}) {
    const name = options.name ?? "matrix";
    checkDim("cholesky", "d", d);
    checkSize("cholesky", name, a, d * d, `${d} x ${d}`);
    checkFinite("cholesky", name, a, d, "singular");
    const L = Float64Array.from(a);
    const info = k.potrf(L, d);
    if (info !== 0) {
      throw new SaddleError(
        "singular",
        `cholesky: ${name} is not positive definite (pivot ${info - 1} is not positive); ` +
          "a constant or collinear column makes a covariance singular: add a ridge to its diagonal " +
          "(the `regularization` option) or drop the column",
        { parameter: name },
      );
    }
    return L;
  }

  function solve(
    op: string,
    L: ArrayLike<number>,
    d: number,
    b: ArrayLike<number>,
    out: Float64Array,
    transposed: boolean,
  ): Float64Array {
    checkFactor(op, L, d);
    checkSize(op, "b", b, d, `${d}`);
    checkSize(op, "out", out, d, `${d}`);
    checkFinite(op, "b", b, 1);
    if (out !== b) { for (let i = 0; i < d; i++) out[i] = b[i]; }
    k.trsm({ L: f64(L), b: out, m: d, n: 1, right: false, transposed });
    return out;
  }

  function solveLower(
    L: ArrayLike<number>,
    d: number,
    b: ArrayLike<number>,
    out: Float64Array = new Float64Array(d),
  ) {
    return solve("solveLower", L, d, b, out, false);
  }

  function solveLowerTransposed(
    L: ArrayLike<number>,
    d: number,
    y: ArrayLike<number>,
    out: Float64Array = new Float64Array(d),
  ) {
    return solve("solveLowerTransposed", L, d, y, out, true);
  }

  function choleskySolve(L: ArrayLike<number>, d: number, b: ArrayLike<number>) {
    const x = solve("choleskySolve", L, d, b, new Float64Array(d), false);
    k.trsm({ L: f64(L), b: x, m: d, n: 1, right: false, transposed: true });
    return x;
  }

  function choleskyInverse(L: ArrayLike<number>, d: number) {
    checkFactor("choleskyInverse", L, d);
    return k.potri(f64(L), d);
  }

  function logDetCholesky(L: ArrayLike<number>, d: number): number {
    let s = 0;
    for (let i = 0; i < d; i++) s += Math.log(L[i * d + i]);
    return 2 * s;
  }

  function eigen(op: string, a: ArrayLike<number>, d: number, vectors: boolean, name = "matrix") {
    checkDim(op, "d", d);
    checkSize(op, name, a, d * d, `${d} x ${d}`);
    // Only the lower triangle is read (it is mirrored), so only it must be finite.
    for (let i = 0; i < d; i++) {
      for (let j = 0; j <= i; j++) {
        const v = a[i * d + j];
        if (!Number.isFinite(v)) {
          throw new SaddleError(
            "non-finite",
            `${op}: ${name} has a non-finite entry (row ${i}, column ${j} is ${v}); ` +
              "check the data or parameters it was computed from",
            { parameter: name },
          );
        }
      }
    }
    const r = k.syev(Float64Array.from(a), d, vectors);
    if (!r) {
      throw new SaddleError(
        "numerical",
        `${op}: the symmetric eigensolver did not converge for the ${d} x ${d} ${name}; ` +
          "check its scaling (entries spanning hundreds of orders of magnitude)",
        { parameter: name },
      );
    }
    return r;
  }

  function symmetricEigen(
    a: ArrayLike<number>,
    d: number,
    options: SymmetricEigenOptions = {},
  ): SymmetricEigen | SymmetricEigenValues {
    const r = eigen("symmetricEigen", a, d, options.vectors ?? true);
    return r.vectors ? { values: r.values, vectors: r.vectors } : { values: r.values };
  }

  /** Eigenvalue floor: clearly negative throws, rounding-level ones become 0. */
  function clampEigen(
    op: string,
    name: string,
    values: Float64Array,
    tolerance: number,
    scale = 0,
  ) {
    let top = scale;
    for (const v of values) top = Math.max(top, Math.abs(v));
    for (let i = 0; i < values.length; i++) {
      if (values[i] < -tolerance * top) {
        throw new SaddleError(
          "singular",
          `${op}: ${name} has eigenvalue ${values[i]} < 0: not positive semi-definite`,
          { parameter: name },
        );
      }
      // Within rounding of 0 (|λ| <= 4 d ε λ_max): exactly 0, so that square roots of
      // singular matrices carry no ~1e-8 noise.
      if (Math.abs(values[i]) <= 4 * values.length * Number.EPSILON * top || values[i] < 0) {
        values[i] = 0;
      }
    }
  }

  function sqrtSymmetric(a: ArrayLike<number>, d: number, tolerance = 1e-10): Float64Array {
    const { values, vectors } = eigen("sqrtSymmetric", a, d, true);
    clampEigen("sqrtSymmetric", "matrix", values, tolerance);
    // S = V diag(√λ) Vᵀ = B Bᵀ with B = V diag(λ^¼).
    const v = vectors!;
    for (let j = 0; j < d; j++) {
      const q = Math.sqrt(Math.sqrt(values[j]));
      for (let i = 0; i < d; i++) v[i * d + j] *= q;
    }
    const out = new Float64Array(d * d);
    k.syrk({ a: v, n: d, d, outer: true, alpha: 1, beta: 0, c: out });
    return out;
  }

  function traceSqrtProduct(
    a: ArrayLike<number>,
    b: ArrayLike<number>,
    d: number,
    options: TraceSqrtProductOptions = {},
  ): number {
    const op = "traceSqrtProduct";
    const tolerance = options.tolerance ?? 1e-10;
    checkSize(op, "b", b, d * d, `${d} x ${d}`);
    checkFinite(op, "b", b, d);
    const { values, vectors } = eigen(op, a, d, true, "a");
    clampEigen(op, "a", values, tolerance);
    // A^½ B A^½ = V C Vᵀ with C = diag(√λ) Vᵀ B V diag(√λ): same eigenvalues, symmetric.
    const v = vectors!;
    for (let j = 0; j < d; j++) {
      const q = Math.sqrt(values[j]);
      for (let i = 0; i < d; i++) v[i * d + j] *= q;
    }
    const bs = Float64Array.from(b);
    for (let i = 0; i < d; i++) {
      for (let j = i + 1; j < d; j++) {
        bs[i * d + j] = bs[j * d + i] = 0.5 * (bs[i * d + j] + bs[j * d + i]);
      }
    }
    const t = new Float64Array(d * d);
    k.gemm({
      m: d,
      n: d,
      k: d,
      transposeA: false,
      transposeB: false,
      alpha: 1,
      beta: 0,
      a: bs,
      b: v,
      c: t,
    });
    const c = new Float64Array(d * d);
    k.gemm({
      m: d,
      n: d,
      k: d,
      transposeA: true,
      transposeB: false,
      alpha: 1,
      beta: 0,
      a: v,
      b: t,
      c,
    });
    const mu = k.syev(c, d, false);
    if (!mu) {
      throw new SaddleError("numerical", `${op}: the symmetric eigensolver did not converge`, {
        parameter: "b",
      });
    }
    // Scale of C's rounding: ‖A‖ ‖B‖ (‖B‖ <= tr |B| diag), not C's own largest eigenvalue,
    // which is 0 when A and B have orthogonal supports.
    let trB = 0;
    for (let i = 0; i < d; i++) trB += Math.abs(bs[i * d + i]);
    clampEigen(op, "b", mu.values, tolerance, values[d - 1] * trB);
    let s = 0;
    for (const m of mu.values) s += Math.sqrt(m);
    return s;
  }

  return {
    name: k.name,
    gemm,
    syrk,
    trsm,
    cholesky,
    solveLower,
    solveLowerTransposed,
    choleskySolve,
    choleskyInverse,
    logDetCholesky,
    symmetricEigen: symmetricEigen as Linalg["symmetricEigen"],
    sqrtSymmetric,
    traceSqrtProduct,
  };
}
