/**
 * NumPy `.npy` files: read (versions 1.0/2.0/3.0, either byte order, C or Fortran order,
 * float16/32/64, int8..64, uint8..64, bool) and write (version 1.0, `<f8` or `<f4`).
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { writeFileAtomic } from "../files/atomic_write.ts";
import { fromBuffer, isSamples, type Samples, samples, type SamplesInput } from "./samples.ts";
import { type ColumnSelection, fileLoc, nameAndSelect } from "./column_selection.ts";
import { readFull } from "./_io.ts";
import { openFile, readNpyHead } from "./_npy_open.ts";
import {
  decodeNpyChunk,
  NATIVE_LITTLE_ENDIAN,
  npyDims,
  type NpyHeader,
  parseNpyHeader,
} from "./npy_format.ts";

export type { NpyDtype, NpyHeader } from "./npy_format.ts";

/** Options of {@linkcode parseNpy} and {@linkcode readNpy}. */
export interface NpyOptions {
  /** Columns to keep: 0-based indices (or names, when `names` are given). */
  columns?: ColumnSelection;
  /** Names for the array's columns (one per column, before selection). */
  names?: readonly string[];
  /** Name of the input in error messages (defaults to the path for files). */
  source?: string;
}

/** Values decoded per chunk: 1 MiB of float64. */
const CHUNK = 1 << 17;

/**
 * Parse the header of `.npy` bytes without decoding the data (to inspect shape and dtype).
 *
 * @example
 * ```ts
 * import { encodeNpy, npyHeader } from "./npy.ts";
 * import { samples } from "./samples.ts";
 * import assert from "node:assert/strict";
 * const h = npyHeader(encodeNpy(samples([[1, 2], [3, 4], [5, 6]])));
 * assert.deepEqual([h.dtype.descr, h.shape, h.fortranOrder], ["<f8", [3, 2], false]);
 * ```
 */
export function npyHeader(bytes: Uint8Array, source?: string): NpyHeader {
  return parseNpyHeader(bytes, fileLoc(source));
}

/**
 * Samples from the bytes of a `.npy` file: a 1-D array of length n is n points of
 * dimension 1, a 2-D array `(n, d)` is n points of dimension d; values become float64.
 *
 * int64/uint64 values beyond 2^53 are rounded to the nearest double (as numpy's
 * `astype(numpy.float64)` does); bool becomes 0/1. NaN or ±Infinity values are refused
 * with an error naming the row and column.
 *
 * @example
 * ```ts
 * import { encodeNpy, parseNpy } from "./npy.ts";
 * import { samples } from "./samples.ts";
 * import assert from "node:assert/strict";
 * const bytes = encodeNpy(samples([[1, 2], [3, 4]]));
 * const s = parseNpy(bytes);
 * assert.deepEqual([s.n, s.d, Array.from(s.data)], [2, 2, [1, 2, 3, 4]]);
 * ```
 */
export function parseNpy(bytes: Uint8Array, options: NpyOptions = {}): Samples {
  const loc = fileLoc(options.source);
  const h = parseNpyHeader(bytes, loc);
  const { n, d } = npyDims(h, loc);
  const s = h.dtype.size, total = n * d;
  const have = bytes.length - h.dataOffset;
  if (have < total * s) throw truncated(h, n, d, have, loc);
  const out = allocate(total, loc);
  const scratch = new Uint8Array(Math.min(CHUNK, total) * s);
  const vals = h.fortranOrder && d > 1 ? new Float64Array(Math.min(CHUNK, total)) : undefined;
  for (let k = 0; k < total; k += CHUNK) {
    const count = Math.min(CHUNK, total - k);
    const src = bytes.subarray(h.dataOffset + k * s, h.dataOffset + (k + count) * s);
    place({ h, n, d, k, count, src, out, scratch, vals });
  }
  return finish(out, d, options);
}

/**
 * Read a `.npy` file, streaming the data in 1 MiB chunks straight into the result: the
 * memory held is the float64 result plus two chunk buffers (for a float32 file, about
 * twice its size).
 *
 * @example
 * ```ts
 * import { readNpy, writeNpy } from "./npy.ts";
 * import { samples } from "./samples.ts";
 * import assert from "node:assert/strict";
 * const path = await Deno.makeTempFile({ suffix: ".npy" });
 * await writeNpy(path, samples([0.5, 1.5, 2.5]), { dtype: "<f4" });
 * const s = await readNpy(path);
 * assert.deepEqual(Array.from(s.data), [0.5, 1.5, 2.5]);
 * await Deno.remove(path);
 * ```
 */
export async function readNpy(path: string, options: NpyOptions = {}): Promise<Samples> {
  const source = options.source ?? path;
  const loc = { file: source };
  const file = await openFile(path, source);
  try {
    const size = (await file.stat()).size;
    const { h, headerSize, n, d } = await readNpyHead(file, loc);
    const s = h.dtype.size, total = n * d;
    if (size - headerSize < total * s) throw truncated(h, n, d, size - headerSize, loc);
    const out = allocate(total, loc);
    const chunk = Math.min(CHUNK, total);
    const buf = new Uint8Array(chunk * s), scratch = new Uint8Array(chunk * s);
    const vals = h.fortranOrder && d > 1 ? new Float64Array(chunk) : undefined;
    for (let k = 0; k < total; k += chunk) {
      const count = Math.min(chunk, total - k);
      const src = buf.subarray(0, count * s);
      if (await readFull(file, src) < src.length) {
        throw truncated(h, n, d, headerSize + k * s, loc);
      }
      place({ h, n, d, k, count, src, out, scratch, vals });
    }
    return finish(out, d, { ...options, source });
  } finally {
    file.close();
  }
}

function place(
  { h, n, d, k, count, src, out, scratch, vals }: {
    h: NpyHeader;
    n: number;
    d: number;
    k: number;
    count: number;
    src: Uint8Array;
    out: Float64Array;
    scratch: Uint8Array;
    vals: Float64Array | undefined;
  },
): void {
  if (!vals) {
    decodeNpyChunk(h.dtype, src, out.subarray(k, k + count), scratch);
    return;
  }
  // Fortran order: flat index k is row k % n of column floor(k / n).
  const v = vals.subarray(0, count);
  decodeNpyChunk(h.dtype, src, v, scratch);
  let i = k % n, j = (k - i) / n;
  for (let t = 0; t < count; t++) {
    out[i * d + j] = v[t];
    if (++i === n) {
      i = 0;
      j++;
    }
  }
}

function finish(out: Float64Array, d: number, options: NpyOptions): Samples {
  const s = fromBuffer(out, d, undefined, options.source);
  return nameAndSelect(s, options.columns, options.names, options.source);
}

function allocate(total: number, loc: { file?: string }): Float64Array {
  try {
    return new Float64Array(total);
  } catch {
    throw new SaddleError(
      "unsupported",
      `cannot hold ${total} float64 values in memory; read a subset of the rows`,
      loc,
    );
  }
}

function truncated(
  h: NpyHeader,
  n: number,
  d: number,
  have: number,
  loc: { file?: string },
): SaddleError {
  return new SaddleError(
    "parse",
    `file is truncated: shape (${h.shape.join(", ")}) of '${h.dtype.descr}' needs ` +
      `${n * d * h.dtype.size} data bytes but only ${Math.max(0, have)} follow the header; ` +
      "copy or save the file again",
    loc,
  );
}

/** Options of {@linkcode encodeNpy} and {@linkcode writeNpy}. */
export interface NpyWriteOptions {
  /** Stored type: `"<f8"` (float64, exact; default) or `"<f4"` (float32, rounded). */
  dtype?: "<f8" | "<f4";
  /**
   * Write a 1-D array `(n,)` when `d = 1` instead of `(n, 1)` (default: true for a flat
   * number[] or typed array, false for Samples and rows).
   */
  squeeze?: boolean;
}

function npyHeaderBytes(s: Samples, options: NpyWriteOptions): Uint8Array {
  const dtype = options.dtype ?? "<f8";
  if (dtype !== "<f8" && dtype !== "<f4") {
    throw new SaddleError("invalid-argument", `dtype must be "<f8" or "<f4", got "${dtype}"`, {
      parameter: "dtype",
    });
  }
  const shape = options.squeeze && s.d === 1 ? `(${s.n},)` : `(${s.n}, ${s.d})`;
  // The same dict text and 64-byte alignment as numpy.lib.format (numpy >= 1.19).
  const dict = `{'descr': '${dtype}', 'fortran_order': False, 'shape': ${shape}, }`;
  const pad = (64 - ((10 + dict.length + 1) % 64)) % 64;
  const header = dict + " ".repeat(pad) + "\n";
  const out = new Uint8Array(10 + header.length);
  out.set([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0, header.length & 255, header.length >> 8]);
  for (let i = 0; i < header.length; i++) out[10 + i] = header.charCodeAt(i);
  return out;
}

/**
 * Check every value before a byte is written: finite, and within float32's range for
 * `"<f4"` (a value that rounds to ±Infinity in float32 is refused, naming row and column).
 */
function checkWritable(s: Samples, dtype: "<f8" | "<f4"): void {
  const v = s.data;
  for (let i = 0; i < v.length; i++) {
    const x = v[i];
    const bad = x - x !== 0
      ? "non-finite"
      : dtype === "<f4" && !isFinite(Math.fround(x))
      ? "invalid-argument"
      : undefined;
    if (bad) {
      throw new SaddleError(
        bad,
        bad === "non-finite"
          ? `value is ${x}; Samples must be finite`
          : `value ${x} does not fit in float32; write with dtype "<f8"`,
        {
          row: Math.floor(i / s.d),
          column: i % s.d,
          parameter: bad === "non-finite" ? "s" : "dtype",
        },
      );
    }
  }
}

/** The little-endian bytes of values `start..start+count` of `s.data` as `dtype` (checked). */
function dataBytes(s: Samples, start: number, count: number, dtype: "<f8" | "<f4"): Uint8Array {
  const src = s.data.subarray(start, start + count);
  if (dtype === "<f4") return swapIfBig(new Uint8Array(Float32Array.from(src).buffer), 4);
  const view = new Uint8Array(src.buffer, src.byteOffset, src.byteLength);
  return NATIVE_LITTLE_ENDIAN ? view : swapIfBig(view.slice(), 8);
}

/**
 * Samples from what the writers accept, and whether the array is written 1-D: a flat
 * input (number[] or typed array) is n points of d = 1, written as shape (n,) unless
 * `squeeze: false`; Samples and rows are written (n, d) unless `squeeze: true` with d = 1.
 */
function toWritable(
  input: SamplesInput,
  options: NpyWriteOptions,
): { s: Samples; options: NpyWriteOptions } {
  const flat = ArrayBuffer.isView(input) ||
    (Array.isArray(input) && input.length > 0 && typeof input[0] === "number");
  const s = isSamples(input) ? input : samples(input, { source: "s" });
  const squeeze = options.squeeze ?? (flat && !isSamples(input));
  const dtype = options.dtype ?? "<f8";
  npyHeaderBytes(s, { ...options, squeeze }); // checks dtype
  checkWritable(s, dtype);
  return { s, options: { ...options, squeeze, dtype } };
}

function swapIfBig(bytes: Uint8Array, size: number): Uint8Array {
  if (NATIVE_LITTLE_ENDIAN) return bytes;
  for (let i = 0; i < bytes.length; i += size) bytes.subarray(i, i + size).reverse();
  return bytes;
}

/**
 * The bytes of a `.npy` file (format 1.0, C order) holding the samples as a 2-D `(n, d)`
 * array (or 1-D with `squeeze` when d = 1; a flat number[] or typed array is 1-D unless
 * `squeeze: false`), readable by `numpy.load`. Column names are not
 * stored (the format has no place for them).
 *
 * @example
 * ```ts
 * import { encodeNpy, parseNpy } from "./npy.ts";
 * import { samples } from "./samples.ts";
 * import assert from "node:assert/strict";
 * const s = samples([0.1, 0.2, 0.3]);
 * const bytes = encodeNpy(s, { squeeze: true });
 * assert.equal(bytes.length, 128 + 3 * 8); // 128-byte header, then the data
 * assert.deepEqual(parseNpy(bytes).data, s.data);
 * ```
 */
export function encodeNpy(input: SamplesInput, options: NpyWriteOptions = {}): Uint8Array {
  const w = toWritable(input, options);
  const head = npyHeaderBytes(w.s, w.options);
  const body = dataBytes(w.s, 0, w.s.data.length, w.options.dtype ?? "<f8");
  const out = new Uint8Array(head.length + body.length);
  out.set(head);
  out.set(body, head.length);
  return out;
}

/**
 * Write samples to a `.npy` file (see {@linkcode encodeNpy}), in chunks, so results go back
 * to Python with `numpy.load(path)`. Accepts Samples, rows of numbers, a plain number[] or a
 * typed array (a flat input is written 1-D, shape (n,)). Every value is checked first (finite;
 * within float32's range for `"<f4"`), then the file is written atomically: to a temporary
 * file beside it, renamed into place at the end, so a failure never leaves a partial file;
 * a missing folder, no permission or a full disk is a SaddleError naming the path.
 *
 * @example
 * ```ts
 * import { readNpy, writeNpy } from "./npy.ts";
 * import { samples } from "./samples.ts";
 * import assert from "node:assert/strict";
 * const path = await Deno.makeTempFile({ suffix: ".npy" });
 * await writeNpy(path, samples([[1, 2], [3, 4]]));
 * assert.deepEqual(Array.from((await readNpy(path)).data), [1, 2, 3, 4]);
 * await Deno.remove(path);
 * ```
 */
export async function writeNpy(
  path: string,
  input: SamplesInput,
  options: NpyWriteOptions = {},
): Promise<void> {
  const { s, options: o } = toWritable(input, options);
  const dtype = o.dtype ?? "<f8";
  function* chunks(): Generator<Uint8Array> {
    yield npyHeaderBytes(s, o);
    for (let k = 0; k < s.data.length; k += CHUNK) {
      yield dataBytes(s, k, Math.min(CHUNK, s.data.length - k), dtype);
    }
  }
  await writeFileAtomic(path, chunks());
}
