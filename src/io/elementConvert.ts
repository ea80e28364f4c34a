/**
 * Binary file elements → the model's final arrays, one chunk at a time, so a large array is decoded
 * straight into its final typed array and the only fresh memory of a load is that array.
 *
 * An `ArrayPlan` says what the file holds (element type, byte order) and what the model wants:
 *  - `values`: the model type of the file type (see `elementTypes.ts`: 64-bit integers become Float64,
 *    exact to 2^53, checked);
 *  - `float64`: a Float64Array whatever the file type (points);
 *  - `ids`: an Int32Array of ids checked in `[min, max]` (connectivity, offsets, face streams);
 *  - `cellTypes`: a Uint8Array of VTK cell-type numbers (legacy `CELL_TYPES`, written as Int32).
 * `lead` leaves that many zero slots before the values (offsets with their leading 0).
 *
 * Two ways in: `direct` plans (file bytes are the model's bytes, perhaps byte-swapped, perhaps to be
 * range-checked) land in the final buffer as they are and are finished in place by `finishDirect`; the
 * others are converted from a small aligned scratch buffer, chunk by chunk, by `convertChunk`.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import { ELEMENT_SIZE, allocateFor, type ElementType } from './elementTypes.ts';
import { narrowIdsInKernel } from './chunkKernel.ts';
import { claimMemory } from './memoryBudget.ts';

/** What one array's file elements are and what the model makes of them. */
export interface ArrayPlan {
  /** Element type in the file. */
  readonly type: ElementType;
  /** Byte order in the file. */
  readonly littleEndian: boolean;
  readonly target: 'values' | 'float64' | 'ids' | 'cellTypes';
  /** Range of `ids` (default 0 .. 2^31 − 1). */
  readonly min?: number;
  readonly max?: number;
  /** Zero slots before the values (default 0). */
  readonly lead?: number;
  /** Message prefix, e.g. `box.vtu: piece 0: DataArray "connectivity"`. */
  readonly where: string;
  /** Allocate the final array in a `SharedArrayBuffer` (`LoadOptions.sharedArrays`). Default false. */
  readonly shared?: boolean;
  /** Builds the error for a cell type outside 0..255 (`cellTypes` only); index and value as in the file. */
  readonly badCellType?: (index: number, value: number) => Error;
  /** Bytes to count by value while each chunk is in cache (XML cell types read as UInt8 values; `ChunkScan`). */
  readonly countBytes?: boolean;
}

/** Whether this machine stores numbers little-endian. */
export const HOST_LITTLE = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/** Bytes of the module scratch: big enough that a read or an inflate call is rare, small enough to stay in cache. */
export const SCRATCH_BYTES = 1 << 20;

/** The module's scratch buffers per slot: in ordinary memory, and in shared memory (`Scratch`'s `inSharedMemory`; empty until first grown). */
const kept: ArrayBufferLike[][] = [[new ArrayBuffer(0), new ArrayBuffer(0), new ArrayBuffer(0)], [new ArrayBuffer(0), new ArrayBuffer(0), new ArrayBuffer(0)]];
const busy = [[false, false, false], [false, false, false]];

/**
 * A scratch buffer held for the length of one array's read: the module's shared buffer for its slot
 * (grown when needed, reused by every read) or, when a concurrent load holds that, a private one. Slot 0
 * holds file elements on their way to a final array; slot 1 compressed blocks on their way to slot 0 (or
 * the next chunk, read while slot 0 is converted); slot 2 base64 text on its way to being decoded.
 * `inSharedMemory`: a SharedArrayBuffer, so worker threads can write into it (the Node inflate pool inflates
 * blocks straight into shared memory). Call `release` when done (in a `finally`).
 */
export class Scratch {
  private buf: ArrayBufferLike;
  private readonly own: boolean;
  private readonly kind: 0 | 1;

  constructor(private readonly slot: 0 | 1 | 2, inSharedMemory = false) {
    this.kind = inSharedMemory && typeof SharedArrayBuffer !== 'undefined' ? 1 : 0;
    this.own = busy[this.kind]![slot]!;
    if (!this.own) busy[this.kind]![slot] = true;
    this.buf = this.own ? new ArrayBuffer(0) : kept[this.kind]![slot]!;
  }

  /** The first `n` bytes of the buffer (aligned, contents not kept when it grows). */
  bytes(n: number): Uint8Array {
    if (this.buf.byteLength < n) {
      const size = Math.max(n, SCRATCH_BYTES);
      this.buf = this.kind === 1 ? new SharedArrayBuffer(size) : new ArrayBuffer(size);
      if (!this.own) kept[this.kind]![this.slot] = this.buf;
    }
    return new Uint8Array(this.buf, 0, n);
  }

  release(): void {
    if (!this.own) busy[this.kind]![this.slot] = false;
  }
}

/** Elements per chunk of the scratch for an element size (a whole number of elements). */
export function chunkElements(size: number, chunkBytes: number = SCRATCH_BYTES): number {
  return Math.max(1, Math.floor(chunkBytes / size));
}

type TargetCtor = new (buffer: ArrayBufferLike, byteOffset: number, length: number) => NumericArray;

/** The typed-array class of a plan's final array. */
function targetClass(plan: ArrayPlan): TargetCtor {
  switch (plan.target) {
    case 'values': return allocateFor(plan.type, 0).constructor as TargetCtor;
    case 'float64': return Float64Array as TargetCtor;
    case 'ids': return Int32Array as TargetCtor;
    case 'cellTypes': return Uint8Array as TargetCtor;
  }
}

/**
 * Allocates the final array for `count` file elements (plus `lead` zero slots), with a clear error when memory
 * runs out; in a fresh `SharedArrayBuffer` when `shared` (arrays read in parts by several threads).
 */
export function allocateTarget(plan: ArrayPlan, count: number, shared = false): NumericArray {
  const n = (plan.lead ?? 0) + count;
  claimMemory(n * (plan.target === 'values' ? ELEMENT_SIZE[plan.type] : plan.target === 'float64' ? 8 : plan.target === 'ids' ? 4 : 1), plan.where);
  try {
    if (shared || plan.shared) {
      const Ctor = targetClass(plan);
      const bytes = n * (Ctor as unknown as { BYTES_PER_ELEMENT: number }).BYTES_PER_ELEMENT;
      return new Ctor(new SharedArrayBuffer(bytes), 0, n);
    }
    switch (plan.target) {
      case 'values': return allocateFor(plan.type, n);
      case 'float64': return new Float64Array(n);
      case 'ids': return new Int32Array(n);
      case 'cellTypes': return new Uint8Array(n);
    }
  } catch {
    throw new Error(`${plan.where}: cannot allocate ${n} values for the array (not enough memory)`);
  }
}

/** The final array of a plan viewing `length` elements (lead included) of `buffer` at `byteOffset` (a worker's view of a shared target). */
export function targetView(plan: ArrayPlan, buffer: ArrayBufferLike, byteOffset: number, length: number): NumericArray {
  return new (targetClass(plan))(buffer, byteOffset, length);
}

/** Whether the file's bytes are the final array's bytes (up to byte order and a range check). */
export function isDirect(plan: ArrayPlan): boolean {
  switch (plan.target) {
    case 'values': return plan.type !== 'Int64' && plan.type !== 'UInt64';
    case 'float64': return plan.type === 'Float64';
    case 'ids': return plan.type === 'Int32' || plan.type === 'UInt32';
    case 'cellTypes': return plan.type === 'UInt8';
  }
}

/**
 * Swaps the byte order of `count` elements of `size` bytes in place. Through a DataView: V8 turns its
 * big-endian reads into single byte-swap instructions, about three times faster than shifts and masks.
 */
export function swapInPlace(bytes: Uint8Array, count: number, size: number): void {
  if (size === 1 || count === 0) return;
  const dv = new DataView(bytes.buffer, bytes.byteOffset, count * size);
  const n = count * size;
  if (size === 2) {
    for (let i = 0; i < n; i += 2) dv.setInt16(i, dv.getInt16(i, true), false);
  } else if (size === 4) {
    for (let i = 0; i < n; i += 4) dv.setInt32(i, dv.getInt32(i, true), false);
  } else {
    for (let i = 0; i < n; i += 8) {
      const a = dv.getInt32(i, true), b = dv.getInt32(i + 4, true);
      dv.setInt32(i, b, false);
      dv.setInt32(i + 4, a, false);
    }
  }
}

function idError(plan: ArrayPlan, v: number | bigint, i: number): Error {
  return new Error(`${plan.where}: value ${v} at index ${i} is not an id in ${plan.min ?? 0}..${plan.max ?? 0x7fffffff}`);
}

/**
 * The last run of ids checked by `finishDirect` or `convertChunk`: its final array, first file element, length,
 * least and greatest value. The in-cache scan (`ChunkScan` in partReads.ts) takes the range from here instead of
 * reading the run again, when the run is the one it is handed.
 */
export const lastIdRun = { out: undefined as WeakRef<NumericArray> | undefined, from: 0, count: 0, min: 0, max: 0 };

/** Records `runRange` as the range of ids `[from, from + count)` of `out` (held weakly: a dropped array is not kept). */
function noteIdRun(out: NumericArray, from: number, count: number): void {
  lastIdRun.out = new WeakRef(out); lastIdRun.from = from; lastIdRun.count = count;
  lastIdRun.min = runRange[0]!; lastIdRun.max = runRange[1]!;
}

/**
 * Finishes elements `[from, from + count)` of a direct plan whose file bytes were copied into `out`
 * (indices count file elements, after the lead): swaps the byte order and checks ids in place.
 */
export function finishDirect(plan: ArrayPlan, out: NumericArray, from: number, count: number): void {
  const size = ELEMENT_SIZE[plan.type], at = (plan.lead ?? 0) + from;
  if (plan.littleEndian !== HOST_LITTLE) swapInPlace(new Uint8Array(out.buffer, out.byteOffset + at * size, count * size), count, size);
  if (plan.target === 'ids' && count > 0) {
    const min = plan.min ?? 0, max = plan.max ?? 0x7fffffff;
    // Every value is in range when the run's least and greatest are (a UInt32 of 2^31 or more reads as a
    // negative Int32 here, so its run fails too); only a run that fails is searched for its first bad value.
    rangeOfRun(new Int32Array(out.buffer, out.byteOffset + at * 4, count));
    if (runRange[0]! >= min && runRange[1]! <= max && (plan.type !== 'UInt32' || runRange[0]! >= 0)) {
      noteIdRun(out, from, count);
      return;
    }
    const bad = plan.type === 'UInt32'
      ? firstOutside(new Uint32Array(out.buffer, out.byteOffset + at * 4, count), min, max)
      : firstOutside(new Int32Array(out.buffer, out.byteOffset + at * 4, count), min, max);
    if (bad >= 0) throw idError(plan, plan.type === 'UInt32' ? new Uint32Array(out.buffer, out.byteOffset + at * 4, count)[bad]! : (out as Int32Array)[at + bad]!, from + bad);
  }
}

/** The least and greatest value of the last run summed up (`rangeOfRun`, `narrowLowFirst`, `narrowHighFirst`). */
const runRange = new Int32Array(2);

/** Least and greatest value of `a[a0, a1)` (non-empty) into `runRange`, which it returns; no branch per value. */
export function rangeOfRun(a: Int32Array, a0 = 0, a1 = a.length): Int32Array {
  let lo = a[a0]!, hi = lo;
  for (let i = a0 + 1; i < a1; i++) { const v = a[i]!; lo = v < lo ? v : lo; hi = v > hi ? v : hi; }
  runRange[0] = lo; runRange[1] = hi;
  return runRange;
}

/** Index of the first value of `a` outside `[min, max]`, or −1. */
function firstOutside(a: Int32Array | Uint32Array, min: number, max: number): number {
  for (let i = 0; i < a.length; i++) { const v = a[i]!; if (v < min || v > max) return i; }
  return -1;
}

/**
 * Converts `count` elements held in `bytes` (aligned to the element size, file byte order — swapped here in
 * place, so `bytes` must be scratch the caller owns) into `out` at file-element index `from`.
 */
export function convertChunk(plan: ArrayPlan, bytes: Uint8Array, count: number, out: NumericArray, from: number): void {
  const size = ELEMENT_SIZE[plan.type];
  const o = (plan.lead ?? 0) + from;
  const t = plan.type;
  if (t === 'Int64' || t === 'UInt64') return convert64(plan, bytes, count, out, o, from);
  if (plan.littleEndian !== HOST_LITTLE) swapInPlace(bytes, count, size);
  const src = viewOf(t, bytes, count);
  if (plan.target === 'ids') {
    const min = plan.min ?? 0, max = plan.max ?? 0x7fffffff;
    for (let i = 0; i < count; i++) {
      const v = src[i]!;
      if (!(v >= min && v <= max) || Math.floor(v) !== v) throw idError(plan, v, from + i);
      out[o + i] = v;
    }
    return;
  }
  if (plan.target === 'cellTypes') {
    for (let i = 0; i < count; i++) {
      const v = src[i]!;
      if (!(v >= 0 && v <= 255) || Math.floor(v) !== v) throw plan.badCellType ? plan.badCellType(from + i, v) : idError(plan, v, from + i);
      out[o + i] = v;
    }
    return;
  }
  // Values of their own model type, and doubles from any narrower type: TypedArray.set converts natively.
  (out as Float64Array).set(src, o);
}

/** A host-order view of `count` elements of `type` at an aligned `bytes` (not 64-bit integers). */
function viewOf(type: ElementType, b: Uint8Array, count: number): NumericArray {
  switch (type) {
    case 'Int8': return new Int8Array(b.buffer, b.byteOffset, count);
    case 'UInt8': return b.subarray(0, count);
    case 'Int16': return new Int16Array(b.buffer, b.byteOffset, count);
    case 'UInt16': return new Uint16Array(b.buffer, b.byteOffset, count);
    case 'Int32': return new Int32Array(b.buffer, b.byteOffset, count);
    case 'UInt32': return new Uint32Array(b.buffer, b.byteOffset, count);
    case 'Float32': return new Float32Array(b.buffer, b.byteOffset, count);
    default: return new Float64Array(b.buffer, b.byteOffset, count);
  }
}

/**
 * 64-bit integers in the file's byte order (read through a DataView, which swaps for free) from their
 * 32-bit halves: ids narrowed to Int32 (cell types to bytes), other targets to exact doubles.
 */
function convert64(plan: ArrayPlan, bytes: Uint8Array, count: number, out: NumericArray, o: number, from: number): void {
  const dv = new DataView(bytes.buffer, bytes.byteOffset, 8 * count);
  const le = plan.littleEndian, unsigned = plan.type === 'UInt64';
  const big = (i: number) => (unsigned ? dv.getBigUint64(8 * i, le) : dv.getBigInt64(8 * i, le));
  if (plan.target === 'ids' || plan.target === 'cellTypes') {
    const ids = plan.target === 'ids';
    const min = ids ? plan.min ?? 0 : 0, max = ids ? plan.max ?? 0x7fffffff : 255;
    if (ids && bytes.byteOffset % 4 === 0 && count > 0 && narrowIds(bytes, le, count, out as Int32Array, o, min, max, unsigned)) {
      noteIdRun(out, from, count);
      return;
    }
    // In the host's byte order and 4-byte aligned (the usual case), the halves are read as 32-bit words: a
    // plain typed-array loop, fast from the first call (a DataView loop is slow until the engine optimises it).
    const bad = le === HOST_LITTLE && bytes.byteOffset % 4 === 0
      ? (ids ? narrowWords(new Int32Array(bytes.buffer, bytes.byteOffset, 2 * count), le, count, out as Int32Array, o, min, max, unsigned)
        : narrowWordsToBytes(new Int32Array(bytes.buffer, bytes.byteOffset, 2 * count), le, count, out as Uint8Array, o, min, max, unsigned))
      : narrow64(dv, le, count, out as Int32Array | Uint8Array, o, min, max, unsigned);
    if (bad < 0) return;
    if (!ids && plan.badCellType) throw plan.badCellType(from + bad, Number(big(bad)));
    throw idError(plan, big(bad), from + bad);
  }
  const bad = widen64(dv, le, count, out as Float64Array, o, unsigned);
  if (bad >= 0) throw new Error(`${plan.where}: 64-bit value ${big(bad)} at index ${from + bad} is beyond ±2^53 and cannot be held exactly`);
}

/**
 * Copies the low words of `count` 64-bit integers into `out[o…]`, checking each value lies in
 * `[min, max]` (within 32 bits). Returns the index of the first bad value, or −1.
 */
function narrow64(dv: DataView, le: boolean, count: number, out: Int32Array | Uint8Array, o: number, min: number, max: number, unsigned: boolean): number {
  const L = le ? 0 : 4, H = 4 - L;
  for (let i = 0, p = 0; i < count; i++, p += 8) {
    const lo = dv.getInt32(p + L, le), hi = dv.getInt32(p + H, le);
    if (hi !== lo >> 31 || lo < min || lo > max || (unsigned && lo < 0)) return i;
    out[o + i] = lo;
  }
  return -1;
}

/**
 * The fast path of 64-bit ids (4-byte aligned `bytes`, either byte order): writes the low words into `out[o…]`
 * while summing up, with no branch per id, whether every high word is its low word's sign (the value fits in
 * 32 bits) and the least and greatest low word (into `runRange`). True when every value lies in `[min, max]`
 * (and is not negative when `unsigned`): the same test as `narrowWords`, per run instead of per id. False when
 * some value does not; `bytes` is then as it was, for the precise loops to find and name the first.
 */
function narrowIds(bytes: Uint8Array, le: boolean, count: number, out: Int32Array, o: number, min: number, max: number, unsigned: boolean): boolean {
  const w = new Int32Array(bytes.buffer, bytes.byteOffset, 2 * count);
  // Words of the other byte order are swapped into the host's in place: each value is then high word first.
  const swap = le !== HOST_LITTLE;
  if (swap) swapInPlace(bytes, 2 * count, 4);
  // Low word first (little-endian files on a little-endian host, the usual case): the SIMD kernel when it is on.
  const sign = HOST_LITTLE === !swap ? narrowIdsInKernel(bytes, count, out, o, runRange) ?? narrowLowFirst(w, count, out, o) : narrowHighFirst(w, count, out, o);
  if (sign === 0 && runRange[0]! >= (unsigned ? Math.max(min, 0) : min) && runRange[1]! <= max) return true;
  if (swap) swapInPlace(bytes, 2 * count, 4);
  return false;
}

/**
 * Low word of each of `count` 64-bit values (host-order words, low word first) into `out[o…]`; returns the OR of
 * every high word XOR its low word's sign (0: every value fits in 32 bits) and leaves the least and greatest low
 * word in `runRange`. One loop per word order, so each reads its words at fixed places.
 */
function narrowLowFirst(w: Int32Array, count: number, out: Int32Array, o: number): number {
  let sign = 0, lo = w[0]!, hi = lo;
  for (let i = 0, p = 0; i < count; i++, p += 2) {
    const v = w[p]!;
    sign |= w[p + 1]! ^ (v >> 31);
    lo = v < lo ? v : lo; hi = v > hi ? v : hi;
    out[o + i] = v;
  }
  runRange[0] = lo; runRange[1] = hi;
  return sign;
}

/** `narrowLowFirst` for values stored high word first. */
function narrowHighFirst(w: Int32Array, count: number, out: Int32Array, o: number): number {
  let sign = 0, lo = w[1]!, hi = lo;
  for (let i = 0, p = 0; i < count; i++, p += 2) {
    const v = w[p + 1]!;
    sign |= w[p]! ^ (v >> 31);
    lo = v < lo ? v : lo; hi = v > hi ? v : hi;
    out[o + i] = v;
  }
  runRange[0] = lo; runRange[1] = hi;
  return sign;
}

/** `narrow64` over the 32-bit words of the values, in the host's byte order (`le` = the host's), into ids. */
function narrowWords(w: Int32Array, le: boolean, count: number, out: Int32Array, o: number, min: number, max: number, unsigned: boolean): number {
  const L = le ? 0 : 1, H = 1 - L;
  for (let i = 0, p = 0; i < count; i++, p += 2) {
    const lo = w[p + L]!, hi = w[p + H]!;
    if (hi !== lo >> 31 || lo < min || lo > max || (unsigned && lo < 0)) return i;
    out[o + i] = lo;
  }
  return -1;
}

/** `narrowWords` into bytes (cell types); a separate copy so each loop sees one array type. */
function narrowWordsToBytes(w: Int32Array, le: boolean, count: number, out: Uint8Array, o: number, min: number, max: number, unsigned: boolean): number {
  const L = le ? 0 : 1, H = 1 - L;
  for (let i = 0, p = 0; i < count; i++, p += 2) {
    const lo = w[p + L]!, hi = w[p + H]!;
    if (hi !== lo >> 31 || lo < min || lo > max || (unsigned && lo < 0)) return i;
    out[o + i] = lo;
  }
  return -1;
}

/** 64-bit integers → exact doubles in `out[o…]`. Returns the index of the first beyond ±2^53, or −1. */
function widen64(dv: DataView, le: boolean, count: number, out: Float64Array, o: number, unsigned: boolean): number {
  const L = le ? 0 : 4, H = 4 - L;
  for (let i = 0, p = 0; i < count; i++, p += 8) {
    const l = dv.getUint32(p + L, le), h = dv.getInt32(p + H, le);
    const hs = unsigned ? h >>> 0 : h;
    // |value| ≤ 2^53 exactly when the high word lies in [-2^21, 2^21] (2^21 itself only with a zero low word).
    if (hs > 0x200000 || hs < -0x200000 || ((hs === 0x200000) && l !== 0)) return i;
    out[o + i] = hs * 4294967296 + l;
  }
  return -1;
}
