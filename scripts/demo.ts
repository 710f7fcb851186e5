/**
 * `deno task demo`: the report command (`deno task analyse`) on the bundled demo data of
 * the wind-farm scenario, with its claims file; prints where the report is.
 *
 * Usage: deno task demo [--data DIR] [--out DIR] [--seed N] [--force] [--quiet]
 *
 * `--data DIR` reads turbine_real.csv, turbine_fake.npy, disc_scores.json and (when there)
 * claims.json, training/train_log.csv and training/checkpoints/ from DIR instead of
 * data/demo/. Every argument is checked before any work.
 * Exits 0 when the report was written (the demo's claims include one that fails on
 * purpose), 2 on bad arguments.
 *
 * @module
 */
import { relative } from "node:path";
import { SaddleError } from "../lib/errors/mod.ts";
import { analyseCommand, parseCli } from "../lib/report/mod.ts";

// Relative to the working folder when inside it, so that the report names data/demo/...
const DEMO_DIR = ((abs: string) => {
  const rel = relative(Deno.cwd(), abs);
  return rel && !rel.startsWith("..") ? rel : abs;
})(new URL("../data/demo", import.meta.url).pathname);
const FILES = ["turbine_real.csv", "turbine_fake.npy", "disc_scores.json"];

/** Build the analyse arguments for the demo; returns the exit code. */
export async function demoCommand(args: readonly string[]): Promise<number> {
  let forwarded: string[];
  try {
    const { values, flags } = parseCli(args, ["data", "out", "seed"], ["force", "quiet"]);
    const data = values.data ?? DEMO_DIR;
    let info: Deno.FileInfo;
    try {
      info = await Deno.stat(data);
    } catch {
      throw new SaddleError(
        "not-found",
        "--data: no such folder; give the folder of the demo files",
        {
          file: data,
          parameter: "--data",
        },
      );
    }
    if (!info.isDirectory) {
      throw new SaddleError("invalid-argument", "--data must be a folder, not a file", {
        file: data,
        parameter: "--data",
      });
    }
    const has = async (f: string) => await Deno.stat(`${data}/${f}`).then(() => true, () => false);
    const missing = [];
    for (const f of FILES) if (!(await has(f))) missing.push(f);
    if (missing.length) {
      throw new SaddleError(
        "not-found",
        `--data: the folder lacks ${missing.join(", ")}; it needs ${FILES.join(", ")} ` +
          "(or run deno task analyse on your own file names)",
        { file: data, parameter: "--data" },
      );
    }
    forwarded = [
      "--real",
      `${data}/turbine_real.csv`,
      "--fake",
      `${data}/turbine_fake.npy`,
      "--scores",
      `${data}/disc_scores.json`,
      ...((await has("claims.json")) ? ["--claims", `${data}/claims.json`] : []),
      ...((await has("training/train_log.csv")) ? ["--log", `${data}/training/train_log.csv`] : []),
      ...((await has("training/checkpoints"))
        ? ["--checkpoints", `${data}/training/checkpoints`]
        : []),
      "--out",
      values.out ?? "out/demo",
      ...(values.seed ? ["--seed", values.seed] : []),
      ...[...flags].map((f) => `--${f}`),
    ];
  } catch (e) {
    if (e instanceof SaddleError) {
      console.error(`error: ${e.message}`);
      return 2;
    }
    throw e;
  }
  const code = await analyseCommand(forwarded);
  if (code === 1) {
    // The demo's claims are chosen to show all three verdicts, so one fails on purpose.
    console.log(
      "(a failing claim makes `deno task analyse` exit 1; the demo shows it and exits 0)",
    );
    return 0;
  }
  return code;
}

if (import.meta.main) {
  Deno.exit(await demoCommand(Deno.args));
}
