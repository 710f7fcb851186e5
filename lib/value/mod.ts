/**
 * value (in progress).
 *
 * @module
 */
export {};
