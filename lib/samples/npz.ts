/**
 * NumPy `.npz` archives (zip files of `.npy` arrays, stored or deflated), as written by
 * `numpy.savez` and `numpy.savez_compressed`; unzipped with fflate.
 *
 * @module
 */
import { unzipSync } from "fflate";
import { SaddleError } from "../errors/saddle_error.ts";
import type { Samples } from "./samples.ts";
import { type NpyOptions, parseNpy } from "./npy.ts";
import { readBytes } from "./_io.ts";
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
  const names: string[] = [];
  unzip(bytes, (f) => {
    names.push(f.name.replace(/\.npy$/, ""));
    return false;
  }, source);
  return names;
}

/**
 * Samples from one array of the bytes of a `.npz` archive; only the chosen entry is
 * decompressed. A missing name gives an error listing the names there are.
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
  const want = options.array?.replace(/\.npy$/, "");
  const names: string[] = [];
  const entries = unzip(bytes, (f) => {
    const name = f.name.replace(/\.npy$/, "");
    names.push(name);
    return want !== undefined && name === want;
  }, options.source);
  const list = () => names.map((x) => `"${x}"`).join(", ");
  const keys = Object.keys(entries);
  if (want === undefined) {
    if (names.length === 0) {
      throw new SaddleError("empty", "the archive holds no arrays", fileLoc(options.source));
    }
    if (names.length > 1) {
      throw new SaddleError(
        "invalid-argument",
        `the archive holds ${names.length} arrays (${list()}); choose one with { array: "${
          names[0]
        }" }`,
        { ...fileLoc(options.source), parameter: "array" },
      );
    }
    // A single array: extract it.
    const only = unzip(bytes, () => true, options.source);
    const k = Object.keys(only)[0];
    return parseNpy(only[k], { ...options, source: entrySource(options.source, k) });
  }
  if (keys.length === 0) {
    throw new SaddleError(
      "not-found",
      `no array named "${want}"; the archive holds ${names.length ? list() : "no arrays"}`,
      { ...fileLoc(options.source), parameter: "array" },
    );
  }
  return parseNpy(entries[keys[0]], { ...options, source: entrySource(options.source, keys[0]) });
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

function unzip(
  bytes: Uint8Array,
  filter: (f: { name: string; compression: number }) => boolean,
  source: string | undefined,
): Record<string, Uint8Array> {
  try {
    return unzipSync(bytes, {
      filter: (f) => {
        const take = filter(f);
        if (take && f.compression !== 0 && f.compression !== 8) {
          throw new SaddleError(
            "unsupported",
            `entry "${f.name}" uses zip compression method ${f.compression}; ` +
              "save with numpy.savez or numpy.savez_compressed (stored or deflated)",
            fileLoc(source),
          );
        }
        return take;
      },
    });
  } catch (err) {
    if (err instanceof SaddleError) throw err;
    throw new SaddleError(
      "parse",
      `not a readable .npz (zip) archive: ${(err as Error).message}; ` +
        "save it with numpy.savez or numpy.savez_compressed",
      fileLoc(source),
    );
  }
}
