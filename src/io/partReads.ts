/**
 * One part of an uncompressed array read on a thread of its own (`LoadOptions.readParts`): the elements
 * `[from, to)` are read chunk by chunk (`readChunkSync`: straight into the final array, or through the chunk
 * kernel's input or the thread's scratch) exactly as the one-thread read of a file on disk (`readArray` in
 * sourceArrays.ts) does it, with the same chunk boundaries when parts start on multiples of its chunk, so values
 * and messages are the same.
 *
 * Each chunk is scanned while in cache for what the piece checks would read the whole array again for (the
 * first non-finite value of floats, the range of ids), so the reader can note it (src/model/arrayScans.ts).
 *
 * Pure: the caller hands in a synchronous `fill` (a positional read of the file on a worker thread).
 */
import type { ArrayScan } from '../model/arrayScans.ts';
import type { NumericArray } from '../model/fieldArray.ts';
import { ELEMENT_SIZE } from './elementTypes.ts';
import { countBytesInKernel, kernelInput, nonFiniteInKernel } from './chunkKernel.ts';
import { HOST_LITTLE, convertChunk, finishDirect, isDirect, lastIdRun, rangeOfRun, type ArrayPlan } from './elementConvert.ts';

/** Fills all of `target` with the file's bytes from byte `offset` (throws when the file ends first). */
export type FillSync = (offset: number, target: Uint8Array) => void;

/**
 * Reads file elements `[from, to)` of an array whose element 0 lies at byte `offset` into `out` (the plan's final
 * array, `lead` slots included), `step` elements at a time through `scratch` (at least `step` elements, at byte 0
 * of its own buffer so it is aligned). Throws the one-thread read's message for the part's first bad element.
 * Returns the part's scan: the first non-finite value's index in the array (−1: none) for floating-point arrays,
 * the least and greatest value for ids, nothing for other arrays.
 */
export function readPartSync(plan: ArrayPlan, out: NumericArray, offset: number, from: number, to: number, step: number,
  fill: FillSync, scratch: Uint8Array): ArrayScan {
  const outBytes = directBytes(plan, out);
  const scan = new ChunkScan(plan, out);
  for (let i = from; i < to; i += step) {
    const k = Math.min(step, to - i);
    scan.add(i, k, readChunkSync(plan, out, outBytes, offset, i, k, fill, scratch));
  }
  return scan.result();
}

/** The bytes of a direct plan's final array after its lead (where the file's bytes go as they are), or undefined for converted plans. */
export function directBytes(plan: ArrayPlan, out: NumericArray): Uint8Array | undefined {
  const size = ELEMENT_SIZE[plan.type], lead = plan.lead ?? 0;
  return isDirect(plan) ? new Uint8Array(out.buffer, out.byteOffset + lead * size, (out.length - lead) * size) : undefined;
}

/**
 * Reads file elements `[i, i + k)` (k ≤ the scratch's elements) into `out` at once: a direct plan's bytes straight
 * into the final array (`outBytes`, from `directBytes`), swapped and checked there — except floats of the host's
 * byte order while the chunk kernel (chunkKernel.ts) is on: read into its input, tested there for a non-finite
 * value while in cache, then copied; 64-bit ids of the host's byte order straight into the kernel's input; others
 * through `scratch` (aligned), converted. Throws the one-thread read's message for the chunk's first bad element.
 * Returns whether the chunk holds a non-finite float when the kernel tested it (for `ChunkScan.add`), else undefined.
 */
export function readChunkSync(plan: ArrayPlan, out: NumericArray, outBytes: Uint8Array | undefined, offset: number, i: number, k: number,
  fill: FillSync, scratch: Uint8Array): boolean | undefined {
  const size = ELEMENT_SIZE[plan.type];
  if (outBytes) {
    const floatSize = (out instanceof Float32Array || out instanceof Float64Array) && (plan.littleEndian === HOST_LITTLE) ? size as 4 | 8 : 0;
    const input = floatSize ? kernelInput(k * size) : undefined;
    if (input) {
      fill(offset + i * size, input);
      const hit = nonFiniteInKernel(input, k, floatSize as 4 | 8);
      outBytes.set(input, i * size);
      return hit;
    }
    fill(offset + i * size, outBytes.subarray(i * size, (i + k) * size));
    finishDirect(plan, out, i, k);
    return undefined;
  }
  const lowFirst = plan.target === 'ids' && (plan.type === 'Int64' || plan.type === 'UInt64') && plan.littleEndian && HOST_LITTLE;
  const buf = (lowFirst ? kernelInput(k * size) : undefined) ?? scratch.subarray(0, k * size);
  fill(offset + i * size, buf);
  convertChunk(plan, buf, k, out, i);
  return undefined;
}

/**
 * The scan of an array built chunk by chunk while each chunk is in cache: the first non-finite value of a
 * floating-point array, the least and greatest id of an ids array, how many of each type a cell-type array holds
 * (through the chunk kernel, when it is on), nothing for other arrays. `add(i, k)` takes
 * file elements `[i, i + k)` just written (in order); `result()` is what `noteScan` records.
 */
export class ChunkScan {
  private readonly floats: boolean;
  private readonly ids: boolean;
  private readonly lead: number;
  private firstNonFinite = -1;
  private min = Infinity;
  private max = -Infinity;
  private any = false;
  /** Cell types: the counts so far, or undefined when not counted (not cell types, or the kernel is off). */
  private counts: Float64Array | undefined;

  constructor(plan: ArrayPlan, private readonly out: NumericArray) {
    this.floats = out instanceof Float64Array || out instanceof Float32Array;
    this.ids = plan.target === 'ids';
    this.lead = plan.lead ?? 0;
    if ((plan.target === 'cellTypes' || plan.countBytes) && out instanceof Uint8Array) this.counts = new Float64Array(256);
  }

  /** `nonFinite`: whether the chunk holds a non-finite float, when known already (tested by the chunk kernel); only a chunk that does is searched. */
  add(i: number, k: number, nonFinite?: boolean): void {
    const a0 = this.lead + i;
    if (this.floats && this.firstNonFinite < 0 && nonFinite !== false) {
      this.firstNonFinite = this.out instanceof Float64Array ? nonFiniteIn64(this.out, a0, a0 + k) : nonFiniteIn32(this.out as Float32Array, a0, a0 + k);
    }
    if (this.counts && k > 0 && !countBytesInKernel((this.out as Uint8Array).subarray(a0, a0 + k), this.counts)) this.counts = undefined;
    if (this.ids && k > 0) {
      // The check of these ids (`finishDirect`, `convertChunk`) summed up their range already, as a rule.
      const run = lastIdRun;
      let lo = run.min, hi = run.max;
      if (!(run.out?.deref() === this.out && run.from === i && run.count === k)) {
        const r = rangeOfRun(this.out as Int32Array, a0, a0 + k);
        lo = r[0]!; hi = r[1]!;
      }
      if (lo < this.min) this.min = lo;
      if (hi > this.max) this.max = hi;
      this.any = true;
    }
  }

  result(): ArrayScan {
    if (this.floats) return { firstNonFinite: this.firstNonFinite < 0 ? -1 : this.firstNonFinite - this.lead };
    if (this.counts) return { counts: this.counts };
    return this.ids && this.any ? { min: this.min, max: this.max } : {};
  }
}

/**
 * Index of the first non-finite value of `a[a0, a1)`, or −1. x − x is 0 for finite x and NaN otherwise, so a
 * sum of them is NaN exactly when some value is not finite: one branch per run; only a run that has one is
 * searched for it. A loop per array type, so each sees one kind of element.
 */
function nonFiniteIn64(a: Float64Array, a0: number, a1: number): number {
  // Four sums, so the additions do not wait on one another.
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0, j = a0;
  for (; j + 3 < a1; j += 4) {
    const x0 = a[j]!, x1 = a[j + 1]!, x2 = a[j + 2]!, x3 = a[j + 3]!;
    s0 += x0 - x0; s1 += x1 - x1; s2 += x2 - x2; s3 += x3 - x3;
  }
  for (; j < a1; j++) { const x = a[j]!; s0 += x - x; }
  if (s0 + s1 + s2 + s3 === 0) return -1;
  for (let i = a0; i < a1; i++) { const x = a[i]!; if (x - x !== 0) return i; }
  return -1;
}

/** `nonFiniteIn64` over single-precision values. */
function nonFiniteIn32(a: Float32Array, a0: number, a1: number): number {
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0, j = a0;
  for (; j + 3 < a1; j += 4) {
    const x0 = a[j]!, x1 = a[j + 1]!, x2 = a[j + 2]!, x3 = a[j + 3]!;
    s0 += x0 - x0; s1 += x1 - x1; s2 += x2 - x2; s3 += x3 - x3;
  }
  for (; j < a1; j++) { const x = a[j]!; s0 += x - x; }
  if (s0 + s1 + s2 + s3 === 0) return -1;
  for (let i = a0; i < a1; i++) { const x = a[i]!; if (x - x !== 0) return i; }
  return -1;
}

/** The scan of a whole array from its parts' scans, in order (see `readPartSync`). */
export function joinScans(parts: readonly ArrayScan[]): ArrayScan {
  if (parts.length === 0) return {};
  if (parts[0]!.firstNonFinite !== undefined) {
    const hit = parts.find((s) => (s.firstNonFinite ?? -1) >= 0);
    return { firstNonFinite: hit ? hit.firstNonFinite! : -1 };
  }
  if (parts.every((s) => s.min !== undefined && s.max !== undefined)) {
    return { min: Math.min(...parts.map((s) => s.min!)), max: Math.max(...parts.map((s) => s.max!)) };
  }
  return {};
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
