/**
 * CSV/TSV edge cases. Expected values are the plain reading of each small text (worked by
 * hand); line numbers are 1-based as editors show them.
 */
import assert from "node:assert/strict";
import { parseCsv, readCsv } from "../../lib/samples/csv.ts";
import { SaddleError, type SaddleErrorCode } from "../../lib/errors/saddle_error.ts";

function rejects(
  f: () => unknown,
  code: SaddleErrorCode,
  loc: { line?: number; row?: number; column?: number },
  message: RegExp,
) {
  assert.throws(f, (e: unknown) => {
    assert.ok(e instanceof SaddleError, `not a SaddleError: ${e}`);
    assert.equal(e.code, code, e.message);
    for (const [k, v] of Object.entries(loc)) {
      assert.equal(e.location[k as keyof typeof loc], v, `${k} in ${e.message}`);
    }
    assert.match(e.message, message);
    return true;
  });
}

Deno.test("header detected when a first-row cell is not a number; names kept", () => {
  const s = parseCsv("x,y\n1,2\n3.5,-4e-3\n");
  assert.deepEqual([s.n, s.d, s.columns], [2, 2, ["x", "y"]]);
  assert.deepEqual(Array.from(s.data), [1, 2, 3.5, -4e-3]);
  const t = parseCsv("1,2\n3,4\n");
  assert.equal(t.columns, undefined);
  assert.equal(t.n, 2);
});

Deno.test("header option forces or forbids a header", () => {
  const s = parseCsv("10,20\n1,2\n", { header: true });
  assert.deepEqual([s.n, s.columns], [1, ["10", "20"]]);
  rejects(
    () => parseCsv("x,y\n1,2\n", { header: false }),
    "parse",
    { line: 1, row: 0 },
    /header: true/,
  );
});

Deno.test("quoted fields: delimiters, doubled quotes and line breaks inside quotes", () => {
  const text = 'name,x,y\n"a, b",1,2\n"say ""hi""",3,4\n"two\nlines",5,6\n';
  const s = parseCsv(text, { columns: ["x", "y"] });
  assert.deepEqual(Array.from(s.data), [1, 2, 3, 4, 5, 6]);
  // Quoted numbers are numbers.
  assert.deepEqual(Array.from(parseCsv('"1","2"\n"3","4"').data), [1, 2, 3, 4]);
  // A line break inside quotes shifts the line numbers of later rows: row 3 is on line 6.
  rejects(
    () => parseCsv(text + "z,7,oops\n", { columns: ["x", "y"], source: "q.csv" }),
    "parse",
    { line: 6, row: 3, column: 2 },
    /q\.csv, line 6.*"oops" in column "y" \(index 2\) is not a number/,
  );
});

Deno.test("CRLF and lone CR line endings, BOM, trailing blank lines", () => {
  const s = parseCsv("\ufeffx,y\r\n1,2\r\n3,4\r\n\r\n");
  assert.deepEqual([s.columns, Array.from(s.data)], [["x", "y"], [1, 2, 3, 4]]);
  const r = parseCsv("x,y\r1,2\r3,4");
  assert.deepEqual(Array.from(r.data), [1, 2, 3, 4]);
  rejects(
    () => parseCsv("x,y\r\n1,2\r\n3,\r\n"),
    "parse",
    { line: 3, row: 1, column: 1 },
    /missing/,
  );
});

Deno.test("missing value: error names file, line, row, column name and index, and a fix", () => {
  rejects(
    () => parseCsv("id,x,y\n1,0.5,0.25\n2,,0.75\n", { source: "real.csv" }),
    "parse",
    { line: 3, row: 1, column: 1 },
    /real\.csv, line 3, row 1, column 1: missing value in column "x" \(index 1\); fill it in/,
  );
  // Whitespace-only counts as missing, not as 0.
  rejects(() => parseCsv("1, \n"), "parse", { line: 1, row: 0, column: 1 }, /missing/);
});

Deno.test("non-numeric, NaN and infinite cells", () => {
  rejects(
    () => parseCsv("x\n1\nabc\n"),
    "parse",
    { line: 3, row: 1, column: 0 },
    /"abc".*not a number/,
  );
  for (const w of ["NaN", "nan", "inf", "-Infinity", "Infinity"]) {
    rejects(() => parseCsv(`x\n1\n${w}\n`), "non-finite", { line: 3, row: 1 }, /not finite/);
  }
  rejects(() => parseCsv("x\n1e999\n"), "non-finite", { line: 2 }, /not finite/);
  // Hex and other radix prefixes are not decimal numbers.
  rejects(
    () => parseCsv("x\n1\n0x1A\n"),
    "parse",
    { line: 3 },
    /hexadecimal literal.*decimal numbers only: write it as 26/,
  );
});

Deno.test("ragged rows are refused with the line and the expected width", () => {
  rejects(
    () => parseCsv("x,y,z\n1,2,3\n4,5\n"),
    "dimension-mismatch",
    { line: 3, row: 1 },
    /2 fields but line 1 has 3/,
  );
  rejects(() => parseCsv("1,2\n3,4,5\n"), "dimension-mismatch", { line: 2, row: 1 }, /3 fields/);
});

Deno.test("TSV, semicolons and whitespace-separated text (numpy.savetxt's default)", () => {
  assert.deepEqual(Array.from(parseCsv("a\tb\n1\t2\n").data), [1, 2]);
  assert.deepEqual(Array.from(parseCsv("a;b\n1.5;2\n", { delimiter: ";" }).data), [1.5, 2]);
  assert.deepEqual(Array.from(parseCsv("a;b\n1.5;2\n").data), [1.5, 2]); // guessed
  const ws = parseCsv("1.000000000000000000e+00 2.500000000000000000e+00\n  3  4 \n");
  assert.deepEqual([ws.d, Array.from(ws.data)], [2, [1, 2.5, 3, 4]]);
  // A TSV whose fields contain commas stays TSV when the delimiter is given.
  const t = parseCsv("name\tx\na,b\t1\n", { delimiter: "\t", columns: ["x"] });
  assert.deepEqual(Array.from(t.data), [1]);
});

Deno.test("column selection by name and index; errors list the columns", () => {
  const text = "label,x,y\ncat,1,2\ndog,3,4\n";
  assert.deepEqual(Array.from(parseCsv(text, { columns: [2, "x"] }).data), [2, 1, 4, 3]);
  assert.deepEqual(parseCsv(text, { columns: [2, "x"] }).columns, ["y", "x"]);
  rejects(() => parseCsv(text, { columns: ["z"] }), "not-found", {}, /1: "x", 2: "y"/);
  rejects(() => parseCsv(text, { columns: [3] }), "invalid-argument", {}, /outside/);
  rejects(() => parseCsv("1,2\n", { columns: ["x"] }), "invalid-argument", {}, /no header row/);
  // Without a selection a text column is an error that suggests `columns`.
  rejects(() => parseCsv(text), "parse", { line: 2, column: 0 }, /`columns` option/);
});

Deno.test("comments, skipped lines and names for headerless files", () => {
  const s = parseCsv("written by run 7\n# seed 3\nx,y\n1,2\n  # note\n3,4\n", { skip: 1 });
  assert.deepEqual([s.n, s.columns], [2, ["x", "y"]]);
  rejects(
    () => parseCsv("skip me\n# c\nx\n1\nq\n", { skip: 1 }),
    "parse",
    { line: 5, row: 1 },
    /"q"/,
  );
  const named = parseCsv("1,2\n3,4\n", { names: ["a", "b"], columns: ["b"] });
  assert.deepEqual([named.columns, Array.from(named.data)], [["b"], [2, 4]]);
  assert.equal(parseCsv("#x\n1\n", { comment: "" }).columns?.[0], "#x");
});

Deno.test("empty inputs", () => {
  rejects(() => parseCsv(""), "empty", {}, /no data rows/);
  rejects(() => parseCsv("x,y\n"), "empty", {}, /header but no data/);
  rejects(() => parseCsv("\n\n# only comments\n"), "empty", {}, /no data/);
});

Deno.test("readCsv picks the delimiter by extension and names the file", async () => {
  const dir = await Deno.makeTempDir();
  try {
    await Deno.writeTextFile(`${dir}/a.tsv`, "x\ty\n1\t2\n");
    await Deno.writeTextFile(`${dir}/b.csv`, "x,y\n1,2\n3,\n");
    assert.deepEqual(Array.from((await readCsv(`${dir}/a.tsv`)).data), [1, 2]);
    await assert.rejects(
      () => readCsv(`${dir}/b.csv`),
      (e: unknown) =>
        e instanceof SaddleError && e.location.file === `${dir}/b.csv` && e.location.line === 3,
    );
    await assert.rejects(
      () => readCsv(`${dir}/none.csv`),
      (e: unknown) => e instanceof SaddleError && e.code === "not-found",
    );
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
