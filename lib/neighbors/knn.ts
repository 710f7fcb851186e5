/**
 * Exact k-nearest neighbours in Euclidean distance: a k-d tree for low dimensions and a
 * blocked brute-force search for high ones, chosen automatically.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";
import { htmlTable, textTable, withDisplay } from "../display/mod.ts";
import {
  assertSameDimension,
  isSamples,
  type Samples,
  samples,
  type SamplesInput,
} from "../samples/mod.ts";
import { NeighborHeaps } from "./_heap.ts";
import { buildTree, queryTree } from "./_kdtree.ts";
import { bruteKnn } from "./_brute.ts";

/** Search algorithm of {@linkcode kNearest} and {@linkcode kNearestSelf}. */
export type NeighborMethod = "auto" | "tree" | "brute";

/** Options of {@linkcode kNearest} and {@linkcode kNearestSelf}. */
export interface NeighborOptions {
  /** Number of neighbours per query point (default 1). */
  k?: number;
  /**
   * "tree" (k-d tree), "brute" (blocked brute force through dense products) or "auto"
   * (default): the tree up to 12 dimensions, brute force above. Both return the same
   * neighbours.
   */
  method?: NeighborMethod;
}

/**
 * The `k` nearest reference points of each query point, nearest first. Row `q` of the
 * `m x k` buffers belongs to query point `q`.
 */
export interface Neighbors {
  /** Number of query points. */
  readonly m: number;
  /** Neighbours per query point. */
  readonly k: number;
  /** Euclidean distances, `m x k` row-major, ascending in each row. */
  readonly distances: Float64Array;
  /** Reference row of each neighbour, `m x k` row-major. */
  readonly indices: Int32Array;
  /** The algorithm that ran. */
  readonly method: "tree" | "brute";
}

/** The dimension at and below which "auto" uses the k-d tree. */
export const TREE_MAX_DIMENSION = 12;

/**
 * The `k` nearest points of `reference` to every point of `query` (exact, Euclidean).
 *
 * Ties: neighbours are ordered by distance and, among equal distances, by the lower
 * reference row, so the result is unique and the same for both algorithms. Duplicate
 * points are kept: a reference point equal to the query is a neighbour at distance 0.
 * Distances are computed directly as `sqrt(Σ (q_t − r_t)²)` (the brute-force search ranks
 * candidates through dense products, then recomputes them directly).
 *
 * @example
 * ```ts
 * import { kNearest } from "./knn.ts";
 * import assert from "node:assert/strict";
 * const nb = kNearest([[0], [1], [3]], [[0.9], [2]], { k: 2 });
 * assert.deepEqual(Array.from(nb.indices), [1, 0, 1, 2]); // 2 is as near to 1 as to 3: lower row first
 * assert.deepEqual(Array.from(nb.distances).map((x) => +x.toFixed(12)), [0.1, 0.9, 1, 1]);
 * ```
 */
export function kNearest(
  reference: SamplesInput,
  query: SamplesInput,
  options: NeighborOptions = {},
): Neighbors {
  const ref = toSamples(reference, "reference");
  const q = toSamples(query, "query");
  assertSameDimension(ref, q, "reference", "query");
  const k = checkK(options.k ?? 1, ref.n, false);
  return search(ref, q, k, false, options.method ?? "auto");
}

/**
 * The `k` nearest other points of every point of `points`: each point's own row is
 * excluded (a duplicate of it in another row is kept, at distance 0). Ties are ordered by
 * the lower row, as in {@linkcode kNearest}.
 *
 * @example
 * ```ts
 * import { kNearestSelf } from "./knn.ts";
 * import assert from "node:assert/strict";
 * const nb = kNearestSelf([[0, 0], [0, 1], [5, 5]], { k: 1 });
 * assert.deepEqual(Array.from(nb.indices), [1, 0, 1]);
 * ```
 */
export function kNearestSelf(points: SamplesInput, options: NeighborOptions = {}): Neighbors {
  const p = toSamples(points, "points");
  const k = checkK(options.k ?? 1, p.n, true);
  return search(p, p, k, true, options.method ?? "auto");
}

function search(
  ref: Samples,
  q: Samples,
  k: number,
  self: boolean,
  method: NeighborMethod,
): Neighbors {
  if (method !== "auto" && method !== "tree" && method !== "brute") {
    throw new SaddleError(
      "invalid-argument",
      `unknown method "${method}"; use "auto", "tree" or "brute"`,
      { parameter: "method" },
    );
  }
  const d = ref.d, m = q.n;
  const use = method === "auto" ? (d <= TREE_MAX_DIMENSION ? "tree" : "brute") : method;
  const heaps = new NeighborHeaps(m, k);
  if (use === "tree") {
    const tree = buildTree(ref.data, ref.n, d);
    queryTree(tree, { data: q.data, m }, heaps, self ? (i: number) => i : undefined);
  } else {
    bruteKnn({ ref: ref.data, n: ref.n, query: q.data, m, d, self, out: heaps });
  }
  const { dist, idx } = heaps;
  for (let i = 0; i < m; i++) {
    heaps.sort(i * k, k);
    for (let c = 0; c < k; c++) dist[i * k + c] = Math.sqrt(dist[i * k + c]);
  }
  return Object.freeze(
    withDisplay({ m, k, distances: dist, indices: idx, method: use }, neighborsBundle),
  );
}

function neighborsBundle(nb: Neighbors) {
  const shown = Math.min(nb.m, 8);
  const header = ["query", ...Array.from({ length: nb.k }, (_, c) => `neighbour ${c + 1}`)];
  const rows = Array.from({ length: shown }, (_, i) => [
    String(i),
    ...Array.from(
      { length: nb.k },
      (_, c) => `${nb.indices[i * nb.k + c]} (${+nb.distances[i * nb.k + c].toPrecision(4)})`,
    ),
  ]);
  const caption = `${nb.k} nearest neighbours of ${nb.m} points by ${nb.method}` +
    (nb.m > shown ? ` (first ${shown} shown: row (distance))` : ": row (distance)");
  return {
    "text/plain": `${caption}\n${textTable(header, rows)}`,
    "text/html": htmlTable(header, rows, caption),
  };
}

function toSamples(x: SamplesInput, name: string): Samples {
  return isSamples(x) ? x : samples(x, { source: name });
}

function checkK(k: number, n: number, self: boolean): number {
  if (!Number.isInteger(k) || k < 1) {
    throw new SaddleError("invalid-argument", `k must be an integer >= 1, got ${k}`, {
      parameter: "k",
    });
  }
  const avail = self ? n - 1 : n;
  if (k > avail) {
    throw new SaddleError(
      "too-few-samples",
      `k = ${k} neighbours asked but only ${avail} ${self ? "other " : ""}points exist; ` +
        `lower k below ${avail + 1} or give more points`,
      { parameter: "k" },
    );
  }
  return k;
}
