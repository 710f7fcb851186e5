/** Estimate construction, the mean estimate against a hand computation, and formatting. */
import assert from "node:assert/strict";
import {
  exact,
  makeEstimate,
  meanEstimate,
  meanVariance,
  normalCritical,
} from "../../lib/estimate/estimate.ts";
import { estimateHtml, formatEstimate } from "../../lib/estimate/format.ts";
import { escapeHtml, formatNumber, htmlTable, textTable } from "../../lib/display/table.ts";
import { displayBundle } from "../../lib/display/display.ts";
import { SaddleError } from "../../lib/errors/saddle_error.ts";
import { assertClose } from "../_assert.ts";

Deno.test("meanEstimate of 2,4,4,4,5,5,7,9 by hand: mean 5, se sqrt(32/7/8)", () => {
  // Sum 40, mean 5; squared deviations 9+1+1+1+0+0+4+16 = 32; sample variance 32/7.
  const e = meanEstimate([2, 4, 4, 4, 5, 5, 7, 9], { unit: "nats" });
  const se = Math.sqrt(32 / 7 / 8);
  assert.equal(e.value, 5);
  assertClose(e.se!, se, { rel: 1e-15 });
  // 1.959963984540054 is the 97.5% standard normal quantile (common knowledge).
  assertClose(e.ci![0], 5 - 1.959963984540054 * se, { rel: 1e-14 });
  assertClose(e.ci![1], 5 + 1.959963984540054 * se, { rel: 1e-14 });
  assert.deepEqual([e.level, e.method, e.n, e.unit], [0.95, "monte-carlo", 8, "nats"]);
  const e90 = meanEstimate([2, 4, 4, 4, 5, 5, 7, 9], { level: 0.9, method: "plug-in" });
  assertClose(e90.ci![1] - 5, 1.6448536269514722 * se, { rel: 1e-14 });
  assert.equal(e90.method, "plug-in");
});

Deno.test("meanEstimate edge cases: one term, no terms, offsets", () => {
  const one = meanEstimate([3]);
  assert.equal(one.value, 3);
  assert.ok(Number.isNaN(one.se!));
  assert.match(one.notes.join(), /one term only/);
  assert.throws(
    () => meanEstimate([]),
    (e: unknown) => e instanceof SaddleError && e.code === "empty",
  );
  // Welford stays exact-ish at a large offset where the naive formula loses everything.
  const mv = meanVariance([1e12 + 1, 1e12 + 2, 1e12 + 3, 1e12 + 4]);
  assert.equal(mv.mean, 1e12 + 2.5);
  assertClose(mv.variance, 5 / 3, { rel: 1e-9 });
});

Deno.test("normalCritical gives the two-sided standard normal quantiles", () => {
  // Values from standard tables (common knowledge).
  assertClose(normalCritical(0.95), 1.959963984540054, { rel: 1e-14 });
  assertClose(normalCritical(0.99), 2.5758293035489004, { rel: 1e-14 });
  assertClose(normalCritical(0.6826894921370859), 1, { rel: 1e-12 });
});

Deno.test("makeEstimate: frozen, JSON without the display, level checked", () => {
  const e = makeEstimate({
    value: 0.3,
    se: 0.01,
    ci: [0.28, 0.32],
    method: "bootstrap-percentile",
    n: 100,
  });
  assert.ok(Object.isFrozen(e));
  assert.deepEqual(JSON.parse(JSON.stringify(e)), {
    value: 0.3,
    se: 0.01,
    ci: [0.28, 0.32],
    level: 0.95,
    method: "bootstrap-percentile",
    n: 100,
    notes: [],
  });
  assert.throws(() => makeEstimate({ value: 1, method: "x", n: 1, level: 0 }), /level/);
  const x = exact(-Math.log(4), "nats", ["Goodfellow et al. 2014, Thm. 1"]);
  assert.deepEqual([x.method, x.n, x.se, x.ci], ["exact", 0, undefined, undefined]);
});

Deno.test("formatNumber: significant digits, exponents, specials", () => {
  assert.equal(formatNumber(0.693147), "0.6931");
  assert.equal(formatNumber(2), "2");
  assert.equal(formatNumber(-1.38629436, 6), "-1.38629");
  // toPrecision alone would give "1.235e+5" here; the exponent form stays one style.
  assert.equal(formatNumber(123456.7), "1.235e5");
  assert.equal(formatNumber(99999, 2), "1e5");
  assert.equal(formatNumber(0.00001234), "1.234e-5");
  assert.equal(formatNumber(1e6), "1e6");
  assert.equal(formatNumber(0), "0");
  assert.equal(formatNumber(NaN), "NaN");
  assert.equal(formatNumber(-Infinity), "-∞");
  assert.equal(formatNumber(1234.5), "1235"); // toPrecision rounds half away from zero here
});

Deno.test("formatEstimate and estimateHtml show value, se, interval, method, n, notes", () => {
  const e = makeEstimate({
    value: 0.5123456,
    se: 0.0123,
    ci: [0.49, 0.535],
    level: 0.9,
    method: "monte-carlo",
    n: 2000,
    unit: "bits",
    notes: ["clipped 3 values"],
  });
  assert.equal(
    formatEstimate(e),
    "0.5123 ± 0.012 bits [0.49, 0.535] (90% CI, monte-carlo, n = 2000); clipped 3 values",
  );
  assert.equal(formatEstimate(exact(Math.LN2, "nats")), "0.6931 nats (exact)");
  const html = estimateHtml(e);
  assert.match(html, /<table class="saddlekit">/);
  assert.match(html, /\[0\.49, 0\.535\] \(90%\)/);
  assert.match(html, /clipped 3 values/);
  const bundle = displayBundle(e)!;
  assert.equal(bundle["text/plain"], formatEstimate(e));
  assert.equal(bundle["text/html"], html);
});

Deno.test("tables escape HTML and align text", () => {
  assert.equal(escapeHtml(`<a href="x">&'`), "&lt;a href=&quot;x&quot;&gt;&amp;&#39;");
  const html = htmlTable(["name", "value"], [["<real>", 1 / 3], ["fake", null]], "JSD & co");
  assert.match(html, /&lt;real&gt;/);
  assert.match(html, /0\.3333/);
  assert.match(html, /<caption[^>]*>JSD &amp; co<\/caption>/);
  assert.equal(
    textTable(["term", "value"], [["JSD", 0.25], ["value V", -1.3862944]]),
    "term     value\nJSD      0.25\nvalue V  -1.386",
  );
});

Deno.test("meanVariance / meanEstimate: an infinite term makes the mean infinite, not NaN", () => {
  // The mean of a sample with one +Infinity (and otherwise finite terms) is +Infinity;
  // +Infinity and -Infinity together have no mean (NaN). Common practice, no source.
  assert.equal(meanVariance([1, Infinity, 2]).mean, Infinity);
  assert.ok(Number.isNaN(meanVariance([1, Infinity, 2]).variance));
  assert.equal(meanEstimate([1, -Infinity, 2]).value, -Infinity);
  assert.ok(Number.isNaN(meanEstimate([1, -Infinity, Infinity]).value));
});

Deno.test("meanEstimate: a NaN term is refused with its row, not averaged into a NaN", () => {
  assert.throws(() => meanEstimate([1, 2, NaN, 4]), (e: unknown) => {
    assert.ok(e instanceof SaddleError, String(e));
    assert.equal(e.code, "non-finite");
    assert.equal(e.location.row, 2);
    assert.equal(e.location.parameter, "terms");
    return true;
  });
});
