/**
 * NumPy `.npz` archives (zip files of `.npy` arrays, stored or deflated), as written by
 * `numpy.savez` and `numpy.savez_compressed`; unzipped with fflate.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import type { Samples } from "./samples.ts";
import { type NpyOptions, parseNpy } from "./npy.ts";
import { readBytes } from "./_io.ts";
import { npyHeaderSize, parseNpyHeader } from "./npy_format.ts";
import { zipEntries, zipEntryBytes } from "./_zip.ts";
import { fileLoc } from "./column_selection.ts";

/** Options of {@linkcode parseNpz} and {@linkcode readNpz}. */
export interface NpzOptions extends NpyOptions {
  /**
   * The array to read, by the name given to `numpy.savez` (`"real"` or `"real.npy"`).
   * May be left out when the archive holds a single array.
   */
  array?: string;
}

/**
 * The names of the arrays in `.npz` bytes (without the `.npy` suffix), in archive order.
 *
 * @example
 * ```ts
 * import { zipSync } from "fflate";
 * import { npzNames } from "./npz.ts";
 * import { encodeNpy } from "./npy.ts";
 * import { samples } from "./samples.ts";
 * import assert from "node:assert/strict";
 * const zip = zipSync({ "real.npy": encodeNpy(samples([1, 2])), "fake.npy": encodeNpy(samples([3])) });
 * assert.deepEqual(npzNames(zip), ["real", "fake"]);
 * ```
 */
export function npzNames(bytes: Uint8Array, source?: string): string[] {
  return zipEntries(bytes, fileLoc(source)).map((e) => e.name.replace(/\.npy$/, ""));
}

/**
 * Samples from one array of the bytes of a `.npz` archive; only the chosen entry is
 * decompressed. A missing name gives an error listing the names there are.
 *
 * The entry is checked as `numpy.load` checks it, and more strictly: its CRC-32 and its
 * declared sizes must match (a damaged archive is refused, never read as other numbers),
 * and its declared size must be what its `.npy` header describes (header plus
 * rows x columns x item size); a deflated entry is inflated in small slices and refused as
 * soon as it grows past that size, so an archive that claims a small array but inflates to
 * gigabytes takes no more memory than the array.
 *
 * @example
 * ```ts
 * import { zipSync } from "fflate";
 * import { parseNpz } from "./npz.ts";
 * import { encodeNpy } from "./npy.ts";
 * import { samples } from "./samples.ts";
 * import assert from "node:assert/strict";
 * const zip = zipSync({ "real.npy": encodeNpy(samples([1, 2])), "fake.npy": encodeNpy(samples([3])) });
 * assert.deepEqual(Array.from(parseNpz(zip, { array: "fake" }).data), [3]);
 * assert.throws(() => parseNpz(zip), /"real", "fake"/);
 * ```
 */
export function parseNpz(bytes: Uint8Array, options: NpzOptions = {}): Samples {
  const loc = fileLoc(options.source);
  const want = options.array?.replace(/\.npy$/, "");
  const entries = zipEntries(bytes, loc);
  const names = entries.map((e) => e.name.replace(/\.npy$/, ""));
  const list = () => names.map((x) => `"${x}"`).join(", ");
  if (want === undefined) {
    if (names.length === 0) {
      throw new SaddleError("empty", "the archive holds no arrays", loc);
    }
    if (names.length > 1) {
      throw new SaddleError(
        "invalid-argument",
        `the archive holds ${names.length} arrays (${list()}); choose one with { array: "${
          names[0]
        }" }`,
        { ...loc, parameter: "array" },
      );
    }
  }
  const k = want === undefined ? 0 : names.indexOf(want);
  if (k < 0) {
    throw new SaddleError(
      "not-found",
      `no array named "${want}"; the archive holds ${names.length ? list() : "no arrays"}`,
      { ...loc, parameter: "array" },
    );
  }
  const entry = entries[k];
  const source = entrySource(options.source, entry.name);
  const data = zipEntryBytes(bytes, entry, loc, {
    after: HEAD_BYTES,
    max: (head) => npySizeFromHeader(head, entry.size, source),
  });
  return parseNpy(data, { ...options, source });
}

/** Bytes of an entry read before its size is trusted: enough for any header numpy writes. */
const HEAD_BYTES = 1 << 16;

/** Total bytes of a `.npy` file from its header: header plus the data the shape describes. */
function npySizeFromHeader(head: Uint8Array, declared: number, source: string): number {
  const loc = fileLoc(source);
  const size = npyHeaderSize(head, loc);
  if (size > head.length && head.length < declared) {
    throw new SaddleError(
      "unsupported",
      `.npy header of ${size} bytes inside the archive (over ${HEAD_BYTES}); numpy writes ` +
        "headers of a few hundred bytes",
      loc,
    );
  }
  const h = parseNpyHeader(head, loc);
  const count = h.shape.reduce((a, b) => a * b, 1);
  return h.dataOffset + count * h.dtype.size;
}

/**
 * Read one array of a `.npz` file (see {@linkcode parseNpz}). The archive is read whole,
 * then only the chosen entry is decompressed.
 *
 * @example
 * ```ts
 * import { zipSync } from "fflate";
 * import { readNpz } from "./npz.ts";
 * import { encodeNpy } from "./npy.ts";
 * import { samples } from "./samples.ts";
 * import assert from "node:assert/strict";
 * const path = await Deno.makeTempFile({ suffix: ".npz" });
 * await Deno.writeFile(path, zipSync({ "x.npy": encodeNpy(samples([[1, 2]])) }, { level: 6 }));
 * assert.deepEqual(Array.from((await readNpz(path, { array: "x" })).data), [1, 2]);
 * await Deno.remove(path);
 * ```
 */
export async function readNpz(path: string, options: NpzOptions = {}): Promise<Samples> {
  const source = options.source ?? path;
  return parseNpz(await readBytes(path, source), { ...options, source });
}

function entrySource(source: string | undefined, entry: string): string {
  return source === undefined ? entry : `${source}:${entry}`;
}
