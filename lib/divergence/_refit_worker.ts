/**
 * Web Worker entry of the shared refit bootstrap (private): runs binned replicates
 * `from .. to - 1` into shared memory, counts progress there, and signals through
 * `Atomics.notify` so that the main thread can wait synchronously.
 *
 * @module
 */
import { type BinnedJob, binnedReplicates } from "./_refit_core.ts";

/** A block of binned replicates over shared memory. */
export interface RefitSharedJob {
  job: BinnedJob;
  from: number;
  to: number;
  /** Float64 replicate rows (B x quantities). */
  out: SharedArrayBuffer;
  /** Int32 flags: slot `index` is 1 when done, 2 on failure; slot 0 counts replicates done. */
  done: SharedArrayBuffer;
  index: number;
  /** UTF-8 bytes of the first failure message (256 bytes a worker). */
  messages: SharedArrayBuffer;
}

const scope = self as unknown as {
  onmessage: ((e: MessageEvent<RefitSharedJob>) => void) | null;
  close(): void;
};

scope.onmessage = (e: MessageEvent<RefitSharedJob>) => {
  const j = e.data;
  const flags = new Int32Array(j.done);
  try {
    const q = j.job.quantities.length;
    const out = new Float64Array(j.out, j.from * q * 8, (j.to - j.from) * q);
    const failures = binnedReplicates(j.job, j.from, j.to, out, () => Atomics.add(flags, 0, 1));
    if (failures.length > 0) {
      const bytes = new TextEncoder().encode(failures[0]).slice(0, 255);
      new Uint8Array(j.messages, j.index * 256, 256).set(bytes);
    }
    Atomics.store(flags, j.index, 1);
  } catch {
    Atomics.store(flags, j.index, 2);
  }
  Atomics.notify(flags, j.index);
  scope.close();
};
