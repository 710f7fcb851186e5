/**
 * The house holds: every import in lib/, mod.ts, scripts/, tests/ and bench/ follows the
 * layer order of lib/layers.json and the rules of DEVELOPERS.md ("Architecture"). The
 * checker itself is tested on in-memory file sets, so a planted break is proven to fail.
 */
import assert from "node:assert/strict";
import { checkHouse, formatViolation, parseImports } from "./_imports.ts";

const root = new URL("../", import.meta.url);
const layers: string[] = JSON.parse(
  await Deno.readTextFile(new URL("lib/layers.json", root)),
);

async function walk(dir: string, out: Map<string, string>): Promise<void> {
  for await (const e of Deno.readDir(new URL(dir, root))) {
    const path = `${dir}${e.name}`;
    if (e.isDirectory) {
      if (e.name !== "fixtures" && e.name !== "node_modules") await walk(`${path}/`, out);
    } else if (/\.(ts|tsx|js|mjs)$/.test(e.name)) {
      out.set(path, await Deno.readTextFile(new URL(path, root)));
    }
  }
}

Deno.test("architecture: every import follows lib/layers.json and the house rules", async () => {
  const files = new Map<string, string>();
  files.set("mod.ts", await Deno.readTextFile(new URL("mod.ts", root)));
  for (const dir of ["lib/", "scripts/", "tests/", "bench/"]) await walk(dir, files);
  assert.ok(files.size > 100, `only ${files.size} files found`);
  const violations = checkHouse(files, layers).map(formatViolation);
  assert.deepEqual(violations, [], `house rules broken:\n${violations.join("\n")}`);
});

Deno.test("architecture: lib/layers.json lists every lib/ folder once", async () => {
  assert.equal(new Set(layers).size, layers.length, "a folder is listed twice");
  for await (const e of Deno.readDir(new URL("lib/", root))) {
    if (e.isDirectory) assert.ok(layers.includes(e.name), `lib/${e.name} missing`);
  }
});

Deno.test("architecture: the parser finds every kind of import and skips comments and strings", () => {
  const src = [
    'import { a } from "./a.ts";',
    'import type { B } from "../b/b.ts";',
    'import "./side.ts";',
    'export * from "./c.ts";',
    'export type { D } from "./d.ts";',
    "export {",
    "  e,",
    '} from "./e.ts";',
    'const m = await import("./f.ts");',
    'const s = "import { x } from \\"./not.ts\\"";',
    'const t = `export * from "./nor.ts" ${import.meta.url}`;',
    '// import { y } from "./comment.ts";',
    '/* export * from "./block.ts"; */',
    'const r = /from "x"/;',
    'export const g = 1; export { h } from "./h.ts";',
    "/**",
    " * @example Use",
    " * ```ts",
    ' * import { z } from "./example.ts";',
    " * ```",
    " */",
  ].join("\n");
  assert.deepEqual(parseImports(src), [
    ...["./a.ts", "../b/b.ts", "./side.ts", "./c.ts", "./d.ts", "./e.ts", "./f.ts", "./h.ts"]
      .map((specifier) => ({ specifier, example: false })),
    { specifier: "./example.ts", example: true },
  ]);
});

Deno.test("architecture: the checker fails on each planted break", () => {
  const layers = ["errors", "samples", "density"];
  const ok = new Map([
    ["lib/errors/saddle_error.ts", "export class E {}"],
    ["lib/samples/samples.ts", 'import { E } from "../errors/saddle_error.ts";'],
    ["lib/density/_eval.ts", 'import type { S } from "../samples/samples.ts";'],
    ["lib/density/kde.ts", 'import { ev } from "./_eval.ts";'],
    ["tests/density/kde_test.ts", 'import { ev } from "../../lib/density/_eval.ts";'],
    ["scripts/demo.ts", 'import { k } from "../lib/density/kde.ts";'],
  ]);
  assert.deepEqual(checkHouse(ok, layers), []);
  const planted = (file: string, src: string) =>
    checkHouse(new Map([...ok, [file, src]]), layers).map(formatViolation);
  assert.deepEqual(
    planted("lib/samples/read.ts", 'import { k } from "../density/kde.ts";'),
    [
      'lib/samples/read.ts: import "../density/kde.ts": upward import: lib/samples (layer 1) ' +
      "may import only folders below it, not lib/density (layer 2)",
    ],
  );
  assert.match(
    planted(
      "lib/samples/read.ts",
      '/** @example\n * ```ts\n * import { k } from "../density/kde.ts";\n * ```\n */',
    )[0],
    /upward import.*JSDoc @example/,
  );
  assert.match(
    planted("lib/samples/read.ts", 'import { ev } from "../density/_eval.ts";').join("\n"),
    /private file: lib\/density\/_eval\.ts/,
  );
  assert.match(
    planted("tests/samples/x_test.ts", 'import type { ev } from "../../lib/density/_eval.ts";')[0],
    /private file/,
  );
  assert.match(
    planted("tests/x_test.ts", 'import "../scripts/demo.ts";')[0],
    /never import scripts/,
  );
  const cycle = checkHouse(
    new Map([
      ...ok,
      ["lib/samples/a.ts", 'import type { B } from "./b.ts";'],
      ["lib/samples/b.ts", 'export type { A } from "./a.ts";'],
    ]),
    layers,
  ).map(formatViolation);
  assert.deepEqual(cycle, [
    'lib/samples/b.ts: import "./a.ts": import cycle: lib/samples/a.ts -> lib/samples/b.ts -> ' +
    "lib/samples/a.ts",
  ]);
  assert.match(
    planted("lib/plot/figure.ts", "export const f = 1;")[0],
    /lib\/plot is missing from lib\/layers\.json/,
  );
});
