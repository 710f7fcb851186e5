/**
 * k-means++ seeding followed by a few Lloyd iterations (private: initialises EM).
 *
 * @module
 */
import type { Rng } from "../random/rng.ts";

/**
 * `k` centres (row-major k x d) by k-means++ (first uniformly, each next with probability
 * proportional to the squared distance to the nearest chosen centre), refined by `lloyd`
 * Lloyd iterations. Also returns the final hard labels.
 *
 * References: Arthur & Vassilvitskii 2007, k-means++: the advantages of careful seeding
 * (SODA); Lloyd 1982.
 */
export function kmeansPlusPlus(
  { x, n, d, k, rng, lloyd = 10 }: {
    x: Float64Array;
    n: number;
    d: number;
    k: number;
    rng: Rng;
    lloyd?: number;
  },
): { centres: Float64Array; labels: Int32Array } {
  const centres = new Float64Array(k * d);
  const dist = new Float64Array(n).fill(Infinity);
  const labels = new Int32Array(n);
  let c = rng.integer(n);
  for (let j = 0; j < k; j++) {
    for (let a = 0; a < d; a++) centres[j * d + a] = x[c * d + a];
    let total = 0;
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let a = 0; a < d; a++) {
        const t = x[i * d + a] - centres[j * d + a];
        s += t * t;
      }
      if (s < dist[i]) {
        dist[i] = s;
        labels[i] = j;
      }
      total += dist[i];
    }
    if (j === k - 1) break;
    // All points coincide with chosen centres: any point will do.
    if (!(total > 0)) {
      c = rng.integer(n);
      continue;
    }
    let u = rng.uniform() * total;
    c = n - 1;
    for (let i = 0; i < n; i++) {
      u -= dist[i];
      if (u < 0) {
        c = i;
        break;
      }
    }
  }
  const sums = new Float64Array(k * d), counts = new Float64Array(k);
  for (let it = 0; it < lloyd; it++) {
    sums.fill(0);
    counts.fill(0);
    for (let i = 0; i < n; i++) {
      const j = labels[i];
      counts[j]++;
      for (let a = 0; a < d; a++) sums[j * d + a] += x[i * d + a];
    }
    for (let j = 0; j < k; j++) {
      if (counts[j] > 0) {
        for (let a = 0; a < d; a++) centres[j * d + a] = sums[j * d + a] / counts[j];
      }
    }
    let changed = 0;
    for (let i = 0; i < n; i++) {
      let best = Infinity, bj = 0;
      for (let j = 0; j < k; j++) {
        let s = 0;
        for (let a = 0; a < d; a++) {
          const t = x[i * d + a] - centres[j * d + a];
          s += t * t;
        }
        if (s < best) {
          best = s;
          bj = j;
        }
      }
      if (labels[i] !== bj) changed++;
      labels[i] = bj;
    }
    if (changed === 0) break;
  }
  return { centres, labels };
}
