/**
 * Names for Observable Plot's own types in saddlekit's signatures. They are Plot's types
 * (see Observable Plot's documentation), aliased so that saddlekit's API documents without
 * re-exporting Plot's whole type graph.
 *
 * @module
 */
import type * as Plot from "@observablehq/plot";

/**
 * A Plot mark, render function, array of them, or null: what `Plot.plot({ marks })` takes.
 *
 * @ignore
 */
export type PlotMark = Plot.Markish;

/**
 * The options of `Plot.plot` (scales, marks, margins...).
 *
 * @ignore
 */
export type PlotLayerOptions = Plot.PlotOptions;
