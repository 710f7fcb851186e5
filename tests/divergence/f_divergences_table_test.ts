/**
 * The f-divergence table against its own definitions: the conjugate is the supremum
 * sup_u (t u - f(u)) (Nowozin et al. 2016, eq. 3; found here numerically by golden-section
 * search), the critic is f' (finite differences), and the log forms equal f(e^r).
 */
import assert from "node:assert/strict";
import { assertClose } from "../_assert.ts";
import {
  alphaDivergence,
  F_DIVERGENCES,
  type FDivergenceSpec,
  fDivergenceSpec,
} from "../../lib/divergence/mod.ts";

const rows: FDivergenceSpec[] = [
  ...Object.values(F_DIVERGENCES),
  alphaDivergence(0.5),
  alphaDivergence(2),
  alphaDivergence(3),
  alphaDivergence(-1),
];

/** Max of a concave function on [lo, hi] by golden-section search. */
function goldenMax(g: (x: number) => number, lo: number, hi: number): number {
  const phi = (Math.sqrt(5) - 1) / 2;
  let a = lo, b = hi;
  let c = b - phi * (b - a), d = a + phi * (b - a);
  for (let i = 0; i < 200; i++) {
    if (g(c) > g(d)) b = d;
    else a = c;
    c = b - phi * (b - a);
    d = a + phi * (b - a);
  }
  return g(0.5 * (a + b));
}

Deno.test("table: f*(t) is sup_u (t u - f(u)) at points inside the domain (Nowozin et al. 2016)", () => {
  for (const s of rows) {
    // Points t = f'(u) for u in a spread of ratios are inside the domain by construction.
    for (const u of [0.2, 0.7, 1.5, 4]) {
      const t = s.criticFromLogRatio(Math.log(u));
      // tu - f(u) is concave in u; search in log u for scale-free accuracy.
      const sup = goldenMax((z) => t * Math.exp(z) - s.f(Math.exp(z)), -12, 12);
      assertClose(s.conjugate(t), sup, { abs: 1e-9, rel: 1e-8 }, `${s.label}, u = ${u}`);
      // Fenchel–Young equality at the optimum: f*(f'(u)) = u f'(u) - f(u).
      assertClose(s.conjugate(t), t * u - s.f(u), { abs: 1e-12, rel: 1e-10 }, s.label);
    }
  }
});

Deno.test("table: T* = f'(u) matches a central finite difference of f", () => {
  for (const s of rows) {
    if (s.name === "total-variation") continue; // f is not differentiable at 1; checked below
    for (const u of [0.3, 0.9, 2.5]) {
      const h = 1e-6 * u;
      const fd = (s.f(u + h) - s.f(u - h)) / (2 * h);
      assertClose(s.criticFromLogRatio(Math.log(u)), fd, { rel: 1e-6, abs: 1e-8 }, s.label);
    }
  }
  const tv = F_DIVERGENCES["total-variation"];
  assert.deepEqual([tv.criticFromLogRatio(-1), tv.criticFromLogRatio(1)], [-0.5, 0.5]);
});

Deno.test("table: log forms equal f(e^r), perspective e^-r f(e^r), and the limits", () => {
  for (const s of rows) {
    for (const r of [-3, -0.5, 0, 0.7, 2.5]) {
      const u = Math.exp(r);
      assertClose(s.fLog(r), s.f(u), { rel: 1e-10, abs: 1e-13 }, `${s.label} fLog(${r})`);
      assertClose(s.fPerspectiveLog(r), s.f(u) / u, { rel: 1e-10, abs: 1e-13 }, s.label);
    }
    // f(1) = 0 except for the GAN row, where f(1) = -ln 4.
    assertClose(s.f(1), s.name === "gan" ? -Math.log(4) : 0, { abs: 1e-15 }, s.label);
    assertClose(s.fLog(-40), s.fAtZero, { rel: 1e-6, abs: 1e-12 }, `${s.label} f(0)`);
    const far = s.fPerspectiveLog(60);
    if (s.slopeAtInfinity === Infinity) assert.ok(far > 30, s.label);
    else assertClose(far, s.slopeAtInfinity, { rel: 1e-6, abs: 1e-12 }, `${s.label} slope`);
    // The activation maps R into the domain.
    for (const v of [-20, -1, 0, 1, 20]) {
      const t = s.activation(v);
      assert.ok(t >= s.domain[0] && t <= s.domain[1], `${s.label}: activation(${v}) = ${t}`);
      assert.ok(Number.isFinite(s.conjugate(t)), `${s.label}: f*(${t})`);
    }
  }
});

Deno.test("table: conjugates are Infinity outside their domain; α rows reduce to known ones", () => {
  assert.equal(F_DIVERGENCES["reverse-kl"].conjugate(0.1), Infinity);
  assert.equal(F_DIVERGENCES.gan.conjugate(0), Infinity);
  assert.equal(F_DIVERGENCES["total-variation"].conjugate(0.6), Infinity);
  assert.equal(F_DIVERGENCES.neyman.conjugate(1), Infinity);
  assert.equal(alphaDivergence(0.5).conjugate(2), Infinity);
  // α = 2 is ½ Pearson, α = ½ is 2 × squared Hellinger (Cichocki & Amari 2010).
  assertClose(alphaDivergence(2).f(3.3), 0.5 * F_DIVERGENCES.pearson.f(3.3));
  assertClose(alphaDivergence(0.5).f(3.3), 2 * F_DIVERGENCES["squared-hellinger"].f(3.3));
  assert.equal(alphaDivergence(1), F_DIVERGENCES.kl);
  assert.equal(alphaDivergence(0), F_DIVERGENCES["reverse-kl"]);
  assert.throws(() => fDivergenceSpec("alpha"), /needs options.alpha/);
  assert.throws(() => fDivergenceSpec("chi2"), /unknown f-divergence/);
});
