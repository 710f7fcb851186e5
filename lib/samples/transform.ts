/**
 * Helpers on Samples: column subsets, standardisation with its inverse, train/test split
 * and concatenation. Each returns new Samples and leaves its input unchanged.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import { assertSameDimension, type Samples } from "./samples.ts";
import { makeSamples } from "./_make.ts";

/**
 * The columns `which` (indices, or names when `s.columns` is set), in that order.
 *
 * @example
 * ```ts
 * import { samples, selectColumns } from "../samples/mod.ts";
 * import assert from "node:assert/strict";
 * const s = samples([{ a: 1, b: 2, c: 3 }]);
 * assert.deepEqual(Array.from(selectColumns(s, ["c", 0]).data), [3, 1]);
 * ```
 */
export function selectColumns(s: Samples, which: readonly (number | string)[]): Samples {
  if (which.length === 0) {
    throw new SaddleError("empty", "no columns chosen", { parameter: "columns" });
  }
  const idx = which.map((w) => {
    if (typeof w === "number") {
      if (!Number.isInteger(w) || w < 0 || w >= s.d) {
        throw new SaddleError("invalid-argument", `column ${w} is outside 0..${s.d - 1}`, {
          parameter: "columns",
        });
      }
      return w;
    }
    const j = s.columns?.indexOf(w) ?? -1;
    if (j < 0) {
      throw new SaddleError(
        "not-found",
        `no column named "${w}"; columns are ${
          s.columns ? s.columns.map((c) => `"${c}"`).join(", ") : "unnamed"
        }`,
        { parameter: "columns" },
      );
    }
    return j;
  });
  const d = idx.length;
  const out = new Float64Array(s.n * d);
  for (let i = 0; i < s.n; i++) {
    for (let j = 0; j < d; j++) out[i * d + j] = s.data[i * s.d + idx[j]];
  }
  const columns = s.columns ? idx.map((j) => s.columns![j]) : undefined;
  return makeSamples(s.n, d, out, columns);
}

/** A per-column affine map `z = (x - shift) / scale`, kept so it can be undone. */
export interface AffineTransform {
  /** Per-column value subtracted. */
  readonly shift: Float64Array;
  /** Per-column divisor (never 0). */
  readonly scale: Float64Array;
  /** Apply the map to other samples of the same dimension. */
  apply(x: Samples): Samples;
  /** Undo the map. */
  invert(z: Samples): Samples;
}

/**
 * Standardise each column to mean 0 and standard deviation 1, or apply the map fitted on
 * `reference` (use the real data as reference so both sides share one map).
 *
 * A constant column would divide by zero: its scale is set to 1 and a note is returned.
 *
 * @example
 * ```ts
 * import { samples, standardize } from "../samples/mod.ts";
 * import assert from "node:assert/strict";
 * const { samples: z, transform } = standardize(samples([1, 2, 3]));
 * assert.deepEqual(Array.from(z.data), [-1, 0, 1]);
 * assert.deepEqual(Array.from(transform.invert(z).data), [1, 2, 3]);
 * ```
 */
export function standardize(
  s: Samples,
  reference: Samples = s,
): { samples: Samples; transform: AffineTransform; notes: string[] } {
  assertSameDimension(reference, s, "reference", "samples");
  const d = s.d;
  const shift = new Float64Array(d);
  const scale = new Float64Array(d);
  const notes: string[] = [];
  for (let j = 0; j < d; j++) {
    // Two passes (mean, then squared deviations): exact enough for large offsets.
    let sum = 0;
    for (let i = 0; i < reference.n; i++) sum += reference.data[i * d + j];
    const mean = sum / reference.n;
    let m2 = 0;
    for (let i = 0; i < reference.n; i++) {
      const dev = reference.data[i * d + j] - mean;
      m2 += dev * dev;
    }
    const sd = reference.n > 1 ? Math.sqrt(m2 / (reference.n - 1)) : 0;
    shift[j] = mean;
    if (sd > 0) scale[j] = sd;
    else {
      scale[j] = 1;
      notes.push(`column ${s.columns?.[j] ?? j} is constant: scale set to 1`);
    }
  }
  const map = (x: Samples, forward: boolean): Samples => {
    assertSameDimension({ d }, x, "transform", "samples");
    const out = new Float64Array(x.data.length);
    for (let i = 0; i < x.n; i++) {
      for (let j = 0; j < d; j++) {
        const k = i * d + j;
        out[k] = forward ? (x.data[k] - shift[j]) / scale[j] : x.data[k] * scale[j] + shift[j];
      }
    }
    return makeSamples(x.n, d, out, x.columns);
  };
  const transform: AffineTransform = {
    shift,
    scale,
    apply: (x) => map(x, true),
    invert: (z) => map(z, false),
  };
  return { samples: transform.apply(s), transform, notes };
}

/**
 * Rows `indices` of `s`, in that order.
 *
 * @example
 * ```ts
 * import { samples, takeRows } from "../samples/mod.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(Array.from(takeRows(samples([5, 6, 7]), [2, 0]).data), [7, 5]);
 * ```
 */
export function takeRows(s: Samples, indices: ArrayLike<number>): Samples {
  const d = s.d;
  const out = new Float64Array(indices.length * d);
  for (let r = 0; r < indices.length; r++) {
    const i = indices[r];
    if (!(i >= 0 && i < s.n) || !Number.isInteger(i)) {
      throw new SaddleError("invalid-argument", `row ${i} is outside 0..${s.n - 1}`, {
        parameter: "indices",
      });
    }
    out.set(s.data.subarray(i * d, i * d + d), r * d);
  }
  const n = indices.length;
  return makeSamples(n, d, out, s.columns);
}

/** Options of {@linkcode trainTestSplit}. */
export interface SplitOptions {
  /** Fraction of rows in the test part, in (0, 1) (default 0.25). */
  testFraction?: number;
  /** Seed or Rng for the shuffle (default 0). */
  seed?: RandomSource;
}

/**
 * A seeded random split into a train and a test part; both keep at least one row.
 *
 * @example
 * ```ts
 * import { samples, trainTestSplit } from "../samples/mod.ts";
 * import assert from "node:assert/strict";
 * const { train, test } = trainTestSplit(samples([1, 2, 3, 4, 5, 6, 7, 8]), { seed: 3 });
 * assert.deepEqual([train.n, test.n], [6, 2]);
 * ```
 */
export function trainTestSplit(
  s: Samples,
  options: SplitOptions = {},
): { train: Samples; test: Samples } {
  const f = options.testFraction ?? 0.25;
  if (!(f > 0 && f < 1)) {
    throw new SaddleError("invalid-argument", `testFraction must be in (0, 1), got ${f}`, {
      parameter: "testFraction",
    });
  }
  if (s.n < 2) {
    throw new SaddleError("too-few-samples", `cannot split ${s.n} row(s) into two parts`, {
      parameter: "samples",
    });
  }
  const nTest = Math.min(s.n - 1, Math.max(1, Math.round(s.n * f)));
  const perm = toRng(options.seed ?? 0).permutation(s.n);
  return { test: takeRows(s, perm.subarray(0, nTest)), train: takeRows(s, perm.subarray(nTest)) };
}

/**
 * Rows of every input stacked in order; all must share the dimension.
 *
 * @example
 * ```ts
 * import { concatSamples, samples } from "../samples/mod.ts";
 * import assert from "node:assert/strict";
 * assert.equal(concatSamples(samples([1, 2]), samples([3])).n, 3);
 * ```
 */
export function concatSamples(...parts: readonly Samples[]): Samples {
  if (parts.length === 0) throw new SaddleError("empty", "nothing to concatenate");
  const d = parts[0].d;
  let n = 0;
  parts.forEach((p, i) => {
    assertSameDimension(parts[0], p, "part 0", `part ${i}`);
    n += p.n;
  });
  const data = new Float64Array(n * d);
  let off = 0;
  for (const p of parts) {
    data.set(p.data, off);
    off += p.data.length;
  }
  const columns = parts[0].columns;
  return makeSamples(n, d, data, columns);
}
