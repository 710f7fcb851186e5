/**
 * Property tests (fast-check, fixed seeds): the .npy round trip is bit-exact, every
 * constructor and reader agrees on the same points, and validation reports the first
 * injected NaN/±Infinity at its row and column in every input form.
 */
import assert from "node:assert/strict";
import fc from "fast-check";
import { samples } from "../../lib/samples/samples.ts";
import { encodeNpy, parseNpy } from "../../lib/samples/npy.ts";
import { parseCsv } from "../../lib/samples/csv.ts";
import { parseJson } from "../../lib/samples/json.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";

const RUNS = { seed: 20260512, numRuns: 300 };

/** A matrix: d in 1..5, n in 1..12, finite doubles (sign of zero kept). */
const matrix = fc.integer({ min: 1, max: 5 }).chain((d) =>
  fc.array(
    fc.array(fc.double({ noNaN: true, noDefaultInfinity: true }), { minLength: d, maxLength: d }),
    { minLength: 1, maxLength: 12 },
  )
);

function bits(a: Float64Array): bigint[] {
  return Array.from(new BigUint64Array(a.buffer, a.byteOffset, a.length));
}

Deno.test("encodeNpy -> parseNpy is bit-exact for <f8 (incl. -0, subnormals, extremes)", () => {
  fc.assert(
    fc.property(matrix, fc.boolean(), (rows, squeeze) => {
      const s = samples(rows);
      const back = parseNpy(encodeNpy(s, { squeeze }));
      assert.deepEqual([back.n, back.d], [s.n, s.d]);
      assert.deepEqual(bits(back.data), bits(s.data));
    }),
    RUNS,
  );
});

Deno.test("encodeNpy <f4 -> parseNpy gives Math.fround of every value", () => {
  const f32 = fc.array(fc.float({ noNaN: true, noDefaultInfinity: true }), {
    minLength: 1,
    maxLength: 40,
  });
  fc.assert(
    fc.property(f32, (xs) => {
      const s = samples(xs);
      const back = parseNpy(encodeNpy(s, { dtype: "<f4" }));
      assert.deepEqual(bits(back.data), bits(Float64Array.from(xs, Math.fround)));
    }),
    RUNS,
  );
});

Deno.test("constructors and readers agree: rows, flat typed array, records, CSV, JSON, NPY", () => {
  fc.assert(
    fc.property(matrix, (raw) => {
      // Text formats cannot keep the sign of zero: compare on +0.
      const rows = raw.map((r) => r.map((x) => x + 0));
      const n = rows.length, d = rows[0].length;
      const names = Array.from({ length: d }, (_, j) => `c${j}`);
      const ref = samples(rows);
      const flat = samples(Float64Array.from(rows.flat()), { d });
      const records = samples(rows.map((r) => Object.fromEntries(r.map((x, j) => [names[j], x]))));
      // String(x) is the shortest text that reads back to the same double.
      const csv = parseCsv(
        [names.join(","), ...rows.map((r) => r.map(String).join(","))].join("\n"),
      );
      const tsv = parseCsv(rows.map((r) => r.map(String).join("\t")).join("\r\n"), {
        header: false,
      });
      const json = parseJson(JSON.stringify(rows));
      const jsonRecords = parseJson(
        JSON.stringify({
          fake: rows.map((r) => Object.fromEntries(r.map((x, j) => [names[j], x]))),
        }),
      );
      const npy = parseNpy(encodeNpy(ref));
      for (
        const [label, s] of Object.entries({ flat, records, csv, tsv, json, jsonRecords, npy })
      ) {
        assert.deepEqual([s.n, s.d], [n, d], label);
        assert.deepEqual(bits(s.data), bits(ref.data), label);
      }
      assert.deepEqual(records.columns, names);
      assert.deepEqual(csv.columns, names);
    }),
    RUNS,
  );
});

const BAD = [NaN, Infinity, -Infinity];

Deno.test("validation reports the first injected NaN/±Infinity at its row and column", () => {
  const injected = matrix.chain((rows) => {
    const n = rows.length, d = rows[0].length;
    return fc.tuple(
      fc.constant(rows),
      fc.array(
        fc.tuple(fc.nat(n - 1), fc.nat(d - 1), fc.constantFrom(...BAD)),
        { minLength: 1, maxLength: 4 },
      ),
    );
  });
  fc.assert(
    fc.property(injected, ([rows0, hits]) => {
      const rows = rows0.map((r) => [...r]);
      for (const [i, j, v] of hits) rows[i][j] = v;
      const d = rows[0].length;
      // The first bad cell in row-major order.
      let first = -1;
      for (let k = 0; k < rows.length * d && first < 0; k++) {
        if (!Number.isFinite(rows[Math.floor(k / d)][k % d])) first = k;
      }
      const row = Math.floor(first / d), col = first % d;
      const names = Array.from({ length: d }, (_, j) => `c${j}`);
      const expectAt = (f: () => unknown, column: number | string, line?: number) =>
        assert.throws(f, (e: unknown) => {
          assert.ok(e instanceof SaddleError, String(e));
          assert.equal(e.code, "non-finite");
          assert.equal(e.location.row, row);
          assert.equal(e.location.column, column);
          if (line !== undefined) assert.equal(e.location.line, line);
          return true;
        });
      expectAt(() => samples(rows), col);
      expectAt(() => samples(Float64Array.from(rows.flat()), { d }), col);
      expectAt(
        () => samples(rows.map((r) => Object.fromEntries(r.map((x, j) => [names[j], x])))),
        names[col],
      );
      // CSV writes NaN, Infinity, -Infinity as those words; the header is line 1.
      const text = [names.join(","), ...rows.map((r) => r.map(String).join(","))].join("\n");
      expectAt(() => parseCsv(text), col, row + 2);
      // NPY: a finite file, then the bad doubles written into its data bytes.
      const bytes = encodeNpy(samples(rows.map((r) => r.map((x) => (Number.isFinite(x) ? x : 0)))));
      const view = new DataView(bytes.buffer, bytes.byteOffset + 128);
      rows.flat().forEach((x, k) => {
        if (!Number.isFinite(x)) view.setFloat64(8 * k, x, true);
      });
      expectAt(() => parseNpy(bytes), col);
    }),
    RUNS,
  );
});

Deno.test("samples(): null, undefined and non-array inputs give a SaddleError naming the input", () => {
  for (const bad of [null, undefined, 5, "1,2", {}]) {
    assert.throws(() => samples(bad as unknown as number[]), (e: unknown) => {
      assert.ok(e instanceof SaddleError, `${String(bad)}: ${e}`);
      assert.equal(e.location.parameter, "input");
      assert.match(e.message, /give numbers, rows of numbers, a typed array or records/);
      assert.doesNotMatch(e.message, /undefined undefined/);
      return true;
    });
  }
});
