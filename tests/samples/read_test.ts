/** readSamples: the reader is chosen by extension, and every format gives the same Samples. */
import assert from "node:assert/strict";
import { zipSync } from "fflate";
import { readSamples, sampleFormatOf } from "../../lib/samples/read.ts";
import { encodeNpy } from "../../lib/samples/npy.ts";
import { samples } from "../../lib/samples/samples.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";

Deno.test("sampleFormatOf reads the extension, case-insensitively", () => {
  assert.equal(sampleFormatOf("a/b.CSV"), "csv");
  assert.equal(sampleFormatOf("x.tab"), "tsv");
  assert.equal(sampleFormatOf("x.npy.gz"), undefined);
  assert.equal(sampleFormatOf("noext"), undefined);
});

Deno.test("the same 3 x 2 points from .csv .tsv .txt .json .npy .npz", async () => {
  const want = samples([[0.5, -1], [2, 3.25], [1e-9, 4]]);
  const dir = await Deno.makeTempDir();
  try {
    await Deno.writeTextFile(`${dir}/p.csv`, "x,y\n0.5,-1\n2,3.25\n1e-9,4\n");
    await Deno.writeTextFile(`${dir}/p.tsv`, "x\ty\n0.5\t-1\n2\t3.25\n1e-9\t4\n");
    await Deno.writeTextFile(`${dir}/p.txt`, "0.5 -1\n2 3.25\n1e-9 4\n");
    await Deno.writeTextFile(`${dir}/p.json`, JSON.stringify([[0.5, -1], [2, 3.25], [1e-9, 4]]));
    await Deno.writeFile(`${dir}/p.npy`, encodeNpy(want));
    await Deno.writeFile(
      `${dir}/p.npz`,
      zipSync({ "fake.npy": encodeNpy(want), "real.npy": encodeNpy(samples([1])) }),
    );
    await Deno.writeTextFile(`${dir}/p.dat`, "0.5,-1\n2,3.25\n1e-9,4\n");
    for (const f of ["p.csv", "p.tsv", "p.txt", "p.json", "p.npy"]) {
      const s = await readSamples(`${dir}/${f}`);
      assert.deepEqual([s.n, s.d, s.data], [3, 2, want.data], f);
    }
    assert.deepEqual((await readSamples(`${dir}/p.npz`, { array: "fake" })).data, want.data);
    assert.deepEqual((await readSamples(`${dir}/p.dat`, { format: "csv" })).data, want.data);
    assert.deepEqual((await readSamples(`${dir}/p.csv`)).columns, ["x", "y"]);
    await assert.rejects(
      () => readSamples(`${dir}/p.dat`),
      (e: unknown) =>
        e instanceof SaddleError && e.code === "unsupported" && /format: "csv"/.test(e.message),
    );
    // The `source` option renames the input in messages.
    await assert.rejects(
      () => readSamples(`${dir}/p.npz`, { source: "generator run 4" }),
      (e: unknown) => e instanceof SaddleError && e.location.file === "generator run 4",
    );
    // npy columns by index, named with `names`.
    const sel = await readSamples(`${dir}/p.npy`, { names: ["a", "b"], columns: ["b"] });
    assert.deepEqual([sel.columns, Array.from(sel.data)], [["b"], [-1, 3.25, 4]]);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
