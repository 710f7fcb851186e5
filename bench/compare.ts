/**
 * `deno task bench:compare [filter]`: runs saddlekit and the reference libraries (Debian's
 * scipy / scikit-learn under /usr/bin/python3) on the same generated data in the same run
 * and prints one JSON object per line per case:
 * `{ "case", "saddlekit_s", "reference_s", "ratio", "max_rel_err" }` with
 * `ratio = saddlekit_s / reference_s`. Cases come from every `bench/_cases_*.ts` file; an
 * optional argument keeps only the cases whose name contains it. Without the reference
 * libraries, the reference side is skipped with a message on stderr.
 *
 * @module
 */
import { cases } from "./_compare_registry.ts";
import { hasPython, INSTALL_HINT, PYTHON } from "../tests/_reference.ts";

const dir = new URL(".", import.meta.url);
const files = [...Deno.readDirSync(dir)]
  .filter((e) => e.isFile && /^_cases_.*\.ts$/.test(e.name))
  .map((e) => e.name)
  .sort();
for (const f of files) await import(new URL(f, dir).href);

const filter = Deno.args[0] ?? "";
const selected = cases.filter((c) => c.name.includes(filter));
if (selected.length === 0) {
  console.error(`no bench case matches "${filter}"; cases: ${cases.map((c) => c.name).join(", ")}`);
  Deno.exit(1);
}
const warned = new Set<string>();
for (const c of selected) {
  const reference = c.python.length > 0 && hasPython(c.python);
  if (c.python.length > 0 && !reference) {
    const key = c.python.join("/");
    if (!warned.has(key)) {
      warned.add(key);
      console.error(
        `*** ${PYTHON} cannot import ${key}: reference timings are SKIPPED. Install with: ${INSTALL_HINT}`,
      );
    }
  }
  const r = await c.run(reference);
  const ratio = r.reference_s ? r.saddlekit_s / r.reference_s : null;
  console.log(JSON.stringify({
    case: c.name,
    saddlekit_s: round(r.saddlekit_s),
    reference_s: r.reference_s === null ? null : round(r.reference_s),
    ratio: ratio === null ? null : round(ratio),
    max_rel_err: r.max_rel_err,
  }));
  const verdict = ratio === null || c.target === undefined
    ? ""
    : ratio <= c.target
    ? ` (target <= ${c.target}: met)`
    : ` (target <= ${c.target}: MISSED)`;
  console.error(`  ${c.name}: ${r.note ?? ""}${verdict}`);
}

function round(v: number): number {
  return Math.round(v * 1e4) / 1e4;
}
