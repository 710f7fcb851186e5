/**
 * Checkpoint series: generated samples saved during training, each compared with one real
 * set by the chosen metrics, with intervals; the real side prepared once, results cached by
 * the checkpoint's SHA-256.
 *
 * @module
 */
import { withDisplay } from "../display/display.ts";
import type { Estimate } from "../estimate/estimate.ts";
import { escapeHtml, htmlTable, type TableCell, textTable } from "../display/table.ts";
import { SaddleError } from "../errors/saddle_error.ts";
import { type RandomSource, toRng } from "../random/rng.ts";
import { type ReadOptions, readSamples, sampleFormatOf } from "../samples/read.ts";
import { isSamples, type Samples, samples, type SamplesInput } from "../samples/samples.ts";
import { CheckpointCache, sha256 } from "./_cache.ts";
import {
  type CheckpointContext,
  type CheckpointMetric,
  checkpointMetric,
  checkpointMetricNames,
  type CheckpointScores,
} from "./checkpoint_metrics.ts";
import "./feature_metrics.ts"; // registers the feature-space metrics (the defaults for d > 2)

/** One checkpoint: its step, its generated samples (a file or in memory), and optional scores. */
export interface CheckpointEntry {
  /** Training step of the checkpoint. */
  readonly step: number;
  /** A samples file (any format `readSamples` reads) or the samples themselves. */
  readonly samples: string | Samples | SamplesInput;
  /** A trained discriminator's outputs on the real set and on these samples. */
  readonly scores?: CheckpointScores;
}

/** Progress of {@linkcode checkpointSeries}. */
export interface CheckpointProgress {
  /** Checkpoints finished. */
  readonly done: number;
  /** Checkpoints in all. */
  readonly total: number;
  /** Step of the checkpoint just finished. */
  readonly step: number;
  /** Whether it came from the cache. */
  readonly cached: boolean;
}

/**
 * Metrics used when none are named: "decomposition" for d <= 2 (the density route is
 * reliable there), the first of these names that is registered for d > 2 (feature-space
 * metrics), else "decomposition" with Monte Carlo integration and a note.
 */
export const HIGH_DIMENSION_METRICS: readonly string[] = ["frechet", "mmd", "precision-recall"];

/** Options of {@linkcode checkpointSeries}. */
export interface CheckpointSeriesOptions {
  /** Registered metric names (default: see {@linkcode HIGH_DIMENSION_METRICS}), plus "discriminator" when scores are given. */
  metrics?: readonly string[];
  /** Bootstrap replicates per checkpoint (default 100). */
  replicates?: number;
  /** Seed, the same for every checkpoint (default 0). */
  seed?: RandomSource;
  /** Confidence level (default 0.95). */
  level?: number;
  /** Folder of the on-disk cache (default none: nothing is written). */
  cacheDir?: string;
  /** Called after each checkpoint. */
  onProgress?: (p: CheckpointProgress) => void;
  /** Options of `readSamples` for the checkpoint files (columns, format...). */
  read?: ReadOptions;
}

/** The results of one checkpoint. */
export interface CheckpointResult {
  /** Training step. */
  readonly step: number;
  /** The file, or "checkpoint k" for in-memory samples. */
  readonly source: string;
  /** SHA-256 of the file's bytes (of the samples' float64 bytes when in memory). */
  readonly checksum: string;
  /** Whether the results came from the cache. */
  readonly cached: boolean;
  /** Estimates by output name ("jsd", "value", "dValue", "gap", ...). */
  readonly metrics: Readonly<Record<string, Estimate>>;
}

/** A checkpoint series. */
export interface CheckpointSeries {
  /** Checkpoints by increasing step. */
  readonly checkpoints: readonly CheckpointResult[];
  /** Metrics run. */
  readonly metrics: readonly string[];
  /** Output names present in at least one checkpoint, in metric order. */
  readonly outputs: readonly string[];
  /** SHA-256 of the real set's float64 bytes. */
  readonly realChecksum: string;
  /** Real sample size and dimension. */
  readonly real: { readonly n: number; readonly d: number };
  /** What was done: metrics, cache hits, skipped files. */
  readonly notes: readonly string[];
}

const STEP_IN_NAME = /(\d+)(?!.*\d)/;

/** Checkpoint files of a folder: names with a step number and a samples extension. */
async function listFolder(dir: string, notes: string[]): Promise<CheckpointEntry[]> {
  const out: CheckpointEntry[] = [];
  const skipped: string[] = [];
  try {
    for await (const e of Deno.readDir(dir)) {
      if (!e.isFile) continue;
      const base = e.name.replace(/\.[^.]*$/, "");
      const m = STEP_IN_NAME.exec(base);
      if (!m || sampleFormatOf(e.name) === undefined) {
        skipped.push(e.name);
        continue;
      }
      out.push({ step: Number(m[1]), samples: `${dir}/${e.name}` });
    }
  } catch (e) {
    if (e instanceof Deno.errors.NotFound) {
      throw new SaddleError("not-found", "no such folder of checkpoints", { file: dir });
    }
    throw e;
  }
  if (skipped.length) {
    notes.push(
      `skipped ${skipped.length} file(s) without a step number or a samples extension: ${
        skipped.slice(0, 5).join(", ")
      }${skipped.length > 5 ? ", ..." : ""}`,
    );
  }
  if (out.length === 0) {
    throw new SaddleError(
      "empty",
      "no checkpoint files: name them with their step (e.g. step_001200.npy)",
      { file: dir },
    );
  }
  return out;
}

function bytesOf(s: Samples): Uint8Array {
  return new Uint8Array(s.data.buffer, s.data.byteOffset, s.data.byteLength);
}

/**
 * Compare each checkpoint's generated samples with one real set: per checkpoint, every
 * chosen metric's estimates with intervals.
 *
 * `checkpoints` is a folder (every file whose name holds a step number, the last run of
 * digits: `step_001200.npy`, `ckpt-5000.csv`) or a list of {@linkcode CheckpointEntry}.
 * Metrics come from the registry ({@linkcode registerCheckpointMetric}): "decomposition"
 * gives `jsd` and `value` = V(D*, G) by the density route (refit bootstrap, real-side fits
 * made once), "discriminator" gives a trained D's `dValue` and `gap` where scores are
 * given. Each metric's `prepare` runs once on the real set. With `cacheDir`, results are
 * stored under the checkpoint's SHA-256 (of the file's bytes), the real set's SHA-256 and
 * the settings, so a second call computes only new or changed checkpoints; the file is
 * written atomically after each one. A checkpoint of the wrong dimension is refused with
 * an error naming its file.
 *
 * @example JSD falling as N(mu, 1) approaches N(0, 1)
 * ```ts
 * import { checkpointSeries } from "./checkpoint_series.ts";
 * import { gaussian } from "../density/gaussian.ts";
 * import assert from "node:assert/strict";
 * const real = gaussian(0, 1).sample(300, 1);
 * const checkpoints = [2, 1, 0].map((mu, k) => ({ step: 1000 * k, samples: gaussian(mu, 1).sample(300, 2 + k) }));
 * const series = await checkpointSeries(real, checkpoints, { replicates: 20 });
 * const jsd = series.checkpoints.map((c) => c.metrics.jsd.value);
 * assert.ok(jsd[0] > jsd[1] && jsd[1] > jsd[2]);
 * ```
 */
export async function checkpointSeries(
  real: Samples | SamplesInput | string,
  checkpoints: string | readonly CheckpointEntry[],
  options: CheckpointSeriesOptions = {},
): Promise<CheckpointSeries> {
  const notes: string[] = [];
  const realS = typeof real === "string"
    ? await readSamples(real, options.read)
    : samples(real, { source: "real" });
  const entries = typeof checkpoints === "string"
    ? await listFolder(checkpoints, notes)
    : [...checkpoints];
  if (entries.length === 0) {
    throw new SaddleError("empty", "no checkpoints given", { parameter: "checkpoints" });
  }
  entries.forEach((e, k) => {
    if (!e || !Number.isFinite(e.step)) {
      throw new SaddleError("invalid-argument", `checkpoint ${k} has no finite step`, {
        parameter: "checkpoints",
        row: k,
      });
    }
  });
  entries.sort((a, b) => a.step - b.step);
  const replicates = options.replicates ?? 100;
  const level = options.level ?? 0.95;
  const seed = options.seed ?? 0;
  toRng(seed);
  const anyScores = entries.some((e) => e.scores !== undefined);
  let names = options.metrics ? [...options.metrics] : defaultMetrics(realS.d, notes);
  if (!options.metrics && anyScores) names.push("discriminator");
  names = [...new Set(names)];
  const metrics = names.map(checkpointMetric);
  const realChecksum = await sha256(bytesOf(realS));
  const base = { real: realS, seed, level, replicates };
  const prepared = new Map<string, unknown>();
  const prepare = (m: CheckpointMetric) => {
    if (!prepared.has(m.name)) prepared.set(m.name, m.prepare(realS, base));
    return prepared.get(m.name);
  };
  const cache = await CheckpointCache.open(options.cacheDir);
  const settings = JSON.stringify({
    real: realChecksum,
    seed: toRng(seed).seed,
    level,
    replicates,
    metrics: metrics.map((m) => `${m.name}@${m.version ?? "1"}`),
  });
  const results: CheckpointResult[] = [];
  let hits = 0;
  for (const [k, e] of entries.entries()) {
    const source = typeof e.samples === "string" ? e.samples : `checkpoint ${k} (step ${e.step})`;
    let fake: Samples, checksum: string;
    if (typeof e.samples === "string") {
      const path = e.samples;
      let bytes: Uint8Array;
      try {
        bytes = await Deno.readFile(path);
      } catch (err) {
        if (err instanceof Deno.errors.NotFound) {
          throw new SaddleError("not-found", "no such checkpoint file", { file: path });
        }
        throw err;
      }
      checksum = await sha256(bytes);
      fake = await readSamples(path, options.read);
    } else {
      fake = isSamples(e.samples) ? e.samples : samples(e.samples, { source });
      checksum = await sha256(bytesOf(fake));
    }
    if (fake.d !== realS.d) {
      throw new SaddleError(
        "dimension-mismatch",
        `checkpoint at step ${e.step} has d = ${fake.d} but the real set has d = ${realS.d}; ` +
          "save the generated samples in the space of the real data (or choose columns with read)",
        typeof e.samples === "string" ? { file: e.samples } : { parameter: "checkpoints", row: k },
      );
    }
    const scoreKey = e.scores ? await sha256(scoreBytes(e.scores)) : "";
    const key = `${checksum}|${scoreKey}|${settings}`;
    let out = cache.get(key);
    const cached = out !== undefined;
    if (out === undefined) {
      out = {};
      const ctx: CheckpointContext = {
        ...base,
        step: e.step,
        ...(e.scores ? { scores: e.scores } : {}),
      };
      for (const m of metrics) {
        if (m.needsScores && !e.scores) continue;
        Object.assign(out, m.compute(prepare(m), fake, ctx));
      }
      await cache.set(key, out);
    } else hits++;
    results.push(
      Object.freeze({ step: e.step, source, checksum, cached, metrics: Object.freeze(out) }),
    );
    options.onProgress?.({ done: k + 1, total: entries.length, step: e.step, cached });
  }
  const outputs = metrics.flatMap((m) => m.outputs).filter((o) =>
    results.some((r) => r.metrics[o] !== undefined)
  );
  notes.unshift(
    `metrics: ${metrics.map((m) => `${m.name} (${m.description})`).join("; ")}; ` +
      `${replicates} bootstrap replicates, seed ${toRng(seed).seed}, the same for every checkpoint`,
  );
  if (options.cacheDir !== undefined) {
    notes.push(`${hits} of ${entries.length} checkpoint(s) from the cache in ${options.cacheDir}`);
  }
  const out: CheckpointSeries = {
    checkpoints: results,
    metrics: names,
    outputs,
    realChecksum,
    real: { n: realS.n, d: realS.d },
    notes,
  };
  return Object.freeze(withDisplay(out, seriesBundle));
}

function scoreBytes(s: CheckpointScores): Uint8Array {
  const a = Float64Array.from(s.real), b = Float64Array.from(s.fake);
  const all = new Float64Array(a.length + b.length + 1);
  all.set(a);
  all.set(b, a.length);
  all[all.length - 1] = s.scale === "logit" ? 1 : 0;
  return new Uint8Array(all.buffer);
}

function defaultMetrics(d: number, notes: string[]): string[] {
  if (d <= 2) return ["decomposition"];
  const registered = checkpointMetricNames();
  const feature = HIGH_DIMENSION_METRICS.filter((m) => registered.includes(m));
  if (feature.length) return feature;
  notes.push(
    `d = ${d}: no feature-space metric is registered, so the density route is used ` +
      "(Monte Carlo integration; less reliable as d grows)",
  );
  return ["decomposition"];
}

function seriesBundle(s: CheckpointSeries): Record<string, string> {
  const header = ["step", ...s.outputs, "cached", "file"];
  const rows: TableCell[][] = s.checkpoints.map((c) => [
    c.step,
    ...s.outputs.map((o) => c.metrics[o] ?? null),
    c.cached ? "yes" : "",
    c.source,
  ]);
  const title = `Checkpoint series: ${s.checkpoints.length} checkpoints against ${s.real.n} ` +
    `real points (d = ${s.real.d})`;
  return {
    "text/plain": [title, textTable(header, rows), ...s.notes.map((n) => `- ${n}`)].join("\n"),
    "text/html": `<div><b>${escapeHtml(title)}</b>${htmlTable(header, rows)}<ul>${
      s.notes.map((n) => `<li>${escapeHtml(n)}</li>`).join("")
    }</ul></div>`,
  };
}
