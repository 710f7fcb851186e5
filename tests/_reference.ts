/**
 * Live cross-checks against Debian's scipy / scikit-learn / numpy.
 *
 * Reference scripts live in `tests/reference/*.py`; each reads one JSON object on stdin
 * and writes one JSON object on stdout. They run under `/usr/bin/python3` (Debian's
 * interpreter, which has python3-scipy and python3-sklearn), not the `python3` on PATH.
 *
 * Where the reference libraries are missing, tests that need them are ignored with a loud
 * line naming the install command; with `SADDLEKIT_REQUIRE_REFERENCE=1` (set by `.ci/run`)
 * a missing library is a failure instead, so CI can never skip these checks.
 *
 * @module
 */

/** The Debian interpreter that has the reference libraries. */
export const PYTHON = Deno.env.get("SADDLEKIT_PYTHON") ?? "/usr/bin/python3";

/** The install command printed when the reference libraries are missing. */
export const INSTALL_HINT =
  "apt-get update && apt-get install -y python3-scipy python3-sklearn python3-numpy";

const cache = new Map<string, boolean>();

/** Whether `/usr/bin/python3` can import every module in `modules`. */
export function hasPython(modules: readonly string[] = ["numpy", "scipy", "sklearn"]): boolean {
  const key = modules.join(",");
  const hit = cache.get(key);
  if (hit !== undefined) return hit;
  let ok = false;
  try {
    const out = new Deno.Command(PYTHON, {
      args: ["-c", modules.map((m) => `import ${m}`).join("; ")],
      stdout: "null",
      stderr: "null",
    }).outputSync();
    ok = out.success;
  } catch {
    ok = false;
  }
  cache.set(key, ok);
  return ok;
}

/** Whether reference checks are mandatory (CI). */
export const REQUIRE_REFERENCE = Deno.env.get("SADDLEKIT_REQUIRE_REFERENCE") === "1";

/**
 * `ignore` flag for a `Deno.test` that needs the reference libraries: false when they are
 * there, or when CI requires them (so a missing library fails the test instead of skipping
 * it). Prints a loud line once when the test will be skipped.
 */
export function ignoreWithoutPython(
  modules: readonly string[] = ["numpy", "scipy", "sklearn"],
): boolean {
  if (hasPython(modules) || REQUIRE_REFERENCE) return false;
  if (!warned) {
    warned = true;
    console.error(
      `\n*** reference checks against ${
        modules.length ? modules.join("/") : "Python's standard library"
      } are IGNORED: ${PYTHON} cannot ${modules.length ? "import them" : "run"}. ` +
        `Install with: ${INSTALL_HINT}\n`,
    );
  }
  return true;
}
let warned = false;

/**
 * Run `tests/reference/<script>` with `input` as JSON on stdin and parse its JSON stdout.
 * Float64Arrays in the input are sent as plain arrays. Throws with the script's stderr on
 * failure.
 */
export async function runReference<T = unknown>(script: string, input: unknown): Promise<T> {
  const path = new URL(`./reference/${script}`, import.meta.url).pathname;
  const child = new Deno.Command(PYTHON, {
    args: [path],
    stdin: "piped",
    stdout: "piped",
    stderr: "piped",
  }).spawn();
  const writer = child.stdin.getWriter();
  await writer.write(
    new TextEncoder().encode(
      JSON.stringify(input, (_k, v) => (ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : v)),
    ),
  );
  await writer.close();
  const out = await child.output();
  if (!out.success) {
    throw new Error(
      `reference script ${script} failed:\n${new TextDecoder().decode(out.stderr)}`,
    );
  }
  return JSON.parse(new TextDecoder().decode(out.stdout)) as T;
}
