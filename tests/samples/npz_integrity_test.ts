/**
 * `.npz` integrity (issue 9): a flipped bit is refused by its CRC-32 (PKWARE APPNOTE 6.3,
 * 4.4.7), as numpy's zipfile refuses it; sizes must match what the archive declares and
 * what the `.npy` header describes; an archive that inflates far past its array is refused
 * without taking the memory.
 */
import assert from "node:assert/strict";
import { Buffer } from "node:buffer";
import { constants, deflateRawSync } from "node:zlib";
import { zipSync } from "fflate";
import { ignoreWithoutPython, runReference } from "../_reference.ts";
import { SaddleError } from "../../lib/errors/mod.ts";
import { encodeNpy, parseNpz, samples } from "../../lib/samples/mod.ts";

const ARRAY = samples([[3, 1], [4, 1], [5, 9], [2, 6], [5, 3]]);
const NPY = encodeNpy(ARRAY);

/** Offset of the first data byte of the (only) entry of a zipSync archive. */
function dataStart(zip: Uint8Array): number {
  const v = new DataView(zip.buffer, zip.byteOffset);
  return 30 + v.getUint16(26, true) + v.getUint16(28, true);
}

function corrupt(level: 0 | 6): Uint8Array {
  const zip = zipSync({ "a.npy": NPY }, { level });
  // A bit in the data of the entry: stored, inside the value 3 (first float's high byte);
  // deflated, in the middle of the compressed stream.
  const at = level === 0 ? dataStart(zip) + 128 + 7 : dataStart(zip) + 20;
  zip[at] ^= level === 0 ? 0x40 : 0x04;
  return zip;
}

const isParse = (e: unknown) => e instanceof SaddleError && e.code === "parse";

Deno.test("npz: a flipped bit is refused (CRC-32), stored and deflated", () => {
  for (const level of [0, 6] as const) {
    assert.deepEqual(
      parseNpz(zipSync({ "a.npy": NPY }, { level }), { array: "a" }).data,
      ARRAY.data,
    );
    assert.throws(
      () => parseNpz(corrupt(level), { array: "a", source: "x.npz" }),
      (e: unknown) => isParse(e) && /x\.npz/.test((e as Error).message),
      `level ${level}`,
    );
  }
});

Deno.test({
  name: "npz: numpy refuses the same corrupt archives",
  ignore: ignoreWithoutPython(["numpy"]),
  async fn() {
    const dir = await Deno.makeTempDir();
    const files = [0, 6].map((level) => {
      const path = `${dir}/c${level}.npz`;
      Deno.writeFileSync(path, corrupt(level as 0 | 6));
      return { path, array: "a" };
    });
    const ref = await runReference<{ results: { ok: boolean }[] }>("npy_batch_load.py", {
      files,
    });
    assert.deepEqual(ref.results.map((r) => r.ok), [false, false]);
    await Deno.remove(dir, { recursive: true });
  },
});

/** A one-entry zip by hand: deflated `raw`, with the declared size and CRC given. */
function zipOf(name: string, raw: Uint8Array, size: number, crc: number): Uint8Array {
  const nameBytes = new TextEncoder().encode(name);
  const local = new Uint8Array(30 + nameBytes.length);
  const lv = new DataView(local.buffer);
  lv.setUint32(0, 0x04034b50, true);
  lv.setUint16(4, 20, true);
  lv.setUint16(8, 8, true);
  lv.setUint32(14, crc, true);
  lv.setUint32(18, raw.length, true);
  lv.setUint32(22, size, true);
  lv.setUint16(26, nameBytes.length, true);
  local.set(nameBytes, 30);
  const cd = new Uint8Array(46 + nameBytes.length);
  const cv = new DataView(cd.buffer);
  cv.setUint32(0, 0x02014b50, true);
  cv.setUint16(4, 20, true);
  cv.setUint16(6, 20, true);
  cv.setUint16(10, 8, true);
  cv.setUint32(16, crc, true);
  cv.setUint32(20, raw.length, true);
  cv.setUint32(24, size, true);
  cv.setUint16(28, nameBytes.length, true);
  cv.setUint32(42, 0, true);
  cd.set(nameBytes, 46);
  const end = new Uint8Array(22);
  const ev = new DataView(end.buffer);
  ev.setUint32(0, 0x06054b50, true);
  ev.setUint16(8, 1, true);
  ev.setUint16(10, 1, true);
  ev.setUint32(12, cd.length, true);
  ev.setUint32(16, local.length + raw.length, true);
  const out = new Uint8Array(local.length + raw.length + cd.length + end.length);
  out.set(local);
  out.set(raw, local.length);
  out.set(cd, local.length + raw.length);
  out.set(end, local.length + raw.length + cd.length);
  return out;
}

/** The (5, 2) array followed by `mib` MiB of zeros, as one raw deflate stream (~1 KiB/MiB). */
function bomb(mib: number): Uint8Array {
  const flush = { finishFlush: constants.Z_SYNC_FLUSH, level: 9 };
  // Independently compressed, sync-flushed pieces concatenate into one valid stream.
  const zeros = deflateRawSync(Buffer.alloc(16 << 20), flush);
  const parts = [deflateRawSync(Buffer.from(NPY), flush)];
  for (let k = 0; k < mib / 16; k++) parts.push(zeros);
  parts.push(deflateRawSync(Buffer.alloc(0)));
  const total = parts.reduce((a, p) => a + p.length, 0);
  const out = new Uint8Array(total);
  let o = 0;
  for (const p of parts) out.set(p, o), o += p.length;
  return out;
}

Deno.test("npz: a (5, 2) array followed by 1 GiB of zeros is refused without inflating it", () => {
  const raw = bomb(1024);
  assert.ok(raw.length < 2 << 20, `archive of ${raw.length} bytes`);
  const before = Deno.memoryUsage().rss;
  // Declared honestly (1 GiB + the array): refused from the header, before inflating.
  const honest = zipOf("a.npy", raw, NPY.length + 2 ** 30, 0);
  assert.throws(
    () => parseNpz(honest),
    (e: unknown) =>
      isParse(e) &&
      /declares \d+ bytes but its \.npy header describes 208/.test((e as Error).message),
  );
  // Declared as the array alone: refused as soon as the output passes that size.
  const lying = zipOf("a.npy", raw, NPY.length, 0);
  assert.throws(
    () => parseNpz(lying),
    (e: unknown) =>
      isParse(e) && /inflates to more than its declared 208 bytes/.test((e as Error).message),
  );
  const grown = Deno.memoryUsage().rss - before;
  assert.ok(grown < 200 * 2 ** 20, `resident memory grew by ${grown} bytes`);
});

Deno.test("npz: a declared size that disagrees with the stored bytes is refused", () => {
  const zip = zipSync({ "a.npy": NPY }, { level: 0 });
  const v = new DataView(zip.buffer);
  const cd = zip.length - 22 - (46 + 5);
  v.setUint32(cd + 24, NPY.length + 8, true); // uncompressed size in the central directory
  assert.throws(() => parseNpz(zip), isParse);
});
