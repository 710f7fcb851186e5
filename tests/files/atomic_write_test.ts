/**
 * Writers never leave a partial file (issue 9): writeNpy and Figure.save write through
 * lib/files' atomic writer (temporary file beside the target, then rename); a missing
 * folder, a read-only folder or a full disk is a SaddleError naming the path, and nothing
 * is left behind. writeNpy takes plain and typed arrays (1-D as shape (n,)) and Samples,
 * and checks every value before the first byte.
 *
 * The read-only and full-disk cases mount small tmpfs file systems when the tests run as
 * root with mount rights (a full disk cannot be simulated otherwise); without them those
 * cases fall back to chmod (read-only) or are skipped with a message (full disk).
 */
import assert from "node:assert/strict";
import { ignoreWithoutPython, runReference } from "../_reference.ts";
import { SaddleError } from "../../lib/errors/mod.ts";
import { writeFileAtomic } from "../../lib/files/mod.ts";
import { Figure } from "../../lib/plot/mod.ts";
import { npyHeader, parseNpy, readNpy, samples, writeNpy } from "../../lib/samples/mod.ts";

const listing = (dir: string) => [...Deno.readDirSync(dir)].map((e) => e.name).sort();

function mount(dir: string, opts: string): boolean {
  if (Deno.uid() !== 0) return false;
  const r = new Deno.Command("mount", { args: ["-t", "tmpfs", "-o", opts, "tmpfs", dir] })
    .outputSync();
  return r.success;
}
function umount(dir: string) {
  new Deno.Command("umount", { args: [dir] }).outputSync();
}

Deno.test("writeNpy: plain arrays, typed arrays (1-D as (n,)) and Samples", async () => {
  const dir = await Deno.makeTempDir();
  const cases: [string, Parameters<typeof writeNpy>[1], number[], number[]][] = [
    ["f64.npy", Float64Array.of(0.5, 1.5, 2.5), [3], [0.5, 1.5, 2.5]],
    ["f32.npy", Float32Array.of(1, 2), [2], [1, 2]],
    ["plain.npy", [3, 4, 5, 6], [4], [3, 4, 5, 6]],
    ["rows.npy", [[1, 2], [3, 4]], [2, 2], [1, 2, 3, 4]],
    ["samples.npy", samples([[1, 2], [3, 4], [5, 6]]), [3, 2], [1, 2, 3, 4, 5, 6]],
  ];
  for (const [name, input, shape, values] of cases) {
    await writeNpy(`${dir}/${name}`, input);
    const bytes = Deno.readFileSync(`${dir}/${name}`);
    assert.deepEqual(npyHeader(bytes).shape, shape, name);
    assert.deepEqual(Array.from(parseNpy(bytes).data), values, name);
  }
  assert.deepEqual(listing(dir), cases.map((c) => c[0]).sort());
  await Deno.remove(dir, { recursive: true });
});

Deno.test({
  name: "writeNpy: numpy reads a typed array written 1-D with the same values",
  ignore: ignoreWithoutPython(["numpy"]),
  async fn() {
    const dir = await Deno.makeTempDir();
    const x = Float64Array.of(0.1, -2, 3e300);
    await writeNpy(`${dir}/x.npy`, x);
    const ref = await runReference<{ results: { ok: boolean; shape: number[] }[] }>(
      "npy_batch_load.py",
      { files: [{ path: `${dir}/x.npy` }] },
    );
    assert.deepEqual(ref.results[0].shape, [3]);
    assert.deepEqual((await readNpy(`${dir}/x.npy`)).data, x);
    await Deno.remove(dir, { recursive: true });
  },
});

Deno.test("writeNpy: a value that does not fit <f4, or NaN, is refused before any byte", async () => {
  const dir = await Deno.makeTempDir();
  const path = `${dir}/x.npy`;
  await assert.rejects(
    () => writeNpy(path, [1, 2, 1e39], { dtype: "<f4" }),
    (e: unknown) => e instanceof SaddleError && e.location.row === 2 && /float32/.test(e.message),
  );
  assert.deepEqual(listing(dir), []);
  // An existing file stays as it was.
  await writeNpy(path, [7]);
  const before = Deno.readFileSync(path);
  await assert.rejects(() => writeNpy(path, [1, 3.5e38 * 10], { dtype: "<f4" }), SaddleError);
  await assert.rejects(() => writeNpy(path, [1, NaN]), SaddleError);
  assert.deepEqual(Deno.readFileSync(path), before);
  assert.deepEqual(listing(dir), ["x.npy"]);
  await Deno.remove(dir, { recursive: true });
});

Deno.test("writers: a missing folder is a SaddleError naming the path; nothing is created", async () => {
  const dir = await Deno.makeTempDir();
  const fig = new Figure('<svg xmlns="http://www.w3.org/2000/svg" width="2" height="2"></svg>', {
    width: 2,
    height: 2,
  });
  for (const write of [() => writeNpy(`${dir}/no/x.npy`, [1]), () => fig.save(`${dir}/no/f.svg`)]) {
    await assert.rejects(
      write,
      (e: unknown) =>
        e instanceof SaddleError && e.code === "not-found" &&
        e.location.file?.startsWith(`${dir}/no/`) === true && /does not exist/.test(e.message),
    );
  }
  assert.deepEqual(listing(dir), []);
  await Deno.remove(dir, { recursive: true });
});

Deno.test("writers: a read-only folder is a SaddleError; nothing is left", async () => {
  const dir = await Deno.makeTempDir();
  const ro = `${dir}/ro`;
  Deno.mkdirSync(ro);
  const mounted = mount(ro, "size=64k,ro");
  if (!mounted) Deno.chmodSync(ro, 0o555);
  try {
    if (!mounted && Deno.uid() === 0) {
      console.error("read-only folder: running as root without mount rights; case skipped");
      return;
    }
    await assert.rejects(
      () => writeNpy(`${ro}/x.npy`, [1, 2]),
      (e: unknown) =>
        e instanceof SaddleError && e.code === "io" && e.location.file === `${ro}/x.npy`,
    );
    assert.deepEqual(listing(ro), []);
  } finally {
    if (mounted) umount(ro);
    else Deno.chmodSync(ro, 0o755);
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("writers: a full disk is a SaddleError; no partial file, the old file kept", async () => {
  const dir = await Deno.makeTempDir();
  if (!mount(dir, "size=64k")) {
    console.error("full disk: needs root with mount rights for a 64 KiB tmpfs; case skipped");
    await Deno.remove(dir);
    return;
  }
  try {
    const big = new Float64Array(20000).fill(1.5); // 160 KB, more than the disk holds
    await assert.rejects(
      () => writeNpy(`${dir}/x.npy`, big),
      (e: unknown) =>
        e instanceof SaddleError && e.code === "io" && /no space/.test(e.message) &&
        e.location.file === `${dir}/x.npy`,
    );
    assert.deepEqual(listing(dir), []);
    await writeFileAtomic(`${dir}/f.svg`, "<svg/>");
    const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="2" height="2"><!--${
      "x".repeat(200000)
    }--></svg>`;
    const fig = new Figure(svg, { width: 2, height: 2 });
    await assert.rejects(
      () => fig.save(`${dir}/f.svg`),
      (e: unknown) => e instanceof SaddleError && e.code === "io",
    );
    assert.equal(Deno.readTextFileSync(`${dir}/f.svg`), "<svg/>");
    assert.deepEqual(listing(dir), ["f.svg"]);
  } finally {
    umount(dir);
    await Deno.remove(dir, { recursive: true });
  }
});
