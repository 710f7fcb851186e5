/**
 * Histogram densities on a regular 1-D or 2-D grid with pseudo-count (additive) smoothing.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { quantileSorted } from "../estimate/bootstrap.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import { fromBuffer, type Samples, samples, type SamplesInput } from "../samples/samples.ts";
import { checkQuery, checkSampleSize, densityBundle, description } from "./_common.ts";
import type { Density, DensityDescription } from "./types.ts";
import { JUPYTER_DISPLAY, type MimeBundle } from "../display/display.ts";

/** Options of {@linkcode fitHistogram}. */
export interface HistogramOptions {
  /** Bins per axis (default: Freedman–Diaconis width per axis, between 1 and 512). */
  bins?: number | readonly number[];
  /** Lower grid corner (default: the data minimum). */
  lower?: number | readonly number[];
  /** Upper grid corner (default: the data maximum); the grid must contain every point. */
  upper?: number | readonly number[];
  /** Added to every cell's count before normalising (default 0.5; 0 gives the raw histogram). */
  pseudoCount?: number;
  /** Per-sample weights (counts); default 1 each. */
  weights?: ArrayLike<number>;
}

/** A fitted histogram density. */
export interface HistogramDensity extends Density {
  /** Bins per axis. */
  readonly bins: readonly number[];
  /** Lower corner of the grid. */
  readonly lower: Float64Array;
  /** Upper corner of the grid. */
  readonly upper: Float64Array;
  /** Smoothed cell probabilities, row-major (2-D: `[i * bins[1] + j]`). */
  readonly probabilities: Float64Array;
  /** Raw (weighted) counts per cell. */
  readonly counts: Float64Array;
}

/**
 * Most cells a histogram may have (all axes together): 2^22, two float64 arrays of 32 MiB.
 *
 * @example
 * ```ts
 * import { fitHistogram, MAX_HISTOGRAM_CELLS } from "./histogram.ts";
 * import assert from "node:assert/strict";
 * assert.equal(MAX_HISTOGRAM_CELLS, 4194304);
 * assert.throws(() => fitHistogram([[0, 0], [1, 1]], { bins: [1e5, 1e5] }), /limit is 4194304/);
 * ```
 */
export const MAX_HISTOGRAM_CELLS = 1 << 22;

/**
 * A histogram density: cell probability `(count + α) / (N + α B)` divided by the cell
 * volume inside the grid, and `-Infinity` outside it (a pseudo-count α > 0 keeps every
 * cell of the grid positive, which log-ratio and divergence estimates need). Sampling is
 * exact: a cell by its probability, then uniform in the cell. At most
 * {@linkcode MAX_HISTOGRAM_CELLS} cells in all; more bins are refused before any memory is
 * taken.
 *
 * References: Freedman & Diaconis 1981 (bin width 2 IQR n^(-1/3)); additive smoothing is
 * common practice (Laplace's rule for α = 1, Jeffreys' prior for α = 0.5).
 *
 * @example
 * ```ts
 * import { fitHistogram } from "./histogram.ts";
 * import { samples } from "../samples/samples.ts";
 * import assert from "node:assert/strict";
 * const h = fitHistogram([0.1, 0.2, 0.6, 0.9], { bins: 2, lower: 0, upper: 1, pseudoCount: 0 });
 * assert.deepEqual(Array.from(h.probabilities), [0.5, 0.5]);
 * assert.ok(Math.abs(h.logPdf(samples([0.3]))[0] - Math.log(1)) < 1e-15);
 * assert.equal(h.logPdf(samples([2]))[0], -Infinity);
 * ```
 */
export function fitHistogram(
  input: SamplesInput,
  options: HistogramOptions = {},
): HistogramDensity {
  const s = samples(input);
  const { n, d, data } = s;
  if (d !== 1 && d !== 2) {
    throw new SaddleError("invalid-argument", `histograms handle d = 1 or 2, got d = ${d}`, {
      parameter: "samples",
    });
  }
  if (n < 2) {
    throw new SaddleError("too-few-samples", `a histogram needs at least 2 points, got ${n}`, {
      parameter: "samples",
    });
  }
  const alpha = options.pseudoCount ?? 0.5;
  if (!(alpha >= 0) || !Number.isFinite(alpha)) {
    throw new SaddleError("invalid-argument", `pseudoCount must be >= 0, got ${alpha}`, {
      parameter: "pseudoCount",
    });
  }
  const w = options.weights;
  if (w && w.length !== n) {
    throw new SaddleError("dimension-mismatch", `${w.length} weights for ${n} points`, {
      parameter: "weights",
    });
  }
  const lower = new Float64Array(d), upper = new Float64Array(d);
  const bins: number[] = [];
  for (let c = 0; c < d; c++) {
    const col = Float64Array.from({ length: n }, (_, i) => data[i * d + c]).sort();
    lower[c] = pick(options.lower, c, d, "lower") ?? col[0];
    upper[c] = pick(options.upper, c, d, "upper") ?? col[n - 1];
    if (!(upper[c] > lower[c])) {
      throw new SaddleError(
        "invalid-argument",
        `axis ${c}: the grid has zero width (${lower[c]} to ${upper[c]}); give lower and upper`,
        { parameter: "upper", column: c },
      );
    }
    let b = pick(options.bins, c, d, "bins");
    if (b === undefined) {
      // Interpolated quartiles (numpy's default, type 7), as numpy's "fd" rule uses.
      const iqr = quantileSorted(col, 0.75) - quantileSorted(col, 0.25);
      const width = 2 * iqr * Math.pow(n, -1 / 3);
      b = width > 0 ? Math.ceil((upper[c] - lower[c]) / width) : Math.ceil(Math.sqrt(n));
      b = Math.max(1, Math.min(512, b));
    }
    if (!Number.isInteger(b) || b < 1) {
      throw new SaddleError("invalid-argument", `bins must be a positive integer, got ${b}`, {
        parameter: "bins",
      });
    }
    bins.push(b);
  }
  const B = bins.reduce((a, b) => a * b, 1);
  if (B > MAX_HISTOGRAM_CELLS) {
    throw new SaddleError(
      "invalid-argument",
      `bins ${d === 1 ? bins[0] : `[${bins.join(", ")}]`} make ${B} cells; the limit is ` +
        `${MAX_HISTOGRAM_CELLS} (2^22) cells in all (two float64 arrays of 32 MiB): use fewer ` +
        "bins (a histogram with far more cells than points is mostly empty cells anyway)",
      { parameter: "bins" },
    );
  }
  const counts = new Float64Array(B);
  let total = 0;
  for (let i = 0; i < n; i++) {
    let cell = 0;
    for (let c = 0; c < d; c++) {
      const v = data[i * d + c];
      if (v < lower[c] || v > upper[c]) {
        throw new SaddleError(
          "invalid-argument",
          `value ${v} lies outside the grid [${lower[c]}, ${upper[c]}]; widen lower/upper`,
          { row: i, column: c, parameter: "lower" },
        );
      }
      cell = cell * bins[c] + binOf(v, lower[c], upper[c], bins[c]);
    }
    const wi = w ? w[i] : 1;
    if (!(wi >= 0) || wi === Infinity) {
      throw new SaddleError("invalid-argument", `weight ${i} is ${wi}; weights must be >= 0`, {
        parameter: "weights",
      });
    }
    counts[cell] += wi;
    total += wi;
  }
  const denom = total + alpha * B;
  if (!(denom > 0)) {
    throw new SaddleError("invalid-argument", "all weights are 0 and pseudoCount is 0", {
      parameter: "weights",
    });
  }
  const probabilities = counts.map((v) => (v + alpha) / denom);
  return new Histogram({ bins, lower, upper, probabilities, counts, alpha });
}

function binOf(v: number, lo: number, hi: number, b: number): number {
  return Math.min(b - 1, Math.floor(((v - lo) / (hi - lo)) * b));
}

function pick(
  v: number | readonly number[] | undefined,
  c: number,
  d: number,
  name: string,
): number | undefined {
  if (v === undefined) return undefined;
  if (typeof v === "number") return v;
  if (v.length !== d) {
    throw new SaddleError("dimension-mismatch", `${name} needs ${d} entries, got ${v.length}`, {
      parameter: name,
    });
  }
  return v[c];
}

class Histogram implements HistogramDensity {
  readonly d: number;
  readonly #logCell: Float64Array;
  readonly #alpha: number;

  readonly bins: readonly number[];
  readonly lower: Float64Array;
  readonly upper: Float64Array;
  readonly probabilities: Float64Array;
  readonly counts: Float64Array;

  constructor(
    { bins, lower, upper, probabilities, counts, alpha }: {
      bins: readonly number[];
      lower: Float64Array;
      upper: Float64Array;
      probabilities: Float64Array;
      counts: Float64Array;
      alpha: number;
    },
  ) {
    this.bins = bins;
    this.lower = lower;
    this.upper = upper;
    this.probabilities = probabilities;
    this.counts = counts;
    this.d = bins.length;
    let logVol = 0;
    for (let c = 0; c < this.d; c++) logVol += Math.log((upper[c] - lower[c]) / bins[c]);
    this.#logCell = probabilities.map((p) => Math.log(p) - logVol);
    this.#alpha = alpha;
  }

  logPdf(x: Samples): Float64Array {
    checkQuery(x, this.d, "histogram");
    const { d, bins, lower, upper } = this;
    const out = new Float64Array(x.n);
    for (let r = 0; r < x.n; r++) {
      let cell = 0, inside = true;
      for (let c = 0; c < d && inside; c++) {
        const v = x.data[r * d + c];
        inside = v >= lower[c] && v <= upper[c];
        cell = cell * bins[c] + binOf(v, lower[c], upper[c], bins[c]);
      }
      out[r] = inside ? this.#logCell[cell] : -Infinity;
    }
    return out;
  }

  sample(n: number, seed: RandomSource): Samples {
    checkSampleSize(n);
    const rng = toRng(seed);
    const pickCell = rng.categoricalSampler(this.probabilities);
    const { d, bins, lower, upper } = this;
    const out = new Float64Array(n * d);
    for (let r = 0; r < n; r++) {
      let cell = pickCell();
      for (let c = d - 1; c >= 0; c--) {
        const idx = cell % bins[c];
        cell = Math.floor(cell / bins[c]);
        const width = (upper[c] - lower[c]) / bins[c];
        out[r * d + c] = lower[c] + (idx + rng.uniform()) * width;
      }
    }
    return fromBuffer(out, d);
  }

  /** Rich notebook display: the description's parameter table. */
  [JUPYTER_DISPLAY](): MimeBundle {
    return densityBundle(this);
  }

  describe(): DensityDescription {
    let total = 0;
    for (const c of this.counts) total += c;
    return description("histogram", this.d, {
      bins: [...this.bins],
      lower: Array.from(this.lower),
      upper: Array.from(this.upper),
      pseudoCount: this.#alpha,
      total,
      emptyCells: this.counts.filter((c) => c === 0).length,
    }, this.#alpha === 0 ? ["pseudoCount 0: empty cells have log-density -Infinity"] : []);
  }
}
