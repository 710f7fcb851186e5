/**
 * Log-space helpers and special functions: softplus, the logistic and its log, log-sum-exp.
 *
 * @module
 */
export * from "./log_space.ts";
