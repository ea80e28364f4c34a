/**
 * How far a load has come, in bytes of its input files, for a progress bar that only moves forward.
 *
 * The readers report a file position, which is not the work done: the arrays of an appended XML file are
 * read in the order they are declared, not in the order they lie in the file, so the position jumps back
 * and forth. The meter instead counts the bytes the reader has fetched from the chosen files. A file that
 * the reader takes whole in one read (inline or text data, parsed afterwards) is the exception: there the
 * reader's position is the parse position, which does move forward, and the meter passes it on.
 *
 * An XML file with inline data is read twice: once streamed for its structure (stage `STRUCTURE_STAGE`,
 * whose position moves forward and is passed on), then array by array. The bar runs once for each pass,
 * the second counting the bytes fetched beyond the first.
 */
import type { ByteSource } from '../src/io/byteSource.ts';
import type { LoadProgress } from '../src/io/loadOptions.ts';
import { STRUCTURE_STAGE } from '../src/io/xmlSkeleton.ts';

/** Bytes done of one load: wrap each chosen file's source, then ask `done` at each of the reader's reports. */
export class ReadMeter {
  private fetched = 0;
  private wholeFile = false;
  private sources = 0;
  private shown = 0;
  /** A structure pass was seen (`streamed`), and whether the last report was of it. */
  private streamed = false;
  private inStructure = false;

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

  /** Bytes done for a reader's progress report: never above `total`, never below an earlier answer of the same pass. */
  done(p: LoadProgress): number {
    const structure = p.stage === STRUCTURE_STAGE;
    // the pass over the arrays after the structure pass starts the bar again
    if (this.inStructure && !structure) this.shown = 0;
    this.inStructure = structure;
    if (structure) this.streamed = true;
    const d = structure ? p.bytesDone : this.streamed ? this.fetched - this.total : this.wholeFile && this.sources === 1 ? p.bytesDone : this.fetched;
    this.shown = Math.max(this.shown, Math.min(this.total, Math.max(0, d)));
    return this.shown;
  }
}
