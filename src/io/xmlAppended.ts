/**
 * One array of raw `<AppendedData>`, read from the file's source at its offset and decoded straight into
 * its final typed array: the block header first (every size checked against the bytes left before
 * anything is allocated), then
 *  - uncompressed data: read into the final buffer, or through the scratch when converted (`readArray`);
 *  - zlib blocks: read in batches into scratch (views for in-memory files) and inflated into the final
 *    buffer, or into scratch and converted chunk by chunk. Blocks may end inside an element.
 * Messages are those of `xmlBlocks.ts`, which reads inline and base64 data.
 */
import { noteScan } from '../model/arrayScans.ts';
import type { NumericArray } from '../model/fieldArray.ts';
import { inMemoryBytes, readExactly, readInto, type ByteSource } from './byteSource.ts';
import { ELEMENT_SIZE } from './elementTypes.ts';
import { SCRATCH_BYTES, Scratch, allocateTarget, convertChunk, finishDirect, isDirect, type ArrayPlan } from './elementConvert.ts';
import type { Checkpoint, InflateBlock, ReadParts } from './loadOptions.ts';
import { ChunkScan } from './partReads.ts';
import { readArray } from './sourceArrays.ts';
import {
  blockCountShort, blocksShort, checkDecodedSize, decodeHeaderWords, headerShort, headerSize, inflateInto, inflatedSize,
  zlibLayout, type BlockExpectation, type BlockFormat, type ZlibLayout,
} from './xmlBlocks.ts';

/** Scratch bytes for the inflated blocks of an array converted on reading when the inflater takes batches (8 MiB). */
const BATCH_SCRATCH_BYTES = 8 << 20;

/** Where the array lies and how the file is written. */
export interface AppendedArray {
  readonly source: ByteSource;
  /** First byte of the array's header in the file, and the end of the appended data. */
  readonly start: number;
  readonly end: number;
  readonly fmt: BlockFormat;
  readonly inflate: InflateBlock;
  readonly cp: Checkpoint;
  /** Reads large uncompressed arrays in parts on several threads (`LoadOptions.readParts`); absent: on this thread. */
  readonly parts?: ReadParts | undefined;
}

/** The decoded values and the file position just after the array. */
export interface AppendedResult {
  readonly values: NumericArray;
  readonly reached: number;
}

async function words(a: AppendedArray, at: number, count: number, what: string, where: string): Promise<number[]> {
  const left = a.end - at;
  if (count * headerSize(a.fmt) > left) throw headerShort(count, a.fmt, left, what, where);
  return decodeHeaderWords(await readExactly(a.source, at, count * headerSize(a.fmt)), count, a.fmt, what, where);
}

/**
 * Reads the array at `a.start` as `plan` says; `expectedValues` (tuples × components), when known, is
 * checked against the header before anything is allocated.
 */
export async function readAppendedArray(a: AppendedArray, plan: ArrayPlan, expectedValues: number | undefined): Promise<AppendedResult> {
  const where = plan.where, size = ELEMENT_SIZE[plan.type], hs = headerSize(a.fmt);
  const exp: BlockExpectation = { where, elementSize: size, ...(expectedValues !== undefined ? { expectedValues } : {}) };
  let pos = a.start;
  if (!a.fmt.compressed) {
    const [n] = await words(a, pos, 1, 'the block header', where);
    pos += hs;
    checkDecodedSize(n!, exp, 'block holds');
    if (n! > a.end - pos) throw new Error(`${where}: block header says ${n} bytes, only ${a.end - pos} are left in the file`);
    const values = await readArray(a.source, pos, n! / size, plan, { view: true, progress: { cp: a.cp, stage: 'arrays' }, parts: a.parts });
    return { values, reached: pos + n! };
  }
  const [nBlocks] = await words(a, pos, 1, 'the compression header', where);
  pos += hs;
  if ((nBlocks! + 2) * hs > a.end - pos) throw blockCountShort(nBlocks!, a.end - pos, where);
  const z = zlibLayout(nBlocks!, await words(a, pos, nBlocks! + 2, 'the compression header', where), exp);
  pos += (nBlocks! + 2) * hs;
  if (z.compressedTotal > a.end - pos) throw blocksShort(z.compressedTotal, a.end - pos, where);
  const values = await inflateBlocks(sourcePacked(a.source, pos), plan, z, a.inflate, a.cp);
  return { values, reached: pos + z.compressedTotal };
}

/** Where the compressed blocks of an array come from, in order. */
export interface PackedInput {
  /** The next `n` compressed bytes (in `scratch` unless they are in memory; valid until the next call). */
  next(n: number, scratch: Scratch): Promise<Uint8Array>;
  /** File position reached, for progress. */
  position(): number;
  /** Preferred bytes per `next` call (consecutive blocks are batched up to this). */
  readonly batchBytes: number;
}

/** Compressed blocks at `pos` of a source. */
function sourcePacked(src: ByteSource, pos: number): PackedInput {
  const mem = inMemoryBytes(src);
  return {
    async next(n, sc) {
      const at = pos;
      pos += n;
      if (mem) return mem.subarray(at, at + n);
      const b = sc.bytes(n);
      await readInto(src, at, b);
      return b;
    },
    position: () => pos,
    batchBytes: src.chunkBytes ?? SCRATCH_BYTES,
  };
}

/** Inflates the blocks of `z` (compressed data from `packed`) into the final array. */
export async function inflateBlocks(packed: PackedInput, plan: ArrayPlan, z: ZlibLayout, inflate: InflateBlock, cp: Checkpoint): Promise<NumericArray> {
  const size = ELEMENT_SIZE[plan.type], count = z.total / size;
  const out = allocateTarget(plan, count);
  // Converted arrays decoded into shared memory: the batch inflater's threads may write the scratch itself.
  const decoded = new Scratch(0, plan.shared === true && inflate.batch !== undefined && !isDirect(plan)), packedScratch = new Scratch(1);
  // Each run of finished elements is scanned while in cache, so the piece checks need not read the array again.
  const scan = new ChunkScan(plan, out);
  try {
    await inflateAll(packed, plan, z, out, decoded, packedScratch, inflate, cp, scan);
  } finally {
    decoded.release();
    packedScratch.release();
  }
  noteScan(out, scan.result());
  return out;
}

async function inflateAll(input: PackedInput, plan: ArrayPlan, z: ZlibLayout, out: NumericArray, decoded: Scratch, packedScratch: Scratch, inflate: InflateBlock, cp: Checkpoint,
  scan: ChunkScan): Promise<void> {
  const size = ELEMENT_SIZE[plan.type], where = plan.where;
  const direct = isDirect(plan);
  // Direct plans: the final array's element size is the file's.
  const outBytes = direct ? new Uint8Array(out.buffer, out.byteOffset + (plan.lead ?? 0) * size, z.total) : new Uint8Array(0);
  // Direct: inflated bytes land in the final array, finished element by element as blocks complete.
  // Converted: they land in scratch (`fill` bytes), converted whenever it is full.
  let to = 0, finished = 0, fill = 0, converted = 0;
  let dec = direct ? outBytes : decoded.bytes(Math.max(SCRATCH_BYTES, z.blockSize + size));
  const flush = () => {
    const k = Math.floor(fill / size);
    if (k === 0) return;
    convertChunk(plan, dec.subarray(0, k * size), k, out, converted);
    scan.add(converted, k);
    converted += k;
    dec.copyWithin(0, k * size, fill);
    fill -= k * size;
  };
  let k = 0;
  while (k < z.nBlocks) {
    // One batch: consecutive blocks up to the scratch size (at least one block).
    let batchBytes = 0, kEnd = k;
    while (kEnd < z.nBlocks && (kEnd === k || batchBytes + z.words[2 + kEnd]! <= input.batchBytes)) batchBytes += z.words[2 + kEnd++]!;
    const packed = await input.next(batchBytes, packedScratch);
    let from = 0;
    if (direct && inflate.batch && kEnd - k > 1) {
      // Several threads inflate the batch's blocks straight into their places in the final array.
      const blocks: Uint8Array[] = [], outs: Uint8Array[] = [];
      for (let j = k, f = from, t = to; j < kEnd; j++) {
        const cs = z.words[2 + j]!, us = inflatedSize(z, j);
        blocks.push(packed.subarray(f, f + cs)); outs.push(outBytes.subarray(t, t + us));
        f += cs; t += us;
      }
      checkBatch(await inflate.batch(blocks, outs), outs, k, z.nBlocks, where);
      for (const o of outs) { to += o.length; k++; }
      const done = Math.floor(to / size);
      if (done > finished) { finishDirect(plan, out, finished, done - finished); scan.add(finished, done - finished); finished = done; }
      await cp.at('inflating', input.position());
      continue;
    }
    if (!direct && inflate.batch && kEnd - k > 1) {
      // Converted plans: runs of the batch's blocks inflate at once into the scratch, converted between runs.
      while (k < kEnd) {
        flush();
        // A larger scratch for batches: fewer, larger hand-overs to the inflater's threads.
        const want = Math.max(fill + inflatedSize(z, k), Math.min(BATCH_SCRATCH_BYTES, z.total + size));
        if (want > dec.length) {
          const keep = dec.slice(0, fill);
          dec = decoded.bytes(want);
          dec.set(keep);
        }
        const blocks: Uint8Array[] = [], outs: Uint8Array[] = [];
        for (let t = fill; k + blocks.length < kEnd && t + inflatedSize(z, k + blocks.length) <= dec.length;) {
          const j = k + blocks.length, cs = z.words[2 + j]!, us = inflatedSize(z, j);
          blocks.push(packed.subarray(from, from + cs)); outs.push(dec.subarray(t, t + us));
          from += cs; t += us;
        }
        checkBatch(await inflate.batch(blocks, outs), outs, k, z.nBlocks, where);
        for (const o of outs) { fill += o.length; k++; }
        await cp.at('inflating', input.position());
      }
      continue;
    }
    for (; k < kEnd; k++) {
      const cs = z.words[2 + k]!, us = inflatedSize(z, k);
      if (direct) {
        inflateInto(packed.subarray(from, from + cs), outBytes.subarray(to, to + us), k, z.nBlocks, where, inflate);
        to += us;
        const done = Math.floor(to / size);
        if (done > finished) { finishDirect(plan, out, finished, done - finished); scan.add(finished, done - finished); finished = done; }
      } else {
        if (fill + us > dec.length) flush();
        if (fill + us > dec.length) {
          const keep = dec.slice(0, fill);
          dec = decoded.bytes(fill + us);
          dec.set(keep);
        }
        inflateInto(packed.subarray(from, from + cs), dec.subarray(fill, fill + us), k, z.nBlocks, where, inflate);
        fill += us;
      }
      from += cs;
      await cp.at('inflating', input.position());
    }
  }
  if (!direct) flush();
}

/** Throws the message of the first block of a batch (block `k0` onwards) that did not inflate to its declared size, as `inflateInto` words it. */
function checkBatch(got: readonly (number | string)[], outs: readonly Uint8Array[], k0: number, nBlocks: number, where: string): void {
  for (let j = 0; j < got.length; j++) {
    const g = got[j]!, n = outs[j]!.length, k = k0 + j;
    if (typeof g === 'string') throw new Error(`${where}: zlib block ${k} of ${nBlocks} is corrupt (${g})`);
    if (g > n) throw new Error(`${where}: zlib block ${k} of ${nBlocks} inflates past the ${n} bytes its header declares (stopped there)`);
    if (g !== n) throw new Error(`${where}: zlib block ${k} of ${nBlocks} inflates to ${g} bytes, the header says ${n}`);
  }
}
