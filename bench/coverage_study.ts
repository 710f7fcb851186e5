/**
 * `deno task coverage [cell] [trials] [from]`: the seeded coverage study of the refit
 * bootstrap's intervals for the JSD (tests/_coverage.ts has the cells' truth and trials).
 * With a cell name ("1d-kde-n500-B100", ...) it runs that cell's trials `from .. trials - 1`
 * and appends one JSON line per trial to bench/coverage/<cell>.jsonl (cells run in separate
 * processes, in the background if need be; a trial already in the file is skipped). With
 * "summary" it prints the coverage per cell and method as a Markdown table from those files.
 * Without arguments it lists the cells.
 *
 * @module
 */
import {
  cellName,
  type CoverageCell,
  type CoverageTrial,
  coverageTrial,
  methodsOf,
  trueJsd,
} from "../tests/_coverage.ts";

/** The study's cells: 1-D and 2-D, KDE and mixture fits, n = 500 and 5000. */
export const CELLS: readonly CoverageCell[] = [
  { d: 1, fit: "kde", n: 500, replicates: 100 },
  { d: 1, fit: "kde", n: 5000, replicates: 100 },
  { d: 2, fit: "kde", n: 500, replicates: 100 },
  { d: 2, fit: "kde", n: 5000, replicates: 100 },
  { d: 1, fit: "mixture", n: 500, replicates: 40 },
  { d: 1, fit: "mixture", n: 5000, replicates: 40 },
  { d: 2, fit: "mixture", n: 500, replicates: 40 },
  { d: 2, fit: "mixture", n: 5000, replicates: 40 },
];

const OUT = new URL(Deno.env.get("SADDLEKIT_COVERAGE_DIR") ?? "./coverage/", import.meta.url);

function read(c: CoverageCell): CoverageTrial[] {
  try {
    return Deno.readTextFileSync(new URL(`${cellName(c)}.jsonl`, OUT)).split("\n")
      .filter((l) => l.trim()).map((l) => JSON.parse(l));
  } catch {
    return [];
  }
}

function summary(): void {
  const methods = ["percentile", "basic", "bc", "bca"];
  console.log(`| cell | true JSD | trials | ${methods.join(" | ")} |`);
  console.log(`| --- | --- | --- | ${methods.map(() => "---").join(" | ")} |`);
  for (const c of CELLS) {
    const rows = read(c);
    if (rows.length === 0) continue;
    const cov = methods.map((m) => {
      if (!methodsOf(c).includes(m as "bca")) return "not run";
      const k = rows.filter((r) => r.covered[m]).length;
      const p = k / rows.length;
      // Binomial se of the coverage.
      const se = Math.sqrt(p * (1 - p) / rows.length);
      const flag = p < 0.90 || p > 0.98 ? " (outside 0.90-0.98)" : "";
      return `${p.toFixed(3)} ± ${se.toFixed(3)}${flag}`;
    });
    console.log(
      `| ${cellName(c)} | ${trueJsd(c.d).toFixed(4)} | ${rows.length} | ${cov.join(" | ")} |`,
    );
  }
}

if (import.meta.main) {
  const [name, trialsArg, fromArg] = Deno.args;
  if (!name) {
    console.log(CELLS.map(cellName).join("\n"));
  } else if (name === "summary") {
    summary();
  } else {
    const cell = CELLS.find((c) => cellName(c) === name);
    if (!cell) throw new Error(`unknown cell ${name}; cells: ${CELLS.map(cellName).join(", ")}`);
    const trials = Number(trialsArg ?? 200), from = Number(fromArg ?? 0);
    Deno.mkdirSync(OUT, { recursive: true });
    const file = new URL(`${cellName(cell)}.jsonl`, OUT);
    const done = new Set(read(cell).map((r) => r.trial));
    const t0 = performance.now();
    for (let t = from; t < trials; t++) {
      if (done.has(t)) continue;
      const r = coverageTrial(cell, t);
      Deno.writeTextFileSync(file, JSON.stringify(r) + "\n", { append: true });
      const s = ((performance.now() - t0) / 1000).toFixed(0);
      console.error(`${cellName(cell)}: trial ${t + 1}/${trials} (${s} s)`);
    }
  }
}
