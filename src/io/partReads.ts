/**
 * One part of an uncompressed array read on a thread of its own (`LoadOptions.readParts`): the elements
 * `[from, to)` are read chunk by chunk into the thread's scratch and copied or converted into the shared final
 * array exactly as the one-thread read (`readArray` in sourceArrays.ts) does it, with the same chunk boundaries
 * when parts start on multiples of its chunk, so values and messages are the same.
 *
 * Pure: the caller hands in a synchronous `fill` (a positional read of the file on a worker thread).
 */
import type { NumericArray } from '../model/fieldArray.ts';
import { ELEMENT_SIZE } from './elementTypes.ts';
import { convertChunk, finishDirect, isDirect, type ArrayPlan } from './elementConvert.ts';

/** Fills all of `target` with the file's bytes from byte `offset` (throws when the file ends first). */
export type FillSync = (offset: number, target: Uint8Array) => void;

/**
 * Reads file elements `[from, to)` of an array whose element 0 lies at byte `offset` into `out` (the plan's final
 * array, `lead` slots included), `step` elements at a time through `scratch` (at least `step` elements, at byte 0
 * of its own buffer so it is aligned). Throws the one-thread read's message for the part's first bad element.
 */
export function readPartSync(plan: ArrayPlan, out: NumericArray, offset: number, from: number, to: number, step: number,
  fill: FillSync, scratch: Uint8Array): void {
  const size = ELEMENT_SIZE[plan.type];
  const outBytes = isDirect(plan) ? new Uint8Array(out.buffer, out.byteOffset + (plan.lead ?? 0) * size, (out.length - (plan.lead ?? 0)) * size) : undefined;
  for (let i = from; i < to; i += step) {
    const k = Math.min(step, to - i), buf = scratch.subarray(0, k * size);
    fill(offset + i * size, buf);
    if (outBytes) {
      outBytes.set(buf, i * size);
      finishDirect(plan, out, i, k);
    } else {
      convertChunk(plan, buf, k, out, i);
    }
  }
}

/**
 * Contiguous parts of `count` elements for `workers` threads: `[from, to)` pairs, each but the last a whole
 * number of `step`-element chunks, as equal as that allows (fewer parts than threads for small arrays).
 */
export function partRanges(count: number, step: number, workers: number): [number, number][] {
  const chunks = Math.ceil(count / step), parts = Math.max(1, Math.min(workers, chunks));
  const per = Math.ceil(chunks / parts), out: [number, number][] = [];
  for (let c = 0; c < chunks; c += per) out.push([c * step, Math.min(count, (c + per) * step)]);
  return out;
}
