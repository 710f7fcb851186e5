/**
 * discriminator (in progress).
 *
 * @module
 */
export {};
