/**
 * Which linear-algebra backend saddlekit uses, and why: native BLAS/LAPACK through Deno's
 * FFI when it can be loaded, pure TypeScript otherwise.
 *
 * @module
 */
import { htmlTable, textTable, withDisplay } from "../display/mod.ts";
import type { GemmArgs, Kernels } from "./_kernels.ts";
import { type Linalg, makeLinalg } from "./_linalg.ts";
import { loadNativeKernels, type NativeInfo } from "./_native_kernels.ts";
import { typescriptKernels } from "./_typescript_kernels.ts";

export type {
  CholeskyOptions,
  GemmOptions,
  Linalg,
  SymmetricEigen,
  SymmetricEigenOptions,
  SymmetricEigenValues,
  SyrkOptions,
  TraceSqrtProductOptions,
  TrsmOptions,
} from "./_linalg.ts";

/** What {@linkcode linalgBackend} reports. */
export interface LinalgBackend {
  /** The backend in use. */
  readonly name: "native" | "typescript";
  /** Path of the native library (native backend only). */
  readonly library?: string;
  /** Its version, when the library reports one (OpenBLAS's configuration line). */
  readonly version?: string;
  /** Why this backend was chosen. */
  readonly reason: string;
}

/** Every backend available in this process, for tests and benchmarks. */
export interface LinalgBackends {
  /** The pure-TypeScript operations (always available). */
  readonly typescript: Linalg;
  /** The native operations, or null when the library could not be loaded. */
  readonly native: Linalg | null;
  /** Why the native backend is or is not available. */
  readonly nativeReason: string;
}

/**
 * Below this many multiply-adds a kernel call stays in TypeScript even on the native
 * backend: the FFI call and its argument checks cost more than the arithmetic.
 */
const NATIVE_MIN_WORK = 4096;

function dispatch(native: Kernels, ts: Kernels): Kernels {
  const pick = (work: number) => (work >= NATIVE_MIN_WORK ? native : ts);
  return {
    name: "native",
    gemm: (g: GemmArgs) => pick(g.m * g.n * g.k).gemm(g),
    syrk: (args) => pick(args.n * args.d * args.d).syrk(args),
    potrf: (a, d) => pick(d * d * d).potrf(a, d),
    trsm: (t) => pick(t.m * t.n * (t.right ? t.n : t.m)).trsm(t),
    potri: (L, d) => pick(d * d * d).potri(L, d),
    syev: (a, d, v) => pick(d * d * d).syev(a, d, v),
  };
}

interface State {
  backend: LinalgBackend;
  active: Linalg;
  backends: LinalgBackends;
}

let state: State | undefined;

function granted(desc: Deno.PermissionDescriptor): boolean {
  try {
    return Deno.permissions.querySync(desc).state === "granted";
  } catch {
    return false;
  }
}

function choose(): State {
  const typescript = makeLinalg(typescriptKernels);
  const ts = (reason: string, nativeReason = reason): State => ({
    backend: { name: "typescript", reason },
    active: typescript,
    backends: { typescript, native: null, nativeReason },
  });
  try {
    const setting = granted({ name: "env", variable: "SADDLEKIT_BLAS" })
      ? Deno.env.get("SADDLEKIT_BLAS")?.trim()
      : undefined;
    if (setting?.toLowerCase() === "off") {
      return ts("SADDLEKIT_BLAS=off forces the TypeScript kernels");
    }
    if (!granted({ name: "ffi" }) || typeof Deno.dlopen !== "function") {
      return ts("no FFI permission (run Deno with --allow-ffi, or -A, for native BLAS/LAPACK)");
    }
    const load = loadNativeKernels(setting || undefined);
    if (!load.ok) return ts(`${load.reason}; using the TypeScript kernels`, load.reason);
    const native = makeLinalg(load.kernels);
    const backends = { typescript, native, nativeReason: `loaded ${load.info.library}` };
    const info: NativeInfo = load.info;
    return {
      backend: {
        name: "native",
        library: info.library,
        ...(info.version ? { version: info.version } : {}),
        reason: setting
          ? `SADDLEKIT_BLAS=${setting} loaded through Deno's FFI`
          : "FFI permission granted and the library was found",
      },
      active: makeLinalg(dispatch(load.kernels, typescriptKernels)),
      backends,
    };
  } catch (e) {
    return ts(`native backend unavailable (${e instanceof Error ? e.message : String(e)})`);
  }
}

function current(): State {
  return state ??= choose();
}

/**
 * The operations of the backend in use (chosen on first use, then fixed), as one object:
 * the same functions as the free ones (`gemm`, `cholesky`, ...), handy to pass around.
 * On the native backend, problems below a few thousand multiply-adds stay in TypeScript,
 * where the FFI call would cost more than the arithmetic.
 *
 * @example
 * ```ts
 * import { activeLinalg, linalgBackend } from "./backend.ts";
 * import assert from "node:assert/strict";
 * const la = activeLinalg();
 * assert.equal(la.name, linalgBackend().name);
 * assert.deepEqual(Array.from(la.cholesky([4, 2, 2, 3], 2)), [2, 0, 1, Math.SQRT2]);
 * ```
 */
export function activeLinalg(): Linalg {
  return current().active;
}

/**
 * The linear-algebra backend in use: `native` (OpenBLAS / LAPACK / Accelerate through
 * `Deno.dlopen`) when FFI permission is granted and the library loads, `typescript`
 * otherwise; `SADDLEKIT_BLAS=off` forces TypeScript and `SADDLEKIT_BLAS=/path/lib.so`
 * picks a library. Chosen once, on the first linear-algebra call, with no prompt and no
 * error. Displays as a table in a notebook cell.
 *
 * @example
 * ```ts
 * import { linalgBackend } from "./backend.ts";
 * import assert from "node:assert/strict";
 * const backend = linalgBackend();
 * assert.ok(backend.name === "native" || backend.name === "typescript");
 * assert.ok(backend.reason.length > 0);
 * if (backend.name === "native") assert.ok(backend.library);
 * console.log(`${backend.name}: ${backend.reason}`);
 * ```
 */
export function linalgBackend(): LinalgBackend {
  const b = current().backend;
  return withDisplay({ ...b }, (o) => {
    const rows: [string, string][] = [["backend", o.name]];
    if (o.library) rows.push(["library", o.library]);
    if (o.version) rows.push(["version", o.version]);
    rows.push(["reason", o.reason]);
    return {
      "text/html": htmlTable(["linear algebra", ""], rows),
      "text/plain": textTable(["linear algebra", ""], rows),
    };
  });
}

/**
 * Both backends' operations, for tests and benchmarks that compare them in one process.
 * `native` is null when the library cannot be loaded (or FFI is not permitted). Unlike the
 * functions of the active backend, these never hand small problems to TypeScript.
 *
 * @example
 * ```ts
 * import { linalgBackends } from "./backend.ts";
 * import assert from "node:assert/strict";
 * const { typescript, native } = linalgBackends();
 * const c = typescript.gemm([1, 2, 3, 4], [1, 0, 0, 1], { m: 2, n: 2, k: 2 });
 * assert.deepEqual(Array.from(c), [1, 2, 3, 4]);
 * if (native) assert.deepEqual(Array.from(native.gemm([1, 2, 3, 4], [1, 0, 0, 1], { m: 2, n: 2, k: 2 })), [1, 2, 3, 4]);
 * ```
 */
export function linalgBackends(): LinalgBackends {
  return current().backends;
}
