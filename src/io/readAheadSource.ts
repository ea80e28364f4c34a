/**
 * A `ByteSource` over a `File` or `Blob` that reads the whole file ahead, in slices and in file order, while
 * the reader decodes what has arrived: the platform's file read (done off the JavaScript thread) overlaps
 * with parsing, narrowing and checking instead of alternating with them. Reads the reader asks for are
 * served from the slices that hold them; a slice the sweep has not started is fetched at once, so a reader
 * that jumps (XML arrays are read in the order they are declared, not the order they lie in) never waits for
 * the sweep to get there. A slice is dropped once every byte of it has been handed out, and the sweep pauses
 * while `maxAheadBytes` wait unclaimed, so a file larger than that is never held twice over. Any byte not
 * held (dropped, or asked for again) is read from the blob directly: the bytes handed out are always the
 * file's. Uses only the Blob API (no DOM): runs in a worker and under Node.
 */
import { BLOB_CHUNK_BYTES } from './blobSource.ts';
import type { ByteSource } from './byteSource.ts';

/** Options of `readAheadSource`; every default is here. */
export interface ReadAheadOptions {
  /** Bytes per slice (default `BLOB_CHUNK_BYTES`, 16 MiB: each blob read carries a fixed cost). */
  sliceBytes?: number;
  /** Slices the sweep keeps in flight at once (default 2). */
  inFlight?: number;
  /** Unclaimed bytes held before the sweep pauses (default 256 MiB). */
  maxAheadBytes?: number;
}

/** What a read-ahead source measured, for the viewer benchmark's phases (ms of `performance.now()`). */
export interface ReadAheadStats {
  /** When the first read was asked for, and when the last slice of the sweep (or the last direct read) arrived. */
  firstAskedAt: number;
  lastArrivedAt: number;
  /** Time the reader spent waiting for bytes that had not arrived yet (ms, summed over its reads). */
  waitedMs: number;
  /** Bytes fetched from the blob: by the sweep, and directly (slices dropped or asked for again). */
  sweptBytes: number;
  directBytes: number;
}

/** A read-ahead source and its measurements. */
export interface ReadAheadSource extends ByteSource {
  readonly stats: ReadAheadStats;
  /** Stops the sweep (a cancelled load): slices in flight are dropped when they arrive. */
  close(): Promise<void>;
}

interface Slice {
  /** The slice's bytes once arrived. */
  bytes?: Uint8Array;
  arrived: Promise<Uint8Array>;
  /** Bytes of it handed out so far (a byte asked for twice counts twice: then it is dropped early, and read directly). */
  handed: number;
}

/** A read-ahead source over `blob`; `name` defaults to the File's name. */
export function readAheadSource(blob: Blob, name: string = (blob as Partial<File>).name ?? 'blob', opts: ReadAheadOptions = {}): ReadAheadSource {
  const size = blob.size;
  const sliceBytes = Math.max(1, Math.floor(opts.sliceBytes ?? BLOB_CHUNK_BYTES));
  const inFlight = Math.max(1, Math.floor(opts.inFlight ?? 2));
  const maxAhead = Math.max(sliceBytes, opts.maxAheadBytes ?? 256 << 20);
  const count = Math.ceil(size / sliceBytes);
  const slices = new Map<number, Slice>();
  /** Slices started (by the sweep or on demand): never fetched twice by the sweep. */
  const started = new Uint8Array(count);
  const stats: ReadAheadStats = { firstAskedAt: NaN, lastArrivedAt: NaN, waitedMs: 0, sweptBytes: 0, directBytes: 0 };
  let next = 0, running = 0, held = 0, closed = false;

  const sliceEnd = (i: number) => Math.min(size, (i + 1) * sliceBytes);
  const start = (i: number): Slice => {
    started[i] = 1;
    const s: Slice = {
      handed: 0,
      arrived: blob.slice(i * sliceBytes, sliceEnd(i)).arrayBuffer().then((b) => {
        const bytes = new Uint8Array(b);
        stats.sweptBytes += bytes.length;
        stats.lastArrivedAt = performance.now();
        if (!closed && slices.get(i) === s) { s.bytes = bytes; held += bytes.length; }
        return bytes;
      }),
    };
    slices.set(i, s);
    return s;
  };
  // The sweep: file order, `inFlight` at a time, paused while `maxAhead` bytes wait unclaimed.
  const sweep = (): void => {
    while (!closed && running < inFlight && next < count && held < maxAhead) {
      const i = next++;
      if (started[i]) continue;
      running++;
      start(i).arrived.then(() => { running--; sweep(); }, () => { running--; });
    }
  };
  const release = (i: number, s: Slice, n: number): void => {
    s.handed += n;
    if (s.handed >= sliceEnd(i) - i * sliceBytes && slices.get(i) === s) {
      slices.delete(i);
      if (s.bytes) held -= s.bytes.length;
      sweep();
    }
  };
  const direct = async (offset: number, end: number): Promise<Uint8Array> => {
    const b = new Uint8Array(await blob.slice(offset, end).arrayBuffer());
    stats.directBytes += b.length;
    stats.lastArrivedAt = performance.now();
    return b;
  };

  const read = async (offset: number, length: number): Promise<Uint8Array> => {
    const end = Math.min(size, offset + length);
    if (offset >= end) return new Uint8Array(0);
    if (Number.isNaN(stats.firstAskedAt)) stats.firstAskedAt = performance.now();
    const first = Math.floor(offset / sliceBytes), last = Math.floor((end - 1) / sliceBytes);
    const parts: { i: number; s: Slice | undefined; from: number; to: number }[] = [];
    for (let i = first; i <= last; i++) {
      const from = Math.max(offset, i * sliceBytes), to = Math.min(end, sliceEnd(i));
      // a slice not started is fetched now; one already handed out whole (dropped) is read directly
      const s = slices.get(i) ?? (started[i] || closed ? undefined : start(i));
      parts.push({ i, s, from, to });
    }
    sweep();
    const t0 = performance.now();
    const got = await Promise.all(parts.map((p) => (p.s ? p.s.arrived : direct(p.from, p.to))));
    const waited = performance.now() - t0;
    if (waited > 0.5) stats.waitedMs += waited;
    const out = new Uint8Array(end - offset);
    parts.forEach((p, k) => {
      const b = got[k]!;
      out.set(p.s ? b.subarray(p.from - p.i * sliceBytes, p.to - p.i * sliceBytes) : b, p.from - offset);
      if (p.s) release(p.i, p.s, p.to - p.from);
    });
    return out;
  };

  return {
    name, size, read, stats, chunkBytes: sliceBytes,
    async close() {
      closed = true;
      slices.clear();
      held = 0;
    },
  };
}
