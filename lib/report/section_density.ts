/**
 * The density route of the report: fit a density to each side, the value at the optimum
 * split into -ln 4 + KL(p_data || m) + KL(p_g || m) with the refit bootstrap, and
 * f-divergences between the fits, with D* and the decomposition as figures.
 *
 * @module
 */
import { fitGaussianMixture } from "../density/mod.ts";
import { selectGaussianMixture } from "../density/mod.ts";
import { fitKde } from "../density/mod.ts";
import type { Density } from "../density/mod.ts";
import { refitBootstrap } from "../divergence/mod.ts";
import { F_DIVERGENCES } from "../divergence/mod.ts";
import { exact, makeEstimate } from "../estimate/mod.ts";
import type { Estimate } from "../estimate/mod.ts";
import { escapeHtml, htmlTable } from "../display/mod.ts";
import { plotDecomposition } from "../plot/mod.ts";
import { plotDensities } from "../plot/mod.ts";
import { plotDiscriminatorMap } from "../plot/mod.ts";
import { plotDivergences } from "../plot/mod.ts";
import type { Samples } from "../samples/mod.ts";
import { decompositionFromSamples } from "../value/mod.ts";
import { biasCorrected, formatShort as fmt } from "./estimate_json.ts";
import { subsample } from "./_subsample.ts";
import type { ReportContext, ReportSection, SectionRecord } from "./types.ts";

/** The f-divergences the report estimates besides the JSD of the decomposition. */
export const REPORT_DIVERGENCES = [
  "kl",
  "reverse-kl",
  "squared-hellinger",
  "total-variation",
] as const;

const TERMS = ["value", "jsd", "klRealMix", "klFakeMix"] as const;
const TERM_LABELS: Record<(typeof TERMS)[number], string> = {
  value: "V(D*, G)",
  jsd: "JSD(p_data, p_g)",
  klRealMix: "KL(p_data ‖ m)",
  klFakeMix: "KL(p_g ‖ m)",
};
const TERM_RANGE: Record<(typeof TERMS)[number], readonly [number, number]> = {
  value: [-Math.log(4), 0],
  jsd: [0, Math.LN2],
  klRealMix: [0, Math.LN2],
  klFakeMix: [0, Math.LN2],
};

/** Shared-map key of the two density fits (for the discriminator's gap to D*). */
export const DENSITY_FITS = "density.fits";

/**
 * The density section: the decomposition at the optimum (Goodfellow et al. 2014, Thm. 1)
 * and f-divergences (Nowozin et al. 2016) between densities fitted to each side, with
 * refit-bootstrap intervals (bias-corrected, basic interval) that include the data's
 * sampling error.
 *
 * @example
 * ```ts
 * import { densitySection } from "./section_density.ts";
 * import assert from "node:assert/strict";
 * assert.equal(densitySection.id, "density");
 * ```
 */
export const densitySection: ReportSection = {
  id: "density",
  title: "Densities, D* and the value of the game at the optimum",
  applies(ctx) {
    return ctx.plan.density.kind === "none" ? ctx.plan.density.reason : true;
  },
  keys() {
    return [
      ...TERMS.map((t) => `estimates.optimum.${t}`),
      "estimates.optimum.constant",
      ...TERMS.map((t) => `estimates.optimumPlugIn.${t}`),
      ...REPORT_DIVERGENCES.map((n) => `estimates.divergences.${n}`),
    ];
  },
  run(ctx, out) {
    runDensity(ctx, out);
  },
};

function runDensity(ctx: ReportContext, out: SectionRecord): void {
  const { plan } = ctx;
  let t = performance.now();
  const lap = (step: string) => {
    const now = performance.now();
    out.timings.push({ step, seconds: (now - t) / 1000 });
    t = now;
  };
  const route = plan.density;
  if (route.kind === "none") return;
  const seed = `${plan.seed}:density`;
  const real = subsample(ctx.inputs.real.samples, plan.densityRows, `${seed}:real`);
  const fake = subsample(ctx.inputs.fake.samples, plan.densityRows, `${seed}:fake`);
  let fit: (s: Samples) => Density;
  const methods: Record<string, unknown> = {
    route: route.kind,
    reason: route.reason,
    rows: { real: real.n, fake: fake.n },
    replicates: plan.replicates,
    integration: route.integration,
    seed,
  };
  ctx.onProgress("density: fitting both sides", 0);
  if (route.kind === "kde") {
    fit = (s) => fitKde(s, { bandwidth: "scott" });
    methods.fit = "Gaussian KDE, Scott's rule";
  } else {
    const sel = [real, fake].map((s) =>
      selectGaussianMixture(s, { components: route.components, criterion: "bic", seed })
    );
    const k = Math.max(sel[0].components, sel[1].components);
    fit = (s) => fitGaussianMixture(s, { components: k, seed });
    methods.fit = `Gaussian mixture, ${k} full-covariance components (the larger of the ` +
      `two BIC choices: real ${sel[0].components}, generated ${sel[1].components}, of ` +
      `${route.components[0]}–${route.components[1]})`;
  }
  const pData = fit(real), pModel = fit(fake);
  ctx.shared.set(DENSITY_FITS, { pData, pModel });
  lap("fits");
  ctx.onProgress("density: decomposition at the optimum", 0.05);
  const dec = decompositionFromSamples(real, fake, {
    fit,
    replicates: plan.replicates,
    seed,
    level: plan.level,
    ...(route.integration === "monte-carlo" ? { n: plan.monteCarloDraws } : {}),
  });
  lap("decomposition");
  const n = real.n + fake.n;
  const optimum: Record<string, Estimate> = { constant: exact(-Math.log(4), "nats") };
  const plugIn: Record<string, Estimate> = {};
  for (const t of TERMS) {
    optimum[t] = biasCorrected({
      value: dec[t].value,
      replicates: dec[t].replicates,
      n,
      level: plan.level,
      range: TERM_RANGE[t],
      unit: "nats",
    });
    plugIn[t] = dec[t];
  }
  const divergences: Record<string, Estimate> = {};
  const divReplicates = Math.max(10, Math.round(plan.replicates / 2));
  // One refit bootstrap for the four divergences: each replicate refits both densities once
  // and evaluates every divergence on the same pair of fits.
  ctx.onProgress("density: f-divergences", 0.4);
  const all = refitBootstrap(real, fake, {
    fit,
    quantities: REPORT_DIVERGENCES,
    replicates: divReplicates,
    seed: `${seed}:divergences`,
    level: plan.level,
    onProgress: (done, total) => ctx.onProgress("density: f-divergences", 0.4 + 0.6 * done / total),
    ...(route.integration === "monte-carlo" ? { n: plan.monteCarloDraws } : {}),
  });
  for (const name of REPORT_DIVERGENCES) {
    const e = all.estimates[name];
    const notes = [...e.notes, ...all.notes.filter((n) => !e.notes.includes(n))];
    divergences[name] = Number.isFinite(e.value)
      ? biasCorrected({
        value: e.value,
        replicates: e.replicates,
        n,
        level: plan.level,
        range: F_DIVERGENCES[name].range,
        ...(e.unit ? { unit: e.unit } : {}),
        notes,
      })
      : makeEstimate({ ...e, notes });
  }
  lap("f-divergences");
  ctx.onProgress("density: figures", 1);
  methods.divergenceReplicates = divReplicates;
  methods.interval = "basic bootstrap interval of the refit replicates, bias-corrected " +
    "(Efron & Tibshirani 1993, ch. 10; Davison & Hinkley 1997, §5.2), clipped to the range";
  out.methods.density = methods as never;
  out.estimates.optimum = optimum;
  out.estimates.optimumPlugIn = plugIn;
  out.estimates.divergences = divergences;
  const labels = ctx.inputs.real.samples.columns;
  out.html.push(
    `<p>Fit: ${escapeHtml(String(methods.fit))}, on ${real.n} real and ${fake.n} generated ` +
      `rows. Intervals: ${plan.replicates} refit-bootstrap replicates (resample each side, ` +
      "refit both densities, recompute); the bootstrap estimate of the plug-in bias is " +
      "removed.</p>",
    htmlTable(
      ["term", "bias-corrected estimate", "plug-in (percentile interval)"],
      [
        ["-ln 4", optimum.constant, null],
        ...TERMS.map((t) => [TERM_LABELS[t], optimum[t], plugIn[t]]),
      ],
      "V(D*, G) = -ln 4 + KL(p_data ‖ m) + KL(p_g ‖ m) = -ln 4 + 2 JSD, m = (p_data + p_g)/2 " +
        "(Goodfellow et al. 2014, Thm. 1), nats",
    ),
    htmlTable(
      ["divergence", "estimate", "notes"],
      REPORT_DIVERGENCES.map((k) => [
        F_DIVERGENCES[k].label,
        divergences[k],
        divergences[k].notes[0] ?? "",
      ]),
      `f-divergences D_f(p_data ‖ p_g) between the fits (${divReplicates} refit replicates)`,
    ),
  );
  const jsd = optimum.jsd;
  out.headlines.push(
    `JSD at the optimum ${fmt(jsd)} nats (0 when the generator matches the data, ln 2 ≈ ` +
      `0.693 for disjoint supports); V(D*, G) ${fmt(optimum.value)} (−ln 4 ≈ −1.386 at equality).`,
  );
  if (plan.d === 1) {
    out.figures.push({
      name: "densities",
      figure: plotDensities(pData, pModel, {
        samples: { real, generated: fake },
        ...(labels?.[0] ? { xLabel: labels[0] } : {}),
      }),
      caption: "Densities fitted to both sides, and D* = p_data / (p_data + p_g).",
    });
  } else if (plan.d === 2) {
    out.figures.push({
      name: "discriminator_map",
      figure: plotDiscriminatorMap({
        real,
        generated: fake,
        pData,
        pModel,
        seed,
        ...(labels ? { labels: [labels[0], labels[1]] } : {}),
      }),
      caption: "Both samples over the map of D* between the two fitted densities.",
    });
  }
  out.figures.push(
    {
      name: "decomposition",
      figure: plotDecomposition({
        value: optimum.value,
        klRealMix: optimum.klRealMix,
        klFakeMix: optimum.klFakeMix,
        constant: optimum.constant,
      }),
      caption: "The value at the optimum, term by term, with intervals.",
    },
    {
      name: "divergences",
      figure: plotDivergences(
        REPORT_DIVERGENCES.map((k) => ({ name: F_DIVERGENCES[k].label, estimate: divergences[k] })),
      ),
      caption: "f-divergences between the fitted densities, with intervals.",
    },
  );
  lap("figures");
  out.notes.push(
    "Density-based quantities are about the fitted densities: they depend on the fit " +
      "(bandwidth, mixture components) and degrade in high dimension.",
    ...dec.notes.slice(0, 1),
    "Plug-in divergences between densities fitted to finite samples are biased upward; the " +
      "bias-corrected values remove the bootstrap estimate of that bias, while the plug-in " +
      "column keeps it (its percentile interval need not contain 0 when p_g = p_data).",
  );
}
