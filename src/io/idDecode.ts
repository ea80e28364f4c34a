/**
 * Binary integer arrays straight to the model's Int32 ids (connectivity, offsets, face streams), with a
 * range check and no intermediate array: 64-bit ids are read as two 32-bit words instead of through
 * BigInt, which is several times faster and allocates nothing but the result.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import { decodeElements, toIds, type ElementType } from './elementTypes.ts';

const HOST_LITTLE = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

function badId(bytes: Uint8Array, offset: number, i: number, type: ElementType, littleEndian: boolean, where: string, min: number, max: number): Error {
  const dv = new DataView(bytes.buffer, bytes.byteOffset + offset + 8 * i, 8);
  const v = type === 'Int64' ? dv.getBigInt64(0, littleEndian) : dv.getBigUint64(0, littleEndian);
  return new Error(`${where}: value ${v} at index ${i} is not an id in ${min}..${max}`);
}

/**
 * Decodes `count` integers of `type` at `bytes[offset…]` (byte order `littleEndian`) into ids in
 * `[min, max]`. Throws naming `where` and the first bad value. The caller has checked the byte count.
 */
export function decodeIds(bytes: Uint8Array, offset: number, count: number, type: ElementType, littleEndian: boolean, where: string, min = 0, max = 0x7fffffff): Int32Array {
  if (type !== 'Int64' && type !== 'UInt64') {
    const v: NumericArray = decodeElements(bytes, offset, count, type, littleEndian, where);
    return toIds(v, where, min, max);
  }
  if (offset < 0 || offset + 8 * count > bytes.length) {
    throw new Error(`${where}: needs ${8 * count} bytes of ${type} data, only ${Math.max(0, bytes.length - offset)} are left`);
  }
  const out = new Int32Array(count);
  const unsigned = type === 'UInt64';
  const abs = bytes.byteOffset + offset;
  if (littleEndian === HOST_LITTLE && abs % 4 === 0) {
    const w = new Int32Array(bytes.buffer, abs, 2 * count);
    for (let i = 0; i < count; i++) {
      const lo = w[2 * i]!, hi = w[2 * i + 1]!;
      if (hi !== lo >> 31 || (unsigned && lo < 0) || lo < min || lo > max) throw badId(bytes, offset, i, type, littleEndian, where, min, max);
      out[i] = lo;
    }
    return out;
  }
  const dv = new DataView(bytes.buffer, abs, 8 * count);
  const loAt = littleEndian ? 0 : 4, hiAt = littleEndian ? 4 : 0;
  for (let i = 0; i < count; i++) {
    const lo = dv.getInt32(8 * i + loAt, littleEndian), hi = dv.getInt32(8 * i + hiAt, littleEndian);
    if (hi !== lo >> 31 || (unsigned && lo < 0) || lo < min || lo > max) throw badId(bytes, offset, i, type, littleEndian, where, min, max);
    out[i] = lo;
  }
  return out;
}
