/**
 * Where a reader gets a file's bytes from: a random-access source that hands out exactly the ranges asked
 * for, so a large file is never held whole when its arrays can be read one by one. Sources exist for bytes
 * already in memory (`bytesSource`, zero-copy), for a `File`/`Blob` (`blobSource.ts`, browser and worker)
 * and for a file on disk (`nodeFiles.ts`, Node only).
 *
 * Offsets and lengths are in bytes from the start of the file.
 */

/** Random access to the bytes of one file. */
export interface ByteSource {
  /** File name, for messages. */
  readonly name: string;
  /** Total size in bytes. */
  readonly size: number;
  /**
   * Bytes `[offset, min(offset + length, size))`: a view (in-memory sources) or a fresh array of that
   * length starting at byte offset 0 of its own buffer (file and blob sources), so a typed array may view
   * it without a copy when the caller owns it.
   */
  read(offset: number, length: number): Promise<Uint8Array>;
  /** Fills all of `target` with bytes `[offset, offset + target.length)`; rejects if the file ends first. */
  readInto?(offset: number, target: Uint8Array): Promise<void>;
  /**
   * `readInto` done at once on this thread (Node file sources only: positional reads of the descriptor); throws
   * if the file ends first. Readers use it for uncompressed arrays, straight into the final array.
   */
  readIntoSync?(offset: number, target: Uint8Array): void;
  /**
   * Preferred size in bytes of one read when an array is read in chunks (conversions, zlib batches); default
   * `SCRATCH_BYTES` (1 MiB). Blob reads carry a fixed cost each, so blob sources ask for larger chunks.
   */
  readonly chunkBytes?: number;
  /**
   * The open file's descriptor (Node file sources only): worker threads of this process may read ranges of it
   * at the same time (`LoadOptions.readParts`). Absent for bytes in memory and blobs.
   */
  readonly descriptor?: number;
  /** Releases what the source holds open (a file handle); readers call it on sources they were handed by a resolver. */
  close?(): Promise<void>;
}

/** The bytes behind each in-memory source, so readers can take the whole file at no cost. */
const IN_MEMORY = new WeakMap<ByteSource, Uint8Array>();

/** A source over bytes already in memory: `read` returns views (no copy). */
export function bytesSource(name: string, bytes: Uint8Array): ByteSource {
  const src: ByteSource = {
    name,
    size: bytes.length,
    read: async (offset, length) => bytes.subarray(offset, Math.min(bytes.length, offset + length)),
    readInto: async (offset, target) => {
      if (offset < 0 || offset + target.length > bytes.length) throw pastEnd(name, offset, target.length, bytes.length);
      target.set(bytes.subarray(offset, offset + target.length));
    },
  };
  IN_MEMORY.set(src, bytes);
  return src;
}

/** The whole content of an in-memory source (made by `bytesSource`), or undefined for file and blob sources. */
export function inMemoryBytes(src: ByteSource): Uint8Array | undefined {
  return IN_MEMORY.get(src);
}

/** The error for a read that runs past the end of the file (the file shrank, or a size check was missed). */
export function pastEnd(name: string, offset: number, length: number, size: number): Error {
  return new Error(`${name}: cannot read bytes ${offset}..${offset + length}: the file holds ${size} bytes (did it change while loading?)`);
}

/** Fills `target` with bytes `[offset, offset + target.length)` of `src`, through `readInto` when the source has one. */
export async function readInto(src: ByteSource, offset: number, target: Uint8Array): Promise<void> {
  if (target.length === 0) return;
  if (src.readInto) return src.readInto(offset, target);
  const b = await src.read(offset, target.length);
  if (b.length !== target.length) throw pastEnd(src.name, offset, target.length, src.size);
  target.set(b);
}

/** Exactly `length` bytes at `offset` (a view or a fresh array, see `ByteSource.read`); rejects if the file ends first. */
export async function readExactly(src: ByteSource, offset: number, length: number): Promise<Uint8Array> {
  const b = await src.read(offset, length);
  if (b.length !== length) throw pastEnd(src.name, offset, length, src.size);
  return b;
}
