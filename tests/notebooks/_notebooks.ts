/**
 * Running notebooks under the real Deno Jupyter kernel through Debian's nbclient
 * (`tests/reference/run_notebook.py`), and deciding whether the tests may be skipped.
 *
 * Where nbclient or the Deno kernel is missing (a user's fresh machine) the notebook tests
 * are ignored with a loud line naming the install commands; with
 * `SADDLEKIT_REQUIRE_JUPYTER=1` (set by `.ci/run`) a missing Jupyter is a failure instead.
 *
 * @module
 */
import { PYTHON, runReference } from "../_reference.ts";

/** The commands that install what the notebook tests need. */
export const JUPYTER_INSTALL =
  "apt-get update && apt-get install -y python3-nbclient python3-ipykernel jupyter-nbconvert " +
  "&& deno jupyter --install";

/** Whether CI demands the notebook tests. */
export const REQUIRE_JUPYTER = Deno.env.get("SADDLEKIT_REQUIRE_JUPYTER") === "1";

/** What `run_notebook.py --probe` found. */
export interface JupyterProbe {
  nbclient: boolean;
  kernel: boolean;
  kernels: string[];
  error?: string;
}

/** Probe once whether nbclient and the Deno kernel are installed. */
export function probeJupyter(): JupyterProbe {
  try {
    const script = new URL("../reference/run_notebook.py", import.meta.url).pathname;
    const child = new Deno.Command(PYTHON, {
      args: [script, "--probe"],
      stdout: "piped",
      stderr: "null",
    }).outputSync();
    if (!child.success) return { nbclient: false, kernel: false, kernels: [] };
    return JSON.parse(new TextDecoder().decode(child.stdout)) as JupyterProbe;
  } catch (e) {
    return { nbclient: false, kernel: false, kernels: [], error: String(e) };
  }
}

let probed: JupyterProbe | undefined;
let warned = false;

/**
 * `ignore` flag for a notebook test: false when Jupyter and the Deno kernel are there or
 * when CI requires them (then a missing piece fails the test), true otherwise (loudly).
 */
export function ignoreWithoutJupyter(): boolean {
  probed ??= probeJupyter();
  if ((probed.nbclient && probed.kernel) || REQUIRE_JUPYTER) return false;
  if (!warned) {
    warned = true;
    console.error(
      `\n*** notebook tests are IGNORED: ${
        probed.nbclient ? "the Deno Jupyter kernel is not registered" : `${PYTHON} lacks nbclient`
      }. Install with: ${JUPYTER_INSTALL}\n`,
    );
  }
  return true;
}

/** Throw (in CI) when Jupyter or the kernel is missing, naming the install commands. */
export function assertJupyter(): void {
  probed ??= probeJupyter();
  if (!probed.nbclient || !probed.kernel) {
    throw new Error(
      `Jupyter is required (SADDLEKIT_REQUIRE_JUPYTER=1) but ${
        probed.nbclient ? "the Deno kernel is not registered" : "nbclient is missing"
      } (kernels found: ${probed.kernels.join(", ") || "none"}). Install with: ${JUPYTER_INSTALL}`,
    );
  }
}

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
  return await runReference<NotebookRun>("run_notebook.py", {
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
