/**
 * Running notebooks under the real Deno Jupyter kernel through Debian's nbclient
 * (`scripts/run_notebook.py`, the runner `deno task notebook` uses too), and deciding
 * whether the tests may be skipped.
 *
 * Whether Jupyter is there, and the skip rules, are in tests/_jupyter.ts (shared with the
 * browser test of exported notebooks).
 *
 * @module
 */
import { runReference } from "../_reference.ts";

export {
  assertJupyter,
  ignoreWithoutJupyter,
  JUPYTER_INSTALL,
  type JupyterProbe,
  probeJupyter,
  REQUIRE_JUPYTER,
  RUNNER,
} from "../_jupyter.ts";

/** One executed code cell. */
export interface ExecutedCell {
  index: number;
  tags: string[];
  mimes: string[];
  errors: { ename: string; evalue: string }[];
  stdout: string;
  stderr: string;
  seconds: number | null;
  executed: boolean;
}

/** What running a notebook produced. */
export interface NotebookRun {
  ok: boolean;
  error: string;
  executed: string;
  seconds: number;
  cells: ExecutedCell[];
  records: Record<string, unknown>;
}

/** Execute `path` top to bottom under the Deno kernel, `timeout` seconds per cell. */
export async function runNotebook(path: string, timeout = 60): Promise<NotebookRun> {
  const outDir = await Deno.makeTempDir({ prefix: "saddlekit-nb-" });
  // runReference resolves names in tests/reference/; the runner lives in scripts/.
  return await runReference<NotebookRun>("../../scripts/run_notebook.py", {
    notebook: path,
    timeout,
    kernel: "deno",
    out_dir: outDir,
  });
}

/** Problems of a run: errors, unexecuted cells, figure cells without SVG, slow cells. */
export function problems(run: NotebookRun, maxCellSeconds = 60): string[] {
  const out: string[] = [];
  if (!run.ok) out.push(`run failed: ${run.error}`);
  for (const c of run.cells) {
    for (const e of c.errors) out.push(`cell ${c.index}: ${e.ename}: ${e.evalue}`);
    if (!c.executed) out.push(`cell ${c.index} did not run`);
    if (c.tags.includes("figure") && !c.mimes.includes("image/svg+xml")) {
      out.push(
        `figure cell ${c.index} showed ${c.mimes.join(", ") || "nothing"}, not image/svg+xml`,
      );
    }
    if (c.seconds !== null && c.seconds > maxCellSeconds) {
      out.push(`cell ${c.index} took ${c.seconds.toFixed(1)} s`);
    }
  }
  return out;
}
