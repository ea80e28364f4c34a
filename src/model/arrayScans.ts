/**
 * What a reader learned about an array while writing it (`noteScan`), so the piece checks (`validate.ts`) need not
 * read a large array again: the index of its first non-finite value (floats) or its least and greatest value
 * (ids), or how many of each value (cell types). Readers that fill arrays on several threads scan each chunk while it is still in cache
 * (src/io/partReads.ts). Kept per array object (a WeakMap): only a reader that has just written the array notes it,
 * before anything else can change it.
 */

/** One array's scan: `firstNonFinite` (−1: none) for floating-point arrays, `min` and `max` for integers. */
export interface ArrayScan {
  readonly firstNonFinite?: number;
  readonly min?: number;
  readonly max?: number;
  /** Cell types (bytes): how many of each value 0–255. */
  readonly counts?: Float64Array;
}

const scans = new WeakMap<ArrayBufferView, ArrayScan>();

/** Records what a reader found in `a` while writing it (call only on an array it has just filled). */
export function noteScan(a: ArrayBufferView, scan: ArrayScan): void {
  scans.set(a, scan);
}

/** The first non-finite value's index in `a` (−1: none) if a reader noted it, else undefined. */
export function notedFirstNonFinite(a: ArrayBufferView): number | undefined {
  return scans.get(a)?.firstNonFinite;
}

/** Whether a reader noted that every value of `a` lies in `[lo, hi]`. */
export function notedWithin(a: ArrayBufferView, lo: number, hi: number): boolean {
  const s = scans.get(a);
  return s !== undefined && s.min !== undefined && s.max !== undefined && s.min >= lo && s.max <= hi;
}

/** How many of each byte value `a` (cell types) holds, if a reader noted it, else undefined. */
export function notedCounts(a: ArrayBufferView): Float64Array | undefined {
  return scans.get(a)?.counts;
}
