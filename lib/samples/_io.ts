/**
 * File access shared by the readers: errors become SaddleErrors that name the file.
 *
 * @module
 */
import { SaddleError } from "../errors/saddle_error.ts";

/** Turn a Deno file-system error on `path` into a SaddleError; rethrow anything else. */
export function fileError(err: unknown, path: string): never {
  if (err instanceof SaddleError) throw err;
  if (err instanceof Deno.errors.NotFound) {
    throw new SaddleError("not-found", "no such file; check the path and working directory", {
      file: path,
    });
  }
  if (err instanceof Deno.errors.PermissionDenied || err instanceof Deno.errors.NotCapable) {
    throw new SaddleError(
      "invalid-argument",
      "permission denied; run deno with --allow-read (or -A) for this path",
      { file: path },
    );
  }
  if (err instanceof Deno.errors.IsADirectory) {
    throw new SaddleError("invalid-argument", "this is a directory, not a file", { file: path });
  }
  throw err;
}

/** The whole file as bytes. */
export async function readBytes(path: string, name: string = path): Promise<Uint8Array> {
  try {
    return await Deno.readFile(path);
  } catch (err) {
    fileError(err, name);
  }
}

/** The whole file as UTF-8 text (a leading byte-order mark is dropped). */
export async function readText(path: string, name: string = path): Promise<string> {
  return new TextDecoder().decode(await readBytes(path, name));
}

/** Read until `buf` is full or the file ends; returns the number of bytes read. */
export async function readFull(file: Deno.FsFile, buf: Uint8Array): Promise<number> {
  let got = 0;
  while (got < buf.length) {
    const r = await file.read(buf.subarray(got));
    if (r === null || r === 0) break;
    got += r;
  }
  return got;
}

/** Write all of `bytes`. */
export async function writeAll(file: Deno.FsFile, bytes: Uint8Array): Promise<void> {
  let off = 0;
  while (off < bytes.length) off += await file.write(bytes.subarray(off));
}
