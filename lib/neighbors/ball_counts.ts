/**
 * Fixed-radius membership: for each query point, how many balls `B(c_i, r_i)` contain it.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import {
  assertSameDimension,
  isSamples,
  type Samples,
  samples,
  type SamplesInput,
} from "../samples/mod.ts";
import { gramBlock, rowSquaredNorms } from "./pairwise.ts";

const TILE_Q = 256;
const TILE_C = 1024;

/**
 * For every query point `q`, the number of centres `c_i` with `‖q − c_i‖ ≤ radii[i]` (closed
 * balls). Blocked over tiles of both sets; squared distances through norms and dense
 * products, so a point within about 1e-15 relative of a sphere may fall either way.
 *
 * @example
 * ```ts
 * import { ballCounts } from "./ball_counts.ts";
 * import assert from "node:assert/strict";
 * const counts = ballCounts([[0], [10]], [1, 5], [[0.5], [7], [20]]);
 * assert.deepEqual(Array.from(counts), [1, 1, 0]);
 * ```
 */
export function ballCounts(
  centres: SamplesInput,
  radii: ArrayLike<number>,
  query: SamplesInput,
): Int32Array {
  const c = isSamples(centres) ? centres : samples(centres, { source: "centres" });
  const q: Samples = isSamples(query) ? query : samples(query, { source: "query" });
  assertSameDimension(c, q, "centres", "query");
  if (radii.length !== c.n) {
    throw new SaddleError(
      "dimension-mismatch",
      `${radii.length} radii for ${c.n} centres; give one radius per centre`,
      { parameter: "radii" },
    );
  }
  const r2 = new Float64Array(c.n);
  for (let i = 0; i < c.n; i++) {
    if (!(radii[i] >= 0) || !Number.isFinite(radii[i])) {
      throw new SaddleError("invalid-argument", `radius ${i} is ${radii[i]}; radii must be >= 0`, {
        parameter: "radii",
        row: i,
      });
    }
    r2[i] = radii[i] * radii[i];
  }
  const d = c.d;
  const cn = rowSquaredNorms(c.data, c.n, d), qn = rowSquaredNorms(q.data, q.n, d);
  const counts = new Int32Array(q.n);
  const g = new Float64Array(TILE_Q * TILE_C);
  for (let q0 = 0; q0 < q.n; q0 += TILE_Q) {
    const nq = Math.min(TILE_Q, q.n - q0);
    for (let c0 = 0; c0 < c.n; c0 += TILE_C) {
      const nc = Math.min(TILE_C, c.n - c0);
      gramBlock({ data: q.data, start: q0, rows: nq }, { data: c.data, start: c0, rows: nc }, d, g);
      for (let a = 0; a < nq; a++) {
        const qq = qn[q0 + a];
        let count = 0;
        for (let b = 0; b < nc; b++) {
          if (qq + cn[c0 + b] - 2 * g[a * nc + b] <= r2[c0 + b]) count++;
        }
        counts[q0 + a] += count;
      }
    }
  }
  return counts;
}
