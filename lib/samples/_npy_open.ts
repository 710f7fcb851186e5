/**
 * Opening a `.npy` file and reading its header (shared by the whole-file and chunked readers).
 *
 * @module
 */
import { fileError, readFull } from "./_io.ts";
import { npyDims, type NpyHeader, npyHeaderSize, parseNpyHeader } from "./npy_format.ts";

/** Open `path` for reading, turning a failure into a SaddleError naming `source`. */
export async function openFile(path: string, source: string): Promise<Deno.FsFile> {
  try {
    return await Deno.open(path, { read: true });
  } catch (err) {
    fileError(err, source);
  }
}

/** Read and parse the header of an open `.npy` file, leaving it at the first data byte. */
export async function readNpyHead(
  file: Deno.FsFile,
  loc: { file?: string },
): Promise<{ h: NpyHeader; headerSize: number; n: number; d: number }> {
  const prefix = new Uint8Array(12);
  const got = await readFull(file, prefix);
  const headerSize = npyHeaderSize(prefix.subarray(0, got), loc);
  await file.seek(0, Deno.SeekMode.Start);
  const head = new Uint8Array(headerSize);
  const h = parseNpyHeader(head.subarray(0, await readFull(file, head)), loc);
  return { h, headerSize, ...npyDims(h, loc) };
}
