/**
 * The trained discriminator's section: V(D, G) from its outputs, its gap to D* of the
 * density fits, calibration (ECE, Brier score, reliability diagram) and its mean output on
 * each side.
 *
 * @module
 */
import type { Density } from "../density/mod.ts";
import { discriminatorGap } from "../discriminator/mod.ts";
import { meanEstimate } from "../estimate/mod.ts";
import type { Estimate } from "../estimate/mod.ts";
import { escapeHtml, htmlTable } from "../display/mod.ts";
import { plotReliability } from "../plot/mod.ts";
import { valueFunction } from "../value/mod.ts";
import { DENSITY_FITS } from "./section_density.ts";
import { formatShort } from "./estimate_json.ts";
import type { ReportSection } from "./types.ts";

function probabilities(x: Float64Array, scale: "prob" | "logit"): Float64Array {
  return scale === "prob" ? x : x.map((v) => 1 / (1 + Math.exp(-v)));
}

/**
 * The discriminator section (runs when outputs are given): the value of the game for the
 * trained D (Goodfellow et al. 2014, eq. 1), its gap V(D*, G) − V(D, G) when the density
 * route ran, expected calibration error and Brier score (Guo et al. 2017; Brier 1950), and
 * the mean output on each side (1/2 on both at the equilibrium).
 *
 * @example
 * ```ts
 * import { discriminatorSection } from "./section_discriminator.ts";
 * import assert from "node:assert/strict";
 * assert.equal(discriminatorSection.id, "discriminator");
 * ```
 */
export const discriminatorSection: ReportSection = {
  id: "discriminator",
  title: "The trained discriminator",
  applies(ctx) {
    return ctx.inputs.scores ? true : "no discriminator outputs given (--scores, or --d-real " +
      "with --d-fake)";
  },
  keys(ctx) {
    const base = ["value", "ece", "brier", "meanOutputReal", "meanOutputFake"];
    const withFits = ctx.plan.density.kind === "none"
      ? []
      : ["optimalValue", "gap", "eceVsOptimal"];
    return [...base, ...withFits].map((k) => `estimates.discriminator.${k}`);
  },
  run(ctx, out) {
    const scores = ctx.inputs.scores!;
    const { plan } = ctx;
    const seed = `${plan.seed}:discriminator`;
    const fits = ctx.shared.get(DENSITY_FITS) as { pData: Density; pModel: Density } | undefined;
    const outputs = { dReal: scores.real, dFake: scores.fake, scale: scores.scale };
    ctx.onProgress("discriminator: value and calibration", 0);
    const value = valueFunction({
      ...outputs,
      seed,
      level: plan.level,
      replicates: plan.sampleReplicates,
    });
    const gap = discriminatorGap({
      ...outputs,
      real: ctx.inputs.real.samples,
      fake: ctx.inputs.fake.samples,
      ...(fits ?? {}),
      seed,
      level: plan.level,
      replicates: plan.sampleReplicates,
    });
    const est: Record<string, Estimate> = {
      value,
      ece: gap.ece,
      brier: gap.brier,
      meanOutputReal: meanEstimate(probabilities(scores.real, scores.scale), {
        level: plan.level,
        method: "sample mean",
        unit: "probability",
      }),
      meanOutputFake: meanEstimate(probabilities(scores.fake, scores.scale), {
        level: plan.level,
        method: "sample mean",
        unit: "probability",
      }),
    };
    if (fits && gap.optimalValue && gap.gap && gap.eceVsOptimal) {
      est.optimalValue = gap.optimalValue;
      est.gap = gap.gap;
      est.eceVsOptimal = gap.eceVsOptimal;
    }
    out.estimates.discriminator = est;
    out.methods.discriminator = {
      scale: scores.scale,
      scaleReason: scores.scaleReason,
      replicates: plan.sampleReplicates,
      bins: gap.bins.length,
      reference: fits ? "D* of the density fits" : "none (no density route)",
      seed,
    };
    const rows: [string, Estimate][] = [
      ["V(D, G) of the trained D", value],
      ...(est.optimalValue
        ? [["V(D*, G) on the same rows", est.optimalValue] as [string, Estimate]]
        : []),
      ...(est.gap ? [["gap V(D*, G) − V(D, G)", est.gap] as [string, Estimate]] : []),
      ["expected calibration error", est.ece],
      ...(est.eceVsOptimal
        ? [["mean |D − D*| by bin (ECE against D*)", est.eceVsOptimal] as [string, Estimate]]
        : []),
      ["Brier score", est.brier],
      ["mean D on real rows", est.meanOutputReal],
      ["mean D on generated rows", est.meanOutputFake],
    ];
    out.html.push(
      `<p>Outputs: ${escapeHtml(scores.paths.join(", "))} (${escapeHtml(scores.scaleReason)}).</p>`,
      htmlTable(["quantity", "estimate"], rows, "The trained discriminator D on the given rows"),
    );
    out.headlines.push(
      `Trained D: V(D, G) ${formatShort(value)} nats` +
        (est.gap ? `, ${formatShort(est.gap)} below V(D*, G)` : "") +
        `; mean output on generated rows ${formatShort(est.meanOutputFake)} (1/2 at equilibrium).`,
    );
    out.figures.push({
      name: "reliability",
      figure: plotReliability(gap),
      caption: "Reliability of the trained D: observed fraction of real rows by predicted D" +
        (fits ? ", against D* of the fits." : "."),
    });
    out.notes.push(...gap.notes.slice(0, 2));
  },
};
