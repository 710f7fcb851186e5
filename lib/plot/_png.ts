/**
 * SVG to PNG with resvg (WebAssembly) and the embedded DejaVu Sans font: both are read from
 * the npm packages in Deno's cache, so no network is needed at run time.
 *
 * @module
 */
import { initWasm, Resvg } from "@resvg/resvg-wasm";
// Importing the font package's manifest puts the package in the module graph, so that Deno
// downloads it (with its .ttf files) whenever it installs saddlekit's dependencies.
import fontPackage from "dejavu-fonts-ttf/package.json" with { type: "json" };
import { SaddleError } from "../errors/saddle_error.ts";

/** The TrueType font used for PNG output, with its package version. */
export const PNG_FONT = `DejaVu Sans (dejavu-fonts-ttf ${fontPackage.version})`;

let ready: Promise<Uint8Array[]> | undefined;

async function readPackageFile(specifier: string): Promise<Uint8Array> {
  const url = import.meta.resolve(specifier);
  if (!url.startsWith("file:")) {
    throw new SaddleError(
      "not-found",
      `cannot locate ${specifier} on disk (resolved to ${url}); run \`deno install\` in the ` +
        "project so that Deno caches saddlekit's npm dependencies",
      { parameter: "png" },
    );
  }
  return await Deno.readFile(new URL(url));
}

function init(): Promise<Uint8Array[]> {
  ready ??= (async () => {
    const wasm = await readPackageFile("@resvg/resvg-wasm/index_bg.wasm");
    await initWasm(wasm);
    return [
      await readPackageFile("dejavu-fonts-ttf/ttf/DejaVuSans.ttf"),
      await readPackageFile("dejavu-fonts-ttf/ttf/DejaVuSans-Bold.ttf"),
    ];
  })();
  // A failed start may be retried (e.g. after `deno install`).
  ready.catch(() => (ready = undefined));
  return ready;
}

/** Render standalone SVG markup to PNG bytes at `scale` device pixels per SVG unit. */
export async function svgToPng(svg: string, scale: number): Promise<Uint8Array> {
  if (!(scale > 0 && scale <= 16)) {
    throw new SaddleError("invalid-argument", `scale must be in (0, 16], got ${scale}`, {
      parameter: "scale",
    });
  }
  const fontBuffers = await init();
  const r = new Resvg(svg, {
    background: "white",
    fitTo: { mode: "zoom", value: scale },
    font: { fontBuffers, loadSystemFonts: false, defaultFontFamily: "DejaVu Sans" },
  });
  const image = r.render();
  const png = image.asPng();
  image.free();
  r.free();
  return png;
}
