/**
 * 64-bit ids read as two 32-bit words. Reference: the shared BigInt path (`decodeElements` + `toIds`),
 * which reads the same bytes through BigInt64Array, and DataView's own 64-bit accessors.
 */
import { describe, expect, it } from 'vitest';
import { decodeElements, toIds } from '../../src/io/elementTypes.ts';
import { decodeIds } from '../../src/io/idDecode.ts';
import { pack } from '../helpers/vtkXmlFixtures.ts';

describe('decodeIds', () => {
  const values = [0, 1, 2, 1000, 65535, 65536, 2 ** 31 - 1, 123456789, 7];

  for (const type of ['Int64', 'UInt64', 'Int32', 'UInt32', 'Int16', 'UInt8'] as const) {
    for (const littleEndian of [true, false]) {
      it(`${type}, ${littleEndian ? 'little' : 'big'}-endian, aligned and misaligned, equals the BigInt path`, () => {
        const vals = type === 'Int16' ? values.map((v) => v & 0x7fff) : type === 'UInt8' ? values.map((v) => v & 255) : values;
        const body = pack(type, type.endsWith('64') ? vals.map(BigInt) : vals, littleEndian);
        for (const shift of [0, 1, 2, 3, 4, 5]) {
          const buf = new Uint8Array(body.length + shift);
          buf.set(body, shift);
          const ours = decodeIds(buf, shift, vals.length, type, littleEndian, 'w');
          const ref = toIds(decodeElements(buf, shift, vals.length, type, littleEndian, 'w'), 'w');
          expect(Array.from(ours)).toEqual(Array.from(ref));
          expect(Array.from(ours)).toEqual(vals);
        }
      });
    }
  }

  it('accepts −1 when the minimum allows it (faceoffsets), refuses it otherwise', () => {
    const b = pack('Int64', [-1n, 31n], true);
    expect(Array.from(decodeIds(b, 0, 2, 'Int64', true, 'w', -1))).toEqual([-1, 31]);
    expect(() => decodeIds(b, 0, 2, 'Int64', true, 'w')).toThrow('w: value -1 at index 0 is not an id in 0..2147483647');
  });

  it('names the first value beyond 32 bits exactly', () => {
    for (const littleEndian of [true, false]) {
      expect(() => decodeIds(pack('Int64', [5n, 2n ** 31n], littleEndian), 0, 2, 'Int64', littleEndian, 'f.vtu: piece 0: DataArray "connectivity"'))
        .toThrow('f.vtu: piece 0: DataArray "connectivity": value 2147483648 at index 1 is not an id in 0..2147483647');
      expect(() => decodeIds(pack('Int64', [-(2n ** 40n)], littleEndian), 0, 1, 'Int64', littleEndian, 'w', -1)).toThrow('w: value -1099511627776 at index 0 is not an id in -1..2147483647');
      expect(() => decodeIds(pack('UInt64', [2n ** 63n + 5n], littleEndian), 0, 1, 'UInt64', littleEndian, 'w')).toThrow('w: value 9223372036854775813 at index 0 is not an id in 0..2147483647');
      expect(() => decodeIds(pack('UInt64', [2n ** 32n - 1n], littleEndian), 0, 1, 'UInt64', littleEndian, 'w')).toThrow('w: value 4294967295 at index 0 is not an id in 0..2147483647');
    }
  });

  it('refuses a byte range shorter than the count', () => {
    expect(() => decodeIds(new Uint8Array(12), 0, 2, 'Int64', true, 'w')).toThrow('w: needs 16 bytes of Int64 data, only 12 are left');
  });
});
