import { describe, expect, it } from 'vitest';
import { decodeElements, type ElementType } from '../../src/io/elementTypes.ts';

/** Reference: DataView's typed getters with an explicit byte order (ECMAScript). */
function expected(bytes: Uint8Array, type: ElementType, le: boolean, count: number, offset: number): number[] {
  const dv = new DataView(bytes.buffer, bytes.byteOffset + offset);
  const size = { Int8: 1, UInt8: 1, Int16: 2, UInt16: 2, Int32: 4, UInt32: 4, Int64: 8, UInt64: 8, Float32: 4, Float64: 8 }[type];
  return Array.from({ length: count }, (_, i) => {
    switch (type) {
      case 'Int8': return dv.getInt8(i);
      case 'UInt8': return dv.getUint8(i);
      case 'Int16': return dv.getInt16(i * size, le);
      case 'UInt16': return dv.getUint16(i * size, le);
      case 'Int32': return dv.getInt32(i * size, le);
      case 'UInt32': return dv.getUint32(i * size, le);
      case 'Float32': return dv.getFloat32(i * size, le);
      case 'Float64': return dv.getFloat64(i * size, le);
      case 'Int64': return Number(dv.getBigInt64(i * size, le));
      case 'UInt64': return Number(dv.getBigUint64(i * size, le));
    }
  });
}

describe('decodeElements', () => {
  it('every type, both byte orders, aligned and misaligned, equals DataView', () => {
    const raw = new Uint8Array(8 * 64 + 3);
    for (let i = 0; i < raw.length; i++) raw[i] = (i * 37 + 11) & 0xff;
    // Keep 64-bit integers inside ±2^53: clear the top bits of each 8-byte word in both orders.
    for (const type of ['Int8', 'UInt8', 'Int16', 'UInt16', 'Int32', 'UInt32', 'Float32', 'Float64', 'Int64', 'UInt64'] as ElementType[]) {
      for (const le of [true, false]) {
        for (const offset of [0, 1, 3]) {
          const b = raw.slice();
          const bdv = new DataView(b.buffer);
          if (type === 'Int64' || type === 'UInt64') {
            for (let i = 0; i < 64; i++) bdv.setBigInt64(offset + 8 * i, BigInt((type === 'UInt64' ? i * 7919 : i * 7919 - 200) * 123456789), le);
          }
          if (type === 'Float32' || type === 'Float64') {
            for (let i = 0; i < 64; i++) type === 'Float32' ? bdv.setFloat32(offset + 4 * i, Math.sin(i) * 1e3, le) : bdv.setFloat64(offset + 8 * i, Math.cos(i) * 1e-3, le);
          }
          const got = Array.from(decodeElements(b, offset, 64, type, le, 't'));
          expect(got, `${type} ${le ? 'LE' : 'BE'} +${offset}`).toEqual(expected(b, type, le, 64, offset));
        }
      }
    }
  });

  it('refuses 64-bit integers beyond ±2^53 and accepts ±2^53 itself', () => {
    const b = new Uint8Array(24);
    const dv = new DataView(b.buffer);
    dv.setBigInt64(0, 2n ** 53n, true);
    dv.setBigInt64(8, -(2n ** 53n), true);
    dv.setBigInt64(16, 2n ** 53n + 1n, true);
    expect(Array.from(decodeElements(b, 0, 2, 'Int64', true, 't'))).toEqual([2 ** 53, -(2 ** 53)]);
    expect(() => decodeElements(b, 0, 3, 'Int64', true, 'f.vtu: "ids"')).toThrow('f.vtu: "ids": 64-bit value 9007199254740993 at index 2 is beyond ±2^53');
  });
});
