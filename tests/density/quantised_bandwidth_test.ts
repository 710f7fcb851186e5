/**
 * Bandwidth selectors on quantised data (issue 9): values rounded to 0.01 or 0.5 and
 * repeated points. "diffusion" counts N as the number of distinct values, as Botev,
 * Grotowski & Kroese (2010)'s published code does (checked against the numpy/scipy
 * implementation in tests/reference/density_botev.py); "cv" leaves every copy of the
 * held-out value out, so ties no longer push the bandwidth to 0.
 */
import assert from "node:assert/strict";
import { assertClose } from "../_assert.ts";
import { ignoreWithoutPython, runReference } from "../_reference.ts";
import { fitKde } from "../../lib/density/mod.ts";
import { fDivergence } from "../../lib/divergence/mod.ts";
import { Rng } from "../../lib/random/mod.ts";
import { fromBuffer } from "../../lib/samples/mod.ts";

function normals(n: number, seed: number, step = 0): Float64Array {
  const r = new Rng(seed);
  return Float64Array.from({ length: n }, () => {
    const v = r.normal();
    return step ? Math.round(v / step) * step : v;
  });
}

/** 500 normals, each value repeated 4 times (2000 points). */
function repeated(seed: number): Float64Array {
  const x = normals(500, seed);
  return Float64Array.from({ length: 2000 }, (_, i) => x[i >> 2]);
}

const h = (x: Float64Array, bandwidth: "diffusion" | "cv" | "scott") =>
  Math.sqrt(fitKde(fromBuffer(x, 1), { bandwidth }).bandwidth[0]);

Deno.test({
  name: "diffusion on rounded and repeated data vs numpy/scipy (Botev et al. 2010, unique N)",
  ignore: ignoreWithoutPython(["numpy", "scipy"]),
  async fn() {
    for (const x of [normals(1000, 3, 0.01), normals(1000, 4, 0.5), repeated(5)]) {
      const ref = await runReference<{ bandwidth: number }>("density_botev.py", { x });
      assertClose(h(x, "diffusion"), ref.bandwidth, { rel: 1e-8 });
    }
  },
});

Deno.test("diffusion and cv on quantised data stay near the normal-reference bandwidth", () => {
  // Normal reference for N(0, 1) (Silverman 1986, eq. 3.28): h = (4 / 3n)^(1/5); rounding to
  // 0.5 adds variance 1/48 (Sheppard's correction), negligible against the factor-2 bounds.
  for (
    const [name, x, n] of [
      ["0.01", normals(1000, 3, 0.01), 1000],
      ["0.5", normals(1000, 4, 0.5), 1000],
      ["repeated", repeated(5), 500],
    ] as const
  ) {
    const ref = Math.pow(4 / (3 * n), 0.2);
    for (const rule of ["diffusion", "cv"] as const) {
      const got = h(x, rule);
      // With 0.5 steps only about 15 distinct values remain: Botev's N = 15 gives a far
      // wider kernel (h near 1), which is the published method's answer; the check there
      // is only that it does not collapse below the rounding step.
      const ok = rule === "diffusion" && name === "0.5"
        ? got > 0.25 && got < 2
        : got > ref / 2.5 && got < ref * 2.5;
      assert.ok(ok, `${rule} on ${name}: h = ${got}, ref ${ref}`);
    }
  }
});

Deno.test("cv on rounded data: JSD between N(0,1) samples, one rounded to 0.5, stays small", () => {
  const a = fromBuffer(normals(1000, 7), 1), b = fromBuffer(normals(1000, 8, 0.5), 1);
  const jsd = (bw: "cv" | "scott") =>
    fDivergence(fitKde(a, { bandwidth: bw }), fitKde(b, { bandwidth: bw }), "jensen-shannon")
      .value;
  const scott = jsd("scott"), cv = jsd("cv");
  // Two samples of one distribution: only the sampling noise and the rounding remain.
  assert.ok(cv < 0.03, `cv JSD ${cv} (Scott ${scott})`);
  const notes = fitKde(b, { bandwidth: "cv" }).describe().notes;
  assert.ok(notes.some((n) => /exact copies/.test(n)), notes.join("\n"));
});
