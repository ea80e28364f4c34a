/**
 * What every reader takes besides the bytes: progress reporting, cancellation, a way to fetch the other
 * files of a multi-file set (pieces of a `.pvtu`, blocks of a `.vtm`), and an optional faster inflater.
 */
import type { ArrayScan } from '../model/arrayScans.ts';
import type { Dataset } from '../model/dataset.ts';
import type { NumericArray } from '../model/fieldArray.ts';
import type { ByteSource } from './byteSource.ts';
import type { ArrayPlan } from './elementConvert.ts';

/** One progress report: the current stage and how many bytes of the input it has consumed. */
export interface LoadProgress {
  stage: string;
  bytesDone: number;
  bytesTotal: number;
}

/** Fetches a file named relative to the set file's folder (`/`-separated); rejects with a clear error if missing. */
export type ResolveFile = (relativePath: string) => Promise<Uint8Array>;

/**
 * Opens a file named relative to the set file's folder as a `ByteSource` (read by ranges, never whole
 * when not needed); rejects with a clear error if missing. The reader closes the source when done.
 */
export type ResolveSource = (relativePath: string) => Promise<ByteSource>;

/**
 * Inflates one complete zlib stream (RFC 1950) `block` into `out`, whose length is the size the file
 * declares. Returns the number of bytes the stream holds (any number above `out.length` when it holds
 * more); throws an Error (its message is quoted in the reader's) when the stream is corrupt.
 */
export type InflateBlock = ((block: Uint8Array, out: Uint8Array) => number) & {
  /**
   * Optional: inflates many blocks at once (on several threads, src/parallel/inflatePool.ts). Resolves, per
   * block, to what the single-block call returns, or to an Error message string for a corrupt stream.
   * Readers use it for runs of whole blocks that land straight in the final array.
   */
  batch?: InflateBatch;
};

/** Inflates `blocks[i]` into `outs[i]` for every i; see `InflateBlock.batch`. */
export type InflateBatch = (blocks: readonly Uint8Array[], outs: readonly Uint8Array[]) => Promise<(number | string)[]>;

/**
 * Parses the numbers of many windows of ASCII text at once (on several threads, src/parallel/textPool.ts):
 * window `[a, b, o]` is `text[a, b)`, its numbers go to `values[o…]` (see `parseWindow` in
 * src/io/asciiWindows.ts). Resolves, per window, to the count of numbers or a message. `text` and `values`
 * view SharedArrayBuffers where the platform has them, so workers read and write them in place.
 */
export type ParseTextBatch = ((text: Uint8Array, windows: readonly (readonly [number, number, number])[], values: Float64Array) => Promise<(number | string)[]>) & {
  /** Windows parsed at once (the pool's thread count); default 1. */
  readonly workers?: number;
  /** Text bytes of one window; default 1 MiB (`TEXT_WINDOW_BYTES`). */
  readonly windowBytes?: number;
};

/**
 * Decodes many windows of base64 text at once (on several threads, src/parallel/textPool.ts): window
 * `[a, b, o, n]` is `text[a, b)`, decoded to exactly `n` bytes at `out[o…]` (see `decodeWindow` in
 * src/io/base64Windows.ts). Resolves, per window, to `n` or a message. `text` and `out` view
 * SharedArrayBuffers where the platform has them.
 */
export type Base64Batch = ((text: Uint8Array, windows: readonly (readonly [number, number, number, number])[], out: Uint8Array) => Promise<(number | string)[]>) & {
  /** Windows decoded at once (the pool's thread count); default 1. */
  readonly workers?: number;
  /** Text characters of one window; default 1 MiB. */
  readonly windowBytes?: number;
};

/**
 * One uncompressed array of a file on disk, to be read in parts on several threads (`LoadOptions.readParts`).
 * Offsets are bytes from the start of the file; `count` counts file elements (after `plan.lead` zero slots).
 */
export interface PartsJob {
  /** The open file's descriptor (`ByteSource.descriptor`; threads of this process share it). */
  readonly descriptor: number;
  /** File name and size in bytes, for messages. */
  readonly name: string;
  readonly size: number;
  /** Byte offset of element 0. */
  readonly offset: number;
  readonly count: number;
  /** How the elements become the final array (`badCellType` is not used: cell-type plans are not read in parts). */
  readonly plan: ArrayPlan;
  /** The final array, in a SharedArrayBuffer, allocated by the reader; parts write into it in place. */
  readonly out: NumericArray;
  /** Elements per part boundary: every part but the last holds a multiple of it (the one-thread read's chunk). */
  readonly step: number;
}

/**
 * Optional (Node, src/parallel/readPool.ts): reads an uncompressed array of a file on disk in contiguous parts on
 * several threads, each part converted, swapped and checked in place as the one-thread read does it. Resolves to
 * the array's scan (first non-finite value of floats, range of ids: `joinScans` in src/io/partReads.ts); rejects
 * with the message the one-thread read gives for the first bad element (the lowest part that failed).
 */
export type ReadParts = ((job: PartsJob) => Promise<ArrayScan>) & {
  /** Parts read at once (the thread count). */
  readonly workers: number;
  /** Arrays of fewer file bytes are read on the calling thread; default `PARTS_MIN_BYTES`. */
  readonly minBytes?: number;
};

/** File bytes below which an array is read on the calling thread even when `readParts` is given (4 MiB). */
export const PARTS_MIN_BYTES = 4 << 20;

export interface LoadOptions {
  /** Called now and then (throttled by the reader) with the stage and bytes consumed. */
  onProgress?: (p: LoadProgress) => void;
  /** When aborted, the reader stops at its next checkpoint and rejects with an Error named 'AbortError'. */
  signal?: AbortSignal;
  /** Required for set files (this or `resolveSource`); single files ignore it. */
  resolve?: ResolveFile;
  /** Like `resolve`, but pieces are read by ranges; preferred over `resolve` when both are given. */
  resolveSource?: ResolveSource;
  /**
   * Sets only: asked about each leaf file of the set before it is opened, with its number over the whole set
   * (depth first, in file order, nested sets included) and its path; a leaf it refuses is not opened and gives
   * no pieces. Nested set files (named `.pvtu`, `.pvtp`, `.vtm`, `.vtpd`, `.vtpc`) are always opened, to number
   * their leaves. Used to read one task's share of a set (`fieldtally partial`).
   */
  pieceShare?: (leaf: number, path: string) => boolean;
  /** zlib inflater for compressed XML arrays. Default: fflate's (pure JavaScript); the Node loader passes node:zlib's. */
  inflate?: InflateBlock;
  /**
   * Optional: XML `format="ascii"` arrays are parsed window by window with it (on several threads); the
   * arrays are the same bits as without it. Default: parsed on this thread.
   */
  parseText?: ParseTextBatch;
  /** Optional: uncompressed base64 arrays of XML files are decoded window by window with it (same bytes). */
  decodeBase64?: Base64Batch;
  /**
   * Optional: uncompressed raw appended arrays of XML files on disk (sources with a `descriptor`) of at least
   * `minBytes` are read in parts on several threads, straight into arrays in shared memory (same values, same
   * messages). Default: read on this thread.
   */
  readParts?: ReadParts;
  /**
   * Optional: every mesh and field array is decoded straight into a `SharedArrayBuffer` (zlib, base64, ASCII,
   * raw appended and legacy files alike), so handing the dataset to a worker pool (`toSharedDataset`) copies
   * nothing. Same values and messages. Default false (plain ArrayBuffers, which a page can transfer).
   */
  sharedArrays?: boolean;
  /**
   * Most bytes the decoded arrays of this load may take (a set's pieces together); an array that would pass it
   * is refused before it is allocated (see `memoryBudget.ts`). Default: no limit.
   */
  memoryLimit?: number;
  /** How to lift `memoryLimit`, quoted in its message (e.g. the command-line flag). */
  memoryHint?: string;
  /**
   * A dataset read before (the previous step of a series). XML files only: a geometry array (points, cell
   * types, offsets, connectivity) stored as raw appended bytes equal to the same piece's array of this
   * dataset is taken from it instead of decoded again (`sameBlock.ts`), and not checked again when the whole
   * geometry is (give only a dataset that was read or built through the usual checks); anything else is read
   * as usual.
   */
  geometryBefore?: Dataset;
}

/** Throws an AbortError if the signal is aborted. */
export function checkAborted(signal: AbortSignal | undefined, where: string): void {
  if (signal?.aborted) {
    const e = new Error(`${where}: loading cancelled`);
    e.name = 'AbortError';
    throw e;
  }
}

/**
 * A cooperative checkpoint for long parses: reports progress, lets the event loop run (so a cancel
 * message can arrive in a worker) at most every `intervalMs`, and throws if cancelled.
 */
export class Checkpoint {
  private last = performance.now();
  constructor(
    private readonly where: string,
    private readonly opts: LoadOptions,
    private readonly bytesTotal: number,
    private readonly intervalMs = 50,
  ) {}

  /** Call between arrays or blocks; cheap when called often. */
  async at(stage: string, bytesDone: number): Promise<void> {
    const now = performance.now();
    if (now - this.last < this.intervalMs) return;
    this.last = now;
    this.opts.onProgress?.({ stage, bytesDone, bytesTotal: this.bytesTotal });
    await new Promise<void>((r) => setTimeout(r, 0));
    checkAborted(this.opts.signal, this.where);
  }
}
