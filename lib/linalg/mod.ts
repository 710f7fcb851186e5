/**
 * linalg (in progress).
 *
 * @module
 */
export {};
