/**
 * The NumPy `.npy` format (versions 1.0, 2.0, 3.0): a strict parser of the header dict
 * (never evaluated), the dtypes saddlekit reads, and a chunked decoder to Float64.
 *
 * Format: the magic `\x93NUMPY`, major and minor version bytes, the header length
 * (uint16 little-endian in 1.0, uint32 in 2.0 and 3.0), then a Python dict literal
 * `{'descr': '<f8', 'fortran_order': False, 'shape': (3, 2), }` padded with spaces and a
 * newline (latin-1 in 1.0/2.0, UTF-8 in 3.0), then the raw data.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";

/** The magic string that opens every `.npy` file. */
export const NPY_MAGIC: readonly number[] = [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59];

/** Largest header accepted; numpy itself refuses headers over 10 000 bytes by default. */
const MAX_HEADER_BYTES = 1 << 20;

/** A numeric dtype as read from `descr`. */
export interface NpyDtype {
  /** The descr string as written (`"<f4"`, `"|u1"`, `"|b1"`...). */
  readonly descr: string;
  /** `f` float, `i` signed integer, `u` unsigned integer, `b` bool. */
  readonly kind: "f" | "i" | "u" | "b";
  /** Bytes per value. */
  readonly size: 1 | 2 | 4 | 8;
  /** Whether multi-byte values are little-endian (true for one-byte types). */
  readonly littleEndian: boolean;
}

/** The parsed header of a `.npy` file. */
export interface NpyHeader {
  /** Format version `[major, minor]`. */
  readonly version: readonly [number, number];
  /** Element type. */
  readonly dtype: NpyDtype;
  /** Column-major storage (Fortran order) when true. */
  readonly fortranOrder: boolean;
  /** Array shape (one or two axes for saddlekit). */
  readonly shape: readonly number[];
  /** Byte offset of the first data byte (the total header size). */
  readonly dataOffset: number;
}

type Loc = { file?: string };

function fail(code: "parse" | "unsupported" | "empty", msg: string, loc: Loc): never {
  throw new SaddleError(code, msg, loc);
}

/**
 * Bytes needed to know the header size: 10 for version 1.0, 12 for 2.0/3.0.
 * Returns the total header size once `prefix` has at least 12 bytes (or 10 for 1.0).
 */
export function npyHeaderSize(prefix: Uint8Array, loc: Loc = {}): number {
  if (prefix.length < 10) {
    fail("parse", `file is ${prefix.length} bytes long, too short for a .npy header`, loc);
  }
  for (let i = 0; i < 6; i++) {
    if (prefix[i] !== NPY_MAGIC[i]) {
      fail(
        "parse",
        "not a .npy file: it does not start with the magic \\x93NUMPY; write it with " +
          "numpy.save or pass the right format",
        loc,
      );
    }
  }
  const major = prefix[6], minor = prefix[7];
  if (minor !== 0 || major < 1 || major > 3) {
    fail(
      "unsupported",
      `.npy format version ${major}.${minor}; saddlekit reads 1.0, 2.0, 3.0`,
      loc,
    );
  }
  if (major === 1) return 10 + (prefix[8] | (prefix[9] << 8));
  if (prefix.length < 12) fail("parse", "file ends inside the .npy header length", loc);
  const len = (prefix[8] | (prefix[9] << 8) | (prefix[10] << 16)) + prefix[11] * 0x1000000;
  if (len > MAX_HEADER_BYTES) {
    fail(
      "parse",
      `.npy header claims ${len} bytes (limit ${MAX_HEADER_BYTES}): file is damaged`,
      loc,
    );
  }
  return 12 + len;
}

/**
 * Parse the header at the start of `bytes` (which must hold at least the whole header).
 */
export function parseNpyHeader(bytes: Uint8Array, loc: Loc = {}): NpyHeader {
  const dataOffset = npyHeaderSize(bytes, loc);
  if (bytes.length < dataOffset) {
    fail("parse", `file ends inside the .npy header (needs ${dataOffset} bytes)`, loc);
  }
  const major = bytes[6];
  const start = major === 1 ? 10 : 12;
  const raw = bytes.subarray(start, dataOffset);
  let text: string;
  if (major === 3) {
    try {
      text = new TextDecoder("utf-8", { fatal: true }).decode(raw);
    } catch {
      fail("parse", ".npy 3.0 header is not valid UTF-8", loc);
    }
  } else {
    // latin-1: one byte, one code point.
    text = "";
    for (let i = 0; i < raw.length; i += 4096) {
      text += String.fromCharCode(...raw.subarray(i, Math.min(raw.length, i + 4096)));
    }
  }
  const dict = parseHeaderDict(text, loc);
  const descr = dict.get("descr"), fortran = dict.get("fortran_order"), shape = dict.get("shape");
  if (typeof descr !== "string") {
    if (Array.isArray(descr) || descr === LIST) {
      fail("unsupported", "structured dtype (a list descr); save a plain numeric array", loc);
    }
    fail("parse", ".npy header lacks a string 'descr'", loc);
  }
  if (typeof fortran !== "boolean") fail("parse", ".npy header lacks 'fortran_order'", loc);
  if (!Array.isArray(shape)) fail("parse", ".npy header lacks a tuple 'shape'", loc);
  for (const k of dict.keys()) {
    if (k !== "descr" && k !== "fortran_order" && k !== "shape") {
      fail("parse", `.npy header has an unexpected key '${k}'`, loc);
    }
  }
  return {
    version: [major, 0],
    dtype: parseDtype(descr, loc),
    fortranOrder: fortran,
    shape,
    dataOffset,
  };
}

const LIST = Symbol("list");
type HeaderValue = string | boolean | number[] | typeof LIST;

/**
 * A strict parser of the header dict: string keys; values a string, True/False, or a
 * tuple of non-negative integers (Python 2's `3L` accepted). A list value (structured
 * dtype) is recognised only to report it.
 */
function parseHeaderDict(text: string, loc: Loc): Map<string, HeaderValue> {
  let i = 0;
  const n = text.length;
  const bad = (what: string): never =>
    fail("parse", `.npy header is malformed at character ${i}: ${what}`, loc);
  const ws = () => {
    while (i < n && (text[i] === " " || text[i] === "\t" || text[i] === "\n" || text[i] === "\r")) {
      i++;
    }
  };
  const expect = (c: string) => {
    ws();
    if (text[i] !== c) bad(`expected '${c}'`);
    i++;
  };
  const str = (): string => {
    ws();
    const q = text[i];
    if (q !== "'" && q !== '"') bad("expected a quoted string");
    const end = text.indexOf(q, i + 1);
    if (end < 0) bad("unterminated string");
    const s = text.slice(i + 1, end);
    if (s.includes("\\")) bad("escapes are not allowed in header strings");
    i = end + 1;
    return s;
  };
  const int = (): number => {
    ws();
    const st = i;
    while (i < n && text[i] >= "0" && text[i] <= "9") i++;
    if (i === st) bad("expected an integer");
    if (i - st > 15) bad("shape entry too large");
    const v = Number(text.slice(st, i));
    if (text[i] === "L") i++;
    return v;
  };
  const value = (): HeaderValue => {
    ws();
    const c = text[i];
    if (c === "'" || c === '"') return str();
    if (text.startsWith("True", i)) return (i += 4), true;
    if (text.startsWith("False", i)) return (i += 5), false;
    if (c === "[") return LIST;
    if (c === "(") {
      i++;
      const items: number[] = [];
      ws();
      while (text[i] !== ")") {
        items.push(int());
        ws();
        if (text[i] === ",") i++;
        else if (text[i] !== ")") bad("expected ',' or ')' in shape");
        ws();
      }
      i++;
      // Python writes a one-element tuple as `(5,)`; `(5)` would be an int, not a tuple.
      return items;
    }
    return bad("expected a string, True, False or a tuple");
  };
  const out = new Map<string, HeaderValue>();
  expect("{");
  ws();
  while (text[i] !== "}") {
    const k = str();
    if (out.has(k)) bad(`duplicate key '${k}'`);
    expect(":");
    const v = value();
    if (v === LIST) {
      out.set(k, v);
      return out; // structured dtype: reported by the caller, no need to parse further
    }
    out.set(k, v);
    ws();
    if (text[i] === ",") i++;
    else if (text[i] !== "}") bad("expected ',' or '}'");
    ws();
    if (i >= n) bad("unterminated dict");
  }
  i++;
  ws();
  if (i !== n) bad("text after the closing '}'");
  return out;
}

/** Parse a numeric descr such as `<f4`, `>i8`, `|u1`, `|b1`. */
export function parseDtype(descr: string, loc: Loc = {}): NpyDtype {
  const m = /^([<>|])([fiub])([1248])$/.exec(descr);
  const known = "float16/32/64, int8..64, uint8..64 or bool";
  if (!m) {
    fail(
      "unsupported",
      `dtype '${descr}' is not read by saddlekit (it reads ${known}); convert with ` +
        "arr.astype(numpy.float64) before saving",
      loc,
    );
  }
  const order = m[1], kind = m[2] as NpyDtype["kind"], size = Number(m[3]) as NpyDtype["size"];
  if ((kind === "f" && size === 1) || (kind === "b" && size !== 1)) {
    fail("unsupported", `dtype '${descr}' does not exist in numpy; expected ${known}`, loc);
  }
  if (order === "|" && size !== 1) {
    fail("parse", `dtype '${descr}' needs a byte order ('<' or '>')`, loc);
  }
  return { descr, kind, size, littleEndian: order !== ">" };
}

/**
 * The number of rows and columns of a header's shape: `(n,)` is `n x 1`, `(n, d)` is
 * `n x d`; 0-D and 3-D or more are refused.
 */
export function npyDims(h: NpyHeader, loc: Loc = {}): { n: number; d: number } {
  const s = h.shape;
  if (s.length === 0) {
    fail("unsupported", "0-D array (a single scalar): save at least a 1-D array of points", loc);
  }
  if (s.length > 2) {
    fail(
      "unsupported",
      `array of shape (${s.join(", ")}) has ${s.length} axes; save a 1-D array or a 2-D ` +
        "array of points x features (e.g. arr.reshape(len(arr), -1))",
      loc,
    );
  }
  const n = s[0], d = s.length === 2 ? s[1] : 1;
  if (n === 0 || d === 0) fail("empty", `array of shape (${s.join(", ")}) holds no values`, loc);
  if (!Number.isSafeInteger(n * d) || n * d * h.dtype.size > Number.MAX_SAFE_INTEGER) {
    fail("unsupported", `array of shape (${s.join(", ")}) is too large`, loc);
  }
  return { n, d };
}

const NATIVE_LITTLE = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

let half: Float64Array | undefined;
/** Every float16 bit pattern's value as a double (exact): a 512 KiB table built once. */
function halfTable(): Float64Array {
  if (half) return half;
  half = new Float64Array(65536);
  for (let h = 0; h < 65536; h++) {
    const sign = h & 0x8000 ? -1 : 1, exp = (h >> 10) & 31, frac = h & 1023;
    half[h] = exp === 0
      ? sign * frac * 2 ** -24
      : exp === 31
      ? (frac ? NaN : sign * Infinity)
      : sign * (1 + frac / 1024) * 2 ** (exp - 15);
  }
  return half;
}

/**
 * Decode `out.length` values of `dtype` from `src` (exactly `out.length * size` bytes) to
 * doubles. int64/uint64 beyond 2^53 are rounded to the nearest double, as numpy's
 * `astype(float64)` does. `scratch` must hold at least `src.length` bytes (8-aligned).
 */
export function decodeNpyChunk(
  dtype: NpyDtype,
  src: Uint8Array,
  out: Float64Array,
  scratch: Uint8Array,
): void {
  const s = dtype.size, count = out.length;
  let bytes = src;
  if (s > 1 && dtype.littleEndian !== NATIVE_LITTLE) {
    // Swap into native order in the scratch buffer.
    for (let i = 0; i < count; i++) {
      const b = i * s;
      for (let k = 0; k < s; k++) scratch[b + k] = src[b + s - 1 - k];
    }
    bytes = scratch.subarray(0, src.length);
  } else if (src.byteOffset % s !== 0) {
    scratch.set(src);
    bytes = scratch.subarray(0, src.length);
  }
  const buf = bytes.buffer, off = bytes.byteOffset;
  switch (dtype.kind) {
    case "f":
      if (s === 8) out.set(new Float64Array(buf, off, count));
      else if (s === 4) out.set(new Float32Array(buf, off, count));
      else {
        const t = halfTable(), h = new Uint16Array(buf, off, count);
        for (let i = 0; i < count; i++) out[i] = t[h[i]];
      }
      return;
    case "b": {
      const u = new Uint8Array(buf, off, count);
      for (let i = 0; i < count; i++) out[i] = u[i] === 0 ? 0 : 1;
      return;
    }
    case "i":
    case "u":
      if (s === 1) out.set(dtype.kind === "i" ? new Int8Array(buf, off, count) : bytes);
      else if (s === 2) {
        out.set(
          dtype.kind === "i" ? new Int16Array(buf, off, count) : new Uint16Array(buf, off, count),
        );
      } else if (s === 4) {
        out.set(
          dtype.kind === "i" ? new Int32Array(buf, off, count) : new Uint32Array(buf, off, count),
        );
      } else {
        // hi * 2^32 is exact and lo < 2^32, so one rounding: the nearest double, ties to
        // even, the same as Number(BigInt) and numpy's cast.
        const lo = new Uint32Array(buf, off, 2 * count);
        const hi = dtype.kind === "i" ? new Int32Array(buf, off, 2 * count) : lo;
        const L = NATIVE_LITTLE ? 0 : 1, H = 1 - L;
        for (let i = 0; i < count; i++) out[i] = hi[2 * i + H] * 4294967296 + lo[2 * i + L];
      }
      return;
  }
}

/** Whether this platform stores numbers little-endian (true on x86 and ARM). */
export const NATIVE_LITTLE_ENDIAN: boolean = NATIVE_LITTLE;
