/**
 * An exact k-d tree: median splits on the widest side of each node's bounding box, leaves
 * of up to 16 points, best-first descent with box-distance pruning.
 *
 * @module
 */
import type { NeighborHeaps } from "./_heap.ts";

const LEAF = 16;

interface Tree {
  readonly d: number;
  /** Reference rows in tree order (row-major copy). */
  readonly points: Float64Array;
  /** Original row index of each tree-order row. */
  readonly perm: Int32Array;
  readonly start: Int32Array;
  readonly end: Int32Array;
  readonly left: Int32Array;
  readonly right: Int32Array;
  /** Bounding box of each node: `lo` then `hi`, `2 d` values per node. */
  readonly box: Float64Array;
  readonly nodes: number;
}

/** Build a tree over the `n x d` rows of `data`. */
export function buildTree(data: Float64Array, n: number, d: number, copy = true): Tree {
  const perm = new Int32Array(n);
  for (let i = 0; i < n; i++) perm[i] = i;
  const maxNodes = 2 * Math.ceil(n / (LEAF / 2)) + 1;
  const start = new Int32Array(maxNodes), end = new Int32Array(maxNodes);
  const left = new Int32Array(maxNodes).fill(-1), right = new Int32Array(maxNodes).fill(-1);
  const box = new Float64Array(maxNodes * 2 * d);
  let nodes = 0;
  const stack: number[] = [];
  const make = (s: number, e: number): number => {
    const id = nodes++;
    start[id] = s;
    end[id] = e;
    const o = id * 2 * d;
    for (let t = 0; t < d; t++) {
      box[o + t] = Infinity;
      box[o + d + t] = -Infinity;
    }
    for (let i = s; i < e; i++) {
      const r = perm[i] * d;
      for (let t = 0; t < d; t++) {
        const v = data[r + t];
        if (v < box[o + t]) box[o + t] = v;
        if (v > box[o + d + t]) box[o + d + t] = v;
      }
    }
    return id;
  };
  stack.push(make(0, n));
  while (stack.length) {
    const id = stack.pop()!;
    const s = start[id], e = end[id];
    if (e - s <= LEAF) continue;
    const o = id * 2 * d;
    let dim = 0, width = -1;
    for (let t = 0; t < d; t++) {
      const w = box[o + d + t] - box[o + t];
      if (w > width) {
        width = w;
        dim = t;
      }
    }
    if (!(width > 0)) continue; // all points equal: a leaf, however large
    const mid = (s + e) >> 1;
    select({ data, d, perm }, s, e - 1, mid, dim);
    left[id] = make(s, mid);
    right[id] = make(mid, e);
    stack.push(left[id], right[id]);
  }
  const points = new Float64Array(copy ? n * d : 0);
  if (copy) {
    for (let i = 0; i < n; i++) points.set(data.subarray(perm[i] * d, perm[i] * d + d), i * d);
  }
  return { d, points, perm, start, end, left, right, box, nodes };
}

/** Quickselect on coordinate `dim`: afterwards perm[s..k) <= perm[k] <= perm(k..e]. */
function select(
  pts: { data: Float64Array; d: number; perm: Int32Array },
  lo: number,
  hi: number,
  k: number,
  dim: number,
): void {
  const { data, d, perm } = pts;
  while (hi > lo) {
    const pivot = data[perm[(lo + hi) >> 1] * d + dim];
    let i = lo, j = hi;
    while (i <= j) {
      while (data[perm[i] * d + dim] < pivot) i++;
      while (data[perm[j] * d + dim] > pivot) j--;
      if (i <= j) {
        const t = perm[i];
        perm[i] = perm[j];
        perm[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return;
  }
}

/**
 * The nearest tree points to each query row, into `heaps` (capacity k; squared distances
 * and original indices, unsorted). `exclude(q)` (when given) is a reference row that query
 * `q` must not return.
 */
export function queryTree(
  tree: Tree,
  queries: { readonly data: Float64Array; readonly m: number },
  heaps: NeighborHeaps,
  exclude?: (q: number) => number,
): void {
  const { d, points, perm, start, end, left, right, box } = tree;
  const query = queries.data, m = queries.m, k = heaps.cap, dist = heaps.dist;
  const nodeStack = new Int32Array(tree.nodes + 1);
  const boundStack = new Float64Array(tree.nodes + 1);
  const order = queryOrder(query, m, d);
  for (let oi = 0; oi < m; oi++) {
    const q = order[oi];
    const qo = q * d, off = q * k;
    const skip = exclude ? exclude(q) : -1;
    let size = 0;
    let top = 0;
    nodeStack[top] = 0;
    boundStack[top++] = 0;
    while (top > 0) {
      top--;
      const id = nodeStack[top];
      const bound = boundStack[top];
      // Prune only when strictly farther: an equal distance may still win on the index.
      if (size === k && bound > dist[off]) continue;
      if (left[id] < 0) {
        for (let i = start[id]; i < end[id]; i++) {
          const orig = perm[i];
          if (orig === skip) continue;
          // Partial sums stop once past the current k-th distance (exact: the full sum
          // would only grow).
          const bound = size < k ? Infinity : dist[off];
          let s = 0;
          const po = i * d;
          for (let t = 0; t < d && s <= bound; t++) {
            const diff = query[qo + t] - points[po + t];
            s += diff * diff;
          }
          if (s <= bound) {
            size = heaps.offer(off, size, s, orig);
          }
        }
        continue;
      }
      const bl = boxDistance(box, left[id] * 2 * d, d, query, qo);
      const br = boxDistance(box, right[id] * 2 * d, d, query, qo);
      // Push the farther child first so the nearer one is searched first.
      if (bl <= br) {
        nodeStack[top] = right[id];
        boundStack[top++] = br;
        nodeStack[top] = left[id];
        boundStack[top++] = bl;
      } else {
        nodeStack[top] = left[id];
        boundStack[top++] = bl;
        nodeStack[top] = right[id];
        boundStack[top++] = br;
      }
    }
  }
}

/** Query rows in the leaf order of a k-d tree over them, so consecutive queries are near. */
function queryOrder(query: Float64Array, m: number, d: number): Int32Array {
  return buildTree(query, m, d, false).perm;
}

function boxDistance(box: Float64Array, o: number, d: number, q: Float64Array, qo: number): number {
  let s = 0;
  for (let t = 0; t < d; t++) {
    const v = q[qo + t];
    const lo = box[o + t], hi = box[o + d + t];
    const diff = v < lo ? lo - v : v > hi ? v - hi : 0;
    s += diff * diff;
  }
  return s;
}
