/**
 * Feature-space cases of `deno task bench:compare`: exact k-NN against scipy's cKDTree,
 * the Fréchet distance against numpy cov + scipy sqrtm, the Gaussian MMD² against a
 * vectorised numpy version, and the streamed feature statistics of a large float32 `.npy`
 * against numpy load + cov (time and peak memory). Data are generated here with fixed
 * seeds and written to temporary `.npy` files that both sides read; each side times only
 * its own computation (the streamed case times the reading too, on both sides).
 *
 * @module
 */
import { kNearest, kNearestSelf } from "../lib/neighbors/mod.ts";
import { frechetDistance, mmd } from "../lib/divergence/mod.ts";
import { Rng } from "../lib/random/rng.ts";
import { fromBuffer, type Samples, writeNpy } from "../lib/samples/mod.ts";
import { runReference } from "../tests/_reference.ts";
import { maxRelError } from "../tests/_assert.ts";
import { registerCase, timed } from "./_compare_registry.ts";

function gaussian(n: number, d: number, seed: number, shift = 0): Samples {
  const x = new Rng(seed).fillNormal(new Float64Array(n * d));
  if (shift) { for (let i = 0; i < x.length; i++) x[i] += shift * ((i % d) / d); }
  return fromBuffer(x, d);
}

async function tempNpy(s: Samples): Promise<string> {
  const path = await Deno.makeTempFile({ suffix: ".npy" });
  await writeNpy(path, s);
  return path;
}

async function withFiles<T>(sets: Samples[], f: (paths: string[]) => Promise<T>): Promise<T> {
  const paths = await Promise.all(sets.map(tempNpy));
  try {
    return await f(paths);
  } finally {
    for (const p of paths) await Deno.remove(p);
  }
}

registerCase({
  name: "knn-d8-k5-5e4x5e4",
  python: ["numpy", "scipy"],
  target: 1.0,
  async run(reference) {
    const ref = gaussian(5e4, 8, 1), q = gaussian(5e4, 8, 2);
    const ours = await timed(() => kNearest(ref, q, { k: 5 }));
    if (!reference) return { saddlekit_s: ours.seconds, reference_s: null, max_rel_err: null };
    const r = await withFiles(
      [ref, q],
      ([a, b]) =>
        runReference<{ seconds: number; dist: number[] }>("feature_bench.py", {
          task: "knn",
          ref: a,
          query: b,
          k: 5,
        }),
    );
    return {
      saddlekit_s: ours.seconds,
      reference_s: r.seconds,
      max_rel_err: maxRelError(ours.value.distances, r.dist),
      note: `scipy cKDTree build + query; ours: ${ours.value.method}`,
    };
  },
});

registerCase({
  name: "knn-d64-k5-1e4-self",
  python: ["numpy", "scipy"],
  target: 0.5,
  async run(reference) {
    const x = gaussian(1e4, 64, 3);
    const ours = await timed(() => kNearestSelf(x, { k: 5 }));
    if (!reference) return { saddlekit_s: ours.seconds, reference_s: null, max_rel_err: null };
    const r = await withFiles(
      [x],
      ([a]) =>
        runReference<{ seconds: number; dist: number[] }>("feature_bench.py", {
          task: "knn",
          ref: a,
          query: null,
          k: 5,
        }),
    );
    return {
      saddlekit_s: ours.seconds,
      reference_s: r.seconds,
      max_rel_err: maxRelError(ours.value.distances, r.dist),
      note: `scipy cKDTree self-query (k + 1, own point dropped); ours: ${ours.value.method}`,
    };
  },
});

registerCase({
  name: "frechet-2048-n5000",
  python: ["numpy", "scipy"],
  target: 0.5,
  async run(reference) {
    const a = gaussian(5000, 2048, 4), b = gaussian(5000, 2048, 5, 0.5);
    const ours = await timed(() => frechetDistance(a, b));
    if (!reference) return { saddlekit_s: ours.seconds, reference_s: null, max_rel_err: null };
    const r = await withFiles(
      [a, b],
      ([pa, pb]) =>
        runReference<{ seconds: number; fd: number }>("feature_bench.py", {
          task: "frechet",
          a: pa,
          b: pb,
        }),
    );
    return {
      saddlekit_s: ours.seconds,
      reference_s: r.seconds,
      max_rel_err: maxRelError([ours.value.value], [r.fd]),
      note: "numpy cov + scipy.linalg.sqrtm",
    };
  },
});

registerCase({
  name: "mmd-d64-5000x5000",
  python: ["numpy"],
  target: 1.0,
  async run(reference) {
    const a = gaussian(5000, 64, 6), b = gaussian(5000, 64, 7, 0.3);
    const ours = await timed(() => mmd(a, b, { bandwidth: 8 }));
    if (!reference) return { saddlekit_s: ours.seconds, reference_s: null, max_rel_err: null };
    const r = await withFiles(
      [a, b],
      ([pa, pb]) =>
        runReference<{ seconds: number; mmd2: number }>("feature_bench.py", {
          task: "mmd",
          a: pa,
          b: pb,
          sigma: 8,
        }),
    );
    return {
      saddlekit_s: ours.seconds,
      reference_s: r.seconds,
      max_rel_err: maxRelError([ours.value.value], [r.mmd2]),
      note: "unbiased Gaussian MMD², vectorised numpy (full n x n kernel matrices)",
    };
  },
});

const STREAM_ROWS = Number(Deno.env.get("SADDLEKIT_BENCH_STREAM_ROWS") ?? 1e5);

registerCase({
  name: "frechet-stream-1e5x2048-f32",
  python: ["numpy"],
  target: 1.0,
  async run(reference) {
    const d = 2048, n = STREAM_ROWS, block = 2000;
    const path = await Deno.makeTempFile({ suffix: ".npy" });
    try {
      await writeLargeF32(path, n, d, block);
      // Our side in its own process, so its peak memory is its own.
      const child = await new Deno.Command(Deno.execPath(), {
        args: ["run", "-A", new URL("./_stream_stats.ts", import.meta.url).pathname, path],
        stdout: "piped",
      }).output();
      if (!child.success) throw new Error("the streamed statistics process failed");
      const ours = JSON.parse(new TextDecoder().decode(child.stdout)) as {
        seconds: number;
        trace: number;
        peak_rss_mb: number;
        backend: string;
      };
      if (!reference) return { saddlekit_s: ours.seconds, reference_s: null, max_rel_err: null };
      const r = await runReference<{ seconds: number; trace: number; peak_rss_mb: number }>(
        "feature_bench.py",
        { task: "stream", path },
      );
      return {
        saddlekit_s: ours.seconds,
        reference_s: r.seconds,
        max_rel_err: maxRelError([ours.trace], [r.trace]),
        note: `numpy load + cov (ours: ${ours.backend} linear algebra); peak RSS ours ${
          Math.round(ours.peak_rss_mb)
        } MB, numpy ${Math.round(r.peak_rss_mb)} MB (${
          ours.peak_rss_mb < r.peak_rss_mb ? "below" : "NOT below"
        })`,
      };
    } finally {
      await Deno.remove(path);
    }
  },
});

/** A C-order float32 `.npy` of n x d seeded normals, written block by block. */
async function writeLargeF32(path: string, n: number, d: number, block: number): Promise<void> {
  const head = `{'descr': '<f4', 'fortran_order': False, 'shape': (${n}, ${d}), }`;
  const total = Math.ceil((10 + head.length + 1) / 64) * 64;
  const header = new Uint8Array(total);
  header.set([0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59, 1, 0]);
  new DataView(header.buffer).setUint16(8, total - 10, true);
  header.set(new TextEncoder().encode(head.padEnd(total - 11, " ") + "\n"), 10);
  const file = await Deno.open(path, { write: true, truncate: true });
  try {
    await file.write(header);
    const r = new Rng(8);
    const buf = new Float32Array(block * d), tmp = new Float64Array(block * d);
    for (let i = 0; i < n; i += block) {
      const rows = Math.min(block, n - i);
      r.fillNormal(tmp);
      for (let t = 0; t < rows * d; t++) buf[t] = tmp[t] + (t % d) / d;
      const bytes = new Uint8Array(buf.buffer, 0, rows * d * 4);
      for (let off = 0; off < bytes.length;) off += await file.write(bytes.subarray(off));
    }
  } finally {
    file.close();
  }
}
