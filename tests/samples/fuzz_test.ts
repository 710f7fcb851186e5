/**
 * Seeded, bounded fuzzing (a fixed number of cases per reader, so every run sees the same
 * inputs): random and mutated bytes into the NPY and NPZ parsers, random text into the CSV
 * and JSON readers. Each input must give valid Samples (right size, finite values) or throw
 * a SaddleError, never another error type. Every NPY and NPZ input that is accepted is
 * then read by Debian's numpy in one batch (tests/reference/npy_batch_load.py): numpy must
 * read the same values, or refuse the file.
 */
import assert from "node:assert/strict";
import { ignoreWithoutPython, runReference } from "../_reference.ts";
import { zipSync } from "fflate";
import { Rng } from "../../lib/random/rng.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import type { Samples } from "../../lib/samples/samples.ts";
import { encodeNpy, parseNpy } from "../../lib/samples/npy.ts";
import { parseNpz } from "../../lib/samples/npz.ts";
import { parseCsv } from "../../lib/samples/csv.ts";
import { parseJson } from "../../lib/samples/json.ts";
import { samples } from "../../lib/samples/samples.ts";

/** Cases per reader: a few thousand in all, a few seconds on this machine. */
const CASES = { npy: 2000, npz: 1000, csv: 15000, json: 1000 };

function checkOutcome(f: () => Samples, describe: () => string): "ok" | "error" {
  let s: Samples;
  try {
    s = f();
  } catch (e) {
    if (e instanceof SaddleError) return "error";
    throw new Error(`non-SaddleError ${e} for input ${describe()}`);
  }
  assert.ok(s.n >= 1 && s.d >= 1, describe());
  assert.equal(s.data.length, s.n * s.d, describe());
  for (const v of s.data) assert.ok(Number.isFinite(v), describe());
  if (s.columns) assert.equal(s.columns.length, s.d, describe());
  return "ok";
}

function fuzz(cases: number, step: (r: Rng) => "ok" | "error", seed: string) {
  const r = new Rng(seed);
  const counts = { ok: 0, error: 0 };
  for (let k = 0; k < cases; k++) counts[step(r)]++;
  return counts;
}

const hex = (b: Uint8Array) =>
  Array.from(b.subarray(0, 200), (x) => x.toString(16).padStart(2, "0")).join("");

const seedsNpy: Uint8Array[] = [
  encodeNpy(samples([[1, 2], [3, 4]])),
  encodeNpy(samples([0.5, 1.5, 2.5]), { dtype: "<f4", squeeze: true }),
  ...["i8_be_f.npy", "f2_le_c.npy", "b1_na_1d.npy", "version_2_c.npy", "version_3_f_be.npy"].map((
    f,
  ) => Deno.readFileSync(new URL(`../fixtures/npy/${f}`, import.meta.url))),
];

function mutate(r: Rng, base: Uint8Array, headerBias: boolean): Uint8Array {
  let b = base.slice();
  const edits = 1 + r.integer(4);
  for (let e = 0; e < edits; e++) {
    const op = r.integer(4);
    const limit = headerBias ? Math.min(b.length, 140) : b.length;
    const at = r.integer(Math.max(1, limit));
    if (op === 0) b[at] = r.integer(256);
    else if (op === 1) b = b.subarray(0, at); // truncate
    else if (op === 2) b[at] = " {}():,'\"<>|fiub0123456789LTrueFalse"[r.integer(35)].charCodeAt(0);
    else {
      const ins = new Uint8Array(b.length + 1);
      ins.set(b.subarray(0, at));
      ins[at] = r.integer(256);
      ins.set(b.subarray(at), at + 1);
      b = ins;
    }
    if (b.length === 0) break;
  }
  return b;
}

/** One fuzz case of a binary reader: the bytes and what saddlekit made of them. */
interface BinaryCase {
  readonly bytes: Uint8Array;
  readonly result: Samples | undefined;
}

/** Run `parse` on `bytes`: Samples (checked), undefined for a SaddleError, else throw. */
function binaryCase(bytes: Uint8Array, parse: (b: Uint8Array) => Samples): BinaryCase {
  let result: Samples | undefined;
  const outcome = checkOutcome(() => (result = parse(bytes)), () => hex(bytes));
  return { bytes, result: outcome === "ok" ? result : undefined };
}

/** The NPY cases: random bytes (half with the magic) and mutated valid files. */
function npyCases(): BinaryCase[] {
  const r = new Rng("fuzz-npy");
  return Array.from({ length: CASES.npy }, () => {
    let b: Uint8Array;
    const kind = r.integer(3);
    if (kind === 0) {
      b = new Uint8Array(r.integer(300));
      for (let i = 0; i < b.length; i++) b[i] = r.integer(256);
      if (r.uniform() < 0.5) b.set(seedsNpy[0].subarray(0, Math.min(8, b.length)));
    } else {
      b = mutate(r, seedsNpy[r.integer(seedsNpy.length)], kind === 1);
    }
    return binaryCase(b, (x) => parseNpy(x));
  });
}

/** The NPZ cases: mutated stored and deflated archives, array "a" read. */
function npzCases(): BinaryCase[] {
  const zips = [
    zipSync({ "a.npy": seedsNpy[0], "b.npy": seedsNpy[2] }, { level: 0 }),
    zipSync({ "a.npy": seedsNpy[0], "b.npy": seedsNpy[3] }, { level: 6 }),
  ];
  const r = new Rng("fuzz-npz");
  return Array.from({ length: CASES.npz }, () => {
    const b = mutate(r, zips[r.integer(2)], false);
    return binaryCase(b, (x) => parseNpz(x, { array: "a" }));
  });
}

const counts = (cases: BinaryCase[]) => ({
  ok: cases.filter((c) => c.result).length,
  error: cases.filter((c) => !c.result).length,
});

Deno.test(`fuzz parseNpy: ${CASES.npy} random and mutated byte strings`, () => {
  const c = counts(npyCases());
  // Both outcomes must occur, or the fuzzer is not reaching the decoder.
  assert.ok(c.ok > 50 && c.error > 50, JSON.stringify(c));
});

Deno.test(`fuzz parseNpz: ${CASES.npz} mutated archives`, () => {
  const c = counts(npzCases());
  assert.ok(c.ok > 10 && c.error > 10, JSON.stringify(c));
});

Deno.test({
  name: "fuzz: every NPY and NPZ case saddlekit accepts, numpy reads the same or refuses",
  ignore: ignoreWithoutPython(["numpy"]),
  async fn() {
    const dir = await Deno.makeTempDir();
    const accepted = [
      ...npyCases().filter((c) => c.result).map((c) => ({ ...c, ext: "npy" })),
      ...npzCases().filter((c) => c.result).map((c) => ({ ...c, ext: "npz" })),
    ];
    const files = accepted.map((c, k) => {
      const path = `${dir}/${k}.${c.ext}`;
      Deno.writeFileSync(path, c.bytes);
      return c.ext === "npz" ? { path, array: "a" } : { path };
    });
    // One Python process for the whole batch.
    const ref = await runReference<{
      results: ({ ok: true; shape: number[]; float64_hex: string[] } | { ok: false })[];
    }>("npy_batch_load.py", { files });
    await Deno.remove(dir, { recursive: true });
    let same = 0, refused = 0;
    accepted.forEach((c, k) => {
      const np = ref.results[k];
      if (!np.ok) {
        refused++;
        return;
      }
      const s = c.result!;
      const where = `${c.ext} case ${k}: ${hex(c.bytes)}`;
      assert.equal(np.shape.reduce((a, b) => a * b, 1), s.n * s.d, where);
      assert.ok(np.shape.length === 1 ? s.d === 1 : np.shape[0] === s.n, where);
      assert.deepEqual(hexBits(s.data), np.float64_hex, where);
      same++;
    });
    console.log(`numpy: ${same} equal, ${refused} refused of ${accepted.length} accepted`);
    assert.ok(same > 50, `${same} equal, ${refused} refused by numpy`);
  },
});

function hexBits(x: Float64Array): string[] {
  const v = new DataView(x.buffer, x.byteOffset, x.byteLength);
  return Array.from(
    { length: x.length },
    (_, i) => v.getBigUint64(8 * i, true).toString(16).padStart(16, "0"),
  );
}

const CSV_ALPHABET = [
  "0",
  "1",
  "2",
  "9",
  ".",
  "-",
  "+",
  "e",
  "E",
  ",",
  ",",
  "\t",
  ";",
  " ",
  '"',
  "\n",
  "\r\n",
  "\r",
  "#",
  "x",
  "nan",
  "inf",
  "0x1",
  "\ufeff",
  "",
];

Deno.test(`fuzz parseCsv: ${CASES.csv} random texts`, () => {
  const c = fuzz(CASES.csv, (r) => {
    let t = "";
    const len = r.integer(60);
    for (let i = 0; i < len; i++) t += CSV_ALPHABET[r.integer(CSV_ALPHABET.length)];
    const opts = [
      {},
      { header: false },
      { header: true },
      { delimiter: "\t" },
      { delimiter: " " },
      { columns: [0] },
      { columns: ["x"] },
      { skip: 1, comment: "" },
    ][r.integer(8)];
    return checkOutcome(() => parseCsv(t, opts), () => JSON.stringify([t, opts]));
  }, "fuzz-csv");
  assert.ok(c.ok > 50 && c.error > 50, JSON.stringify(c));
});

const JSON_ALPHABET = [
  "[",
  "]",
  "{",
  "}",
  ",",
  ":",
  '"x"',
  '"y"',
  "1",
  "-2.5",
  "1e999",
  "null",
  "true",
  " ",
  '"k"',
];

Deno.test(`fuzz parseJson: ${CASES.json} random token soups`, () => {
  const c = fuzz(CASES.json, (r) => {
    let t = "";
    const len = r.integer(30);
    for (let i = 0; i < len; i++) t += JSON_ALPHABET[r.integer(JSON_ALPHABET.length)];
    const opts = [{}, { key: "k" }, { columns: ["x"] }, { columns: [1] }][r.integer(4)];
    return checkOutcome(() => parseJson(t, opts), () => JSON.stringify([t, opts]));
  }, "fuzz-json");
  assert.ok(c.error > 50, JSON.stringify(c));
});
