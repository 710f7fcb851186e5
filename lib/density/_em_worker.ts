/**
 * EM worker (private): runs {@linkcode emPass} on its rows whenever the main thread bumps
 * the job counter in shared memory, and reports its sums in its own shared slot. The main
 * thread waits with `Atomics.wait`, so the fit stays synchronous.
 *
 * @module
 */
import { emPass } from "./_em_pass.ts";

/** First (and only) message: the shared buffers and this worker's rows. */
export interface EmWorkerSetup {
  data: SharedArrayBuffer;
  ll: SharedArrayBuffer;
  params: SharedArrayBuffer;
  stats: SharedArrayBuffer;
  ctrl: SharedArrayBuffer;
  n: number;
  d: number;
  k: number;
  /** Row bounds of every part (length parts + 1). */
  bounds: number[];
  /** The parts this worker computes. */
  parts: number[];
  index: number;
  full: boolean;
}

/** Control words: job counter, command, then one "done" counter per worker. */
export const CTRL_GEN = 0, CTRL_CMD = 1, CTRL_ERR = 2, CTRL_DONE = 3;
/** Commands. */
export const CMD_STATS = 1, CMD_LL = 2, CMD_STOP = 3;

/** Offsets of the parameter block (Float64): mu, L (Cholesky factors), base. */
export function paramLayout(k: number, d: number) {
  return { mu: 0, L: k * d, base: k * d + k * d * d, size: k * d + k * d * d + k };
}

/** Offsets of one worker's stats block (Float64): nk, s1, s2, total. */
export function statsLayout(k: number, d: number) {
  const size = k + k * d + k * d * d + 1;
  return { nk: 0, s1: k, s2: k + k * d, total: size - 1, size };
}

const scope = self as unknown as {
  onmessage: ((e: MessageEvent<EmWorkerSetup>) => void) | null;
  close(): void;
};

scope.onmessage = (e: MessageEvent<EmWorkerSetup>) => {
  const s = e.data;
  const { d, k } = s;
  const ctrl = new Int32Array(s.ctrl);
  const data = new Float64Array(s.data);
  const ll = new Float64Array(s.ll);
  const par = new Float64Array(s.params);
  const pl = paramLayout(k, d), sl = statsLayout(k, d);
  const all = new Float64Array(s.stats);
  const mu = par.subarray(pl.mu, pl.mu + k * d);
  const prep = {
    L: par.subarray(pl.L, pl.L + k * d * d),
    base: par.subarray(pl.base, pl.base + k),
  };
  let seen = 0;
  for (;;) {
    Atomics.wait(ctrl, CTRL_GEN, seen);
    const gen = Atomics.load(ctrl, CTRL_GEN);
    seen = gen;
    const cmd = Atomics.load(ctrl, CTRL_CMD);
    if (cmd === CMD_STOP) break;
    try {
      for (const part of s.parts) {
        runPart({ all, part, sl, k, d, s, data, mu, prep, ll, withStats: cmd === CMD_STATS });
      }
    } catch {
      Atomics.store(ctrl, CTRL_ERR, 1);
    }
    Atomics.store(ctrl, CTRL_DONE + s.index, gen);
    Atomics.notify(ctrl, CTRL_DONE + s.index);
  }
  scope.close();
};

/**
 * Compute part `part` (its rows `bounds[part]..bounds[part + 1]`) into its own stats slot of
 * `all`: every part is summed alone and the parts are combined in order, so the result does
 * not depend on how many threads ran.
 */
export function runPart({
  all,
  part,
  sl,
  k,
  d,
  s,
  data,
  mu,
  prep,
  ll,
  withStats,
}: {
  all: Float64Array;
  part: number;
  sl: ReturnType<typeof statsLayout>;
  k: number;
  d: number;
  s: { bounds: number[]; full: boolean };
  data: Float64Array;
  mu: Float64Array;
  prep: { L: Float64Array; base: Float64Array };
  ll: Float64Array;
  withStats: boolean;
}): void {
  const slot = all.subarray(part * sl.size, (part + 1) * sl.size);
  slot.fill(0);
  const stats = withStats
    ? {
      nk: slot.subarray(sl.nk, sl.nk + k),
      s1: slot.subarray(sl.s1, sl.s1 + k * d),
      s2: slot.subarray(sl.s2, sl.s2 + k * d * d),
    }
    : null;
  slot[sl.total] = emPass({
    data,
    from: s.bounds[part],
    to: s.bounds[part + 1],
    d,
    k,
    mu,
    prep,
    full: s.full,
    ll,
    stats,
  });
}
