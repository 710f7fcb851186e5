/**
 * The variational bound E_P[T] - E_Q[f*(T)] <= D_f(P || Q) for any critic, with equality
 * at T* = f'(p/q) (Nguyen, Wainwright & Jordan 2010; Nowozin et al. 2016, eq. 4-5).
 */
import assert from "node:assert/strict";
import { assertWithinSe } from "../_assert.ts";
import { gaussian } from "../../lib/density/mod.ts";
import {
  F_DIVERGENCES,
  fDivergence,
  type FDivergenceName,
  optimalCritic,
  variationalBound,
} from "../../lib/divergence/mod.ts";
import { Rng } from "../../lib/random/mod.ts";
import { type Samples, samples } from "../../lib/samples/mod.ts";

const p = gaussian(0, 1), q = gaussian(0.7, 1.44);
const names = Object.keys(F_DIVERGENCES) as FDivergenceName[];

Deno.test("variationalBound: equals D_f at the optimal critic T* within Monte Carlo error", () => {
  for (const name of names) {
    const exact = fDivergence(p, q, name, { method: "grid" }).value;
    const b = variationalBound(p, q, optimalCritic(p, q, name), name, { seed: 3, n: 20000 });
    assertWithinSe(b.value, exact, b.se!, 5, name);
  }
});

Deno.test("variationalBound: random quadratic critics through the activation stay below D_f", () => {
  const r = new Rng(17);
  for (const name of names) {
    const exact = fDivergence(p, q, name, { method: "grid" }).value;
    for (let k = 0; k < 5; k++) {
      const [a, b, c] = [r.normal(0, 0.5), r.normal(0, 1), r.normal(0, 1)];
      const critic = (x: Samples) => x.data.map((v) => a * v * v + b * v + c);
      const est = variationalBound(p, q, critic, name, { seed: k, n: 5000, activation: true });
      // A lower bound: never above the divergence beyond Monte Carlo error.
      assert.ok(
        est.value <= exact + 4 * (est.se ?? 0),
        `${name}: bound ${est.value} ± ${est.se} above D_f = ${exact}`,
      );
    }
  }
});

Deno.test("variationalBound: a critic outside the domain gives -Infinity with a note; bad input", () => {
  const x = samples([0, 1, 2]), y = samples([1, 2, 3]);
  const b = variationalBound(x, y, (s) => new Float64Array(s.n).fill(1), "gan");
  assert.equal(b.value, -Infinity);
  assert.match(b.notes.join(" "), /leaves the domain/);
  assert.throws(() => variationalBound(x, y, () => [NaN, 0, 0], "kl"), /NaN/);
  assert.throws(() => variationalBound(x, y, () => [0], "kl"), /returned 1 values/);
  assert.throws(() => variationalBound(x, samples([[1, 2]]), () => [0, 0, 0], "kl"), /d = 2/);
});
