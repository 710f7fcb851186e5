/**
 * The report and exported notebooks in a real browser (Debian's chromium, headless, driven
 * by puppeteer-core): the report opens with no console errors and no network requests, and
 * a screenshot of every figure is not blank; a notebook's HTML written by `deno task
 * notebook` and the HTML that plain `jupyter nbconvert --to html` makes of the executed
 * notebook both show non-blank figures.
 *
 * Skipped loudly without chromium; with SADDLEKIT_REQUIRE_BROWSER=1 (CI) a missing browser
 * fails instead. The notebook part also needs Jupyter and the Deno kernel (see
 * tests/notebooks/_notebooks.ts).
 */
import assert from "node:assert/strict";
import puppeteer, { type Browser, type Page } from "puppeteer-core";
import { prepareAnalysis, runAnalysis, writeReport } from "../../lib/report/mod.ts";
import { PYTHON } from "../_reference.ts";
import { ignoreWithoutJupyter } from "../_jupyter.ts";
import { gaussianPair } from "./_report.ts";

const CHROMIUM = Deno.env.get("SADDLEKIT_CHROMIUM") ?? "/usr/bin/chromium";
const REQUIRE = Deno.env.get("SADDLEKIT_REQUIRE_BROWSER") === "1";
const HAVE = (() => {
  try {
    return Deno.statSync(CHROMIUM).isFile;
  } catch {
    return false;
  }
})();
if (!HAVE && !REQUIRE) {
  console.error(
    `\n*** browser tests are IGNORED: no chromium at ${CHROMIUM}. Install with: ` +
      "apt-get install -y chromium (or set SADDLEKIT_CHROMIUM)\n",
  );
}
const ignore = !HAVE && !REQUIRE;

async function launch(): Promise<Browser> {
  if (!HAVE) {
    throw new Error(
      `chromium is required (SADDLEKIT_REQUIRE_BROWSER=1) but ${CHROMIUM} is missing`,
    );
  }
  return await puppeteer.launch({
    executablePath: CHROMIUM,
    args: ["--no-sandbox", "--disable-gpu", "--no-first-run"],
  });
}

/** Open a local page with every request that is not file: or data: blocked and recorded. */
async function open(browser: Browser, path: string) {
  const page = await browser.newPage();
  await page.setViewport({ width: 1100, height: 900 });
  const errors: string[] = [], network: string[] = [];
  page.on("console", (m) => {
    if (m.type() === "error") errors.push(m.text());
  });
  page.on("pageerror", (e) => errors.push(String(e)));
  await page.setRequestInterception(true);
  page.on("request", (r) => {
    const url = r.url();
    if (url.startsWith("file:") || url.startsWith("data:")) r.continue();
    else {
      network.push(url);
      r.abort();
    }
  });
  await page.goto(`file://${path}`, { waitUntil: "load" });
  return { page, errors, network };
}

/** Share of pixels of a screenshot that are not (near) white, measured in the page. */
async function ink(page: Page, png: Uint8Array): Promise<number> {
  let binary = "";
  for (let i = 0; i < png.length; i += 0x8000) {
    binary += String.fromCharCode(...png.subarray(i, i + 0x8000));
  }
  // Evaluated in the page (a string: this file is type-checked without the DOM library).
  return await page.evaluate(`(async () => {
    const img = new Image();
    img.src = "data:image/png;base64,${btoa(binary)}";
    await img.decode();
    const c = document.createElement("canvas");
    c.width = img.naturalWidth;
    c.height = img.naturalHeight;
    const g = c.getContext("2d");
    g.drawImage(img, 0, 0);
    const px = g.getImageData(0, 0, c.width, c.height).data;
    let dark = 0;
    for (let i = 0; i < px.length; i += 4) if (Math.min(px[i], px[i + 1], px[i + 2]) < 200) dark++;
    return dark / (px.length / 4);
  })()`) as number;
}

/** Screenshot each element matching `selector`; their ink fractions. */
async function figureInk(page: Page, selector: string): Promise<number[]> {
  const out: number[] = [];
  for (const el of await page.$$(selector)) {
    await el.scrollIntoView();
    out.push(await ink(page, await el.screenshot() as Uint8Array));
  }
  return out;
}

Deno.test({
  name: "the report opens in headless chromium: no console errors, no network, non-blank figures",
  ignore,
  async fn() {
    const { dir, real, fake } = await gaussianPair({ n: 300, mean: 0.4, sd: 1, seed: 21, d: 2 });
    const scores = `${dir}/scores.csv`;
    const rows = ["side,score"];
    for (let i = 0; i < 300; i++) rows.push(`real,${0.5 + 0.1 * Math.sin(i)}`);
    for (let i = 0; i < 300; i++) rows.push(`fake,${0.45 + 0.1 * Math.cos(i)}`);
    await Deno.writeTextFile(scores, rows.join("\n") + "\n");
    const report = await runAnalysis(await prepareAnalysis({ real, fake, scores, replicates: 10 }));
    await writeReport(report, `${dir}/report`);
    const browser = await launch();
    try {
      const { page, errors, network } = await open(browser, `${dir}/report/index.html`);
      await page.screenshot({ path: `${dir}/report/first-screen.png` });
      assert.deepEqual(errors, [], "console errors");
      assert.deepEqual(network, [], "network requests");
      const first = await page.evaluate("document.body.innerText.slice(0, 600)") as string;
      assert.match(first, /Real and generated samples compared/);
      assert.match(first, /Read before you decide/);
      const inks = await figureInk(page, "figure svg");
      assert.deepEqual(report.figures.map((f) => f.name), [
        "discriminator_map",
        "decomposition",
        "divergences",
        "reliability",
      ]);
      assert.equal(inks.length, 4);
      for (const [i, f] of inks.entries()) assert.ok(f > 0.01, `figure ${i} is blank (${f})`);
    } finally {
      await browser.close();
    }
    await Deno.remove(dir, { recursive: true });
  },
});

Deno.test({
  name: "notebooks exported by deno task notebook and by plain nbconvert show non-blank figures",
  ignore: ignore || ignoreWithoutJupyter(),
  async fn() {
    // Inside the project, so that the kernel finds deno.json and its import map.
    const root = new URL("../../", import.meta.url).pathname;
    await Deno.mkdir(`${root}out`, { recursive: true });
    const dir = await Deno.makeTempDir({ dir: `${root}out`, prefix: "nb-test-" });
    const cell = (source: string) => ({
      cell_type: "code",
      execution_count: null,
      metadata: {},
      outputs: [],
      source,
    });
    await Deno.writeTextFile(
      `${dir}/tiny.ipynb`,
      JSON.stringify({
        nbformat: 4,
        nbformat_minor: 5,
        metadata: { kernelspec: { name: "deno", display_name: "Deno", language: "typescript" } },
        cells: [cell(`import * as sk from "${root}mod.ts";`), cell("sk.plotObjective()")],
      }),
    );
    const run = async (cmd: string, args: string[]) => {
      const r = await new Deno.Command(cmd, { args, cwd: dir, stdout: "piped", stderr: "piped" })
        .output();
      assert.ok(r.success, `${cmd} ${args.join(" ")}:\n${new TextDecoder().decode(r.stderr)}`);
    };
    await run(Deno.execPath(), [
      "run",
      "-A",
      `${root}scripts/notebook.ts`,
      "tiny.ipynb",
      "--out",
      `${dir}/executed`,
      "--html",
      `${dir}/task.html`,
    ]);
    // Plain nbconvert on the executed notebook. (Executing with nbconvert itself can drop the
    // Deno kernel's late outputs: that is what `deno task notebook` works around.)
    await run(PYTHON, [
      "-m",
      "nbconvert",
      "--to",
      "html",
      `${dir}/executed/tiny.ipynb`,
      "--output-dir",
      dir,
      "--output",
      "plain",
    ]);
    const browser = await launch();
    try {
      for (const html of ["task.html", "plain.html"]) {
        const { page } = await open(browser, `${dir}/${html}`);
        const inks = await figureInk(page, 'img[src^="data:image/svg+xml"]');
        assert.ok(inks.length >= 1, `${html}: no figure`);
        for (const f of inks) assert.ok(f > 0.01, `${html}: blank figure (${f})`);
      }
    } finally {
      await browser.close();
    }
    await Deno.remove(dir, { recursive: true });
  },
});
