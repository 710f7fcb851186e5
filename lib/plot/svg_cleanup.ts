/**
 * Post-processing of a figure's SVG text: geometry rounded to 0.01 px, and ids renamed so
 * that figures inlined in one page never share a clip path.
 *
 * @module
 */

const GEOMETRY = /\s(d|transform|x|y|x1|x2|y1|y2|cx|cy|r|width|height|points)="([^"]*)"/g;

/**
 * Round the numbers in geometry attributes to 0.01 px (Plot writes positions with 15
 * digits): figures get several times smaller and nothing moves visibly. Text is untouched.
 */
export function roundGeometry(svg: string): string {
  return svg.replace(
    GEOMETRY,
    (_, name: string, value: string) =>
      ` ${name}="${
        value.replace(/-?\d+\.\d{3,}/g, (num) => {
          const r = Math.round(Number(num) * 100) / 100;
          return String(Object.is(r, -0) ? 0 : r);
        })
      }"`,
  );
}

/**
 * Give the ids inside a figure (Plot's clip paths) names of their own: numbered in order of
 * appearance (deterministic output, whatever Plot's global counter says) and prefixed with
 * a hash of the figure, so that several figures inlined in one notebook page never pick up
 * each other's clip paths.
 */
export function uniqueIds(svg: string): string {
  const ids = new Map<string, string>();
  for (const m of svg.matchAll(/\sid="([^"]+)"/g)) {
    if (!ids.has(m[1])) ids.set(m[1], `k${ids.size + 1}`);
  }
  if (ids.size === 0) return svg;
  const rename = (s: string, f: (id: string) => string) =>
    s.replace(/(\sid=")([^"]+)(")/g, (_, a, id, b) => `${a}${f(id)}${b}`)
      .replace(/url\(#([^)]+)\)/g, (m, id) => (ids.has(id) ? `url(#${f(id)})` : m))
      .replace(/(href=")#([^"]+)(")/g, (m, a, id, b) => (ids.has(id) ? `${a}#${f(id)}${b}` : m));
  const local = rename(svg, (id) => ids.get(id) as string);
  let h = 0x811c9dc5;
  for (let i = 0; i < local.length; i++) h = Math.imul(h ^ local.charCodeAt(i), 0x01000193);
  const prefix = `sk${(h >>> 0).toString(36)}-`;
  return rename(svg, (id) => prefix + (ids.get(id) as string));
}
