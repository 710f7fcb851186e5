/**
 * Whether Debian's nbclient and the Deno Jupyter kernel are installed, and the skip rule of
 * the tests that run notebooks (tests/notebooks, and the browser test of exported
 * notebooks in tests/report).
 *
 * Where nbclient or the Deno kernel is missing (a user's fresh machine) those tests are
 * ignored with a loud line naming the install commands; with `SADDLEKIT_REQUIRE_JUPYTER=1`
 * (set by `.ci/run`) a missing Jupyter is a failure instead.
 *
 * @module
 */
import { PYTHON } from "./_reference.ts";

/** The notebook runner (a file the tests execute, not a module they import). */
export const RUNNER: string = new URL("../scripts/run_notebook.py", import.meta.url).pathname;

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
    const script = RUNNER;
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
