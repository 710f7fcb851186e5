/**
 * The training run in the report: the log diagnosed against the equilibrium values
 * (`--log`), and the checkpoint series against the real set (`--checkpoints`).
 *
 * @module
 */
import { escapeHtml, htmlTable } from "../display/mod.ts";
import {
  plotCheckpointMetrics,
  plotDiscriminatorOutputs,
  plotLossCurves,
  plotPeriodogram,
} from "../plot/mod.ts";
import { checkpointSeries, diagnoseTraining, TRAINING_EQUILIBRIUM } from "../training/mod.ts";
import { estimateJson, formatShort } from "./estimate_json.ts";
import type { Json } from "./json.ts";
import type { ReportSection } from "./types.ts";

/** A number for JSON: non-finite ones as the strings "Infinity", "-Infinity", "NaN". */
const finiteOrText = (x: number): Json => Number.isFinite(x) ? x : String(x);

/**
 * The training-log section: `readTrainingLog` and `diagnoseTraining` on `--log`, each flag
 * with its evidence under `training.flags` of summary.json, the flags on the first screen,
 * and the loss curves, D's outputs and (with an oscillation flag) the periodogram.
 *
 * References: Goodfellow et al. 2014 (equilibrium: D loss 2 ln 2, D outputs 1/2); Fisher
 * 1929 (periodogram test); Killick, Fearnhead & Eckley 2012 (PELT change points).
 *
 * @example
 * ```ts
 * import { trainingSection } from "./section_training.ts";
 * import assert from "node:assert/strict";
 * assert.match(String(trainingSection.applies({ inputs: {} } as never)), /--log/);
 * ```
 */
export const trainingSection: ReportSection = {
  id: "training",
  title: "Training log diagnosed against the equilibrium",
  applies(ctx) {
    return ctx.inputs.log ? true : "no training log given (--log FILE)";
  },
  keys() {
    return ["training.flagCount"];
  },
  run(ctx, out) {
    const input = ctx.inputs.log!;
    ctx.onProgress("training log: diagnosis", 0);
    const t0 = performance.now();
    const diagnosis = diagnoseTraining(input.log);
    out.timings.push({ step: "diagnosis", seconds: (performance.now() - t0) / 1000 });
    const { log, flags } = diagnosis;
    const flagsJson: Json[] = flags.map((f) => ({
      kind: f.kind,
      run: f.run,
      series: f.series,
      step: f.step,
      end: f.end,
      period: f.period ?? null,
      evidence: {
        statistic: f.evidence.statistic,
        value: finiteOrText(f.evidence.value),
        threshold: finiteOrText(f.evidence.threshold),
        steps: [...f.evidence.steps],
      },
      message: f.message,
    }));
    out.data.training = {
      path: input.path,
      sha256: input.sha256,
      roles: { ...log.roles } as Record<string, string>,
      guessed: [...log.guessed],
      runs: log.runs.map((r) => ({ name: r.name, records: r.steps.length })),
      equilibrium: { ...TRAINING_EQUILIBRIUM },
      flagCount: flags.length,
      flags: flagsJson,
      notes: [...diagnosis.notes],
    };
    out.methods.training = {
      diagnosis: "diagnoseTraining with its documented default thresholds",
      thresholds: JSON.parse(JSON.stringify(diagnosis.thresholds)) as Json,
    };
    out.html.push(
      flags.length
        ? htmlTable(
          ["flag", "run", "column", "steps", "evidence"],
          flags.map((f) => [
            f.kind + (f.period ? ` (period ${f.period} steps)` : ""),
            f.run || "-",
            f.series,
            `${f.step}–${f.end}`,
            `${f.evidence.statistic} = ${f.evidence.value.toPrecision(3)} ` +
            `(threshold ${f.evidence.threshold.toPrecision(3)})`,
          ]),
          `Flags raised on ${input.path}`,
        )
        : `<p>No flag raised on ${escapeHtml(input.path)}.</p>`,
    );
    if (log.notes.length) {
      out.html.push(
        `<p>Reading the log: ${log.notes.map((n) => escapeHtml(n)).join("; ")}.</p>`,
      );
    }
    out.headlines.push(
      flags.length
        ? `Training log: ${flags.length} flag(s): ` +
          flags.map((f) =>
            `${f.kind}${f.period ? ` (period ${f.period})` : ""} on ${f.series} from step ${f.step}`
          ).join("; ") + "."
        : "Training log: no flag raised (no oscillation, divergence, collapse, winning " +
          "discriminator or plateau at the default thresholds).",
    );
    out.figures.push({
      name: "loss_curves",
      figure: plotLossCurves(diagnosis),
      caption: "Losses over training with their equilibrium values (2 ln 2 for D's summed " +
        "cross-entropy, ln 2 for the non-saturating G loss); flagged spans shaded.",
    });
    if (log.roles.dReal || log.roles.dFake) {
      out.figures.push({
        name: "d_outputs",
        figure: plotDiscriminatorOutputs(diagnosis),
        caption: "D's mean output on real and generated batches; both tend to 1/2 at the " +
          "equilibrium.",
      });
    }
    if (flags.some((f) => f.kind === "oscillation")) {
      out.figures.push({
        name: "periodogram",
        figure: plotPeriodogram(diagnosis),
        caption: "Periodogram of the detrended series behind the oscillation flag.",
      });
    }
    out.notes.push(
      "Training flags are screening rules with thresholds tuned for a false-alarm rate of " +
        "about 5% on clean converging logs; read them with the figures.",
    );
  },
};

/**
 * The checkpoint section: `checkpointSeries` on `--checkpoints DIR` against the real set,
 * each metric per checkpoint with its interval under `checkpoints.points` of summary.json,
 * and a figure of the metrics over steps with interval bands. Metrics: the density route's
 * JSD and V(D*, G) for d ≤ 2, the feature-space metrics above (the series' defaults);
 * `plan.checkpointReplicates` bootstrap replicates each.
 *
 * References: Goodfellow et al. 2014 (V(D*, G) = -ln 4 + 2 JSD); Heusel et al. 2017
 * (Fréchet distance).
 *
 * @example
 * ```ts
 * import { checkpointsSection } from "./section_training.ts";
 * import assert from "node:assert/strict";
 * assert.match(String(checkpointsSection.applies({ inputs: {} } as never)), /--checkpoints/);
 * ```
 */
export const checkpointsSection: ReportSection = {
  id: "checkpoints",
  title: "Checkpoints against the real set",
  applies(ctx) {
    return ctx.inputs.checkpoints ? true : "no checkpoint folder given (--checkpoints DIR)";
  },
  keys() {
    return [];
  },
  async run(ctx, out) {
    const input = ctx.inputs.checkpoints!;
    const { plan } = ctx;
    const seed = `${plan.seed}:checkpoints`;
    const total = input.files.length;
    ctx.onProgress(`checkpoints: 0 of ${total}`, 0);
    const series = await checkpointSeries(
      ctx.inputs.real.samples,
      input.files.map((f) => ({ step: f.step, samples: f.samples })),
      {
        replicates: plan.checkpointReplicates,
        level: plan.level,
        seed,
        onProgress: (p) => ctx.onProgress(`checkpoints: ${p.done} of ${p.total}`, p.done / total),
      },
    );
    out.data.checkpoints = {
      path: input.path,
      metrics: [...series.metrics],
      outputs: [...series.outputs],
      points: series.checkpoints.map((c, i) => ({
        step: c.step,
        path: input.files[i].path,
        sha256: input.files[i].sha256,
        n: input.files[i].samples.n,
        estimates: Object.fromEntries(
          Object.entries(c.metrics).map(([k, e]) => [k, estimateJson(e)]),
        ),
      })),
      skipped: [...input.skipped],
      notes: [...series.notes],
    };
    out.methods.checkpoints = {
      metrics: [...series.metrics],
      replicates: plan.checkpointReplicates,
      seed,
      interval: "each metric's own bootstrap, the same seed for every checkpoint",
    };
    const last = series.checkpoints.at(-1)!;
    out.html.push(htmlTable(
      ["step", ...series.outputs],
      series.checkpoints.map((c) => [
        String(c.step),
        ...series.outputs.map((o) => c.metrics[o] ?? "-"),
      ]),
      `${total} checkpoints of ${input.path} against the real set`,
    ));
    out.headlines.push(
      `Checkpoints: at the last step ${last.step}, ` +
        series.outputs.filter((o) => last.metrics[o]).map((o) =>
          `${o} ${formatShort(last.metrics[o])}`
        ).join(", ") + ".",
    );
    out.figures.push({
      name: "checkpoint_metrics",
      figure: plotCheckpointMetrics(series),
      caption: `Metrics over training steps with ${Math.round(plan.level * 100)}% interval ` +
        "bands, each checkpoint against the real set.",
    });
  },
};
