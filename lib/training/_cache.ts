/**
 * The on-disk cache of checkpoint results: one JSON file in a folder the user names, keyed
 * by the checkpoint's SHA-256 and the computation's settings, written atomically
 * (`writeFileAtomic`: a temp file in the same folder, then a rename).
 *
 * @module
 */
import { type Estimate, type EstimateUnit, makeEstimate } from "../estimate/estimate.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { writeFileAtomic } from "../files/atomic_write.ts";

/** Name of the cache file inside the cache folder. */
export const CACHE_FILE = "saddlekit-checkpoints.json";

interface Stored {
  value: number | null;
  se?: number | null;
  ci?: [number | null, number | null];
  level: number;
  method: string;
  n: number;
  unit?: EstimateUnit;
  notes: string[];
}

/** Hex SHA-256 of bytes (crypto.subtle). */
export async function sha256(bytes: Uint8Array): Promise<string> {
  const copy = new Uint8Array(bytes.length);
  copy.set(bytes);
  const h = new Uint8Array(await crypto.subtle.digest("SHA-256", copy.buffer));
  return Array.from(h, (b) => b.toString(16).padStart(2, "0")).join("");
}

const num = (x: number | null | undefined) => (x === null || x === undefined ? NaN : x);
const store = (x: number) => (Number.isFinite(x) ? x : null);

function toStored(e: Estimate): Stored {
  return {
    value: store(e.value),
    ...(e.se !== undefined ? { se: store(e.se) } : {}),
    ...(e.ci ? { ci: [store(e.ci[0]), store(e.ci[1])] as [number | null, number | null] } : {}),
    level: e.level,
    method: e.method,
    n: e.n,
    ...(e.unit ? { unit: e.unit } : {}),
    notes: [...e.notes],
  };
}

function fromStored(s: Stored): Estimate {
  return makeEstimate({
    value: num(s.value),
    ...(s.se !== undefined ? { se: num(s.se) } : {}),
    ...(s.ci ? { ci: [num(s.ci[0]), num(s.ci[1])] as const } : {}),
    level: s.level,
    method: s.method,
    n: s.n,
    ...(s.unit ? { unit: s.unit } : {}),
    notes: s.notes,
  });
}

/** The cache in memory, saved after each new entry. */
export class CheckpointCache {
  readonly #dir: string | undefined;
  #entries: Record<string, Record<string, Stored>> = {};
  private constructor(dir: string | undefined) {
    this.#dir = dir;
  }

  /** Open the cache in `dir` (created if missing); no folder: a cache in memory only. */
  static async open(dir: string | undefined): Promise<CheckpointCache> {
    const c = new CheckpointCache(dir);
    if (dir === undefined) return c;
    await Deno.mkdir(dir, { recursive: true });
    const path = `${dir}/${CACHE_FILE}`;
    let text: string | undefined;
    try {
      text = await Deno.readTextFile(path);
    } catch (e) {
      if (!(e instanceof Deno.errors.NotFound)) throw e;
    }
    if (text !== undefined) {
      try {
        const parsed = JSON.parse(text);
        if (parsed?.version === 1 && typeof parsed.entries === "object") {
          c.#entries = parsed.entries;
        }
      } catch {
        throw new SaddleError(
          "parse",
          "the checkpoint cache is not valid JSON; delete the file to rebuild it",
          { file: path },
        );
      }
    }
    return c;
  }

  /** The estimates stored under `key`, or undefined. */
  get(key: string): Record<string, Estimate> | undefined {
    const e = this.#entries[key];
    if (!e) return undefined;
    return Object.fromEntries(Object.entries(e).map(([k, v]) => [k, fromStored(v)]));
  }

  /** Store the estimates under `key` and write the file atomically. */
  async set(key: string, metrics: Readonly<Record<string, Estimate>>): Promise<void> {
    this.#entries[key] = Object.fromEntries(
      Object.entries(metrics).map(([k, v]) => [k, toStored(v)]),
    );
    if (this.#dir === undefined) return;
    await writeFileAtomic(
      `${this.#dir}/${CACHE_FILE}`,
      JSON.stringify({ version: 1, entries: this.#entries }),
    );
  }
}
