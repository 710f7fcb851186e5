/**
 * Seeded test and benchmark data shared by tests/ and bench/ (invented, for checks only).
 *
 * @module
 */
import { Rng } from "../lib/random/rng.ts";

/**
 * Row-major `n x d` normal data, bimodal in the first column (every third row shifted by
 * 3 after scaling by 2) and correlated in the second: a KDE workload with some structure.
 */
export function shiftedNormalData(n: number, d: number, seed: number): Float64Array {
  const r = new Rng(seed);
  const x = r.fillNormal(new Float64Array(n * d));
  for (let i = 0; i < n; i++) {
    x[i * d] = 2 * x[i * d] + (i % 3 === 0 ? 3 : 0);
    if (d > 1) x[i * d + 1] += 0.5 * x[i * d];
  }
  return x;
}
