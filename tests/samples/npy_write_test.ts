/**
 * The .npy writer: header layout, float32 rounding, errors, and a live check that
 * Debian's numpy loads what saddlekit writes and would write the same bytes itself.
 */
import assert from "node:assert/strict";
import { encodeNpy, npyHeader, parseNpy, readNpy, writeNpy } from "../../lib/samples/npy.ts";
import { samples } from "../../lib/samples/samples.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";

function hexBits(data: Float64Array): string[] {
  return Array.from(
    new BigUint64Array(data.buffer, data.byteOffset, data.length),
    (b) => b.toString(16).padStart(16, "0"),
  );
}

Deno.test("encodeNpy writes numpy's 1.0 header, 64-byte aligned, C order", () => {
  const bytes = encodeNpy(samples([[1, 2], [3, 4], [5, 6]]));
  assert.deepEqual(Array.from(bytes.subarray(0, 8)), [0x93, 78, 85, 77, 80, 89, 1, 0]);
  const hlen = bytes[8] | (bytes[9] << 8);
  assert.equal((10 + hlen) % 64, 0);
  const text = new TextDecoder().decode(bytes.subarray(10, 10 + hlen));
  assert.equal(text.trimEnd(), "{'descr': '<f8', 'fortran_order': False, 'shape': (3, 2), }");
  assert.ok(text.endsWith("\n"));
  assert.equal(bytes.length, 10 + hlen + 6 * 8);
  const h = npyHeader(encodeNpy(samples([1, 2]), { squeeze: true, dtype: "<f4" }));
  assert.deepEqual([h.shape, h.dtype.descr], [[2], "<f4"]);
  // squeeze has no effect when d > 1, as numpy.squeeze only drops axes of length 1.
  assert.deepEqual(npyHeader(encodeNpy(samples([[1, 2]]), { squeeze: true })).shape, [1, 2]);
});

Deno.test("<f4 rounds to float32 and refuses values beyond its range", () => {
  const s = samples([0.1, 1 / 3, -2.5e38]);
  const back = parseNpy(encodeNpy(s, { dtype: "<f4" }));
  assert.deepEqual(Array.from(back.data), [
    Math.fround(0.1),
    Math.fround(1 / 3),
    Math.fround(-2.5e38),
  ]);
  assert.throws(
    () => encodeNpy(samples([[1, 2], [3, 1e39]]), { dtype: "<f4" }),
    (e: unknown) =>
      e instanceof SaddleError && e.location.row === 1 && e.location.column === 1 &&
      /"<f8"/.test(e.message),
  );
  assert.throws(
    () => encodeNpy(samples([1]), { dtype: "<i4" as "<f4" }),
    (e: unknown) => e instanceof SaddleError && e.code === "invalid-argument",
  );
});

Deno.test("writeNpy writes in chunks: a file larger than one chunk reads back exactly", async () => {
  const n = 200_003, d = 3;
  const data = new Float64Array(n * d);
  for (let i = 0; i < data.length; i++) data[i] = Math.sin(i) * 1e3 + i;
  const s = samples(data, { d });
  const path = await Deno.makeTempFile({ suffix: ".npy" });
  try {
    await writeNpy(path, s);
    const back = await readNpy(path);
    assert.deepEqual([back.n, back.d], [n, d]);
    assert.deepEqual(back.data, data);
    assert.deepEqual(Deno.readFileSync(path), encodeNpy(s));
  } finally {
    await Deno.remove(path);
  }
});

Deno.test({
  name: "live: numpy loads writeNpy's files bit for bit and numpy.save writes the same bytes",
  ignore: ignoreWithoutPython(["numpy"]),
  fn: async () => {
    const dir = await Deno.makeTempDir();
    try {
      const cases = [
        { s: samples([[0.1, -0.0], [1e-310, 1e300], [Math.PI, -7]]), opts: {} },
        { s: samples([0.1, 2.5, -3]), opts: { dtype: "<f4" as const, squeeze: true } },
        { s: samples([1, 2, 3]), opts: {} },
      ];
      for (const [k, { s, opts }] of cases.entries()) {
        const path = `${dir}/case${k}.npy`;
        await writeNpy(path, s, opts);
        const got = await runReference<{
          descr: string;
          shape: number[];
          float64_hex: string[];
          same_bytes_as_numpy_save: boolean;
        }>("npy_load.py", { path });
        const f4 = opts.dtype === "<f4";
        assert.equal(got.descr, f4 ? "<f4" : "<f8");
        assert.deepEqual(got.shape, "squeeze" in opts ? [s.n] : [s.n, s.d]);
        const want = f4 ? Float64Array.from(Float32Array.from(s.data)) : s.data;
        assert.deepEqual(got.float64_hex, hexBits(want), `case ${k}`);
        assert.ok(got.same_bytes_as_numpy_save, `case ${k}: numpy.save writes other bytes`);
      }
    } finally {
      await Deno.remove(dir, { recursive: true });
    }
  },
});
