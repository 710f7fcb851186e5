/**
 * The analysis behind `deno task analyse`: read and check every input, choose the methods
 * from the data, run the sections, settle the claims, and assemble summary.json, the
 * figures and the HTML report.
 *
 * @module
 */
import { SaddleError } from "../errors/mod.ts";
import { linalgBackend } from "../linalg/mod.ts";
import type { Estimate } from "../estimate/mod.ts";
import { checkClaims, type Claim, claimJson, parseClaims } from "./claims.ts";
import { choosePlan, type PlanOptions } from "./defaults.ts";
import { estimateJson } from "./estimate_json.ts";
import {
  readInputFile,
  type ReadInputsOptions,
  readReportInputs,
  type ReportInputs,
  sha256Hex,
} from "./inputs.ts";
import { renderReportHtml } from "./html.ts";
import { densitySection } from "./section_density.ts";
import { discriminatorSection } from "./section_discriminator.ts";
import { gaussianSection } from "./section_gaussian.ts";
import { inputsSection } from "./section_inputs.ts";
import { metricsSection } from "./section_metrics.ts";
import { checkpointsSection, trainingSection } from "./section_training.ts";
import { comparisonSection } from "./section_comparison.ts";
import type { Json } from "./json.ts";
import type {
  PreparedAnalysis,
  Report,
  ReportContext,
  ReportFigure,
  ReportProgress,
  ReportSection,
  SectionRecord,
} from "./types.ts";

/** Version of the summary.json schema (lib/report/summary.schema.json). */
export const SCHEMA_VERSION = 1;

/** The sections of the report, in order. New capabilities append theirs. */
export const DEFAULT_SECTIONS: readonly ReportSection[] = [
  inputsSection,
  densitySection,
  gaussianSection,
  metricsSection,
  comparisonSection,
  discriminatorSection,
  trainingSection,
  checkpointsSection,
];

/** Options of {@linkcode prepareAnalysis}: the inputs, the claims and the overrides. */
export interface AnalyseOptions extends ReadInputsOptions, PlanOptions {
  /** A claims file (JSON; see README, "Claims"). */
  claims?: string;
  /** Sections to run (default {@linkcode DEFAULT_SECTIONS}). */
  sections?: readonly ReportSection[];
  /** Progress of long steps. */
  onProgress?: ReportProgress;
}

/**
 * Read and check everything before any long computation: the inputs, the plan, which
 * sections run, and the claims against the estimate paths those sections write.
 *
 * @example
 * ```ts
 * import { prepareAnalysis } from "./analyse.ts";
 * import assert from "node:assert/strict";
 * await assert.rejects(prepareAnalysis({ real: "/nonexistent.csv", fake: "/nonexistent.npy" }), /not found/);
 * ```
 */
export async function prepareAnalysis(options: AnalyseOptions): Promise<PreparedAnalysis> {
  const inputs = await readReportInputs(options);
  const plan = choosePlan(
    { d: inputs.real.samples.d, nReal: inputs.real.samples.n, nFake: inputs.fake.samples.n },
    options,
  );
  const onProgress = options.onProgress ?? (() => {});
  const ctx: ReportContext = { inputs, plan, shared: new Map(), onProgress };
  const sections = (options.sections ?? DEFAULT_SECTIONS).map((section) => ({
    section,
    applies: section.applies(ctx),
  }));
  const keys = sections.flatMap((s) => s.applies === true ? s.section.keys(ctx) : []);
  let claims: Claim[] = [];
  let claimsFile: PreparedAnalysis["claimsFile"];
  if (options.claims) {
    const bytes = await readInputFile(options.claims, "--claims");
    claims = parseClaims(new TextDecoder().decode(bytes), options.claims, keys);
    claimsFile = { path: options.claims, sha256: await sha256Hex(bytes) };
  }
  return {
    inputs,
    plan,
    claims,
    ...(claimsFile ? { claimsFile } : {}),
    sections,
    keys,
    onProgress,
  };
}

function sideJson(s: ReportInputs["real"]): Json {
  return {
    path: s.path,
    n: s.samples.n,
    d: s.samples.d,
    columns: s.samples.columns ? [...s.samples.columns] : null,
    sha256: s.sha256,
  };
}

/**
 * Run the sections of a prepared analysis and assemble the report. A section that throws
 * a `SaddleError` is recorded as failed (with the message) and the others still run.
 *
 * @example
 * ```ts
 * import { prepareAnalysis, runAnalysis } from "./analyse.ts";
 * import { gaussian } from "../density/mod.ts";
 * import { writeNpy } from "../samples/mod.ts";
 * import assert from "node:assert/strict";
 * const dir = await Deno.makeTempDir();
 * await writeNpy(`${dir}/r.npy`, gaussian(0, 1).sample(200, 1));
 * await writeNpy(`${dir}/f.npy`, gaussian(0.5, 1).sample(200, 2));
 * const prep = await prepareAnalysis({ real: `${dir}/r.npy`, fake: `${dir}/f.npy`, replicates: 10 });
 * const report = await runAnalysis(prep);
 * assert.match(report.summaryText, /"schema_version": 1/);
 * await Deno.remove(dir, { recursive: true });
 * ```
 */
export async function runAnalysis(prep: PreparedAnalysis): Promise<Report> {
  const { inputs, plan } = prep;
  const ctx: ReportContext = { inputs, plan, shared: new Map(), onProgress: prep.onProgress };
  const timings: { step: string; seconds: number; within?: string }[] = [];
  const estimates: Record<string, Record<string, Json>> = {};
  const estimateObjects: Record<string, Record<string, Estimate>> = {};
  const tests: Record<string, Json> = {};
  const data: Record<string, Json> = { comparison: null, training: null, checkpoints: null };
  const methods: Record<string, Json> = {};
  const figures: ReportFigure[] = [];
  const status: Json[] = [];
  const blocks: {
    section: ReportSection;
    record: SectionRecord;
    status: string;
    reason: string | null;
  }[] = [];
  const notes: string[] = [];
  for (const { section, applies } of prep.sections) {
    const record: SectionRecord = {
      estimates: {},
      data: {},
      tests: {},
      methods: {},
      figures: [],
      html: [],
      headlines: [],
      notes: [],
      timings: [],
    };
    let state = "skipped", reason: string | null = applies === true ? null : applies;
    if (applies === true) {
      const t0 = performance.now();
      try {
        await section.run(ctx, record);
        state = "ran";
      } catch (e) {
        if (!(e instanceof SaddleError)) throw e;
        state = "failed";
        reason = e.message;
      }
      timings.push({ step: section.id, seconds: (performance.now() - t0) / 1000 });
      for (const t of record.timings) {
        timings.push({ step: `${section.id}: ${t.step}`, seconds: t.seconds, within: section.id });
      }
    }
    if (state === "ran") {
      for (const [group, entries] of Object.entries(record.estimates)) {
        estimates[group] ??= {};
        estimateObjects[group] ??= {};
        for (const [k, e] of Object.entries(entries)) {
          estimates[group][k] = estimateJson(e);
          estimateObjects[group][k] = e;
        }
      }
      for (const [k, t] of Object.entries(record.tests)) {
        tests[k] = {
          method: t.method,
          statistic: estimateJson(t.statistic),
          pValue: t.pValue,
          permutations: t.permutations,
          notes: [...t.notes],
        };
      }
      Object.assign(methods, record.methods);
      Object.assign(data, record.data);
      for (const f of record.figures) {
        if (figures.some((g) => g.name === f.name)) {
          throw new Error(`two sections draw a figure named "${f.name}"`);
        }
        figures.push(f);
      }
      notes.push(...record.notes);
    }
    status.push({ id: section.id, title: section.title, status: state, reason });
    blocks.push({ section, record, status: state, reason });
  }
  const base: Record<string, Json> = {
    schema_version: SCHEMA_VERSION,
    generator: "saddlekit report",
    inputs: {
      real: sideJson(inputs.real),
      fake: sideJson(inputs.fake),
      scores: inputs.scores
        ? {
          paths: [...inputs.scores.paths],
          sha256: [...inputs.scores.sha256],
          scale: inputs.scores.scale,
          n: { real: inputs.scores.real.length, fake: inputs.scores.fake.length },
        }
        : null,
      generators: inputs.generators
        ? inputs.generators.map((g) => ({ name: g.name, ...(sideJson(g) as Record<string, Json>) }))
        : null,
      log: inputs.log ? { path: inputs.log.path, sha256: inputs.log.sha256 } : null,
      checkpoints: inputs.checkpoints
        ? { path: inputs.checkpoints.path, files: inputs.checkpoints.files.length }
        : null,
      claims: prep.claimsFile
        ? { path: prep.claimsFile.path, sha256: prep.claimsFile.sha256 }
        : null,
    },
    plan: JSON.parse(JSON.stringify(plan)) as Json,
    environment: { linalg: linalgBackend().name },
    sections: status,
    methods,
    estimates,
    tests,
    ...data,
  };
  const t0 = performance.now();
  const claims = checkClaims(base, prep.claims);
  timings.push({ step: "claims", seconds: (performance.now() - t0) / 1000 });
  const verdicts = { holds: 0, fails: 0, undecided: 0 };
  for (const c of claims) verdicts[c.verdict]++;
  const summary: Json = {
    ...base,
    claims: claims.map(claimJson),
    verdicts,
    notes: [...new Set(notes)],
  };
  const summaryText = JSON.stringify(summary, null, 2) + "\n";
  const html = renderReportHtml({
    prep,
    blocks,
    claims,
    figures,
    notes: [...new Set(notes)],
    timings,
  });
  return { summary, summaryText, figures, html, timings, claims };
}
