/**
 * Row sums of kernel matrices, computed tile by tile so no `n x n` matrix is ever held:
 * the engine behind the MMD, the energy distance and the kernel two-sample test.
 *
 * @module
 */
import type { Samples } from "../samples/mod.ts";
import { gramBlock, rowSquaredNorms } from "../neighbors/mod.ts";

/** Rows `start .. start + rows` of a sample set, with the squared norms of all its rows. */
export interface KernelBlock {
  /** The sample set. */
  readonly s: Samples;
  /** Squared norm of every row of `s`. */
  readonly norms: Float64Array;
  /** First row of the block. */
  readonly start: number;
  /** Rows in the block. */
  readonly rows: number;
}

/** A kernel on `R^d`: Gaussian `exp(−‖x−y‖²/(2σ²))`, cubic `(x·y/d + 1)³`, or `−‖x−y‖`. */
export type KernelSpec =
  | { readonly kind: "gaussian"; readonly bandwidth: number }
  | { readonly kind: "cubic" }
  | { readonly kind: "distance" };

/** Off-diagonal and cross row sums of the kernel matrices of `x` (n) and `y` (m). */
export interface KernelSums {
  /** `Σ_{j≠i} k(x_i, x_j)` per row of x. */
  readonly xx: Float64Array;
  /** `Σ_j k(x_i, y_j)` per row of x. */
  readonly xy: Float64Array;
  /** `Σ_{j≠i} k(y_i, y_j)` per row of y. */
  readonly yy: Float64Array;
  /** `Σ_i k(x_i, y_j)` per row of y. */
  readonly yx: Float64Array;
  /** `Σ_i k(x_i, x_i)` and `Σ_j k(y_j, y_j)`. */
  readonly diagX: number;
  readonly diagY: number;
}

const TILE = 512;

/** Kernel row sums of `x` and `y` by tiles (the symmetric blocks computed once). */
export function kernelSums(x: Samples, y: Samples, kernel: KernelSpec): KernelSums {
  const xx = new Float64Array(x.n), xy = new Float64Array(x.n);
  const yy = new Float64Array(y.n), yx = new Float64Array(y.n);
  const nx = rowSquaredNorms(x.data, x.n, x.d), ny = rowSquaredNorms(y.data, y.n, y.d);
  const tile = new Float64Array(TILE * TILE);
  symmetricSums(x, nx, kernel, tile, xx);
  symmetricSums(y, ny, kernel, tile, yy);
  for (let a0 = 0; a0 < x.n; a0 += TILE) {
    const na = Math.min(TILE, x.n - a0);
    for (let b0 = 0; b0 < y.n; b0 += TILE) {
      const nb = Math.min(TILE, y.n - b0);
      kernelTile(
        { s: x, norms: nx, start: a0, rows: na },
        { s: y, norms: ny, start: b0, rows: nb },
        kernel,
        tile,
      );
      for (let i = 0; i < na; i++) {
        let s = 0;
        for (let j = 0; j < nb; j++) {
          const v = tile[i * nb + j];
          s += v;
          yx[b0 + j] += v;
        }
        xy[a0 + i] += s;
      }
    }
  }
  return { xx, xy, yy, yx, diagX: diagonal(x, nx, kernel), diagY: diagonal(y, ny, kernel) };
}

function diagonal(x: Samples, norms: Float64Array, kernel: KernelSpec): number {
  if (kernel.kind === "gaussian") return x.n;
  if (kernel.kind === "distance") return 0;
  let s = 0;
  for (let i = 0; i < x.n; i++) s += (norms[i] / x.d + 1) ** 3;
  return s;
}

function symmetricSums(
  x: Samples,
  norms: Float64Array,
  kernel: KernelSpec,
  tile: Float64Array,
  out: Float64Array,
): void {
  for (let a0 = 0; a0 < x.n; a0 += TILE) {
    const na = Math.min(TILE, x.n - a0);
    for (let b0 = a0; b0 < x.n; b0 += TILE) {
      const nb = Math.min(TILE, x.n - b0);
      kernelTile(
        { s: x, norms, start: a0, rows: na },
        { s: x, norms, start: b0, rows: nb },
        kernel,
        tile,
      );
      for (let i = 0; i < na; i++) {
        let s = 0;
        for (let j = 0; j < nb; j++) {
          if (a0 === b0 && j <= i) continue;
          const v = tile[i * nb + j];
          s += v;
          out[b0 + j] += v;
        }
        out[a0 + i] += s;
      }
    }
  }
}

/** Kernel values of the rows of block `ba` against those of `bb`, row-major into `out`. */
export function kernelTile(
  ba: KernelBlock,
  bb: KernelBlock,
  kernel: KernelSpec,
  out: Float64Array,
): void {
  const a = ba.s, b = bb.s, a0 = ba.start, na = ba.rows, b0 = bb.start, nb = bb.rows;
  const an = ba.norms, bn = bb.norms;
  const d = a.d;
  if (kernel.kind === "distance") {
    // Direct differences: the norm expansion loses the digits of near pairs under sqrt.
    for (let i = 0; i < na; i++) {
      const ai = (a0 + i) * d;
      for (let j = 0; j < nb; j++) {
        const bj = (b0 + j) * d;
        let s = 0;
        for (let t = 0; t < d; t++) {
          const diff = a.data[ai + t] - b.data[bj + t];
          s += diff * diff;
        }
        out[i * nb + j] = -Math.sqrt(s);
      }
    }
    return;
  }
  gramBlock({ data: a.data, start: a0, rows: na }, { data: b.data, start: b0, rows: nb }, d, out);
  const len = na * nb;
  if (kernel.kind === "cubic") {
    for (let t = 0; t < len; t++) {
      const v = out[t] / d + 1;
      out[t] = v * v * v;
    }
    return;
  }
  const g = 1 / (2 * kernel.bandwidth * kernel.bandwidth);
  for (let i = 0; i < na; i++) {
    const ai = an[a0 + i];
    for (let j = 0; j < nb; j++) {
      const sq = ai + bn[b0 + j] - 2 * out[i * nb + j];
      out[i * nb + j] = Math.exp(-g * (sq > 0 ? sq : 0));
    }
  }
}
