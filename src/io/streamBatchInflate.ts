/**
 * A batch inflater on the platform's own zlib: `DecompressionStream('deflate')` (the Compression Streams
 * standard; `'deflate'` is the zlib format of RFC 1950, Adler-32 checked by the platform), present in
 * browsers and their workers and in Node 18 and later. It is several times faster than a pure-JavaScript
 * inflate, so the app's compute worker decodes compressed XML arrays with it (`InflateBlock.batch`, used by
 * src/io/xmlAppended.ts for runs of whole blocks that land in the final array).
 *
 * Only the plain case is taken from the stream: a block that inflates without error to exactly the size
 * its header declares. Any other block (corrupt, short, long, bad checksum, trailing bytes) is inflated again
 * by the single-block inflater given (fflate's by default), so its result and message are exactly those of
 * a load without this hook. A long block is stopped at its first chunk past the declared size, never
 * inflated whole. zlib is deterministic: the bytes are those of any other inflater.
 */
import type { InflateBatch, InflateBlock } from './loadOptions.ts';
import { fflateInflate } from './xmlBlocks.ts';

/** Blocks of one batch inflating at once (their streams interleave on the thread; more gains nothing measurable). */
export const STREAM_BLOCKS_IN_FLIGHT = 4;

/** The constructor of a decompression stream, as the Compression Streams standard defines it. */
export type DecompressionStreamClass = new (format: 'deflate') => { readable: ReadableStream<Uint8Array>; writable: WritableStream<Uint8Array> };

/** The platform's `DecompressionStream`, or undefined where it is missing (older runtimes). */
export function platformDecompressionStream(): DecompressionStreamClass | undefined {
  const c = (globalThis as { DecompressionStream?: unknown }).DecompressionStream;
  return typeof c === 'function' ? (c as DecompressionStreamClass) : undefined;
}

/**
 * Inflates one zlib stream into `out` with the platform's stream; true when it held exactly `out.length`
 * bytes and the platform found it sound (checksum included), false otherwise (`out` may then hold part of
 * the data; the caller inflates the block again).
 */
export async function streamInflateExact(Stream: DecompressionStreamClass, block: Uint8Array, out: Uint8Array): Promise<boolean> {
  let ds;
  try {
    ds = new Stream('deflate');
  } catch {
    return false;
  }
  const writer = ds.writable.getWriter(), reader = ds.readable.getReader();
  // Errors surface on the reader; the writer's promises would only repeat them.
  writer.write(block).catch(() => undefined);
  writer.close().catch(() => undefined);
  let got = 0;
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) return got === out.length;
      if (got + value.length > out.length) {
        reader.cancel().catch(() => undefined);
        return false;
      }
      out.set(value, got);
      got += value.length;
    }
  } catch {
    return false;
  }
}

/**
 * `single` (fflate's inflater by default) with a `batch` that inflates through the platform's
 * `DecompressionStream`, a few blocks at once; without that platform class (or given `null`), `single` as it is
 * (no batch).
 * Results per block are those `single` gives: the byte count, or the message of the Error it throws.
 */
export function streamBatchInflate(single: InflateBlock = fflateInflate, Stream: DecompressionStreamClass | null = platformDecompressionStream() ?? null): InflateBlock {
  if (!Stream) return single;
  const again = (block: Uint8Array, out: Uint8Array): number | string => {
    try {
      return single(block, out);
    } catch (e) {
      return e instanceof Error ? e.message : String(e);
    }
  };
  const batch: InflateBatch = async (blocks, outs) => {
    const got: (number | string)[] = new Array(blocks.length);
    let next = 0;
    const lane = async () => {
      for (let i = next++; i < blocks.length; i = next++) {
        const block = blocks[i]!, out = outs[i]!;
        got[i] = (await streamInflateExact(Stream, block, out)) ? out.length : again(block, out);
      }
    };
    await Promise.all(Array.from({ length: Math.min(STREAM_BLOCKS_IN_FLIGHT, blocks.length) }, lane));
    return got;
  };
  const inflate = (block: Uint8Array, out: Uint8Array) => single(block, out);
  return Object.assign(inflate, { batch });
}
