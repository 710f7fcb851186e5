/** Samples helpers and the constructor's validation (expected values worked by hand). */
import assert from "node:assert/strict";
import {
  concatSamples,
  selectColumns,
  standardize,
  takeRows,
  trainTestSplit,
} from "../../lib/samples/transform.ts";
import { fromBuffer, row, samples } from "../../lib/samples/samples.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import { Rng } from "../../lib/random/rng.ts";
import { assertAllClose, assertClose } from "../_assert.ts";

const isErr = (code: string, re: RegExp) => (e: unknown) =>
  e instanceof SaddleError && e.code === code && re.test(e.message);

Deno.test("standardize: mean 0 and sd 1 per column, inverse restores the data", () => {
  const r = new Rng("std");
  const n = 500, d = 3;
  const data = new Float64Array(n * d);
  for (let i = 0; i < n; i++) {
    data[i * d] = r.normal(10, 3);
    data[i * d + 1] = r.uniform(-1e6, 1e6);
    // A large offset: Welford's running mean keeps ~sqrt(n) ulps of 1e6 (~3e-9 here).
    data[i * d + 2] = 1e6 + r.normal(0, 1);
  }
  const s = samples(data, { d });
  const { samples: z, transform, notes } = standardize(s);
  assert.deepEqual(notes, []);
  for (let j = 0; j < d; j++) {
    let m = 0, v = 0;
    for (let i = 0; i < n; i++) m += z.data[i * d + j] / n;
    for (let i = 0; i < n; i++) v += (z.data[i * d + j] - m) ** 2 / (n - 1);
    assertClose(m, 0, { abs: 1e-8 }, `mean ${j}`);
    assertClose(v, 1, { rel: 1e-9 }, `var ${j}`);
  }
  assertAllClose(transform.invert(z).data, s.data, { rel: 1e-12, abs: 1e-9 });
  // A second sample mapped with the first one's transform.
  const other = samples([[10, 0, 1e6]]);
  assertAllClose(transform.apply(other).data, [
    (10 - transform.shift[0]) / transform.scale[0],
    (0 - transform.shift[1]) / transform.scale[1],
    (1e6 - transform.shift[2]) / transform.scale[2],
  ]);
});

Deno.test("standardize: a constant column keeps scale 1 and says so", () => {
  const { samples: z, transform, notes } = standardize(samples([[1, 5], [2, 5], [3, 5]]));
  assert.deepEqual(Array.from(transform.scale), [1, 1]);
  assert.deepEqual(Array.from(z.data), [-1, 0, 0, 0, 1, 0]);
  assert.equal(notes.length, 1);
  assert.match(notes[0], /column 1 is constant/);
});

Deno.test("takeRows keeps order and repeats; refuses out-of-range rows", () => {
  const s = samples([[1, 2], [3, 4], [5, 6]], { columns: ["a", "b"] });
  const t = takeRows(s, [2, 0, 2]);
  assert.deepEqual([Array.from(t.data), t.columns], [[5, 6, 1, 2, 5, 6], ["a", "b"]]);
  assert.throws(() => takeRows(s, [3]), isErr("invalid-argument", /row 3/));
  assert.throws(() => takeRows(s, [0.5]), isErr("invalid-argument", /row 0.5/));
});

Deno.test("trainTestSplit: disjoint, covering, sized by testFraction, seeded", () => {
  const n = 101;
  const s = samples(Float64Array.from({ length: n }, (_, i) => i));
  for (const f of [0.1, 0.25, 0.5, 0.9]) {
    const { train, test } = trainTestSplit(s, { testFraction: f, seed: 7 });
    assert.equal(test.n, Math.round(n * f));
    const all = [...train.data, ...test.data].sort((a, b) => a - b);
    assert.deepEqual(all, Array.from({ length: n }, (_, i) => i)); // covering, no repeats
  }
  const a = trainTestSplit(s, { seed: "x" }), b = trainTestSplit(s, { seed: "x" });
  assert.deepEqual(a.test.data, b.test.data);
  assert.notDeepEqual(a.test.data, trainTestSplit(s, { seed: "y" }).test.data);
  assert.throws(() => trainTestSplit(samples([1])), isErr("too-few-samples", /1 row/));
  assert.throws(
    () => trainTestSplit(s, { testFraction: 1 }),
    isErr("invalid-argument", /testFraction/),
  );
  const tiny = trainTestSplit(samples([1, 2]), { testFraction: 0.01 });
  assert.deepEqual([tiny.train.n, tiny.test.n], [1, 1]);
});

Deno.test("concatSamples stacks rows; a dimension mismatch names both parts", () => {
  const c = concatSamples(samples([[1, 2]]), samples([[3, 4], [5, 6]]));
  assert.deepEqual([c.n, Array.from(c.data)], [3, [1, 2, 3, 4, 5, 6]]);
  assert.throws(
    () => concatSamples(samples([[1, 2]]), samples([1])),
    isErr("dimension-mismatch", /part 0 has d = 2 but part 1 has d = 1/),
  );
  assert.throws(() => concatSamples(), isErr("empty", /nothing/));
});

Deno.test("selectColumns by name and index; an unknown name lists the columns", () => {
  const s = samples([{ x: 1, y: 2, z: 3 }, { x: 4, y: 5, z: 6 }]);
  const t = selectColumns(s, ["z", 0]);
  assert.deepEqual([t.columns, Array.from(t.data)], [["z", "x"], [3, 1, 6, 4]]);
  assert.throws(() => selectColumns(s, ["w"]), isErr("not-found", /"x", "y", "z"/));
  assert.throws(() => selectColumns(s, [3]), isErr("invalid-argument", /outside 0..2/));
  assert.throws(() => selectColumns(samples([1]), ["a"]), isErr("not-found", /unnamed/));
});

Deno.test("samples(): empty, ragged and bad-typed inputs name the row and column", () => {
  assert.throws(() => samples([]), isErr("empty", /no rows/));
  assert.throws(() => samples([[1, 2], [3]]), isErr("dimension-mismatch", /row 1/));
  assert.throws(
    () => samples([[1, 2], [3, "4" as unknown as number]]),
    isErr("parse", /row 1, column 1/),
  );
  assert.throws(
    () => samples(new Float64Array(5), { d: 2 }),
    isErr("dimension-mismatch", /5 values/),
  );
  assert.throws(() => samples([1], { d: 0 }), isErr("invalid-argument", /positive integer/));
  assert.throws(
    () => samples([[1]], { columns: ["a", "b"] }),
    isErr("dimension-mismatch", /2 column names/),
  );
  // A Float64Array input is copied; fromBuffer wraps without copying.
  const buf = new Float64Array([1, 2]);
  const s = samples(buf);
  buf[0] = 9;
  assert.equal(s.data[0], 1);
  assert.equal(fromBuffer(buf, 1).data, buf);
  assert.deepEqual(row(samples([[1, 2], [3, 4]]), 1), [3, 4]);
  assert.throws(() => row(s, 2), isErr("invalid-argument", /row 2/));
});
