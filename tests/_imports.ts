/**
 * The import checker behind tests/architecture_test.ts: a small TypeScript tokenizer that
 * finds every module specifier (static `import`, `import type`, `export ... from`, dynamic
 * `import()`), skipping comments and string contents, plus the imports of JSDoc `@example`
 * code blocks; and the rules of the house (lib/layers.json) checked over a set of files.
 *
 * @module
 */

/** One import found in a file. */
export interface FoundImport {
  /** The specifier as written. */
  readonly specifier: string;
  /** True for an import inside a JSDoc `@example` block (a separate module at doc-test time). */
  readonly example: boolean;
}

type Token = { kind: "id" | "str" | "punct"; text: string };

/** Tokens of `src` (identifiers, string literals, punctuation) and the comments skipped. */
function tokenize(src: string): { tokens: Token[]; comments: string[] } {
  const tokens: Token[] = [];
  const comments: string[] = [];
  // Template nesting: each entry counts open braces inside one `${ ... }`.
  const braces: number[] = [];
  let i = 0;
  const n = src.length;
  const regexAllowed = () => {
    const last = tokens[tokens.length - 1];
    if (!last) return true;
    if (last.kind === "id") {
      return ["return", "typeof", "case", "do", "else", "in", "of", "void", "yield", "await"]
        .includes(last.text);
    }
    if (last.kind === "str") return false;
    return !/^[)\]}]$/.test(last.text);
  };
  // Reads template text from i (just after ` or }) up to the closing ` or a `${`.
  const templateText = () => {
    while (i < n) {
      const c = src[i];
      if (c === "\\") {
        i += 2;
      } else if (c === "`") {
        i++;
        tokens.push({ kind: "str", text: "`" });
        return;
      } else if (c === "$" && src[i + 1] === "{") {
        i += 2;
        braces.push(0);
        return;
      } else i++;
    }
  };
  while (i < n) {
    const c = src[i];
    if (c === "/" && src[i + 1] === "/") {
      const end = src.indexOf("\n", i);
      comments.push(src.slice(i, end < 0 ? n : end));
      i = end < 0 ? n : end;
    } else if (c === "/" && src[i + 1] === "*") {
      const end = src.indexOf("*/", i + 2);
      comments.push(src.slice(i, end < 0 ? n : end + 2));
      i = end < 0 ? n : end + 2;
    } else if (c === '"' || c === "'") {
      let j = i + 1;
      let text = "";
      while (j < n && src[j] !== c && src[j] !== "\n") {
        if (src[j] === "\\") j++;
        text += src[j];
        j++;
      }
      tokens.push({ kind: "str", text });
      i = j + 1;
    } else if (c === "`") {
      i++;
      templateText();
    } else if (c === "/" && regexAllowed()) {
      let j = i + 1;
      let cls = false;
      while (j < n && src[j] !== "\n") {
        if (src[j] === "\\") j++;
        else if (src[j] === "[") cls = true;
        else if (src[j] === "]") cls = false;
        else if (src[j] === "/" && !cls) break;
        j++;
      }
      tokens.push({ kind: "str", text: "/regex/" });
      i = j + 1;
    } else if (/[A-Za-z_$]/.test(c)) {
      let j = i + 1;
      while (j < n && /[\w$]/.test(src[j])) j++;
      tokens.push({ kind: "id", text: src.slice(i, j) });
      i = j;
    } else if (/\s/.test(c)) {
      i++;
    } else if (/[0-9]/.test(c)) {
      let j = i + 1;
      while (j < n && /[\w.]/.test(src[j])) j++;
      tokens.push({ kind: "punct", text: "0" });
      i = j;
    } else {
      if (braces.length > 0) {
        if (c === "{") braces[braces.length - 1]++;
        else if (c === "}") {
          if (braces[braces.length - 1] === 0) {
            braces.pop();
            i++;
            templateText();
            continue;
          }
          braces[braces.length - 1]--;
        }
      }
      tokens.push({ kind: "punct", text: c });
      i++;
    }
  }
  return { tokens, comments };
}

const CLAUSE = new Set(["{", "}", ",", "*"]);

/** Module specifiers imported or re-exported by the code tokens. */
function specifiersOf(tokens: Token[]): string[] {
  const out: string[] = [];
  for (let t = 0; t < tokens.length; t++) {
    const tok = tokens[t];
    if (tok.kind !== "id" || (tok.text !== "import" && tok.text !== "export")) continue;
    if (t > 0 && tokens[t - 1].text === ".") continue; // obj.import
    const next = tokens[t + 1];
    if (!next) continue;
    if (tok.text === "import" && next.text === "(" && tokens[t + 2]?.kind === "str") {
      out.push(tokens[t + 2].text);
      continue;
    }
    if (tok.text === "import" && next.kind === "str") {
      out.push(next.text);
      continue;
    }
    // Walk an import/export clause up to `from "..."`; anything else ends the search.
    for (let u = t + 1; u < tokens.length; u++) {
      const w = tokens[u];
      if (w.kind === "id" && w.text === "from" && tokens[u + 1]?.kind === "str") {
        out.push(tokens[u + 1].text);
        break;
      }
      if (w.kind === "id" || (w.kind === "punct" && CLAUSE.has(w.text))) {
        if (
          tok.text === "export" && u === t + 1 && w.kind === "id" && w.text !== "type"
        ) break; // export const / function / class ...
        continue;
      }
      break;
    }
  }
  return out;
}

/** Code blocks of JSDoc `@example` sections inside the comments, leading ` * ` removed. */
function exampleBlocks(comments: string[]): string[] {
  const blocks: string[] = [];
  for (const comment of comments) {
    if (!comment.includes("@example")) continue;
    const lines = comment.split("\n").map((l) => l.replace(/^\s*(\/\*\*\s*)?\*? ?/, ""));
    let inExample = false;
    let block: string[] | null = null;
    for (const line of lines) {
      if (/^@\w+/.test(line)) inExample = line.startsWith("@example");
      if (/^```/.test(line.trim())) {
        if (block) {
          if (inExample) blocks.push(block.join("\n"));
          block = null;
        } else block = [];
      } else if (block) block.push(line);
    }
  }
  return blocks;
}

/** Every import of a TypeScript source: code imports, then JSDoc example imports. */
export function parseImports(src: string): FoundImport[] {
  const { tokens, comments } = tokenize(src);
  const found: FoundImport[] = specifiersOf(tokens).map((specifier) => ({
    specifier,
    example: false,
  }));
  for (const block of exampleBlocks(comments)) {
    for (const specifier of specifiersOf(tokenize(block).tokens)) {
      found.push({ specifier, example: true });
    }
  }
  return found;
}

/** A rule broken by one import. */
export interface Violation {
  /** Importing file, relative to the repository root. */
  readonly file: string;
  /** The specifier as written. */
  readonly specifier: string;
  /** Which rule, and why. */
  readonly rule: string;
}

/** Resolve `spec` relative to the file `from` (both repository-relative, "/"-separated). */
function resolve(from: string, spec: string): string {
  const parts = from.split("/").slice(0, -1);
  for (const p of spec.split("/")) {
    if (p === "..") parts.pop();
    else if (p !== ".") parts.push(p);
  }
  return parts.join("/");
}

/** The lib folder a path belongs to (`lib/density/kde.ts` -> "density"), if any. */
function libFolder(path: string): string | undefined {
  const m = /^lib\/([^/]+)\//.exec(path);
  return m?.[1];
}

/**
 * Check a set of files (repository-relative path -> source) against the house rules:
 * `layers` lowest first; every `lib/` folder must be listed; a lib folder imports only
 * from folders below it; a `_` file is imported only from its own folder (or that folder's
 * tests in `tests/<folder>/`); `lib/` and `tests/` never import `scripts/`; no import cycle
 * between files (JSDoc examples are separate modules and are left out of the cycle check).
 * `bench/` may use the test helpers in `tests/_*.ts` (the same reference runner and data).
 */
export function checkHouse(
  files: ReadonlyMap<string, string>,
  layers: readonly string[],
): Violation[] {
  const out: Violation[] = [];
  const rank = new Map(layers.map((l, i) => [l, i]));
  const seenFolders = new Set<string>();
  const graph = new Map<string, { target: string; specifier: string }[]>();
  for (const [file, src] of files) {
    const folder = libFolder(file);
    if (folder !== undefined && !seenFolders.has(folder)) {
      seenFolders.add(folder);
      if (!rank.has(folder)) {
        out.push({
          file,
          specifier: "",
          rule: `lib/${folder} is missing from lib/layers.json (add it at its layer)`,
        });
      }
    }
    const edges: { target: string; specifier: string }[] = [];
    for (const { specifier, example } of parseImports(src)) {
      if (!specifier.startsWith(".")) continue;
      const target = resolve(file, specifier);
      const where = example ? " (in a JSDoc @example)" : "";
      if (!example) edges.push({ target, specifier });
      if ((file.startsWith("lib/") || file.startsWith("tests/")) && target.startsWith("scripts/")) {
        out.push({ file, specifier, rule: `lib/ and tests/ never import scripts/${where}` });
      }
      const to = libFolder(target);
      if (folder !== undefined && to !== undefined && to !== folder) {
        const a = rank.get(folder), b = rank.get(to);
        if (a !== undefined && b !== undefined && b >= a) {
          out.push({
            file,
            specifier,
            rule: `${b === a ? "sideways" : "upward"} import: lib/${folder} (layer ${a}) may ` +
              `import only folders below it, not lib/${to} (layer ${b})${where}`,
          });
        }
      }
      if (folder !== undefined && target === "mod.ts") {
        out.push({ file, specifier, rule: `lib/ never imports the root mod.ts${where}` });
      }
      const base = target.split("/").pop() ?? "";
      if (base.startsWith("_")) {
        const home = target.slice(0, target.length - base.length);
        // A lib folder's tests may read its private files; bench/ shares the test helpers.
        const testsOf = home.startsWith("lib/") ? `tests/${home.slice(4)}` : undefined;
        const benchOk = home === "tests/" && file.startsWith("bench/");
        if (!file.startsWith(home) && !(testsOf && file.startsWith(testsOf)) && !benchOk) {
          out.push({
            file,
            specifier,
            rule: `private file: ${target} is private to ${home} ` +
              `(import a public file or mod.ts)${where}`,
          });
        }
      }
    }
    graph.set(file, edges);
  }
  // Cycles: depth-first search; report each back edge with the cycle it closes.
  const state = new Map<string, 1 | 2>();
  const stack: string[] = [];
  const visit = (f: string) => {
    state.set(f, 1);
    stack.push(f);
    for (const { target, specifier } of graph.get(f) ?? []) {
      if (!graph.has(target)) continue;
      const s = state.get(target);
      if (s === 1) {
        const cycle = [...stack.slice(stack.indexOf(target)), target].join(" -> ");
        out.push({ file: f, specifier, rule: `import cycle: ${cycle}` });
      } else if (s === undefined) visit(target);
    }
    stack.pop();
    state.set(f, 2);
  };
  for (const f of [...graph.keys()].sort()) if (!state.has(f)) visit(f);
  return out;
}

/** Human-readable line for a violation: file, import, rule. */
export function formatViolation(v: Violation): string {
  return `${v.file}: import "${v.specifier}": ${v.rule}`;
}
