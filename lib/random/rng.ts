/**
 * Seeded random numbers over seedrandom's xor4096 generator.
 *
 * @module
 */
// @ts-types="npm:@types/seedrandom@3.0.8"
import seedrandom from "seedrandom";
import { SaddleError } from "../errors/saddle_error.ts";

/** A seed, or an {@linkcode Rng} to draw from. Every random function in saddlekit takes one. */
export type RandomSource = number | string | Rng;

/**
 * A seeded pseudo-random generator: the same seed gives the same sequence of bits on
 * every run and platform (seedrandom's xor4096, Brent 2006, 53-bit doubles).
 *
 * @example Reproducible draws
 * ```ts
 * import { Rng } from "./rng.ts";
 * import assert from "node:assert/strict";
 *
 * const a = new Rng(42), b = new Rng(42);
 * assert.equal(a.uniform(), b.uniform());
 * assert.equal(a.normal(), b.normal());
 * ```
 */
export class Rng {
  /** The seed this generator started from (as a string). */
  readonly seed: string;
  #next: () => number;
  #spare = NaN;

  /**
   * Start a generator from a seed.
   *
   * @param seed Any number or string; equal seeds give equal streams.
   */
  constructor(seed: number | string) {
    if (typeof seed !== "number" && typeof seed !== "string") {
      // String() of any object is "[object Object]": every object would share one stream.
      throw new SaddleError(
        "invalid-argument",
        `seed must be a number, a string or an Rng, got ${seed === null ? "null" : typeof seed}`,
        { parameter: "seed" },
      );
    }
    if (typeof seed === "number" && !Number.isFinite(seed)) {
      throw new SaddleError("invalid-argument", `seed must be finite, got ${seed}`, {
        parameter: "seed",
      });
    }
    this.seed = String(seed);
    const gen = seedrandom.xor4096(this.seed);
    this.#next = () => gen.double();
  }

  /** A uniform draw in [lo, hi) (default [0, 1)). */
  uniform(lo = 0, hi = 1): number {
    return lo + (hi - lo) * this.#next();
  }

  /** A normal draw with the given mean and standard deviation (Marsaglia polar method). */
  normal(mean = 0, sd = 1): number {
    if (this.#spare === this.#spare) {
      const z = this.#spare;
      this.#spare = NaN;
      return mean + sd * z;
    }
    let u: number, v: number, s: number;
    do {
      u = 2 * this.#next() - 1;
      v = 2 * this.#next() - 1;
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const f = Math.sqrt((-2 * Math.log(s)) / s);
    this.#spare = v * f;
    return mean + sd * u * f;
  }

  /** Fill `out` with standard normal draws and return it. */
  fillNormal(out: Float64Array): Float64Array {
    for (let i = 0; i < out.length; i++) out[i] = this.normal();
    return out;
  }

  /** Fill `out` with uniform draws in [0, 1) and return it. */
  fillUniform(out: Float64Array): Float64Array {
    for (let i = 0; i < out.length; i++) out[i] = this.#next();
    return out;
  }

  /** A uniform integer in 0..n-1. */
  integer(n: number): number {
    if (!Number.isInteger(n) || n < 1) {
      throw new SaddleError("invalid-argument", `n must be a positive integer, got ${n}`, {
        parameter: "n",
      });
    }
    return Math.floor(this.#next() * n);
  }

  /**
   * An index drawn with probability proportional to `weights` (non-negative, not all 0).
   * For many draws from the same weights, use {@linkcode Rng.categoricalSampler}.
   */
  categorical(weights: ArrayLike<number>): number {
    return this.categoricalSampler(weights)();
  }

  /**
   * A function that draws indices with probability proportional to `weights`, by binary
   * search in the cumulative sums (O(log k) a draw).
   */
  categoricalSampler(weights: ArrayLike<number>): () => number {
    const k = weights.length;
    if (k === 0) throw new SaddleError("empty", "no weights", { parameter: "weights" });
    const cum = new Float64Array(k);
    let total = 0;
    for (let i = 0; i < k; i++) {
      const w = weights[i];
      if (!(w >= 0) || w === Infinity) {
        throw new SaddleError("invalid-argument", `weight ${i} is ${w}; weights must be >= 0`, {
          parameter: "weights",
        });
      }
      total += w;
      cum[i] = total;
    }
    if (total === 0) {
      throw new SaddleError("invalid-argument", "all weights are 0", { parameter: "weights" });
    }
    return () => {
      const u = this.#next() * total;
      let lo = 0, hi = k - 1;
      while (lo < hi) {
        const mid = (lo + hi) >>> 1;
        if (cum[mid] > u) hi = mid;
        else lo = mid + 1;
      }
      // Skip zero-weight entries that share the cumulative value of their predecessor.
      while (lo < k - 1 && weights[lo] === 0) lo++;
      return lo;
    };
  }

  /** A uniformly random permutation of 0..n-1 (Fisher–Yates). */
  permutation(n: number): Uint32Array {
    if (!Number.isInteger(n) || n < 0) {
      throw new SaddleError("invalid-argument", `n must be an integer >= 0, got ${n}`, {
        parameter: "n",
      });
    }
    const p = new Uint32Array(n);
    for (let i = 0; i < n; i++) p[i] = i;
    for (let i = n - 1; i > 0; i--) {
      const j = Math.floor(this.#next() * (i + 1));
      const t = p[i];
      p[i] = p[j];
      p[j] = t;
    }
    return p;
  }

  /** `size` indices drawn uniformly with replacement from 0..n-1 (a bootstrap resample). */
  bootstrapIndices(n: number, size = n, out: Uint32Array = new Uint32Array(size)): Uint32Array {
    if (!Number.isInteger(n) || n < 1) {
      throw new SaddleError("too-few-samples", `cannot resample from n = ${n} points`, {
        parameter: "n",
      });
    }
    if (out.length !== size) {
      throw new SaddleError(
        "dimension-mismatch",
        `out has length ${out.length} but size is ${size}; pass a buffer of length size`,
        { parameter: "size" },
      );
    }
    for (let i = 0; i < out.length; i++) out[i] = Math.floor(this.#next() * n);
    return out;
  }

  /**
   * An independent generator derived from this one's seed and a label, so that parts of an
   * analysis draw reproducibly whatever order they run in.
   */
  fork(label: string | number): Rng {
    return new Rng(`${this.seed}/${label}`);
  }
}

/**
 * A seeded {@linkcode Rng}.
 *
 * @example
 * ```ts
 * import { rng } from "./rng.ts";
 * import assert from "node:assert/strict";
 * const r = rng(7);
 * const x = r.uniform();
 * assert.ok(x >= 0 && x < 1);
 * assert.equal(rng(7).uniform(), x);
 * ```
 */
export function rng(seed: number | string): Rng {
  return new Rng(seed);
}

/**
 * An {@linkcode Rng} from a {@linkcode RandomSource}: an Rng is used as is, a seed makes a
 * new one. Functions call this on their `seed` option.
 *
 * @example
 * ```ts
 * import { toRng, Rng } from "./rng.ts";
 * import assert from "node:assert/strict";
 * const r = new Rng(1);
 * assert.equal(toRng(r), r);
 * assert.equal(toRng(1).uniform(), new Rng(1).uniform());
 * ```
 */
export function toRng(source: RandomSource): Rng {
  return source instanceof Rng ? source : new Rng(source);
}
