/**
 * The report's inputs: both sample files, the optional discriminator outputs, read and
 * checked up front (existence, permission, format, dimensions, lengths) with errors that
 * name the file and the fix, and a SHA-256 checksum of every file.
 *
 * @module
 */
// @ts-types="npm:@types/d3-dsv@3.0.7"
import { dsvFormat } from "d3-dsv";
import { SaddleError } from "../errors/mod.ts";
import { readSamples, sampleFormatOf } from "../samples/mod.ts";
import type { Samples } from "../samples/mod.ts";
import { selectColumns } from "../samples/mod.ts";
import type { OutputScale } from "../discriminator/mod.ts";
import { readTrainingLog, type TrainingLog } from "../training/mod.ts";

/** One sample file as read. */
export interface SideInput {
  /** The path as given. */
  readonly path: string;
  /** The rows (after `columns`). */
  readonly samples: Samples;
  /** Lower-case hex SHA-256 of the file's bytes. */
  readonly sha256: string;
}

/** The trained discriminator's outputs on the rows of both files, in file order. */
export interface ScoresInput {
  /** The file(s) they came from. */
  readonly paths: readonly string[];
  /** SHA-256 of each file, in the order of `paths`. */
  readonly sha256: readonly string[];
  /** Output on each real row. */
  readonly real: Float64Array;
  /** Output on each generated row. */
  readonly fake: Float64Array;
  /** Probabilities or logits, and how that was decided. */
  readonly scale: OutputScale;
  /** Why `scale` was chosen. */
  readonly scaleReason: string;
}

/** A training log as read (`--log`). */
export interface LogInput {
  /** The path as given. */
  readonly path: string;
  /** SHA-256 of the file's bytes. */
  readonly sha256: string;
  /** The log, its columns mapped (guesses said in its notes). */
  readonly log: TrainingLog;
}

/** One checkpoint file of `--checkpoints DIR`, checked up front. */
export interface CheckpointFile {
  /** Training step (the last number in the file name). */
  readonly step: number;
  /** The file. */
  readonly path: string;
  /** SHA-256 of its bytes. */
  readonly sha256: string;
  /** Its rows (after `columns`). */
  readonly samples: Samples;
}

/** The checkpoint folder (`--checkpoints`). */
export interface CheckpointsInput {
  /** The folder as given. */
  readonly path: string;
  /** Its checkpoint files by increasing step. */
  readonly files: readonly CheckpointFile[];
  /** Files of the folder that were not taken (no step number or no samples extension). */
  readonly skipped: readonly string[];
}

/** One named generated set of several (`--fake A=path --fake B=path`). */
export interface GeneratorInput extends SideInput {
  /** Its name (letters, digits, `_`, `-`). */
  readonly name: string;
}

/** Everything the sections read. */
export interface ReportInputs {
  /** Samples of the data distribution. */
  readonly real: SideInput;
  /** Samples of the generator. */
  readonly fake: SideInput;
  /** Discriminator outputs, when given. */
  readonly scores?: ScoresInput;
  /** Every generated set by name, the first being `fake`, when several are given. */
  readonly generators?: readonly GeneratorInput[];
  /** The training log, when given. */
  readonly log?: LogInput;
  /** The checkpoint series' files, when given. */
  readonly checkpoints?: CheckpointsInput;
}

/** Where the inputs are and how to read them. */
export interface ReadInputsOptions {
  /** Real samples: any file {@linkcode readSamples} reads. */
  real: string;
  /** Generated samples (default the first of `generators`). */
  fake?: string;
  /** Columns to keep, by name or 0-based index (both files). */
  columns?: readonly (string | number)[];
  /**
   * One file of discriminator outputs on both sides: CSV/TSV with a `side` column
   * (`real`/`fake`, `generated`, `1`/`0`) and one numeric score column, a JSON array of such
   * records, or a JSON object `{ "real": [...], "fake": [...] }`.
   */
  scores?: string;
  /** Discriminator outputs on the real rows, one column (instead of `scores`). */
  dReal?: string;
  /** Discriminator outputs on the generated rows, one column. */
  dFake?: string;
  /** Scale of the outputs (default: probabilities when every value is in [0, 1]). */
  scoreScale?: OutputScale;
  /**
   * Several generated sets to compare, by name (the first is the one the other sections
   * analyse; `fake` may then be omitted).
   */
  generators?: readonly { readonly name: string; readonly path: string }[];
  /** A training log (CSV/TSV/JSON lines; columns guessed from common spellings). */
  log?: string;
  /**
   * A folder of generated samples saved during training, one file a checkpoint, named with
   * its step (`step_001000.csv`); the same columns as the real file.
   */
  checkpoints?: string;
}

/**
 * The bytes of a file, with a `SaddleError` naming it when it is missing, a folder or not
 * readable.
 *
 * @example
 * ```ts
 * import { readInputFile } from "./inputs.ts";
 * import assert from "node:assert/strict";
 * await assert.rejects(readInputFile("/nonexistent/x.csv", "--real"), /not found/);
 * ```
 */
export async function readInputFile(path: string, what: string): Promise<Uint8Array> {
  try {
    const info = await Deno.stat(path);
    if (info.isDirectory) {
      throw new SaddleError("invalid-argument", `${what} is a folder; give a file`, {
        file: path,
      });
    }
    return await Deno.readFile(path);
  } catch (e) {
    if (e instanceof SaddleError) throw e;
    if (e instanceof Deno.errors.NotFound) {
      throw new SaddleError("not-found", `${what}: file not found; check the path`, {
        file: path,
      });
    }
    if (e instanceof Deno.errors.PermissionDenied || e instanceof Deno.errors.NotCapable) {
      throw new SaddleError(
        "not-found",
        `${what}: cannot read the file (${(e as Error).message.split("\n")[0]}); make it ` +
          "readable, or grant read access to it (--allow-read)",
        { file: path },
      );
    }
    throw new SaddleError("parse", `${what}: cannot read the file: ${String(e)}`, { file: path });
  }
}

/**
 * Lower-case hex SHA-256 of some bytes.
 *
 * @example
 * ```ts
 * import { sha256Hex } from "./inputs.ts";
 * import assert from "node:assert/strict";
 * // FIPS 180-2, appendix B.1: SHA-256("abc").
 * assert.equal(await sha256Hex(new TextEncoder().encode("abc")),
 *   "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
 * ```
 */
export async function sha256Hex(bytes: Uint8Array): Promise<string> {
  const digest = new Uint8Array(await crypto.subtle.digest("SHA-256", bytes as BufferSource));
  return Array.from(digest, (b) => b.toString(16).padStart(2, "0")).join("");
}

async function readSide(path: string, what: string): Promise<{ s: Samples; sha256: string }> {
  const bytes = await readInputFile(path, what);
  if (sampleFormatOf(path) === undefined) {
    throw new SaddleError(
      "unsupported",
      `${what}: cannot tell the format from the extension; name the file .csv, .tsv, .txt, ` +
        ".json, .npy or .npz",
      { file: path },
    );
  }
  let s: Samples;
  try {
    s = await readSamples(path);
  } catch (e) {
    if (e instanceof SaddleError) throw e;
    throw new SaddleError("parse", `${what}: ${String(e)}`, { file: path });
  }
  return { s, sha256: await sha256Hex(bytes) };
}

function pickColumns(s: Samples, columns: readonly (string | number)[], file: string): Samples {
  const names = [...columns];
  const byName = names.filter((c) => typeof c === "string") as string[];
  if (byName.length && !s.columns) {
    throw new SaddleError(
      "not-found",
      `--columns names ${byName.join(", ")} but the file has no column names; give 0-based ` +
        "indices instead",
      { file },
    );
  }
  try {
    return selectColumns(s, names);
  } catch (e) {
    if (e instanceof SaddleError) {
      throw new SaddleError(e.code, `--columns: ${e.message}`, { file });
    }
    throw e;
  }
}

/**
 * Read and check every input before any long computation: both sample files (same
 * dimension, the selected columns), and the discriminator outputs (one per row of each
 * file, finite, the scale recorded). Files without column names take the other file's.
 *
 * @example
 * ```ts
 * import { readReportInputs } from "./inputs.ts";
 * import assert from "node:assert/strict";
 * const dir = await Deno.makeTempDir();
 * await Deno.writeTextFile(`${dir}/r.csv`, "a,b\n1,2\n3,4\n5,7\n");
 * await Deno.writeTextFile(`${dir}/f.csv`, "a,b\n1,1\n2,4\n5,5\n");
 * await Deno.writeTextFile(`${dir}/s.csv`, "side,score\nreal,0.6\nreal,0.5\nreal,0.7\nfake,0.4\nfake,0.5\nfake,0.3\n");
 * const inputs = await readReportInputs({ real: `${dir}/r.csv`, fake: `${dir}/f.csv`, scores: `${dir}/s.csv`, columns: ["b"] });
 * assert.equal(inputs.real.samples.d, 1);
 * assert.deepEqual(Array.from(inputs.scores!.fake), [0.4, 0.5, 0.3]);
 * assert.equal(inputs.scores!.scale, "prob");
 * await Deno.remove(dir, { recursive: true });
 * ```
 */
export async function readReportInputs(options: ReadInputsOptions): Promise<ReportInputs> {
  const fakePath = options.fake ?? options.generators?.[0]?.path;
  if (fakePath === undefined) {
    throw new SaddleError("invalid-argument", "give the generated samples (--fake FILE)", {
      parameter: "--fake",
    });
  }
  const real = await readSide(options.real, "--real");
  const fake = await readSide(fakePath, "--fake");
  let r = real.s, f = fake.s;
  if (!f.columns && r.columns && r.d === f.d) f = { ...f, columns: r.columns };
  if (!r.columns && f.columns && r.d === f.d) r = { ...r, columns: f.columns };
  if (options.columns?.length) {
    r = pickColumns(r, options.columns, options.real);
    f = pickColumns(f, options.columns, fakePath);
  }
  if (r.d !== f.d) {
    throw new SaddleError(
      "dimension-mismatch",
      `the real samples have d = ${r.d} columns but the generated samples in ${fakePath} ` +
        `have d = ${f.d}; give files of the same dimension, or pick the shared ones with --columns`,
      { file: options.real },
    );
  }
  const scores = await readScoreInputs(options, r.n, f.n);
  const generators = options.generators && options.generators.length > 1
    ? await readGenerators(options.generators, fakePath, { s: f, sha256: fake.sha256 }, r, options)
    : undefined;
  const log = options.log ? await readLogInput(options.log) : undefined;
  const checkpoints = options.checkpoints
    ? await readCheckpointsInput(options.checkpoints, r, options.columns)
    : undefined;
  return {
    real: { path: options.real, samples: r, sha256: real.sha256 },
    fake: { path: fakePath, samples: f, sha256: fake.sha256 },
    ...(generators ? { generators } : {}),
    ...(scores ? { scores } : {}),
    ...(log ? { log } : {}),
    ...(checkpoints ? { checkpoints } : {}),
  };
}

const GENERATOR_NAME = /^[A-Za-z0-9][A-Za-z0-9_-]*$/;

async function readGenerators(
  list: readonly { readonly name: string; readonly path: string }[],
  firstPath: string,
  first: { s: Samples; sha256: string },
  real: Samples,
  options: ReadInputsOptions,
): Promise<GeneratorInput[]> {
  const out: GeneratorInput[] = [];
  for (const [i, g] of list.entries()) {
    if (!GENERATOR_NAME.test(g.name) || g.name.includes("_vs_")) {
      throw new SaddleError(
        "invalid-argument",
        `--fake: generator name "${g.name}" must be letters, digits, _ and - (not "_vs_"), ` +
          "starting with a letter or digit",
        { parameter: "--fake", file: g.path },
      );
    }
    if (out.some((o) => o.name === g.name)) {
      throw new SaddleError("invalid-argument", `--fake: two generators named "${g.name}"`, {
        parameter: "--fake",
        file: g.path,
      });
    }
    let side = i === 0 && g.path === firstPath ? first : await readSide(g.path, "--fake");
    let s = side.s;
    if (!s.columns && real.columns && s.d === real.d) s = { ...s, columns: real.columns };
    if (i > 0 && options.columns?.length) s = pickColumns(s, options.columns, g.path);
    if (s.d !== real.d) {
      throw new SaddleError(
        "dimension-mismatch",
        `--fake ${g.name}: d = ${s.d} columns but the real samples have d = ${real.d}; give ` +
          "files of the same dimension, or pick the shared ones with --columns",
        { file: g.path },
      );
    }
    side = { s, sha256: side.sha256 };
    out.push({ name: g.name, path: g.path, samples: side.s, sha256: side.sha256 });
  }
  return out;
}

async function readLogInput(path: string): Promise<LogInput> {
  const bytes = await readInputFile(path, "--log");
  let log: TrainingLog;
  try {
    log = await readTrainingLog(path);
  } catch (e) {
    if (e instanceof SaddleError) {
      throw new SaddleError(e.code, `--log: ${e.message}`, { file: path });
    }
    throw new SaddleError("parse", `--log: ${String(e)}`, { file: path });
  }
  return { path, sha256: await sha256Hex(bytes), log };
}

const STEP_IN_NAME = /(\d+)(?!.*\d)/;

async function readCheckpointsInput(
  dir: string,
  real: Samples,
  columns: readonly (string | number)[] | undefined,
): Promise<CheckpointsInput> {
  const names: string[] = [];
  try {
    if (!(await Deno.stat(dir)).isDirectory) {
      throw new SaddleError("invalid-argument", "--checkpoints is a file; give the folder", {
        file: dir,
      });
    }
    for await (const e of Deno.readDir(dir)) if (e.isFile) names.push(e.name);
  } catch (e) {
    if (e instanceof SaddleError) throw e;
    throw new SaddleError(
      "not-found",
      `--checkpoints: cannot read the folder (${(e as Error).message.split("\n")[0]}); check ` +
        "the path and read access",
      { file: dir },
    );
  }
  names.sort();
  const files: CheckpointFile[] = [];
  const skipped: string[] = [];
  for (const name of names) {
    const m = STEP_IN_NAME.exec(name.replace(/\.[^.]*$/, ""));
    if (!m || sampleFormatOf(name) === undefined) {
      skipped.push(name);
      continue;
    }
    const path = `${dir}/${name}`;
    const side = await readSide(path, "--checkpoints");
    let s = side.s;
    if (!s.columns && real.columns && s.d === real.d) s = { ...s, columns: real.columns };
    if (columns?.length) s = pickColumns(s, columns, path);
    if (s.d !== real.d) {
      throw new SaddleError(
        "dimension-mismatch",
        `--checkpoints: this checkpoint has d = ${s.d} columns but the real samples have ` +
          `d = ${real.d}; save checkpoints with the real file's columns, or pick them with --columns`,
        { file: path },
      );
    }
    files.push({ step: Number(m[1]), path, sha256: side.sha256, samples: s });
  }
  if (files.length === 0) {
    throw new SaddleError(
      "empty",
      "--checkpoints: no checkpoint files; name each with its step (step_001200.npy)",
      { file: dir },
    );
  }
  files.sort((a, b) => a.step - b.step);
  for (let i = 1; i < files.length; i++) {
    if (files[i].step === files[i - 1].step) {
      throw new SaddleError(
        "invalid-argument",
        `--checkpoints: ${files[i - 1].path} and ${files[i].path} have the same step ` +
          `${files[i].step}; keep one`,
        { file: files[i].path },
      );
    }
  }
  return { path: dir, files, skipped };
}

async function readScoreInputs(
  o: ReadInputsOptions,
  nReal: number,
  nFake: number,
): Promise<ScoresInput | undefined> {
  if (o.scores && (o.dReal || o.dFake)) {
    throw new SaddleError(
      "invalid-argument",
      "give either --scores or --d-real with --d-fake, not both",
      { parameter: "--scores" },
    );
  }
  let paths: string[], sums: string[], real: Float64Array, fake: Float64Array;
  if (o.scores) {
    const bytes = await readInputFile(o.scores, "--scores");
    ({ real, fake } = parseScores(new TextDecoder().decode(bytes), o.scores));
    paths = [o.scores];
    sums = [await sha256Hex(bytes)];
  } else if (o.dReal || o.dFake) {
    if (!o.dReal || !o.dFake) {
      throw new SaddleError(
        "invalid-argument",
        `--d-real and --d-fake go together; ${o.dReal ? "--d-fake" : "--d-real"} is missing`,
        { parameter: o.dReal ? "--d-fake" : "--d-real" },
      );
    }
    const a = await readSide(o.dReal, "--d-real"), b = await readSide(o.dFake, "--d-fake");
    for (const [s, p] of [[a.s, o.dReal], [b.s, o.dFake]] as const) {
      if (s.d !== 1) {
        throw new SaddleError(
          "dimension-mismatch",
          `discriminator outputs need one column, the file has ${s.d}; pick it with a one-column file`,
          { file: p },
        );
      }
    }
    real = a.s.data;
    fake = b.s.data;
    paths = [o.dReal, o.dFake];
    sums = [a.sha256, b.sha256];
  } else {
    return undefined;
  }
  for (
    const [v, n, side, file] of [
      [real, nReal, "real", paths[0]],
      [fake, nFake, "generated", paths[paths.length - 1]],
    ] as const
  ) {
    if (v.length !== n) {
      throw new SaddleError(
        "dimension-mismatch",
        `${v.length} discriminator outputs on the ${side} side but the ${side} file has ${n} ` +
          "rows; give one output per row, in file order",
        { file },
      );
    }
  }
  let scale: OutputScale, scaleReason: string;
  const outside = [...real, ...fake].some((x) => x < 0 || x > 1);
  if (o.scoreScale) {
    scale = o.scoreScale;
    scaleReason = "given with --score-scale";
    if (scale === "prob" && outside) {
      throw new SaddleError(
        "invalid-argument",
        "--score-scale prob but some outputs lie outside [0, 1]; use --score-scale logit",
        { file: paths[0] },
      );
    }
  } else {
    scale = outside ? "logit" : "prob";
    scaleReason = outside
      ? "some outputs lie outside [0, 1]: read as logits"
      : "every output lies in [0, 1]: read as probabilities (--score-scale logit to override)";
  }
  return { paths, sha256: sums, real, fake, scale, scaleReason };
}

const REAL_SIDE = new Set(["real", "data", "1", "true"]);
const FAKE_SIDE = new Set(["fake", "generated", "gen", "model", "0", "false"]);

/**
 * Parse a scores file's text: a JSON object `{ "real": [...], "fake": [...] }` (or
 * `"generated"`), a JSON array of `{ "side", <score> }` records, or CSV/TSV with a `side`
 * column and one numeric score column. Throws `SaddleError` naming the file, row and fix.
 *
 * @example
 * ```ts
 * import { parseScores } from "./inputs.ts";
 * import assert from "node:assert/strict";
 * const s = parseScores('{"real":[0.9,0.8],"fake":[0.1]}', "s.json");
 * assert.deepEqual([Array.from(s.real), Array.from(s.fake)], [[0.9, 0.8], [0.1]]);
 * assert.throws(() => parseScores("{oops", "s.json"), /s\.json.*not valid JSON/);
 * ```
 */
export function parseScores(
  text: string,
  file: string,
): { real: Float64Array; fake: Float64Array } {
  const trimmed = text.trimStart();
  let records: Record<string, unknown>[];
  if (trimmed.startsWith("{") || trimmed.startsWith("[")) {
    let json: unknown;
    try {
      json = JSON.parse(text);
    } catch (e) {
      throw new SaddleError(
        "parse",
        `not valid JSON (${(e as Error).message}); write { "real": [...], "fake": [...] } or ` +
          'an array of { "side": "real" | "fake", "score": number } records',
        { file },
      );
    }
    if (json && !Array.isArray(json) && typeof json === "object") {
      const o = json as Record<string, unknown>;
      const fakeKey = "fake" in o ? "fake" : "generated";
      return {
        real: numberArray(o.real, file, "real"),
        fake: numberArray(o[fakeKey], file, fakeKey),
      };
    }
    records = json as Record<string, unknown>[];
  } else {
    const delimiter = /\.(tsv|tab)$/i.test(file) ? "\t" : ",";
    records = dsvFormat(delimiter).parse(text) as unknown as Record<string, unknown>[];
  }
  return sideRecords(records, file);
}

function numberArray(v: unknown, file: string, key: string): Float64Array {
  if (!Array.isArray(v)) {
    throw new SaddleError(
      "parse",
      `"${key}" must be an array of numbers (one discriminator output per row)`,
      { file, column: key },
    );
  }
  const out = new Float64Array(v.length);
  v.forEach((x, i) => {
    if (typeof x !== "number" || !Number.isFinite(x)) {
      throw new SaddleError(
        typeof x === "number" ? "non-finite" : "parse",
        `expected a finite number, found ${JSON.stringify(x)}; fix or drop that row`,
        { file, column: key, row: i },
      );
    }
    out[i] = x;
  });
  return out;
}

function sideRecords(records: Record<string, unknown>[], file: string) {
  if (!records.length || typeof records[0] !== "object" || records[0] === null) {
    throw new SaddleError(
      "empty",
      "no score records; give a header row with a side column and a score column",
      { file },
    );
  }
  const keys = Object.keys(records[0]);
  const sideKey = keys.find((k) => k.trim().toLowerCase() === "side");
  if (!sideKey) {
    throw new SaddleError(
      "not-found",
      `no "side" column (columns: ${keys.join(", ")}); add one saying real or fake on each row`,
      { file, column: "side" },
    );
  }
  const others = keys.filter((k) => k !== sideKey);
  const scoreKey =
    others.find((k) => /^(score|d|prob|probability|logit|output)$/i.test(k.trim())) ??
      (others.length === 1 ? others[0] : undefined);
  if (!scoreKey) {
    throw new SaddleError(
      "not-found",
      `cannot tell the score column among ${
        others.join(", ") || "no other columns"
      }; name it "score"`,
      { file },
    );
  }
  const real: number[] = [], fake: number[] = [];
  records.forEach((r, i) => {
    const side = String(r[sideKey] ?? "").trim().toLowerCase();
    const raw = r[scoreKey];
    const x = typeof raw === "number"
      ? raw
      : typeof raw === "string" && raw.trim() !== ""
      ? Number(raw)
      : NaN;
    if (!Number.isFinite(x)) {
      throw new SaddleError(
        "parse",
        `score ${JSON.stringify(raw)} is not a finite number; fix or drop that row`,
        { file, row: i, column: scoreKey },
      );
    }
    if (REAL_SIDE.has(side)) real.push(x);
    else if (FAKE_SIDE.has(side)) fake.push(x);
    else {
      throw new SaddleError(
        "parse",
        `side ${
          JSON.stringify(r[sideKey])
        } is neither real nor fake (write real/fake, generated, 1/0)`,
        { file, row: i, column: sideKey },
      );
    }
  });
  return { real: Float64Array.from(real), fake: Float64Array.from(fake) };
}
