/**
 * A `ByteSource` over a `File` or `Blob` (browser page or worker): ranges are read with
 * `blob.slice(a, b).arrayBuffer()`, so a large file is never read whole when its arrays can be read one by
 * one. Uses only the Blob API (no DOM), so it runs in a worker and under Node (which has `Blob`).
 */
import { pastEnd, type ByteSource } from './byteSource.ts';

/** A source over `blob`; `name` defaults to the File's name. */
export function blobSource(blob: Blob, name: string = (blob as Partial<File>).name ?? 'blob'): ByteSource {
  const size = blob.size;
  // Each arrayBuffer() result is a fresh, aligned buffer: typed arrays may view it with no copy.
  const read = async (offset: number, length: number): Promise<Uint8Array> => {
    const end = Math.min(size, offset + length);
    if (offset >= end) return new Uint8Array(0);
    return new Uint8Array(await blob.slice(offset, end).arrayBuffer());
  };
  return {
    name,
    size,
    read,
    async readInto(offset, target) {
      const b = await read(offset, target.length);
      if (b.length !== target.length) throw pastEnd(name, offset, target.length, size);
      target.set(b);
    },
  };
}
