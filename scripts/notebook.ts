/**
 * `deno task notebook FILE [--html OUT] [--out DIR] [--timeout S]`: run a notebook headless
 * under the Deno kernel and write the executed .ipynb and an HTML export with its figures.
 *
 * The Deno kernel sometimes sends a cell's result after it reported the cell idle; a plain
 * `jupyter nbconvert --execute` then drops that output. The runner (scripts/run_notebook.py,
 * Debian's nbclient) routes every output to its cell by the parent message id, also when
 * it arrives late. The HTML comes from Debian's nbconvert; saddlekit figures carry a
 * `text/html` `<img>` of their SVG, which the export keeps.
 *
 * Needs python3-nbclient, jupyter-nbconvert, python3-ipykernel and `deno jupyter --install`.
 * Exit codes: 0 ran without errors, 1 a cell failed, 2 bad usage or a missing tool.
 *
 * @module
 */
import { SaddleError } from "../lib/errors/mod.ts";
import { parseCli } from "../lib/report/mod.ts";

const RUNNER = new URL("./run_notebook.py", import.meta.url).pathname;
const PYTHON = Deno.env.get("SADDLEKIT_PYTHON") ?? "/usr/bin/python3";
const INSTALL = "apt-get install -y python3-nbclient jupyter-nbconvert python3-ipykernel && " +
  "deno jupyter --install";

interface RunResult {
  ok: boolean;
  error: string;
  executed: string;
  seconds: number;
  late_outputs: number;
  cells: { index: number; errors: { ename: string; evalue: string }[] }[];
}

async function python(
  args: string[],
  stdin?: string,
): Promise<{ ok: boolean; out: string; err: string }> {
  let child;
  try {
    child = new Deno.Command(PYTHON, {
      args,
      stdin: stdin === undefined ? "null" : "piped",
      stdout: "piped",
      stderr: "piped",
    }).spawn();
  } catch (e) {
    throw new SaddleError(
      "not-found",
      `cannot run ${PYTHON} (${(e as Error).message}); install Python 3 and ${INSTALL}`,
      {
        parameter: "SADDLEKIT_PYTHON",
      },
    );
  }
  if (stdin !== undefined) {
    const w = child.stdin.getWriter();
    await w.write(new TextEncoder().encode(stdin));
    await w.close();
  }
  const r = await child.output();
  const dec = new TextDecoder();
  return { ok: r.success, out: dec.decode(r.stdout), err: dec.decode(r.stderr) };
}

/** Run the command; returns the exit code. */
export async function notebookCommand(args: readonly string[]): Promise<number> {
  try {
    const file = args[0];
    if (!file || file.startsWith("--")) {
      throw new SaddleError(
        "invalid-argument",
        "usage: deno task notebook FILE.ipynb [--html OUT.html] [--out DIR] [--timeout S]",
        {
          parameter: "FILE",
        },
      );
    }
    const { values } = parseCli(args.slice(1), ["html", "out", "timeout"], []);
    const info = await Deno.stat(file).catch(() => null);
    if (!info?.isFile || !file.endsWith(".ipynb")) {
      throw new SaddleError("not-found", "no such notebook; give the path of an .ipynb file", {
        file,
      });
    }
    const timeout = values.timeout ? Number(values.timeout) : 120;
    if (!(timeout > 0)) {
      throw new SaddleError("invalid-argument", `--timeout must be a positive number of seconds`, {
        parameter: "--timeout",
      });
    }
    const name = file.replace(/^.*\//, "").replace(/\.ipynb$/, "");
    const outDir = values.out ?? "out/notebooks";
    const html = values.html ?? `${outDir}/${name}.html`;
    await Deno.mkdir(outDir, { recursive: true });
    const probe = await python([RUNNER, "--probe"]);
    const found = probe.ok ? JSON.parse(probe.out) as { nbclient: boolean; kernel: boolean } : null;
    if (!found?.nbclient || !found.kernel) {
      throw new SaddleError(
        "not-found",
        `${
          found?.nbclient ? "the Deno Jupyter kernel is not registered" : `${PYTHON} lacks nbclient`
        }; install with: ${INSTALL}`,
        { parameter: "kernel" },
      );
    }
    console.error(`running ${file} under the Deno kernel...`);
    const run = await python(
      [RUNNER],
      JSON.stringify({
        notebook: file,
        timeout,
        kernel: "deno",
        out_dir: await Deno.realPath(outDir),
      }),
    );
    if (!run.ok) throw new Error(`the notebook runner failed:\n${run.err}`);
    const result = JSON.parse(run.out) as RunResult;
    const htmlDir = html.includes("/") ? html.replace(/\/[^/]*$/, "") : ".";
    await Deno.mkdir(htmlDir, { recursive: true });
    const conv = await python([
      "-m",
      "nbconvert",
      "--to",
      "html",
      result.executed,
      "--output-dir",
      await Deno.realPath(htmlDir),
      "--output",
      html.replace(/^.*\//, "").replace(/\.html$/, ""),
    ]);
    if (!conv.ok) {
      throw new SaddleError(
        "not-found",
        `nbconvert failed (${conv.err.trim().split("\n").pop()}); install with: ${INSTALL}`,
        {
          parameter: "nbconvert",
        },
      );
    }
    console.log(`executed notebook: ${result.executed}`);
    console.log(`HTML: ${html}`);
    if (result.late_outputs) {
      console.log(
        `${result.late_outputs} output(s) arrived after their cell was reported idle; routed to their cells`,
      );
    }
    for (const c of result.cells) {
      for (const e of c.errors) console.error(`cell ${c.index}: ${e.ename}: ${e.evalue}`);
    }
    if (!result.ok) {
      console.error(`error: ${result.error}`);
      return 1;
    }
    return 0;
  } catch (e) {
    if (e instanceof SaddleError) {
      console.error(`error: ${e.message}`);
      return 2;
    }
    throw e;
  }
}

if (import.meta.main) {
  Deno.exit(await notebookCommand(Deno.args));
}
