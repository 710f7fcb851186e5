/**
 * The `Figure`: one standalone SVG that saves to .svg or .png and shows itself in a notebook
 * cell.
 *
 * @module
 */
import type { PlotLayerOptions, PlotMark } from "./plot_types.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { writeFileAtomic } from "../files/atomic_write.ts";
import { withDisplay } from "../display/display.ts";
import { svgToPng } from "./_png.ts";

/** What a {@linkcode Figure} knows besides its SVG. */
export interface FigureInfo {
  /** Width in px (SVG user units). */
  readonly width: number;
  /** Height in px (SVG user units). */
  readonly height: number;
  /** Title, used in the text form. */
  readonly title?: string;
  /** The builder's marks, to compose into your own `Plot.plot`. */
  readonly marks?: readonly PlotMark[];
  /** Every Plot layer the figure was drawn from (options without `document`). */
  readonly layers?: readonly PlotLayerOptions[];
}

/** Options of {@linkcode Figure.toPNG} and {@linkcode Figure.save}. */
export interface PngOptions {
  /** Device pixels per SVG unit (default 2, for sharp figures in print). */
  scale?: number;
}

/**
 * A figure held as standalone SVG markup: namespaced, a white background, fonts given as a
 * family list, no external references. Shows as `image/svg+xml` in a Jupyter cell, with a
 * `text/html` `<img>` of the same SVG for exporters that strip inline SVG (nbconvert).
 *
 * @example
 * ```ts
 * import { Figure } from "./figure.ts";
 * import { displayBundle } from "../display/display.ts";
 * import assert from "node:assert/strict";
 * const svg = '<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10" viewBox="0 0 10 10"></svg>';
 * const f = new Figure(svg, { width: 10, height: 10, title: "empty" });
 * assert.equal(f.toSVG(), svg);
 * assert.equal(displayBundle(f)?.["image/svg+xml"], svg);
 * assert.match(String(f), /empty/);
 * ```
 */
export class Figure {
  /** Width in px. */
  readonly width: number;
  /** Height in px. */
  readonly height: number;
  /** Title ("" when none). */
  readonly title: string;
  /** The builder's marks: spread them into your own `Plot.plot({ marks: [...] })`. */
  readonly marks: readonly PlotMark[];
  /** The Plot layers (options) the figure was drawn from. */
  readonly layers: readonly PlotLayerOptions[];
  readonly #svg: string;

  /**
   * Wrap standalone SVG markup (builders do this for you).
   *
   * @param svg Standalone SVG markup.
   * @param info Size, title and the marks it was drawn from.
   */
  constructor(svg: string, info: FigureInfo) {
    if (!svg.trimStart().startsWith("<svg")) {
      throw new SaddleError("invalid-argument", "a Figure needs SVG markup starting with <svg", {
        parameter: "svg",
      });
    }
    this.#svg = svg;
    this.width = info.width;
    this.height = info.height;
    this.title = info.title ?? "";
    this.marks = info.marks ?? [];
    this.layers = info.layers ?? [];
    withDisplay(this, (f) => ({
      "image/svg+xml": f.toSVG(),
      "text/html": f.toImgTag(),
      "text/plain": f.toString(),
    }));
  }

  /** The standalone SVG markup. */
  toSVG(): string {
    return this.#svg;
  }

  /**
   * The figure as an HTML `<img>` whose source is the SVG as a base64 data URI. A
   * notebook cell shows it beside `image/svg+xml`: nbconvert's HTML export picks
   * `text/html` first and strips the inside of inline SVG, so this form keeps figures in
   * exported notebooks.
   *
   * @example
   * ```ts
   * import { Figure } from "./figure.ts";
   * import assert from "node:assert/strict";
   * const f = new Figure('<svg xmlns="http://www.w3.org/2000/svg" width="20" height="10"><text>µ</text></svg>', { width: 20, height: 10, title: "t" });
   * const src = f.toImgTag().match(/src="data:image\/svg\+xml;base64,([^"]+)"/)![1];
   * const bytes = Uint8Array.from(atob(src), (c) => c.charCodeAt(0));
   * assert.equal(new TextDecoder().decode(bytes), f.toSVG());
   * ```
   */
  toImgTag(): string {
    const bytes = new TextEncoder().encode(this.#svg);
    let binary = "";
    for (let i = 0; i < bytes.length; i += 0x8000) {
      binary += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
    }
    const alt = (this.title || "figure").replace(/&/g, "&amp;").replace(/"/g, "&quot;")
      .replace(/</g, "&lt;");
    return `<img src="data:image/svg+xml;base64,${btoa(binary)}" width="${this.width}" ` +
      `height="${this.height}" alt="${alt}" style="max-width:100%;height:auto">`;
  }

  /**
   * Render to PNG bytes with resvg and the embedded DejaVu Sans font.
   *
   * @example
   * ```ts
   * import { Figure } from "./figure.ts";
   * import assert from "node:assert/strict";
   * const f = new Figure('<svg xmlns="http://www.w3.org/2000/svg" width="20" height="10"></svg>', { width: 20, height: 10 });
   * const png = await f.toPNG({ scale: 1 });
   * assert.deepEqual([...png.subarray(1, 4)], [80, 78, 71]); // "PNG"
   * ```
   */
  toPNG(options: PngOptions = {}): Promise<Uint8Array> {
    return svgToPng(this.#svg, options.scale ?? 2);
  }

  /**
   * Save as `.svg` (the markup) or `.png` (rendered at `scale`); other extensions throw.
   *
   * @example
   * ```ts
   * import { Figure } from "./figure.ts";
   * import assert from "node:assert/strict";
   * const f = new Figure('<svg xmlns="http://www.w3.org/2000/svg" width="20" height="10"></svg>', { width: 20, height: 10 });
   * const path = await Deno.makeTempFile({ suffix: ".svg" });
   * await f.save(path);
   * assert.equal(await Deno.readTextFile(path), f.toSVG());
   * await Deno.remove(path);
   * ```
   */
  async save(path: string, options: PngOptions = {}): Promise<void> {
    const ext = path.toLowerCase().match(/\.([a-z0-9]+)$/)?.[1];
    // Rendered first, then written atomically (temporary file, rename): a failure leaves no
    // partial file, and Deno's errors become SaddleErrors naming the path.
    if (ext === "svg") {
      await writeFileAtomic(path, this.#svg);
    } else if (ext === "png") {
      await writeFileAtomic(path, await this.toPNG(options));
    } else {
      throw new SaddleError(
        "unsupported",
        `cannot save a figure as "${path}": give a path ending in .svg or .png`,
        { file: path },
      );
    }
  }

  /** Text form: size and title. */
  toString(): string {
    return `Figure ${this.width}×${this.height}${this.title ? `: ${this.title}` : ""}`;
  }
}
