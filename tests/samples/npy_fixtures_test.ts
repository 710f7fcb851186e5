/**
 * The .npy/.npz readers against fixtures written by Debian's numpy 1.24
 * (tests/reference/make_npy_fixtures.py): every value is compared bit for bit with
 * numpy's own `asarray(arr, dtype=float64)` of the same file, recorded in expected.json.
 */
import assert from "node:assert/strict";
import { parseNpy, readNpy } from "../../lib/samples/npy.ts";
import { npzNames, parseNpz, readNpz } from "../../lib/samples/npz.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import { hasPython, ignoreWithoutPython, PYTHON } from "../_reference.ts";

const DIR = new URL("../fixtures/npy/", import.meta.url);
const path = (name: string) => new URL(name, DIR).pathname;

interface Fixture {
  file: string;
  descr: string;
  fortran_order: boolean;
  version: [number, number];
  shape: number[];
  float64_hex: string[];
}
interface Expected {
  numpy: string;
  files: Fixture[];
  npz: Record<string, string[]>;
}

function loadExpected(dir: URL): Expected {
  return JSON.parse(Deno.readTextFileSync(new URL("expected.json", dir))) as Expected;
}

/** Hex of the float64 bits, big-endian digit order, as numpy's `format(int(bits), "016x")`. */
function hexBits(data: Float64Array): string[] {
  const u = new BigUint64Array(data.buffer, data.byteOffset, data.length);
  return Array.from(u, (b) => b.toString(16).padStart(16, "0"));
}

function checkFixture(dir: URL, f: Fixture): void {
  const bytes = Deno.readFileSync(new URL(f.file, dir));
  const s = parseNpy(bytes, { source: f.file });
  const n = f.shape[0], d = f.shape.length === 2 ? f.shape[1] : 1;
  assert.deepEqual([s.n, s.d], [n, d], f.file);
  // numpy (expected.json) vs saddlekit, bit for bit; -0 and subnormals included.
  assert.deepEqual(hexBits(s.data), f.float64_hex, f.file);
}

const expected = loadExpected(DIR);

Deno.test("npy fixtures cover every dtype, order, byte order and version", () => {
  const descrs = new Set(expected.files.map((f) => f.descr));
  for (
    const t of ["f2", "f4", "f8", "i2", "i4", "i8", "u2", "u4", "u8"]
  ) {
    assert.ok(descrs.has(`<${t}`) && descrs.has(`>${t}`), t);
  }
  for (const t of ["|i1", "|u1", "|b1"]) assert.ok(descrs.has(t), t);
  assert.ok(expected.files.some((f) => f.fortran_order && f.shape[0] > 1 && f.shape[1] > 1));
  const versions = new Set(expected.files.map((f) => f.version[0]));
  assert.deepEqual([...versions].sort(), [1, 2, 3]);
  assert.ok(expected.files.some((f) => f.shape.length === 1));
});

Deno.test("parseNpy matches numpy bit for bit on every fixture", () => {
  assert.ok(expected.files.length >= 60);
  for (const f of expected.files) checkFixture(DIR, f);
});

Deno.test("readNpy (streaming) matches numpy bit for bit on every fixture", async () => {
  for (const f of expected.files) {
    const s = await readNpy(path(f.file));
    assert.deepEqual(hexBits(s.data), f.float64_hex, f.file);
  }
});

Deno.test("int64/uint64 beyond 2^53 round to the nearest double as numpy's cast does", () => {
  const s = parseNpy(Deno.readFileSync(path("u8_le_c.npy")));
  // Row 2 holds 2^53 + 1 and 2^53 + 3, which numpy rounds (ties to even) to 2^53, 2^53 + 4.
  assert.equal(s.data[7], 2 ** 53);
  assert.equal(s.data[8], 2 ** 53 + 4);
  assert.equal(s.data[2], 2 ** 64); // uint64 max
  const i = parseNpy(Deno.readFileSync(path("i8_be_f.npy")));
  assert.equal(i.data[3], -(2 ** 63)); // int64 min, exact
});

Deno.test("npz stored and deflated: arrays by name, with or without .npy", async () => {
  for (const file of ["stored.npz", "compressed.npz"]) {
    const bytes = Deno.readFileSync(path(file));
    assert.deepEqual(npzNames(bytes).sort(), ["fake", "real"]);
    const real = parseNpz(bytes, { array: "real" });
    const fake = parseNpz(bytes, { array: "fake.npy" });
    assert.deepEqual([real.n, real.d, fake.n, fake.d], [5, 2, 3, 2]);
    assert.deepEqual(hexBits(real.data), expected.npz.real, file);
    assert.deepEqual(hexBits(fake.data), expected.npz.fake, file);
    const viaFile = await readNpz(path(file), { array: "fake" });
    assert.deepEqual(viaFile.data, fake.data);
  }
  const single = parseNpz(Deno.readFileSync(path("single.npz")));
  assert.deepEqual(hexBits(single.data), expected.npz.arr_0);
});

Deno.test("npz: a missing or unspecified array lists the names there are", () => {
  const bytes = Deno.readFileSync(path("compressed.npz"));
  assert.throws(
    () => parseNpz(bytes, { array: "generated", source: "c.npz" }),
    (e: unknown) =>
      e instanceof SaddleError && e.code === "not-found" &&
      /c\.npz/.test(e.message) && /"real"/.test(e.message) && /"fake"/.test(e.message),
  );
  assert.throws(
    () => parseNpz(bytes),
    (e: unknown) =>
      e instanceof SaddleError && e.code === "invalid-argument" &&
      /choose one/.test(e.message),
  );
  assert.throws(
    () => parseNpz(new Uint8Array([1, 2, 3, 4, 5])),
    (e: unknown) => e instanceof SaddleError && e.code === "parse",
  );
});

Deno.test("npy files numpy writes but saddlekit refuses give our error and code", async () => {
  const cases: [string, string, RegExp][] = [
    ["bad_0d.npy", "unsupported", /0-D/],
    ["bad_3d.npy", "unsupported", /3 axes/],
    ["bad_nan.npy", "non-finite", /row 1, column 1/],
    ["bad_structured.npy", "unsupported", /structured/],
    ["bad_complex.npy", "unsupported", /<c16/],
    ["bad_empty.npy", "empty", /no values/],
  ];
  for (const [file, code, re] of cases) {
    const inMemory = async () => parseNpy(await Deno.readFile(path(file)));
    for (const read of [inMemory, () => readNpy(path(file))]) {
      await assert.rejects(
        read,
        (e: unknown) => e instanceof SaddleError && e.code === code && re.test(e.message),
        file,
      );
    }
  }
  await assert.rejects(
    () => readNpy(path("no_such_file.npy")),
    (e: unknown) => e instanceof SaddleError && e.code === "not-found",
  );
});

Deno.test("truncated npy data is a parse error, in memory and streaming", async () => {
  const bytes = Deno.readFileSync(path("f8_le_c.npy"));
  const cut = bytes.subarray(0, bytes.length - 3);
  assert.throws(
    () => parseNpy(cut),
    (e: unknown) => e instanceof SaddleError && /truncated/.test(e.message),
  );
  const tmp = await Deno.makeTempFile({ suffix: ".npy" });
  try {
    await Deno.writeFile(tmp, cut);
    await assert.rejects(() => readNpy(tmp), /truncated/);
  } finally {
    await Deno.remove(tmp);
  }
});

Deno.test({
  name: "live: numpy regenerates the committed fixtures and they still match (numpy)",
  ignore: ignoreWithoutPython(["numpy"]),
  fn: async () => {
    if (!hasPython(["numpy"])) throw new Error(`${PYTHON} cannot import numpy`);
    const dir = await Deno.makeTempDir();
    try {
      const script = new URL("../reference/make_npy_fixtures.py", import.meta.url).pathname;
      const out = await new Deno.Command(PYTHON, { args: [script, dir], stdout: "null" }).output();
      assert.ok(out.success, new TextDecoder().decode(out.stderr));
      const fresh = loadExpected(new URL(`file://${dir}/`));
      assert.equal(fresh.files.length, expected.files.length);
      for (const f of fresh.files) checkFixture(new URL(`file://${dir}/`), f);
      // The committed values are what this numpy produces today.
      assert.deepEqual(
        fresh.files.map((f) => f.float64_hex),
        expected.files.map((f) => f.float64_hex),
      );
    } finally {
      await Deno.remove(dir, { recursive: true });
    }
  },
});
