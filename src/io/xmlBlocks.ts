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
import { unzlibSync } from 'fflate';
import { Base64Reader } from './base64.ts';
import type { Checkpoint } from './loadOptions.ts';

/** Sequential bytes of one array: a view into the file (raw) or decoded on demand (base64). */
export interface ByteSource {
  /** An upper bound on the bytes left. */
  available(): number;
  /** The next `n` bytes: a view into the file for raw data, a fresh aligned array for base64. */
  read(n: number): Uint8Array;
  /** Position in the file, for progress. */
  position(): number;
}

/** Raw bytes `bytes[start, end)`. */
export function rawSource(bytes: Uint8Array, start: number, end: number): ByteSource {
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
export function base64Source(bytes: Uint8Array, start: number, end: number, where: string): ByteSource {
  const r = new Base64Reader(bytes, start, end, where);
  return { available: () => r.available(), read: (n) => r.read(n), position: () => r.position() };
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

function headerWords(src: ByteSource, count: number, fmt: BlockFormat, what: string, where: string): number[] {
  const size = fmt.headerType === 'UInt64' ? 8 : 4;
  if (count * size > src.available()) {
    throw new Error(`${where}: ${what} needs ${count * size} bytes of ${fmt.headerType} header, only ${src.available()} are left`);
  }
  const b = src.read(count * size);
  const dv = new DataView(b.buffer, b.byteOffset, b.byteLength);
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

/** `holds` is the subject and verb for messages: "block holds" or "zlib blocks hold". */
function checkDecodedSize(bytes: number, exp: BlockExpectation, holds: string): void {
  if (bytes % exp.elementSize !== 0) {
    throw new Error(`${exp.where}: ${holds} ${bytes} bytes, not a whole number of ${exp.elementSize}-byte values`);
  }
  if (exp.expectedValues !== undefined && bytes !== exp.expectedValues * exp.elementSize) {
    throw new Error(`${exp.where}: declares ${exp.expectedValues} values, ${holds} ${bytes / exp.elementSize}`);
  }
}

/** Allocates a byte buffer, turning an allocation failure into a clear error. */
function allocate(n: number, where: string): Uint8Array {
  try {
    return new Uint8Array(n);
  } catch {
    throw new Error(`${where}: cannot allocate ${n} bytes for the array (not enough memory)`);
  }
}

/**
 * Reads one binary array (header and data) from `src` and returns its decoded bytes: a view into the
 * file where possible (raw, uncompressed), otherwise a fresh buffer starting at offset 0.
 */
export async function readBlocks(src: ByteSource, fmt: BlockFormat, exp: BlockExpectation, cp?: Checkpoint): Promise<Uint8Array> {
  const where = exp.where;
  if (!fmt.compressed) {
    const [n] = headerWords(src, 1, fmt, 'the block header', where);
    checkDecodedSize(n!, exp, 'block holds');
    if (n! > src.available()) throw new Error(`${where}: block header says ${n} bytes, only ${src.available()} are left in the file`);
    return src.read(n!);
  }
  const [nBlocks] = headerWords(src, 1, fmt, 'the compression header', where);
  const hs = fmt.headerType === 'UInt64' ? 8 : 4;
  if ((nBlocks! + 2) * hs > src.available()) {
    throw new Error(`${where}: compression header declares ${nBlocks} blocks, but only ${src.available()} bytes are left for the header and data`);
  }
  const words = headerWords(src, nBlocks! + 2, fmt, 'the compression header', where);
  const blockSize = words[0]!, lastRaw = words[1]!;
  const nb = nBlocks!;
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
  if (compressedTotal > src.available()) {
    throw new Error(`${where}: compressed blocks need ${compressedTotal} bytes, only ${src.available()} are left in the file`);
  }
  const out = allocate(total, where);
  const startPos = src.position();
  const packed = src.read(compressedTotal);
  const span = src.position() - startPos;
  let from = 0, to = 0;
  for (let k = 0; k < nb; k++) {
    const cs = words[2 + k]!, us = k === nb - 1 ? last : blockSize;
    const target = out.subarray(to, to + us);
    let got: Uint8Array;
    try {
      got = unzlibSync(packed.subarray(from, from + cs), { out: target });
    } catch (e) {
      throw new Error(`${where}: zlib block ${k} of ${nb} is corrupt (${e instanceof Error ? e.message : String(e)})`);
    }
    if (got.length !== us || got.buffer !== out.buffer) {
      throw new Error(`${where}: zlib block ${k} of ${nb} inflates to ${got.length} bytes, the header says ${us}`);
    }
    from += cs;
    to += us;
    if (cp) await cp.at('inflating', startPos + Math.round((span * from) / compressedTotal));
  }
  return out;
}
