/**
 * Both linear-algebra backends in one process: each against Debian's numpy/scipy, and
 * against each other (products and eigenvalues to 1e-12 relative to the matrix's scale,
 * eigenvectors up to sign), on random, ill-conditioned and singular matrices; the same
 * SaddleErrors from both. Run a second time by CI with SADDLEKIT_BLAS=off, where only the
 * TypeScript backend is loaded.
 */
import assert from "node:assert/strict";
import { type Linalg, linalgBackend, linalgBackends } from "../../lib/linalg/backend.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import { Rng } from "../../lib/random/rng.ts";
import { assertAllClose, assertClose } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";

const { typescript, native, nativeReason } = linalgBackends();
const backends: Linalg[] = native ? [typescript, native] : [typescript];

/** Q diag(λ) Qᵀ with Q a random orthogonal matrix (QR of a Gaussian matrix by Gram-Schmidt). */
function withSpectrum(lambda: number[], r: Rng): Float64Array {
  const d = lambda.length;
  const q = r.fillNormal(new Float64Array(d * d));
  for (let j = 0; j < d; j++) {
    for (let pass = 0; pass < 2; pass++) {
      for (let p = 0; p < j; p++) {
        let s = 0;
        for (let i = 0; i < d; i++) s += q[i * d + j] * q[i * d + p];
        for (let i = 0; i < d; i++) q[i * d + j] -= s * q[i * d + p];
      }
    }
    let s = 0;
    for (let i = 0; i < d; i++) s += q[i * d + j] ** 2;
    for (let i = 0; i < d; i++) q[i * d + j] /= Math.sqrt(s);
  }
  const a = new Float64Array(d * d);
  for (let i = 0; i < d; i++) {
    for (let j = 0; j <= i; j++) {
      let s = 0;
      for (let k = 0; k < d; k++) s += q[i * d + k] * lambda[k] * q[j * d + k];
      a[i * d + j] = s;
      a[j * d + i] = s;
    }
  }
  return a;
}

const maxAbs = (x: ArrayLike<number>) =>
  Array.from(x).reduce((m, v) => Math.max(m, Math.abs(v)), 0);

/** Agreement to 1e-12 relative to the largest entry (the matrix's scale). */
function assertScaled(
  actual: ArrayLike<number>,
  expected: ArrayLike<number>,
  what: string,
  rel = 1e-12,
) {
  assertAllClose(
    actual,
    Array.from(expected),
    { abs: rel * Math.max(maxAbs(expected), 1e-300) },
    what,
  );
}

/** Columns equal up to sign, where the eigenvalue is separated from its neighbours. */
function assertVectorsUpToSign(
  v: Float64Array,
  ref: ArrayLike<number>,
  values: ArrayLike<number>,
  d: number,
  what: string,
) {
  const scale = maxAbs(values);
  for (let k = 0; k < d; k++) {
    const gap = Math.min(
      k > 0 ? values[k] - values[k - 1] : Infinity,
      k < d - 1 ? values[k + 1] - values[k] : Infinity,
    );
    // Perturbation theory (Davis-Kahan): a vector is determined to ~ε‖A‖ / gap.
    const tol = Math.max(1e-12, 1e-13 * scale / gap);
    if (tol > 1e-6) continue;
    let dot = 0;
    for (let i = 0; i < d; i++) dot += v[i * d + k] * ref[i * d + k];
    const sign = dot < 0 ? -1 : 1;
    for (let i = 0; i < d; i++) {
      assertClose(v[i * d + k], sign * ref[i * d + k], { abs: tol }, `${what} vector ${k}`);
    }
  }
}

interface Case {
  name: string;
  spectrum: (d: number) => number[];
}

const cases: Case[] = [
  { name: "random", spectrum: (d) => Array.from({ length: d }, (_, i) => 1 + i + 0.37 * (i % 3)) },
  // Condition number 1e12.
  {
    name: "ill-conditioned",
    spectrum: (d) => Array.from({ length: d }, (_, i) => 10 ** (-12 * i / (d - 1))),
  },
  // Rank d/2: half the eigenvalues exactly 0.
  { name: "singular", spectrum: (d) => Array.from({ length: d }, (_, i) => (i % 2 ? 0 : 1 + i)) },
];

const REF_D = 37, REF_N = 61;

/** A well-conditioned random lower-triangular matrix (junk above the diagonal: ignored). */
function randomLower(d: number, r: Rng): Float64Array {
  const t = r.fillNormal(new Float64Array(d * d));
  for (let i = 0; i < d; i++) {
    for (let j = 0; j < i; j++) t[i * d + j] /= Math.sqrt(d);
    t[i * d + i] = 1 + Math.abs(t[i * d + i]);
  }
  return t;
}

/** The symmetric `c` with its upper triangle garbled: syrk must read only the lower one. */
function lowerOnly(c: Float64Array, d: number): Float64Array {
  const out = Float64Array.from(c);
  for (let i = 0; i < d; i++) for (let j = i + 1; j < d; j++) out[i * d + j] = 1e300;
  return out;
}

function transposed(x: Float64Array, n: number, d: number): Float64Array {
  const t = new Float64Array(n * d);
  for (let i = 0; i < n; i++) for (let j = 0; j < d; j++) t[j * n + i] = x[i * d + j];
  return t;
}

/** The four trsm variants: reference key, side, transpose, right-hand side, its shape. */
function trsmVariants(
  x: Float64Array,
  xt: Float64Array,
  n: number,
  d: number,
): [string, "left" | "right", boolean, Float64Array, number, number][] {
  return [
    ["trsm_right_t", "right", true, x, n, d],
    ["trsm_right", "right", false, x, n, d],
    ["trsm_left", "left", false, xt, d, n],
    ["trsm_left_t", "left", true, xt, d, n],
  ];
}

for (const c of cases) {
  Deno.test({
    name: `linalg backends (${
      backends.map((b) => b.name).join(" + ")
    }), ${c.name} ${REF_D} x ${REF_D}: ` +
      "syrk, gram, gemm, eigh, traceSqrtProduct, Cholesky vs numpy/scipy",
    ignore: ignoreWithoutPython(["numpy", "scipy"]),
    async fn() {
      const r = new Rng(`linalg-${c.name}`);
      const d = REF_D, n = REF_N;
      const a = withSpectrum(c.spectrum(d), r);
      const b = withSpectrum(
        c.spectrum(d).map((v) =>
          v * 2
        ),
        r,
      );
      const cc = withSpectrum(c.spectrum(d).reverse(), r);
      const x = r.fillNormal(new Float64Array(n * d));
      const tri = randomLower(d, r);
      const ref = await runReference<Record<string, number[] | number | null>>("linalg_check.py", {
        kernels: true,
        n,
        d,
        x,
        a,
        b,
        c: cc,
        tri,
      });
      for (const k of backends) {
        const at = `${k.name}/${c.name}`;
        assertScaled(k.syrk(x, { n, d }), ref.syrk as number[], `${at} syrk`);
        assertScaled(k.syrk(x, { n, d, outer: true }), ref.gram as number[], `${at} gram`);
        assertScaled(k.gemm(a, b, { m: d, n: d, k: d }), ref.gemm as number[], `${at} gemm`);
        const acc = k.syrk(x, { n, d, alpha: 2, beta: 0.5, c: lowerOnly(cc, d) });
        assertScaled(acc, ref.syrk_acc as number[], `${at} syrk accumulate`);
        // Triangular solves with a block: rows of x (right side) or its columns (left).
        const xt = transposed(x, n, d);
        for (const [key, side, transpose, rhs, rows, cols] of trsmVariants(x, xt, n, d)) {
          const got = k.trsm(tri, rhs, { m: rows, n: cols, side, transpose });
          assertScaled(got, ref[key] as number[], `${at} ${key}`);
        }
        const e = k.symmetricEigen(a, d);
        assertScaled(e.values, ref.eigenvalues as number[], `${at} eigenvalues`);
        assertScaled(
          k.symmetricEigen(a, d, { vectors: false }).values,
          e.values,
          `${at} values only`,
          1e-14,
        );
        assertVectorsUpToSign(e.vectors, ref.vectors as number[], e.values, d, at);
        // Eigenvalues of B^½ C B^½ carry absolute rounding up to ~ d ε ‖B‖ ‖C‖, and the
        // square root turns that into up to √(d ε ‖B‖ ‖C‖) per eigenvalue near 0
        // (ill-conditioned, singular): the accuracy of any method, numpy's included.
        const normB = 2 * maxAbs(c.spectrum(d)), normC = maxAbs(c.spectrum(d));
        const floor = d * Math.sqrt(d * Number.EPSILON * normB * normC);
        assertClose(k.traceSqrtProduct(b, cc, d), ref.trace_sqrt as number, {
          rel: 1e-9,
          abs: floor,
        }, `${at} trace`);
        // The factor's forward error grows like ε √κ(B) (first-order perturbation bound of
        // the Cholesky factor, Sun 1991; recalled from memory).
        const sp = c.spectrum(d).filter((v) => v > 0);
        const cholTol = Math.max(1e-11, 1e-14 * Math.sqrt(Math.max(...sp) / Math.min(...sp)));
        if (ref.cholesky) {
          assertScaled(k.cholesky(b, d), ref.cholesky as number[], `${at} cholesky`, cholTol);
        } else assert.throws(() => k.cholesky(b, d), /cholesky: matrix is not positive definite/);
      }
    },
  });
}

Deno.test(`linalg backends agree with each other (native: ${nativeReason})`, {
  ignore: native === null,
}, () => {
  const nat = native!;
  const r = new Rng(7);
  // Sizes crossing the TypeScript tiles (128 deep, 256 wide) and odd shapes.
  for (const [m, n, k] of [[1, 1, 1], [3, 300, 130], [260, 5, 7], [64, 64, 64]]) {
    const a = r.fillNormal(new Float64Array(m * k));
    const b = r.fillNormal(new Float64Array(k * n));
    for (const transposeA of [false, true]) {
      for (const transposeB of [false, true]) {
        const c0 = r.fillNormal(new Float64Array(m * n));
        const o = { m, n, k, transposeA, transposeB, alpha: 1.5, beta: -0.5 };
        const ct = typescript.gemm(a, b, { ...o, c: Float64Array.from(c0) });
        const cn = nat.gemm(a, b, { ...o, c: Float64Array.from(c0) });
        assertScaled(cn, ct, `gemm ${m}x${n}x${k} ${transposeA} ${transposeB}`);
      }
    }
  }
  for (const c of cases) {
    const d = 150;
    const a = withSpectrum(c.spectrum(d), r);
    const et = typescript.symmetricEigen(a, d), en = nat.symmetricEigen(a, d);
    assertScaled(en.values, et.values, `${c.name} eigenvalues`);
    assertVectorsUpToSign(en.vectors, et.vectors, et.values, d, c.name);
    assertScaled(nat.sqrtSymmetric(a, d), typescript.sqrtSymmetric(a, d), `${c.name} sqrt`, 1e-10);
    assertClose(nat.traceSqrtProduct(a, a, d), typescript.traceSqrtProduct(a, a, d), {
      rel: 1e-10,
    });
    const x = r.fillNormal(new Float64Array(300 * d));
    assertScaled(nat.syrk(x, { n: 300, d }), typescript.syrk(x, { n: 300, d }), `${c.name} syrk`);
    const sa = { n: 300, d, alpha: -1.5, beta: 2 };
    assertScaled(
      nat.syrk(x, { ...sa, c: lowerOnly(a, d) }),
      typescript.syrk(x, { ...sa, c: lowerOnly(a, d) }),
      `${c.name} syrk accumulate`,
    );
    const tri = randomLower(d, r);
    for (
      const [key, side, transpose, rhs, rows, cols] of trsmVariants(
        x,
        transposed(x, 300, d),
        300,
        d,
      )
    ) {
      const o = { m: rows, n: cols, side, transpose };
      assertScaled(nat.trsm(tri, rhs, o), typescript.trsm(tri, rhs, o), `${c.name} ${key}`, 1e-11);
      // In place: out = b.
      const inPlace = Float64Array.from(rhs);
      typescript.trsm(tri, inPlace, { ...o, out: inPlace });
      assertScaled(inPlace, typescript.trsm(tri, rhs, o), `${c.name} ${key} in place`, 0);
    }
    if (c.name !== "singular") {
      const spd = Float64Array.from(a, (v, i) => v + (i % (d + 1) === 0 ? 1e-3 : 0));
      const Lt = typescript.cholesky(spd, d), Ln = nat.cholesky(spd, d);
      assertScaled(Ln, Lt, `${c.name} cholesky`, 1e-11);
      const rhs = r.fillNormal(new Float64Array(d));
      assertScaled(
        nat.choleskySolve(Ln, d, rhs),
        typescript.choleskySolve(Lt, d, rhs),
        "solve",
        1e-9,
      );
      assertScaled(
        nat.solveLower(Ln, d, rhs),
        typescript.solveLower(Lt, d, rhs),
        "solveLower",
        1e-10,
      );
      assertScaled(nat.choleskyInverse(Ln, d), typescript.choleskyInverse(Lt, d), "inverse", 1e-9);
    }
  }
});

Deno.test("linalg: traceSqrtProduct is tr(A) when B = A (tr (A²)^½ = tr A, A PSD) and handles singular input", () => {
  // Common practice, no source: (A^½ A A^½)^½ = A for PSD A.
  const r = new Rng(11);
  const d = 20;
  const spectrum = Array.from({ length: d }, (_, i) => (i < 5 ? 0 : i));
  const a = withSpectrum(spectrum, r);
  const tr = spectrum.reduce((s, v) => s + v, 0);
  for (const k of backends) {
    assertClose(k.traceSqrtProduct(a, a, d), tr, { rel: 1e-12 }, k.name);
    assert.equal(k.traceSqrtProduct(new Float64Array(d * d), a, d), 0);
  }
});

Deno.test("linalg: both backends throw the same SaddleErrors, naming the operation", () => {
  const messages = backends.map((k) => {
    const out: string[] = [];
    const grab = (f: () => unknown, code: string, op: string) => {
      try {
        f();
        assert.fail(`${k.name}: ${op} did not throw`);
      } catch (e) {
        assert.ok(e instanceof SaddleError, `${k.name}: ${op} threw ${e}`);
        assert.equal(e.code, code, `${k.name}: ${op}: ${e.message}`);
        assert.ok(e.message.includes(` ${op}: `), e.message);
        out.push(e.message);
      }
    };
    grab(() => k.cholesky([1, 2, 2, 4], 2), "singular", "cholesky");
    grab(() => k.cholesky([1, 0, 0, 0, 1, 0, 0, 0, -1], 3), "singular", "cholesky");
    grab(() => k.cholesky([1, 0, 0, NaN], 2), "singular", "cholesky");
    grab(() => k.symmetricEigen([1, 0, Infinity, 1], 2), "non-finite", "symmetricEigen");
    grab(() => k.symmetricEigen([1, 0, 0], 2), "dimension-mismatch", "symmetricEigen");
    grab(() => k.gemm([1, NaN], [1, 1], { m: 1, n: 1, k: 2 }), "non-finite", "gemm");
    grab(() => k.gemm([1, 2], [1], { m: 1, n: 1, k: 2 }), "dimension-mismatch", "gemm");
    grab(() => k.syrk([1, 2, 3], { n: 2, d: 2 }), "dimension-mismatch", "syrk");
    grab(() => k.solveLower([1, 0, 1, 0], 2, [1, 1]), "singular", "solveLower");
    grab(() => k.trsm([1, 0, 1, 0], [1, 1], { m: 1, n: 2, side: "right" }), "singular", "trsm");
    grab(() => k.trsm([1, 0, 1, 1], [1, NaN], { m: 2, n: 1 }), "non-finite", "trsm");
    grab(() => k.trsm([1, 0, 1, 1], [1, 1, 1], { m: 1, n: 2 }), "dimension-mismatch", "trsm");
    grab(
      () => k.syrk([1, 2], { n: 1, d: 2, c: new Float64Array(3) }),
      "dimension-mismatch",
      "syrk",
    );
    grab(() => k.choleskyInverse([0, 0, 0, 1], 2), "singular", "choleskyInverse");
    grab(() => k.sqrtSymmetric([1, 0, 0, -1], 2), "singular", "sqrtSymmetric");
    grab(() => k.traceSqrtProduct([1, 0, 0, 1], [1, 0, 0, -1], 2), "singular", "traceSqrtProduct");
    grab(() => k.traceSqrtProduct([-1, 0, 0, 1], [1, 0, 0, 1], 2), "singular", "traceSqrtProduct");
    return out;
  });
  if (messages.length === 2) assert.deepEqual(messages[1], messages[0]);
});

Deno.test("linalg: the native backend loads where CI requires it (SADDLEKIT_REQUIRE_NATIVE=1)", {
  ignore: Deno.env.get("SADDLEKIT_REQUIRE_NATIVE") !== "1" ||
    Deno.env.get("SADDLEKIT_BLAS")?.toLowerCase() === "off",
}, () => {
  assert.ok(native, `native backend required but unavailable: ${nativeReason}`);
  assert.equal(linalgBackend().name, "native");
});

Deno.test("linalgBackend: names the backend, why, and displays as a table", () => {
  const b = linalgBackend();
  const off = Deno.env.get("SADDLEKIT_BLAS")?.toLowerCase() === "off";
  assert.equal(b.name, off ? "typescript" : native ? "native" : "typescript");
  if (off) assert.match(b.reason, /SADDLEKIT_BLAS=off/);
  if (b.name === "native") assert.ok(b.library && b.library.length > 0);
  const show = (b as unknown as Record<symbol, () => Record<string, string>>)[
    Symbol.for("Jupyter.display")
  ];
  assert.match(show()["text/html"], /<table/);
  assert.match(show()["text/plain"], new RegExp(b.name));
});
