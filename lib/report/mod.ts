/**
 * The report: the whole analysis of two sample files (and optionally a trained
 * discriminator's outputs and a claims file) as one folder with a self-contained
 * index.html, summary.json (schema in `summary.schema.json`) and every figure as .svg and
 * .png. `deno task analyse` is a thin command over {@linkcode prepareAnalysis},
 * {@linkcode runAnalysis} and {@linkcode writeReport}.
 *
 * The report is a list of sections ({@linkcode ReportSection}): each says whether it
 * applies to the inputs, which estimate keys it writes, and runs; new capabilities plug in
 * as new sections.
 *
 * @example
 * ```ts
 * import { DEFAULT_SECTIONS } from "./mod.ts";
 * import assert from "node:assert/strict";
 * assert.deepEqual(DEFAULT_SECTIONS.map((s) => s.id), ["inputs", "density", "gaussian", "metrics", "comparison", "discriminator",
 *   "training", "checkpoints"]);
 * ```
 *
 * @module
 */
export * from "./types.ts";
export * from "./json.ts";
export * from "./inputs.ts";
export * from "./defaults.ts";
export * from "./estimate_json.ts";
export * from "./claims.ts";
export * from "./schema.ts";
export * from "./section_inputs.ts";
export * from "./section_density.ts";
export * from "./section_gaussian.ts";
export * from "./section_metrics.ts";
export * from "./section_discriminator.ts";
export * from "./section_comparison.ts";
export * from "./section_training.ts";
export * from "./html.ts";
export * from "./analyse.ts";
export * from "./write.ts";
export * from "./command.ts";
// Types of other folders that this folder's API mentions, re-exported so the module documents alone.
export type { Estimate, EstimateUnit } from "../estimate/mod.ts";
export type { Figure } from "../plot/mod.ts";
export type { Samples } from "../samples/mod.ts";
export type { OutputScale } from "../discriminator/mod.ts";
