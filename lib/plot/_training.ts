/**
 * Shared pieces of the training figures: the diagnosis of a log or a diagnosis, the series
 * of one run as rows, and the shaded spans of the flags.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { SaddleError } from "../errors/saddle_error.ts";
import {
  diagnoseTraining,
  type SeriesDiagnosis,
  type TrainingDiagnosis,
  type TrainingFlag,
  type TrainingFlagKind,
} from "../training/diagnose_training.ts";
import type { TrainingLog } from "../training/training_log.ts";
import { axisLabel, lineStyle, referenceY } from "./axes.ts";
import { composeFigure, type LegendItem } from "./compose.ts";
import type { Figure } from "./figure.ts";
import { INK_MUTED, type Role } from "./palette.ts";
import type { PlotMark } from "./plot_types.ts";
import { short } from "./_text.ts";

/** A diagnosis as given, or made with the default thresholds from a log. */
export function asDiagnosis(input: TrainingDiagnosis | TrainingLog): TrainingDiagnosis {
  if (input && typeof input === "object" && "flags" in input && "series" in input) return input;
  if (input && typeof input === "object" && "runs" in input) return diagnoseTraining(input);
  throw new SaddleError(
    "invalid-argument",
    "give a TrainingLog (readTrainingLog) or a TrainingDiagnosis (diagnoseTraining)",
    { parameter: "input" },
  );
}

/** The run to draw: the one named, else the first. */
export function pickRun(d: TrainingDiagnosis, run: string | undefined): string {
  const names = [...new Set(d.series.map((s) => s.run))];
  if (names.length === 0) {
    throw new SaddleError("empty", "the diagnosis has no series to draw", { parameter: "input" });
  }
  if (run === undefined) return names[0];
  if (!names.includes(run)) {
    throw new SaddleError(
      "not-found",
      `no run named "${run}"; runs are ${names.map((n) => `"${n}"`).join(", ")}`,
      { parameter: "run" },
    );
  }
  return run;
}

/** Rows { step, raw, smooth } of a series (moving median or EMA as the smooth line). */
export function seriesRows(
  s: SeriesDiagnosis,
  smoothing: "median" | "ema",
): { step: number; raw: number; smooth: number }[] {
  const sm = smoothing === "ema" ? s.ema : s.median;
  return Array.from(s.steps, (step, i) => ({ step, raw: s.values[i], smooth: sm[i] }));
}

/** Fill colour of each kind of flag (muted, so the curves stay readable). */
export const FLAG_FILL: Readonly<Record<TrainingFlagKind, string>> = Object.freeze({
  "divergence": "#c0392b",
  "collapse": "#8e44ad",
  "discriminator-winning": "#e07050",
  "oscillation": "#2e86c1",
  "plateau": "#7f8c8d",
});

/** Shaded spans of the flags of one run (restricted to `series` when given), with legend entries. */
export function flagSpans(
  flags: readonly TrainingFlag[],
  run: string,
  series?: readonly string[],
): { marks: PlotMark[]; legend: LegendItem[] } {
  const fs = flags.filter((f) => f.run === run && (!series || series.includes(f.series)));
  if (fs.length === 0) return { marks: [], legend: [] };
  // Flags of one kind on several series (both losses oscillating) over overlapping spans
  // draw as one span, their union.
  const rows: { x1: number; x2: number; kind: TrainingFlagKind; label: string }[] = [];
  for (const f of [...fs].sort((a, b) => a.step - b.step)) {
    const label = `${f.kind}${f.period !== undefined ? ` (period ${Math.round(f.period)})` : ""}`;
    const open = rows.find((r) => r.kind === f.kind && f.step <= r.x2);
    if (open) open.x2 = Math.max(open.x2, f.end);
    else rows.push({ x1: f.step, x2: Math.max(f.end, f.step), kind: f.kind, label });
  }
  const marks: PlotMark[] = [
    Plot.rectX(rows, {
      x1: "x1",
      x2: "x2",
      fill: (r: { kind: TrainingFlagKind }) => FLAG_FILL[r.kind],
      fillOpacity: 0.1,
    }),
    Plot.ruleX(rows, {
      x: "x1",
      stroke: (r: { kind: TrainingFlagKind }) => FLAG_FILL[r.kind],
      strokeOpacity: 0.6,
    }),
    Plot.text(rows, {
      x: "x1",
      text: "label",
      frameAnchor: "top",
      textAnchor: "start",
      dx: 3,
      dy: 3,
      fontSize: 9.5,
      fill: INK_MUTED,
    }),
  ];
  const kinds = [...new Set(fs.map((f) => f.kind))];
  const legend: LegendItem[] = kinds.map((k) => ({
    label: `flag: ${k}`,
    shape: "box",
    color: FLAG_FILL[k],
  }));
  return { marks, legend };
}

/** Options of {@linkcode plotLossCurves} and {@linkcode plotDiscriminatorOutputs}. */
export interface TrainingPlotOptions {
  /** Run to draw (default the first). */
  run?: string;
  /** Smooth line: centred moving "median" (default) or "ema". The raw values are drawn faintly behind. */
  smoothing?: "median" | "ema";
  /** Title. */
  title?: string;
  /** Panel width in px (default 640). */
  width?: number;
  /** Panel height in px (default 300). */
  height?: number;
}

/** Draw the role series of one run against their equilibrium values (shared by two figures). */
export function trainingCurves(
  input: TrainingDiagnosis | TrainingLog,
  options: TrainingPlotOptions,
  spec: {
    roles: readonly { role: "dLoss" | "gLoss" | "dReal" | "dFake"; style: Role; label: string }[];
    yLabel: string;
    unit?: string;
    title: string;
    y?: { domain?: [number, number] };
  },
): Figure {
  const d = asDiagnosis(input);
  const run = pickRun(d, options.run);
  const smoothing = options.smoothing ?? "median";
  const marks: PlotMark[] = [];
  const legend: LegendItem[] = [];
  const drawn: string[] = [];
  const refs = new Map<number, string[]>();
  for (const r of spec.roles) {
    const s = d.series.find((x) => x.run === run && x.role === r.role);
    if (!s) continue;
    drawn.push(s.column);
    const rows = seriesRows(s, smoothing);
    const style = lineStyle(r.style);
    marks.push(
      Plot.lineY(rows, {
        x: "step",
        y: "raw",
        stroke: style.stroke,
        strokeOpacity: 0.25,
        strokeWidth: 1,
      }),
      Plot.lineY(rows, { x: "step", y: "smooth", ...style }),
    );
    legend.push({ label: `${r.label} ("${s.column}")`, role: r.style });
    const eq = s.equilibrium!;
    refs.set(eq, [...(refs.get(eq) ?? []), r.label]);
  }
  if (drawn.length === 0) {
    throw new SaddleError(
      "not-found",
      `the log has none of the columns this figure draws (${
        spec.roles.map((r) => r.label).join(", ")
      }); name them with readTrainingLog(path, { columns: { ... } })`,
      { parameter: "input" },
    );
  }
  for (const [v, who] of refs) {
    marks.push(...referenceY(v, { label: `equilibrium ${who.join(", ")} = ${short(v, 4)}` }));
  }
  legend.push({ label: "equilibrium value (p_g = p_data)", role: "reference" });
  const spans = flagSpans(d.flags, run, drawn);
  legend.push(...spans.legend);
  const flagged = d.flags.filter((f) => f.run === run && drawn.includes(f.series)).length;
  // A divergence would squash every other curve: frame the values before it (and the
  // equilibrium lines) with a margin, and clip what leaves the frame.
  const diverged = Math.min(
    Infinity,
    ...d.flags.filter((f) => f.run === run && f.kind === "divergence" && drawn.includes(f.series))
      .map((f) => f.step),
  );
  let y = spec.y ?? {};
  let caption: string | undefined;
  if (Number.isFinite(diverged) && !y.domain) {
    let lo = Math.min(...refs.keys()), hi = Math.max(...refs.keys());
    for (const s of d.series.filter((x) => x.run === run && drawn.includes(x.column))) {
      for (let i = 0; i < s.steps.length && s.steps[i] < diverged; i++) {
        if (Number.isFinite(s.values[i])) {
          [lo, hi] = [Math.min(lo, s.values[i]), Math.max(hi, s.values[i])];
        }
      }
    }
    const pad = 0.25 * (hi - lo || 1);
    y = { ...y, domain: [lo - pad, hi + 2 * pad] };
    caption = "Values after the divergence leave the frame and are clipped.";
  }
  return composeFigure({
    ...(caption ? { caption } : {}),
    title: options.title ?? spec.title,
    subtitle: `${d.log.source}${run ? `, run "${run}"` : ""}; faint: raw, bold: ${
      smoothing === "ema" ? "exponential moving average" : "moving median"
    }; ${flagged ? `${flagged} flag(s) shaded` : "no flag"}`,
    legend,
    panels: [{
      width: options.width ?? 640,
      height: options.height ?? 300,
      layers: [{
        x: { label: "step" },
        y: { label: axisLabel(spec.yLabel, { unit: spec.unit }), grid: true, ...y },
        clip: true,
        marks: [...spans.marks, ...marks],
      }],
    }],
    marks,
  });
}
