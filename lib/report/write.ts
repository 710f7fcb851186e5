/**
 * Writing a report: check the output folder before any work, write everything into a
 * temporary sibling folder, and rename it into place at the end, so an interrupted or
 * failed run never leaves a report that looks complete.
 *
 * @module
 */
import { SaddleError } from "../errors/mod.ts";
import type { Report } from "./types.ts";

/** Files a report writes (figures add `<name>.svg` and `<name>.png`). */
export const REPORT_FILES: readonly string[] = ["index.html", "summary.json", "timings.json"];

/** The temporary sibling folder a report is written into before the rename. */
export function partialPath(out: string): string {
  return `${out.replace(/\/+$/, "")}.partial`;
}

function ioError(e: unknown, what: string, path: string): SaddleError {
  if (e instanceof SaddleError) return e;
  const msg = (e as Error)?.message?.split("\n")[0] ?? String(e);
  const fix = e instanceof Deno.errors.PermissionDenied || e instanceof Deno.errors.NotCapable
    ? "choose a folder you may write to (or grant --allow-write to it and its .partial sibling)"
    : /no space|ENOSPC|quota/i.test(msg)
    ? "free some disk space or choose another disk"
    : /read-only|EROFS/i.test(msg)
    ? "the disk is read-only: choose another folder"
    : "choose another --out folder";
  return new SaddleError("invalid-argument", `${what} (${msg}); ${fix}`, { file: path });
}

async function statOrNull(path: string): Promise<Deno.FileInfo | null> {
  try {
    return await Deno.lstat(path);
  } catch (e) {
    if (e instanceof Deno.errors.NotFound) return null;
    throw ioError(e, "cannot inspect the output path", path);
  }
}

function isReportFile(name: string): boolean {
  return REPORT_FILES.includes(name) || /^[A-Za-z0-9_]+\.(svg|png)$/.test(name);
}

/**
 * Check the output folder before any work: it is not a file; if it exists it is empty,
 * holds an earlier report (only report files, and a summary.json of saddlekit), or
 * `force` is set; and its parent takes a test write of the temporary sibling folder.
 * Throws a `SaddleError` naming the path and the fix.
 *
 * @example
 * ```ts
 * import { checkOutputFolder } from "./write.ts";
 * import assert from "node:assert/strict";
 * const file = await Deno.makeTempFile();
 * await assert.rejects(checkOutputFolder(file), /is a file/);
 * await Deno.remove(file);
 * ```
 */
export async function checkOutputFolder(
  out: string,
  options: { force?: boolean } = {},
): Promise<void> {
  const info = await statOrNull(out);
  if (info && !info.isDirectory) {
    throw new SaddleError(
      "invalid-argument",
      "the output path is a file, not a folder; give a folder path to --out",
      { file: out, parameter: "--out" },
    );
  }
  if (info && !options.force) {
    const names: string[] = [];
    try {
      for await (const e of Deno.readDir(out)) names.push(e.name);
    } catch (e) {
      throw ioError(e, "cannot list the output folder", out);
    }
    const foreign = names.filter((n) => !isReportFile(n));
    let earlier = names.length === 0;
    if (!foreign.length && names.includes("summary.json")) {
      try {
        const s = JSON.parse(await Deno.readTextFile(`${out}/summary.json`));
        earlier = s?.generator === "saddlekit report";
      } catch {
        earlier = false;
      }
    }
    if (!earlier) {
      throw new SaddleError(
        "invalid-argument",
        `the output folder exists and holds ${
          foreign.length
            ? `other files (${foreign.slice(0, 5).join(", ")})`
            : "files that are not a saddlekit report"
        }; ` +
          "choose a new --out folder, or pass --force to replace it",
        { file: out, parameter: "--out" },
      );
    }
  }
  const tmp = partialPath(out);
  try {
    await Deno.remove(tmp, { recursive: true }).catch((e) => {
      if (!(e instanceof Deno.errors.NotFound)) throw e;
    });
    await Deno.mkdir(tmp, { recursive: true });
    await Deno.writeTextFile(`${tmp}/.probe`, "saddlekit");
    await Deno.remove(tmp, { recursive: true });
  } catch (e) {
    throw ioError(e, "cannot write next to the output folder", tmp);
  }
}

/**
 * Write a report: index.html, summary.json, timings.json and every figure as .svg and .png
 * into `<out>.partial`, then replace `out` with it. On any failure the temporary folder is
 * removed and a `SaddleError` names the path and the fix. Returns the seconds spent.
 *
 * @example
 * ```ts
 * import { writeReport } from "./write.ts";
 * import assert from "node:assert/strict";
 * const dir = await Deno.makeTempDir();
 * const report = { summary: {}, summaryText: '{"generator": "saddlekit report"}\n', figures: [], html: "<!DOCTYPE html>", timings: [], claims: [] };
 * await writeReport(report, `${dir}/out`);
 * assert.equal(await Deno.readTextFile(`${dir}/out/index.html`), "<!DOCTYPE html>");
 * await Deno.remove(dir, { recursive: true });
 * ```
 */
export async function writeReport(
  report: Report,
  out: string,
  options: { onProgress?: (step: string, fraction: number) => void } = {},
): Promise<number> {
  const t0 = performance.now();
  const tmp = partialPath(out);
  try {
    await Deno.remove(tmp, { recursive: true }).catch((e) => {
      if (!(e instanceof Deno.errors.NotFound)) throw e;
    });
    await Deno.mkdir(tmp, { recursive: true });
    for (const [i, f] of report.figures.entries()) {
      options.onProgress?.(`writing ${f.name}.png`, i / Math.max(1, report.figures.length));
      await Deno.writeTextFile(`${tmp}/${f.name}.svg`, f.figure.toSVG());
      await Deno.writeFile(`${tmp}/${f.name}.png`, await f.figure.toPNG());
    }
    await Deno.writeTextFile(`${tmp}/summary.json`, report.summaryText);
    const timings = [...report.timings, {
      step: "write",
      seconds: (performance.now() - t0) / 1000,
    }];
    await Deno.writeTextFile(
      `${tmp}/timings.json`,
      JSON.stringify(
        {
          note: "wall-clock seconds per step; not part of summary.json, which the seed decides",
          steps: timings,
          total_seconds: timings.reduce((s, t) => s + ("within" in t ? 0 : t.seconds), 0),
        },
        null,
        2,
      ) + "\n",
    );
    // index.html last: a folder without it is visibly unfinished.
    await Deno.writeTextFile(`${tmp}/index.html`, report.html);
    const existing = await statOrNull(out);
    if (existing) await Deno.remove(out, { recursive: true });
    await Deno.rename(tmp, out);
  } catch (e) {
    await Deno.remove(tmp, { recursive: true }).catch(() => {});
    throw ioError(e, "cannot write the report", out);
  }
  return (performance.now() - t0) / 1000;
}
