/**
 * Parameter vectors from user input.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";

/** Numbers from user input, checked finite and (when `p` is given) of length `p`. */
export function toParams(
  x: ArrayLike<number> | number,
  p: number | undefined,
  name: string,
): Float64Array {
  const v = typeof x === "number" ? Float64Array.of(x) : Float64Array.from(x);
  if (p !== undefined && v.length !== p) {
    throw new SaddleError("dimension-mismatch", `${name} needs ${p} entries, got ${v.length}`, {
      parameter: name,
    });
  }
  for (const [i, t] of v.entries()) {
    if (!Number.isFinite(t)) {
      throw new SaddleError("non-finite", `${name}[${i}] is ${t}; give finite numbers`, {
        parameter: name,
      });
    }
  }
  return v;
}
