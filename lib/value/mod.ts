/**
 * The value function of the GAN game, the generator objectives and the decomposition of the
 * value at the optimal discriminator into -ln 4 + 2 JSD.
 *
 * @example Three lines in a notebook: D* on a grid, the value at the optimum split into
 * terms with intervals, and an f-divergence
 * ```ts
 * import { gaussian } from "../density/mod.ts";
 * import { optimalDiscriminator } from "../discriminator/mod.ts";
 * import { fDivergence } from "../divergence/mod.ts";
 * import { samples } from "../samples/mod.ts";
 * import { optimumDecomposition } from "./mod.ts";
 * import assert from "node:assert/strict";
 * const pData = gaussian(0, 1), pModel = gaussian(1.5, 0.5);
 * const dStar = optimalDiscriminator(pData, pModel).prob(samples([-2, -1, 0, 1, 2, 3]));
 * const dec = optimumDecomposition(pData, pModel); // value, jsd, klRealMix, klFakeMix, ...
 * const tv = fDivergence(pData, pModel, "total-variation");
 * assert.equal(dStar.length, 6);
 * assert.ok(Math.abs(dec.value.value - (-Math.log(4) + 2 * dec.jsd.value)) < 1e-12);
 * assert.ok(dec.jsd.ci![0] <= dec.jsd.value && tv.value > 0 && tv.value < 1);
 * ```
 *
 * @module
 */
export * from "./value_function.ts";
export * from "./generator_objectives.ts";
export * from "./optimum_decomposition.ts";
export * from "./sample_decomposition.ts";
// Types of other folders that this folder's API mentions, re-exported so the module documents alone.
export type { RandomSource, Rng } from "../random/rng.ts";
export type { SampleRecord, Samples, SamplesInput } from "../samples/samples.ts";
export type { Density, DensityDescription } from "../density/types.ts";
export type { BootstrapEstimate } from "../estimate/bootstrap.ts";
export type { Estimate, EstimateUnit } from "../estimate/estimate.ts";
export type { Discriminator } from "../discriminator/types.ts";
export type { IntegrationOptions } from "../divergence/integration_options.ts";
export type { RefitOptions } from "../divergence/divergence_from_samples.ts";
export type { OutputScale } from "../discriminator/output_scale.ts";
