/**
 * Agreement report: grid quadrature, Monte Carlo, closed forms and scipy's integrate.quad on
 * the same divergences. Run: `deno run -A tests/divergence/_agreement.ts` (needs Debian's
 * scipy under /usr/bin/python3). Prints one line per check and a summary.
 *
 * @module
 */
import { runReference } from "../_reference.ts";
import { gaussian } from "../../lib/density/mod.ts";
import { F_DIVERGENCES, fDivergence, gaussianKl } from "../../lib/divergence/mod.ts";
import { optimumDecomposition } from "../../lib/value/mod.ts";

const pairs: [number, number, number, number][] = [
  [0, 1, 1, 2],
  [0, 1, 0.8, 1.3],
  [-1, 0.5, 2, 1],
  [0, 1, 0.1, 1],
];
const names = [...Object.keys(F_DIVERGENCES), "alpha:0.5", "alpha:2"];
const cases = pairs.flatMap(([mp, sp, mq, sq]) =>
  names.map((s) => {
    const [name, a] = s.split(":");
    return { name, ...(a ? { alpha: Number(a) } : {}), p: [mp, sp], q: [mq, sq] };
  })
);
const ref = await runReference<{ gaussian: (number | null)[] }>("divergence_quad.py", {
  gaussian: cases,
});

let maxGridRel = 0, maxGridAbs = 0, maxZ = 0, covered = 0, total = 0;
const lines: string[] = [];
cases.forEach((c, i) => {
  const p = gaussian(c.p[0], c.p[1] ** 2), q = gaussian(c.q[0], c.q[1] ** 2);
  const opts = c.alpha !== undefined ? { alpha: c.alpha } : {};
  const g = fDivergence(p, q, c.name as "kl", { method: "grid", ...opts });
  const m = fDivergence(p, q, c.name as "kl", {
    method: "monte-carlo",
    seed: i,
    n: 20000,
    ...opts,
  });
  const s = ref.gaussian[i] ?? Infinity; // null: scipy's integral diverges
  if (s === Infinity) {
    lines.push(
      `${
        c.name.padEnd(20)
      } p=N(${c.p}) q=N(${c.q})  scipy diverges; grid ${g.value}, MC ${m.value} (${
        m.notes.filter((n) => /infinite/.test(n)).length ? "flagged" : "NOT flagged"
      })`,
    );
    return;
  }
  const abs = Math.abs(g.value - s), rel = abs / Math.max(Math.abs(s), 1e-300);
  const heavy = /variance may be infinite/.test(m.notes.join(" "));
  const z = Math.abs(m.value - s) / m.se!;
  total++;
  if (abs <= g.se!) covered++;
  maxGridAbs = Math.max(maxGridAbs, abs);
  maxGridRel = Math.max(maxGridRel, rel);
  if (!heavy) maxZ = Math.max(maxZ, z);
  lines.push(
    `${
      (c.name + (c.alpha !== undefined ? `(${c.alpha})` : "")).padEnd(20)
    } p=N(${c.p}) q=N(${c.q})  ` +
      `scipy ${s.toPrecision(10)}  grid-scipy ${(g.value - s).toExponential(2)} (bar ${
        g.se!.toExponential(1)
      })  MC-scipy ${(m.value - s).toExponential(2)} = ${z.toFixed(2)} se${
        heavy ? " [flagged heavy-tailed]" : ""
      }`,
  );
});

// Decomposition: grid vs Monte Carlo on every term, against scipy's JSD.
const decLines: string[] = [];
let maxDecZ = 0;
pairs.forEach(([mp, sp, mq, sq], k) => {
  const p = gaussian(mp, sp * sp), q = gaussian(mq, sq * sq);
  const gr = optimumDecomposition(p, q, { method: "grid" });
  const mc = optimumDecomposition(p, q, { method: "monte-carlo", seed: k, n: 20000 });
  const s = ref.gaussian[k * names.length + names.indexOf("jensen-shannon")]!;
  const z = Math.abs(mc.jsd.value - gr.jsd.value) / mc.jsd.se!;
  maxDecZ = Math.max(maxDecZ, z);
  decLines.push(
    `JSD p=N(${mp},${sp}) q=N(${mq},${sq}): grid-scipy ${(gr.jsd.value - s).toExponential(2)}, ` +
      `MC-grid ${(mc.jsd.value - gr.jsd.value).toExponential(2)} = ${z.toFixed(2)} se; ` +
      `V grid ${gr.value.value.toFixed(6)} MC ${mc.value.value.toFixed(6)} ± ${
        mc.value.se!.toExponential(1)
      }; ` +
      `residuals ${gr.residual.value.toExponential(1)} / ${mc.residual.value.toExponential(1)}`,
  );
});

// KL in 2-D: closed form vs grid vs Monte Carlo.
const a = gaussian([0, 0], [1, 0.5, 0.5, 1.5]), b = gaussian([0.5, -0.3], [2, -0.3, -0.3, 1]);
const exact = gaussianKl(a, b);
const g2 = fDivergence(a, b, "kl", { method: "grid" });
const m2 = fDivergence(a, b, "kl", { method: "monte-carlo", seed: 1, n: 20000 });

console.log(lines.join("\n"));
console.log(decLines.join("\n"));
console.log(
  `KL 2-D: closed ${exact.toPrecision(12)}  grid-closed ${(g2.value - exact).toExponential(2)}  ` +
    `MC-closed ${(m2.value - exact).toExponential(2)} = ${
      (Math.abs(m2.value - exact) / m2.se!).toFixed(2)
    } se`,
);
console.log(
  `\nSUMMARY f-divergences (${total} cases): grid vs scipy max |diff| ${
    maxGridAbs.toExponential(2)
  }, ` +
    `max rel ${maxGridRel.toExponential(2)}, error bar covers scipy in ${covered}/${total}; ` +
    `Monte Carlo max |MC - scipy| / se = ${
      maxZ.toFixed(2)
    } (heavy-tailed flagged cases excluded); ` +
    `decomposition max |MC - grid| / se = ${maxDecZ.toFixed(2)}`,
);
