/**
 * Atomic file writes: the bytes go to a temporary file in the destination's folder, which is
 * renamed over the destination only once everything is written, so a reader never sees a
 * half-written file and a failure leaves the destination as it was.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";

/** What {@linkcode writeFileAtomic} writes: text, bytes, or chunks of bytes in order. */
export type AtomicContent =
  | string
  | Uint8Array
  | Iterable<Uint8Array>
  | AsyncIterable<Uint8Array>;

/**
 * Write `content` to `path` atomically: into a temporary file beside it (same folder, so
 * the final rename stays on one file system), then `rename` onto `path`. Chunks are
 * produced lazily, so a generator can stream a large file and may throw to abort; the
 * temporary file is then removed and `path` is untouched.
 *
 * Deno's file-system errors become a `SaddleError` naming the path and the fix: a missing
 * folder (`not-found`), a directory in the way or no permission (`invalid-argument`), a
 * full or read-only disk (`io`). Other errors (from `content` itself) propagate as they
 * are, after the clean-up.
 *
 * Common practice (write-then-rename), no source; POSIX rename(2) replaces the target
 * atomically within one file system.
 *
 * @example
 * ```ts
 * import { writeFileAtomic } from "./atomic_write.ts";
 * import assert from "node:assert/strict";
 * const dir = await Deno.makeTempDir();
 * await writeFileAtomic(`${dir}/a.txt`, "hello");
 * assert.equal(await Deno.readTextFile(`${dir}/a.txt`), "hello");
 * await assert.rejects(() => writeFileAtomic(`${dir}/missing/a.txt`, "x"), /does not exist/);
 * assert.deepEqual([...Deno.readDirSync(dir)].map((e) => e.name), ["a.txt"]);
 * await Deno.remove(dir, { recursive: true });
 * ```
 */
export async function writeFileAtomic(path: string, content: AtomicContent): Promise<void> {
  const slash = path.lastIndexOf("/");
  const dir = slash >= 0 ? path.slice(0, slash + 1) : "";
  const base = path.slice(slash + 1);
  if (base === "") {
    throw new SaddleError("invalid-argument", "the path names a folder, not a file", {
      file: path,
    });
  }
  const tmp = `${dir}.${base}.${crypto.randomUUID().slice(0, 8)}.tmp`;
  let file: Deno.FsFile | undefined;
  try {
    file = await Deno.open(tmp, { write: true, createNew: true });
    if (typeof content === "string") await writeAll(file, new TextEncoder().encode(content));
    else if (content instanceof Uint8Array) await writeAll(file, content);
    else {
      for await (const chunk of content as AsyncIterable<Uint8Array>) await writeAll(file, chunk);
    }
    await file.syncData();
    file.close();
    file = undefined;
    await Deno.rename(tmp, path);
  } catch (err) {
    if (file) {
      try {
        file.close();
      } catch { /* already closed */ }
    }
    await Deno.remove(tmp).catch(() => {});
    throw fileWriteError(err, path);
  }
}

async function writeAll(file: Deno.FsFile, bytes: Uint8Array): Promise<void> {
  let off = 0;
  while (off < bytes.length) off += await file.write(bytes.subarray(off));
}

/**
 * A SaddleError naming `path` for a Deno file-system error met while writing it (missing
 * folder, permission, directory in the way, full or read-only disk); any other error is
 * returned unchanged.
 *
 * @example
 * ```ts
 * import { fileWriteError } from "./atomic_write.ts";
 * import assert from "node:assert/strict";
 * const e = fileWriteError(new Deno.errors.NotFound("x"), "/nowhere/out.svg");
 * assert.match(String(e), /\/nowhere\/ does not exist/);
 * ```
 */
export function fileWriteError(err: unknown, path: string): unknown {
  if (err instanceof SaddleError) return err;
  const folder = path.includes("/") ? path.slice(0, path.lastIndexOf("/") + 1) : "./";
  const text = err instanceof Error ? err.message : String(err);
  if (err instanceof Deno.errors.NotFound) {
    return new SaddleError(
      "not-found",
      `cannot write: the folder ${folder} does not exist; create it first ` +
        `(Deno.mkdir("${folder}", { recursive: true })) or choose another path`,
      { file: path },
    );
  }
  if (err instanceof Deno.errors.PermissionDenied || err instanceof Deno.errors.NotCapable) {
    return new SaddleError(
      "io",
      `cannot write: permission denied in ${folder}; choose a writable folder, or run deno ` +
        "with --allow-write (or -A) for it",
      { file: path },
    );
  }
  if (err instanceof Deno.errors.IsADirectory) {
    return new SaddleError(
      "invalid-argument",
      "cannot write: a folder of that name is in the way; choose a file name",
      { file: path },
    );
  }
  if (/os error 28\b|no space left/i.test(text)) {
    return new SaddleError(
      "io",
      "cannot write: no space left on the device; free space or choose another disk " +
        "(nothing was left behind)",
      { file: path },
    );
  }
  if (/os error 30\b|read-only file system/i.test(text)) {
    return new SaddleError(
      "io",
      "cannot write: the file system is read-only; choose a writable folder",
      { file: path },
    );
  }
  if (/os error (20|36)\b|not a directory|name too long/i.test(text)) {
    return new SaddleError("invalid-argument", `cannot write: ${text}; check the path`, {
      file: path,
    });
  }
  return err;
}
