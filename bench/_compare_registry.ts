/**
 * Case registry of `deno task bench:compare` (bench/compare.ts). A case file
 * `bench/_cases_<topic>.ts` calls {@linkcode registerCase} at import time; compare.ts
 * imports every such file, so later topics add cases without editing compare.ts.
 *
 * @module
 */

/** What a case measured. Times in seconds; `reference_s` null when no reference ran. */
export interface CaseResult {
  /** Wall time of saddlekit on the case. */
  readonly saddlekit_s: number;
  /** Wall time of the reference library on the same data, same run. */
  readonly reference_s: number | null;
  /** Largest relative error of saddlekit's numbers against the reference (or exact). */
  readonly max_rel_err: number | null;
  /** Free-text remark (what the reference was, what the target is). */
  readonly note?: string;
}

/** One comparison case. */
export interface CompareCase {
  /** Unique, stable name (printed as `case`). */
  readonly name: string;
  /** Python modules the reference side needs (empty: no reference run). */
  readonly python: readonly string[];
  /** Target ratio saddlekit_s / reference_s, when the issue sets one. */
  readonly target?: number;
  /** Run the case. `reference` is false when the reference modules are missing. */
  run(reference: boolean): Promise<CaseResult>;
}

/** Every registered case, in registration order. */
export const cases: CompareCase[] = [];

/** Register a case (names must be unique). */
export function registerCase(c: CompareCase): void {
  if (cases.some((x) => x.name === c.name)) throw new Error(`duplicate bench case ${c.name}`);
  cases.push(c);
}

/** Wall time of an async or sync function, in seconds, with its result. */
export async function timed<T>(f: () => T | Promise<T>): Promise<{ seconds: number; value: T }> {
  const t0 = performance.now();
  const value = await f();
  return { seconds: (performance.now() - t0) / 1000, value };
}
