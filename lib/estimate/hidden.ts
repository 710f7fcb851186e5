/**
 * Frozen objects with extra non-enumerable fields: bootstrap replicates, plug-in values and
 * other detail that plots read but JSON and spreading leave out.
 *
 * The types make that loss visible: a hidden field is declared as a get-accessor of a
 * declared class (`get replicates(): Float64Array`), and TypeScript leaves class accessors
 * out of a spread's type. So `const c = { ...b }` has no `replicates` in its type, and
 * `const c: BootstrapEstimate = { ...b }` does not compile, instead of compiling and
 * reading `undefined` later. Read hidden fields from the result itself. JSON keeps the
 * plain `Estimate` shape (see tests/estimate/hidden_fields_test.ts).
 *
 * @module
 */
import { JUPYTER_DISPLAY, type MimeBundle } from "../display/display.ts";

/**
 * A frozen copy of `obj` with extra non-enumerable properties (and optionally a new rich
 * display), leaving out `obj`'s own display when a new one is given. Declare the hidden
 * fields of the result type as accessors (see the module doc).
 *
 * @example
 * ```ts
 * import { withHidden } from "./hidden.ts";
 * import assert from "node:assert/strict";
 * const e = withHidden({ value: 1 }, { detail: [1, 2] });
 * assert.deepEqual((e as unknown as { detail: number[] }).detail, [1, 2]);
 * assert.equal(JSON.stringify(e), '{"value":1}');
 * assert.ok(Object.isFrozen(e));
 * ```
 */
export function withHidden<T extends object>(
  obj: T,
  hidden: Record<string, unknown>,
  display?: () => MimeBundle,
): T {
  const desc = Object.getOwnPropertyDescriptors(obj) as Record<PropertyKey, PropertyDescriptor>;
  if (display) delete desc[JUPYTER_DISPLAY];
  const out = Object.create(Object.getPrototypeOf(obj), desc);
  for (const [k, v] of Object.entries(hidden)) {
    Object.defineProperty(out, k, { value: v, enumerable: false });
  }
  if (display) Object.defineProperty(out, JUPYTER_DISPLAY, { value: display, enumerable: false });
  return Object.freeze(out) as T;
}
