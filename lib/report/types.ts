/**
 * The parts of a report: the run context every section reads, the section interface, and
 * the record each section fills (estimates, parameters, figures, HTML).
 *
 * @module
 */
import type { Estimate } from "../estimate/mod.ts";
import type { Figure } from "../plot/mod.ts";
import type { ReportInputs } from "./inputs.ts";
import type { ReportPlan } from "./defaults.ts";
import type { Claim, ClaimResult } from "./claims.ts";
import type { Json } from "./json.ts";

/** Progress of a long step: a label and the fraction done in [0, 1]. */
export type ReportProgress = (step: string, fraction: number) => void;

/** What every section reads: the inputs, the plan chosen from the data, and shared fits. */
export interface ReportContext {
  /** The samples of both sides and the optional discriminator outputs. */
  readonly inputs: ReportInputs;
  /** Methods and parameters chosen from the data (and the caller's overrides). */
  readonly plan: ReportPlan;
  /**
   * Objects one section makes for a later one (the density fits for the discriminator's
   * gap to D*), by name.
   */
  readonly shared: Map<string, unknown>;
  /** Progress callback (a no-op when nobody listens). */
  readonly onProgress: ReportProgress;
}

/** A two-sample test as the report keeps it. */
export interface ReportTest {
  /** The test's name. */
  readonly method: string;
  /** The statistic with its interval. */
  readonly statistic: Estimate;
  /** p-value of "both sides come from one distribution". */
  readonly pValue: number;
  /** Random relabellings behind the p-value (0 for an exact one). */
  readonly permutations: number;
  /** Caveats and settings. */
  readonly notes: readonly string[];
}

/** One figure of a section: saved as `<name>.svg` and `<name>.png`, inlined in the HTML. */
export interface ReportFigure {
  /** File name without extension, unique in the report (letters, digits, `_`). */
  readonly name: string;
  /** The figure. */
  readonly figure: Figure;
  /** One sentence under the figure. */
  readonly caption: string;
}

/** What a section adds to the report. */
export interface SectionRecord {
  /** Estimates under `estimates.<group>.<key>` of summary.json. */
  readonly estimates: Record<string, Record<string, Estimate>>;
  /**
   * Results that are not estimates, under top-level keys of summary.json (`training`,
   * `checkpoints`); each key is null in the summary when its section did not run.
   */
  readonly data: Record<string, Json>;
  /** Two-sample tests under `tests.<name>` of summary.json. */
  readonly tests: Record<string, ReportTest>;
  /** Methods and parameters under `methods.<section id>`. */
  readonly methods: Record<string, Json>;
  /** Figures, in display order. */
  readonly figures: ReportFigure[];
  /** HTML blocks (tables, paragraphs), shown before the figures. */
  readonly html: string[];
  /** One-line findings for the first screen. */
  readonly headlines: string[];
  /** Caveats of this section. */
  readonly notes: string[];
  /** Seconds of the section's own steps (timings.json lists them under the section). */
  readonly timings: { step: string; seconds: number }[];
}

/**
 * One section of the report. A new capability plugs in as a section: it says whether it
 * applies to the inputs, which estimate keys it will write (so claims are checked before
 * any long computation), and runs.
 */
export interface ReportSection {
  /** Stable id: the key under `methods` and in `sections` of summary.json. */
  readonly id: string;
  /** Heading in the HTML report. */
  readonly title: string;
  /** `true` when the section runs on these inputs, or the reason it does not. */
  applies(ctx: ReportContext): true | string;
  /**
   * The summary.json paths of the results this section will write that claims may address
   * (`estimates.<group>.<key>`).
   */
  keys(ctx: ReportContext): string[];
  /** Compute and fill `out`. */
  run(ctx: ReportContext, out: SectionRecord): Promise<void> | void;
}

/** Everything checked before the long computation. */
export interface PreparedAnalysis {
  /** The inputs, read and checked. */
  readonly inputs: ReportInputs;
  /** The methods chosen. */
  readonly plan: ReportPlan;
  /** The claims, parsed and checked against the estimate paths of this run. */
  readonly claims: readonly Claim[];
  /** The claims file and its checksum. */
  readonly claimsFile?: { readonly path: string; readonly sha256: string };
  /** Each section and whether it runs (true) or why not. */
  readonly sections: readonly {
    readonly section: ReportSection;
    readonly applies: true | string;
  }[];
  /** Paths of the results this run will write that claims may address. */
  readonly keys: readonly string[];
  /** Progress callback. */
  readonly onProgress: ReportProgress;
}

/** A finished analysis, ready to write. */
export interface Report {
  /** summary.json's content. */
  readonly summary: Json;
  /** summary.json's bytes (two-space JSON and a final newline). */
  readonly summaryText: string;
  /** Every figure, in report order. */
  readonly figures: readonly ReportFigure[];
  /** index.html. */
  readonly html: string;
  /**
   * Seconds per step (also in timings.json; not in summary.json, so that seeds decide its
   * bytes). A section's own steps name it in `within` and count inside its time.
   */
  readonly timings: readonly {
    readonly step: string;
    readonly seconds: number;
    readonly within?: string;
  }[];
  /** The claims' verdicts. */
  readonly claims: readonly ClaimResult[];
}
