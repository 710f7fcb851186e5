/**
 * Densities far apart on the grid (issue 9, high): every path gives JSD = ln 2, V(D*, G) = 0
 * and KL(p || m) = KL(q || m) = ln 2 for (numerically) disjoint supports (Arjovsky & Bottou
 * 2017, Thm. 2.3; Lin 1991 for the range), TV = 1 at most, never a silent NaN; moderate
 * separations agree with scipy's integrate.quad of the defining integral.
 */
import assert from "node:assert/strict";
import { assertClose } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";
import { fitKde, gaussian } from "../../lib/density/mod.ts";
import { divergenceFromSamples, fDivergence } from "../../lib/divergence/mod.ts";
import { decompositionFromSamples, optimumDecomposition } from "../../lib/value/mod.ts";

const LN2 = Math.LN2;

for (const sep of [3e5, 1e5]) {
  Deno.test(`far apart: optimumDecomposition of N(0,1) and N(${sep},1) on the grid`, () => {
    const dec = optimumDecomposition(gaussian(0, 1), gaussian(sep, 1));
    assert.equal(dec.method, "grid");
    assertClose(dec.jsd.value, LN2, { rel: 1e-9 }, "JSD");
    assertClose(dec.klRealMix.value, LN2, { rel: 1e-9 }, "KL(p_data || m)");
    assertClose(dec.klFakeMix.value, LN2, { rel: 1e-9 }, "KL(p_g || m)");
    assertClose(dec.value.value, 0, { abs: 1e-9 }, "V(D*, G)");
    for (const t of [dec.jsd, dec.klRealMix, dec.klFakeMix, dec.value]) {
      assert.ok(Number.isFinite(t.se!) && t.ci, `finite error bar: ${t.se}`);
      assert.ok(t.ci![1] <= LN2 && t.ci![0] >= -2 * LN2, `interval within range: ${t.ci}`);
      assert.equal(t.n, 0, "a quadrature rests on no sample: n = 0, cells in the notes");
    }
    assert.ok(dec.jsd.notes.some((n) => /cells/.test(n)));
  });

  Deno.test(`far apart: KDE fits 300 + 300 points ${sep} apart, every path`, () => {
    const a = gaussian(0, 1).sample(300, 1), b = gaussian(sep, 1).sample(300, 2);
    const p = fitKde(a), q = fitKde(b);
    const plug = optimumDecomposition(p, q);
    assertClose(plug.jsd.value, LN2, { rel: 1e-9 }, "plug-in JSD");
    assertClose(plug.klRealMix.value, LN2, { rel: 1e-9 }, "plug-in KL");
    assertClose(plug.klFakeMix.value, LN2, { rel: 1e-9 }, "plug-in KL");
    const tv = fDivergence(p, q, "total-variation");
    assertClose(tv.value, 1, { abs: 1e-9 }, "TV");
    assert.ok(tv.ci![1] <= 1, `TV interval ${tv.ci}`);
    assert.ok(!tv.notes.some((n) => /infinite/.test(n)), tv.notes.join("\n"));
    const dec = decompositionFromSamples(a, b, { replicates: 6, seed: 3 });
    assert.equal(dec.failed, 0);
    assertClose(dec.value.value, 0, { abs: 1e-9 }, "V from samples");
    assert.ok(Number.isFinite(dec.value.se!) && dec.value.ci!.every(Number.isFinite));
    const jsd = divergenceFromSamples(a, b, "jensen-shannon", { replicates: 6, seed: 3 });
    assertClose(jsd.value, LN2, { rel: 1e-9 }, "JSD from samples");
    assert.ok(jsd.ci![1] <= LN2, `JSD interval ${jsd.ci}`);
  });
}

Deno.test({
  name: "far apart: moderate separations on the grid vs scipy quad (JSD, KL, TV)",
  ignore: ignoreWithoutPython(["scipy"]),
  async fn() {
    const seps = [2, 6, 12, 25];
    const names = ["jensen-shannon", "total-variation", "kl"] as const;
    const cases = seps.flatMap((s) => names.map((name) => ({ name, p: [0, 1], q: [s, 1.5] })));
    const ref = await runReference<{ gaussian: (number | null)[] }>("divergence_quad.py", {
      gaussian: cases,
    });
    cases.forEach((c, k) => {
      const est = fDivergence(gaussian(0, 1), gaussian(c.q[0], c.q[1] ** 2), c.name);
      const want = ref.gaussian[k]!;
      // The grid's error bar, or 1e-9 relative where quad itself is the limit.
      const tol = Math.max(est.se! * 3, 1e-9 * Math.abs(want), 1e-12);
      assert.ok(
        Math.abs(est.value - want) <= tol,
        `${c.name} at ${c.q[0]}: ${est.value} vs quad ${want} (tol ${tol})`,
      );
    });
  },
});
