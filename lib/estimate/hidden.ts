/**
 * Frozen objects with extra non-enumerable fields: bootstrap replicates, plug-in values and
 * other detail that plots read but JSON and spreading leave out.
 *
 * @module
 */
import { JUPYTER_DISPLAY, type MimeBundle } from "../display/display.ts";

/**
 * A frozen copy of `obj` with extra non-enumerable properties (and optionally a new rich
 * display), leaving out `obj`'s own display when a new one is given.
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
