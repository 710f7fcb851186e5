/**
 * Hostile but realistic inputs to the readers and small numerical edges (issue 9): each
 * gives the right value or a SaddleError naming where and how to fix it.
 */
import assert from "node:assert/strict";
import { SaddleError } from "../../lib/errors/mod.ts";
import { fitHistogram, gaussian, MAX_HISTOGRAM_CELLS } from "../../lib/density/mod.ts";
import { optimalDiscriminator, pointwiseMaximiser } from "../../lib/discriminator/mod.ts";
import { parseCsv, parseJson, samples } from "../../lib/samples/mod.ts";

const saddle = (code: string, re: RegExp) => (e: unknown) =>
  e instanceof SaddleError && e.code === code && re.test(e.message);

Deno.test("fitHistogram: bin counts that cannot fit are refused naming the limit", () => {
  const x = [[0, 0], [1, 1], [0.5, 0.2]];
  for (const bins of [[1e5, 1e5], [2e8, 1]]) {
    assert.throws(() => fitHistogram(x, { bins }), saddle("invalid-argument", /limit is 4194304/));
  }
  assert.throws(() => fitHistogram([0, 1, 2], { bins: 1e12 }), saddle("invalid-argument", /cells/));
  // At the limit it still works (1-D, 2^22 cells).
  assert.equal(fitHistogram([0, 1, 2], { bins: MAX_HISTOGRAM_CELLS }).bins[0], MAX_HISTOGRAM_CELLS);
});

Deno.test("CSV: one wide row and 200,000 blank lines are read without a huge allocation", () => {
  const row = Array.from({ length: 20000 }, (_, j) => j % 10).join(",");
  const s = parseCsv(row + "\n".repeat(200000));
  assert.deepEqual([s.n, s.d], [1, 20000]);
});

Deno.test("CSV: a first row 0x10,2 is data (reported), not a header; # inside quotes stays", () => {
  assert.throws(
    () => parseCsv("0x10,2\n3,4\n"),
    (e: unknown) =>
      e instanceof SaddleError && e.code === "parse" && e.location.line === 1 &&
      /hexadecimal literal.*write it as 16/.test(e.message),
  );
  // A quoted multi-line field whose second line starts with #: the field spans lines 2-3,
  // so the row's cell count and values come out right only if that # is kept.
  const s = parseCsv('x,y\n1,"2\n# not a comment"\n3,4\n# a comment\n5,6\n', {
    columns: ["x"],
  });
  assert.deepEqual(Array.from(s.data), [1, 3, 5]);
  assert.throws(
    () => parseCsv('x,y\n1,"2\n# kept"\n3,4\n'),
    (e: unknown) =>
      e instanceof SaddleError && e.location.line === 2 && /"2\\n# kept"/.test(e.message),
  );
});

Deno.test("JSON: a null cell is refused naming row and key; key 'constructor' is not-found", () => {
  assert.throws(
    () => parseJson('[{"x": 1, "y": null}, {"x": 2, "y": 3}]'),
    (e: unknown) =>
      e instanceof SaddleError && e.location.row === 0 && e.location.column === "y" &&
      /null/.test(e.message),
  );
  assert.throws(
    () => parseJson('[{"x": 1, "y": 2}, {"x": 2, "y": null}]'),
    (e: unknown) => e instanceof SaddleError && e.location.row === 1 && e.location.column === "y",
  );
  assert.throws(
    () => parseJson('{"real": [1, 2]}', { key: "constructor" }),
    (e: unknown) => e instanceof SaddleError && e.code === "not-found",
  );
  assert.throws(
    () => parseJson('[{"x": 1}]', { columns: ["constructor"] }),
    (e: unknown) => e instanceof SaddleError && e.code === "not-found",
  );
});

Deno.test("pointwiseMaximiser: a / (a + b) without overflow (Goodfellow et al. 2014, Prop. 1)", () => {
  assert.equal(pointwiseMaximiser(1e308, 1e308), 0.5);
  assert.equal(pointwiseMaximiser(1.5e308, 0.5e308), 0.75);
  assert.equal(pointwiseMaximiser(0, 1e308), 0);
  assert.equal(pointwiseMaximiser(3, 1), 0.75);
});

Deno.test("D* at x = ±1e200: 0 or 1 as the Gaussians' log-ratio says, though both underflow", () => {
  // ln N(x; 0, 1) - ln N(x; 1, 1) = 1/2 - x (closed form): D* → 1 at -∞ and 0 at +∞.
  // ln N(x; 0, 1) - ln N(x; 0, 4) = ln 2 - 3x²/8: D* → 0 on both sides.
  const x = samples([-1e200, 1e200, 0]);
  const shift = optimalDiscriminator(gaussian(0, 1), gaussian(1, 1)).prob(x);
  assert.deepEqual(Array.from(shift.subarray(0, 2)), [1, 0]);
  const wide = optimalDiscriminator(gaussian(0, 1), gaussian(0, 4)).prob(x);
  assert.deepEqual(Array.from(wide.subarray(0, 2)), [0, 0]);
  assert.ok(Math.abs(wide[2] - 2 / 3) < 1e-15); // ln 2 at 0: D* = 2/3
  const same = optimalDiscriminator(gaussian(0, 1), gaussian(0, 1)).evaluate(x);
  assert.deepEqual(Array.from(same.prob), [0.5, 0.5, 0.5]);
  // 2-D: a wider second density along the first axis wins far out along it.
  const p2 = gaussian([0, 0], [1, 0, 0, 1]), q2 = gaussian([0, 0], [9, 0, 0, 1]);
  assert.deepEqual(
    Array.from(optimalDiscriminator(p2, q2).prob(samples([[1e200, 0], [-1e200, 1]]))),
    [0, 0],
  );
});
