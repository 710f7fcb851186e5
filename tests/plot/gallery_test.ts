/**
 * The gallery task keeps working as the library grows: `scripts/gallery.ts --out DIR`
 * writes every figure, each one standalone SVG, and the committed gallery is up to date.
 */
import assert from "node:assert/strict";
import { assertStandalone } from "./_svg.ts";

const FIGURES = [
  "bootstrap",
  "checkpoint_metrics",
  "decomposition",
  "densities_1d",
  "discriminator_map",
  "discriminator_outputs",
  "divergences",
  "eigenvalues",
  "fit_1d",
  "fit_2d",
  "generator_comparison",
  "generator_objectives",
  "gradient_field",
  "loss_curves",
  "mode_coverage",
  "objective",
  "periodogram",
  "phase_snapshots",
  "precision_recall",
  "reliability",
  "training_curves",
  "value_surface",
];

Deno.test("gallery: scripts/gallery.ts writes every figure, identical to docs/gallery", async () => {
  const dir = await Deno.makeTempDir();
  const script = new URL("../../scripts/gallery.ts", import.meta.url).pathname;
  const out = await new Deno.Command(Deno.execPath(), {
    args: ["run", "-A", script, "--out", dir],
    stdout: "piped",
    stderr: "piped",
  }).output();
  assert.ok(out.success, new TextDecoder().decode(out.stderr));
  const written = [...Deno.readDirSync(dir)].map((e) => e.name).sort();
  assert.deepEqual(written, FIGURES.map((f) => `${f}.svg`));
  for (const name of written) {
    const svg = await Deno.readTextFile(`${dir}/${name}`);
    assertStandalone(svg);
    const committed = await Deno.readTextFile(
      new URL(`../../docs/gallery/${name}`, import.meta.url),
    );
    assert.equal(svg, committed, `docs/gallery/${name} is stale: run deno task gallery`);
  }
  await Deno.remove(dir, { recursive: true });
});
