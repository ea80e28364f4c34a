/**
 * Binary blocks of VTK XML arrays (inline `format="binary"` and appended data): the block header, and
 * zlib-compressed blocks decompressed straight into one output buffer.
 *
 * Layout (header words are `header_type` UInt32 or UInt64, in the file's byte order):
 *  - uncompressed: `[byteCount]` then `byteCount` bytes;
 *  - zlib (`vtkZLibDataCompressor`): `[nBlocks, blockSize, lastBlockSize, compressedSize_0 … _{n−1}]`
 *    then the compressed blocks back to back. Every block but the last inflates to `blockSize` bytes,
 *    the last to `lastBlockSize` (0 meaning a full block). `nBlocks = 0` is an empty array.
 *
 * Every size is checked against the bytes really present before anything is allocated.
 */
import { Unzlib, unzlibSync } from 'fflate';
import { Base64Reader } from './base64.ts';
import { claimMemory } from './memoryBudget.ts';
import type { Checkpoint, InflateBlock } from './loadOptions.ts';

/** Sequential bytes of one array: a view into the file (raw) or decoded on demand (base64). */
export interface BlockReader {
  /** An upper bound on the bytes left. */
  available(): number;
  /** The next `n` bytes: a view into the file for raw data, a fresh aligned array for base64. */
  read(n: number): Uint8Array;
  /** The next `n` bytes into `out[at, at + n)` (base64: decoded in place, no fresh array). */
  readInto?(out: Uint8Array, at: number, n: number): void;
  /** Position in the file, for progress. */
  position(): number;
}

/** Raw bytes `bytes[start, end)`. */
export function rawSource(bytes: Uint8Array, start: number, end: number): BlockReader {
  let pos = start;
  return {
    available: () => end - pos,
    read(n) {
      const v = bytes.subarray(pos, pos + n);
      pos += n;
      return v;
    },
    position: () => pos,
  };
}

/** Base64 text `bytes[start, end)`; errors name `where`. */
export function base64Source(bytes: Uint8Array, start: number, end: number, where: string): BlockReader {
  const r = new Base64Reader(bytes, start, end, where);
  return { available: () => r.available(), read: (n) => r.read(n), readInto: (out, at, n) => r.readInto(out, at, n), position: () => r.position() };
}

/** How the blocks of a file are laid out. */
export interface BlockFormat {
  headerType: 'UInt32' | 'UInt64';
  littleEndian: boolean;
  compressed: boolean;
}

/** What the caller knows about the array, for checks and messages. */
export interface BlockExpectation {
  /** `where` prefix of every message, e.g. `box.vtu: piece 0: DataArray "p"`. */
  where: string;
  /** Bytes per element (the decoded size must be a whole number of elements). */
  elementSize: number;
  /** Number of elements the file declares, when known (NumberOfTuples × NumberOfComponents). */
  expectedValues?: number;
}

/** Deflate cannot expand more than about 1032:1; a header claiming more is corrupt. */
const MAX_INFLATE_RATIO = 1032;
/** The smallest zlib stream with any output: 2 header bytes, 1 deflate byte, 4 checksum bytes. */
const MIN_ZLIB_BYTES = 7;

/** Bytes per header word. */
export const headerSize = (fmt: BlockFormat): number => (fmt.headerType === 'UInt64' ? 8 : 4);

/** The error for a header that does not fit in what is left of the data. */
export function headerShort(count: number, fmt: BlockFormat, available: number, what: string, where: string): Error {
  return new Error(`${where}: ${what} needs ${count * headerSize(fmt)} bytes of ${fmt.headerType} header, only ${available} are left`);
}

/** Decodes `count` header words from `b` (which holds them all). */
export function decodeHeaderWords(b: Uint8Array, count: number, fmt: BlockFormat, what: string, where: string): number[] {
  const size = headerSize(fmt);
  const dv = new DataView(b.buffer, b.byteOffset, count * size);
  const out: number[] = [];
  for (let i = 0; i < count; i++) {
    if (size === 4) {
      out.push(dv.getUint32(4 * i, fmt.littleEndian));
    } else {
      const lo = dv.getUint32(8 * i + (fmt.littleEndian ? 0 : 4), fmt.littleEndian);
      const hi = dv.getUint32(8 * i + (fmt.littleEndian ? 4 : 0), fmt.littleEndian);
      if (hi >= 0x200000) throw new Error(`${where}: ${what} holds a header value beyond 2^53 (${hi} × 2^32 + ${lo}); the header is corrupt`);
      out.push(hi * 4294967296 + lo);
    }
  }
  return out;
}

/** Reads `count` header words from `src`, checking they are there. */
export function headerWords(src: BlockReader, count: number, fmt: BlockFormat, what: string, where: string): number[] {
  if (count * headerSize(fmt) > src.available()) throw headerShort(count, fmt, src.available(), what, where);
  return decodeHeaderWords(src.read(count * headerSize(fmt)), count, fmt, what, where);
}

/** `holds` is the subject and verb for messages: "block holds" or "zlib blocks hold". */
export function checkDecodedSize(bytes: number, exp: BlockExpectation, holds: string): void {
  if (bytes % exp.elementSize !== 0) {
    throw new Error(`${exp.where}: ${holds} ${bytes} bytes, not a whole number of ${exp.elementSize}-byte values`);
  }
  if (exp.expectedValues !== undefined && bytes !== exp.expectedValues * exp.elementSize) {
    throw new Error(`${exp.where}: declares ${exp.expectedValues} values, ${holds} ${bytes / exp.elementSize}`);
  }
}

/** Allocates a byte buffer, turning an allocation failure into a clear error. */
function allocate(n: number, where: string): Uint8Array {
  claimMemory(n, where);
  try {
    return new Uint8Array(n);
  } catch {
    throw new Error(`${where}: cannot allocate ${n} bytes for the array (not enough memory)`);
  }
}

/** The error for a block count whose header alone does not fit in what is left. */
export function blockCountShort(nBlocks: number, available: number, where: string): Error {
  return new Error(`${where}: compression header declares ${nBlocks} blocks, but only ${available} bytes are left for the header and data`);
}

/** A checked zlib block layout: sizes of every block, compressed and inflated. */
export interface ZlibLayout {
  readonly nBlocks: number;
  readonly blockSize: number;
  /** Inflated size of the last block. */
  readonly last: number;
  /** Inflated bytes of all blocks. */
  readonly total: number;
  /** Compressed bytes of all blocks. */
  readonly compressedTotal: number;
  /** `words[2 + k]` is the compressed size of block k (the header words after the block count). */
  readonly words: readonly number[];
}

/** Inflated size of block `k`. */
export const inflatedSize = (z: ZlibLayout, k: number): number => (k === z.nBlocks - 1 ? z.last : z.blockSize);

/**
 * Checks the words after the block count (`[blockSize, lastBlockSize, compressedSizes…]`): the last block
 * no larger than the others, the total against the expectation, each block's ratio within what zlib can do.
 */
export function zlibLayout(nBlocks: number, words: readonly number[], exp: BlockExpectation): ZlibLayout {
  const where = exp.where;
  const blockSize = words[0]!, lastRaw = words[1]!;
  const nb = nBlocks;
  if (lastRaw > blockSize) throw new Error(`${where}: compression header's last block (${lastRaw} bytes) is larger than the block size (${blockSize} bytes)`);
  const last = lastRaw === 0 ? blockSize : lastRaw;
  const total = nb === 0 ? 0 : (nb - 1) * blockSize + last;
  checkDecodedSize(total, exp, 'zlib blocks hold');
  let compressedTotal = 0;
  for (let k = 0; k < nb; k++) {
    const cs = words[2 + k]!, us = k === nb - 1 ? last : blockSize;
    if (us > 0 && cs < MIN_ZLIB_BYTES) throw new Error(`${where}: zlib block ${k} of ${nb} is ${cs} bytes, too short to hold ${us} bytes`);
    if (us > cs * MAX_INFLATE_RATIO + 64) throw new Error(`${where}: zlib block ${k} of ${nb} claims ${us} bytes from ${cs} compressed bytes, more than zlib can expand; the header is corrupt`);
    compressedTotal += cs;
  }
  return { nBlocks: nb, blockSize, last, total, compressedTotal, words };
}

/** The error for compressed blocks longer than what is left of the data. */
export function blocksShort(compressedTotal: number, available: number, where: string): Error {
  return new Error(`${where}: compressed blocks need ${compressedTotal} bytes, only ${available} are left in the file`);
}

/** Compressed bytes pushed to fflate at a time when streaming (at most about 64 MiB inflated, zlib's ratio being at most 1032). */
const INFLATE_PIECE = 64 << 10;

/** Thrown inside fflate's stream callback to stop a stream that is longer than declared. */
const OVERFLOW = Symbol('inflates past the declared size');

/** Adler-32 of `b` (RFC 1950 §8.2), the checksum at the end of every zlib stream. */
export function adler32(b: Uint8Array): number {
  let a = 1, s = 0;
  for (let i = 0; i < b.length;) {
    const end = Math.min(b.length, i + 5552);
    for (; i < end; i++) { a += b[i]!; s += a; }
    a %= 65521; s %= 65521;
  }
  return ((s << 16) | a) >>> 0;
}

/** fflate's stream, fed in pieces and stopped at the first output chunk past `out`'s end; returns the bytes it holds (more than `out.length` when longer). */
function streamInflate(block: Uint8Array, out: Uint8Array): number {
  let got = 0;
  const z = new Unzlib((chunk) => {
    if (got + chunk.length > out.length) { got += chunk.length; throw OVERFLOW; }
    out.set(chunk, got);
    got += chunk.length;
  });
  try {
    for (let at = 0; at < block.length; at += INFLATE_PIECE) z.push(block.subarray(at, at + INFLATE_PIECE), at + INFLATE_PIECE >= block.length);
  } catch (e) {
    if (e !== OVERFLOW) throw e;
  }
  return got;
}

/**
 * fflate's inflate into `out`, returning the bytes the stream holds (a count above `out.length` when it
 * holds more). A block of up to `INFLATE_PIECE` compressed bytes is inflated in one call (fflate drops
 * what passes `out`'s end, so at most about 64 MiB of work) and checked by its Adler-32; a larger block,
 * or one whose checksum differs, is streamed and stopped at the first chunk past the end, so a zlib bomb
 * is never inflated whole.
 */
export const fflateInflate: InflateBlock = (block, out) => {
  if (block.length <= INFLATE_PIECE && block.length >= 6) {
    const r = unzlibSync(block, { out });
    const n = block.length;
    const sum = ((block[n - 4]! << 24) | (block[n - 3]! << 16) | (block[n - 2]! << 8) | block[n - 1]!) >>> 0;
    if (r.length === out.length && adler32(out) === sum) return out.length;
    if (r.length < out.length) return r.length;
  }
  const got = streamInflate(block, out);
  if (got === out.length && adler32(out) !== ((block[block.length - 4]! << 24 | block[block.length - 3]! << 16 | block[block.length - 2]! << 8 | block[block.length - 1]!) >>> 0)) {
    throw new Error('the Adler-32 checksum does not match the inflated data');
  }
  return got;
};

/** Inflates zlib block `k` of `nb` into all of `target`, with the block's messages. */
export function inflateInto(block: Uint8Array, target: Uint8Array, k: number, nb: number, where: string, inflate: InflateBlock = fflateInflate): void {
  let got: number;
  try {
    got = inflate(block, target);
  } catch (e) {
    throw new Error(`${where}: zlib block ${k} of ${nb} is corrupt (${e instanceof Error ? e.message : String(e)})`);
  }
  if (got > target.length) throw new Error(`${where}: zlib block ${k} of ${nb} inflates past the ${target.length} bytes its header declares (stopped there)`);
  if (got !== target.length) throw new Error(`${where}: zlib block ${k} of ${nb} inflates to ${got} bytes, the header says ${target.length}`);
}

/**
 * Reads one binary array (header and data) from `src` and returns its decoded bytes: a view into the
 * file where possible (raw, uncompressed), otherwise a fresh buffer starting at offset 0.
 */
export async function readBlocks(src: BlockReader, fmt: BlockFormat, exp: BlockExpectation, cp?: Checkpoint, inflate?: InflateBlock): Promise<Uint8Array> {
  const where = exp.where;
  if (!fmt.compressed) {
    const [n] = headerWords(src, 1, fmt, 'the block header', where);
    checkDecodedSize(n!, exp, 'block holds');
    if (n! > src.available()) throw new Error(`${where}: block header says ${n} bytes, only ${src.available()} are left in the file`);
    return src.read(n!);
  }
  const [nBlocks] = headerWords(src, 1, fmt, 'the compression header', where);
  const hs = headerSize(fmt);
  if ((nBlocks! + 2) * hs > src.available()) throw blockCountShort(nBlocks!, src.available(), where);
  const z = zlibLayout(nBlocks!, headerWords(src, nBlocks! + 2, fmt, 'the compression header', where), exp);
  if (z.compressedTotal > src.available()) throw blocksShort(z.compressedTotal, src.available(), where);
  const out = allocate(z.total, where);
  const startPos = src.position();
  const packed = src.read(z.compressedTotal);
  const span = src.position() - startPos;
  let from = 0, to = 0;
  for (let k = 0; k < z.nBlocks; k++) {
    const cs = z.words[2 + k]!, us = inflatedSize(z, k);
    inflateInto(packed.subarray(from, from + cs), out.subarray(to, to + us), k, z.nBlocks, where, inflate);
    from += cs;
    to += us;
    if (cp) await cp.at('inflating', startPos + Math.round((span * from) / z.compressedTotal));
  }
  return out;
}
