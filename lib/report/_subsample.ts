/**
 * A seeded subsample of rows, shared by the report's sections.
 *
 * @module
 */
import { rng } from "../random/mod.ts";
import { type Samples, takeRows } from "../samples/mod.ts";

/** At most `rows` rows of `s`, chosen by `seed`, in their original order. */
export function subsample(s: Samples, rows: number, seed: string): Samples {
  if (s.n <= rows) return s;
  const idx = rng(seed).permutation(s.n).subarray(0, rows);
  return takeRows(s, Uint32Array.from(idx).sort());
}
