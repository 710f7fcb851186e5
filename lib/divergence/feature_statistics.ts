/**
 * Streamed, mergeable means and covariances of feature sets (Chan, Golub & LeVeque 1983):
 * from arrays, from `.npy` files read a block at a time, from other accumulators, and from
 * precomputed (mean, covariance) pairs.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { syrk } from "../linalg/mod.ts";
import { withDisplay } from "../display/mod.ts";
import { htmlTable, textTable } from "../display/mod.ts";
import { isSamples, npyChunks, samples, type SamplesInput } from "../samples/mod.ts";

/** Mean and covariance of `n` feature vectors of dimension `d`. */
export interface FeatureStatistics {
  /** Number of rows behind the statistics (0 when unknown: precomputed without a count). */
  readonly n: number;
  /** Dimension. */
  readonly d: number;
  /** Column means, length d. */
  readonly mean: Float64Array;
  /** Unbiased covariance (divisor n − 1), row-major `d x d`. */
  readonly covariance: Float64Array;
}

/** Precomputed statistics accepted by {@linkcode featureStatistics}. */
export interface PrecomputedStatistics {
  /** Column means. */
  readonly mean: ArrayLike<number>;
  /** Covariance, row-major `d x d` (flat) or as rows. */
  readonly covariance: ArrayLike<number> | readonly ArrayLike<number>[];
  /** Rows behind them, when known (needed to merge them with others). */
  readonly n?: number;
}

/**
 * Accumulates the mean and the scatter matrix `Σ (x − x̄)(x − x̄)ᵀ` block by block: each
 * block's own centred scatter, merged with the running one by the pairwise update of Chan,
 * Golub & LeVeque 1983, so the result matches a two-pass computation to rounding whatever
 * the block sizes and offsets.
 *
 * References: Chan, Golub & LeVeque 1983, Algorithms for computing the sample variance
 * (Am. Stat.).
 *
 * @example
 * ```ts
 * import { FeatureAccumulator } from "./feature_statistics.ts";
 * import assert from "node:assert/strict";
 * const acc = new FeatureAccumulator(2);
 * acc.add(new Float64Array([0, 0, 1, 2]));
 * acc.add(new Float64Array([2, 4]));
 * const s = acc.statistics();
 * assert.deepEqual(Array.from(s.mean), [1, 2]);
 * assert.deepEqual(Array.from(s.covariance), [1, 2, 2, 4]);
 * ```
 */
export class FeatureAccumulator {
  /** Dimension. */
  readonly d: number;
  #n = 0;
  #mean: Float64Array;
  #scatter: Float64Array;
  #centred = new Float64Array(0);
  #blockMean: Float64Array;

  /** An empty accumulator for `d`-dimensional rows. */
  constructor(d: number) {
    if (!Number.isInteger(d) || d < 1) {
      throw new SaddleError("invalid-argument", `d must be an integer >= 1, got ${d}`, {
        parameter: "d",
      });
    }
    this.d = d;
    this.#mean = new Float64Array(d);
    this.#scatter = new Float64Array(d * d);
    this.#blockMean = new Float64Array(d);
  }

  /** Rows accumulated so far. */
  get n(): number {
    return this.#n;
  }

  /**
   * Add a block of rows: a row-major buffer whose length is a multiple of `d`, or Samples
   * of dimension `d`. A block of another width throws a `dimension-mismatch` error.
   */
  add(rows: Float64Array | SamplesInput): this {
    const d = this.d;
    let data: Float64Array;
    if (rows instanceof Float64Array) {
      if (rows.length % d !== 0) {
        throw new SaddleError(
          "dimension-mismatch",
          `a block of ${rows.length} values does not split into rows of d = ${d}; ` +
            "every block must have the accumulator's width",
          { parameter: "rows" },
        );
      }
      for (let i = 0; i < rows.length; i++) {
        if (!Number.isFinite(rows[i])) {
          throw new SaddleError("non-finite", `value is ${rows[i]}; fix or drop that row`, {
            row: Math.floor(i / d),
            column: i % d,
            parameter: "rows",
          });
        }
      }
      data = rows;
    } else {
      const s = isSamples(rows) ? rows : samples(rows, { d, source: "rows" });
      if (s.d !== d) {
        throw new SaddleError(
          "dimension-mismatch",
          `a block of width ${s.d} was added to statistics of width ${d}; ` +
            "every block must have the same columns",
          { parameter: "rows" },
        );
      }
      data = s.data;
    }
    const nb = data.length / d;
    if (nb === 0) return this;
    const mean = this.#blockMean.fill(0);
    for (let i = 0; i < nb; i++) for (let t = 0; t < d; t++) mean[t] += data[i * d + t];
    for (let t = 0; t < d; t++) mean[t] /= nb;
    if (this.#centred.length < data.length) this.#centred = new Float64Array(data.length);
    const c = this.#centred;
    for (let i = 0; i < nb; i++) {
      for (let t = 0; t < d; t++) c[i * d + t] = data[i * d + t] - mean[t];
    }
    // The block's centred scatter CᵀC (both triangles) through the linear-algebra interface.
    this.#mergeParts(nb, mean, syrk(c.subarray(0, nb * d), { n: nb, d }));
    return this;
  }

  /** Merge another accumulator or statistics with a known `n` into this one. */
  merge(other: FeatureAccumulator | FeatureStatistics): this {
    if (other.d !== this.d) {
      throw new SaddleError(
        "dimension-mismatch",
        `cannot merge statistics of width ${other.d} into width ${this.d}`,
        { parameter: "other" },
      );
    }
    if (other instanceof FeatureAccumulator) {
      if (other.#n > 0) this.#mergeParts(other.#n, other.#mean, other.#scatter);
      return this;
    }
    const s = other;
    if (!(s.n >= 1)) {
      throw new SaddleError(
        "invalid-argument",
        "these statistics do not say how many rows are behind them (n = 0); give n with " +
          "precomputed statistics to merge them",
        { parameter: "n" },
      );
    }
    const scatter = Float64Array.from(s.covariance, (v) => v * (s.n - 1));
    this.#mergeParts(s.n, s.mean, scatter);
    return this;
  }

  #mergeParts(nb: number, meanB: Float64Array, scatterB: Float64Array): void {
    const d = this.d, na = this.#n, n = na + nb;
    const mean = this.#mean, M = this.#scatter;
    const f = (na * nb) / n;
    // delta = meanB − meanA, kept in the block-mean buffer when it is not meanB itself.
    const delta = new Float64Array(d);
    for (let t = 0; t < d; t++) delta[t] = meanB[t] - mean[t];
    for (let a = 0; a < d; a++) {
      for (let b = a; b < d; b++) {
        M[a * d + b] += scatterB[a * d + b] + (na > 0 ? delta[a] * delta[b] * f : 0);
      }
    }
    for (let t = 0; t < d; t++) mean[t] += delta[t] * (nb / n);
    this.#n = n;
  }

  /** The mean and unbiased covariance so far (at least 2 rows). */
  statistics(): FeatureStatistics {
    const d = this.d, n = this.#n;
    if (n < 2) {
      throw new SaddleError(
        "too-few-samples",
        `${n} rows accumulated; a covariance needs at least 2`,
        { parameter: "rows" },
      );
    }
    const cov = new Float64Array(d * d);
    for (let a = 0; a < d; a++) {
      for (let b = a; b < d; b++) {
        const v = this.#scatter[a * d + b] / (n - 1);
        cov[a * d + b] = v;
        cov[b * d + a] = v;
      }
    }
    return statisticsOf(n, d, Float64Array.from(this.#mean), cov);
  }
}

/** Options of {@linkcode featureStatistics} and {@linkcode readFeatureStatistics}. */
export interface FeatureStatisticsOptions {
  /** Rows per block (default 4096 for arrays; 2^22 values, 32 MiB of float64, for files). */
  rows?: number;
  /** Called after each block of a file with the rows read so far and the total. */
  onProgress?: (done: number, total: number) => void;
}

/**
 * Mean and covariance of a feature set, accumulated block by block: from samples (anything
 * `samples()` takes), from other statistics (merged), or from a precomputed
 * `{ mean, covariance, n? }`.
 *
 * References: Chan, Golub & LeVeque 1983 (Am. Stat.), the pairwise update.
 *
 * @example
 * ```ts
 * import { featureStatistics } from "./feature_statistics.ts";
 * import assert from "node:assert/strict";
 * const a = featureStatistics([[0, 0], [1, 2]]), b = featureStatistics([[2, 4], [1, 2]]);
 * const ab = featureStatistics([a, b]);
 * assert.equal(ab.n, 4);
 * assert.deepEqual(Array.from(ab.mean), [1, 2]);
 * const pre = featureStatistics({ mean: [0, 0], covariance: [[1, 0], [0, 1]] });
 * assert.equal(pre.n, 0);
 * ```
 */
export function featureStatistics(
  input: SamplesInput | PrecomputedStatistics | readonly FeatureStatistics[],
  options: FeatureStatisticsOptions = {},
): FeatureStatistics {
  if (isStatisticsList(input)) {
    if (input.length === 0) {
      throw new SaddleError("empty", "no statistics to merge", { parameter: "input" });
    }
    const acc = new FeatureAccumulator(input[0].d);
    for (const s of input) acc.merge(s);
    return acc.statistics();
  }
  if (isPrecomputed(input)) return fromPrecomputed(input);
  const s = isSamples(input) ? input : samples(input as SamplesInput, { source: "input" });
  const acc = new FeatureAccumulator(s.d);
  const rows = options.rows ?? 4096;
  for (let i = 0; i < s.n; i += rows) {
    acc.add(s.data.subarray(i * s.d, Math.min(s.n, i + rows) * s.d));
  }
  return acc.statistics();
}

/**
 * Mean and covariance of the rows of a `.npy` file, read a block at a time (the file never
 * sits in memory whole; memory is one block plus two `d x d` matrices).
 *
 * @example
 * ```ts
 * import { readFeatureStatistics } from "./feature_statistics.ts";
 * import { samples, writeNpy } from "../samples/mod.ts";
 * import assert from "node:assert/strict";
 * const path = await Deno.makeTempFile({ suffix: ".npy" });
 * await writeNpy(path, samples([[0, 0], [1, 2], [2, 4]]), { dtype: "<f4" });
 * const s = await readFeatureStatistics(path, { rows: 2 });
 * assert.deepEqual(Array.from(s.covariance), [1, 2, 2, 4]);
 * await Deno.remove(path);
 * ```
 */
export async function readFeatureStatistics(
  path: string,
  options: FeatureStatisticsOptions = {},
): Promise<FeatureStatistics> {
  let acc: FeatureAccumulator | undefined;
  // Blocks of 2^22 values (32 MiB as float64) unless told: large enough for an efficient
  // syrk, small next to the file.
  const probe = npyChunks(path, { rows: 1 });
  const head = await probe.next();
  await probe.return(undefined);
  const d = head.done ? 1 : head.value.d;
  const rows = options.rows ?? Math.max(1, Math.floor(2 ** 22 / d));
  for await (const chunk of npyChunks(path, { rows })) {
    acc ??= new FeatureAccumulator(chunk.d);
    acc.add(chunk.data);
    options.onProgress?.(chunk.start + chunk.n, chunk.total);
  }
  if (!acc) throw new SaddleError("empty", "the file has no rows", { file: path });
  return acc.statistics();
}

function isStatisticsList(x: unknown): x is readonly FeatureStatistics[] {
  return Array.isArray(x) && x.length > 0 && typeof x[0] === "object" && x[0] !== null &&
    "covariance" in x[0] && "mean" in x[0];
}

function isPrecomputed(x: unknown): x is PrecomputedStatistics {
  return typeof x === "object" && x !== null && !Array.isArray(x) && "mean" in x &&
    "covariance" in x;
}

function fromPrecomputed(p: PrecomputedStatistics): FeatureStatistics {
  const mean = Float64Array.from(p.mean);
  const d = mean.length;
  const cov = new Float64Array(d * d);
  const c = p.covariance as ArrayLike<number> | readonly ArrayLike<number>[];
  if (c.length === d && d > 0 && typeof c[0] === "object") {
    (c as readonly ArrayLike<number>[]).forEach((r, i) => {
      if (r.length !== d) {
        throw new SaddleError(
          "dimension-mismatch",
          `covariance row ${i} has ${r.length} entries, not ${d}`,
          {
            parameter: "covariance",
            row: i,
          },
        );
      }
      for (let j = 0; j < d; j++) cov[i * d + j] = r[j];
    });
  } else if (c.length === d * d) {
    cov.set(c as ArrayLike<number>);
  } else {
    throw new SaddleError(
      "dimension-mismatch",
      `the mean has ${d} entries but the covariance ${c.length}; give a ${d} x ${d} matrix`,
      { parameter: "covariance" },
    );
  }
  for (let i = 0; i < d * d; i++) {
    if (!Number.isFinite(cov[i])) {
      throw new SaddleError("non-finite", "covariance has a non-finite entry", {
        parameter: "covariance",
        row: Math.floor(i / d),
        column: i % d,
      });
    }
  }
  for (let i = 0; i < d; i++) {
    if (!Number.isFinite(mean[i])) {
      throw new SaddleError("non-finite", "mean has a non-finite entry", {
        parameter: "mean",
        column: i,
      });
    }
    for (let j = 0; j < i; j++) {
      const a = cov[i * d + j], b = cov[j * d + i];
      if (Math.abs(a - b) > 1e-10 * (Math.abs(a) + Math.abs(b)) + 1e-300) {
        throw new SaddleError(
          "invalid-argument",
          `covariance is not symmetric at (${i}, ${j}): ${a} vs ${b}`,
          { parameter: "covariance" },
        );
      }
    }
  }
  return statisticsOf(p.n ?? 0, d, mean, cov);
}

function statisticsOf(
  n: number,
  d: number,
  mean: Float64Array,
  covariance: Float64Array,
): FeatureStatistics {
  const shown = Math.min(d, 6);
  return Object.freeze(withDisplay({ n, d, mean, covariance }, (s) => {
    const header = ["", ...Array.from({ length: shown }, (_, j) => `f${j}`)];
    const rows = [
      ["mean", ...Array.from(s.mean.subarray(0, shown))],
      ...Array.from({ length: shown }, (_, i) => [
        `cov f${i}`,
        ...Array.from(s.covariance.subarray(i * d, i * d + shown)),
      ]),
    ];
    const caption = `feature statistics: n = ${s.n || "unknown"}, d = ${d}` +
      (d > shown ? ` (first ${shown} features shown)` : "");
    return {
      "text/plain": `${caption}\n${textTable(header, rows)}`,
      "text/html": htmlTable(header, rows, caption),
    };
  }));
}

/** Whether `x` is a {@linkcode FeatureStatistics} (mean and covariance as Float64Arrays). */
export function isFeatureStatistics(x: unknown): x is FeatureStatistics {
  return typeof x === "object" && x !== null && "mean" in x && "covariance" in x &&
    (x as FeatureStatistics).mean instanceof Float64Array &&
    (x as FeatureStatistics).covariance instanceof Float64Array && "d" in x;
}
