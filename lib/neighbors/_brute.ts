/**
 * Blocked brute-force k-NN: squared distances of row tiles through norms and a Gram block
 * (`‖q‖² + ‖r‖² − 2 q·r`), a bounded heap of a few more candidates than `k`, then the kept
 * candidates' distances recomputed directly and checked against the rounding bound, with a
 * direct scan for the rare query whose order the bound cannot settle.
 *
 * @module
 */
import { NeighborHeaps } from "./_heap.ts";
import { gramBlock, rowSquaredNorms } from "./pairwise.ts";

const TILE_Q = 128;
const TILE_R = 1024;

/** What {@linkcode bruteKnn} searches. */
export interface BruteSearch {
  /** Reference rows, `n x d`. */
  readonly ref: Float64Array;
  readonly n: number;
  /** Query rows, `m x d`. */
  readonly query: Float64Array;
  readonly m: number;
  readonly d: number;
  /** Query and reference are the same rows; each row excludes itself. */
  readonly self: boolean;
  /** Output heaps (capacity k), one per query row. */
  readonly out: NeighborHeaps;
}

/** Direct squared distance between row `i` of `a` and row `j` of `b`. */
export function directSquared(
  a: Float64Array,
  i: number,
  b: Float64Array,
  j: number,
  d: number,
): number {
  let s = 0;
  const ai = i * d, bj = j * d;
  for (let t = 0; t < d; t++) {
    const diff = a[ai + t] - b[bj + t];
    s += diff * diff;
  }
  return s;
}

/** Exact k nearest reference rows of every query row, into `search.out` (unsorted heaps). */
export function bruteKnn(search: BruteSearch): void {
  const { ref, n, query, m, d, self, out } = search;
  const k = out.cap;
  const avail = self ? n - 1 : n;
  const cand = new NeighborHeaps(m, Math.min(avail, k + Math.max(4, k)));
  const cap = cand.cap, cd = cand.dist, ci = cand.idx, cs = new Int32Array(m);
  const rn = rowSquaredNorms(ref, n, d), qn = self ? rn : rowSquaredNorms(query, m, d);
  let maxRn = 0;
  for (let j = 0; j < n; j++) if (rn[j] > maxRn) maxRn = rn[j];
  const g = new Float64Array(TILE_Q * TILE_R);
  for (let q0 = 0; q0 < m; q0 += TILE_Q) {
    const nq = Math.min(TILE_Q, m - q0);
    for (let r0 = 0; r0 < n; r0 += TILE_R) {
      const nr = Math.min(TILE_R, n - r0);
      gramBlock({ data: query, start: q0, rows: nq }, { data: ref, start: r0, rows: nr }, d, g);
      for (let a = 0; a < nq; a++) {
        const q = q0 + a, off = q * cap, base = a * nr;
        let size = cs[q];
        const qq = qn[q];
        for (let b = 0; b < nr; b++) {
          const r = r0 + b;
          if (self && r === q) continue;
          const s = qq + rn[r] - 2 * g[base + b];
          if (size < cap || s <= cd[off]) size = cand.offer(off, size, s, r);
        }
        cs[q] = size;
      }
    }
  }
  const eps = 2 ** -52, dist = out.dist;
  for (let q = 0; q < m; q++) {
    const off = q * cap, size = cs[q];
    // Exact distances of the candidates, into the output heap of size k.
    const o = q * k;
    let kept = 0;
    for (let c = 0; c < size; c++) {
      kept = out.offer(o, kept, directSquared(query, q, ref, ci[off + c], d), ci[off + c]);
    }
    if (size < cap) continue; // every reference row was a candidate
    // A row left out has approximate distance >= the worst candidate's; its exact distance
    // is at least that minus the rounding bound of the norm expansion.
    const bound = 4 * (d + 4) * eps * (qn[q] + maxRn);
    if (cd[off] - bound > dist[o]) continue;
    kept = 0;
    for (let r = 0; r < n; r++) {
      if (self && r === q) continue;
      const s = directSquared(query, q, ref, r, d);
      if (kept < k || s <= dist[o]) kept = out.offer(o, kept, s, r);
    }
  }
}
