/**
 * Reading numbers and intervals from Estimates (or plain numbers) for figures.
 *
 * @module
 */
import type { EstimateOrNumber } from "./input_types.ts";

export type { EstimateOrNumber };

/** Value, interval (or none) and unit of an Estimate or number. */
export function readEstimate(e: EstimateOrNumber): {
  value: number;
  lo?: number;
  hi?: number;
  unit?: string;
  level?: number;
  n?: number;
  method?: string;
} {
  if (typeof e === "number") return { value: e };
  const ci = e.ci && Number.isFinite(e.ci[0]) && Number.isFinite(e.ci[1]) ? e.ci : undefined;
  return {
    value: e.value,
    ...(ci ? { lo: ci[0], hi: ci[1] } : {}),
    ...(e.unit ? { unit: e.unit } : {}),
    level: e.level,
    n: e.n,
    method: e.method,
  };
}

/** "95% CI" for a level. */
export function levelText(level = 0.95): string {
  return `${Math.round(level * 1000) / 10}% CI`;
}
