/**
 * Line numbers for CSV error messages. d3-dsv reports rows, not lines; a quoted field may
 * span several lines, so the 1-based line where row `r` starts is found by re-scanning the
 * text with d3-dsv's own rules (a quote is special only at the start of a field; `""`
 * inside quotes is a quote; after the closing quote one character is consumed). Only
 * called when an error is reported.
 *
 * @module
 */

const QUOTE = 34, NL = 10, CR = 13;

/** The 1-based line on which row `target` (0-based, as d3-dsv counts rows) starts. */
export function lineOfRow(text: string, delimiter: string, target: number): number {
  const D = delimiter.charCodeAt(0);
  let N = text.length;
  if (text.charCodeAt(N - 1) === NL) N--;
  if (text.charCodeAt(N - 1) === CR) N--;
  let line = 1, row = 0, i = 0;
  // Count the line breaks in text[a, b): \n, \r\n and a lone \r each end one line.
  const breaks = (a: number, b: number) => {
    for (let k = a; k < b; k++) {
      const c = text.charCodeAt(k);
      if (c === NL) line++;
      else if (c === CR && text.charCodeAt(k + 1) !== NL) line++;
    }
  };
  while (i < N && row < target) {
    // One field starting at i.
    if (text.charCodeAt(i) === QUOTE) {
      let j = i + 1;
      for (;;) {
        if (j >= N) break;
        if (text.charCodeAt(j) === QUOTE) {
          if (text.charCodeAt(j + 1) === QUOTE) j += 2;
          else break;
        } else j++;
      }
      breaks(i, Math.min(j, N));
      i = j + 1; // past the closing quote
      if (i >= N) break;
      const c = text.charCodeAt(i++);
      if (c === NL) {
        line++;
        row++;
      } else if (c === CR) {
        if (text.charCodeAt(i) === NL) i++;
        line++;
        row++;
      }
      continue;
    }
    while (i < N) {
      const c = text.charCodeAt(i++);
      if (c === NL) {
        line++;
        row++;
        break;
      }
      if (c === CR) {
        if (text.charCodeAt(i) === NL) i++;
        line++;
        row++;
        break;
      }
      if (c === D) break;
    }
  }
  return line;
}
