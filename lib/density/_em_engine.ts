/**
 * Runs EM passes on the main thread or split across Web Workers that share the data
 * (private). Parallel passes are synchronous: the main thread does its share, then waits on
 * shared memory for the workers, so `fitGaussianMixture` keeps a synchronous API.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { canStartWorker } from "./_common.ts";
import { type PassStats, prepare } from "./_em_pass.ts";
import {
  CMD_LL,
  CMD_STATS,
  CMD_STOP,
  CTRL_CMD,
  CTRL_DONE,
  CTRL_ERR,
  CTRL_GEN,
  type EmWorkerSetup,
  paramLayout,
  runPart,
  statsLayout,
} from "./_em_worker.ts";

const WORKER_URL = new URL("./_em_worker.ts", import.meta.url);

/** Fixed number of row parts: sums are formed per part and combined in order. */
const PARTS = 8;

/** Parameters of a pass. */
export interface EngineParams {
  readonly w: Float64Array;
  readonly mu: Float64Array;
  readonly cov: Float64Array;
}

/** Time the first job may take, worker start-up included, before falling back (ms). */
const STARTUP_TIMEOUT = 20000;

/** EM passes over fixed data. Call `close()` when done (it stops the workers). */
export class EmEngine {
  readonly ll: Float64Array;
  readonly #data: Float64Array;
  readonly #n: number;
  readonly #d: number;
  readonly #k: number;
  readonly #full: boolean;
  readonly #bounds: number[];
  readonly #mine: number[];
  readonly #stats: Float64Array;
  #workers: Worker[] = [];
  #ctrl?: Int32Array;
  #par?: Float64Array;
  #started = false;

  constructor(
    { data, n, d, k, full, workers }: {
      data: Float64Array;
      n: number;
      d: number;
      k: number;
      full: boolean;
      workers: number;
    },
  ) {
    this.#n = n;
    this.#d = d;
    this.#k = k;
    this.#full = full;
    const parts = Math.max(1, Math.min(PARTS, n));
    this.#bounds = Array.from({ length: parts + 1 }, (_, i) => Math.floor((i * n) / parts));
    const threads = canStartWorker(WORKER_URL) ? Math.min(workers, parts - 1) + 1 : 1;
    const sl = statsLayout(k, d), pl = paramLayout(k, d);
    // Part p goes to thread p % threads; thread 0 is this one.
    this.#mine = this.#bounds.slice(0, parts).map((_, p) => p).filter((p) => p % threads === 0);
    if (threads === 1) {
      this.#data = data;
      this.ll = new Float64Array(n);
      this.#stats = new Float64Array(parts * sl.size);
      return;
    }
    const dataSab = new SharedArrayBuffer(n * d * 8);
    this.#data = new Float64Array(dataSab);
    this.#data.set(data);
    const llSab = new SharedArrayBuffer(n * 8);
    this.ll = new Float64Array(llSab);
    const parSab = new SharedArrayBuffer(pl.size * 8);
    const statsSab = new SharedArrayBuffer(parts * sl.size * 8);
    const ctrlSab = new SharedArrayBuffer((CTRL_DONE + threads - 1) * 4);
    this.#par = new Float64Array(parSab);
    this.#stats = new Float64Array(statsSab);
    this.#ctrl = new Int32Array(ctrlSab);
    for (let i = 0; i < threads - 1; i++) {
      let w: Worker;
      try {
        w = new Worker(WORKER_URL, { type: "module" });
      } catch {
        // No permission to start workers: every part runs on this thread.
        this.close();
        return;
      }
      const setup: EmWorkerSetup = {
        data: dataSab,
        ll: llSab,
        params: parSab,
        stats: statsSab,
        ctrl: ctrlSab,
        n,
        d,
        k,
        bounds: this.#bounds,
        parts: this.#bounds.slice(0, parts).map((_, p) => p).filter((p) => p % threads === i + 1),
        index: i,
        full,
      };
      w.postMessage(setup);
      this.#workers.push(w);
    }
  }

  /** One pass; adds the moments into `stats` when given. Returns the mean log-likelihood. */
  pass(p: EngineParams, stats: PassStats | null): number {
    const n = this.#n, d = this.#d, k = this.#k;
    const prep = prepare(p.w, p.cov, k, d);
    const parts = this.#bounds.length - 1;
    const sl = statsLayout(k, d);
    const run = (part: number) =>
      runPart({
        all: this.#stats,
        part,
        sl,
        k,
        d,
        s: { bounds: this.#bounds, full: this.#full },
        data: this.#data,
        mu: p.mu,
        prep,
        ll: this.ll,
        withStats: stats !== null,
      });
    if (this.#workers.length > 0) {
      const ctrl = this.#ctrl!, par = this.#par!;
      const pl = paramLayout(k, d);
      par.set(p.mu, pl.mu);
      par.set(prep.L, pl.L);
      par.set(prep.base, pl.base);
      Atomics.store(ctrl, CTRL_CMD, stats ? CMD_STATS : CMD_LL);
      const gen = Atomics.add(ctrl, CTRL_GEN, 1) + 1;
      Atomics.notify(ctrl, CTRL_GEN);
      for (const part of this.#mine) run(part);
      for (let i = 0; i < this.#workers.length; i++) {
        let v = Atomics.load(ctrl, CTRL_DONE + i);
        while (v !== gen) {
          const r = Atomics.wait(
            ctrl,
            CTRL_DONE + i,
            v,
            this.#started ? undefined : STARTUP_TIMEOUT,
          );
          if (r === "timed-out") {
            // A worker that never started (no permission to load it, say): run every part here.
            this.close();
            for (let q = 0; q < parts; q++) if (!this.#mine.includes(q)) run(q);
            break;
          }
          v = Atomics.load(ctrl, CTRL_DONE + i);
        }
        if (this.#workers.length === 0) break;
      }
      this.#started = true;
      if (this.#ctrl && Atomics.load(this.#ctrl, CTRL_ERR) !== 0) {
        this.close();
        throw new SaddleError("numerical", "an EM worker failed; retry with `workers: 0`", {
          parameter: "workers",
        });
      }
    } else {
      for (let q = 0; q < parts; q++) run(q);
    }
    // Combine the parts in order: the same bits whatever the number of threads.
    const st = this.#stats;
    let total = 0;
    for (let q = 0; q < parts; q++) {
      const o = q * sl.size;
      total += st[o + sl.total];
      if (!stats) continue;
      for (let j = 0; j < k; j++) stats.nk[j] += st[o + sl.nk + j];
      for (let a = 0; a < k * d; a++) stats.s1[a] += st[o + sl.s1 + a];
      for (let a = 0; a < k * d * d; a++) stats.s2[a] += st[o + sl.s2 + a];
    }
    return total / n;
  }

  /** Stop and terminate the workers (idempotent). */
  close(): void {
    if (this.#workers.length === 0) return;
    const ctrl = this.#ctrl!;
    Atomics.store(ctrl, CTRL_CMD, CMD_STOP);
    Atomics.add(ctrl, CTRL_GEN, 1);
    Atomics.notify(ctrl, CTRL_GEN);
    for (const w of this.#workers) w.terminate();
    this.#workers = [];
  }
}
