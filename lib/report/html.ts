/**
 * index.html of a report: one self-contained file (inline CSS and SVG, no scripts, no
 * network), readable on screen and on paper. The first screen says what was compared,
 * gives the claims' verdicts and the headline numbers, and states the cautions.
 *
 * @module
 */
import { escapeHtml } from "../display/mod.ts";
import type { ClaimResult } from "./claims.ts";
import type { PreparedAnalysis, ReportFigure, ReportSection, SectionRecord } from "./types.ts";

/** What {@linkcode renderReportHtml} lays out. */
export interface ReportHtmlInput {
  /** The checked inputs and plan. */
  readonly prep: PreparedAnalysis;
  /** Each section's record and status. */
  readonly blocks: readonly {
    readonly section: ReportSection;
    readonly record: SectionRecord;
    readonly status: string;
    readonly reason: string | null;
  }[];
  /** Claim verdicts. */
  readonly claims: readonly ClaimResult[];
  /** Figures in order. */
  readonly figures: readonly ReportFigure[];
  /** Caveats of the sections that ran. */
  readonly notes: readonly string[];
  /** Seconds per step. */
  readonly timings: readonly {
    readonly step: string;
    readonly seconds: number;
    readonly within?: string;
  }[];
}

const CSS = `
:root { --real: #1f6a88; --gen: #b07a1c; --ink: #1d1d1f; --muted: #5a5a60; --rule: #d8d6d0; }
* { box-sizing: border-box; }
body { margin: 0; color: var(--ink); background: #fff;
  font: 15px/1.5 "DejaVu Sans", Verdana, Helvetica, Arial, sans-serif; }
main { max-width: 60rem; margin: 0 auto; padding: 1.5rem 1.25rem 3rem; }
h1 { font-size: 1.5rem; margin: 0 0 .25rem; }
h2 { font-size: 1.15rem; margin: 2rem 0 .5rem; border-bottom: 1px solid var(--rule); padding-bottom: .2rem; }
p, li { max-width: 48rem; }
code { font-size: .9em; overflow-wrap: anywhere; }
.lede { color: var(--muted); margin-top: 0; }
table { border-collapse: collapse; margin: .5rem 0 1rem; font-size: .9rem; width: 100%; }
caption { caption-side: top; text-align: left; color: var(--muted); padding-bottom: .25rem; }
th, td { border-bottom: 1px solid var(--rule); padding: .3rem .5rem; vertical-align: top; }
th { text-align: left; font-weight: 600; }
td { font-variant-numeric: tabular-nums; }
.verdict { display: inline-block; min-width: 6.5rem; padding: .05rem .45rem; border-radius: .25rem;
  font-weight: 700; border: 1.5px solid currentColor; text-align: center; }
.holds { color: #1b6e3a; } .fails { color: #a3231b; } .undecided { color: #6b5a00; }
.cautions { border: 1.5px solid var(--rule); border-left: 6px solid #8a8a8a; padding: .25rem 1rem; margin: .75rem 0; font-size: .9rem; }
.cautions ul { margin: .25rem 0; padding-left: 1.2rem; }
.cautions h2 { border: 0; margin: .25rem 0; font-size: 1rem; }
.skipped { color: var(--muted); font-style: italic; }
figure { margin: 1rem 0 1.5rem; break-inside: avoid; page-break-inside: avoid; }
figure svg { max-width: 100%; height: auto; display: block; }
figcaption { color: var(--muted); font-size: .9rem; }
nav ol { columns: 2; padding-left: 1.2rem; }
footer { margin-top: 2.5rem; color: var(--muted); font-size: .85rem; }
@media print {
  body { font-size: 11pt; }
  main { max-width: none; padding: 0; }
  nav { display: none; }
  h2 { break-after: avoid; }
  table, .cautions { break-inside: avoid; }
  a { color: inherit; text-decoration: none; }
}
`;

function sideText(label: string, s: PreparedAnalysis["inputs"]["real"]): string {
  return `<b>${label}</b> <code>${escapeHtml(s.path)}</code> (n = ${s.samples.n})`;
}

function claimRows(claims: readonly ClaimResult[]): string {
  if (!claims.length) {
    return "<p>No claims file was given: pass <code>--claims FILE</code> to settle statements " +
      "about these numbers (holds, fails or undecided from each interval).</p>";
  }
  const rows = claims.map((c) => {
    const more = c.moreSamples
      ? `about ${c.moreSamples.factor}× the sample size (n ≈ ${c.moreSamples.n}) would settle it`
      : c.verdict === "undecided"
      ? "more samples may not settle it"
      : "";
    return `<tr><td><span class="verdict ${c.verdict}">${c.verdict}</span></td><td>${
      escapeHtml(c.claim.statement)
    }</td><td>${escapeHtml(c.evidence)}${more ? `<br><i>${escapeHtml(more)}</i>` : ""}</td></tr>`;
  }).join("");
  return `<table><thead><tr><th>verdict</th><th>claim</th><th>evidence</th></tr></thead>` +
    `<tbody>${rows}</tbody></table><p class="lede">Each claim is settled by its whole ` +
    `interval: it holds when the interval lies inside the claim, fails when it lies outside, ` +
    `and is undecided when it straddles the bound. The sample sizes that would settle an ` +
    `undecided claim assume the interval narrows as 1/√n around the same centre; n counts ` +
    `the rows the estimate rests on (both sides).</p>`;
}

/**
 * The report as one HTML page.
 *
 * @example
 * ```ts
 * import { renderReportHtml } from "./html.ts";
 * import assert from "node:assert/strict";
 * assert.equal(typeof renderReportHtml, "function");
 * ```
 */
export function renderReportHtml(input: ReportHtmlInput): string {
  const { prep, blocks, claims } = input;
  const { inputs, plan } = prep;
  const real = inputs.real.samples;
  const pct = `${Math.round(plan.level * 1000) / 10}%`;
  const columns = real.columns
    ? `: ${real.columns.slice(0, 8).join(", ")}${real.d > 8 ? ", …" : ""}`
    : "";
  const headlines = blocks.flatMap((b) => b.record.headlines);
  const counts = { holds: 0, fails: 0, undecided: 0 };
  for (const c of claims) counts[c.verdict]++;
  const verdictLine = claims.length
    ? `${claims.length} claim${
      claims.length > 1 ? "s" : ""
    }: ${counts.holds} hold, ${counts.fails} ` +
      `fail, ${counts.undecided} undecided.`
    : "";
  const densityRows = plan.density.kind === "none"
    ? "not computed"
    : `${Math.min(plan.densityRows, plan.n.real)} real and ${
      Math.min(plan.densityRows, plan.n.fake)
    } generated rows`;
  const cautions = [
    `Every number is an estimate with its ${pct} interval; read the interval, not only the value.`,
    "Density-based quantities (D*, the value at the optimum, f-divergences) are about the " +
    "fitted densities: they depend on the fitted model and degrade in high dimension. " +
    escapeHtml(plan.density.reason) + ".",
    `Sample sizes: ${plan.n.real} real and ${plan.n.fake} generated rows in d = ${plan.d}; the ` +
    `density route used ${densityRows}.`,
    "The JSD saturates at ln 2 on (nearly) disjoint supports; a distance (Fréchet) still " +
    "compares such cases.",
  ];
  const sectionHtml = blocks.map((b) => {
    const head = `<section id="${b.section.id}"><h2>${escapeHtml(b.section.title)}</h2>`;
    if (b.status !== "ran") {
      return `${head}<p class="skipped">${b.status === "failed" ? "Failed" : "Not run"}: ${
        escapeHtml(b.reason ?? "")
      }</p></section>`;
    }
    const figs = b.record.figures.map((f) =>
      `<figure id="fig-${f.name}">${f.figure.toSVG()}<figcaption>${escapeHtml(f.caption)} ` +
      `(<a href="${f.name}.svg">${f.name}.svg</a>, <a href="${f.name}.png">.png</a>)</figcaption></figure>`
    ).join("");
    return `${head}${b.record.html.join("\n")}${figs}</section>`;
  }).join("\n");
  const nav = blocks.map((b) =>
    `<li><a href="#${b.section.id}">${escapeHtml(b.section.title)}</a></li>`
  )
    .join("");
  const total = input.timings.reduce((s, t) => s + (t.within ? 0 : t.seconds), 0);
  const files =
    [inputs.real, inputs.fake].map((s) =>
      `<li><code>${escapeHtml(s.path)}</code> sha256 <code>${s.sha256}</code></li>`
    ).join("") +
    (inputs.scores
      ? inputs.scores.paths.map((p, i) =>
        `<li><code>${escapeHtml(p)}</code> sha256 <code>${inputs.scores!.sha256[i]}</code></li>`
      ).join("")
      : "") +
    (prep.claimsFile
      ? `<li><code>${
        escapeHtml(prep.claimsFile.path)
      }</code> sha256 <code>${prep.claimsFile.sha256}</code></li>`
      : "");
  return `<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>saddlekit report: ${escapeHtml(inputs.real.path)} vs ${escapeHtml(inputs.fake.path)}</title>
<style>${CSS}</style></head>
<body><main>
<header>
<h1>Real and generated samples compared</h1>
<p class="lede">${sideText("Real", inputs.real)} against ${
    sideText("generated", inputs.fake)
  }, d = ${plan.d}${escapeHtml(columns)}${
    inputs.scores ? ", with a trained discriminator's outputs" : ""
  }. Seed ${plan.seed}.</p>
</header>
<aside class="cautions"><h2>Read before you decide</h2><ul>${
    cautions.map((c) => `<li>${c}</li>`).join("")
  }</ul></aside>
<section id="verdicts"><h2>Verdicts</h2>
${verdictLine ? `<p><b>${escapeHtml(verdictLine)}</b></p>` : ""}
${claimRows(claims)}
<h3>Headline numbers</h3>
${
    headlines.length
      ? `<ul>${headlines.map((h) => `<li>${escapeHtml(h)}</li>`).join("")}</ul>`
      : "<p>None: no section that estimates ran on these inputs (each says why below).</p>"
  }
</section>
<nav><ol>${nav}<li><a href="#methods">Methods and parameters</a></li></ol></nav>
${sectionHtml}
<section id="methods"><h2>Methods and parameters</h2>
<ul>${plan.reasons.map((r) => `<li>${escapeHtml(r)}</li>`).join("")}</ul>
${
    input.notes.length
      ? `<h3>Notes</h3><ul>${input.notes.map((n) => `<li>${escapeHtml(n)}</li>`).join("")}</ul>`
      : ""
  }
<h3>Inputs</h3><ul>${files}</ul>
</section>
<footer>saddlekit report. Every number and parameter is in <a href="summary.json">summary.json</a>;
step timings (${total.toFixed(1)} s in all) in <a href="timings.json">timings.json</a>. The same
inputs and seed give the same summary.json, byte for byte.</footer>
</main></body></html>
`;
}
