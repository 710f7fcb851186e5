/**
 * A strict reader of the zip archives behind `.npz` files: the central directory (with
 * zip64 sizes), stored and deflated entries, the declared sizes and the CRC-32 of every
 * entry that is read, and a cap on the inflated size so that a small archive cannot claim
 * gigabytes of memory.
 *
 * Format: PKWARE APPNOTE.TXT 6.3 (sections 4.3.7 local header, 4.3.12 central directory,
 * 4.3.16 end of central directory, 4.5.3 zip64 extra field); CRC-32 as in ISO 3309 / ITU-T
 * V.42 (polynomial 0xEDB88320, reflected).
 *
 * @module
 */
import { Inflate } from "fflate";
import { SaddleError } from "../errors/saddle_error.ts";

type Loc = { file?: string };

/** One entry of the central directory. */
export interface ZipEntry {
  /** File name inside the archive. */
  readonly name: string;
  /** Compression method: 0 stored, 8 deflated (others are refused when read). */
  readonly method: number;
  /** CRC-32 of the uncompressed bytes. */
  readonly crc: number;
  /** Bytes of the compressed data. */
  readonly compressedSize: number;
  /** Bytes once uncompressed. */
  readonly size: number;
  /** Offset of the entry's local header. */
  readonly headerOffset: number;
}

function bad(msg: string, loc: Loc): never {
  throw new SaddleError(
    "parse",
    `not a readable .npz (zip) archive: ${msg}; save it with numpy.savez or ` +
      "numpy.savez_compressed",
    loc,
  );
}

let CRC_TABLE: Uint32Array | undefined;

/** CRC-32 (ISO 3309, reflected polynomial 0xEDB88320) of `bytes`. */
export function crc32(bytes: Uint8Array): number {
  if (!CRC_TABLE) {
    CRC_TABLE = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      CRC_TABLE[n] = c >>> 0;
    }
  }
  let c = 0xffffffff;
  for (let i = 0; i < bytes.length; i++) c = CRC_TABLE[(c ^ bytes[i]) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

/** The entries of the central directory, in archive order. */
export function zipEntries(bytes: Uint8Array, loc: Loc): ZipEntry[] {
  const v = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const u16 = (o: number) => v.getUint16(o, true), u32 = (o: number) => v.getUint32(o, true);
  // End of central directory: 22 bytes plus a comment of up to 65535 bytes.
  let eocd = -1;
  for (let o = bytes.length - 22; o >= Math.max(0, bytes.length - 22 - 65535); o--) {
    if (u32(o) === 0x06054b50 && o + 22 + u16(o + 20) === bytes.length) {
      eocd = o;
      break;
    }
  }
  if (eocd < 0) bad("no end-of-central-directory record", loc);
  let count = u16(eocd + 10), cdSize = u32(eocd + 12), cdOffset = u32(eocd + 16);
  if (count === 0xffff || cdSize === 0xffffffff || cdOffset === 0xffffffff) {
    // zip64: the locator sits just before the end record and points at the zip64 record.
    const locAt = eocd - 20;
    if (locAt < 0 || u32(locAt) !== 0x07064b50) bad("zip64 locator missing", loc);
    const rec = Number(v.getBigUint64(locAt + 8, true));
    if (rec + 56 > bytes.length || u32(rec) !== 0x06064b50) bad("zip64 record missing", loc);
    count = Number(v.getBigUint64(rec + 32, true));
    cdSize = Number(v.getBigUint64(rec + 40, true));
    cdOffset = Number(v.getBigUint64(rec + 48, true));
  }
  if (cdOffset + cdSize > bytes.length) bad("the central directory lies past the end", loc);
  const entries: ZipEntry[] = [];
  let o = cdOffset;
  for (let k = 0; k < count; k++) {
    if (o + 46 > cdOffset + cdSize || u32(o) !== 0x02014b50) {
      bad(`central directory entry ${k} is damaged`, loc);
    }
    const flags = u16(o + 8), method = u16(o + 10), crc = u32(o + 16);
    let compressedSize = u32(o + 20), size = u32(o + 24);
    const nameLen = u16(o + 28), extraLen = u16(o + 30), commentLen = u16(o + 32);
    let headerOffset = u32(o + 42);
    const end = o + 46 + nameLen + extraLen + commentLen;
    if (end > cdOffset + cdSize) bad(`central directory entry ${k} is damaged`, loc);
    if (flags & 1) {
      throw new SaddleError("unsupported", "the archive is encrypted", loc);
    }
    const nameBytes = bytes.subarray(o + 46, o + 46 + nameLen);
    const name = new TextDecoder(flags & 0x800 ? "utf-8" : "latin1").decode(nameBytes);
    // zip64 extra field: the 64-bit values of the fields that read 0xFFFFFFFF, in order.
    let e = o + 46 + nameLen;
    const extraEnd = e + extraLen;
    while (e + 4 <= extraEnd) {
      const id = u16(e), len = u16(e + 2);
      if (e + 4 + len > extraEnd) bad(`extra field of entry "${name}" is damaged`, loc);
      if (id === 0x0001) {
        let f = e + 4;
        const next = () => {
          if (f + 8 > e + 4 + len) bad(`zip64 field of entry "${name}" is short`, loc);
          const x = Number(v.getBigUint64(f, true));
          f += 8;
          return x;
        };
        if (size === 0xffffffff) size = next();
        if (compressedSize === 0xffffffff) compressedSize = next();
        if (headerOffset === 0xffffffff) headerOffset = next();
      }
      e += 4 + len;
    }
    entries.push({ name, method, crc, compressedSize, size, headerOffset });
    o = end;
  }
  return entries;
}

/**
 * The uncompressed bytes of one entry, checked against the declared sizes and CRC-32.
 * `limit(prefix)` is called on the first inflated bytes (at least `limitAfter` of them,
 * or all if fewer) and returns the size the entry may have at most; an entry declaring
 * or inflating to more is refused before more memory is taken.
 */
export function zipEntryBytes(
  bytes: Uint8Array,
  entry: ZipEntry,
  loc: Loc,
  limit: { after: number; max: (prefix: Uint8Array) => number },
): Uint8Array {
  const v = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const at = entry.headerOffset;
  if (at + 30 > bytes.length || v.getUint32(at, true) !== 0x04034b50) {
    bad(`local header of entry "${entry.name}" is missing`, loc);
  }
  const start = at + 30 + v.getUint16(at + 26, true) + v.getUint16(at + 28, true);
  const stop = start + entry.compressedSize;
  if (stop > bytes.length) {
    bad(`entry "${entry.name}" is truncated (${stop - bytes.length} bytes missing)`, loc);
  }
  const raw = bytes.subarray(start, stop);
  let out: Uint8Array;
  if (entry.method === 0) {
    if (entry.compressedSize !== entry.size) {
      bad(`stored entry "${entry.name}" declares ${entry.size} bytes but holds ${raw.length}`, loc);
    }
    const head = raw.subarray(0, Math.min(raw.length, limit.after));
    checkLimit(entry, limit.max(head), loc);
    out = raw;
  } else if (entry.method === 8) {
    out = inflateCapped(raw, entry, loc, limit);
  } else {
    throw new SaddleError(
      "unsupported",
      `entry "${entry.name}" uses zip compression method ${entry.method}; ` +
        "save with numpy.savez or numpy.savez_compressed (stored or deflated)",
      loc,
    );
  }
  const crc = crc32(out);
  if (crc !== entry.crc) {
    bad(
      `entry "${entry.name}" fails its CRC-32 check (stored ${hex(entry.crc)}, computed ` +
        `${hex(crc)}): the file is corrupt`,
      loc,
    );
  }
  return out;
}

function hex(x: number): string {
  return `0x${x.toString(16).padStart(8, "0")}`;
}

function checkLimit(entry: ZipEntry, max: number, loc: Loc): void {
  if (entry.size !== max) {
    bad(
      `entry "${entry.name}" declares ${entry.size} bytes but its .npy header describes ` +
        `${max}`,
      loc,
    );
  }
}

/** Inflate in small slices, refusing output beyond the declared size as it grows. */
function inflateCapped(
  raw: Uint8Array,
  entry: ZipEntry,
  loc: Loc,
  limit: { after: number; max: (prefix: Uint8Array) => number },
): Uint8Array {
  // Allocated once the header has told the size; the head is gathered first.
  let out: Uint8Array | undefined;
  let head = new Uint8Array(0);
  let filled = 0;
  let done = false;
  const take = (chunk: Uint8Array) => {
    if (!out) {
      const h = new Uint8Array(head.length + chunk.length);
      h.set(head);
      h.set(chunk, head.length);
      head = h;
      if (head.length < limit.after && !done) return;
      checkLimit(entry, limit.max(head.subarray(0, Math.min(head.length, limit.after))), loc);
      out = new Uint8Array(entry.size);
      chunk = head;
    }
    if (filled + chunk.length > out.length) {
      bad(`entry "${entry.name}" inflates to more than its declared ${entry.size} bytes`, loc);
    }
    out.set(chunk, filled);
    filled += chunk.length;
  };
  const inf = new Inflate((chunk, final) => {
    done = final;
    take(chunk);
  });
  // 1 KiB of deflate input inflates to about 1 MiB at most: bounded work per push.
  const SLICE = 1024;
  try {
    for (let i = 0; i < raw.length; i += SLICE) {
      inf.push(raw.subarray(i, Math.min(raw.length, i + SLICE)), i + SLICE >= raw.length);
    }
    if (raw.length === 0) inf.push(new Uint8Array(0), true);
  } catch (err) {
    if (err instanceof SaddleError) throw err;
    bad(`entry "${entry.name}" does not inflate: ${(err as Error).message}`, loc);
  }
  if (!out) {
    done = true;
    take(new Uint8Array(0));
  }
  if (filled !== entry.size) {
    bad(`entry "${entry.name}" inflates to ${filled} bytes, not its declared ${entry.size}`, loc);
  }
  return out!;
}
