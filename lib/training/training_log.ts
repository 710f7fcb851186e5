/**
 * Training logs: CSV/TSV and JSON-lines files (or in-memory records and columns) with a
 * step column, the discriminator and generator losses, D's mean output on real and on
 * generated samples, and any other metric; several runs in one file; restarts, gaps and
 * NaN rows handled and reported.
 *
 * @module
 */
// @ts-types="npm:@types/d3-dsv@3.0.7"
import { dsvFormat } from "d3-dsv";
import { withDisplay } from "../display/display.ts";
import { escapeHtml, htmlTable, type TableCell, textTable } from "../display/table.ts";
import { SaddleError } from "../errors/saddle_error.ts";

/** The roles a log column can play. */
export type TrainingRole = "step" | "run" | "dLoss" | "gLoss" | "dReal" | "dFake";

/** What each role means, for notes and tables. */
export const TRAINING_ROLE_NAMES: Readonly<Record<TrainingRole, string>> = Object.freeze({
  step: "step",
  run: "run",
  dLoss: "discriminator loss",
  gLoss: "generator loss",
  dReal: "D on real",
  dFake: "D on fake",
});

/**
 * Common spellings of each role, compared after lower-casing and dropping every character
 * that is not a letter or digit (so `Loss_D`, `loss-d` and `lossD` all read `lossd`, and
 * `D(G(z))` reads `dgz`). The first column matching a role, in file order, takes it.
 */
export const TRAINING_COLUMN_SPELLINGS: Readonly<Record<TrainingRole, readonly string[]>> = Object
  .freeze({
    step: ["step", "steps", "globalstep", "iteration", "iter", "it", "iterations", "batch"],
    run: ["run", "runid", "runname", "trial", "experiment"],
    dLoss: [
      "dloss",
      "lossd",
      "discloss",
      "lossdisc",
      "discriminatorloss",
      "lossdiscriminator",
      "errd",
      "dcost",
    ],
    gLoss: [
      "gloss",
      "lossg",
      "genloss",
      "lossgen",
      "generatorloss",
      "lossgenerator",
      "errg",
      "gcost",
    ],
    dReal: ["dreal", "dx", "realscore", "scorereal", "donreal", "drealmean", "probreal", "preal"],
    dFake: [
      "dfake",
      "dgz",
      "dgz1",
      "fakescore",
      "scorefake",
      "donfake",
      "dfakemean",
      "probfake",
      "pfake",
    ],
  });

/** Options of {@linkcode readTrainingLog}, {@linkcode parseTrainingLog} and {@linkcode trainingLog}. */
export interface TrainingLogOptions {
  /**
   * Column of each role by name, overriding the guess: e.g.
   * `{ dLoss: "loss_disc", dFake: "p_fake" }`. Roles not given are guessed from
   * {@linkcode TRAINING_COLUMN_SPELLINGS}; every guess is said in the log's notes.
   */
  columns?: Partial<Record<TrainingRole, string>>;
  /**
   * Text format (default: `.jsonl`/`.ndjson` JSON lines, `.json` a JSON array of records,
   * else by content: a first character `{` or `[`, otherwise CSV).
   */
  format?: "csv" | "jsonl" | "json";
  /** CSV field separator (default: `.tsv` tab, `.csv` comma, else guessed: tab, comma, semicolon). */
  delimiter?: string;
  /** CSV lines starting with this character are skipped (default `"#"`). */
  comment?: string;
  /** Name of the input in messages (defaults to the path). */
  source?: string;
}

/** A step where a loss or D output was logged as NaN or ±Infinity. */
export interface NonFiniteEntry {
  /** The step. */
  readonly step: number;
  /** The column. */
  readonly column: string;
  /** The value as logged (NaN or ±Infinity). */
  readonly value: number;
}

/** One run of a log: steps in increasing order, one value per step and column. */
export interface TrainingRun {
  /** The run's name (the run column's value; `""` when there is no run column). */
  readonly name: string;
  /** Steps, increasing, without repeats. */
  readonly steps: Float64Array;
  /**
   * Values by column name, aligned with `steps`. NaN where a value was absent (an empty
   * cell, a missing JSON key) or logged as NaN; logged NaN/±Infinity values of the role
   * columns are also listed in `nonFinite`.
   */
  readonly columns: Readonly<Record<string, Float64Array>>;
  /** Logged non-finite values of the role columns and metrics (not absent ones). */
  readonly nonFinite: readonly NonFiniteEntry[];
  /** Rows replaced by a later row with the same step (restarts). */
  readonly replaced: number;
  /** Steps where the log went back (a restart), with the step it had reached. */
  readonly restarts: readonly { readonly from: number; readonly to: number }[];
  /** The usual step increment (median difference). */
  readonly stepSize: number;
  /** Gaps: increments above 1.5 x `stepSize`, as [step before, step after]. */
  readonly gaps: readonly (readonly [number, number])[];
}

/** A training log: the role of each column, the runs, and what the reader did. */
export interface TrainingLog {
  /** Where it came from (a path, or "records"/"columns"). */
  readonly source: string;
  /** Column name of each role found (given or guessed). */
  readonly roles: Readonly<Partial<Record<TrainingRole, string>>>;
  /** Roles whose column was guessed rather than given. */
  readonly guessed: readonly TrainingRole[];
  /** Numeric columns that play no role (extra metrics), in file order. */
  readonly metrics: readonly string[];
  /** The runs, in order of first appearance. */
  readonly runs: readonly TrainingRun[];
  /** The guesses, restarts, gaps, NaN rows and ignored text columns, said out loud. */
  readonly notes: readonly string[];
}

/** One parsed row before runs are split: the run, the step, the cells, the line. */
interface RawTable {
  names: string[];
  /** Cells by column, as text or numbers; null when absent. */
  rows: (string | number | null)[][];
  /** 1-based line of each row (0 for in-memory input). */
  lines: number[];
  /** Whether line numbers are meaningful. */
  file: boolean;
  source: string;
}

const NAN_WORDS = /^[+-]?(nan|inf|infinity)$/i;

/** Number of a cell: NaN for absent cells and NaN words, undefined when not a number. */
function cellNumber(c: string | number | null): number | undefined {
  if (c === null) return NaN;
  if (typeof c === "number") return c;
  const t = c.trim();
  if (t === "" || /^(null|none|na)$/i.test(t)) return NaN;
  if (NAN_WORDS.test(t)) {
    return /nan/i.test(t) ? NaN : t.startsWith("-") ? -Infinity : Infinity;
  }
  const v = Number(t);
  return Number.isNaN(v) || /^\s*0[xXbBoO]/.test(t) ? undefined : v;
}

function normalise(name: string): string {
  return name.toLowerCase().replace(/[^a-z0-9]/g, "");
}

function parseCsvTable(
  text: string,
  source: string,
  delimiter: string | undefined,
  comment: string,
): RawTable {
  const lines = text.split(/\r\n|\n|\r/);
  const isSkipped = (l: string) =>
    l.trim() === "" || (comment !== "" && l.trimStart().startsWith(comment));
  const first = lines.findIndex((l) => !isSkipped(l));
  if (first < 0) throw new SaddleError("empty", "the log holds no lines", { file: source });
  const delim = delimiter ??
    (lines[first].includes("\t") ? "\t" : lines[first].includes(",") ? "," : ";");
  const parser = dsvFormat(delim);
  const names = parser.parseRows(lines[first])[0].map((c) => c.trim());
  if (names.every((c) => cellNumber(c) !== undefined)) {
    throw new SaddleError(
      "parse",
      "the first line is not a header of column names; a log needs named columns " +
        "(add a header line such as step,d_loss,g_loss)",
      { file: source, line: first + 1 },
    );
  }
  const rows: (string | null)[][] = [], at: number[] = [];
  for (let i = first + 1; i < lines.length; i++) {
    if (isSkipped(lines[i])) continue;
    const cells = parser.parseRows(lines[i])[0] ?? [];
    if (cells.length !== names.length) {
      throw new SaddleError(
        "dimension-mismatch",
        `row has ${cells.length} fields but the header (line ${first + 1}) has ${names.length}; ` +
          "check for a missing or extra delimiter",
        { file: source, line: i + 1 },
      );
    }
    rows.push(cells);
    at.push(i + 1);
  }
  return { names, rows, lines: at, file: true, source };
}

/** Python's json module writes bare NaN and Infinity: read them as their words. */
function quoteNanWords(text: string): string {
  return text.replace(
    /([:\[,]\s*)(-?Infinity|NaN)(?=\s*[,}\]])/g,
    (_m, pre: string, w: string) => `${pre}"${w}"`,
  );
}

/**
 * A table from objects of named values: the union of their keys in order of appearance, a
 * missing key absent. `lines` are the objects' 1-based lines, or undefined when errors
 * should name the row (0-based) instead.
 */
function objectsTable(
  objs: readonly unknown[],
  source: string,
  lines?: readonly number[],
): RawTable {
  const where = (
    r: number,
  ) => (lines ? { file: source, line: lines[r] } : { file: source, row: r });
  const names: string[] = [], index = new Map<string, number>();
  objs.forEach((o, r) => {
    if (o === null || typeof o !== "object" || Array.isArray(o)) {
      throw new SaddleError("parse", "each record must be one object of named values", where(r));
    }
    for (const k of Object.keys(o)) {
      if (!index.has(k)) {
        index.set(k, names.length);
        names.push(k);
      }
    }
  });
  const rows = objs.map((o, r) =>
    names.map((k) => {
      const v = (o as Record<string, unknown>)[k];
      if (v === undefined || v === null) return null;
      if (typeof v === "number" || typeof v === "string") return v;
      if (typeof v === "boolean") return v ? 1 : 0;
      throw new SaddleError(
        "parse",
        `value of "${k}" is ${Array.isArray(v) ? "an array" : "an object"}; a log holds ` +
          "one number (or a run name) per key",
        { ...where(r), column: k },
      );
    })
  );
  return {
    names,
    rows,
    lines: lines ? [...lines] : rows.map(() => 0),
    file: lines !== undefined,
    source,
  };
}

function parseJsonLinesTable(text: string, source: string): RawTable {
  const objs: unknown[] = [], at: number[] = [];
  text.split(/\r\n|\n|\r/).forEach((line, i) => {
    const t = line.trim();
    if (t === "") return;
    try {
      objs.push(JSON.parse(quoteNanWords(t)));
    } catch (e) {
      throw new SaddleError(
        "parse",
        `not valid JSON (${(e as Error).message}); each line must be one JSON object`,
        { file: source, line: i + 1 },
      );
    }
    at.push(i + 1);
  });
  return objectsTable(objs, source, at);
}

function parseJsonArrayTable(text: string, source: string): RawTable {
  let arr: unknown;
  try {
    arr = JSON.parse(quoteNanWords(text));
  } catch (e) {
    throw new SaddleError("parse", `not valid JSON (${(e as Error).message})`, { file: source });
  }
  if (!Array.isArray(arr)) {
    throw new SaddleError("parse", "a JSON log is an array of records (one object per step)", {
      file: source,
    });
  }
  return objectsTable(arr, source);
}

/** Find the column of each role: given names first, then common spellings. */
function assignRoles(
  names: readonly string[],
  given: Partial<Record<TrainingRole, string>>,
  source: string,
): { roles: Partial<Record<TrainingRole, string>>; guessed: TrainingRole[] } {
  const roles: Partial<Record<TrainingRole, string>> = {};
  const guessed: TrainingRole[] = [];
  const taken = new Set<string>();
  for (const [role, name] of Object.entries(given) as [TrainingRole, string][]) {
    if (name === undefined) continue;
    if (!(role in TRAINING_ROLE_NAMES)) {
      throw new SaddleError(
        "invalid-argument",
        `unknown role "${role}"; roles are ${Object.keys(TRAINING_ROLE_NAMES).join(", ")}`,
        { parameter: "columns" },
      );
    }
    if (!names.includes(name)) {
      throw new SaddleError(
        "not-found",
        `no column named "${name}" for the ${TRAINING_ROLE_NAMES[role]}; columns are ${
          names.map((n) => `"${n}"`).join(", ")
        }`,
        { file: source, parameter: "columns" },
      );
    }
    roles[role] = name;
    taken.add(name);
  }
  for (const role of Object.keys(TRAINING_COLUMN_SPELLINGS) as TrainingRole[]) {
    if (roles[role] !== undefined) continue;
    const spellings = TRAINING_COLUMN_SPELLINGS[role];
    let best: string | undefined, rank = Infinity;
    for (const n of names) {
      const k = spellings.indexOf(normalise(n));
      if (k >= 0 && k < rank && !taken.has(n)) [best, rank] = [n, k];
    }
    if (best !== undefined) {
      roles[role] = best;
      taken.add(best);
      guessed.push(role);
    }
  }
  if (roles.step === undefined) {
    throw new SaddleError(
      "not-found",
      `no step column: none of ${names.map((n) => `"${n}"`).join(", ")} reads as a step ` +
        `(${TRAINING_COLUMN_SPELLINGS.step.join(", ")}); name it with columns: { step: "..." }`,
      { file: source, parameter: "columns" },
    );
  }
  return { roles, guessed };
}

function median(x: ArrayLike<number>): number {
  const s = Float64Array.from(x).sort();
  if (s.length === 0) return NaN;
  const h = s.length >> 1;
  return s.length % 2 ? s[h] : (s[h - 1] + s[h]) / 2;
}

function buildLog(table: RawTable, options: TrainingLogOptions): TrainingLog {
  const { names, rows, source } = table;
  if (rows.length === 0) {
    throw new SaddleError("empty", "the log has a header but no rows", { file: source });
  }
  const { roles, guessed } = assignRoles(names, options.columns ?? {}, source);
  const where = (r: number, column: string) =>
    table.file ? { file: source, line: table.lines[r], column } : { file: source, row: r, column };
  // A column is numeric unless its first present cell is text; role columns must be numeric.
  const numeric = names.map((n, j) => {
    if (n === roles.run) return false;
    const firstPresent = rows.find((r) => r[j] !== null && String(r[j]).trim() !== "");
    return firstPresent === undefined || cellNumber(firstPresent[j]) !== undefined;
  });
  const notes: string[] = [];
  for (const role of guessed) {
    notes.push(
      `guessed the ${TRAINING_ROLE_NAMES[role]} column: "${roles[role]}" (name another with ` +
        `columns: { ${role}: "..." })`,
    );
  }
  for (const role of ["dLoss", "gLoss", "dReal", "dFake"] as const) {
    if (roles[role] === undefined) notes.push(`no ${TRAINING_ROLE_NAMES[role]} column found`);
  }
  const roleColumns = new Set(Object.values(roles));
  const textCols = names.filter((n, j) => !numeric[j] && n !== roles.run);
  if (textCols.length) {
    notes.push(`ignored text column(s) ${textCols.map((c) => `"${c}"`).join(", ")}`);
  }
  const kept = names.map((_, j) => j).filter((j) => numeric[j] && names[j] !== roles.step);
  const jStep = names.indexOf(roles.step!);
  const jRun = roles.run !== undefined ? names.indexOf(roles.run) : -1;
  const values = rows.map((r, i) =>
    kept.map((j) => {
      const v = cellNumber(r[j]);
      if (v === undefined) {
        const isRole = roleColumns.has(names[j]);
        throw new SaddleError(
          "parse",
          `${JSON.stringify(String(r[j]).slice(0, 40))} in column "${names[j]}" is not a number` +
            (isRole ? "" : " (the column's first value was a number)") +
            "; fix the cell or write NaN",
          where(i, names[j]),
        );
      }
      return v;
    })
  );
  const present = rows.map((r) => kept.map((j) => r[j] !== null && String(r[j]).trim() !== ""));
  const stepOf = rows.map((r, i) => {
    const s = cellNumber(r[jStep]);
    if (s === undefined || !Number.isFinite(s)) {
      throw new SaddleError(
        "parse",
        `step ${JSON.stringify(r[jStep])} is not a finite number; every row needs its step`,
        where(i, names[jStep]),
      );
    }
    return s;
  });
  // Split into runs, in order of first appearance; within a run the last row of a step wins.
  const runOrder: string[] = [];
  const byRun = new Map<string, number[]>();
  rows.forEach((r, i) => {
    const name = jRun >= 0 ? String(r[jRun] ?? "").trim() : "";
    if (!byRun.has(name)) {
      byRun.set(name, []);
      runOrder.push(name);
    }
    byRun.get(name)!.push(i);
  });
  const metricNames = kept.map((j) => names[j]);
  const runs = runOrder.map((name) => {
    const idx = byRun.get(name)!;
    const last = new Map<number, number>();
    const restarts: { from: number; to: number }[] = [];
    let prev = -Infinity;
    for (const i of idx) {
      const s = stepOf[i];
      if (s < prev) restarts.push({ from: prev, to: s });
      prev = s;
      last.set(s, i);
    }
    const order = [...last.keys()].sort((a, b) => a - b);
    const steps = Float64Array.from(order);
    const columns: Record<string, Float64Array> = {};
    const nonFinite: NonFiniteEntry[] = [];
    metricNames.forEach((c, k) => {
      const col = new Float64Array(order.length);
      order.forEach((s, t) => {
        const i = last.get(s)!;
        const v = values[i][k];
        col[t] = v;
        if (!Number.isFinite(v) && present[i][k]) nonFinite.push({ step: s, column: c, value: v });
      });
      columns[c] = col;
    });
    const diffs = steps.slice(1).map((s, t) => s - steps[t]);
    const stepSize = diffs.length ? median(diffs) : NaN;
    const gaps: [number, number][] = [];
    diffs.forEach((dlt, t) => {
      if (dlt > 1.5 * stepSize) gaps.push([steps[t], steps[t + 1]]);
    });
    const run: TrainingRun = {
      name,
      steps,
      columns,
      nonFinite,
      replaced: idx.length - order.length,
      restarts,
      stepSize,
      gaps,
    };
    const label = name === "" ? "" : `run "${name}": `;
    if (run.replaced > 0) {
      notes.push(
        `${label}${run.replaced} row(s) repeat an earlier step (restart${
          restarts.length ? ` at ${restarts.map((r) => `${r.to} after ${r.from}`).join(", ")}` : ""
        }); the last row of each step is kept`,
      );
    }
    if (gaps.length) {
      const widest = gaps.reduce((a, b) => (b[1] - b[0] > a[1] - a[0] ? b : a));
      notes.push(
        `${label}${gaps.length} gap(s) in the steps (usual increment ${stepSize}; widest from ` +
          `${widest[0]} to ${widest[1]}); the diagnosis reads the series in record order`,
      );
    }
    if (nonFinite.length) {
      const cols = [...new Set(nonFinite.map((e) => e.column))];
      notes.push(
        `${label}${nonFinite.length} logged NaN/infinite value(s) in ${
          cols.map((c) => `"${c}"`).join(", ")
        }, first at step ${nonFinite[0].step}; kept and flagged`,
      );
    }
    return Object.freeze(run);
  });
  const metrics = metricNames.filter((c) => !roleColumns.has(c));
  const log: TrainingLog = {
    source,
    roles: Object.freeze(roles),
    guessed: Object.freeze(guessed),
    metrics,
    runs,
    notes,
  };
  return Object.freeze(withDisplay(log, logBundle));
}

function logBundle(log: TrainingLog): Record<string, string> {
  const header = ["run", "records", "steps", "replaced rows", "gaps", "NaN/inf values"];
  const rows: TableCell[][] = log.runs.map((r) => [
    r.name || "(one run)",
    r.steps.length,
    `${r.steps[0]} to ${r.steps[r.steps.length - 1]} by ${r.stepSize}`,
    r.replaced,
    r.gaps.length,
    r.nonFinite.length,
  ]);
  const roleRows: TableCell[][] = (Object.keys(TRAINING_ROLE_NAMES) as TrainingRole[])
    .filter((k) => log.roles[k] !== undefined)
    .map((
      k,
    ) => [TRAINING_ROLE_NAMES[k], log.roles[k]!, log.guessed.includes(k) ? "guessed" : "given"]);
  const title = `Training log ${log.source}`;
  const metrics = log.metrics.length ? `other metrics: ${log.metrics.join(", ")}` : "";
  return {
    "text/plain": [
      title,
      textTable(["role", "column", ""], roleRows),
      textTable(header, rows),
      metrics,
      ...log.notes.map((n) => `- ${n}`),
    ].filter(Boolean).join("\n"),
    "text/html": `<div><b>${escapeHtml(title)}</b>${htmlTable(["role", "column", ""], roleRows)}${
      htmlTable(header, rows)
    }${metrics ? `<p>${escapeHtml(metrics)}</p>` : ""}<ul>${
      log.notes.map((n) => `<li>${escapeHtml(n)}</li>`).join("")
    }</ul></div>`,
  };
}

/**
 * A training log from text: CSV/TSV with a header line, or JSON lines (one object per
 * line; `NaN` and `Infinity` as Python's json module writes them are read). See
 * {@linkcode readTrainingLog} for what is tolerated and what is refused.
 *
 * @example
 * ```ts
 * import { parseTrainingLog } from "./training_log.ts";
 * import assert from "node:assert/strict";
 * const log = parseTrainingLog('{"iter": 0, "loss_D": 1.2}\n{"iter": 10, "loss_D": NaN}\n');
 * assert.equal(log.roles.step, "iter");
 * assert.ok(Number.isNaN(log.runs[0].columns["loss_D"][1]));
 * assert.equal(log.runs[0].nonFinite[0].step, 10);
 * ```
 */
export function parseTrainingLog(text: string, options: TrainingLogOptions = {}): TrainingLog {
  const source = options.source ?? "text";
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const head = body.trimStart();
  const format = options.format ??
    (head.startsWith("{") ? "jsonl" : head.startsWith("[") ? "json" : "csv");
  const table = format === "jsonl"
    ? parseJsonLinesTable(body, source)
    : format === "json"
    ? parseJsonArrayTable(body, source)
    : parseCsvTable(body, source, options.delimiter, options.comment ?? "#");
  return buildLog(table, options);
}

/**
 * Read a training log file: CSV/TSV (`.csv`, `.tsv`, or text with a header line), JSON
 * lines (`.jsonl`, `.ndjson`, or a first line starting with `{`), or a JSON array of
 * records (`.json`, or text starting with `[`).
 *
 * Columns are named by the user (`columns: { step, run, dLoss, gLoss, dReal, dFake }`) or
 * guessed from common spellings ({@linkcode TRAINING_COLUMN_SPELLINGS}); each guess is
 * written into `notes` and shown in the display. Other numeric columns are kept as extra
 * metrics; text columns other than the run column are ignored (said in the notes).
 *
 * Tolerated: missing steps (gaps are listed), repeated steps (a restart: the last row of a
 * step is kept), NaN, `inf` and empty cells (kept as NaN or ±Infinity; logged NaN/inf
 * values are listed in each run's `nonFinite` and flagged by the diagnosis), and several
 * runs in one file (a run column). Refused with a {@linkcode SaddleError} naming the file,
 * the line and the column: no step column, a row with more or fewer fields than the header,
 * a non-number in a numeric column, a step that is not a finite number.
 *
 * @example Two lines in a notebook: the log, then its diagnosis (see diagnoseTraining)
 * ```ts
 * import { readTrainingLog } from "./training_log.ts";
 * import { diagnoseTraining } from "./diagnose_training.ts";
 * import assert from "node:assert/strict";
 * const path = await Deno.makeTempFile({ suffix: ".csv" });
 * const rows = Array.from({ length: 300 }, (_, i) =>
 *   `${10 * i},${2 * Math.LN2 + Math.exp(-i / 30) + 0.03 * Math.sin(i * 7.3)},` +
 *   `${Math.LN2 + 0.03 * Math.cos(i * 5.1)}`);
 * await Deno.writeTextFile(path, "iteration,Loss_D,Loss_G\n" + rows.join("\n"));
 * const diagnosis = diagnoseTraining(await readTrainingLog(path));
 * assert.match(diagnosis.log.notes[0], /guessed the step column: "iteration"/);
 * assert.deepEqual(diagnosis.flags.map((f) => f.kind), []);
 * await Deno.remove(path);
 * ```
 */
export async function readTrainingLog(
  path: string,
  options: TrainingLogOptions = {},
): Promise<TrainingLog> {
  const source = options.source ?? path;
  let text: string;
  try {
    text = await Deno.readTextFile(path);
  } catch (e) {
    if (e instanceof Deno.errors.NotFound) {
      throw new SaddleError("not-found", "no such file; check the path and working directory", {
        file: source,
      });
    }
    throw e;
  }
  const lower = path.toLowerCase();
  const format = options.format ??
    (lower.endsWith(".jsonl") || lower.endsWith(".ndjson")
      ? "jsonl"
      : lower.endsWith(".json")
      ? "json"
      : undefined);
  const delimiter = options.delimiter ??
    (lower.endsWith(".tsv") || lower.endsWith(".tab")
      ? "\t"
      : lower.endsWith(".csv")
      ? ","
      : undefined);
  return parseTrainingLog(text, {
    ...options,
    source,
    ...(format ? { format } : {}),
    ...(delimiter ? { delimiter } : {}),
  });
}

/** In-memory log input: records (one object per logged step) or named columns of equal length. */
export type TrainingLogInput =
  | readonly Readonly<Record<string, number | string | null | undefined>>[]
  | Readonly<Record<string, ArrayLike<number | string | null>>>;

/**
 * A training log from records (one object per step) or from named columns of equal
 * length, with the same role guessing and tolerance as {@linkcode readTrainingLog}. Errors
 * name the row (0-based) and the column.
 *
 * @example
 * ```ts
 * import { trainingLog } from "./training_log.ts";
 * import assert from "node:assert/strict";
 * const log = trainingLog({ step: [0, 1, 2], d_loss: [1.5, 1.4, 1.39] });
 * assert.equal(log.roles.dLoss, "d_loss");
 * assert.throws(() => trainingLog({ step: [0, 1], d_loss: [1] }), /unequal|length/);
 * ```
 */
export function trainingLog(
  input: TrainingLogInput,
  options: TrainingLogOptions = {},
): TrainingLog {
  const source = options.source ?? (Array.isArray(input) ? "records" : "columns");
  if (Array.isArray(input)) return buildLog(objectsTable(input, source), options);
  if (input === null || typeof input !== "object") {
    throw new SaddleError(
      "invalid-argument",
      "a log is an array of records or an object of columns",
      {
        parameter: "input",
      },
    );
  }
  const cols = input as Readonly<Record<string, ArrayLike<number | string | null>>>;
  const names = Object.keys(cols);
  if (names.length === 0) throw new SaddleError("empty", "no columns", { parameter: "input" });
  const n = cols[names[0]].length;
  for (const k of names) {
    if (cols[k].length !== n) {
      throw new SaddleError(
        "dimension-mismatch",
        `unequal column lengths: "${k}" has ${cols[k].length} values but "${names[0]}" has ${n}`,
        { parameter: "input", column: k },
      );
    }
  }
  const rows = Array.from({ length: n }, (_, i) => names.map((k) => cols[k][i] ?? null));
  return buildLog({ names, rows, lines: rows.map(() => 0), file: false, source }, options);
}

/**
 * The values of a role's column in a run (undefined when the log has no such column).
 *
 * @example
 * ```ts
 * import { roleSeries, trainingLog } from "./training_log.ts";
 * import assert from "node:assert/strict";
 * const log = trainingLog({ step: [0, 1], errD: [2, 1] });
 * assert.deepEqual(Array.from(roleSeries(log, log.runs[0], "dLoss")!), [2, 1]);
 * ```
 */
export function roleSeries(
  log: TrainingLog,
  run: TrainingRun,
  role: Exclude<TrainingRole, "step" | "run">,
): Float64Array | undefined {
  const c = log.roles[role];
  return c === undefined ? undefined : run.columns[c];
}
