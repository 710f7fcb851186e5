/**
 * Writing files safely: atomic writes (temporary file, then rename) whose failures are
 * SaddleErrors naming the path and the fix. Imports only lib/errors (and lib/math).
 *
 * @module
 */
export * from "./atomic_write.ts";
