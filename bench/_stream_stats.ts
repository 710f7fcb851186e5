/**
 * The saddlekit side of the `frechet-stream` bench case, run in its own process so that its
 * peak resident memory is measured alone: streamed mean and covariance of a `.npy` file.
 * Prints `{ seconds, trace, peak_rss_mb, backend }` as JSON.
 *
 * @module
 */
import { readFeatureStatistics } from "../lib/divergence/mod.ts";
import { linalgBackend } from "../lib/linalg/mod.ts";

const t0 = performance.now();
const s = await readFeatureStatistics(Deno.args[0]);
const seconds = (performance.now() - t0) / 1000;
let trace = 0;
for (let i = 0; i < s.d; i++) trace += s.covariance[i * s.d + i];
const status = await Deno.readTextFile("/proc/self/status");
const hwm = Number(/VmHWM:\s+(\d+) kB/.exec(status)?.[1] ?? NaN);
console.log(
  JSON.stringify({ seconds, trace, peak_rss_mb: hwm / 1024, backend: linalgBackend().name }),
);
