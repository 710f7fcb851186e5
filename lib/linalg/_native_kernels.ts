/**
 * Native kernels: CBLAS and Fortran LAPACK through `Deno.dlopen` (OpenBLAS, the reference
 * BLAS/LAPACK pair, or Apple's Accelerate). Never throws: {@linkcode loadNativeKernels}
 * returns the kernels or the reason they are unavailable.
 *
 * Row-major storage is handled by transposition: a row-major lower triangle is a
 * column-major upper triangle, and a symmetric matrix is its own transpose.
 *
 * @module
 */
import {
  type GemmArgs,
  type Kernels,
  mirrorLower,
  type SyrkArgs,
  type TrsmArgs,
} from "./_kernels.ts";

const ROW_MAJOR = 101, NO_TRANS = 111, TRANS = 112, LOWER = 122, LEFT = 141, RIGHT = 142;
const NON_UNIT = 131;

const symbols = {
  cblas_dgemm: {
    parameters: [
      "i32",
      "i32",
      "i32",
      "i32",
      "i32",
      "i32",
      "f64",
      "buffer",
      "i32",
      "buffer",
      "i32",
      "f64",
      "buffer",
      "i32",
    ],
    result: "void",
    optional: true,
  },
  cblas_dsyrk: {
    parameters: ["i32", "i32", "i32", "i32", "i32", "f64", "buffer", "i32", "f64", "buffer", "i32"],
    result: "void",
    optional: true,
  },
  cblas_dtrsm: {
    parameters: [
      "i32",
      "i32",
      "i32",
      "i32",
      "i32",
      "i32",
      "i32",
      "f64",
      "buffer",
      "i32",
      "buffer",
      "i32",
    ],
    result: "void",
    optional: true,
  },
  // Fortran: every argument by reference, then the hidden lengths of character arguments.
  dpotrf_: {
    parameters: ["buffer", "buffer", "buffer", "buffer", "buffer", "usize"],
    result: "void",
    optional: true,
  },
  dpotri_: {
    parameters: ["buffer", "buffer", "buffer", "buffer", "buffer", "usize"],
    result: "void",
    optional: true,
  },
  dsyevd_: {
    parameters: [
      "buffer",
      "buffer",
      "buffer",
      "buffer",
      "buffer",
      "buffer",
      "buffer",
      "buffer",
      "buffer",
      "buffer",
      "buffer",
      "usize",
      "usize",
    ],
    result: "void",
    optional: true,
  },
  openblas_get_config: { parameters: [], result: "pointer", optional: true },
} as const;

type Lib = Deno.DynamicLibrary<typeof symbols>;
type Sym = Lib["symbols"];

/** Where the native kernels came from. */
export interface NativeInfo {
  /** Path(s) of the loaded library. */
  readonly library: string;
  /** Version string (OpenBLAS's configuration line), when the library tells it. */
  readonly version?: string;
}

/** Result of {@linkcode loadNativeKernels}. */
export type NativeLoad =
  | { readonly ok: true; readonly kernels: Kernels; readonly info: NativeInfo }
  | { readonly ok: false; readonly reason: string };

const REQUIRED_BLAS = ["cblas_dgemm", "cblas_dsyrk", "cblas_dtrsm"] as const;
const REQUIRED_LAPACK = ["dpotrf_", "dpotri_", "dsyevd_"] as const;

/** Candidate libraries in search order: a single path, or a BLAS + LAPACK pair. */
function candidates(os: string): string[][] {
  if (os === "darwin") {
    return [["/System/Library/Frameworks/Accelerate.framework/Accelerate"]];
  }
  const dirs = [
    "/usr/lib/x86_64-linux-gnu",
    "/usr/lib/aarch64-linux-gnu",
    "/usr/lib64",
    "/usr/lib",
  ];
  const out: string[][] = [];
  for (const d of dirs) {
    out.push([`${d}/libopenblas.so.0`], [`${d}/openblas-pthread/libopenblas.so.0`]);
  }
  out.push(["libopenblas.so.0"]);
  for (const d of dirs) out.push([`${d}/libblas.so.3`, `${d}/liblapack.so.3`]);
  out.push(["libblas.so.3", "liblapack.so.3"]);
  return out;
}

function tryOpen(paths: string[]): { libs: Lib[]; sym: Partial<Sym> } | string {
  const libs: Lib[] = [];
  const sym: Record<string, unknown> = {};
  try {
    for (const p of paths) {
      const lib = Deno.dlopen(p, symbols);
      libs.push(lib);
      for (const [k, v] of Object.entries(lib.symbols)) if (v && !sym[k]) sym[k] = v;
    }
  } catch (e) {
    for (const l of libs) l.close();
    return e instanceof Error ? e.message.split("\n")[0] : String(e);
  }
  const missing = [...REQUIRED_BLAS, ...REQUIRED_LAPACK].filter((k) => !sym[k]);
  if (missing.length > 0) {
    for (const l of libs) l.close();
    return `${paths.join(" + ")} lacks ${missing.join(", ")}`;
  }
  return { libs, sym: sym as Partial<Sym> };
}

/**
 * Open the native library: `path` when given (from `SADDLEKIT_BLAS`), else the platform's
 * usual places. Never throws.
 */
export function loadNativeKernels(path?: string): NativeLoad {
  const tries = path ? [[path]] : candidates(Deno.build.os);
  const failures: string[] = [];
  for (const paths of tries) {
    const r = tryOpen(paths);
    if (typeof r === "string") {
      failures.push(r);
      continue;
    }
    const s = r.sym as Sym;
    let version: string | undefined;
    if (s.openblas_get_config) {
      const p = s.openblas_get_config();
      if (p) version = Deno.UnsafePointerView.getCString(p).trim();
    }
    return { ok: true, kernels: makeKernels(s), info: { library: paths.join(" + "), version } };
  }
  return {
    ok: false,
    reason: path
      ? `SADDLEKIT_BLAS=${path} could not be loaded (${failures[0]})`
      : `no BLAS/LAPACK library found (tried ${tries.length} places; install Debian's ` +
        "libopenblas0, or set SADDLEKIT_BLAS to the library's path)",
  };
}

function makeKernels(s: Sym): Kernels {
  const U = new Uint8Array(["U".charCodeAt(0)]);
  const V = new Uint8Array(["V".charCodeAt(0)]);
  const N = new Uint8Array(["N".charCodeAt(0)]);
  const int = (v: number) => new Int32Array([v]);

  function gemm(g: GemmArgs): void {
    if (g.m === 0 || g.n === 0) return;
    s.cblas_dgemm!(
      ROW_MAJOR,
      g.transposeA ? TRANS : NO_TRANS,
      g.transposeB ? TRANS : NO_TRANS,
      g.m,
      g.n,
      g.k,
      g.alpha,
      g.a,
      Math.max(1, g.transposeA ? g.m : g.k),
      g.b,
      Math.max(1, g.transposeB ? g.k : g.n),
      g.beta,
      g.c,
      Math.max(1, g.n),
    );
  }

  function syrk({ a, n, d, outer, alpha, beta, c }: SyrkArgs) {
    const size = outer ? n : d;
    if (size === 0) return;
    s.cblas_dsyrk!(
      ROW_MAJOR,
      LOWER,
      outer ? NO_TRANS : TRANS,
      size,
      outer ? d : n,
      alpha,
      a,
      Math.max(1, d),
      beta,
      c,
      size,
    );
    mirrorLower(c, size);
  }

  function potrf(a: Float64Array, d: number): number {
    if (d === 0) return 0;
    // Row-major lower = column-major upper: A = Uᵀ U with U = Lᵀ.
    const info = int(0);
    s.dpotrf_!(U, int(d), a, int(d), info, 1n);
    if (info[0] < 0) throw new Error(`dpotrf_ rejected argument ${-info[0]}`);
    if (info[0] > 0) return info[0];
    for (let i = 0; i < d; i++) a.fill(0, i * d + i + 1, (i + 1) * d);
    return 0;
  }

  function trsm({ L, b, m, n, right, transposed }: TrsmArgs) {
    if (m === 0 || n === 0) return;
    s.cblas_dtrsm!(
      ROW_MAJOR,
      right ? RIGHT : LEFT,
      LOWER,
      transposed ? TRANS : NO_TRANS,
      NON_UNIT,
      m,
      n,
      1,
      L,
      right ? n : m,
      b,
      n,
    );
  }

  function potri(L: Float64Array, d: number): Float64Array {
    const x = Float64Array.from(L);
    if (d === 0) return x;
    const info = int(0);
    // Column-major upper U = Lᵀ with A = Uᵀ U: dpotri gives A⁻¹ in the upper triangle
    // (column-major), i.e. the row-major lower triangle.
    s.dpotri_!(U, int(d), x, int(d), info, 1n);
    if (info[0] !== 0) throw new Error(`dpotri_ failed (info ${info[0]})`);
    mirrorLower(x, d);
    return x;
  }

  function syev(a: Float64Array, d: number, vectors: boolean) {
    const values = new Float64Array(d);
    if (d === 0) return { values, vectors: vectors ? new Float64Array(0) : null };
    const jobz = vectors ? V : N;
    const n = int(d), lda = int(d), info = int(0);
    const wq = new Float64Array(1), iwq = new Int32Array(1);
    // Workspace query, then the solve. Column-major "U" reads the row-major lower triangle.
    s.dsyevd_!(jobz, U, n, a, lda, values, wq, int(-1), iwq, int(-1), info, 1n, 1n);
    if (info[0] !== 0) throw new Error(`dsyevd_ workspace query failed (info ${info[0]})`);
    const lwork = Math.ceil(wq[0]), liwork = iwq[0];
    const work = new Float64Array(Math.max(1, lwork));
    const iwork = new Int32Array(Math.max(1, liwork));
    s.dsyevd_!(jobz, U, n, a, lda, values, work, int(lwork), iwork, int(liwork), info, 1n, 1n);
    if (info[0] < 0) throw new Error(`dsyevd_ rejected argument ${-info[0]}`);
    if (info[0] > 0) return null;
    if (!vectors) return { values, vectors: null };
    // Column k of the column-major result is eigenvector k: transpose to row-major.
    const out = new Float64Array(d * d);
    for (let k = 0; k < d; k++) {
      const col = k * d;
      for (let i = 0; i < d; i++) out[i * d + k] = a[col + i];
    }
    return { values, vectors: out };
  }

  return { name: "native", gemm, syrk, potrf, trsm, potri, syev };
}
