/**
 * Web Worker entry for parallel KDE evaluation (private). Two modes:
 * - a {@linkcode KdeJob} message: evaluate the queries and post the log kernel sums back
 *   (used by the async `logPdfParallel`);
 * - a {@linkcode KdeSharedJob} message: read whitened queries from shared memory, write the
 *   results there and signal through `Atomics.notify`, so that `logPdf` can wait for it
 *   synchronously.
 *
 * @module
 */
import { makeEvaluator } from "./_kde_eval.ts";
import type { EvalMethod } from "./kde_types.ts";

/** An evaluation job answered by message. */
export interface KdeJob {
  z: Float64Array;
  d: number;
  lw: Float64Array | null;
  method: EvalMethod;
  q: Float64Array;
}

/** An evaluation job over shared memory: rows `from..to` of `q` into `out`. */
export interface KdeSharedJob {
  z: Float64Array;
  d: number;
  lw: Float64Array | null;
  method: EvalMethod;
  q: SharedArrayBuffer;
  out: SharedArrayBuffer;
  /** Int32 flags: slot `index` is set to 1 when done, 2 on failure. */
  done: SharedArrayBuffer;
  index: number;
  from: number;
  to: number;
}

const scope = self as unknown as {
  onmessage: ((e: MessageEvent<KdeJob | KdeSharedJob>) => void) | null;
  postMessage(message: Float64Array, transfer: Transferable[]): void;
  close(): void;
};

scope.onmessage = (e: MessageEvent<KdeJob | KdeSharedJob>) => {
  const job = e.data;
  if (job.q instanceof SharedArrayBuffer) {
    const j = job as KdeSharedJob;
    const flags = new Int32Array(j.done);
    try {
      const q = new Float64Array(j.q);
      const out = new Float64Array(j.out, j.from * 8, j.to - j.from);
      makeEvaluator(j.z, j.d, j.lw, j.method).evaluate(q, out, j.from, j.to);
      Atomics.store(flags, j.index, 1);
    } catch {
      Atomics.store(flags, j.index, 2);
    }
    Atomics.notify(flags, j.index);
    scope.close();
    return;
  }
  const { z, d, lw, method, q } = job as KdeJob;
  const m = q.length / d;
  const out = new Float64Array(m);
  makeEvaluator(z, d, lw, method).evaluate(q, out, 0, m);
  scope.postMessage(out, [out.buffer]);
};
