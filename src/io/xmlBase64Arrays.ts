/**
 * One base64 binary array (inline `format="binary"`, or in base64 `<AppendedData>`) decoded straight
 * into its final typed array: uncompressed data are decoded chunk by chunk into the final buffer (or
 * into the scratch and converted), zlib blocks are decoded in batches into the scratch and inflated like
 * raw appended data (`xmlAppended.ts`). Messages are those of `xmlBlocks.ts` and
 * `base64.ts`, with positions in the file.
 *
 * The text comes from the file's bytes in memory, or from its source in windows that end on whole
 * 4-character groups (so appended base64 data are never read whole).
 */
import { noteScan } from '../model/arrayScans.ts';
import type { NumericArray } from '../model/fieldArray.ts';
import { Base64Reader } from './base64.ts';
import type { ByteSource } from './byteSource.ts';
import { ELEMENT_SIZE } from './elementTypes.ts';
import { SCRATCH_BYTES, Scratch, allocateTarget, chunkElements, convertChunk, finishDirect, isDirect, type ArrayPlan } from './elementConvert.ts';
import type { FetchText } from './asciiWindows.ts';
import { decodeBase64InWindows } from './base64Windows.ts';
import type { Base64Batch, Checkpoint, InflateBlock } from './loadOptions.ts';
import { ChunkScan } from './partReads.ts';
import { inflateBlocks } from './xmlAppended.ts';
import {
  blockCountShort, blocksShort, checkDecodedSize, decodeHeaderWords, headerShort, headerSize, zlibLayout,
  type BlockExpectation, type BlockFormat,
} from './xmlBlocks.ts';

/** Base64 text being decoded in order. */
export interface Base64Input {
  /** An upper bound on the bytes still to come. */
  available(): number;
  /** File offset of the next character. */
  position(): number;
  /** Decodes up to `n` bytes into `out[at, at + n)`; fewer only at the end of the text. Throws on bad text. */
  readSome(out: Uint8Array, at: number, n: number): Promise<number>;
  /** Releases what the input holds (a scratch window). */
  release(): void;
  /**
   * The text still to decode, as file offsets `[at, end)` and a way to read it, when no decoded byte is held
   * back (so the next byte starts a group); for decoding on several threads. The input itself does not move.
   */
  rest?(): { fetch: FetchText; at: number; end: number } | undefined;
}

/** Base64 text `text[start, end)` already in memory (positions are offsets in `text`). */
export function memoryBase64(text: Uint8Array, start: number, end: number, where: string): Base64Input {
  const r = new Base64Reader(text, start, end, where);
  return {
    available: () => r.available(), position: () => r.position(), readSome: async (out, at, n) => r.readSome(out, at, n), release: () => undefined,
    rest: () => (r.carried() ? undefined : { fetch: (at, w) => { w.set(text.subarray(at, at + w.length)); }, at: r.position(), end }),
  };
}

const isSpace = (c: number) => c === 32 || c === 10 || c === 13 || c === 9;

/** Length of the longest start of `text` holding whole 4-character groups (whitespace does not count). */
function wholeGroups(text: Uint8Array): number {
  let chars = 0;
  for (let i = 0; i < text.length; i++) if (!isSpace(text[i]!)) chars++;
  let keep = chars - (chars % 4);
  if (keep === chars) return text.length;
  for (let i = 0; i < text.length; i++) if (!isSpace(text[i]!) && keep-- === 0) return i;
  return 0;
}

/**
 * Base64 text `[start, end)` of a source, read in windows of the scratch size ending on whole groups.
 * Windows stop at `aheadEnd` (where the next array's text starts) unless the text runs on past it.
 */
export function sourceBase64(src: ByteSource, start: number, end: number, where: string, aheadEnd = end): Base64Input {
  const r = new Base64Reader(new Uint8Array(0), 0, 0, where);
  r.setWindow(new Uint8Array(0), 0, 0, start);
  const sc = new Scratch(2);
  let windowEnd = start;
  const refill = async () => {
    const from = r.position(), stop = from < aheadEnd ? aheadEnd : end;
    for (let len = Math.min(SCRATCH_BYTES, stop - from); ; len = Math.min(2 * len, end - from)) {
      const text = sc.bytes(len);
      await readIntoSource(src, from, text);
      const cut = from + len >= end ? len : wholeGroups(text);
      // A window without a whole group: take a longer one.
      if (cut > 0) {
        r.setWindow(text, 0, cut, from);
        windowEnd = from + cut;
        return;
      }
    }
  };
  return {
    available: () => r.carried() + Math.floor((end - r.position()) / 4) * 3,
    position: () => r.position(),
    async readSome(out, at, n) {
      let got = 0;
      for (;;) {
        got += r.readSome(out, at + got, n - got);
        if (got === n || windowEnd >= end) return got;
        await refill();
      }
    },
    release: () => sc.release(),
    rest: () => (r.carried() ? undefined : { fetch: (at, w) => readIntoSource(src, at, w), at: r.position(), end }),
  };
}

async function readIntoSource(src: ByteSource, offset: number, target: Uint8Array): Promise<void> {
  if (src.readInto) return src.readInto(offset, target);
  target.set((await src.read(offset, target.length)).subarray(0, target.length));
}

/** Decodes exactly `n` bytes into `out[at…]`; `done` of `total` were decoded before, for the message. */
async function fill(input: Base64Input, out: Uint8Array, at: number, n: number, done: number, total: number, where: string): Promise<void> {
  const got = await input.readSome(out, at, n);
  if (got < n) throw new Error(`${where}: base64 data end after ${done + got} of ${total} bytes`);
}

/** `count` header words, checked to be there. */
async function words(input: Base64Input, count: number, fmt: BlockFormat, what: string, where: string): Promise<number[]> {
  const n = count * headerSize(fmt);
  if (n > input.available()) throw headerShort(count, fmt, input.available(), what, where);
  const b = new Uint8Array(n);
  await fill(input, b, 0, n, 0, n, where);
  return decodeHeaderWords(b, count, fmt, what, where);
}

/**
 * Decodes the array `input` holds (header, then data) as `plan` says; `expectedValues`, when known, is
 * checked against the header before anything is allocated.
 */
export async function readBase64Array(input: Base64Input, fmt: BlockFormat, plan: ArrayPlan, expectedValues: number | undefined, inflate: InflateBlock, cp: Checkpoint,
  decode?: Base64Batch): Promise<NumericArray> {
  const where = plan.where, size = ELEMENT_SIZE[plan.type];
  const exp: BlockExpectation = { where, elementSize: size, ...(expectedValues !== undefined ? { expectedValues } : {}) };
  if (fmt.compressed) {
    const [nBlocks] = await words(input, 1, fmt, 'the compression header', where);
    if ((nBlocks! + 2) * headerSize(fmt) > input.available()) throw blockCountShort(nBlocks!, input.available(), where);
    const z = zlibLayout(nBlocks!, await words(input, nBlocks! + 2, fmt, 'the compression header', where), exp);
    if (z.compressedTotal > input.available()) throw blocksShort(z.compressedTotal, input.available(), where);
    let done = 0;
    const packed = {
      async next(n: number, sc: Scratch) {
        const b = sc.bytes(n);
        await fill(input, b, 0, n, done, z.compressedTotal, where);
        done += n;
        return b;
      },
      position: () => input.position(),
      batchBytes: SCRATCH_BYTES,
    };
    return inflateBlocks(packed, plan, z, inflate, cp);
  }
  const [n] = await words(input, 1, fmt, 'the block header', where);
  checkDecodedSize(n!, exp, 'block holds');
  if (n! > input.available()) throw new Error(`${where}: block header says ${n} bytes, only ${input.available()} are left in the file`);
  const count = n! / size;
  const out = allocateTarget(plan, count);
  const outBytes = isDirect(plan) ? new Uint8Array(out.buffer, out.byteOffset + (plan.lead ?? 0) * size, n!) : undefined;
  const step = chunkElements(size);
  const rest = decode && n! > 0 ? input.rest?.() : undefined;
  if (rest && await inWindows(decode!, rest, n!, plan, out, outBytes, cp)) return out;
  const sc = new Scratch(0);
  // Each chunk is scanned while in cache, so the piece checks need not read the array again.
  const scan = new ChunkScan(plan, out);
  try {
    for (let i = 0; i < count; i += step) {
      const k = Math.min(step, count - i);
      if (outBytes) {
        await fill(input, outBytes, i * size, k * size, i * size, n!, where);
        finishDirect(plan, out, i, k);
      } else {
        const buf = sc.bytes(k * size);
        await fill(input, buf, 0, k * size, i * size, n!, where);
        convertChunk(plan, buf, k, out, i);
      }
      scan.add(i, k);
      await cp.at('decoding base64', input.position());
    }
  } finally {
    sc.release();
  }
  noteScan(out, scan.result());
  return out;
}

/**
 * The uncompressed data (`n` bytes) decoded on several threads (`base64Windows.ts`) into `out` (through
 * `outBytes` when the file's bytes are the model's, else converted from a temporary copy). False when a window
 * did not decode cleanly: the caller then decodes on this thread, for the one-thread message.
 */
async function inWindows(decode: Base64Batch, rest: NonNullable<ReturnType<NonNullable<Base64Input['rest']>>>, n: number, plan: ArrayPlan,
  out: NumericArray, outBytes: Uint8Array | undefined, cp: Checkpoint): Promise<boolean> {
  const size = ELEMENT_SIZE[plan.type], all = outBytes ?? new Uint8Array(n);
  const ok = await decodeBase64InWindows(decode, rest.fetch, rest.at, rest.end, n, (bytes, first) => all.set(bytes, first), cp);
  if (!ok) return false;
  const count = n / size;
  if (outBytes) finishDirect(plan, out, 0, count);
  else {
    const step = chunkElements(size);
    for (let i = 0; i < count; i += step) {
      const k = Math.min(step, count - i);
      convertChunk(plan, all.subarray(i * size, (i + k) * size), k, out, i);
    }
  }
  return true;
}
