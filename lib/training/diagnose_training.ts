/**
 * Diagnosis of a training log against the equilibrium values the theory predicts:
 * discriminator winning, oscillation, divergence, sudden collapse and plateaus away from
 * equilibrium, each flag with its evidence (steps, statistic, threshold).
 *
 * @module
 */
import { withDisplay } from "../display/display.ts";
import { withHidden } from "../estimate/hidden.ts";
import {
  escapeHtml,
  formatNumber,
  htmlTable,
  type TableCell,
  textTable,
} from "../display/table.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { changePoints, differenceSigma } from "./change_points.ts";
import { detrend, type Periodogram, periodogram } from "./periodogram.ts";
import { exponentialMovingAverage, movingMedian } from "./smoothing.ts";
import {
  TRAINING_ROLE_NAMES,
  type TrainingLog,
  type TrainingRole,
  type TrainingRun,
} from "./training_log.ts";

/** The kinds of flag {@linkcode diagnoseTraining} raises. */
export type TrainingFlagKind =
  | "oscillation"
  | "divergence"
  | "collapse"
  | "discriminator-winning"
  | "plateau";

/** The roles whose equilibrium value the theory gives. */
export type EquilibriumRole = "dLoss" | "gLoss" | "dReal" | "dFake";

/**
 * Equilibrium values of the logged quantities when p_g = p_data and D = 1/2 everywhere
 * (Goodfellow et al. 2014, Prop. 1 and Thm. 1): the discriminator's binary cross-entropy
 * summed over the real and the generated batch, `-ln D(x) - ln(1 - D(G(z)))` → 2 ln 2; the
 * non-saturating generator loss `-ln D(G(z))` → ln 2; D's outputs → 1/2. A discriminator
 * loss that averages the two terms instead of summing them tends to ln 2: pass
 * `equilibrium: { dLoss: Math.LN2 }`.
 */
export const TRAINING_EQUILIBRIUM: Readonly<Record<EquilibriumRole, number>> = Object.freeze({
  dLoss: 2 * Math.LN2,
  gLoss: Math.LN2,
  dReal: 0.5,
  dFake: 0.5,
});

/** The evidence behind a flag. */
export interface TrainingFlagEvidence {
  /** What was measured ("Fisher's g p-value", "median D loss over the last 60 records"...). */
  readonly statistic: string;
  /** Its value. */
  readonly value: number;
  /** The threshold it crossed (the option's value, in the statistic's units). */
  readonly threshold: number;
  /** The steps the evidence covers, first and last. */
  readonly steps: readonly [number, number];
}

/** One finding of {@linkcode diagnoseTraining}. */
export interface TrainingFlag {
  /** What was found. */
  readonly kind: TrainingFlagKind;
  /** The run (`""` when the log has one). */
  readonly run: string;
  /** The column the flag rests on (the D loss column for "discriminator-winning"). */
  readonly series: string;
  /** The step where it starts. */
  readonly step: number;
  /** The last step it covers. */
  readonly end: number;
  /** For "oscillation": the dominant period, in steps. */
  readonly period?: number;
  /** The statistic, its value and its threshold. */
  readonly evidence: TrainingFlagEvidence;
  /** One sentence saying what was found. */
  readonly message: string;
}

/** What the diagnosis measured on one column of one run. */
export interface SeriesDiagnosis {
  /** The run. */
  readonly run: string;
  /** The column. */
  readonly column: string;
  /** Its role, when it has one. */
  readonly role?: TrainingRole;
  /** The equilibrium value, for the four roles that have one. */
  readonly equilibrium?: number;
  /** Median of the last `tail` share of the finite records. */
  readonly tailMedian: number;
  /** Robust noise sd (median absolute first difference x 1.4826 / sqrt 2). */
  readonly noise: number;
  /** Steps of the finite records (non-enumerable). */
  readonly steps: Float64Array;
  /** The finite raw values (non-enumerable). */
  readonly values: Float64Array;
  /** Moving median of the finite values (non-enumerable). */
  readonly median: Float64Array;
  /** Exponential moving average of the finite values (non-enumerable). */
  readonly ema: Float64Array;
  /** Periodogram after the warm-up (non-enumerable; absent when too short). */
  readonly periodogram?: Periodogram;
  /** First step of the periodogram's window (non-enumerable). */
  readonly periodogramStart?: number;
}

/**
 * Options of {@linkcode diagnoseTraining}. Every threshold has a documented default; the
 * defaults are tuned so that clean converging logs of a few hundred records raise a flag
 * in at most {@linkcode TRAINING_FALSE_ALARM_RATE} of cases (measured by the tests).
 */
export interface DiagnoseTrainingOptions {
  /** Diagnose only this run (default all). */
  run?: string;
  /** Equilibrium values to compare with (default {@linkcode TRAINING_EQUILIBRIUM}). */
  equilibrium?: Partial<Record<EquilibriumRole, number>>;
  /** Extra metric columns to check for divergence, collapse and oscillation (default none). */
  metrics?: readonly string[];
  /** Share of the records skipped at the start by the oscillation and collapse checks (default 0.1). */
  warmup?: number;
  /** Share of the records that is the "end" for the winning and plateau checks (default 0.2, at least 10 records). */
  tail?: number;
  /** Window of the moving median, odd (default 11 records). */
  window?: number;
  /**
   * Longest series read record by record (default 5000); longer ones are read as means of
   * consecutive blocks (said in the notes), which keeps the periodogram and PELT fast.
   */
  maxRecords?: number;
  /** Half-life of the exponential moving average, in records (default 10; drawn, not tested). */
  halfLife?: number;
  /**
   * Oscillation: family-wise level of Fisher's g test over the series tested, split evenly
   * (Bonferroni) (default 0.001).
   */
  oscillationAlpha?: number;
  /** Oscillation: smallest amplitude, as a share of the equilibrium value's magnitude (default 0.05). */
  oscillationAmplitude?: number;
  /** Oscillation: polynomial degree of the trend removed first (default 3). */
  detrendDegree?: number;
  /** Oscillation: fewest cycles a period must complete in the window (default 3). */
  minCycles?: number;
  /** Divergence: bound on a loss's moving median, as a multiple of its equilibrium value (default 20). */
  divergenceFactor?: number;
  /** Divergence: bounds for other columns by name (default none: only NaN counts). */
  bounds?: Readonly<Record<string, number>>;
  /** Divergence: the onset is where the moving median leaves its floor by this many noise sds (default 6). */
  divergenceSigmas?: number;
  /** Collapse: PELT penalty per segment in noise variances (default 2 ln n). */
  penalty?: number;
  /** Collapse: shortest segment and comparison window, in records (default 5). */
  minSegment?: number;
  /** Collapse: smallest jump, as a share of the equilibrium value's magnitude (default 0.25). */
  collapseJump?: number;
  /** Collapse: smallest jump in noise sds (default 8). */
  collapseSigmas?: number;
  /** Collapse: the jump must exceed the drift before it by this factor (default 3). */
  collapseDrift?: number;
  /** Winning: D loss below this share of its equilibrium value (default 0.1). */
  winningLoss?: number;
  /** Winning: D on fake below this value (default 0.05; D on real above 1 minus it when there is no D loss). */
  winningOutput?: number;
  /** Plateau: distance from equilibrium, as a share of its magnitude (default 0.25). */
  plateauDistance?: number;
  /** Plateau: the tail must move less than this share of its distance from equilibrium (default 0.25). */
  plateauFlat?: number;
}

/**
 * The false-alarm rate the default thresholds are held to: the share of clean, converging
 * synthetic logs (white noise around an exponential approach to equilibrium, 400 records)
 * that raise any flag. The tests measure it over 200 seeded logs.
 */
export const TRAINING_FALSE_ALARM_RATE = 0.05;

/** The diagnosis of a training log. */
export interface TrainingDiagnosis {
  /** The log that was diagnosed. */
  readonly log: TrainingLog;
  /** Findings, by run then step. */
  readonly flags: readonly TrainingFlag[];
  /** What was measured on each column checked. */
  readonly series: readonly SeriesDiagnosis[];
  /** The thresholds used (every option with its default filled in). */
  readonly thresholds:
    & Readonly<
      Required<
        Omit<DiagnoseTrainingOptions, "run" | "metrics" | "bounds" | "equilibrium" | "penalty">
      >
    >
    & {
      readonly equilibrium: Readonly<Record<EquilibriumRole, number>>;
    };
  /** The log's notes and the diagnosis's own. */
  readonly notes: readonly string[];
}

const ROLES: readonly EquilibriumRole[] = ["dLoss", "gLoss", "dReal", "dFake"];

function medianOf(x: ArrayLike<number>, a = 0, b = x.length): number {
  const s = Float64Array.prototype.slice.call(x, a, b).sort();
  const k = s.length;
  if (k === 0) return NaN;
  return k % 2 ? s[k >> 1] : (s[(k >> 1) - 1] + s[k >> 1]) / 2;
}

function checkShare(v: number, name: string, lo = 0, hi = 1): number {
  if (!(v >= lo && v < hi)) {
    throw new SaddleError("invalid-argument", `${name} must be in [${lo}, ${hi}), got ${v}`, {
      parameter: name,
    });
  }
  return v;
}

function positive(v: number, name: string): number {
  if (!(v > 0)) {
    throw new SaddleError("invalid-argument", `${name} must be positive, got ${v}`, {
      parameter: name,
    });
  }
  return v;
}

const fmt = (x: number) => formatNumber(x, 3);

/**
 * Diagnose a training log against the equilibrium the theory predicts (Goodfellow et al.
 * 2014: D's summed BCE → 2 ln 2, D's outputs → 1/2, the non-saturating G loss → ln 2; see
 * {@linkcode TRAINING_EQUILIBRIUM}). For each run, on each of the four role columns found
 * (and the extra `metrics` asked for), the checks are:
 *
 * - **divergence**: a logged NaN or ±Infinity (at its first step), or the moving median of
 *   a loss beyond `divergenceFactor` x its equilibrium value (from the step where it left
 *   its floor by `divergenceSigmas` noise sds);
 * - **discriminator-winning**: over the last `tail` of the records, the median D loss below
 *   `winningLoss` x 2 ln 2 and the median D(fake) below `winningOutput`;
 * - **oscillation**: the periodogram of the series after `warmup`, detrended by a
 *   polynomial of `detrendDegree`, has a maximum that Fisher's g test finds significant at
 *   `oscillationAlpha` / (series tested), with an amplitude of at least
 *   `oscillationAmplitude` x |equilibrium|; the flag has the `period` in steps, and spans
 *   the records where the local amplitude at that period (complex demodulation over whole
 *   periods of at least 20 records) is at least half its largest value;
 * - **collapse**: PELT finds a change in the mean after `warmup` where the median of the
 *   next `minSegment` records differs from the previous ones by at least `collapseJump` x
 *   |equilibrium| and `collapseSigmas` noise sds, and `collapseDrift` times more than the
 *   drift before it (so a fast but smooth descent is not a collapse), and the medians of
 *   longer windows (20 records, or the period of an oscillation of the series if longer)
 *   differ as much (so half a swing of an oscillation is not a collapse);
 * - **plateau**: the tail's median is `plateauDistance` x |equilibrium| or more away from
 *   equilibrium and moved less than `plateauFlat` of that distance over the tail (not
 *   raised for the D columns of a run where the discriminator wins).
 *
 * The raw series stay in the log; the smoothed ones (moving median and EMA) and the
 * periodograms are in `series` for the figures. Steps are read in record order: gaps in
 * the steps (said in the log's notes) stretch periods measured across them.
 *
 * References: Goodfellow et al. 2014 (NeurIPS), Prop. 1, Thm. 1; Fisher 1929 (Proc. R.
 * Soc. A 125), the g test; Killick, Fearnhead & Eckley 2012 (JASA), PELT.
 *
 * @example A discriminator that wins
 * ```ts
 * import { trainingLog } from "./training_log.ts";
 * import { diagnoseTraining } from "./diagnose_training.ts";
 * import assert from "node:assert/strict";
 * const n = 200, step = Array.from({ length: n }, (_, i) => 10 * i);
 * const d_loss = step.map((_, i) => 1.4 * Math.exp(-i / 20) + 0.01 + 0.005 * Math.sin(i * 2.1));
 * const d_fake = step.map((_, i) => 0.5 * Math.exp(-i / 20) + 0.005 * Math.cos(i * 1.7) ** 2);
 * const flags = diagnoseTraining(trainingLog({ step, d_loss, d_fake })).flags;
 * assert.ok(flags.some((f) => f.kind === "discriminator-winning"));
 * ```
 */
export function diagnoseTraining(
  log: TrainingLog,
  options: DiagnoseTrainingOptions = {},
): TrainingDiagnosis {
  if (log === null || typeof log !== "object" || !Array.isArray(log.runs)) {
    throw new SaddleError(
      "invalid-argument",
      "log must be a TrainingLog (from readTrainingLog, parseTrainingLog or trainingLog)",
      { parameter: "log" },
    );
  }
  const eq = { ...TRAINING_EQUILIBRIUM, ...(options.equilibrium ?? {}) };
  const t = {
    warmup: checkShare(options.warmup ?? 0.1, "warmup"),
    tail: checkShare(options.tail ?? 0.2, "tail", 1e-9, 1.000001),
    window: options.window ?? 11,
    halfLife: positive(options.halfLife ?? 10, "halfLife"),
    maxRecords: positive(options.maxRecords ?? 5000, "maxRecords"),
    oscillationAlpha: checkShare(options.oscillationAlpha ?? 1e-3, "oscillationAlpha", 1e-300),
    oscillationAmplitude: options.oscillationAmplitude ?? 0.05,
    detrendDegree: options.detrendDegree ?? 3,
    minCycles: options.minCycles ?? 3,
    divergenceFactor: positive(options.divergenceFactor ?? 20, "divergenceFactor"),
    divergenceSigmas: positive(options.divergenceSigmas ?? 6, "divergenceSigmas"),
    minSegment: options.minSegment ?? 5,
    collapseJump: positive(options.collapseJump ?? 0.25, "collapseJump"),
    collapseSigmas: positive(options.collapseSigmas ?? 8, "collapseSigmas"),
    collapseDrift: positive(options.collapseDrift ?? 3, "collapseDrift"),
    winningLoss: positive(options.winningLoss ?? 0.1, "winningLoss"),
    winningOutput: positive(options.winningOutput ?? 0.05, "winningOutput"),
    plateauDistance: positive(options.plateauDistance ?? 0.25, "plateauDistance"),
    plateauFlat: positive(options.plateauFlat ?? 0.25, "plateauFlat"),
    equilibrium: Object.freeze(eq),
  };
  if (!Number.isInteger(t.window) || t.window < 1 || t.window % 2 === 0) {
    throw new SaddleError(
      "invalid-argument",
      `window must be an odd positive integer, got ${t.window}`,
      {
        parameter: "window",
      },
    );
  }
  const runs = options.run === undefined
    ? log.runs
    : log.runs.filter((r) => r.name === options.run);
  if (runs.length === 0) {
    throw new SaddleError(
      "not-found",
      `no run named "${options.run}"; runs are ${log.runs.map((r) => `"${r.name}"`).join(", ")}`,
      { parameter: "run" },
    );
  }
  for (const m of options.metrics ?? []) {
    if (!log.metrics.includes(m) && !Object.values(log.roles).includes(m)) {
      throw new SaddleError(
        "not-found",
        `no metric column "${m}"; metrics are ${
          log.metrics.map((c) => `"${c}"`).join(", ") || "none"
        }`,
        { parameter: "metrics" },
      );
    }
  }
  const flags: TrainingFlag[] = [];
  const series: SeriesDiagnosis[] = [];
  const notes = [...log.notes];
  for (const run of runs) {
    const r = diagnoseRun(log, run, t, options, notes);
    flags.push(...r.flags);
    series.push(...r.series);
  }
  const { equilibrium: _e, ...rest } = t;
  const out: TrainingDiagnosis = {
    log,
    flags,
    series,
    thresholds: Object.freeze({ ...rest, equilibrium: t.equilibrium }),
    notes,
  };
  return Object.freeze(withDisplay(out, diagnosisBundle));
}

type Thresholds = TrainingDiagnosis["thresholds"];

interface Column {
  column: string;
  role?: EquilibriumRole;
  eq?: number;
  steps: Float64Array;
  x: Float64Array;
  /** Steps per record (the log's increment, times the block length of long logs). */
  stepSize: number;
  median: Float64Array;
  noise: number;
}

function diagnoseRun(
  log: TrainingLog,
  run: TrainingRun,
  t: Thresholds,
  options: DiagnoseTrainingOptions,
  notes: string[],
): { flags: TrainingFlag[]; series: SeriesDiagnosis[] } {
  const flags: TrainingFlag[] = [];
  const label = run.name === "" ? "" : `run "${run.name}": `;
  const cols: Column[] = [];
  const wanted: { column: string; role?: EquilibriumRole }[] = [];
  for (const role of ROLES) {
    const c = log.roles[role];
    if (c !== undefined) wanted.push({ column: c, role });
  }
  for (const m of options.metrics ?? []) {
    if (!wanted.some((w) => w.column === m)) wanted.push({ column: m });
  }
  for (const w of wanted) {
    const raw = run.columns[w.column];
    let k = 0;
    for (let i = 0; i < raw.length; i++) if (Number.isFinite(raw[i])) k++;
    const steps = new Float64Array(k), x = new Float64Array(k);
    k = 0;
    for (let i = 0; i < raw.length; i++) {
      if (Number.isFinite(raw[i])) [steps[k], x[k++]] = [run.steps[i], raw[i]];
    }
    const bad = run.nonFinite.filter((e) => e.column === w.column);
    if (bad.length) {
      flags.push(makeFlag(run, {
        kind: "divergence",
        series: w.column,
        step: bad[0].step,
        end: bad[bad.length - 1].step,
        statistic: "logged NaN or infinite values",
        value: bad.length,
        threshold: 0,
        message: `${label}"${w.column}" was logged as ${bad[0].value} at step ${bad[0].step}` +
          (bad.length > 1 ? ` (${bad.length} non-finite values in all)` : ""),
      }));
    }
    if (k < 10) {
      notes.push(`${label}"${w.column}" has ${k} finite record(s); too few to diagnose`);
      continue;
    }
    const eq = w.role ? t.equilibrium[w.role] : undefined;
    // Long logs are read in block means, so the periodogram and PELT (quadratic when
    // changes are rare) stay fast.
    const b = Math.ceil(k / t.maxRecords);
    if (b > 1) {
      notes.push(
        `${label}"${w.column}": ${k} records read as means of blocks of ${b} (maxRecords ` +
          `${t.maxRecords})`,
      );
    }
    const [bs, bx] = b > 1 ? blockMeans(steps, x, b) : [steps, x];
    cols.push({
      column: w.column,
      ...(w.role ? { role: w.role } : {}),
      ...(eq !== undefined ? { eq } : {}),
      steps: bs,
      x: bx,
      stepSize: (run.stepSize > 0 ? run.stepSize : 1) * b,
      median: movingMedian(bx, t.window),
      noise: differenceSigma(bx),
    });
  }
  const tailLen = (n: number) => Math.min(n, Math.max(10, Math.round(t.tail * n)));

  // Divergence: a loss whose moving median passes its bound.
  const divergedAt = new Map<string, number>();
  for (const c of cols) {
    const bound = c.role === "dLoss" || c.role === "gLoss"
      ? t.divergenceFactor * Math.abs(c.eq!)
      : options.bounds?.[c.column];
    if (bound === undefined) continue;
    const cross = c.median.findIndex((v) => Math.abs(v) > bound);
    if (cross < 0) continue;
    const level = (cross > 0 ? Math.abs(medianOf(c.median, 0, cross)) : 0) +
      t.divergenceSigmas * c.noise;
    let onset = cross;
    while (onset > 0 && Math.abs(c.median[onset - 1]) > level) onset--;
    divergedAt.set(c.column, onset);
    let peak = 0;
    for (let i = cross; i < c.x.length; i++) peak = Math.max(peak, Math.abs(c.median[i]));
    flags.push(makeFlag(run, {
      kind: "divergence",
      series: c.column,
      step: c.steps[onset],
      end: c.steps[c.steps.length - 1],
      statistic: `moving median of "${c.column}" (${t.window} records), largest magnitude`,
      value: peak,
      threshold: bound,
      message: `${label}"${c.column}" grows from step ${c.steps[onset]} and passes ${fmt(bound)} ` +
        `at step ${c.steps[cross]}`,
    }));
  }

  // Discriminator winning, from the D loss and D(fake) (or D(real) and D(fake)).
  const byRole = (r: EquilibriumRole) => cols.find((c) => c.role === r);
  const dLoss = byRole("dLoss"), dFake = byRole("dFake"), dReal = byRole("dReal");
  let winning = false;
  {
    const lossLimit = t.winningLoss * Math.abs(t.equilibrium.dLoss);
    const conds: { c: Column; ok: (v: number) => boolean; limit: number; what: string }[] = [];
    if (dLoss) conds.push({ c: dLoss, ok: (v) => v < lossLimit, limit: lossLimit, what: "D loss" });
    if (dFake) {
      conds.push({
        c: dFake,
        ok: (v) => v < t.winningOutput,
        limit: t.winningOutput,
        what: "D(fake)",
      });
    }
    if (!dLoss && dReal) {
      conds.push({
        c: dReal,
        ok: (v) => v > 1 - t.winningOutput,
        limit: 1 - t.winningOutput,
        what: "D(real)",
      });
    }
    const usable = conds.length >= 2 || (conds.length === 1 && conds[0].what === "D loss");
    if (usable) {
      const tails = conds.map((q) => {
        const n = q.c.x.length, L = tailLen(n);
        return medianOf(q.c.x, n - L, n);
      });
      if (conds.every((q, i) => q.ok(tails[i]))) {
        winning = true;
        // Start: the first step of the last stretch where every smoothed series meets its condition.
        const first = conds.map((q) => {
          let i = q.c.x.length;
          while (i > 0 && q.ok(q.c.median[i - 1])) i--;
          return q.c.steps[Math.min(i, q.c.x.length - 1)];
        });
        const start = Math.max(...first);
        const main = conds[0];
        const L = tailLen(main.c.x.length);
        flags.push(makeFlag(run, {
          kind: "discriminator-winning",
          series: main.c.column,
          step: start,
          end: main.c.steps[main.c.steps.length - 1],
          statistic: `median ${main.what} over the last ${L} records`,
          value: tails[0],
          threshold: main.limit,
          steps: [main.c.steps[main.c.x.length - L], main.c.steps[main.c.x.length - 1]],
          message: `${label}the discriminator wins from step ${start}: ` +
            conds.map((q, i) => `median ${q.what} ${fmt(tails[i])} (limit ${fmt(q.limit)})`).join(
              ", ",
            ),
        }));
      }
    } else if (conds.length) {
      notes.push(
        `${label}discriminator winning not checked: it needs the D loss, or D(real) and D(fake)`,
      );
    }
  }

  // Collapse after the warm-up; then oscillation between the warm-up and the first break
  // (a collapse or divergence: a step or a blow-up would fill the low frequencies).
  const seriesOut: SeriesDiagnosis[] = [];
  const tested = cols.length;
  const alpha = t.oscillationAlpha / Math.max(1, tested);
  const warm = (c: Column) => Math.floor(t.warmup * c.x.length);
  const scaleOf = (c: Column) =>
    c.eq !== undefined ? Math.abs(c.eq) : Math.abs(medianOf(c.x)) || c.noise;
  // A periodogram of the whole window after the warm-up, where a collapse's step leaks
  // only into the lowest frequencies (not a line), gives the period a collapse must
  // outlast: half an oscillation is not a collapse.
  const oscillationIn = (c: Column, from: number, to: number) => {
    let pg: Periodogram | undefined;
    try {
      pg = periodogram(c.x.subarray(from, to), {
        detrendDegree: t.detrendDegree,
        minCycles: t.minCycles,
        stepSize: c.stepSize,
      });
    } catch (e) {
      if (!(e instanceof SaddleError)) throw e;
      return { error: e.message };
    }
    // A spectral line is a local maximum; a maximum at the lowest frequency kept is the
    // leakage of a trend or step, not a period.
    const line = pg.peak > 0 && pg.peak < pg.power.length - 1;
    const found = line && pg.pValue < alpha && pg.amplitude >= t.oscillationAmplitude * scaleOf(c);
    return { pg, found };
  };
  const collapsed = new Set<string>();
  const whole = new Map<string, ReturnType<typeof oscillationIn>>();
  for (const c of cols) {
    const pre = oscillationIn(c, warm(c), c.x.length);
    whole.set(c.column, pre);
    const periodRecords = pre.found ? pre.pg!.n / pre.pg!.k[pre.pg!.peak] : 0;
    const collapse = findCollapse(c, warm(c), scaleOf(c), t, {
      penalty: options.penalty,
      divergenceOnset: divergedAt.get(c.column),
      persistence: Math.max(4 * t.minSegment, 20, Math.ceil(periodRecords)),
    });
    if (!collapse) continue;
    collapsed.add(c.column);
    flags.push(makeFlag(run, {
      kind: "collapse",
      series: c.column,
      step: c.steps[collapse.at],
      end: c.steps[collapse.end - 1],
      statistic: `jump of the median across the change point (${t.minSegment} records a side)`,
      value: collapse.jump,
      threshold: collapse.threshold,
      message: `${label}"${c.column}" jumps by ${fmt(collapse.jump)} at step ${
        c.steps[collapse.at]
      } (from ${fmt(collapse.before)} to ${fmt(collapse.after)})`,
    }));
  }
  const breakStep = Math.min(
    Infinity,
    ...flags.filter((f) => f.kind === "collapse" || f.kind === "divergence").map((f) => f.step),
  );
  for (const c of cols) {
    const n = c.x.length;
    const w0 = warm(c);
    let w1 = n;
    while (w1 > w0 && c.steps[w1 - 1] >= breakStep) w1--;
    const osc = w1 === n ? whole.get(c.column)! : oscillationIn(c, w0, w1);
    if (osc.error) notes.push(`${label}"${c.column}": no periodogram (${osc.error})`);
    const pg = osc.pg;
    if (pg && osc.found) {
      const period = pg.period[pg.peak];
      const [on, off] = oscillationSpan(c.x.subarray(w0, w1), pg, t.detrendDegree);
      flags.push(makeFlag(run, {
        kind: "oscillation",
        series: c.column,
        step: c.steps[w0 + on],
        end: c.steps[w0 + off],
        steps: [c.steps[w0], c.steps[w1 - 1]],
        period,
        statistic: `Fisher's g p-value of the periodogram maximum (g = ${fmt(pg.g)}, ` +
          `${pg.power.length} frequencies)`,
        value: pg.pValue,
        threshold: alpha,
        message: `${label}"${c.column}" oscillates with period ${fmt(period)} steps and ` +
          `amplitude ${fmt(pg.amplitude)} (p = ${formatNumber(pg.pValue, 2)})`,
      }));
    }
    // Plateau away from equilibrium.
    const L = tailLen(n);
    const tailMedian = medianOf(c.x, n - L, n);
    const skipPlateau = collapsed.has(c.column) ||
      (winning && (c.role === "dLoss" || c.role === "dFake" || c.role === "dReal"));
    if (c.eq !== undefined && !skipPlateau && !divergedAt.has(c.column)) {
      const dist = Math.abs(tailMedian - c.eq);
      const limit = t.plateauDistance * Math.abs(c.eq);
      const moved = Math.abs(tailSlope(c.x, n - L) * (L - 1));
      if (dist > limit && moved < t.plateauFlat * dist) {
        const band = Math.max(3 * c.noise, dist / 2);
        let i = n - L;
        while (i > 0 && Math.abs(c.median[i - 1] - tailMedian) <= band) i--;
        flags.push(makeFlag(run, {
          kind: "plateau",
          series: c.column,
          step: c.steps[i],
          end: c.steps[n - 1],
          statistic: `distance of the median over the last ${L} records from ${fmt(c.eq)}`,
          value: dist,
          threshold: limit,
          message: `${label}"${c.column}" settles at ${fmt(tailMedian)} from step ${c.steps[i]}, ` +
            `${fmt(dist)} away from its equilibrium value ${fmt(c.eq)}`,
        }));
      }
    }
    seriesOut.push(
      withHidden(
        {
          run: run.name,
          column: c.column,
          ...(c.role ? { role: c.role } : {}),
          ...(c.eq !== undefined ? { equilibrium: c.eq } : {}),
          tailMedian,
          noise: c.noise,
        } as SeriesDiagnosis,
        {
          steps: c.steps,
          values: c.x,
          median: c.median,
          ema: exponentialMovingAverage(c.x, { halfLife: t.halfLife }),
          ...(pg ? { periodogram: pg, periodogramStart: c.steps[w0] } : {}),
        },
      ),
    );
  }
  flags.sort((a, b) => a.step - b.step);
  return { flags: flags.map((f) => Object.freeze(f)), series: seriesOut };
}

/** Fields of a flag, with the evidence's steps defaulting to [step, end]. */
interface FlagFields {
  kind: TrainingFlagKind;
  series: string;
  step: number;
  end: number;
  period?: number;
  statistic: string;
  value: number;
  threshold: number;
  steps?: readonly [number, number];
  message: string;
}

function makeFlag(run: TrainingRun, f: FlagFields): TrainingFlag {
  return {
    kind: f.kind,
    run: run.name,
    series: f.series,
    step: f.step,
    end: f.end,
    ...(f.period !== undefined ? { period: f.period } : {}),
    evidence: {
      statistic: f.statistic,
      value: f.value,
      threshold: f.threshold,
      steps: f.steps ?? [f.step, f.end],
    },
    message: f.message,
  };
}

/**
 * Where the oscillation is: the local amplitude at the peak frequency over a sliding window
 * of whole periods, at least 20 records (complex demodulation of the detrended series); the
 * span is where it is at least half its largest value. Returns the first and last record
 * index; the edges are good to about half a window.
 */
function oscillationSpan(x: Float64Array, pg: Periodogram, degree: number): [number, number] {
  const r = detrend(x, degree);
  const n = r.length, k = pg.k[pg.peak];
  // Whole periods covering at least 20 records, so one window's amplitude is not noise.
  const period = Math.max(2, Math.round(n / k));
  const P = period * Math.ceil(20 / period);
  if (P >= n) return [0, n - 1];
  const w = (2 * Math.PI * k) / n;
  const re = new Float64Array(n + 1), im = new Float64Array(n + 1);
  for (let s = 0; s < n; s++) {
    re[s + 1] = re[s] + r[s] * Math.cos(w * s);
    im[s + 1] = im[s] - r[s] * Math.sin(w * s);
  }
  const amp = new Float64Array(n - P + 1);
  let top = 0;
  for (let i = 0; i + P <= n; i++) {
    amp[i] = Math.hypot(re[i + P] - re[i], im[i + P] - im[i]);
    top = Math.max(top, amp[i]);
  }
  let first = 0, last = amp.length - 1;
  while (first < last && amp[first] < top / 2) first++;
  while (last > first && amp[last] < top / 2) last--;
  // Half the largest amplitude is reached when the window is half into the oscillating
  // stretch: its centre marks the edge (unless the stretch runs to the series' ends).
  const h = Math.floor(P / 2);
  return [first === 0 ? 0 : first + h, last === amp.length - 1 ? n - 1 : last + h];
}

/** Means of consecutive blocks of `b` records, each at its first step. */
function blockMeans(steps: Float64Array, x: Float64Array, b: number): [Float64Array, Float64Array] {
  const m = Math.ceil(x.length / b);
  const s = new Float64Array(m), v = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    const a = j * b, e = Math.min(x.length, a + b);
    let sum = 0;
    for (let i = a; i < e; i++) sum += x[i];
    [s[j], v[j]] = [steps[a], sum / (e - a)];
  }
  return [s, v];
}

/** Least-squares slope of x[a..] per record. */
function tailSlope(x: Float64Array, a: number): number {
  const n = x.length - a;
  if (n < 2) return 0;
  const tm = (n - 1) / 2;
  let xm = 0;
  for (let i = a; i < x.length; i++) xm += x[i] / n;
  let sxy = 0, sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (i - tm) * (x[a + i] - xm);
    sxx += (i - tm) * (i - tm);
  }
  return sxy / sxx;
}

function findCollapse(
  c: Column,
  w0: number,
  scale: number,
  t: Thresholds,
  { penalty, divergenceOnset, persistence }: {
    penalty?: number;
    divergenceOnset?: number;
    persistence: number;
  },
):
  | { at: number; end: number; jump: number; threshold: number; before: number; after: number }
  | undefined {
  const w = Math.max(2, t.minSegment);
  const x = c.x.subarray(w0);
  if (x.length < 4 * w) return undefined;
  const cp = changePoints(x, { minSegment: w, ...(penalty !== undefined ? { penalty } : {}) });
  const bounds = [...cp.changePoints, x.length];
  const threshold = Math.max(t.collapseJump * scale, t.collapseSigmas * c.noise);
  for (let j = 0; j < cp.changePoints.length; j++) {
    const tau = cp.changePoints[j];
    if (tau < 2 * w || tau + w > x.length) continue;
    if (divergenceOnset !== undefined && w0 + tau >= divergenceOnset - w) continue;
    const before = medianOf(x, tau - w, tau), after = medianOf(x, tau, tau + w);
    const earlier = medianOf(x, tau - 2 * w, tau - w);
    const jump = Math.abs(after - before);
    const drift = Math.abs(before - earlier);
    // The new level must persist: the medians of longer windows differ as much.
    const L = persistence;
    const lasting = Math.abs(
      medianOf(x, tau, Math.min(x.length, tau + L)) - medianOf(x, Math.max(0, tau - L), tau),
    );
    if (jump >= threshold && jump >= t.collapseDrift * drift && lasting >= threshold) {
      return {
        at: w0 + tau,
        end: w0 + bounds[j + 1],
        jump,
        threshold,
        before,
        after,
      };
    }
  }
  return undefined;
}

function diagnosisBundle(d: TrainingDiagnosis): Record<string, string> {
  const header = [
    "run",
    "flag",
    "series",
    "from step",
    "to step",
    "period",
    "statistic",
    "value",
    "threshold",
  ];
  const rows: TableCell[][] = d.flags.map((f) => [
    f.run,
    f.kind,
    f.series,
    f.step,
    f.end,
    f.period ?? null,
    f.evidence.statistic,
    f.evidence.value,
    f.evidence.threshold,
  ]);
  const sHeader = ["run", "series", "role", "equilibrium", "median of the tail", "noise sd"];
  const sRows: TableCell[][] = d.series.map((s) => [
    s.run,
    s.column,
    s.role ? TRAINING_ROLE_NAMES[s.role] : "metric",
    s.equilibrium ?? null,
    s.tailMedian,
    s.noise,
  ]);
  const title = `Diagnosis of ${d.log.source}: ${
    d.flags.length ? `${d.flags.length} flag(s)` : "no flag"
  }`;
  return {
    "text/plain": [
      title,
      d.flags.length ? textTable(header, rows) : "",
      ...d.flags.map((f) => `- ${f.message}`),
      textTable(sHeader, sRows),
      ...d.notes.map((n) => `note: ${n}`),
    ].filter(Boolean).join("\n"),
    "text/html": `<div><b>${escapeHtml(title)}</b>${
      d.flags.length ? htmlTable(header, rows) : ""
    }<ul>${d.flags.map((f) => `<li>${escapeHtml(f.message)}</li>`).join("")}</ul>${
      htmlTable(sHeader, sRows, "End state against the equilibrium values")
    }<ul>${d.notes.map((n) => `<li>${escapeHtml(n)}</li>`).join("")}</ul></div>`,
  };
}
