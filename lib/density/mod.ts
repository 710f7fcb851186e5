/**
 * Densities: the Density interface, analytic densities (Gaussian, mixture, uniform box) and
 * fitted estimators (Gaussian KDE with bandwidth rules and a binned grid evaluator,
 * Gaussian mixtures by EM with model selection, histograms).
 *
 * @module
 */
export * from "./types.ts";
export type { MatrixInput } from "../linalg/matrix_input.ts";
export * from "./kde_types.ts";
export { gaussian, type GaussianDensity } from "./gaussian.ts";
export * from "./gaussian_mixture.ts";
export * from "./uniform_box.ts";
export * from "./bandwidth.ts";
export * from "./kde.ts";
export * from "./kde_grid.ts";
export * from "./binned_kde.ts";
export * from "./gaussian_mixture_fit.ts";
export * from "./gaussian_mixture_select.ts";
export * from "./histogram.ts";
// Types of other folders that this folder's API mentions, re-exported so the module documents alone.
export type { RandomSource, Rng } from "../random/rng.ts";
export type { SampleRecord, Samples, SamplesInput } from "../samples/samples.ts";
