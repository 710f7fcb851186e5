/**
 * Test helpers: read back the SVG of a Figure (linkedom's XML parser) and check that it is
 * standalone.
 *
 * @module
 */
import { DOMParser } from "linkedom";
import { AssertionError } from "node:assert/strict";

/** The part of a DOM element the tests use. */
export interface El {
  readonly tagName: string;
  readonly children: ArrayLike<El> & Iterable<El>;
  readonly textContent: string | null;
  getAttribute(name: string): string | null;
  querySelectorAll(selector: string): Iterable<El>;
}

/** Parse SVG markup; the root element. */
export function parseSvg(svg: string): El {
  const doc = new DOMParser().parseFromString(svg, "image/svg+xml") as unknown as {
    documentElement: El;
  };
  return doc.documentElement;
}

/** Elements matching `selector`. */
export function all(root: El, selector: string): El[] {
  return [...root.querySelectorAll(selector)];
}

/** Number of `tag` elements inside groups with `aria-label` `label`. */
export function countIn(root: El, label: string, tag: string): number {
  return all(root, `g[aria-label="${label}"] ${tag}`).length;
}

/** Text content of every `<text>` (tspans joined). */
export function texts(root: El): string[] {
  return all(root, "text").map((t) => t.textContent ?? "");
}

/** The frame's layers: the root's `<g transform>` children other than the legend. */
export function layers(root: El): El[] {
  return [...root.children].filter((c) =>
    c.tagName.toLowerCase() === "g" && c.getAttribute("aria-label") !== "legend"
  );
}

/** Numbers of an SVG path's `d` as [x, y] pairs (M/L commands only). */
export function pathPoints(d: string): [number, number][] {
  const out: [number, number][] = [];
  for (const m of d.matchAll(/[ML]\s*(-?[\d.e+-]+)[ ,](-?[\d.e+-]+)/g)) {
    out.push([Number(m[1]), Number(m[2])]);
  }
  return out;
}

/**
 * Assert the SVG is standalone: svg root in the SVG namespace with width/height/viewBox, a
 * font-family list, a white background rect first, and no external references.
 */
export function assertStandalone(svg: string): void {
  const fail = (m: string) => {
    throw new AssertionError({ message: `not standalone: ${m}` });
  };
  if (!svg.startsWith('<svg xmlns="http://www.w3.org/2000/svg"')) fail("no SVG namespace");
  const root = parseSvg(svg);
  for (const a of ["width", "height", "viewBox", "font-family"]) {
    if (!root.getAttribute(a)) fail(`missing ${a}`);
  }
  if (!(root.getAttribute("font-family") ?? "").includes(",")) fail("font-family is not a list");
  const rect = [...root.children].find((c) => c.tagName.toLowerCase() === "rect");
  if (!rect || rect.getAttribute("fill") !== "white") fail("no white background");
  if (/href=|<image|<foreignObject|<style|<script|class="/i.test(svg)) {
    fail("external reference, style sheet, script or class found");
  }
  // url(...) may only point at ids defined in this document, named after this figure.
  const ids = new Set([...svg.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]));
  for (const m of svg.matchAll(/url\(([^)]*)\)/g)) {
    const id = m[1].startsWith("#") ? m[1].slice(1) : "";
    if (!ids.has(id)) fail(`url(${m[1]}) does not name an id of this figure`);
  }
  for (const id of ids) if (!/^sk[0-9a-z]+-k\d+$/.test(id)) fail(`id ${id} is not figure-local`);
}

/** Width and height from a PNG's IHDR chunk (PNG spec, ISO/IEC 15948, sec. 11.2.2). */
export function pngSize(png: Uint8Array): { width: number; height: number } {
  const sig = [137, 80, 78, 71, 13, 10, 26, 10];
  if (!sig.every((b, i) => png[i] === b)) throw new AssertionError({ message: "not a PNG" });
  const v = new DataView(png.buffer, png.byteOffset, png.byteLength);
  const type = String.fromCharCode(...png.subarray(12, 16));
  if (type !== "IHDR") throw new AssertionError({ message: `first chunk is ${type}` });
  return { width: v.getUint32(16), height: v.getUint32(20) };
}
