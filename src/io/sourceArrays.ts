/**
 * Reading one uncompressed binary array from a `ByteSource` straight into its final typed array, so
 * nothing but that array is fresh memory and no other part of the file is read:
 *  - sources with synchronous positional reads (`readIntoSync`: files on disk under Node) are read chunk by
 *    chunk on this thread, a direct plan's bytes straight into the final array, floats and 64-bit ids through
 *    the chunk kernel's input (chunkKernel.ts), other conversions through the module scratch (`readChunkSync`,
 *    the read parts' code); no promise or thread-pool hop per chunk;
 *  - other sources that fill the caller's buffer (`readInto`) are read chunk by chunk into the module
 *    scratch (the next chunk read while this one is copied or converted) and copied or converted;
 *  - sources that hand out fresh buffers (`read` only: a Blob) give the final array itself when its file
 *    bytes are the model's bytes (viewed, swapped and checked in place), otherwise chunks to convert;
 *  - in-memory files are viewed (when allowed) or copied.
 */
import { noteScan } from '../model/arrayScans.ts';
import type { NumericArray } from '../model/fieldArray.ts';
import { inMemoryBytes, readExactly, readInto, type ByteSource } from './byteSource.ts';
import { ELEMENT_SIZE } from './elementTypes.ts';
import { ChunkScan, directBytes, readChunkSync, type FillSync } from './partReads.ts';
import { HOST_LITTLE, Scratch, allocateTarget, chunkElements, convertChunk, finishDirect, isDirect, type ArrayPlan } from './elementConvert.ts';
import { PARTS_MIN_BYTES, type Checkpoint, type ReadParts } from './loadOptions.ts';

/** Where progress of a read is reported. */
export interface ReadProgress {
  readonly cp: Checkpoint;
  readonly stage: string;
}

/** Options of `readArray`. Defaults: copies, no progress. */
export interface ReadArrayOptions {
  /**
   * For in-memory sources: return a view of the file's bytes when they are already the final array
   * (aligned, host order, no lead; ids are checked in place) instead of a copy. Default false (a copy
   * lets the file's buffer go, and be transferred alone).
   */
  view?: boolean;
  progress?: ReadProgress;
  /**
   * Reads large arrays of files on disk in parts on several threads, into shared memory (`LoadOptions.readParts`);
   * cell-type plans and arrays under its `minBytes` are read here.
   */
  parts?: ReadParts | undefined;
}

/**
 * Reads `count` elements of `plan.type` at byte `offset` of `src` into the array the plan asks for. The
 * caller has checked that `count` elements fit in the source.
 */
export async function readArray(src: ByteSource, offset: number, count: number, plan: ArrayPlan, opts: ReadArrayOptions = {}): Promise<NumericArray> {
  const size = ELEMENT_SIZE[plan.type];
  const mem = inMemoryBytes(src);
  const direct = isDirect(plan);
  // A view of the file's bytes is not shared memory: `plan.shared` reads into a fresh shared array.
  if (direct && !plan.lead && !plan.shared) {
    const hostOrder = plan.littleEndian === HOST_LITTLE || size === 1;
    if (mem && opts.view && hostOrder && (mem.byteOffset + offset) % size === 0) return finishedView(plan, mem, offset, count);
    if (!mem && !src.readInto) {
      const b = await readExactly(src, offset, count * size);
      if (b.byteOffset % size === 0) return finishedView(plan, b, 0, count);
      const out = allocateTarget(plan, count);
      new Uint8Array(out.buffer, out.byteOffset, b.length).set(b);
      finishDirect(plan, out, 0, count);
      return out;
    }
  }
  const parts = opts.parts;
  if (parts && !mem && src.descriptor !== undefined && plan.target !== 'cellTypes' && count * size >= (parts.minBytes ?? PARTS_MIN_BYTES)) {
    return readInParts(src, src.descriptor, offset, count, plan, parts, opts.progress);
  }
  if (!mem && src.readIntoSync) return readOnThisThread(src, src.readIntoSync.bind(src), offset, count, plan, opts.progress);
  const out = allocateTarget(plan, count);
  const outBytes = direct ? new Uint8Array(out.buffer, out.byteOffset + (plan.lead ?? 0) * size, count * size) : undefined;
  const step = chunkElements(size, src.chunkBytes);
  // Each chunk is scanned while in cache, so the piece checks need not read the array again (as parts do).
  const scan = new ChunkScan(plan, out);
  // Two scratch buffers: the next chunk is read while this one is copied or converted.
  const sc = [new Scratch(0), new Scratch(1)] as const;
  const fetch = (i: number): Promise<Uint8Array> | undefined => {
    if (mem || i >= count) return undefined;
    const k = Math.min(step, count - i), buf = sc[(i / step) & 1]!.bytes(k * size);
    return readInto(src, offset + i * size, buf).then(() => buf);
  };
  let next: Promise<Uint8Array> | undefined;
  try {
    next = fetch(0);
    for (let i = 0; i < count; i += step) {
      const k = Math.min(step, count - i), a = offset + i * size, e = a + k * size;
      if (outBytes && mem) {
        outBytes.set(mem.subarray(a, e), i * size);
      } else {
        let buf: Uint8Array;
        if (mem) {
          buf = sc[0].bytes(k * size);
          buf.set(mem.subarray(a, e));
        } else {
          buf = await next!;
          next = fetch(i + step);
        }
        if (outBytes) outBytes.set(buf, i * size);
        else convertChunk(plan, buf, k, out, i);
      }
      if (outBytes) finishDirect(plan, out, i, k);
      scan.add(i, k);
      if (opts.progress) await opts.progress.cp.at(opts.progress.stage, e);
    }
    await next;
  } catch (e) {
    // A read still in flight writes into the scratch: let it finish before the scratch is handed on.
    await next?.catch(() => undefined);
    throw e;
  } finally {
    sc[0].release();
    sc[1].release();
  }
  noteScan(out, scan.result());
  return out;
}

/**
 * `readArray` from a source with synchronous reads (a file on disk): chunk by chunk, a direct plan's bytes read
 * straight into the final array and finished there, others through the scratch (64-bit ids through the chunk
 * kernel's input) — the read parts' code (`readChunkSync`), with a checkpoint between chunks.
 */
async function readOnThisThread(src: ByteSource, fill: FillSync, offset: number, count: number, plan: ArrayPlan, progress: ReadProgress | undefined): Promise<NumericArray> {
  const size = ELEMENT_SIZE[plan.type];
  const out = allocateTarget(plan, count);
  const outBytes = directBytes(plan, out);
  const step = chunkElements(size, src.chunkBytes);
  const scan = new ChunkScan(plan, out);
  const sc = new Scratch(0);
  try {
    const scratch = outBytes ? new Uint8Array(0) : sc.bytes(Math.min(count, step) * size);
    for (let i = 0; i < count; i += step) {
      const k = Math.min(step, count - i);
      scan.add(i, k, readChunkSync(plan, out, outBytes, offset, i, k, fill, scratch));
      if (progress) await progress.cp.at(progress.stage, offset + (i + k) * size);
    }
  } finally {
    sc.release();
  }
  noteScan(out, scan.result());
  return out;
}

/** `readArray` through `parts`: the final array in shared memory, its parts filled on other threads. */
async function readInParts(src: ByteSource, descriptor: number, offset: number, count: number, plan: ArrayPlan, parts: ReadParts, progress: ReadProgress | undefined): Promise<NumericArray> {
  const out = allocateTarget(plan, count, true);
  // Only what can cross to a thread: the plan's data, not its functions.
  const { type, littleEndian, target, min, max, lead, where } = plan;
  const clean: ArrayPlan = { type, littleEndian, target, where, ...(min !== undefined ? { min } : {}), ...(max !== undefined ? { max } : {}), ...(lead !== undefined ? { lead } : {}) };
  const scan = await parts({ descriptor, name: src.name, size: src.size, offset, count, plan: clean, out, step: chunkElements(ELEMENT_SIZE[plan.type], src.chunkBytes) });
  // The piece checks take the scan instead of reading the array again.
  noteScan(out, scan);
  if (progress) await progress.cp.at(progress.stage, offset + count * ELEMENT_SIZE[plan.type]);
  return out;
}

/** The final array as a view of `count` elements of `bytes` at `offset` (aligned), swapped and checked in place. */
function finishedView(plan: ArrayPlan, bytes: Uint8Array, offset: number, count: number): NumericArray {
  const view = viewAs(allocateTarget(plan, 0), bytes, offset, count);
  finishDirect(plan, view, 0, count);
  return view;
}

/** A typed array of `like`'s kind viewing `count` elements of `mem` at `offset` (aligned). */
function viewAs(like: NumericArray, mem: Uint8Array, offset: number, count: number): NumericArray {
  const Ctor = like.constructor as new (b: ArrayBufferLike, o: number, n: number) => NumericArray;
  return new Ctor(mem.buffer, mem.byteOffset + offset, count);
}

const WHOLE: ArrayPlan = { type: 'UInt8', littleEndian: true, target: 'values', where: '' };

/**
 * The whole file: the bytes themselves for an in-memory source, otherwise one fresh buffer of the file's
 * size (filled through the scratch when the source has `readInto`; see the note at the top).
 */
export async function readWhole(src: ByteSource): Promise<Uint8Array> {
  const mem = inMemoryBytes(src);
  if (mem) return mem;
  return (await readArray(src, 0, src.size, { ...WHOLE, where: src.name })) as Uint8Array;
}
