/**
 * Small reader and writer cases for `deno bench` (in memory, so disk speed does not
 * enter): NPY decode by dtype and order, CSV and JSON parsing, NPY encoding.
 *
 *     deno bench -A bench/io_bench.ts
 */
import { zipSync } from "fflate";
import { Rng } from "../lib/random/rng.ts";
import { fromBuffer } from "../lib/samples/samples.ts";
import { encodeNpy, parseNpy } from "../lib/samples/npy.ts";
import { parseNpz } from "../lib/samples/npz.ts";
import { parseCsv } from "../lib/samples/csv.ts";
import { parseJson } from "../lib/samples/json.ts";

const r = new Rng("io-bench");
const n = 100_000, d = 4;
const pts = fromBuffer(r.fillNormal(new Float64Array(n * d)), d);
const f8 = encodeNpy(pts);
const f4 = encodeNpy(pts, { dtype: "<f4" });

/** The same values as big-endian Fortran-order float32, built by hand (numpy's layout). */
function bigEndianFortran(): Uint8Array {
  const dict = `{'descr': '>f4', 'fortran_order': True, 'shape': (${n}, ${d}), }`;
  const pad = (64 - ((10 + dict.length + 1) % 64)) % 64;
  const header = dict + " ".repeat(pad) + "\n";
  const out = new Uint8Array(10 + header.length + n * d * 4);
  out.set([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0, header.length & 255, header.length >> 8]);
  for (let i = 0; i < header.length; i++) out[10 + i] = header.charCodeAt(i);
  const view = new DataView(out.buffer, 10 + header.length);
  for (let j = 0; j < d; j++) {
    for (let i = 0; i < n; i++) view.setFloat32(4 * (j * n + i), pts.data[i * d + j], false);
  }
  return out;
}
const beF = bigEndianFortran();
const npz = zipSync({ "real.npy": f8, "fake.npy": f4 }, { level: 6 });

const rows = 10_000;
const csv = [
  "a,b,c,d",
  ...Array.from(
    { length: rows },
    (_, i) => Array.from(pts.data.subarray(i * d, i * d + d)).join(","),
  ),
].join("\n");
const json = JSON.stringify(
  Array.from({ length: rows }, (_, i) => Array.from(pts.data.subarray(i * d, i * d + d))),
);

Deno.bench("parseNpy <f8 C order, 4e5 values", { group: "npy" }, () => {
  parseNpy(f8);
});
Deno.bench("parseNpy <f4 C order, 4e5 values", { group: "npy", baseline: true }, () => {
  parseNpy(f4);
});
Deno.bench("parseNpy >f4 Fortran order, 4e5 values", { group: "npy" }, () => {
  parseNpy(beF);
});
Deno.bench("parseNpz deflated <f8, 4e5 values", { group: "npy" }, () => {
  parseNpz(npz, { array: "real" });
});
Deno.bench("encodeNpy <f8, 4e5 values", { group: "write" }, () => {
  encodeNpy(pts);
});
Deno.bench("encodeNpy <f4, 4e5 values", { group: "write" }, () => {
  encodeNpy(pts, { dtype: "<f4" });
});
Deno.bench("parseCsv 1e4 x 4 with header", { group: "text" }, () => {
  parseCsv(csv);
});
Deno.bench("parseJson 1e4 rows of 4", { group: "text" }, () => {
  parseJson(json);
});
