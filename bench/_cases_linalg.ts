/**
 * Linear-algebra cases of `deno task bench:compare`: syrk (XᵀX of 5000 x 2048), the
 * symmetric eigenproblem (values + vectors, 2048) and Cholesky (2048) on the native
 * backend (target ratio <= 1.2 against numpy) and on the TypeScript backend (reported),
 * against numpy in the same run. Data go to numpy as raw float64 files; numpy's timing is
 * taken once per size and shared by both backends' lines.
 *
 * @module
 */
import { type Linalg, linalgBackends } from "../lib/linalg/backend.ts";
import { Rng } from "../lib/random/rng.ts";
import { runReference } from "../tests/_reference.ts";
import { registerCase, timed } from "./_compare_registry.ts";

interface Job {
  name: string;
  op: "syrk" | "eigh" | "cholesky";
  n: number;
  d: number;
  /** Generate the input (row-major n x d). */
  input(): Float64Array;
  /** Run it on one backend; the array compared with numpy's output. */
  run(k: Linalg, x: Float64Array): Float64Array;
}

/** A well-conditioned SPD matrix XᵀX / n + I from Gaussian data. */
function spd(d: number, k: Linalg, seed: number): Float64Array {
  const n = d + 64;
  const x = new Rng(seed).fillNormal(new Float64Array(n * d));
  const a = k.syrk(x, { n, d, alpha: 1 / n });
  for (let i = 0; i < d; i++) a[i * d + i] += 1;
  return a;
}

const jobs: Job[] = [
  {
    name: "linalg-syrk-5000x2048",
    op: "syrk",
    n: 5000,
    d: 2048,
    input: () => new Rng(1).fillNormal(new Float64Array(5000 * 2048)),
    run: (k, x) => k.syrk(x, { n: 5000, d: 2048 }),
  },
  {
    name: "linalg-eigh-2048",
    op: "eigh",
    n: 2048,
    d: 2048,
    input: () => spd(2048, linalgBackends().native ?? linalgBackends().typescript, 2),
    run: (k, x) => k.symmetricEigen(x, 2048).values,
  },
  {
    name: "linalg-cholesky-2048",
    op: "cholesky",
    n: 2048,
    d: 2048,
    input: () => spd(2048, linalgBackends().native ?? linalgBackends().typescript, 3),
    run: (k, x) => k.cholesky(x, 2048),
  },
];

/** Largest |a - b| relative to the largest |b|. */
function scaledError(a: Float64Array, b: Float64Array): number {
  let err = 0, top = 0;
  for (let i = 0; i < b.length; i++) {
    err = Math.max(err, Math.abs(a[i] - b[i]));
    top = Math.max(top, Math.abs(b[i]));
  }
  return err / top;
}

const inputs = new Map<string, Float64Array>();
const numpy = new Map<string, { seconds: number; output: Float64Array }>();

async function numpyRun(job: Job): Promise<{ seconds: number; output: Float64Array }> {
  const cached = numpy.get(job.name);
  if (cached) return cached;
  const dir = await Deno.makeTempDir({ prefix: "saddlekit-linalg-bench-" });
  try {
    const input = `${dir}/input.f64`, output = `${dir}/output.f64`;
    const x = inputs.get(job.name)!;
    await Deno.writeFile(input, new Uint8Array(x.buffer, x.byteOffset, x.byteLength));
    const ref = await runReference<{ seconds: number }>("linalg_bench.py", {
      op: job.op,
      n: job.n,
      d: job.d,
      input,
      output,
      repeats: 2,
    });
    const bytes = await Deno.readFile(output);
    const r = {
      seconds: ref.seconds,
      output: new Float64Array(bytes.buffer, 0, bytes.byteLength / 8),
    };
    numpy.set(job.name, r);
    return r;
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

for (const job of jobs) {
  for (const backend of ["native", "typescript"] as const) {
    registerCase({
      name: backend === "native" ? job.name : `${job.name}-typescript`,
      python: ["numpy"],
      ...(backend === "native" ? { target: 1.2 } : {}),
      async run(reference) {
        const { native, typescript, nativeReason } = linalgBackends();
        const k = backend === "native" ? native : typescript;
        if (!k) throw new Error(`native backend unavailable: ${nativeReason}`);
        if (!inputs.has(job.name)) inputs.set(job.name, job.input());
        const x = inputs.get(job.name)!;
        // Warm up (thread pools, JIT) on a small problem, then best of 2 (1 for TypeScript).
        const w = spd(64, k, 9);
        k.symmetricEigen(w, 64);
        k.cholesky(w, 64);
        let best = await timed(() => job.run(k, x));
        if (backend === "native") {
          const again = await timed(() => job.run(k, x));
          if (again.seconds < best.seconds) best = again;
        }
        if (!reference) return { saddlekit_s: best.seconds, reference_s: null, max_rel_err: null };
        const ref = await numpyRun(job);
        return {
          saddlekit_s: best.seconds,
          reference_s: ref.seconds,
          max_rel_err: scaledError(best.value, ref.output),
          note: `${k.name} backend vs numpy (${job.op}); error relative to the largest entry`,
        };
      },
    });
  }
}
