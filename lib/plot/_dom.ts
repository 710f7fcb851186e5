/**
 * A server-side DOM for Observable Plot (linkedom) and the clean-up that turns Plot's output
 * into a fragment of a standalone SVG.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { parseHTML } from "linkedom";

/** The part of a DOM element this module uses (Deno has no DOM types by default). */
export interface DomElement {
  readonly tagName: string;
  readonly children: ArrayLike<DomElement> & Iterable<DomElement>;
  readonly textContent: string | null;
  innerHTML: string;
  getAttribute(name: string): string | null;
  removeAttribute(name: string): void;
  querySelector(selector: string): DomElement | null;
  querySelectorAll(selector: string): Iterable<DomElement>;
  remove(): void;
}

/** The document type Plot expects, whatever the ambient DOM types are. */
type PlotDocument = NonNullable<Plot.PlotOptions["document"]>;

/** A fresh linkedom document, typed as the DOM document Plot expects. */
export function newDocument(): PlotDocument {
  const window = parseHTML("<!DOCTYPE html><html><head></head><body></body></html>") as unknown as {
    document: PlotDocument;
  };
  return window.document;
}

/** A swatch legend entry found in a `<figure>` returned by Plot. */
export interface ExtractedSwatch {
  readonly label: string;
  readonly color: string;
}

/** The pieces of one `Plot.plot` result, ready to be placed in a frame. */
export interface RenderedLayer {
  /** SVG markup of the plot's children, without `<style>` and class names. */
  readonly inner: string;
  /** `text-anchor` of the plot's root (children inherit it). */
  readonly textAnchor: string;
  /** Width and height of the plot's root `<svg>`. */
  readonly width: number;
  readonly height: number;
  /** Further `<svg>` children of a `<figure>` wrapper (ramp legends), above the plot. */
  readonly extras: readonly { inner: string; width: number; height: number }[];
  /** Swatch legends of a `<figure>` wrapper. */
  readonly swatches: readonly ExtractedSwatch[];
  /** Title, subtitle and caption texts of a `<figure>` wrapper. */
  readonly title?: string;
  readonly subtitle?: string;
  readonly caption?: string;
}

/** Render `options` with Plot on a linkedom document and take the result apart. */
export function renderLayer(options: Plot.PlotOptions): RenderedLayer {
  const document = newDocument();
  const el = Plot.plot({ ...options, document }) as unknown as DomElement;
  return takeApart(el);
}

/**
 * Take apart a Plot result: an `<svg>`, or a `<figure>` holding swatch legends, ramp legend
 * `<svg>`s, the plot `<svg>` (the last direct child `<svg>`), a title, subtitle and caption.
 */
export function takeApart(el: DomElement): RenderedLayer {
  const tag = el.tagName.toLowerCase();
  if (tag === "svg") return { ...cleanSvg(el), extras: [], swatches: [] };
  const svgs = [...el.children].filter((c) => c.tagName.toLowerCase() === "svg");
  if (svgs.length === 0) throw new Error(`Plot returned a <${tag}> without an <svg>`);
  const main = cleanSvg(svgs[svgs.length - 1]);
  const extras = svgs.slice(0, -1).map(cleanSvg);
  const swatches: ExtractedSwatch[] = [];
  for (const span of el.querySelectorAll("span")) {
    const sw = span.querySelector("svg");
    if (!sw) continue;
    const color = sw.getAttribute("fill") ?? sw.getAttribute("stroke") ?? "currentColor";
    swatches.push({ label: (span.textContent ?? "").trim(), color });
  }
  const text = (sel: string) => {
    const t = el.querySelector(sel)?.textContent?.trim();
    return t ? t : undefined;
  };
  const title = text("h2"), subtitle = text("h3"), caption = text("figcaption");
  return {
    ...main,
    extras,
    swatches,
    ...(title ? { title } : {}),
    ...(subtitle ? { subtitle } : {}),
    ...(caption ? { caption } : {}),
  };
}

function cleanSvg(
  svg: DomElement,
): { inner: string; textAnchor: string; width: number; height: number } {
  for (const s of [...svg.querySelectorAll("style")]) s.remove();
  for (const e of [...svg.querySelectorAll("[class]")]) e.removeAttribute("class");
  return {
    inner: svg.innerHTML,
    textAnchor: svg.getAttribute("text-anchor") ?? "middle",
    width: Number(svg.getAttribute("width") ?? 0),
    height: Number(svg.getAttribute("height") ?? 0),
  };
}
