/**
 * The `Samples` type (row-major points) and the inputs its constructors accept.
 *
 * @module
 */

/**
 * A set of `n` points in `d` dimensions, stored row-major: point `i`, coordinate `j` is
 * `data[i * d + j]`. Every value is finite (the constructors check).
 */
export interface Samples {
  /** Number of points (rows). */
  readonly n: number;
  /** Dimension (columns). */
  readonly d: number;
  /** Row-major `n x d` values. */
  readonly data: Float64Array;
  /** Optional column names, one per dimension. */
  readonly columns?: readonly string[];
}

/** A record of named values, as read from JSON or a CSV with a header. */
export type SampleRecord = Readonly<Record<string, unknown>>;

/** What `samples()` accepts. */
export type SamplesInput =
  | Samples
  | readonly number[]
  | readonly (readonly number[])[]
  | Float64Array
  | Float32Array
  | Int8Array
  | Int16Array
  | Int32Array
  | Uint8Array
  | Uint16Array
  | Uint32Array
  | readonly SampleRecord[];
