/**
 * Training-log reader: formats, column guessing, restarts, gaps, NaN rows, several runs, and
 * bad input. Expected values are the plain reading of each small text (worked by hand).
 */
import assert from "node:assert/strict";
import { SaddleError, type SaddleErrorCode } from "../../lib/errors/saddle_error.ts";
import { parseTrainingLog, readTrainingLog, trainingLog } from "../../lib/training/training_log.ts";
import { displayBundle } from "../../lib/display/display.ts";

function rejects(
  f: () => unknown,
  code: SaddleErrorCode,
  loc: Record<string, string | number>,
  message: RegExp,
) {
  assert.throws(f, (e: unknown) => {
    assert.ok(e instanceof SaddleError, `not a SaddleError: ${e}`);
    assert.equal(e.code, code, e.message);
    for (const [k, v] of Object.entries(loc)) {
      assert.equal(e.location[k as keyof typeof e.location], v, `${k} in ${e.message}`);
    }
    assert.match(e.message, message);
    return true;
  });
}

Deno.test("CSV: roles guessed from common spellings and said out loud", () => {
  const log = parseTrainingLog(
    "Iteration,Loss_D,Loss_G,D(x),D(G(z)),fid,tag\n0,1.5,0.9,0.7,0.3,80,a\n10,1.4,0.8,0.6,0.4,60,b\n",
  );
  assert.deepEqual(log.roles, {
    step: "Iteration",
    dLoss: "Loss_D",
    gLoss: "Loss_G",
    dReal: "D(x)",
    dFake: "D(G(z))",
  });
  assert.deepEqual(log.metrics, ["fid"]);
  assert.equal(log.guessed.length, 5);
  assert.ok(log.notes.some((n) => /guessed the discriminator loss column: "Loss_D"/.test(n)));
  assert.ok(log.notes.some((n) => /ignored text column\(s\) "tag"/.test(n)));
  assert.deepEqual(Array.from(log.runs[0].columns["fid"]), [80, 60]);
  const shown = displayBundle(log)!;
  assert.match(shown["text/plain"], /guessed/);
  assert.match(shown["text/html"], /Loss_D/);
});

Deno.test("user mapping overrides the guess; unknown column named in the error", () => {
  const text = "t,a,b\n0,1,2\n1,1.1,2.2\n";
  const log = parseTrainingLog(text, { columns: { step: "t", dLoss: "b", gLoss: "a" } });
  assert.deepEqual(log.roles, { step: "t", dLoss: "b", gLoss: "a" });
  assert.equal(log.guessed.length, 0);
  rejects(
    () => parseTrainingLog(text, { columns: { step: "t", dLoss: "c" }, source: "x.csv" }),
    "not-found",
    { file: "x.csv", parameter: "columns" },
    /no column named "c"/,
  );
});

Deno.test("restarts keep the last row of a step; gaps and NaN rows kept and reported", () => {
  const log = parseTrainingLog(
    "step,d_loss\n0,2\n10,1.8\n20,1.6\n30,1.5\n20,1.55\n30,1.45\n40,nan\n80,1.4\n",
  );
  const run = log.runs[0];
  assert.deepEqual(Array.from(run.steps), [0, 10, 20, 30, 40, 80]);
  assert.deepEqual(Array.from(run.columns["d_loss"]).slice(0, 4), [2, 1.8, 1.55, 1.45]);
  assert.ok(Number.isNaN(run.columns["d_loss"][4]));
  assert.equal(run.replaced, 2);
  assert.deepEqual(run.restarts, [{ from: 30, to: 20 }]);
  assert.deepEqual(run.gaps, [[40, 80]]);
  assert.deepEqual(run.nonFinite, [{ step: 40, column: "d_loss", value: NaN }]);
  assert.ok(log.notes.some((n) => /restart at 20 after 30/.test(n)));
  assert.ok(log.notes.some((n) => /1 gap/.test(n)));
});

Deno.test("TSV and JSON lines (Python's bare NaN/Infinity), several runs in one file", async () => {
  const tsv = parseTrainingLog("step\tD_loss\trun\n0\t1\ta\n0\t2\tb\n5\t1.1\ta\n", {
    delimiter: "\t",
  });
  assert.deepEqual(tsv.runs.map((r) => [r.name, Array.from(r.steps)]), [["a", [0, 5]], ["b", [0]]]);
  const path = await Deno.makeTempFile({ suffix: ".jsonl" });
  await Deno.writeTextFile(
    path,
    '{"step": 0, "g_loss": 0.9, "run": "x"}\n\n{"step": 1, "g_loss": Infinity, "run": "x"}\n' +
      '{"step": 2, "run": "x", "lr": 0.001}\n',
  );
  const log = await readTrainingLog(path);
  const run = log.runs[0];
  assert.equal(run.columns["g_loss"][1], Infinity);
  assert.ok(Number.isNaN(run.columns["g_loss"][2])); // absent key: NaN, not a logged NaN
  assert.deepEqual(run.nonFinite, [{ step: 1, column: "g_loss", value: Infinity }]);
  assert.deepEqual(log.metrics, ["lr"]);
  await Deno.remove(path);
});

Deno.test("a JSON array of records; errors name the record", async () => {
  const path = await Deno.makeTempFile({ suffix: ".json" });
  await Deno.writeTextFile(path, '[{"it": 0, "errD": 1.2}, {"it": 5, "errD": NaN}]');
  const log = await readTrainingLog(path);
  assert.deepEqual([log.roles.step, log.roles.dLoss], ["it", "errD"]);
  assert.deepEqual(log.runs[0].nonFinite, [{ step: 5, column: "errD", value: NaN }]);
  await Deno.remove(path);
  rejects(
    () => parseTrainingLog('[{"step": 0, "d_loss": [1, 2]}]', { source: "a.json" }),
    "parse",
    { file: "a.json", row: 0, column: "d_loss" },
    /value of "d_loss" is an array/,
  );
  rejects(
    () => parseTrainingLog('{"step": 0}\n[1]\n', { source: "b.jsonl" }),
    "parse",
    { file: "b.jsonl", line: 2 },
    /one object of named values/,
  );
});

Deno.test("in-memory records and columns", () => {
  const a = trainingLog([{ step: 0, errD: 1 }, { step: 1, errD: 0.9, errG: 2 }]);
  assert.equal(a.roles.gLoss, "errG");
  assert.ok(Number.isNaN(a.runs[0].columns["errG"][0]));
  const b = trainingLog({ step: new Float64Array([0, 1]), d_fake: [0.4, null] });
  assert.ok(Number.isNaN(b.runs[0].columns["d_fake"][1]));
});

Deno.test("bad input names the file, line and column", async () => {
  rejects(
    () => parseTrainingLog("epoch_time,d_loss\n1,2\n", { source: "log.csv" }),
    "not-found",
    { file: "log.csv", parameter: "columns" },
    /no step column/,
  );
  rejects(
    () => trainingLog({ step: [0, 1, 2], d_loss: [1, 2] }),
    "dimension-mismatch",
    { column: "d_loss" },
    /unequal column lengths/,
  );
  rejects(
    () => parseTrainingLog("step,d_loss\n0,1.2\n# comment\n1,1.1x\n", { source: "log.csv" }),
    "parse",
    { file: "log.csv", line: 4, column: "d_loss" },
    /"1\.1x" in column "d_loss" is not a number/,
  );
  rejects(
    () => parseTrainingLog("step,d_loss\n0,1.2\n1,1.1,7\n", { source: "log.csv" }),
    "dimension-mismatch",
    { file: "log.csv", line: 3 },
    /3 fields but the header \(line 1\) has 2/,
  );
  rejects(
    () => parseTrainingLog('{"step": 0}\n{"step": oops}\n', { source: "log.jsonl" }),
    "parse",
    { file: "log.jsonl", line: 2 },
    /not valid JSON/,
  );
  rejects(
    () => parseTrainingLog("step,d_loss\n,1\n", { source: "log.csv" }),
    "parse",
    { file: "log.csv", line: 2, column: "step" },
    /every row needs its step/,
  );
  rejects(
    () => parseTrainingLog("1,2\n3,4\n", { source: "log.csv" }),
    "parse",
    { file: "log.csv", line: 1 },
    /not a header/,
  );
  await assert.rejects(() => readTrainingLog("/no/such/log.csv"), /no such file/);
});
