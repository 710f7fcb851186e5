/**
 * The report command as a user runs it: the README's plain `deno run` with the narrowest
 * permissions, exit codes (0 ran, 1 a claim fails, 2 bad input), the output folder's
 * files, every bad input named with its fix before any long computation, an existing
 * output folder, and an interrupted run (no report that looks complete is left).
 */
import assert from "node:assert/strict";
import { analyseCommand } from "../../lib/report/mod.ts";
import { analyseArgs, claimsFile, gaussianPair, runAnalyse } from "./_report.ts";

/** Run the command in-process, capturing what it prints on stderr. */
async function inProcess(args: string[]): Promise<{ code: number; err: string }> {
  const original = console.error;
  let err = "";
  console.error = (...a: unknown[]) => (err += a.join(" ") + "\n");
  try {
    const code = await analyseCommand(args, { print: () => {}, progress: false });
    return { code, err };
  } finally {
    console.error = original;
  }
}

const exists = (p: string) => Deno.stat(p).then(() => true, () => false);
const HAVE_SCRIPT = (() => {
  try {
    return Deno.statSync("/usr/bin/script").isFile;
  } catch {
    return false;
  }
})();

Deno.test("plain deno run with narrow permissions writes the report; exit 1 when a claim fails", async () => {
  const { dir, real, fake } = await gaussianPair({ n: 150, mean: 0.5, sd: 1, seed: 3 });
  const claims = await claimsFile(dir, [
    {
      statement: "JSD below 0.001",
      path: "estimates.optimum.jsd",
      comparison: "<",
      threshold: 0.001,
    },
  ]);
  const out = `${dir}/report`;
  const r = await runAnalyse([dir], out, [
    "--real",
    real,
    "--fake",
    fake,
    "--claims",
    claims,
    "--replicates",
    "10",
  ]);
  assert.equal(r.code, 1, r.stderr);
  assert.equal(r.stderr, "", "no progress when stderr is not a terminal");
  assert.match(r.stdout, /fails +JSD below 0\.001/);
  assert.match(r.stdout, new RegExp(`report: ${out}/index.html`));
  const names = [...Deno.readDirSync(out)].map((e) => e.name).sort();
  for (const f of ["index.html", "summary.json", "timings.json"]) assert.ok(names.includes(f), f);
  for (const fig of ["densities", "decomposition", "divergences"]) {
    assert.ok(names.includes(`${fig}.svg`) && names.includes(`${fig}.png`), fig);
  }
  assert.ok(!(await exists(`${out}.partial`)));
  // Rerunning into an earlier report replaces it without --force; exit 0 without claims.
  const again = await runAnalyse([dir], out, [
    "--real",
    real,
    "--fake",
    fake,
    "--replicates",
    "10",
    "--quiet",
  ]);
  assert.equal(again.code, 0, again.stderr);
  assert.equal(again.stdout, "");
  await Deno.remove(dir, { recursive: true });
});

Deno.test({
  name: "progress on stderr when it is a terminal (util-linux script gives a pseudo-terminal)",
  ignore: !HAVE_SCRIPT,
  async fn() {
    const { dir, real, fake } = await gaussianPair({ n: 100, mean: 0, sd: 1, seed: 4 });
    const out = `${dir}/report`;
    const cmd = [Deno.execPath(), ...analyseArgs([dir], out, ["--real", real, "--fake", fake])]
      .map((a) => `'${a}'`).join(" ");
    const r = await new Deno.Command("/usr/bin/script", {
      args: ["-qec", `${cmd} --replicates 10`, "/dev/null"],
      stdout: "piped",
      stderr: "piped",
    }).output();
    const text = new TextDecoder().decode(r.stdout);
    assert.equal(r.code, 0, text);
    assert.match(text, /density: decomposition at the optimum \d+%/);
    assert.match(text, /writing decomposition\.png/);
    await Deno.remove(dir, { recursive: true });
  },
});

Deno.test("bad input and usage exit 2 with a message naming the file and the fix, before any work", async () => {
  const { dir, real, fake } = await gaussianPair({ n: 60, mean: 0, sd: 1, seed: 5 });
  const out = `${dir}/out`;
  const base = ["--real", real, "--fake", fake, "--out", out, "--replicates", "10"];
  const cases: [string, string[], RegExp][] = [
    [
      "missing file",
      ["--real", `${dir}/nope.csv`, "--fake", fake, "--out", out],
      /nope\.csv.*not found/,
    ],
    ["a folder as input", ["--real", dir, "--fake", fake, "--out", out], /is a folder/],
    ["no --fake", ["--real", real], /--real and --fake are required/],
    ["flag without value", ["--real", real, "--fake"], /--fake needs a value/],
    ["unknown option", [...base, "--bogus", "1"], /unknown option --bogus/],
    ["bad seed", [...base, "--seed", "x"], /--seed must be a whole number/],
  ];
  // Mismatched dimensions.
  const wide = `${dir}/wide.csv`;
  await Deno.writeTextFile(wide, "a,b\n1,2\n3,4\n5,6\n");
  cases.push([
    "mismatched dimensions",
    ["--real", real, "--fake", wide, "--out", out],
    /d = 1.*d = 2|dimension/,
  ]);
  // Scores: invalid JSON, and the wrong count.
  const badScores = `${dir}/scores.json`;
  await Deno.writeTextFile(badScores, "{ not json");
  cases.push([
    "invalid scores file",
    [...base, "--scores", badScores],
    /scores\.json.*not valid JSON/,
  ]);
  const shortScores = `${dir}/short.csv`;
  await Deno.writeTextFile(shortScores, "side,score\nreal,0.5\nfake,0.5\n");
  cases.push([
    "scores of the wrong length",
    [...base, "--scores", shortScores],
    /short\.csv.*1 discriminator outputs on the real side.*60 rows/,
  ]);
  // Claims: unknown path, malformed comparison.
  const unknownPath = await claimsFile(dir, [
    { statement: "s", path: "estimates.optimum.jsdd", comparison: "<", threshold: 1 },
  ], "c1.json");
  cases.push([
    "claim with an unknown path",
    [...base, "--claims", unknownPath],
    /c1\.json.*claim 1: unknown path "estimates\.optimum\.jsdd"/,
  ]);
  const badCmp = await claimsFile(dir, [
    { statement: "s", path: "estimates.optimum.jsd", comparison: "=<", threshold: 1 },
  ], "c2.json");
  cases.push([
    "claim with a malformed comparison",
    [...base, "--claims", badCmp],
    /c2\.json.*"comparison" must be one of/,
  ]);
  const needsScores = await claimsFile(dir, [
    { statement: "s", path: "estimates.discriminator.value", comparison: "<", threshold: 1 },
  ], "c3.json");
  cases.push([
    "claim on a section that does not run",
    [...base, "--claims", needsScores],
    /unknown path "estimates\.discriminator\.value"/,
  ]);
  // Output path: an existing file; a folder with other files.
  const file = `${dir}/taken`;
  await Deno.writeTextFile(file, "x");
  cases.push([
    "output path is a file",
    ["--real", real, "--fake", fake, "--out", file],
    /taken.*is a file/,
  ]);
  const busy = `${dir}/busy`;
  await Deno.mkdir(busy);
  await Deno.writeTextFile(`${busy}/notes.txt`, "mine");
  cases.push([
    "output folder with other files",
    ["--real", real, "--fake", fake, "--out", busy],
    /busy.*other files \(notes\.txt\).*--force/,
  ]);
  cases.push(["output on a read-only file system", [
    "--real",
    real,
    "--fake",
    fake,
    "--out",
    "/proc/saddlekit-report",
  ], /saddlekit-report.*cannot write/]);
  for (const [what, args, pattern] of cases) {
    const r = await inProcess(args);
    assert.equal(r.code, 2, `${what}: exit ${r.code}, ${r.err}`);
    assert.match(r.err, pattern, what);
  }
  assert.ok(!(await exists(out)), "nothing is written when the input is bad");
  assert.equal(await Deno.readTextFile(`${busy}/notes.txt`), "mine");
  // --force replaces the folder.
  const forced = await inProcess([
    "--real",
    real,
    "--fake",
    fake,
    "--out",
    busy,
    "--force",
    "--replicates",
    "10",
  ]);
  assert.equal(forced.code, 0, forced.err);
  assert.ok(await exists(`${busy}/index.html`));
  assert.ok(!(await exists(`${busy}/notes.txt`)));
  await Deno.remove(dir, { recursive: true });
});

Deno.test("unreadable input (no read permission) exits 2 naming the file", async () => {
  const { dir, real, fake } = await gaussianPair({ n: 60, mean: 0, sd: 1, seed: 6 });
  const other = await Deno.makeTempDir();
  const hidden = `${other}/f.npy`;
  await Deno.copyFile(fake, hidden);
  // Read access covers `dir` only: the generated file in `other` cannot be read.
  const r = await runAnalyse([dir], `${dir}/out`, ["--real", real, "--fake", hidden]);
  assert.equal(r.code, 2, r.stderr);
  assert.match(r.stderr, new RegExp(`${hidden}.*cannot read the file`));
  await Deno.remove(dir, { recursive: true });
  await Deno.remove(other, { recursive: true });
});

Deno.test("the demo's --data is checked: no folder, a missing folder, a folder without the files", async () => {
  const dir = await Deno.makeTempDir();
  const demo = new URL("../../scripts/demo.ts", import.meta.url).pathname;
  const run = async (args: string[]) => {
    const r = await new Deno.Command(Deno.execPath(), {
      args: ["run", "--allow-read", "--allow-write", demo, ...args],
      stdout: "piped",
      stderr: "piped",
    }).output();
    return { code: r.code, err: new TextDecoder().decode(r.stderr) };
  };
  const cases: [string[], RegExp][] = [
    [["--data"], /--data needs a value/],
    [["--data=/nonexistent"], /\/nonexistent.*no such folder/],
    [["--data", dir], /lacks turbine_real\.csv, turbine_fake\.npy, disc_scores\.json/],
  ];
  for (const [args, pattern] of cases) {
    const r = await run(args);
    assert.equal(r.code, 2, `${args.join(" ")}: ${r.err}`);
    assert.match(r.err, pattern);
  }
  await Deno.remove(dir, { recursive: true });
});

Deno.test("an interrupted run leaves no report that looks complete", async () => {
  const { dir, real, fake } = await gaussianPair({ n: 3000, mean: 0.3, sd: 1, seed: 8, d: 2 });
  const out = `${dir}/report`;
  const child = new Deno.Command(Deno.execPath(), {
    args: analyseArgs([dir], out, ["--real", real, "--fake", fake, "--replicates", "200"]),
    stdout: "null",
    stderr: "null",
  }).spawn();
  // Kill it while the density route computes (it needs far longer than this).
  await new Promise((r) => setTimeout(r, 2500));
  child.kill("SIGKILL");
  const status = await child.status;
  assert.equal(status.signal, "SIGKILL", "the run must still have been computing when killed");
  assert.ok(!(await exists(`${out}/index.html`)), "no index.html after an interrupted run");
  assert.ok(!(await exists(`${out}/summary.json`)));
  await Deno.remove(dir, { recursive: true });
});
