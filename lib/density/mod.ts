/**
 * Densities: the Density interface, analytic densities and fitted estimators.
 *
 * @module
 */
export * from "./types.ts";
