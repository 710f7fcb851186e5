/**
 * `deno task analyse`: the whole analysis of two sample files as one report folder
 * (index.html, summary.json, timings.json, every figure as .svg and .png). A thin entry
 * over `analyseCommand` in lib/report/command.ts.
 *
 * Usage: deno task analyse --real FILE --fake FILE [--columns a,b]
 *          [--scores FILE | --d-real FILE --d-fake FILE] [--score-scale prob|logit]
 *          [--claims FILE] [--seed N] [--replicates N] [--out DIR] [--force] [--quiet]
 *
 * Exit codes: 0 the analysis ran and no claim fails; 1 a claim fails; 2 bad input or
 * usage (a message names the file or option and the fix); 3 an internal error.
 *
 * @module
 */
import { analyseCommand } from "../lib/report/mod.ts";

if (import.meta.main) {
  Deno.exit(await analyseCommand(Deno.args));
}
