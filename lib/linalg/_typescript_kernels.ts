/**
 * Pure-TypeScript kernels: blocked, cache-aware loops (i-k-j order, tiles of the shared
 * operand), no allocation per element. The symmetric eigensolver is Householder
 * tridiagonalisation followed by implicit QL (the EISPACK tred2/tql2 pair), working on the
 * column-major transpose so that every inner loop runs over contiguous memory.
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

/** Depth and width of the gemm/syrk tiles (a 128 x 256 tile of B is 256 KiB). */
const TILE_K = 128;
const TILE_N = 256;

function gemm(g: GemmArgs): void {
  const { m, n, k, alpha, a, c } = g;
  if (g.beta === 0) c.fill(0, 0, m * n);
  else if (g.beta !== 1) { for (let i = 0; i < m * n; i++) c[i] *= g.beta; }
  // op(B) as a row-major k x n array with contiguous rows.
  let b = g.b;
  if (g.transposeB) {
    b = new Float64Array(k * n);
    for (let j = 0; j < n; j++) for (let p = 0; p < k; p++) b[p * n + j] = g.b[j * k + p];
  }
  const ta = g.transposeA;
  for (let j0 = 0; j0 < n; j0 += TILE_N) {
    const j1 = Math.min(n, j0 + TILE_N);
    for (let p0 = 0; p0 < k; p0 += TILE_K) {
      const p1 = Math.min(k, p0 + TILE_K);
      for (let i = 0; i < m; i++) {
        const ci = i * n;
        let p = p0;
        // Four rows of B at a time: one pass over the row of C per four products.
        for (; p + 4 <= p1; p += 4) {
          const a0 = alpha * (ta ? a[p * m + i] : a[i * k + p]);
          const a1 = alpha * (ta ? a[(p + 1) * m + i] : a[i * k + p + 1]);
          const a2 = alpha * (ta ? a[(p + 2) * m + i] : a[i * k + p + 2]);
          const a3 = alpha * (ta ? a[(p + 3) * m + i] : a[i * k + p + 3]);
          const b0 = p * n, b1 = b0 + n, b2 = b1 + n, b3 = b2 + n;
          for (let j = j0; j < j1; j++) {
            c[ci + j] += a0 * b[b0 + j] + a1 * b[b1 + j] + a2 * b[b2 + j] + a3 * b[b3 + j];
          }
        }
        for (; p < p1; p++) {
          const aip = alpha * (ta ? a[p * m + i] : a[i * k + p]);
          const bp = p * n;
          for (let j = j0; j < j1; j++) c[ci + j] += aip * b[bp + j];
        }
      }
    }
  }
}

/** `beta C` on the lower triangle of the `size x size` matrix `c` (0: cleared). */
function scaleLower(c: Float64Array, size: number, beta: number): void {
  if (beta === 0) c.fill(0, 0, size * size);
  else if (beta !== 1) {
    for (let i = 0; i < size; i++) for (let j = 0; j <= i; j++) c[i * size + j] *= beta;
  }
}

function syrk({ a, n, d, outer, alpha, beta, c }: SyrkArgs): void {
  if (outer) {
    // (A Aᵀ)_ij = row i · row j: contiguous dot products.
    for (let i = 0; i < n; i++) {
      for (let j = 0; j <= i; j++) {
        let s = 0;
        for (let p = 0; p < d; p++) s += a[i * d + p] * a[j * d + p];
        const v = beta === 0 ? alpha * s : alpha * s + beta * c[i * n + j];
        c[i * n + j] = v;
        c[j * n + i] = v;
      }
    }
    return;
  }
  // (AᵀA) = Σ_rows outer(row, row), lower triangle, in square tiles of C (128 x 128,
  // 128 KiB: stays in cache while all the rows stream past), then mirrored.
  scaleLower(c, d, beta);
  const T = TILE_K;
  for (let y0 = 0; y0 < d; y0 += T) {
    const y1 = Math.min(d, y0 + T);
    for (let x0 = 0; x0 <= y0; x0 += T) {
      const x1 = Math.min(d, x0 + T);
      // Four rows at a time: one pass over the tile of C per four rows of A.
      let r = 0;
      for (; r + 4 <= n; r += 4) {
        const r0 = r * d, r1 = r0 + d, r2 = r1 + d, r3 = r2 + d;
        for (let y = y0; y < y1; y++) {
          const v0 = alpha * a[r0 + y], v1 = alpha * a[r1 + y];
          const v2 = alpha * a[r2 + y], v3 = alpha * a[r3 + y];
          const cy = y * d;
          const xe = Math.min(x1, y + 1);
          for (let x = x0; x < xe; x++) {
            c[cy + x] += v0 * a[r0 + x] + v1 * a[r1 + x] + v2 * a[r2 + x] + v3 * a[r3 + x];
          }
        }
      }
      for (; r < n; r++) {
        const row = r * d;
        for (let y = y0; y < y1; y++) {
          const v = alpha * a[row + y];
          const cy = y * d;
          const xe = Math.min(x1, y + 1);
          for (let x = x0; x < xe; x++) c[cy + x] += v * a[row + x];
        }
      }
    }
  }
  mirrorLower(c, d);
}

function potrf(a: Float64Array, d: number): number {
  // Row-oriented Cholesky-Crout: both dot products run over contiguous rows of L.
  for (let j = 0; j < d; j++) {
    const rj = j * d;
    let s = a[rj + j];
    for (let k = 0; k < j; k++) s -= a[rj + k] * a[rj + k];
    if (!(s > 0)) return j + 1;
    const ljj = Math.sqrt(s);
    a[rj + j] = ljj;
    for (let i = j + 1; i < d; i++) {
      const ri = i * d;
      let t = a[ri + j];
      for (let k = 0; k < j; k++) t -= a[ri + k] * a[rj + k];
      a[ri + j] = t / ljj;
    }
  }
  for (let i = 0; i < d; i++) a.fill(0, i * d + i + 1, (i + 1) * d);
  return 0;
}

function trsm({ L, b, m, n, right, transposed }: TrsmArgs): void {
  if (right) {
    // Row by row: X Lᵀ = B is forward substitution on each row (x = L⁻¹ b), X L = B back
    // substitution with Lᵀ; L's rows are read contiguously.
    const inv = new Float64Array(n);
    for (let i = 0; i < n; i++) inv[i] = 1 / L[i * n + i];
    for (let r = 0; r < m; r++) {
      const o = r * n;
      if (transposed) {
        for (let i = 0; i < n; i++) {
          let s = b[o + i];
          const li = i * n;
          for (let k = 0; k < i; k++) s -= L[li + k] * b[o + k];
          b[o + i] = s * inv[i];
        }
      } else {
        for (let i = n - 1; i >= 0; i--) {
          const li = i * n;
          const x = b[o + i] * inv[i];
          b[o + i] = x;
          for (let k = 0; k < i; k++) b[o + k] -= x * L[li + k];
        }
      }
    }
    return;
  }
  const d = m, nrhs = n;
  if (!transposed) {
    // Forward substitution, row by row: B_i -= L_ik B_k (k < i), then / L_ii.
    for (let i = 0; i < d; i++) {
      const bi = i * nrhs;
      for (let k = 0; k < i; k++) {
        const l = L[i * d + k];
        if (l === 0) continue;
        const bk = k * nrhs;
        for (let j = 0; j < nrhs; j++) b[bi + j] -= l * b[bk + j];
      }
      const inv = 1 / L[i * d + i];
      for (let j = 0; j < nrhs; j++) b[bi + j] *= inv;
    }
    return;
  }
  // Back substitution with Lᵀ: once row i of X is final, remove it from the rows above.
  for (let i = d - 1; i >= 0; i--) {
    const bi = i * nrhs;
    const inv = 1 / L[i * d + i];
    for (let j = 0; j < nrhs; j++) b[bi + j] *= inv;
    for (let k = 0; k < i; k++) {
      const l = L[i * d + k];
      if (l === 0) continue;
      const bk = k * nrhs;
      for (let j = 0; j < nrhs; j++) b[bk + j] -= l * b[bi + j];
    }
  }
}

function potri(L: Float64Array, d: number): Float64Array {
  // A⁻¹ = L⁻ᵀ L⁻¹: solve L Y = I, then Lᵀ X = Y.
  const x = new Float64Array(d * d);
  for (let i = 0; i < d; i++) x[i * d + i] = 1;
  trsm({ L, b: x, m: d, n: d, right: false, transposed: false });
  trsm({ L, b: x, m: d, n: d, right: false, transposed: true });
  for (let i = 0; i < d; i++) {
    for (let j = i + 1; j < d; j++) {
      const m = 0.5 * (x[i * d + j] + x[j * d + i]);
      x[i * d + j] = m;
      x[j * d + i] = m;
    }
  }
  return x;
}

/**
 * Householder reduction to tridiagonal form (EISPACK tred2). `w` holds the symmetric
 * matrix; it is read as column-major `V` (`V[r][c] = w[c n + r]`), so the inner loops over
 * the row index are contiguous. On return `diag`, `off` hold the tridiagonal matrix and,
 * with `vectors`, `w` holds the orthogonal transformation (column-major).
 */
function tred2(
  w: Float64Array,
  n: number,
  diag: Float64Array,
  off: Float64Array,
  vectors: boolean,
): void {
  const d = diag, e = off;
  for (let j = 0; j < n; j++) d[j] = w[j * n + n - 1];
  for (let i = n - 1; i > 0; i--) {
    let scale = 0, h = 0;
    for (let k = 0; k < i; k++) scale += Math.abs(d[k]);
    if (scale === 0) {
      e[i] = d[i - 1];
      for (let j = 0; j < i; j++) {
        d[j] = w[j * n + i - 1];
        w[j * n + i] = 0;
        w[i * n + j] = 0;
      }
    } else {
      for (let k = 0; k < i; k++) {
        d[k] /= scale;
        h += d[k] * d[k];
      }
      let f = d[i - 1];
      let g = Math.sqrt(h);
      if (f > 0) g = -g;
      e[i] = scale * g;
      h -= f * g;
      d[i - 1] = f - g;
      for (let j = 0; j < i; j++) e[j] = 0;
      for (let j = 0; j < i; j++) {
        f = d[j];
        const cj = j * n;
        w[i * n + j] = f;
        g = e[j] + w[cj + j] * f;
        for (let k = j + 1; k < i; k++) {
          const v = w[cj + k];
          g += v * d[k];
          e[k] += v * f;
        }
        e[j] = g;
      }
      f = 0;
      for (let j = 0; j < i; j++) {
        e[j] /= h;
        f += e[j] * d[j];
      }
      const hh = f / (h + h);
      for (let j = 0; j < i; j++) e[j] -= hh * d[j];
      for (let j = 0; j < i; j++) {
        f = d[j];
        g = e[j];
        const cj = j * n;
        for (let k = j; k < i; k++) w[cj + k] -= f * e[k] + g * d[k];
        d[j] = w[cj + i - 1];
        w[cj + i] = 0;
      }
    }
    d[i] = h;
  }
  if (!vectors) {
    for (let j = 0; j < n; j++) d[j] = w[j * n + j];
    e[0] = 0;
    return;
  }
  // Accumulate the transformations.
  for (let i = 0; i < n - 1; i++) {
    w[i * n + n - 1] = w[i * n + i];
    w[i * n + i] = 1;
    const h = d[i + 1];
    const ci1 = (i + 1) * n;
    if (h !== 0) {
      for (let k = 0; k <= i; k++) d[k] = w[ci1 + k] / h;
      for (let j = 0; j <= i; j++) {
        const cj = j * n;
        let g = 0;
        for (let k = 0; k <= i; k++) g += w[ci1 + k] * w[cj + k];
        for (let k = 0; k <= i; k++) w[cj + k] -= g * d[k];
      }
    }
    for (let k = 0; k <= i; k++) w[ci1 + k] = 0;
  }
  for (let j = 0; j < n; j++) {
    d[j] = w[j * n + n - 1];
    w[j * n + n - 1] = 0;
  }
  w[(n - 1) * n + n - 1] = 1;
  e[0] = 0;
}

/** Implicit QL on the tridiagonal matrix (EISPACK tql2); false when it does not converge. */
function tql2(
  w: Float64Array | null,
  n: number,
  d: Float64Array,
  e: Float64Array,
): boolean {
  for (let i = 1; i < n; i++) e[i - 1] = e[i];
  e[n - 1] = 0;
  let f = 0, tst1 = 0;
  const eps = Number.EPSILON;
  for (let l = 0; l < n; l++) {
    tst1 = Math.max(tst1, Math.abs(d[l]) + Math.abs(e[l]));
    let m = l;
    while (m < n - 1 && Math.abs(e[m]) > eps * tst1) m++;
    if (m > l) {
      let iter = 0;
      do {
        if (++iter > 60) return false;
        let g = d[l];
        let p = (d[l + 1] - g) / (2 * e[l]);
        let r = Math.hypot(p, 1);
        if (p < 0) r = -r;
        d[l] = e[l] / (p + r);
        d[l + 1] = e[l] * (p + r);
        const dl1 = d[l + 1];
        let h = g - d[l];
        for (let i = l + 2; i < n; i++) d[i] -= h;
        f += h;
        p = d[m];
        let c = 1, c2 = 1, c3 = 1, s = 0, s2 = 0;
        const el1 = e[l + 1];
        for (let i = m - 1; i >= l; i--) {
          c3 = c2;
          c2 = c;
          s2 = s;
          g = c * e[i];
          h = c * p;
          r = Math.hypot(p, e[i]);
          e[i + 1] = s * r;
          s = e[i] / r;
          c = p / r;
          p = c * d[i] - s * g;
          d[i + 1] = h + s * (c * g + s * d[i]);
          if (w) {
            const ci = i * n, ci1 = (i + 1) * n;
            for (let k = 0; k < n; k++) {
              const t = w[ci1 + k];
              const u = w[ci + k];
              w[ci1 + k] = s * u + c * t;
              w[ci + k] = c * u - s * t;
            }
          }
        }
        p = -s * s2 * c3 * el1 * e[l] / dl1;
        e[l] = s * p;
        d[l] = c * p;
      } while (Math.abs(e[l]) > eps * tst1);
    }
    d[l] += f;
    e[l] = 0;
  }
  return true;
}

function syev(a: Float64Array, d: number, vectors: boolean) {
  // Mirror the lower triangle: the column-major reading is then the same matrix.
  for (let i = 0; i < d; i++) for (let j = i + 1; j < d; j++) a[i * d + j] = a[j * d + i];
  const diag = new Float64Array(d), off = new Float64Array(d);
  tred2(a, d, diag, off, vectors);
  if (!tql2(vectors ? a : null, d, diag, off)) return null;
  const order = Array.from({ length: d }, (_, i) => i).sort((i, j) => diag[i] - diag[j]);
  const values = new Float64Array(d);
  for (let k = 0; k < d; k++) values[k] = diag[order[k]];
  if (!vectors) return { values, vectors: null };
  const out = new Float64Array(d * d);
  for (let k = 0; k < d; k++) {
    const col = order[k] * d;
    for (let i = 0; i < d; i++) out[i * d + k] = a[col + i];
  }
  return { values, vectors: out };
}

/** The pure-TypeScript kernels. */
export const typescriptKernels: Kernels = {
  name: "typescript",
  gemm,
  syrk,
  potrf,
  trsm,
  potri,
  syev,
};
