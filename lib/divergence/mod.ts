/**
 * divergence (in progress).
 *
 * @module
 */
export {};
