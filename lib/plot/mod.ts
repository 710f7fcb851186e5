/**
 * Figures: Observable Plot on a server-side DOM, drawn into one standalone SVG per figure
 * ({@linkcode Figure}: `toSVG()`, `save("x.svg" | "x.png")`, and `image/svg+xml` in a
 * Jupyter cell). Every builder also exposes its marks (`figure.marks`) to compose into your
 * own `Plot.plot` or {@linkcode plotFigure}.
 *
 * ## The palette
 *
 * One palette of saddlekit's own, used by every figure. The two data sides differ in hue
 * for every common colour vision deficiency and in lightness for greyscale prints; dash
 * styles and markers separate the roles again.
 *
 * | role            | colour    | CIE L* | line                 | marker   |
 * | --------------- | --------- | ------ | -------------------- | -------- |
 * | D* (`optimal`)  | `#4a1a4f` | 19     | solid, 2.5 px        | diamond  |
 * | real data       | `#1f6a88` | 42     | solid, 2 px          | circle   |
 * | reference value | `#8a8a8a` | 57     | dotted `2 3`, 1.2 px | cross    |
 * | trained D       | `#e07050` | 60     | dash-dot `8 3 2 3`   | square   |
 * | generated data  | `#f0b44c` | 77     | dashed `7 3`, 2 px   | triangle |
 *
 * Reference lines mark the equilibrium values: D* = 1/2, V(D*, G) = -ln 4, and the bound
 * JSD = ln 2 of disjoint supports. Maps of D* run from the generated colour (0) through
 * `#f5f2ec` (1/2) to the real colour (1), see {@linkcode dStarColor}. Text is set in
 * "DejaVu Sans, Verdana, Helvetica, Arial, sans-serif"; PNG output embeds DejaVu Sans.
 *
 * ## Builders
 *
 * | figure | function |
 * | --- | --- |
 * | densities of both sides, D* on a second axis (1-D) | {@linkcode plotDensities} |
 * | scatter over a D* heat map with contours (2-D) | {@linkcode plotDiscriminatorMap} |
 * | pointwise objective a ln y + b ln(1 - y) and its maximiser | {@linkcode plotObjective} |
 * | V(D*, G) = -ln 4 + two KL terms, waterfall with CIs | {@linkcode plotDecomposition} |
 * | divergences as bars with CIs | {@linkcode plotDivergences} |
 * | reliability diagram of a trained D against D* | {@linkcode plotReliability} |
 * | bootstrap distribution of an Estimate | {@linkcode plotBootstrap} |
 * | fitted density against its samples (1-D, 2-D) | {@linkcode plotFit} |
 * | generator objectives: minimax vs non-saturating gradients | {@linkcode plotGeneratorObjectives} |
 * | value surface of a game: contours, saddle, best responses | {@linkcode plotValueSurface} |
 * | gradient field of a game with trajectories | {@linkcode plotGradientField} |
 * | training curves with the equilibrium values | {@linkcode plotTrainingCurves} |
 * | phases of training: p_data, p_g and D at chosen steps | {@linkcode plotPhaseSnapshots} |
 * | Jacobian eigenvalues with the stability region | {@linkcode plotEigenvalues} |
 * | per-mode coverage bars | {@linkcode plotModeCoverage} |
 * | metrics of several generators with intervals and verdicts | {@linkcode plotGeneratorComparison} |
 * | k-NN precision/recall on a 2-D projection | {@linkcode plotPrecisionRecall} |
 * | training losses, equilibrium lines, flagged spans shaded | {@linkcode plotLossCurves} |
 * | D(real) and D(fake) converging to 1/2 | {@linkcode plotDiscriminatorOutputs} |
 * | checkpoint metrics over steps with interval bands | {@linkcode plotCheckpointMetrics} |
 * | the periodogram behind an oscillation flag | {@linkcode plotPeriodogram} |
 *
 * New figures are small additions: {@linkcode composeFigure} takes panels of Plot layers
 * and a legend; {@linkcode axisLabel}, {@linkcode lineStyle}, {@linkcode referenceY} and
 * {@linkcode EQUILIBRIUM_VALUES} keep labels, styles and equilibrium lines the same.
 *
 * @example
 * ```ts
 * import { plotObjective } from "./mod.ts";
 * import assert from "node:assert/strict";
 * const fig = plotObjective();
 * assert.match(fig.toSVG(), /^<svg xmlns/);
 * ```
 *
 * @module
 */
export {
  cieLightness,
  dStarColor,
  FONT_FAMILY,
  PALETTE,
  type Role,
  type RoleStyle,
} from "./palette.ts";
export { Figure, type FigureInfo, type PngOptions } from "./figure.ts";
// Types that this folder's API mentions, re-exported so that the module documents alone.
export type { PlotLayerOptions, PlotMark } from "./plot_types.ts";
export type { RandomSource, Rng } from "../random/rng.ts";
export type { Samples } from "../samples/samples.ts";
export type { Density, DensityDescription } from "../density/types.ts";
export type { Estimate, EstimateUnit } from "../estimate/estimate.ts";
export type { BootstrapEstimate } from "../estimate/bootstrap.ts";
export type { Discriminator } from "../discriminator/types.ts";
export type { DiscriminatorGap, ReliabilityBin } from "../discriminator/discriminator_gap.ts";
export type { GeneratorObjectives } from "../value/generator_objectives.ts";
export type { AxisRange, ColumnLabelOptions, EstimateOrNumber } from "./input_types.ts";
export type { GeneratorComparison, PrecisionRecall } from "../metrics/mod.ts";
export {
  composeFigure,
  type FrameSpec,
  type LegendEntry,
  type LegendItem,
  type Margins,
  type PanelSpec,
  type RampLegend,
} from "./compose.ts";
export {
  axisLabel,
  type AxisUnit,
  dotStyle,
  EQUILIBRIUM_VALUES,
  lineStyle,
  type ReferenceOptions,
  referenceX,
  referenceY,
} from "./axes.ts";
export { plotFigure, type PlotFigureOptions } from "./plot_figure.ts";
export { type DensityCurves, type DensityPlotOptions, plotDensities } from "./density_plot.ts";
export { type DiscriminatorMapInput, plotDiscriminatorMap } from "./discriminator_map.ts";
export { type ObjectivePair, type ObjectivePlotOptions, plotObjective } from "./objective_plot.ts";
export {
  type DecompositionPlotOptions,
  type DecompositionTerms,
  plotDecomposition,
} from "./decomposition_plot.ts";
export {
  type DivergenceBar,
  type DivergencePlotOptions,
  plotDivergences,
} from "./divergence_plot.ts";
export {
  plotReliability,
  type ReliabilityPlotOptions,
  type ReliabilitySource,
} from "./reliability_plot.ts";
export { type BootstrapPlotOptions, plotBootstrap } from "./bootstrap_plot.ts";
export { type FitInput, type FitPlotOptions, plotFit } from "./fit_plot.ts";
export {
  type GeneratorObjectivesPlotOptions,
  plotGeneratorObjectives,
} from "./generator_objectives_plot.ts";
export { plotValueSurface, type ValueSurfacePlotOptions } from "./value_surface_plot.ts";
export { type GradientFieldPlotOptions, plotGradientField } from "./gradient_field_plot.ts";
export { plotTrainingCurves, type TrainingCurvesPlotOptions } from "./training_curves_plot.ts";
export { type PhaseSnapshotsPlotOptions, plotPhaseSnapshots } from "./phase_snapshots_plot.ts";
export { type EigenvaluePlotOptions, plotEigenvalues } from "./eigenvalue_plot.ts";
export { type ModeCoveragePlotOptions, plotModeCoverage } from "./mode_coverage_plot.ts";
export type {
  GradientFieldGrid,
  NeuralRun,
  NeuralSnapshot,
  Simulation,
  Stability,
  ValueSurface,
} from "../game/mod.ts";
export type { ModeCoverage } from "../metrics/mod.ts";
export {
  type GeneratorComparisonPlotOptions,
  plotGeneratorComparison,
} from "./generator_comparison_plot.ts";
export { plotPrecisionRecall, type PrecisionRecallPlotOptions } from "./precision_recall_plot.ts";
export type { TrainingPlotOptions } from "./_training.ts";
export { plotLossCurves } from "./loss_curves_plot.ts";
export { plotDiscriminatorOutputs } from "./discriminator_outputs_plot.ts";
export {
  type CheckpointMetricsPlotOptions,
  plotCheckpointMetrics,
} from "./checkpoint_metrics_plot.ts";
export { type PeriodogramPlotOptions, plotPeriodogram } from "./periodogram_plot.ts";
export type {
  SeriesDiagnosis,
  TrainingDiagnosis,
  TrainingFlag,
  TrainingFlagKind,
} from "../training/diagnose_training.ts";
export type { TrainingLog } from "../training/training_log.ts";
export type { CheckpointSeries } from "../training/checkpoint_series.ts";
