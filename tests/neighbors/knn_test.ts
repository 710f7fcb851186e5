import assert from "node:assert/strict";
import { kNearest, kNearestSelf } from "../../lib/neighbors/mod.ts";
import { rng } from "../../lib/random/mod.ts";
import { fromBuffer, type Samples } from "../../lib/samples/mod.ts";
import type { SaddleError } from "../../lib/errors/mod.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";
import { assertAllClose } from "../_assert.ts";

/** Gaussian points rounded to a grid of 1/4, so exact ties and duplicates occur. */
function rounded(n: number, d: number, seed: number): Samples {
  const x = rng(seed).fillNormal(new Float64Array(n * d));
  return fromBuffer(x.map((v) => Math.round(v * 4) / 4), d);
}

/** The definition: every distance, sorted by (distance, row). */
function definition(ref: Samples, q: Samples, k: number, self: boolean) {
  const d = ref.d, idx: number[] = [], dist: number[] = [];
  for (let i = 0; i < q.n; i++) {
    const all: [number, number][] = [];
    for (let j = 0; j < ref.n; j++) {
      if (self && i === j) continue;
      let s = 0;
      for (let t = 0; t < d; t++) s += (q.data[i * d + t] - ref.data[j * d + t]) ** 2;
      all.push([s, j]);
    }
    all.sort((a, b) => a[0] - b[0] || a[1] - b[1]);
    for (let c = 0; c < k; c++) {
      dist.push(Math.sqrt(all[c][0]));
      idx.push(all[c][1]);
    }
  }
  return { dist, idx };
}

// Reference: the definition of k-NN (all distances sorted, ties to the lower row),
// computed directly; both algorithms must match it bit for bit, with ties and duplicates.
for (const d of [1, 2, 8, 64]) {
  Deno.test(`kNearest equals brute force exactly, d = ${d} (tree and blocked)`, () => {
    const ref = rounded(d > 8 ? 300 : 600, d, d), q = rounded(150, d, 100 + d);
    const want = definition(ref, q, 4, false), wantSelf = definition(ref, ref, 3, true);
    for (const method of ["tree", "brute"] as const) {
      const nb = kNearest(ref, q, { k: 4, method });
      assert.deepEqual(Array.from(nb.indices), want.idx, method);
      assert.deepEqual(Array.from(nb.distances), want.dist, method);
      const self = kNearestSelf(ref, { k: 3, method });
      assert.deepEqual(Array.from(self.indices), wantSelf.idx, `${method} self`);
      assert.deepEqual(Array.from(self.distances), wantSelf.dist, `${method} self`);
    }
  });
}

Deno.test("duplicates: the own row is excluded, a duplicate row is a neighbour at 0", () => {
  const nb = kNearestSelf([[1, 1], [1, 1], [3, 3]], { k: 1 });
  assert.deepEqual(Array.from(nb.indices), [1, 0, 0]);
  assert.deepEqual(Array.from(nb.distances).slice(0, 2), [0, 0]);
});

Deno.test("bad input: k too large, mismatched d, NaN", () => {
  assert.throws(
    () => kNearestSelf([[0], [1]], { k: 2 }),
    (e: SaddleError) => e.code === "too-few-samples",
  );
  assert.throws(
    () => kNearest([[0, 1]], [[0]]),
    (e: SaddleError) => e.code === "dimension-mismatch",
  );
  assert.throws(() => kNearest([[0], [NaN]], [[0]]), (e: SaddleError) => e.code === "non-finite");
  assert.throws(
    () => kNearest([[0]], [[0]], { k: 0 }),
    (e: SaddleError) => e.code === "invalid-argument",
  );
});

// Reference: Debian scipy's spatial.cKDTree.query (continuous data, so no ties).
Deno.test({
  name: "kNearest agrees with scipy cKDTree.query (d = 3 tree, d = 20 brute)",
  ignore: ignoreWithoutPython(["numpy", "scipy"]),
  fn: async () => {
    for (const d of [3, 20]) {
      const r = rng(40 + d);
      const ref = fromBuffer(r.fillNormal(new Float64Array(500 * d)), d);
      const q = fromBuffer(r.fillNormal(new Float64Array(200 * d)), d);
      const got = kNearest(ref, q, { k: 5 });
      const want = await runReference<{ dist: number[]; idx: number[] }>("feature_space.py", {
        task: "ckdtree",
        ref: ref.data,
        query: q.data,
        d,
        k: 5,
      });
      assert.deepEqual(Array.from(got.indices), want.idx);
      assertAllClose(got.distances, want.dist, { rel: 1e-12 });
    }
  },
});
