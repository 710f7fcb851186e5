/**
 * The report command's logic: argument parsing, the checks before any work, progress on
 * stderr and exit codes. `scripts/analyse.ts` (`deno task analyse`) is a thin entry over
 * {@linkcode analyseCommand}.
 *
 * @module
 */
import { SaddleError } from "../errors/mod.ts";
import { type AnalyseOptions, prepareAnalysis, runAnalysis } from "./analyse.ts";
import { checkOutputFolder, writeReport } from "./write.ts";

/** The usage text (printed by --help and after usage errors). */
export const USAGE = `usage: deno task analyse --real FILE --fake FILE [options]

  --real FILE            samples of the data (.csv .tsv .txt .json .npy .npz)
  --fake FILE            samples of the generator, same columns; repeat with names to
                         compare generators: --fake A=FILE --fake B=FILE (the first is
                         the one the other sections analyse)
  --columns a,b          keep these columns (names or 0-based indices) of both files
  --scores FILE          a trained discriminator's outputs: CSV/JSON with a "side" column
                         (real/fake) and a score column, or JSON {"real": [...], "fake": [...]}
  --d-real FILE          ... or its outputs on the real rows, one column
  --d-fake FILE          ... and on the generated rows
  --score-scale S        prob or logit (default: prob when every output is in [0, 1])
  --log FILE             a training log (CSV/TSV/JSON lines: step, losses, D outputs)
  --checkpoints DIR      generated samples saved during training, one file a checkpoint
                         named with its step (step_001000.csv), same columns as --real
  --checkpoint-replicates N  bootstrap replicates of each checkpoint's metrics (default 20)
  --claims FILE          statements to settle (JSON; see README, "Claims")
  --seed N               seed of every random step (default 2026)
  --replicates N         refit-bootstrap replicates of the density route (default 100)
  --out DIR              report folder (default out/report)
  --force                replace an existing folder that holds other files
  --quiet                no progress and no closing lines

exit: 0 ran and no claim fails, 1 a claim fails, 2 bad input or usage, 3 internal error`;

const VALUE_FLAGS = [
  "real",
  "fake",
  "columns",
  "scores",
  "d-real",
  "d-fake",
  "score-scale",
  "claims",
  "log",
  "checkpoints",
  "checkpoint-replicates",
  "seed",
  "replicates",
  "out",
] as const;
const BOOL_FLAGS = ["force", "quiet", "help"] as const;

/** Parsed command line. */
export interface CliArgs {
  /** Values of `--flag value` / `--flag=value`, by flag name without the dashes. */
  values: Record<string, string | undefined>;
  /** Switches given. */
  flags: Set<string>;
  /** Every value of each `repeatable` flag, in order. */
  lists: Record<string, string[]>;
}

/**
 * Parse `--flag value`, `--flag=value` and switches (`known` value flags and `switches`,
 * without dashes); a missing value, an unknown option or a flag given twice throws a
 * `SaddleError` naming it.
 *
 * @example
 * ```ts
 * import { parseCli } from "./command.ts";
 * import assert from "node:assert/strict";
 * const { values, flags } = parseCli(["--real=a.csv", "--fake", "b.npy", "--quiet"]);
 * assert.deepEqual([values.real, values.fake, flags.has("quiet")], ["a.csv", "b.npy", true]);
 * assert.throws(() => parseCli(["--real"]), /--real needs a value/);
 * ```
 */
export function parseCli(
  args: readonly string[],
  known: readonly string[] = VALUE_FLAGS,
  switches: readonly string[] = BOOL_FLAGS,
  repeatable: readonly string[] = ["fake"],
): CliArgs {
  const values: Record<string, string> = {};
  const lists: Record<string, string[]> = {};
  const flags = new Set<string>();
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    const m = /^--([a-z-]+)(?:=(.*))?$/s.exec(a);
    if (!m) {
      throw new SaddleError(
        "invalid-argument",
        `unexpected argument "${a}"; options start with --`,
        {
          parameter: a,
        },
      );
    }
    const [, name, inline] = m;
    if (switches.includes(name)) {
      if (inline !== undefined) {
        throw new SaddleError("invalid-argument", `--${name} takes no value`, {
          parameter: `--${name}`,
        });
      }
      flags.add(name);
      continue;
    }
    if (!known.includes(name)) {
      throw new SaddleError("invalid-argument", `unknown option --${name}`, {
        parameter: `--${name}`,
      });
    }
    const value = inline ?? args[i + 1];
    if (inline === undefined) i++;
    if (value === undefined || value === "" || (inline === undefined && value.startsWith("--"))) {
      throw new SaddleError("invalid-argument", `--${name} needs a value`, {
        parameter: `--${name}`,
      });
    }
    (lists[name] ??= []).push(value);
    if (name in values && !repeatable.includes(name)) {
      throw new SaddleError("invalid-argument", `--${name} given twice`, {
        parameter: `--${name}`,
      });
    }
    values[name] ??= value;
  }
  return { values, flags, lists };
}

function wholeNumber(v: string | undefined, flag: string): number | undefined {
  if (v === undefined) return undefined;
  if (!/^\d+$/.test(v)) {
    throw new SaddleError("invalid-argument", `${flag} must be a whole number, got "${v}"`, {
      parameter: flag,
    });
  }
  return Number(v);
}

/**
 * The generated sets of repeated `--fake` values: `NAME=FILE` names one (NAME of letters,
 * digits, `_`, `-`), a plain `FILE` is named G1, G2, ... by position.
 *
 * @example
 * ```ts
 * import { generatorList } from "./command.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(generatorList(["A=a.npy", "b.csv"]), [
 *   { name: "A", path: "a.npy" }, { name: "G2", path: "b.csv" }]);
 * ```
 */
export function generatorList(values: readonly string[]): { name: string; path: string }[] {
  return values.map((v, i) => {
    const m = /^([A-Za-z0-9][A-Za-z0-9_-]*)=(.+)$/s.exec(v);
    return m ? { name: m[1], path: m[2] } : { name: `G${i + 1}`, path: v };
  });
}

/** Options of {@linkcode analyseCommand} beyond the arguments. */
export interface CommandIo {
  /** Lines for the reader (default console.log). */
  print?: (line: string) => void;
  /** Whether progress may be drawn on stderr (default: stderr is a terminal). */
  progress?: boolean;
}

/**
 * The report command (`deno task analyse`) on `args`; returns the exit code (0 ran and no
 * claim fails, 1 a claim fails, 2 bad input or usage, 3 an internal error), never exits
 * itself. Every input, the claims and the output folder are checked before the long
 * computation; progress goes to stderr when it is a terminal, unless `--quiet`.
 *
 * @example
 * ```ts
 * import { analyseCommand } from "./command.ts";
 * import assert from "node:assert/strict";
 * const lines: string[] = [];
 * assert.equal(await analyseCommand(["--help"], { print: (s) => lines.push(s) }), 0);
 * assert.match(lines[0], /usage: deno task analyse/);
 * ```
 */
export async function analyseCommand(args: readonly string[], io: CommandIo = {}): Promise<number> {
  const print = io.print ?? ((s: string) => console.log(s));
  let quiet = false, showProgress = false;
  const encoder = new TextEncoder();
  try {
    const { values: v, flags, lists } = parseCli(args);
    if (flags.has("help")) {
      print(USAGE);
      return 0;
    }
    quiet = flags.has("quiet");
    if (!v.real || !v.fake) {
      throw new SaddleError("invalid-argument", `--real and --fake are required\n\n${USAGE}`, {
        parameter: v.real ? "--fake" : "--real",
      });
    }
    if (v["score-scale"] && !["prob", "logit"].includes(v["score-scale"])) {
      throw new SaddleError(
        "invalid-argument",
        `--score-scale is prob or logit, got "${v["score-scale"]}"`,
        {
          parameter: "--score-scale",
        },
      );
    }
    const out = v.out ?? "out/report";
    showProgress = !quiet && (io.progress ?? Deno.stderr.isTerminal());
    let last = "";
    const onProgress = showProgress
      ? (step: string, fraction: number) => {
        const line = `\r\x1b[2K${step} ${Math.round(fraction * 100)}%`;
        if (line !== last) Deno.stderr.writeSync(encoder.encode(line));
        last = line;
      }
      : undefined;
    const seed = wholeNumber(v.seed, "--seed");
    const replicates = wholeNumber(v.replicates, "--replicates");
    const checkpointReplicates = wholeNumber(
      v["checkpoint-replicates"],
      "--checkpoint-replicates",
    );
    const generators = generatorList(lists.fake ?? []);
    const options: AnalyseOptions = {
      real: v.real,
      fake: generators[0].path,
      ...(generators.length > 1 ? { generators } : {}),
      ...(v.columns
        ? {
          columns: v.columns.split(",").map((c) => (/^\d+$/.test(c.trim()) ? Number(c) : c.trim())),
        }
        : {}),
      ...(v.scores ? { scores: v.scores } : {}),
      ...(v["d-real"] ? { dReal: v["d-real"] } : {}),
      ...(v["d-fake"] ? { dFake: v["d-fake"] } : {}),
      ...(v["score-scale"] ? { scoreScale: v["score-scale"] as "prob" | "logit" } : {}),
      ...(v.claims ? { claims: v.claims } : {}),
      ...(v.log ? { log: v.log } : {}),
      ...(v.checkpoints ? { checkpoints: v.checkpoints } : {}),
      ...(checkpointReplicates !== undefined ? { checkpointReplicates } : {}),
      ...(seed !== undefined ? { seed } : {}),
      ...(replicates !== undefined ? { replicates } : {}),
      ...(onProgress ? { onProgress } : {}),
    };
    // Everything is checked before the long computation: inputs, claims, output folder.
    const prep = await prepareAnalysis(options);
    await checkOutputFolder(out, { force: flags.has("force") });
    const report = await runAnalysis(prep);
    await writeReport(report, out, onProgress ? { onProgress } : {});
    if (showProgress) Deno.stderr.writeSync(encoder.encode("\r\x1b[2K"));
    const counts = { holds: 0, fails: 0, undecided: 0 };
    for (const c of report.claims) counts[c.verdict]++;
    if (!quiet) {
      for (const c of report.claims) print(`${c.verdict.padEnd(9)}  ${c.claim.statement}`);
      if (report.claims.length) {
        print(`claims: ${counts.holds} hold, ${counts.fails} fail, ${counts.undecided} undecided`);
      }
      print(`report: ${out}/index.html (summary.json and figures beside it)`);
    }
    return counts.fails > 0 ? 1 : 0;
  } catch (e) {
    if (showProgress) Deno.stderr.writeSync(encoder.encode("\r\x1b[2K"));
    if (e instanceof SaddleError) {
      console.error(`error: ${e.message}`);
      return 2;
    }
    console.error(e);
    return 3;
  }
}
