/**
 * saddlekit: test the theory of adversarial generative models against your own samples.
 *
 * One import for a notebook:
 *
 * ```ts
 * import * as sk from "./mod.ts";
 * const real = sk.samples([[0, 1], [1, 0], [0.5, 0.5]]);
 * console.log(real.n, real.d);
 * ```
 *
 * @module
 */
export * from "./lib/errors/mod.ts";
export * from "./lib/math/mod.ts";
export * from "./lib/display/mod.ts";
export * from "./lib/samples/mod.ts";
export * from "./lib/random/mod.ts";
export * from "./lib/estimate/mod.ts";
export * from "./lib/linalg/mod.ts";
export * from "./lib/density/mod.ts";
export * from "./lib/neighbors/mod.ts";
export * from "./lib/discriminator/mod.ts";
export * from "./lib/value/mod.ts";
export * from "./lib/divergence/mod.ts";
export * from "./lib/metrics/mod.ts";
export * from "./lib/game/mod.ts";
export * from "./lib/plot/mod.ts";
export * from "./lib/files/mod.ts";
export * from "./lib/training/mod.ts";
export * from "./lib/report/mod.ts";
