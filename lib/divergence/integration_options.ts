/**
 * Options of the numerical integration behind the divergences and the decomposition at the
 * optimum: grid quadrature (d <= 2) or Monte Carlo.
 *
 * @module
 */
import type { RandomSource } from "../random/rng.ts";

/** Integration options shared by the decomposition and the f-divergences. */
export interface IntegrationOptions {
  /** "grid" (d <= 2, the default there) or "monte-carlo" (the default for d > 2). */
  method?: "grid" | "monte-carlo";
  /** Monte Carlo draws from each density (default 20000). */
  n?: number;
  /** Seed of the draws, and of the range-finding draws of the grid (default 0). */
  seed?: RandomSource;
  /** Confidence level (default 0.95). */
  level?: number;
  /** Grid cells per dimension of the coarse grid; the fine grid has twice as many
   * (default 2000 in 1-D, 160 in 2-D). */
  gridSize?: number;
  /** Integration range per dimension `[lo, hi]` (default: from draws of both densities). */
  bounds?: readonly (readonly [number, number])[];
  /** Widening of the sampled range on each side, as a fraction of its span (default 0.5). */
  margin?: number;
}
