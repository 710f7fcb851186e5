/**
 * Binned replicates of the shared refit bootstrap on this thread and Web Workers
 * (private): each worker takes a block of replicate indices and writes its rows into
 * shared memory while this thread does the first block, then waits (Atomics.wait). A
 * replicate depends only on the seed and its index, so the rows are identical whatever
 * the split; a block whose worker cannot start or fails is done here.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { type BinnedJob, binnedReplicates } from "./_refit_core.ts";
import type { RefitSharedJob } from "./_refit_worker.ts";

const WORKER_URL = new URL("./_refit_worker.ts", import.meta.url);
const WAIT_SLICE_MS = 200, WORKER_TIMEOUT_MS = 600000;

/** Point-replicates (points x replicates) below which workers are not worth starting. */
const MIN_WORK = 2e6;

function canStartWorker(): boolean {
  if (typeof Worker === "undefined") return false;
  try {
    return Deno.permissions.querySync({ name: "read", path: WORKER_URL }).state === "granted";
  } catch {
    return false;
  }
}

/** Threads for `B` replicates of the job: `requested`, or the cores (at most 4) when worth it. */
export function threadsFor(job: BinnedJob, B: number, requested?: number): number {
  if (requested !== undefined) {
    if (!Number.isInteger(requested) || requested < 1) {
      throw new SaddleError(
        "invalid-argument",
        `workers must be an integer >= 1, got ${requested}`,
        {
          parameter: "workers",
        },
      );
    }
  }
  const work = (job.data.nReal + job.data.nFake) * B;
  const want = requested ??
    (work < MIN_WORK ? 1 : Math.min(4, navigator.hardwareConcurrency ?? 1));
  const t = Math.max(1, Math.min(want, B));
  return t > 1 && canStartWorker() ? t : 1;
}

/** Rows (B x quantities) of the binned replicates and the first failure messages. */
export function runBinned(
  job: BinnedJob,
  B: number,
  requested: number | undefined,
  tick: () => void,
): { values: Float64Array; failures: string[] } {
  const Q = job.quantities.length;
  const threads = threadsFor(job, B, requested);
  if (threads === 1) {
    const values = new Float64Array(B * Q);
    return { values, failures: binnedReplicates(job, 0, B, values, tick) };
  }
  const outSab = new SharedArrayBuffer(B * Q * 8);
  const doneSab = new SharedArrayBuffer((threads + 1) * 4);
  const msgSab = new SharedArrayBuffer((threads + 1) * 256);
  const flags = new Int32Array(doneSab);
  const bounds = Array.from({ length: threads + 1 }, (_, i) => Math.floor((i * B) / threads));
  const workers: Worker[] = [];
  for (let i = 1; i < threads; i++) {
    let w: Worker;
    try {
      w = new Worker(WORKER_URL, { type: "module" });
    } catch {
      break;
    }
    const msg: RefitSharedJob = {
      job,
      from: bounds[i],
      to: bounds[i + 1],
      out: outSab,
      done: doneSab,
      index: i,
      messages: msgSab,
    };
    w.postMessage(msg);
    workers.push(w);
  }
  const out = new Float64Array(outSab);
  let own = 0, reported = 0;
  const report = () => {
    const total = Math.min(B, own + Atomics.load(flags, 0));
    while (reported < total) {
      reported++;
      tick();
    }
  };
  const failures = binnedReplicates(job, 0, bounds[1], out.subarray(0, bounds[1] * Q), () => {
    own++;
    report();
  });
  try {
    for (let i = 1; i < threads; i++) {
      let state = i <= workers.length ? Atomics.load(flags, i) : -1;
      const t0 = Date.now();
      while (state === 0 && Date.now() - t0 < WORKER_TIMEOUT_MS) {
        Atomics.wait(flags, i, 0, WAIT_SLICE_MS);
        report();
        state = Atomics.load(flags, i);
      }
      const rows = out.subarray(bounds[i] * Q, bounds[i + 1] * Q);
      if (state !== 1) {
        // The block is redone here; its progress is counted again only past the total.
        failures.push(
          ...binnedReplicates(job, bounds[i], bounds[i + 1], rows, () => {
            own++;
            report();
          }),
        );
      } else {
        const bytes = new Uint8Array(msgSab, i * 256, 256);
        const len = bytes.indexOf(0) === -1 ? 256 : bytes.indexOf(0);
        if (len > 0) failures.push(new TextDecoder().decode(bytes.slice(0, len)));
      }
    }
  } finally {
    for (const w of workers) w.terminate();
  }
  report();
  return { values: Float64Array.from(out), failures };
}
