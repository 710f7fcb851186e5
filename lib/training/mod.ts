/**
 * Training runs: logs read from CSV/TSV or JSON lines, diagnosed against the equilibrium
 * values the theory predicts (D's summed BCE → 2 ln 2, D → 1/2, non-saturating G loss →
 * ln 2), with the smoothing, periodogram and change-point tools behind the flags.
 *
 * @example Two lines in a notebook: load a log, get the diagnosis (and its figures with
 * `plotLossCurves(diagnosis)` and `plotDiscriminatorOutputs(diagnosis)` from lib/plot)
 * ```ts
 * import { diagnoseTraining, readTrainingLog } from "./mod.ts";
 * import assert from "node:assert/strict";
 * const path = await Deno.makeTempFile({ suffix: ".jsonl" });
 * // Python's json module writes a NaN loss as a bare NaN: it is read and flagged.
 * const line = (i: number) => `{"step": ${100 * i}, "d_loss": ${i < 80 ? 1.38 + 0.02 * Math.sin(i * 9.1) : NaN}}`;
 * await Deno.writeTextFile(path, Array.from({ length: 100 }, (_, i) => line(i)).join("\n"));
 * const diagnosis = diagnoseTraining(await readTrainingLog(path));
 * assert.deepEqual(diagnosis.flags.map((f) => [f.kind, f.step]), [["divergence", 8000]]);
 * await Deno.remove(path);
 * ```
 *
 * @module
 */
export * from "./training_log.ts";
export * from "./smoothing.ts";
export * from "./periodogram.ts";
export * from "./change_points.ts";
export * from "./diagnose_training.ts";
export * from "./checkpoint_metrics.ts";
export * from "./feature_metrics.ts";
export * from "./checkpoint_series.ts";
