/**
 * Binary element decoding shared by the legacy and XML readers: raw bytes of a given element type and
 * byte order → the model's typed arrays, with range checks where the model narrows.
 *
 * Model types: Float32 stays Float32Array; Float64 is Float64Array; integers of up to 32 bits keep their
 * natural typed array; Int64/UInt64 become Float64Array (exact up to 2^53, checked). Ids (connectivity,
 * offsets, cell types) become Int32Array / Uint8Array with a range check.
 */
import type { NumericArray } from '../model/fieldArray.ts';

/** Element types by their XML names (the legacy reader maps its own names onto these). */
export type ElementType = 'Int8' | 'UInt8' | 'Int16' | 'UInt16' | 'Int32' | 'UInt32' | 'Int64' | 'UInt64' | 'Float32' | 'Float64';

/** Bytes per element. */
export const ELEMENT_SIZE: Readonly<Record<ElementType, number>> = {
  Int8: 1, UInt8: 1, Int16: 2, UInt16: 2, Int32: 4, UInt32: 4, Int64: 8, UInt64: 8, Float32: 4, Float64: 8,
};

const HOST_LITTLE = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/** Whether a string names an ElementType. */
export function isElementType(s: string): s is ElementType {
  return Object.prototype.hasOwnProperty.call(ELEMENT_SIZE, s);
}

/** A typed-array class (Int32Array, Float64Array, …) of the model. */
export type TypedClass<T extends NumericArray> = (new (n: number) => T) & (new (b: ArrayBufferLike, o: number, n: number) => T) & { readonly BYTES_PER_ELEMENT: number };

/**
 * A fresh array of `n` zeros of class `C`, in its own `SharedArrayBuffer` when `shared` (`LoadOptions.sharedArrays`:
 * decoded straight into the memory a worker pool shares, so handing the dataset over copies nothing).
 */
export function freshArray<T extends NumericArray>(C: TypedClass<T>, n: number, shared: boolean): T {
  return shared ? new C(new SharedArrayBuffer(n * C.BYTES_PER_ELEMENT), 0, n) : new C(n);
}

/** Allocates the model array for `count` elements of `type` (empty, for ASCII parsing into); in a fresh `SharedArrayBuffer` when `shared`. */
export function allocateFor(type: ElementType, count: number, shared = false): NumericArray {
  if (shared) return freshArray(allocateFor(type, 0).constructor as TypedClass<NumericArray>, count, true);
  switch (type) {
    case 'Int8': return new Int8Array(count);
    case 'UInt8': return new Uint8Array(count);
    case 'Int16': return new Int16Array(count);
    case 'UInt16': return new Uint16Array(count);
    case 'Int32': return new Int32Array(count);
    case 'UInt32': return new Uint32Array(count);
    case 'Float32': return new Float32Array(count);
    default: return new Float64Array(count);
  }
}

/** Copies `count` elements of `size` bytes into a fresh aligned buffer, swapping byte order if needed. */
function alignedCopy(bytes: Uint8Array, offset: number, count: number, size: number, littleEndian: boolean): ArrayBuffer {
  const n = count * size;
  const out = new Uint8Array(n);
  if (littleEndian === HOST_LITTLE || size === 1) {
    out.set(bytes.subarray(offset, offset + n));
    return out.buffer;
  }
  // Swap by whole words through a DataView: several times faster than byte by byte.
  const dv = new DataView(bytes.buffer, bytes.byteOffset + offset, n);
  if (size === 2) {
    const o16 = new Uint16Array(out.buffer);
    for (let i = 0; i < count; i++) o16[i] = dv.getUint16(2 * i, littleEndian);
  } else if (size === 4) {
    const o32 = new Uint32Array(out.buffer);
    for (let i = 0; i < count; i++) o32[i] = dv.getUint32(4 * i, littleEndian);
  } else {
    const o32 = new Uint32Array(out.buffer);
    const lo = HOST_LITTLE ? 0 : 1;
    for (let i = 0; i < count; i++) {
      o32[2 * i + lo] = dv.getUint32(8 * i + (littleEndian ? 0 : 4), littleEndian);
      o32[2 * i + 1 - lo] = dv.getUint32(8 * i + (littleEndian ? 4 : 0), littleEndian);
    }
  }
  return out.buffer;
}

/** A view when the data are aligned and in host order, otherwise an aligned (and swapped) copy. */
function rawView(bytes: Uint8Array, offset: number, count: number, size: number, littleEndian: boolean): { buffer: ArrayBuffer | SharedArrayBuffer; byteOffset: number } {
  const abs = bytes.byteOffset + offset;
  if ((littleEndian === HOST_LITTLE || size === 1) && abs % size === 0) return { buffer: bytes.buffer, byteOffset: abs };
  return { buffer: alignedCopy(bytes, offset, count, size, littleEndian), byteOffset: 0 };
}

/**
 * Decodes `count` elements of `type` at `bytes[offset…]` into the model's array type. Throws (naming
 * `where`) if the bytes run out or a 64-bit integer is beyond 2^53.
 */
export function decodeElements(bytes: Uint8Array, offset: number, count: number, type: ElementType, littleEndian: boolean, where: string): NumericArray {
  const size = ELEMENT_SIZE[type];
  if (offset < 0 || offset + count * size > bytes.length) {
    throw new Error(`${where}: needs ${count * size} bytes of ${type} data, only ${Math.max(0, bytes.length - offset)} are left`);
  }
  const { buffer, byteOffset } = rawView(bytes, offset, count, size, littleEndian);
  switch (type) {
    case 'Int8': return new Int8Array(buffer, byteOffset, count);
    case 'UInt8': return new Uint8Array(buffer, byteOffset, count);
    case 'Int16': return new Int16Array(buffer, byteOffset, count);
    case 'UInt16': return new Uint16Array(buffer, byteOffset, count);
    case 'Int32': return new Int32Array(buffer, byteOffset, count);
    case 'UInt32': return new Uint32Array(buffer, byteOffset, count);
    case 'Float32': return new Float32Array(buffer, byteOffset, count);
    case 'Float64': return new Float64Array(buffer, byteOffset, count);
    case 'Int64': case 'UInt64': {
      const src = type === 'Int64' ? new BigInt64Array(buffer, byteOffset, count) : new BigUint64Array(buffer, byteOffset, count);
      return bigToFloat64(src, where);
    }
  }
}

const MAX_EXACT = 2n ** 53n;

/** 64-bit integers → doubles from their two 32-bit halves (no BigInt per value); beyond ±2^53 is an error. */
function bigToFloat64(src: BigInt64Array | BigUint64Array, where: string): Float64Array {
  const out = new Float64Array(src.length);
  const w = new Uint32Array(src.buffer, src.byteOffset, src.length * 2);
  const signed = src instanceof BigInt64Array;
  const lo = HOST_LITTLE ? 0 : 1;
  for (let i = 0; i < src.length; i++) {
    const l = w[2 * i + lo]!, h = w[2 * i + 1 - lo]!;
    const hs = signed ? h | 0 : h;
    // |value| ≤ 2^53 exactly when the high word lies in [-2^21, 2^21] (2^21 itself only with a zero low word).
    if (hs > 0x200000 || hs < -0x200000 || ((hs === 0x200000) && l !== 0)) {
      const v = src[i]!;
      if (v > MAX_EXACT || v < -MAX_EXACT) throw new Error(`${where}: 64-bit value ${v} at index ${i} is beyond ±2^53 and cannot be held exactly`);
    }
    out[i] = hs * 4294967296 + l;
  }
  return out;
}

/** Converts any model array to Int32Array ids, checking each lies in [min, max]. */
export function toIds(a: NumericArray, where: string, min = 0, max = 0x7fffffff): Int32Array {
  const out = a instanceof Int32Array ? a : new Int32Array(a.length);
  for (let i = 0; i < a.length; i++) {
    const v = a[i]!;
    if (!(v >= min && v <= max) || !Number.isInteger(v)) throw new Error(`${where}: value ${v} at index ${i} is not an id in ${min}..${max}`);
    if (out !== a) out[i] = v;
  }
  return out;
}

/** Converts any model array to Float64Array (points are always held in double precision). */
export function toFloat64(a: NumericArray): Float64Array {
  return a instanceof Float64Array ? a : Float64Array.from(a);
}
