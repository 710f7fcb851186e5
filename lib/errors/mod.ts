/**
 * The saddlekit error family.
 *
 * @module
 */
export * from "./saddle_error.ts";
