/**
 * Positional reads of an open file on the calling thread (Node only): the loading thread's uncompressed arrays
 * (`ByteSource.readIntoSync` of nodeFiles.ts) and the read workers' parts (src/parallel/partFromFile.ts). A
 * synchronous read costs no promise, no hop to libuv's thread pool and no turn of the event loop per chunk.
 */
import { readSync } from 'node:fs';
import { pastEnd } from './byteSource.ts';

/**
 * Fills all of `target` with bytes from `offset` of the open file `fd` (named `name`, `size` bytes, for the
 * message); throws when the file ends first.
 */
export function readFullySync(fd: number, offset: number, target: Uint8Array, name: string, size: number): void {
  for (let done = 0; done < target.length;) {
    const got = readSync(fd, target, done, target.length - done, offset + done);
    if (got === 0) throw pastEnd(name, offset, target.length, size);
    done += got;
  }
}
