/**
 * CSV/TSV (and whitespace-separated text) readers on d3-dsv: header detection, quoted
 * fields, CRLF, column choice by name or index, comment lines, and errors that name the
 * file, the line, the row and the column.
 *
 * @module
 */
// @ts-types="npm:@types/d3-dsv@3.0.7"
import { dsvFormat } from "d3-dsv";
import { SaddleError } from "../errors/saddle_error.ts";
import type { Samples } from "./samples.ts";
import { type ColumnSelection, fileLoc } from "./column_selection.ts";
import { lineOfRow } from "./_csv_lines.ts";
import { readText } from "./_io.ts";
import { makeSamples } from "./_make.ts";

/** Options of {@linkcode parseCsv} and {@linkcode readCsv}. */
export interface CsvOptions {
  /** Columns to keep, in order: names from the header, or 0-based indices. Default all. */
  columns?: ColumnSelection;
  /**
   * Field separator, one character: `","`, `"\t"`, `";"`, or `" "` for runs of spaces
   * (numpy.savetxt's default). Default: from the file extension (.csv `,` .tsv tab), else
   * guessed from the first data line (tab, then comma, then semicolon, else spaces).
   */
  delimiter?: string;
  /**
   * Whether the first row is a header of column names. Default `"auto"`: it is a header
   * when one of its cells is not a number (radix literals and nan/inf words count as
   * numbers here, see {@linkcode parseCsv}).
   */
  header?: boolean | "auto";
  /** Lines starting with this character are skipped (default `"#"`; `""` for none). */
  comment?: string;
  /** Number of lines to skip at the start of the text, before the header (default 0). */
  skip?: number;
  /** Names for the columns when the file has no header (one per column, before selection). */
  names?: readonly string[];
  /** Name of the input in error messages (defaults to the path for files). */
  source?: string;
}

const NUMERIC_WORD = /^\s*[+-]?(nan|inf|infinity)\s*$/i;
const RADIX_PREFIX = /^\s*0[xXbBoO]/;

/**
 * Whether a header-detection cell looks like a number: a decimal number, a NaN/inf word,
 * or a radix literal such as `0x10`. Radix literals are refused as data (decimal only),
 * but a row of them is a data row with a bad cell, not a header: so it is reported, never
 * dropped as a header.
 */
function looksNumeric(c: string): boolean {
  const t = c.trim();
  if (t === "") return true;
  return !Number.isNaN(Number(t)) || NUMERIC_WORD.test(t);
}

/**
 * Text with comment lines blanked (their line breaks kept, so line numbers stay right). A
 * line is a comment when, outside a quoted field, it starts with `comment` after spaces or
 * tabs; inside a quoted multi-line field the character is data. Quotes follow d3-dsv's
 * rules: special only at the start of a field, `""` inside quotes is a quote.
 */
function stripComments(text: string, comment: string, delimiter: string): string {
  const parts: string[] = [];
  let from = 0, i = 0, inQuote = false, fieldStart = true, lineStart = true;
  const N = text.length;
  while (i < N) {
    if (lineStart && !inQuote) {
      lineStart = false;
      let j = i;
      while (text[j] === " " || text[j] === "\t") j++;
      if (text[j] === comment) {
        let k = j;
        while (k < N && text[k] !== "\n" && text[k] !== "\r") k++;
        parts.push(text.slice(from, i));
        from = i = k;
        continue;
      }
    }
    const c = text[i];
    if (inQuote) {
      if (c === '"') {
        if (text[i + 1] === '"') i++;
        else inQuote = false;
      }
    } else if (c === '"' && fieldStart) {
      inQuote = true;
      fieldStart = false;
    } else if (c === "\n" || c === "\r") {
      fieldStart = lineStart = true;
    } else fieldStart = c === delimiter;
    i++;
  }
  parts.push(text.slice(from));
  return parts.join("");
}

function guessDelimiter(text: string, comment: string): string {
  for (const raw of text.split(/\r\n|\n|\r/, 50)) {
    const line = raw.trim();
    if (line === "" || (comment !== "" && line.startsWith(comment))) continue;
    if (line.includes("\t")) return "\t";
    if (line.includes(",")) return ",";
    if (line.includes(";")) return ";";
    return " ";
  }
  return ",";
}

/**
 * Samples from CSV/TSV text. Every kept cell must be a finite number: an empty cell, a
 * non-numeric cell or a NaN/inf word is refused with an error naming the line (1-based),
 * the data row (0-based), the column index and the column's name, and saying what would
 * fix it. Blank lines are skipped. A header's names become `columns`.
 *
 * Numbers are decimal, as JavaScript's `Number` reads them without a radix prefix: an
 * optional sign, digits with an optional fraction (`1.`, `.5`), an optional exponent
 * (`1e-3`), spaces around the cell allowed. Hexadecimal, octal and binary literals (`0x10`,
 * `0o7`, `0b1`) are refused naming the cell; `nan`, `inf` and `Infinity` are refused as
 * non-finite; an empty cell is a missing value. With `header: "auto"` the first row is a
 * header only when one of its cells is not a number in any of these notations (so a first
 * row `0x10,2` is data, reported, never dropped as a header). A comment line starts with
 * `comment` outside quotes; inside a quoted multi-line field the character is data.
 *
 * @example Header, quotes and CRLF
 * ```ts
 * import { parseCsv } from "./csv.ts";
 * import assert from "node:assert/strict";
 * const s = parseCsv('label,"x",y\r\na,1,2\r\n"b, c",3,4\r\n', { columns: ["x", "y"] });
 * assert.deepEqual([s.n, s.d, s.columns], [2, 2, ["x", "y"]]);
 * assert.deepEqual(Array.from(s.data), [1, 2, 3, 4]);
 * assert.throws(() => parseCsv("x,y\n1,\n", { source: "a.csv" }), /a\.csv, line 2, row 0, column 1/);
 * ```
 */
export function parseCsv(text: string, options: CsvOptions = {}): Samples {
  const source = options.source;
  const comment = options.comment ?? "#";
  let body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const skip = options.skip ?? 0;
  if (!Number.isInteger(skip) || skip < 0) {
    throw new SaddleError("invalid-argument", `skip must be a non-negative integer, got ${skip}`, {
      ...fileLoc(source),
      parameter: "skip",
    });
  }
  let lineOffset = 0;
  for (let k = 0; k < skip && body.length > 0; k++) {
    const m = /\r\n|\n|\r/.exec(body);
    body = m ? body.slice(m.index + m[0].length) : "";
    lineOffset++;
  }
  if (comment.length > 1) {
    throw new SaddleError("invalid-argument", "comment must be one character or empty", {
      parameter: "comment",
    });
  }
  const delimiter = options.delimiter ?? guessDelimiter(body, comment);
  if (delimiter.length !== 1 || delimiter === '"' || delimiter === "\n" || delimiter === "\r") {
    throw new SaddleError(
      "invalid-argument",
      `delimiter must be one character other than a quote or line break, got ${
        JSON.stringify(delimiter)
      }`,
      { ...fileLoc(source), parameter: "delimiter" },
    );
  }
  if (comment !== "" && body.includes(comment)) body = stripComments(body, comment, delimiter);
  const spaces = delimiter === " ";
  const lineOf = (r: number) => lineOffset + lineOfRow(body, delimiter, r);

  // Upper bound on the rows, to allocate once: the number of line breaks + 1.
  let breaks = 0;
  const nl = body.includes("\n") ? "\n" : "\r";
  for (let p = body.indexOf(nl); p >= 0; p = body.indexOf(nl, p + 1)) breaks++;

  let names: string[] | undefined;
  let width = -1; // fields per row
  let headerLine = 0;
  let keep: number[] = [];
  let d = 0;
  let data = new Float64Array(0);
  let n = 0;
  let rowsSeen = 0;

  const cellError = (r: number, j: number, cell: string): never => {
    const name = names ? `"${names[j]}" (index ${j})` : `${j}`;
    const t = cell.trim();
    const loc = { ...fileLoc(source), line: lineOf(r), row: n, column: j };
    if (t === "") {
      throw new SaddleError(
        "parse",
        `missing value in column ${name}; fill it in, drop the row, or leave the column ` +
          "out with the `columns` option",
        loc,
      );
    }
    if (RADIX_PREFIX.test(t) && !Number.isNaN(Number(t))) {
      throw new SaddleError(
        "parse",
        `${JSON.stringify(t.slice(0, 40))} in column ${name} is a ${
          /^\s*0[xX]/.test(t) ? "hexadecimal" : /^\s*0[bB]/.test(t) ? "binary" : "octal"
        } literal; saddlekit reads decimal numbers only: write it as ${Number(t)}`,
        loc,
      );
    }
    const v = Number(t);
    if (NUMERIC_WORD.test(t) || v === Infinity || v === -Infinity) {
      throw new SaddleError(
        "non-finite",
        `value ${JSON.stringify(t)} in column ${name} is not finite; remove or impute it`,
        loc,
      );
    }
    throw new SaddleError(
      "parse",
      `${JSON.stringify(t.slice(0, 40))} in column ${name} is not a number; fix the cell, ` +
        "or leave the column out with the `columns` option" +
        (names ? "" : " (or pass header: true if this row is a header)"),
      loc,
    );
  };

  const start = (cells: string[], r: number, isHeader: boolean) => {
    width = cells.length;
    headerLine = lineOf(r);
    if (isHeader) names = cells.map((c) => c.trim());
    else if (options.names) {
      if (options.names.length !== width) {
        throw new SaddleError(
          "dimension-mismatch",
          `${options.names.length} names given but the rows have ${width} fields`,
          { ...fileLoc(source), parameter: "names" },
        );
      }
      names = [...options.names];
    }
    keep = resolveColumns(options.columns, names, width, source);
    d = keep.length;
    // A data row of `width` fields takes at least 2 width - 1 characters (a digit and a
    // delimiter each): blank lines do not count towards the first allocation, which grows
    // by doubling when needed.
    const rows = Math.max(
      1,
      Math.min(breaks + 1 - rowsSeen - (isHeader ? 1 : 0), Math.ceil(body.length / (2 * width))),
    );
    data = new Float64Array(rows * d);
  };

  const parser = dsvFormat(delimiter);
  parser.parseRows(body, (raw, r) => {
    rowsSeen++;
    let cells = raw;
    if (spaces) cells = raw.filter((c) => c !== "");
    if (cells.length === 0 || (cells.length === 1 && cells[0].trim() === "")) return null;
    if (width < 0) {
      const h = options.header ?? "auto";
      const isHeader = h === "auto" ? !cells.every(looksNumeric) : h;
      start(cells, r, isHeader);
      if (isHeader) return null;
    }
    if (cells.length !== width) {
      throw new SaddleError(
        "dimension-mismatch",
        `row has ${cells.length} fields but line ${headerLine} has ${width}; check for a ` +
          "missing or extra delimiter, or quote fields that contain one",
        { ...fileLoc(source), line: lineOf(r), row: n },
      );
    }
    if ((n + 1) * d > data.length) {
      const grown = new Float64Array(Math.max(data.length * 2, (n + 1) * d));
      grown.set(data);
      data = grown;
    }
    const base = n * d;
    for (let k = 0; k < d; k++) {
      const j = keep[k];
      const c = cells[j];
      const v = +c;
      // `v - v` is 0 only for finite v; "" and blanks are 0 for `+`, hex too: check those.
      if (
        v - v !== 0 || (v === 0 && c.trim() === "") ||
        (Number.isInteger(v) && c.length > 2 && RADIX_PREFIX.test(c))
      ) {
        cellError(r, j, c);
      }
      data[base + k] = v;
    }
    n++;
    return null;
  });
  if (n === 0) {
    throw new SaddleError(
      "empty",
      names ? "the file has a header but no data rows" : "the file holds no data rows",
      fileLoc(source),
    );
  }
  const out = data.length === n * d ? data : data.slice(0, n * d);
  const cols = names ? keep.map((j) => names![j]) : undefined;
  return makeSamples(n, d, out, cols);
}

function resolveColumns(
  columns: ColumnSelection | undefined,
  names: string[] | undefined,
  width: number,
  source: string | undefined,
): number[] {
  if (columns === undefined) return Array.from({ length: width }, (_, j) => j);
  if (columns.length === 0) {
    throw new SaddleError("empty", "no columns chosen", {
      ...fileLoc(source),
      parameter: "columns",
    });
  }
  const list = () =>
    names ? names.map((c, j) => `${j}: "${c}"`).join(", ") : `indices 0..${width - 1}`;
  return columns.map((c) => {
    if (typeof c === "number") {
      if (!Number.isInteger(c) || c < 0 || c >= width) {
        throw new SaddleError(
          "invalid-argument",
          `column ${c} is outside the file's columns (${list()})`,
          { ...fileLoc(source), parameter: "columns" },
        );
      }
      return c;
    }
    if (!names) {
      throw new SaddleError(
        "invalid-argument",
        `column "${c}" chosen by name but the file has no header row; choose by index ` +
          `(0..${width - 1}), pass header: true, or give names`,
        { ...fileLoc(source), parameter: "columns" },
      );
    }
    const j = names.indexOf(c);
    if (j < 0) {
      throw new SaddleError("not-found", `no column named "${c}"; columns are ${list()}`, {
        ...fileLoc(source),
        parameter: "columns",
      });
    }
    return j;
  });
}

/**
 * Read a CSV/TSV/text file (see {@linkcode parseCsv}); the delimiter defaults from the
 * extension: `.csv` comma, `.tsv`/`.tab` tab, otherwise guessed.
 *
 * @example
 * ```ts
 * import { readCsv } from "./csv.ts";
 * import assert from "node:assert/strict";
 * const path = await Deno.makeTempFile({ suffix: ".tsv" });
 * await Deno.writeTextFile(path, "x\ty\n1\t2\n3\t4\n");
 * const s = await readCsv(path);
 * assert.deepEqual([s.n, s.d, s.columns], [2, 2, ["x", "y"]]);
 * await Deno.remove(path);
 * ```
 */
export async function readCsv(path: string, options: CsvOptions = {}): Promise<Samples> {
  const source = options.source ?? path;
  const text = await readText(path, source);
  const lower = path.toLowerCase();
  const delimiter = options.delimiter ??
    (lower.endsWith(".csv")
      ? ","
      : lower.endsWith(".tsv") || lower.endsWith(".tab")
      ? "\t"
      : undefined);
  return parseCsv(text, { ...options, source, ...(delimiter ? { delimiter } : {}) });
}
