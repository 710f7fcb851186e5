/**
 * `readSamples`: one entry point for every file format, chosen by extension.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import type { Samples } from "./samples.ts";
import { type CsvOptions, readCsv } from "./csv.ts";
import { type JsonOptions, readJson } from "./json.ts";
import { readNpy } from "./npy.ts";
import { type NpzOptions, readNpz } from "./npz.ts";

/** File formats {@linkcode readSamples} reads. */
export type SampleFormat = "csv" | "tsv" | "txt" | "json" | "npy" | "npz";

/** Options of {@linkcode readSamples}: those of every reader; each uses the ones it knows. */
export interface ReadOptions extends CsvOptions, JsonOptions, NpzOptions {
  /** The format, when the extension does not tell it. */
  format?: SampleFormat;
}

const FORMATS: readonly SampleFormat[] = ["csv", "tsv", "txt", "json", "npy", "npz"];

/**
 * The format of `path` from its extension (case-insensitive; `.tab` counts as TSV).
 *
 * @example
 * ```ts
 * import { sampleFormatOf } from "./read.ts";
 * import assert from "node:assert/strict";
 * assert.equal(sampleFormatOf("runs/fake.NPZ"), "npz");
 * assert.equal(sampleFormatOf("x.dat"), undefined);
 * ```
 */
export function sampleFormatOf(path: string): SampleFormat | undefined {
  const m = /\.([A-Za-z]+)$/.exec(path);
  const ext = m?.[1].toLowerCase();
  if (ext === "tab") return "tsv";
  return FORMATS.find((f) => f === ext);
}

/**
 * Read samples from a file, the reader chosen by the extension (`.csv .tsv .txt .json .npy
 * .npz`, or `options.format`). Values are validated (finite) and column names kept when
 * the file has them. Options that a format does not use are ignored.
 *
 * @example
 * ```ts
 * import { readSamples } from "./read.ts";
 * import assert from "node:assert/strict";
 * const path = await Deno.makeTempFile({ suffix: ".csv" });
 * await Deno.writeTextFile(path, "x,y,z\n1,2,3\n4,5,6\n");
 * const s = await readSamples(path, { columns: ["z", "x"] });
 * assert.deepEqual([s.columns, Array.from(s.data)], [["z", "x"], [3, 1, 6, 4]]);
 * await Deno.remove(path);
 * ```
 */
export function readSamples(path: string, options: ReadOptions = {}): Promise<Samples> {
  const format = options.format ?? sampleFormatOf(path);
  switch (format) {
    case "csv":
      return readCsv(path, { delimiter: ",", ...options });
    case "tsv":
      return readCsv(path, { delimiter: "\t", ...options });
    case "txt":
      return readCsv(path, options);
    case "json":
      return readJson(path, options);
    case "npy":
      return readNpy(path, options);
    case "npz":
      return readNpz(path, options);
    default:
      return Promise.reject(
        new SaddleError(
          "unsupported",
          `cannot tell the format from the extension; use one of ${
            FORMATS.map((f) => "." + f).join(" ")
          }, or pass { format: "csv" } (or another of ${FORMATS.join(", ")})`,
          { file: options.source ?? path, parameter: "format" },
        ),
      );
  }
}
