/**
 * Small generated inputs for the report tests: Gaussian samples with known parameters
 * written as NPY/CSV files in a temporary folder, and the command run in-process or as a
 * subprocess with the README's narrow permissions.
 *
 * @module
 */
import { gaussian } from "../../lib/density/mod.ts";
import { writeNpy } from "../../lib/samples/mod.ts";

/** A temporary folder with `r.npy` (real) and `f.npy` (generated), 1-D Gaussians. */
export async function gaussianPair(
  options: { n: number; mean: number; sd: number; seed: number; d?: number },
): Promise<{ dir: string; real: string; fake: string }> {
  const dir = await Deno.makeTempDir({ prefix: "saddlekit-report-" });
  const d = options.d ?? 1;
  const eye = (s: number) =>
    Array.from({ length: d }, (_, i) => Array.from({ length: d }, (_, j) => (i === j ? s * s : 0)));
  const g = (m: number, s: number) =>
    d === 1
      ? gaussian(m, s * s)
      : gaussian(Array.from({ length: d }, (_, i) => (i ? 0 : m)), eye(s));
  await writeNpy(`${dir}/r.npy`, g(0, 1).sample(options.n, options.seed));
  await writeNpy(`${dir}/f.npy`, g(options.mean, options.sd).sample(options.n, options.seed + 1));
  return { dir, real: `${dir}/r.npy`, fake: `${dir}/f.npy` };
}

/** Write a claims file and return its path. */
export async function claimsFile(
  dir: string,
  claims: unknown[],
  name = "claims.json",
): Promise<string> {
  const path = `${dir}/${name}`;
  await Deno.writeTextFile(path, JSON.stringify({ claims }));
  return path;
}

/** The npm cache folder (PNG rendering reads resvg's wasm and the fonts from it). */
export function npmCache(): string {
  const out = new Deno.Command(Deno.execPath(), {
    args: ["info", "--json"],
    stdout: "piped",
    stderr: "null",
  })
    .outputSync();
  return (JSON.parse(new TextDecoder().decode(out.stdout)) as { npmCache: string }).npmCache;
}

const ANALYSE = new URL("../../scripts/analyse.ts", import.meta.url).pathname;

/**
 * Run `scripts/analyse.ts` as the README's plain `deno run` with the narrowest
 * permissions: read the inputs, the npm cache and the output folder, write only the output
 * folder and its `.partial` sibling; no network, environment or subprocess access.
 */
export function analyseArgs(reads: string[], out: string, args: string[]): string[] {
  return [
    "run",
    `--allow-read=${[...reads, npmCache(), out, `${out}.partial`].join(",")}`,
    `--allow-write=${out},${out}.partial`,
    ANALYSE,
    ...args,
    "--out",
    out,
  ];
}

/** Run the command as a subprocess; exit code and output. */
export async function runAnalyse(
  reads: string[],
  out: string,
  args: string[],
): Promise<{ code: number; stdout: string; stderr: string }> {
  const r = await new Deno.Command(Deno.execPath(), {
    args: analyseArgs(reads, out, args),
    stdout: "piped",
    stderr: "piped",
  }).output();
  const dec = new TextDecoder();
  return { code: r.code, stdout: dec.decode(r.stdout), stderr: dec.decode(r.stderr) };
}
