/**
 * Reading a `.npy` file a block of rows at a time, so a file larger than memory can be
 * reduced (means, covariances) without ever being held whole.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { readFull } from "./_io.ts";
import { openFile, readNpyHead } from "./_npy_open.ts";
import { assertFinite } from "./samples.ts";
import { decodeNpyChunk } from "./npy_format.ts";

/** Options of {@linkcode npyChunks}. */
export interface NpyChunkOptions {
  /** Rows per chunk (default: as many as fit in 8 MiB of float64, at least 1). */
  rows?: number;
  /** Name of the input in error messages (default the path). */
  source?: string;
}

/** One block of rows of a `.npy` file. */
export interface NpyChunk {
  /** Row of the file where this block starts (0-based). */
  readonly start: number;
  /** Rows in this block. */
  readonly n: number;
  /** Columns (the same for every block). */
  readonly d: number;
  /** Total rows in the file. */
  readonly total: number;
  /**
   * Row-major `n x d` float64 values. The buffer is reused by the next block: copy what
   * you keep.
   */
  readonly data: Float64Array;
}

/**
 * The rows of a C-order `.npy` file as consecutive blocks (any dtype `readNpy` reads),
 * decoded to float64, checked finite (a SaddleError names the file row and column of a
 * NaN), holding one block at a time.
 *
 * @example
 * ```ts
 * import { npyChunks } from "./npy_chunks.ts";
 * import { writeNpy } from "./npy.ts";
 * import { samples } from "./samples.ts";
 * import assert from "node:assert/strict";
 * const path = await Deno.makeTempFile({ suffix: ".npy" });
 * await writeNpy(path, samples([[1, 2], [3, 4], [5, 6]]));
 * const starts: number[] = [];
 * for await (const c of npyChunks(path, { rows: 2 })) starts.push(c.start);
 * assert.deepEqual(starts, [0, 2]);
 * await Deno.remove(path);
 * ```
 */
export async function* npyChunks(
  path: string,
  options: NpyChunkOptions = {},
): AsyncGenerator<NpyChunk> {
  const source = options.source ?? path;
  const loc = { file: source };
  const file = await openFile(path, source);
  try {
    const { h, n, d } = await readNpyHead(file, loc);
    if (h.fortranOrder && d > 1) {
      throw new SaddleError(
        "unsupported",
        "the array is in Fortran (column-major) order, which cannot be read by rows; " +
          "save it in C order (np.ascontiguousarray) or read it whole with readNpy",
        loc,
      );
    }
    const rows = options.rows ?? Math.max(1, Math.floor((1 << 20) / d));
    if (!Number.isInteger(rows) || rows < 1) {
      throw new SaddleError("invalid-argument", `rows must be an integer >= 1, got ${rows}`, {
        parameter: "rows",
      });
    }
    const s = h.dtype.size;
    const raw = new Uint8Array(rows * d * s), scratch = new Uint8Array(rows * d * s);
    const out = new Float64Array(rows * d);
    for (let start = 0; start < n; start += rows) {
      const count = Math.min(rows, n - start);
      const src = raw.subarray(0, count * d * s);
      if (await readFull(file, src) < src.length) {
        throw new SaddleError(
          "parse",
          `file is truncated: shape (${h.shape.join(", ")}) needs ${n} rows but the data ` +
            `end inside row ${start}..${start + count - 1}; copy or save the file again`,
          loc,
        );
      }
      const data = out.subarray(0, count * d);
      decodeNpyChunk(h.dtype, src, data, scratch);
      try {
        assertFinite(data, d, source);
      } catch (err) {
        if (err instanceof SaddleError && err.location.row !== undefined) {
          throw new SaddleError("non-finite", "value is not finite; fix or drop that row", {
            file: source,
            row: start + err.location.row,
            column: err.location.column,
          });
        }
        throw err;
      }
      yield { start, n: count, d, total: n, data };
    }
  } finally {
    file.close();
  }
}
