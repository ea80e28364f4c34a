/**
 * How far a load has come, in bytes of its input files, for a progress bar that only moves forward.
 *
 * The readers report a file position, which is not the work done: the arrays of an appended XML file are
 * read in the order they are declared, not in the order they lie in the file, so the position jumps back
 * and forth. The meter instead counts the bytes the reader has fetched from the chosen files. A file that
 * the reader takes whole in one read (inline or text data, parsed afterwards) is the exception: there the
 * reader's position is the parse position, which does move forward, and the meter passes it on.
 */
import type { ByteSource } from '../src/io/byteSource.ts';
import type { LoadProgress } from '../src/io/loadOptions.ts';

/** Bytes done of one load: wrap each chosen file's source, then ask `done` at each of the reader's reports. */
export class ReadMeter {
  private fetched = 0;
  private wholeFile = false;
  private sources = 0;
  private shown = 0;

  /** `total`: bytes of every chosen file (what the bar runs to). */
  constructor(readonly total: number) {}

  /** The same source, counting the bytes of each completed read. */
  wrap(src: ByteSource): ByteSource {
    this.sources++;
    const count = (offset: number, n: number) => {
      this.fetched += n;
      // a single file read whole: its parse position is the better measure from here on
      if (this.sources === 1 && offset === 0 && n === src.size && n > 0) this.wholeFile = true;
    };
    const wrapped: ByteSource = {
      name: src.name,
      size: src.size,
      read: async (offset, length) => {
        const b = await src.read(offset, length);
        count(offset, b.length);
        return b;
      },
      ...(src.readInto ? { readInto: async (offset: number, target: Uint8Array) => { await src.readInto!(offset, target); count(offset, target.length); } } : {}),
      ...(src.chunkBytes !== undefined ? { chunkBytes: src.chunkBytes } : {}),
      ...(src.close ? { close: () => src.close!() } : {}),
    };
    return wrapped;
  }

  /** Bytes done for a reader's progress report: never above `total`, never below an earlier answer. */
  done(p: LoadProgress): number {
    const d = this.wholeFile && this.sources === 1 ? p.bytesDone : this.fetched;
    this.shown = Math.max(this.shown, Math.min(this.total, d));
    return this.shown;
  }
}
