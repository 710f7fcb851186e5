/** JSON readers: each accepted shape and each refusal (expected values worked by hand). */
import assert from "node:assert/strict";
import { parseJson, readJson } from "../../lib/samples/json.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";

const isErr = (code: string, re: RegExp) => (e: unknown) =>
  e instanceof SaddleError && e.code === code && re.test(e.message);

Deno.test("array of numbers, of rows, of records", () => {
  const a = parseJson("[1, 2.5, -3]");
  assert.deepEqual([a.n, a.d, Array.from(a.data)], [3, 1, [1, 2.5, -3]]);
  const b = parseJson("[[1, 2], [3, 4]]");
  assert.deepEqual([b.n, b.d, Array.from(b.data)], [2, 2, [1, 2, 3, 4]]);
  const c = parseJson('[{"x": 1, "y": 2, "tag": "a"}, {"x": 3, "y": 4, "tag": "b"}]');
  assert.deepEqual([c.columns, Array.from(c.data)], [["x", "y"], [1, 2, 3, 4]]);
});

Deno.test("records: columns by name or by field position; a missing field is named", () => {
  const text = '[{"id": "a", "x": 1, "y": 2}, {"id": "b", "x": 3, "y": 4}]';
  assert.deepEqual(Array.from(parseJson(text, { columns: ["y", "x"] }).data), [2, 1, 4, 3]);
  assert.deepEqual(parseJson(text, { columns: [2] }).columns, ["y"]);
  assert.throws(() => parseJson(text, { columns: ["z"] }), isErr("not-found", /"id", "x", "y"/));
  assert.throws(
    () => parseJson('[{"x": 1}, {"y": 2}]', { source: "r.json" }),
    (e: unknown) =>
      e instanceof SaddleError && e.location.row === 1 && e.location.column === "x" &&
      /r\.json/.test(e.message),
  );
});

Deno.test("object with arrays: chosen by key, the only array, or an error listing keys", () => {
  const text = '{"real": [[1, 2], [3, 4]], "fake": [[5, 6]], "note": "run 3"}';
  assert.deepEqual(Array.from(parseJson(text, { key: "fake" }).data), [5, 6]);
  assert.throws(() => parseJson(text), isErr("invalid-argument", /"real", "fake"/));
  assert.throws(() => parseJson(text, { key: "gen" }), isErr("not-found", /"real", "fake"/));
  assert.throws(() => parseJson(text, { key: "note" }), isErr("parse", /does not hold an array/));
  assert.deepEqual(Array.from(parseJson('{"x": [7, 8], "n": 2}').data), [7, 8]);
  assert.throws(
    () => parseJson("[1, 2]", { key: "x" }),
    isErr("invalid-argument", /not an object/),
  );
});

Deno.test("null cells, NaN literals, ragged rows, strings and bad JSON are refused", () => {
  assert.throws(
    () => parseJson("[[1, 2], [3, null]]"),
    (e: unknown) => e instanceof SaddleError && e.location.row === 1 && e.location.column === 1,
  );
  assert.throws(() => parseJson("[1, NaN]"), isErr("parse", /NaN or Infinity/));
  assert.throws(() => parseJson("[[1, 2], [3]]"), isErr("dimension-mismatch", /row 1/));
  assert.throws(() => parseJson('[["1", 2]]'), isErr("parse", /string "1"/));
  assert.throws(() => parseJson("[1, 2"), isErr("parse", /not valid JSON/));
  assert.throws(() => parseJson("[]"), isErr("empty", /no rows/));
  assert.throws(() => parseJson('"text"'), isErr("parse", /expected an array/));
  assert.throws(() => parseJson("[1e999]"), isErr("non-finite", /Infinity/));
});

Deno.test("names and index selection for unnamed rows; readJson names the file", async () => {
  const s = parseJson("[[1, 2, 3]]", { names: ["a", "b", "c"], columns: ["c", 0] });
  assert.deepEqual([s.columns, Array.from(s.data)], [["c", "a"], [3, 1]]);
  const path = await Deno.makeTempFile({ suffix: ".json" });
  try {
    await Deno.writeTextFile(path, '{"real": [[1], [2]], "fake": [[1, 2]]}');
    await assert.rejects(
      () => readJson(path),
      (e: unknown) => e instanceof SaddleError && e.location.file === path,
    );
    assert.equal((await readJson(path, { key: "real" })).n, 2);
  } finally {
    await Deno.remove(path);
  }
});
