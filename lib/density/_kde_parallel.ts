/**
 * Parallel evaluation of KDE log kernel sums in Web Workers (private): how many workers a
 * job is worth, synchronous evaluation over shared memory (this thread waits with
 * `Atomics.wait`), and asynchronous evaluation by message. The values are identical to
 * evaluation on this thread.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { canStartWorker } from "./_common.ts";
import type { KernelSumEvaluator } from "./_kde_eval.ts";
import type { KdeJob, KdeSharedJob } from "./_kde_worker.ts";
import type { EvalMethod } from "./kde_types.ts";

const WORKER_TIMEOUT_MS = 60000;
const WORKER_URL = new URL("./_kde_worker.ts", import.meta.url);

/** Whitened kernel centres: what a worker needs to evaluate queries. */
export interface KernelCentres {
  /** Row-major whitened centres, n x d. */
  readonly z: Float64Array;
  /** Dimension. */
  readonly d: number;
  /** Log weights, or null for equal weights. */
  readonly lw: Float64Array | null;
  /** The evaluator. */
  readonly method: EvalMethod;
}

/** Workers wanted for `m` queries: 1 below `minPairs` of estimated kernel terms. */
export function workerCount(
  c: KernelCentres,
  m: number,
  minPairs: number,
  requested?: number,
): number {
  // The transform costs a setup per thread and little per query: one thread.
  if (c.method === "fgt") return 1;
  const n = c.z.length / c.d;
  const cores = Math.min(8, navigator.hardwareConcurrency ?? 1);
  const workers = Math.max(1, Math.min(requested ?? cores, m));
  // The 1-D evaluator costs about the same per query whatever n (box expansions): count
  // its work as at most 1000 kernel terms a query, and ask for 100 times more.
  const sorted = c.method === "sorted";
  const work = m * (sorted ? Math.min(n, 1000) : n);
  if (workers < 2 || work < minPairs * (sorted ? 100 : 1)) return 1;
  return canStartWorker(WORKER_URL) ? workers : 1;
}

/**
 * Synchronous parallel evaluation of `m` whitened queries `q` on `threads` threads:
 * workers read the queries from shared memory while this thread does its own share with
 * `here`, then it waits on shared flags (Atomics.wait). Rows of a worker that cannot start
 * or does not finish within the timeout are done here.
 */
export function evaluateShared(
  c: KernelCentres,
  here: KernelSumEvaluator,
  q: Float64Array,
  m: number,
  threads: number,
): Float64Array {
  const qSab = new SharedArrayBuffer(q.length * 8);
  new Float64Array(qSab).set(q);
  const outSab = new SharedArrayBuffer(m * 8);
  const doneSab = new SharedArrayBuffer(threads * 4);
  const flags = new Int32Array(doneSab);
  const bounds = Array.from({ length: threads + 1 }, (_, i) => Math.floor((i * m) / threads));
  const workers: Worker[] = [];
  for (let i = 1; i < threads; i++) {
    let w: Worker;
    try {
      w = new Worker(WORKER_URL, { type: "module" });
    } catch {
      break; // no permission to start workers: the remaining rows are done here
    }
    const job: KdeSharedJob = {
      z: c.z,
      d: c.d,
      lw: c.lw,
      method: c.method,
      q: qSab,
      out: outSab,
      done: doneSab,
      index: i,
      from: bounds[i],
      to: bounds[i + 1],
    };
    w.postMessage(job);
    workers.push(w);
  }
  const out = new Float64Array(outSab);
  const qs = new Float64Array(qSab);
  here.evaluate(qs, out.subarray(0, bounds[1]), 0, bounds[1]);
  try {
    for (let i = 1; i < threads; i++) {
      // A worker that has not finished within the timeout (it could not start, say) has
      // its rows done here instead.
      const r = i <= workers.length ? Atomics.wait(flags, i, 0, WORKER_TIMEOUT_MS) : "none";
      if (r === "timed-out" || r === "none" || Atomics.load(flags, i) !== 1) {
        here.evaluate(qs, out.subarray(bounds[i], bounds[i + 1]), bounds[i], bounds[i + 1]);
      }
    }
  } finally {
    for (const w of workers) w.terminate();
  }
  return Float64Array.from(out);
}

/**
 * Asynchronous evaluation of `m` whitened queries `q` split evenly over `workers` workers;
 * the log kernel sums in query order. Rejects when a worker cannot start or fails.
 */
export async function evaluateInWorkers(
  c: KernelCentres,
  q: Float64Array,
  m: number,
  workers: number,
): Promise<Float64Array> {
  const d = c.d;
  const chunks: Promise<Float64Array>[] = [];
  for (let k = 0; k < workers; k++) {
    const a = Math.floor((k * m) / workers), b = Math.floor(((k + 1) * m) / workers);
    const job: KdeJob = { z: c.z, d, lw: c.lw, method: c.method, q: q.slice(a * d, b * d) };
    chunks.push(runWorker(job));
  }
  const parts = await Promise.all(chunks);
  const out = new Float64Array(m);
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

function runWorker(job: KdeJob): Promise<Float64Array> {
  let worker: Worker;
  try {
    worker = new Worker(WORKER_URL, { type: "module" });
  } catch (e) {
    return Promise.reject(e);
  }
  return new Promise<Float64Array>((resolve, reject) => {
    worker.onmessage = (e: MessageEvent<Float64Array>) => {
      worker.terminate();
      resolve(e.data);
    };
    worker.onerror = (e: ErrorEvent) => {
      e.preventDefault();
      worker.terminate();
      reject(new SaddleError("numerical", `KDE worker failed: ${e.message}`));
    };
    worker.postMessage(job);
  });
}
