/**
 * One part of an uncompressed array read from a file this process opened (Node only): positional reads of the
 * descriptor into this thread's chunk buffer, converted, swapped and checked into the final array by
 * `readPartSync` (src/io/partReads.ts). Run by the read workers (workers/readWorkerBody.ts) and by the loading
 * thread while they start (readPool.ts), so both read a part the same way.
 */
import type { ArrayPlan } from '../io/elementConvert.ts';
import { ELEMENT_SIZE } from '../io/elementTypes.ts';
import { readPartSync } from '../io/partReads.ts';
import { readFullySync } from '../io/syncReads.ts';
import type { ArrayScan } from '../model/arrayScans.ts';
import type { NumericArray } from '../model/fieldArray.ts';

/** Where an array lies in the file: the open descriptor, the file's name and size (bytes, for messages), element 0's byte offset. */
export interface ArrayInFile {
  readonly descriptor: number;
  readonly name: string;
  readonly size: number;
  readonly offset: number;
  readonly plan: ArrayPlan;
  /** Elements per chunk (the one-thread read's chunk). */
  readonly step: number;
}

/** This thread's chunk buffer (grown when a larger chunk is asked for). */
let scratch = new Uint8Array(0);

/**
 * Reads file elements `[from, to)` of `a` into `out` (its final array); returns the part's scan or throws the
 * one-thread read's message for the part's first bad element.
 */
export function readPartFromFile(a: ArrayInFile, out: NumericArray, from: number, to: number): ArrayScan {
  const bytes = a.step * ELEMENT_SIZE[a.plan.type];
  if (scratch.length < bytes) scratch = new Uint8Array(bytes);
  const fill = (at: number, target: Uint8Array): void => readFullySync(a.descriptor, at, target, a.name, a.size);
  return readPartSync(a.plan, out, a.offset, from, to, a.step, fill, scratch);
}
