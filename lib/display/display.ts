/**
 * Rich display in Jupyter cells (Deno kernel): any object with a
 * `[Symbol.for("Jupyter.display")]()` method returning a MIME bundle shows itself.
 *
 * @module
 */

/** The symbol the Deno Jupyter kernel looks for. */
export const JUPYTER_DISPLAY: unique symbol = Symbol.for("Jupyter.display") as never;

/** A MIME bundle: MIME type to content. */
export type MimeBundle = Readonly<Record<string, string>>;

/**
 * Attach a non-enumerable rich display to `obj` (so JSON.stringify and spreading ignore
 * it) and return `obj`. `bundle` is called lazily each time the cell displays.
 *
 * @example
 * ```ts
 * import { withDisplay, JUPYTER_DISPLAY, type MimeBundle } from "./display.ts";
 * import assert from "node:assert/strict";
 * const r = withDisplay({ jsd: 0.1 }, () => ({ "text/plain": "JSD 0.1" }));
 * const show = (r as unknown as Record<symbol, () => MimeBundle>)[JUPYTER_DISPLAY];
 * assert.equal(show()["text/plain"], "JSD 0.1");
 * assert.equal(JSON.stringify(r), '{"jsd":0.1}');
 * ```
 */
export function withDisplay<T extends object>(obj: T, bundle: (obj: T) => MimeBundle): T {
  Object.defineProperty(obj, JUPYTER_DISPLAY, {
    enumerable: false,
    configurable: true,
    value: () => bundle(obj),
  });
  return obj;
}

/**
 * The MIME bundle of an object with a rich display, or undefined.
 *
 * @example
 * ```ts
 * import { displayBundle, withDisplay } from "./display.ts";
 * import assert from "node:assert/strict";
 * assert.equal(displayBundle(withDisplay({}, () => ({ "text/html": "<b>x</b>" })))?.["text/html"], "<b>x</b>");
 * assert.equal(displayBundle({}), undefined);
 * ```
 */
export function displayBundle(obj: unknown): MimeBundle | undefined {
  if (typeof obj !== "object" || obj === null) return undefined;
  const f = (obj as Record<symbol, unknown>)[JUPYTER_DISPLAY];
  return typeof f === "function" ? (f.call(obj) as MimeBundle) : undefined;
}
