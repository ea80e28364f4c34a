/**
 * A `ByteSource` over a `File` or `Blob` that reads an XML file's appended arrays ahead, while the reader
 * decodes what has arrived: the platform's file read (done off the JavaScript thread) overlaps with parsing,
 * narrowing and checking instead of alternating with them.
 *
 * On the first read it reads the file's head (up to `HEAD_BYTES`) and, when the head holds `<AppendedData`,
 * takes the `offset="…"` attributes before it as the arrays' places: each array (its block header and data,
 * up to the next array) becomes one piece, fetched with one blob read, in file order, `inFlight` at a time and
 * never more than `maxAheadBytes` unclaimed (an array larger than that is read range by range). A read inside one piece is served from it as a view — no copy and
 * no fresh memory, which costs the engine page faults — and each byte of a piece is handed out at most once
 * (a read of bytes already handed, or across pieces, or outside every piece, is read from the blob directly,
 * as a fresh buffer). A piece is dropped once all of it was handed out. The plan is only a guess about what
 * will be read: whatever the reader asks for, it gets the file's bytes. A file without appended data (legacy,
 * inline or text arrays) is read range by range as `blobSource` does, and so is a compressed one: with its
 * blocks inflated on every core, reading ahead made the 1M-hexahedron zlib file slower in the viewer bench
 * (file chosen → picture 7.8 and 8.3 s against 6.6 and 5.4 s, and 4.3 and 4.8 s against 3.1 and 3.1 s, taking
 * turns on a machine loaded 9–13 on 2 cores), while the raw file came faster (repeat loads 2.1 and 2.0 s against
 * 2.6 and 3.6 s).
 *
 * Views may start at any byte offset of their buffer (readers check alignment before viewing, and copy
 * otherwise). Uses only the Blob API (no DOM): runs in a worker and under Node.
 */
import { BLOB_CHUNK_BYTES } from './blobSource.ts';
import type { ByteSource } from './byteSource.ts';

/** Options of `readAheadSource`; every default is here. */
export interface ReadAheadOptions {
  /** Pieces fetched at once (default 2). */
  inFlight?: number;
  /** Unclaimed bytes held before fetching pauses, and the largest array read ahead (default 128 MiB: every array of the 1M-cell files; at 10M the largest are read range by range). */
  maxAheadBytes?: number;
  /** Bytes read first to find the appended arrays (default `HEAD_BYTES`). */
  headBytes?: number;
}

/** Bytes read first to find the appended arrays' places (1 MiB: a head with thousands of arrays). */
export const HEAD_BYTES = 1 << 20;

/** What a read-ahead source measured, for the viewer benchmark's phases (ms of `performance.now()`). */
export interface ReadAheadStats {
  /** Arrays planned from the head (0: no appended data found, read range by range). */
  planned: number;
  /** When the last planned piece (or the last direct read) arrived. */
  lastArrivedAt: number;
  /** Time the reader spent waiting for bytes that had not arrived yet (ms, summed over its reads). */
  waitedMs: number;
  /** Bytes fetched from the blob: as planned pieces, and directly. */
  aheadBytes: number;
  directBytes: number;
}

/** A read-ahead source and its measurements. */
export interface ReadAheadSource extends ByteSource {
  readonly stats: ReadAheadStats;
  /** Stops fetching ahead and drops what is held (reads still work, directly). */
  close(): Promise<void>;
}

interface Piece {
  start: number;
  end: number;
  bytes?: Uint8Array;
  arrived?: Promise<Uint8Array>;
  /** Bytes handed out so far, as sorted disjoint [from, to) ranges of file positions. */
  handed: number[];
}

/** A read-ahead source over `blob`; `name` defaults to the File's name. */
export function readAheadSource(blob: Blob, name: string = (blob as Partial<File>).name ?? 'blob', opts: ReadAheadOptions = {}): ReadAheadSource {
  const size = blob.size;
  const inFlight = Math.max(1, Math.floor(opts.inFlight ?? 2));
  const maxAhead = Math.max(1, opts.maxAheadBytes ?? 128 << 20);
  const stats: ReadAheadStats = { planned: 0, lastArrivedAt: NaN, waitedMs: 0, aheadBytes: 0, directBytes: 0 };
  let pieces: Piece[] = [];
  let planning: Promise<void> | undefined;
  let running = 0, held = 0, closed = false;

  const direct = async (offset: number, end: number): Promise<Uint8Array> => {
    const b = new Uint8Array(await blob.slice(offset, end).arrayBuffer());
    stats.directBytes += b.length;
    stats.lastArrivedAt = performance.now();
    return b;
  };
  /** Starts fetching a piece (in turn, or at once when the reader asks for it first). */
  const start = (p: Piece): void => {
    running++;
    held += p.end - p.start;
    p.arrived = blob.slice(p.start, p.end).arrayBuffer().then((b) => {
      running--;
      const bytes = new Uint8Array(b);
      stats.aheadBytes += bytes.length;
      stats.lastArrivedAt = performance.now();
      if (!closed && pieces.includes(p)) p.bytes = bytes;
      fetchAhead();
      return bytes;
    }, (e: unknown) => {
      // a piece that failed is read directly when asked for
      running--;
      if (pieces.includes(p)) drop(p);
      throw e;
    });
    p.arrived.catch(() => undefined);
  };
  /** Pieces in file order, `inFlight` at a time, while less than `maxAhead` bytes are held. */
  const fetchAhead = (): void => {
    while (!closed && running < inFlight && held < maxAhead) {
      const p = pieces.find((x) => !x.arrived);
      if (!p) return;
      start(p);
    }
  };
  const plan = async (): Promise<void> => {
    const head = await direct(0, Math.min(size, opts.headBytes ?? HEAD_BYTES));
    // an array larger than the read-ahead allowance is read range by range (a 10M-cell file's connectivity
    // would otherwise be held whole beside its narrowed copy)
    pieces = appendedPieces(head, size).filter(([from, to]) => to - from <= maxAhead).map(([from, to]) => ({ start: from, end: to, handed: [] }));
    stats.planned = pieces.length;
    fetchAhead();
  };
  const drop = (p: Piece): void => {
    pieces = pieces.filter((x) => x !== p);
    if (p.arrived) held -= p.end - p.start;
    fetchAhead();
  };

  const read = async (offset: number, length: number): Promise<Uint8Array> => {
    const end = Math.min(size, offset + length);
    if (offset >= end) return new Uint8Array(0);
    await (planning ??= plan());
    const p = pieces.find((x) => x.start <= offset && end <= x.end);
    if (!p || overlaps(p.handed, offset, end)) return direct(offset, end);
    if (!p.arrived) start(p);
    const t0 = performance.now();
    const bytes = p.bytes ?? await p.arrived!.catch(() => undefined);
    const waited = performance.now() - t0;
    if (waited > 0.5) stats.waitedMs += waited;
    // dropped meanwhile (closed, failed), or another read took these bytes while this one waited
    if (!bytes || !pieces.includes(p) || overlaps(p.handed, offset, end)) return direct(offset, end);
    addRange(p.handed, offset, end);
    if (covered(p.handed, p.start, p.end)) drop(p);
    return bytes.subarray(offset - p.start, end - p.start);
  };

  return {
    name, size, read, stats, chunkBytes: BLOB_CHUNK_BYTES,
    async close() {
      closed = true;
      pieces = [];
      held = 0;
    },
  };
}

/**
 * Byte ranges [start, end) of the appended arrays of an XML file whose first bytes are `head`: from each
 * distinct `offset` attribute before `<AppendedData`, relative to the byte after its `_` marker, to the next
 * one (the last to the end of the file). Empty when the head holds no appended data (or ends first).
 */
export function appendedPieces(head: Uint8Array, size: number): [number, number][] {
  const text = new TextDecoder('latin1').decode(head);
  const at = text.indexOf('<AppendedData');
  // compressed arrays are read range by range (see the file comment)
  if (at < 0 || /<VTKFile\b[^>]*\scompressor\s*=/.test(text.slice(0, at))) return [];
  const marker = text.indexOf('_', text.indexOf('>', at));
  if (marker < 0) return [];
  const base = marker + 1;
  const offsets = new Set<number>();
  for (const m of text.slice(0, at).matchAll(/\soffset\s*=\s*["'](\d+)["']/g)) {
    const o = base + Number(m[1]);
    if (Number.isSafeInteger(o) && o < size) offsets.add(o);
  }
  const sorted = [...offsets].sort((a, b) => a - b);
  return sorted.map((o, i) => [o, sorted[i + 1] ?? size]);
}

/** True when [a, b) meets any of the sorted disjoint ranges `r` (flat [from, to, from, to, …]). */
function overlaps(r: number[], a: number, b: number): boolean {
  for (let i = 0; i < r.length; i += 2) if (r[i]! < b && a < r[i + 1]!) return true;
  return false;
}

/** Adds [a, b) (disjoint from every range of `r`) to the sorted ranges, merging neighbours. */
function addRange(r: number[], a: number, b: number): void {
  let i = 0;
  while (i < r.length && r[i]! < a) i += 2;
  r.splice(i, 0, a, b);
  for (let k = Math.max(0, i - 2); k + 2 < r.length;) {
    if (r[k + 1] === r[k + 2]) r.splice(k + 1, 2); else k += 2;
  }
}

/** True when the ranges cover [a, b) whole. */
function covered(r: number[], a: number, b: number): boolean {
  return r.length === 2 && r[0]! <= a && r[1]! >= b;
}
