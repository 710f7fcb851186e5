/**
 * Reader throughput and memory: a 10^7-value float32 .npy (written by writeNpy with
 * "<f4") and a 10^6-row, 3-column CSV, generated in a temporary directory.
 *
 *     deno run -A bench/io_throughput.ts [--npy-values 10000000] [--csv-rows 1000000]
 *
 * Each read runs in a fresh child process so its memory is measured alone: the child
 * reports Deno.memoryUsage().rss before and after, and, when /usr/bin/time exists, its peak
 * resident set (maximum RSS). When Debian's numpy is there, numpy.load and numpy.loadtxt
 * read the same files in the same run, for a ratio on the same machine.
 */
import { fromBuffer } from "../lib/samples/samples.ts";
import { writeNpy } from "../lib/samples/npy.ts";
import { readSamples } from "../lib/samples/read.ts";
import { Rng } from "../lib/random/rng.ts";
import { hasPython, PYTHON } from "../tests/_reference.ts";

interface ChildReport {
  seconds: number[];
  rssBefore: number;
  rssAfter: number;
  n: number;
  d: number;
}

const MB = 1024 * 1024;

async function child(path: string, repeats: number): Promise<void> {
  const rssBefore = Deno.memoryUsage().rss;
  const seconds: number[] = [];
  let rssAfter = 0, n = 0, d = 0;
  for (let r = 0; r < repeats; r++) {
    const t0 = performance.now();
    const s = await readSamples(path);
    seconds.push((performance.now() - t0) / 1000);
    if (r === 0) rssAfter = Deno.memoryUsage().rss;
    n = s.n;
    d = s.d;
  }
  const report: ChildReport = { seconds, rssBefore, rssAfter, n, d };
  console.log(JSON.stringify(report));
}

async function measure(path: string, repeats: number) {
  // Memory from a process that reads once; timing from another that reads `repeats` times.
  const mem = await runChild(path, 1, true);
  const time = await runChild(path, repeats, false);
  return { ...time, rssBefore: mem.rssBefore, rssAfter: mem.rssAfter, peakRss: mem.peakRss };
}

async function runChild(path: string, repeats: number, timed: boolean) {
  const self = new URL(import.meta.url).pathname;
  const deno = Deno.execPath();
  const args = ["run", "-A", self, "--child", path, String(repeats)];
  const useTime = timed && await exists("/usr/bin/time");
  const cmd = useTime
    ? new Deno.Command("/usr/bin/time", {
      args: ["-v", deno, ...args],
      stdout: "piped",
      stderr: "piped",
    })
    : new Deno.Command(deno, { args, stdout: "piped", stderr: "piped" });
  const out = await cmd.output();
  const stdout = new TextDecoder().decode(out.stdout),
    stderr = new TextDecoder().decode(out.stderr);
  if (!out.success) throw new Error(`child failed:\n${stderr}`);
  const rep = JSON.parse(stdout.trim().split("\n").pop()!) as ChildReport;
  const peak = /Maximum resident set size \(kbytes\): (\d+)/.exec(stderr);
  return { ...rep, peakRss: peak ? Number(peak[1]) * 1024 : undefined };
}

async function exists(p: string): Promise<boolean> {
  try {
    await Deno.stat(p);
    return true;
  } catch {
    return false;
  }
}

function python(code: string): number | undefined {
  if (!hasPython(["numpy"])) return undefined;
  const out = new Deno.Command(PYTHON, { args: ["-c", code], stdout: "piped" }).outputSync();
  return out.success ? Number(new TextDecoder().decode(out.stdout)) : undefined;
}

function arg(name: string, fallback: number): number {
  const i = Deno.args.indexOf(name);
  return i >= 0 ? Number(Deno.args[i + 1]) : fallback;
}

async function main() {
  if (Deno.args[0] === "--child") return child(Deno.args[1], Number(Deno.args[2]));
  const nNpy = arg("--npy-values", 10_000_000), nCsv = arg("--csv-rows", 1_000_000);
  const dir = await Deno.makeTempDir({ prefix: "saddlekit-io-" });
  try {
    const r = new Rng("io-throughput");
    const npyPath = `${dir}/values_f4.npy`;
    await writeNpy(npyPath, fromBuffer(r.fillNormal(new Float64Array(nNpy)), 1), {
      dtype: "<f4",
      squeeze: true,
    });
    const csvPath = `${dir}/points.csv`;
    {
      const lines: string[] = ["x,y,z"];
      for (let i = 0; i < nCsv; i++) lines.push(`${r.normal()},${r.normal()},${r.uniform()}`);
      await Deno.writeTextFile(csvPath, lines.join("\n") + "\n");
    }
    const rows: string[][] = [];
    for (const [label, path, repeats] of [["npy f4", npyPath, 5], ["csv", csvPath, 3]] as const) {
      const size = (await Deno.stat(path)).size;
      const m = await measure(path, repeats);
      const best = Math.min(...m.seconds);
      const grow = m.rssAfter - m.rssBefore;
      const numpy = label === "csv"
        ? python(
          `import numpy as np, time; t=time.perf_counter(); np.loadtxt(${
            JSON.stringify(path)
          }, delimiter=",", skiprows=1); print(time.perf_counter()-t)`,
        )
        : python(
          `import numpy as np, time\nbest=9e9\nfor _ in range(5):\n t=time.perf_counter(); a=np.load(${
            JSON.stringify(path)
          }).astype(np.float64); best=min(best, time.perf_counter()-t)\nprint(best)`,
        );
      rows.push([
        label,
        `${m.n} x ${m.d}`,
        (size / MB).toFixed(1),
        best.toFixed(3),
        (size / MB / best).toFixed(1),
        (grow / MB).toFixed(0),
        m.peakRss ? (m.peakRss / MB).toFixed(0) : "n/a",
        (grow / size).toFixed(2),
        numpy === undefined ? "n/a" : `${numpy.toFixed(3)} s (${(best / numpy).toFixed(2)}x)`,
      ]);
    }
    const header = [
      "file",
      "n x d",
      "MB",
      "best s",
      "MB/s",
      "rss growth MB",
      "peak rss MB",
      "growth / file",
      "numpy same run",
    ];
    const widths = header.map((h, j) => Math.max(h.length, ...rows.map((r) => r[j].length)));
    const fmt = (r: string[]) => r.map((c, j) => c.padEnd(widths[j])).join("  ");
    console.log(fmt(header));
    for (const row of rows) console.log(fmt(row));
    console.log(
      "\nrss growth = Deno.memoryUsage().rss after the first read minus before, in a fresh " +
        "process reading once; peak rss from /usr/bin/time -v for that process (includes the " +
        "Deno runtime and, for CSV, the file text).\n" +
        "numpy: np.load(...).astype(float64) (best of 5) and np.loadtxt (one run).",
    );
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

if (import.meta.main) await main();
