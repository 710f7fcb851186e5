/**
 * Bounded max-heaps of (squared distance, index) pairs, one per query row, stored in two
 * typed arrays, with the neighbour order of the folder: nearer first, and among equal
 * distances the lower row index first.
 *
 * @module
 */

/** Whether (da, ia) comes after (db, ib) in neighbour order. */
export function after(da: number, ia: number, db: number, ib: number): boolean {
  return da > db || (da === db && ia > ib);
}

/** `rows` heaps of capacity `cap`; heap `q` occupies `[q * cap, (q + 1) * cap)`. */
export class NeighborHeaps {
  /** Squared distances. */
  readonly dist: Float64Array;
  /** Row indices. */
  readonly idx: Int32Array;
  /** Capacity of each heap. */
  readonly cap: number;

  /** Empty heaps for `rows` queries. */
  constructor(rows: number, cap: number) {
    this.cap = cap;
    this.dist = new Float64Array(rows * cap);
    this.idx = new Int32Array(rows * cap);
  }

  /**
   * Offer (dv, iv) to the heap at `off` that holds `size` entries; returns its new size. The
   * root (index `off`) is the worst kept entry.
   */
  offer(off: number, size: number, dv: number, iv: number): number {
    const dist = this.dist, idx = this.idx, cap = this.cap;
    if (size < cap) {
      let c = size;
      while (c > 0) {
        const p = (c - 1) >> 1;
        if (!after(dv, iv, dist[off + p], idx[off + p])) break;
        dist[off + c] = dist[off + p];
        idx[off + c] = idx[off + p];
        c = p;
      }
      dist[off + c] = dv;
      idx[off + c] = iv;
      return size + 1;
    }
    if (!after(dist[off], idx[off], dv, iv)) return size;
    let p = 0;
    for (;;) {
      const l = 2 * p + 1;
      if (l >= cap) break;
      const r = l + 1;
      let c = l;
      if (r < cap && after(dist[off + r], idx[off + r], dist[off + l], idx[off + l])) c = r;
      if (!after(dist[off + c], idx[off + c], dv, iv)) break;
      dist[off + p] = dist[off + c];
      idx[off + p] = idx[off + c];
      p = c;
    }
    dist[off + p] = dv;
    idx[off + p] = iv;
    return size;
  }

  /** Sort the `size` entries at `off` into neighbour order (insertion sort; size is small). */
  sort(off: number, size: number): void {
    const dist = this.dist, idx = this.idx;
    for (let a = 1; a < size; a++) {
      const dv = dist[off + a], iv = idx[off + a];
      let b = a - 1;
      while (b >= 0 && after(dist[off + b], idx[off + b], dv, iv)) {
        dist[off + b + 1] = dist[off + b];
        idx[off + b + 1] = idx[off + b];
        b--;
      }
      dist[off + b + 1] = dv;
      idx[off + b + 1] = iv;
    }
  }
}
