/**
 * Grids, plotting ranges and subsampling for figure builders.
 *
 * @module
 */
import type { Density } from "../density/types.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { quantileSorted } from "../estimate/bootstrap.ts";
import { toRng } from "../random/rng.ts";
import { fromBuffer, type Samples } from "../samples/samples.ts";
import type { AxisRange } from "./input_types.ts";

export type { AxisRange };

/** Points along one axis: `m` values from lo to hi inclusive. */
export function linspace(lo: number, hi: number, m: number): Float64Array {
  const out = new Float64Array(m);
  for (let i = 0; i < m; i++) out[i] = m === 1 ? lo : lo + ((hi - lo) * i) / (m - 1);
  return out;
}

/** A 1-D grid as Samples. */
export function grid1d(domain: AxisRange, m: number): Samples {
  return fromBuffer(linspace(domain[0], domain[1], m), 1);
}

/**
 * A 2-D grid of cell centres as Samples (row-major, x fastest, the first row at the low y),
 * the layout of Plot's contour mark with `x1, y1, x2, y2` given.
 */
export function grid2d(x: AxisRange, y: AxisRange, nx: number, ny: number): Samples {
  const data = new Float64Array(nx * ny * 2);
  for (let j = 0; j < ny; j++) {
    const yv = y[0] + ((j + 0.5) * (y[1] - y[0])) / ny;
    for (let i = 0; i < nx; i++) {
      const k = (j * nx + i) * 2;
      data[k] = x[0] + ((i + 0.5) * (x[1] - x[0])) / nx;
      data[k + 1] = yv;
    }
  }
  return fromBuffer(data, 2);
}

/** Values of column `j` of `s`. */
export function column(s: Samples, j: number): Float64Array {
  const out = new Float64Array(s.n);
  for (let i = 0; i < s.n; i++) out[i] = s.data[i * s.d + j];
  return out;
}

/**
 * A plotting range per coordinate that holds the bulk of every sample set: the 0.2 % and
 * 99.8 % quantiles over all points, widened by `pad` of the span on each side. Densities
 * without samples are represented by `draws` seeded draws.
 */
export function plottingRange(
  sets: readonly Samples[],
  densities: readonly Density[] = [],
  { pad = 0.08, draws = 4000, seed = 0 }: { pad?: number; draws?: number; seed?: number } = {},
): AxisRange[] {
  const all = [...sets, ...(sets.length ? [] : densities.map((p, i) => p.sample(draws, seed + i)))];
  if (all.length === 0) {
    throw new SaddleError("empty", "no samples or densities to take a plotting range from", {
      parameter: "domain",
    });
  }
  const d = all[0].d;
  const out: AxisRange[] = [];
  for (let j = 0; j < d; j++) {
    const vals = Float64Array.from(all.flatMap((s) => Array.from(column(s, j)))).sort();
    let lo = quantileSorted(vals, 0.002), hi = quantileSorted(vals, 0.998);
    if (!(hi > lo)) {
      lo -= 0.5;
      hi += 0.5;
    }
    const w = hi - lo;
    out.push([lo - pad * w, hi + pad * w]);
  }
  return out;
}

/** At most `max` rows of `s`, chosen by a seeded permutation (all rows when n <= max). */
export function subsampleRows(s: Samples, max: number, seed: number | string): number[] {
  if (s.n <= max) return Array.from({ length: s.n }, (_, i) => i);
  const perm = toRng(seed).permutation(s.n);
  return Array.from(perm.subarray(0, max)).sort((a, b) => a - b);
}

/** Check that `s` has dimension `d`, naming the input. */
export function requireDimension(s: { d: number }, d: number, name: string): void {
  if (s.d !== d) {
    throw new SaddleError(
      "dimension-mismatch",
      `${name} has d = ${s.d}, this figure needs d = ${d}` +
        (s.d > d ? "; pick columns first with selectColumns" : ""),
      { parameter: name },
    );
  }
}

/**
 * Density thresholds of highest-density regions from density values on a regular grid:
 * for each mass fraction `f`, the level t such that the cells with density >= t hold a
 * share `f` of the grid's total mass (cells of equal area, so values stand for masses).
 * Fractions must lie in (0, 1); the levels come back in the order given.
 */
export function hdrThresholds(values: ArrayLike<number>, fractions: readonly number[]): number[] {
  const sorted = Float64Array.from(values).filter(Number.isFinite).sort().reverse();
  let total = 0;
  for (const v of sorted) total += v;
  return fractions.map((f) => {
    if (!(f > 0 && f < 1)) {
      throw new SaddleError("invalid-argument", `mass fractions must be in (0, 1), got ${f}`, {
        parameter: "levels",
      });
    }
    let acc = 0;
    for (const v of sorted) {
      acc += v;
      if (acc >= f * total) return v;
    }
    return sorted[sorted.length - 1];
  });
}
