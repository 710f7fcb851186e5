/**
 * Seeded randomness: every random result in saddlekit is reproducible bit for bit.
 *
 * @module
 */
export * from "./rng.ts";
