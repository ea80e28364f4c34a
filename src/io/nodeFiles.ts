/**
 * Loading from the local file system (command line and tests, Node only): files are opened as
 * `ByteSource`s read by ranges (`handle.read` straight into the reader's buffers), so a large file is
 * never held whole when its arrays can be read one by one; pieces of a set resolve from the set file's
 * folder; zlib blocks are inflated by node:zlib.
 */
import type { Stats } from 'node:fs';
import { constants as fsConstants } from 'node:fs';
import { open, stat } from 'node:fs/promises';
import { basename, dirname, resolve as resolvePath } from 'node:path';
import { deflateSync, inflateSync } from 'node:zlib';
import type { Dataset } from '../model/dataset.ts';
import { pastEnd, type ByteSource } from './byteSource.ts';
import type { InflateBlock, LoadOptions } from './loadOptions.ts';
import { cutPath, fileErrorText } from './messageText.ts';
import { readDatasetFrom } from './readDataset.ts';
import { readFullySync } from './syncReads.ts';
import { engineInflate, engineWorks } from './zlibEngine.mjs';
import { fflateInflate } from './xmlBlocks.ts';

/** What a file-system entry is, in words, when it is not a regular file. */
export function specialKind(st: Stats): string | undefined {
  if (st.isFile()) return undefined;
  if (st.isDirectory()) return 'a folder';
  if (st.isFIFO()) return 'a named pipe';
  if (st.isCharacterDevice()) return 'a character device';
  if (st.isBlockDevice()) return 'a block device';
  if (st.isSocket()) return 'a socket';
  return 'not a regular file';
}

/** The error for a path that cannot be read: what it is or what went wrong, path cut to fit one line. */
function cannotRead(path: string, e: unknown): Error {
  return new Error(`${cutPath(path)}: cannot read file (${fileErrorText((e as NodeJS.ErrnoException).code)})`);
}

/**
 * The shared guard of every input: `path` must be a regular file (a named pipe, device, socket or folder
 * would block or never end) — checked by its type before it is opened. Returns its size in bytes.
 */
export async function checkInputFile(path: string): Promise<number> {
  let st: Stats;
  try {
    st = await stat(path);
  } catch (e) {
    throw cannotRead(path, e);
  }
  const kind = specialKind(st);
  if (kind) throw new Error(`${cutPath(path)}: is ${kind}, expected a regular file`);
  return st.size;
}

/** Reads a whole (regular) file as bytes, at most `maxBytes`, with an error naming the path if it cannot. */
export async function readBytes(path: string, maxBytes = 64 << 20): Promise<Uint8Array> {
  const src = await openFileSource(path);
  try {
    if (src.size > maxBytes) throw new Error(`${cutPath(path)}: the file holds ${src.size} bytes, more than the ${maxBytes} expected for this kind of file`);
    const b = await src.read(0, src.size);
    if (b.length !== src.size) throw new Error(`${cutPath(path)}: the file shrank while being read (${b.length} of ${src.size} bytes)`);
    return b;
  } finally {
    await src.close();
  }
}

/** A `ByteSource` that also closes its file handle. */
export type FileSource = ByteSource & { close(): Promise<void> };

/**
 * Opens `path` as a source named `name` (default: the file's base name). Every read goes straight into
 * the caller's buffer (`readInto`) or one fresh buffer of the requested length (`read`).
 */
export async function openFileSource(path: string, name: string = basename(path)): Promise<FileSource> {
  await checkInputFile(path);
  let handle;
  try {
    // Non-blocking, so that a file swapped for a named pipe after the check cannot block the open.
    handle = await open(path, fsConstants.O_RDONLY | fsConstants.O_NONBLOCK);
  } catch (e) {
    throw cannotRead(path, e);
  }
  const h = handle;
  let size: number;
  try {
    const st = await h.stat();
    const kind = specialKind(st);
    if (kind) throw new Error(`${cutPath(path)}: is ${kind}, expected a regular file`);
    size = st.size;
  } catch (e) {
    await h.close();
    throw e instanceof Error && !(e as NodeJS.ErrnoException).code ? e : cannotRead(path, e);
  }
  const fill = async (offset: number, target: Uint8Array): Promise<number> => {
    let done = 0;
    while (done < target.length) {
      const { bytesRead } = await h.read(target, done, target.length - done, offset + done);
      if (bytesRead === 0) break;
      done += bytesRead;
    }
    return done;
  };
  let closed = false;
  return {
    name,
    size,
    descriptor: h.fd,
    async read(offset, length) {
      const n = Math.max(0, Math.min(length, size - offset));
      const out = new Uint8Array(n);
      const got = await fill(offset, out);
      return got === n ? out : out.subarray(0, got);
    },
    async readInto(offset, target) {
      if (await fill(offset, target) !== target.length) throw pastEnd(name, offset, target.length, size);
    },
    readIntoSync(offset, target) {
      readFullySync(h.fd, offset, target, name, size);
    },
    async close() {
      if (!closed) { closed = true; await h.close(); }
    },
  };
}

/** Blocks inflated by `inflateSync` below this size (one output chunk); larger ones by fflate straight into place. */
const NODE_INFLATE_MAX = 4 << 20;

/** node:zlib's inflate through its public API: one output chunk of the declared size, copied into `out`. */
const publicInflate: InflateBlock = (block, out) => {
  if (out.length > NODE_INFLATE_MAX) return fflateInflate(block, out);
  let r: Uint8Array;
  try {
    r = inflateSync(block, { chunkSize: Math.max(64, out.length + 1), maxOutputLength: Math.max(1, out.length) });
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code !== 'ERR_BUFFER_TOO_LARGE') throw e;
    // Longer than declared: say so without inflating the rest.
    return out.length + 1;
  }
  if (r.length === out.length) out.set(r);
  return r.length;
};

let chosen: InflateBlock | undefined;

/**
 * The engine inflater (zlibEngine.mjs: one reused engine straight into `out`, no buffer per block — the public
 * API makes two — about a third faster) if it works on this Node (checked once on a known stream), else the public one.
 */
function pickInflate(): InflateBlock {
  try {
    if (!engineWorks()) return publicInflate;
    const text = new TextEncoder().encode('fieldtally inflate check '.repeat(40));
    const out = new Uint8Array(text.length);
    if (engineInflate(deflateSync(text), out) !== text.length || !out.every((v, i) => v === text[i])) return publicInflate;
    return engineInflate;
  } catch {
    return publicInflate;
  }
}

/**
 * node:zlib's inflate (native, about three times fflate's speed), straight into `out`. A stream longer
 * than declared returns a count above `out.length`; a corrupt one throws zlib's message.
 */
export const nodeInflate: InflateBlock = (block, out) => (chosen ??= pickInflate())(block, out);

/** Options every `loadDatasetFile` starts from (the command line sets its memory limit here). */
let loadDefaults: LoadOptions = {};

/** Sets the options every later `loadDatasetFile` starts from. */
export function setLoadDefaults(o: LoadOptions): void {
  loadDefaults = o;
}

/**
 * Loads a dataset from a path, reading it by ranges; pieces of `.pvtu`/`.vtm` sets resolve relative to the
 * set file's folder. zlib blocks are inflated by node:zlib unless `opts.inflate` says otherwise.
 */
export async function loadDatasetFile(path: string, opts: LoadOptions = {}, onPiece?: (full: string, rel: string) => void): Promise<Dataset> {
  const folder = dirname(resolvePath(path));
  const src = await openFileSource(path);
  try {
    return await readDatasetFrom(src, {
      inflate: nodeInflate,
      ...loadDefaults,
      ...opts,
      ...(opts.resolve || opts.resolveSource ? {} : {
        resolveSource: async (rel: string) => {
          const full = resolvePath(folder, rel);
          try { await stat(full); } catch {
            throw new Error(`${basename(path)}: piece "${rel}" is missing (looked for ${cutPath(full)})`);
          }
          const piece = await openFileSource(full, basename(full));
          onPiece?.(full, rel);
          return piece;
        },
      }),
    });
  } finally {
    await src.close();
  }
}
