/**
 * plot (in progress).
 *
 * @module
 */
export {};
