/**
 * Bounded-time fuzzing with fixed seeds: random and mutated bytes into the NPY and NPZ
 * parsers, random text into the CSV and JSON readers. Each input must give valid Samples
 * (right size, finite values) or throw a SaddleError, never another error type.
 */
import assert from "node:assert/strict";
import { zipSync } from "fflate";
import { Rng } from "../../lib/random/rng.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import type { Samples } from "../../lib/samples/samples.ts";
import { encodeNpy, parseNpy } from "../../lib/samples/npy.ts";
import { parseNpz } from "../../lib/samples/npz.ts";
import { parseCsv } from "../../lib/samples/csv.ts";
import { parseJson } from "../../lib/samples/json.ts";
import { samples } from "../../lib/samples/samples.ts";

const SECONDS = 2;

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

function fuzz(seconds: number, step: (r: Rng) => "ok" | "error", seed: string) {
  const r = new Rng(seed);
  const until = performance.now() + seconds * 1000;
  const counts = { ok: 0, error: 0 };
  while (performance.now() < until) counts[step(r)]++;
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

Deno.test(`fuzz parseNpy: random and mutated bytes for ${SECONDS} s`, () => {
  const c = fuzz(SECONDS, (r) => {
    let b: Uint8Array;
    const kind = r.integer(3);
    if (kind === 0) {
      b = new Uint8Array(r.integer(300));
      for (let i = 0; i < b.length; i++) b[i] = r.integer(256);
      if (r.uniform() < 0.5) b.set(seedsNpy[0].subarray(0, Math.min(8, b.length)));
    } else {
      b = mutate(r, seedsNpy[r.integer(seedsNpy.length)], kind === 1);
    }
    return checkOutcome(() => parseNpy(b), () => hex(b));
  }, "fuzz-npy");
  // Both outcomes must occur, or the fuzzer is not reaching the decoder.
  assert.ok(c.ok > 50 && c.error > 50, JSON.stringify(c));
});

Deno.test(`fuzz parseNpz: mutated archives for ${SECONDS / 2} s`, () => {
  const zips = [
    zipSync({ "a.npy": seedsNpy[0], "b.npy": seedsNpy[2] }, { level: 0 }),
    zipSync({ "a.npy": seedsNpy[0], "b.npy": seedsNpy[3] }, { level: 6 }),
  ];
  const c = fuzz(SECONDS / 2, (r) => {
    const b = mutate(r, zips[r.integer(2)], false);
    return checkOutcome(() => parseNpz(b, { array: "a" }), () => hex(b));
  }, "fuzz-npz");
  assert.ok(c.ok > 10 && c.error > 10, JSON.stringify(c));
});

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

Deno.test(`fuzz parseCsv: random text for ${SECONDS} s`, () => {
  const c = fuzz(SECONDS, (r) => {
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

Deno.test(`fuzz parseJson: random token soup for ${SECONDS / 2} s`, () => {
  const c = fuzz(SECONDS / 2, (r) => {
    let t = "";
    const len = r.integer(30);
    for (let i = 0; i < len; i++) t += JSON_ALPHABET[r.integer(JSON_ALPHABET.length)];
    const opts = [{}, { key: "k" }, { columns: ["x"] }, { columns: [1] }][r.integer(4)];
    return checkOutcome(() => parseJson(t, opts), () => JSON.stringify([t, opts]));
  }, "fuzz-json");
  assert.ok(c.error > 50, JSON.stringify(c));
});
