/**
 * Binary block headers and zlib blocks of VTK XML arrays. Reference: the block layout in VTK's "VTK File
 * Formats" description (uncompressed `[byteCount]`; compressed `[nBlocks, blockSize, lastBlockSize,
 * compressedSizes…]`), with compressed streams made by Node's zlib (the reference zlib library).
 */
import { deflateSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { base64Source, rawSource, readBlocks, type BlockFormat } from '../../src/io/xmlBlocks.ts';
import { binaryBlock, concat, pack } from '../helpers/vtkXmlFixtures.ts';

const exp = (expectedValues?: number, elementSize = 1) => ({ where: 'f.vtu: piece 0: DataArray "p"', elementSize, ...(expectedValues !== undefined ? { expectedValues } : {}) });
const raw = (b: Uint8Array) => rawSource(b, 0, b.length);

describe('readBlocks, uncompressed', () => {
  for (const headerType of ['UInt32', 'UInt64'] as const) {
    for (const littleEndian of [true, false]) {
      it(`reads a ${headerType} ${littleEndian ? 'little' : 'big'}-endian byte-count header`, async () => {
        const data = Uint8Array.from({ length: 24 }, (_, i) => i + 1);
        const { header, payload } = binaryBlock(data, { encoding: 'appended-raw', headerType, bigEndian: !littleEndian });
        expect(header.length).toBe(headerType === 'UInt64' ? 8 : 4);
        const fmt: BlockFormat = { headerType, littleEndian, compressed: false };
        const got = await readBlocks(raw(concat([header, payload])), fmt, exp(3, 8));
        expect(Array.from(got)).toEqual(Array.from(data));
      });
    }
  }

  it('returns a view into the file for raw data (no copy)', async () => {
    const file = concat([pack('UInt32', [8], true), Uint8Array.from([1, 2, 3, 4, 5, 6, 7, 8])]);
    const got = await readBlocks(raw(file), { headerType: 'UInt32', littleEndian: true, compressed: false }, exp());
    expect(got.buffer).toBe(file.buffer);
    expect(got.byteOffset).toBe(4);
  });

  it('checks the declared count and the bytes left before allocating', async () => {
    const fmt: BlockFormat = { headerType: 'UInt32', littleEndian: true, compressed: false };
    const six = concat([pack('UInt32', [24], true), new Uint8Array(24)]);
    await expect(readBlocks(raw(six), fmt, exp(8, 4))).rejects.toThrow('f.vtu: piece 0: DataArray "p": declares 8 values, block holds 6');
    await expect(readBlocks(raw(concat([pack('UInt32', [7], true), new Uint8Array(7)])), fmt, exp(undefined, 4))).rejects.toThrow(/block holds 7 bytes, not a whole number of 4-byte values/);
    const huge = concat([pack('UInt64', [2 ** 40], true), new Uint8Array(16)]);
    await expect(readBlocks(raw(huge), { ...fmt, headerType: 'UInt64' }, exp())).rejects.toThrow('block header says 1099511627776 bytes, only 16 are left in the file');
    const beyond = concat([pack('UInt32', [0, 0x400000], true)]);
    await expect(readBlocks(raw(beyond), { ...fmt, headerType: 'UInt64' }, exp())).rejects.toThrow(/header value beyond 2\^53/);
    await expect(readBlocks(raw(Uint8Array.from([1, 0])), fmt, exp())).rejects.toThrow('needs 4 bytes of UInt32 header, only 2 are left');
  });
});

describe('readBlocks, zlib', () => {
  const data = Uint8Array.from({ length: 100_000 }, (_, i) => (i * 31 + (i >> 7)) & 255);

  for (const headerType of ['UInt32', 'UInt64'] as const) {
    for (const littleEndian of [true, false]) {
      it(`inflates several blocks with a short last one (${headerType}, ${littleEndian ? 'LE' : 'BE'})`, async () => {
        const { header, payload } = binaryBlock(data, { encoding: 'appended-raw', headerType, bigEndian: !littleEndian, zlibBlockSize: 32768 });
        const got = await readBlocks(raw(concat([header, payload])), { headerType, littleEndian, compressed: true }, exp(25_000, 4));
        expect(got.length).toBe(data.length);
        expect(Buffer.compare(Buffer.from(got), Buffer.from(data))).toBe(0);
      });
    }
  }

  it('treats a last-block size of 0 as a full block, and 0 blocks as an empty array', async () => {
    const exact = data.subarray(0, 65536);
    const { header, payload } = binaryBlock(exact, { encoding: 'appended-raw', zlibBlockSize: 32768 });
    expect(Array.from(header.subarray(0, 12))).toEqual(Array.from(pack('UInt32', [2, 32768, 0], true)));
    const got = await readBlocks(raw(concat([header, payload])), { headerType: 'UInt32', littleEndian: true, compressed: true }, exp(65536));
    expect(Buffer.compare(Buffer.from(got), Buffer.from(exact))).toBe(0);
    const empty = await readBlocks(raw(pack('UInt32', [0, 32768, 0], true)), { headerType: 'UInt32', littleEndian: true, compressed: true }, exp(0));
    expect(empty.length).toBe(0);
  });

  it('reads zlib data from base64, header and data encoded separately or together', async () => {
    const small = data.subarray(0, 5000);
    const { header, payload } = binaryBlock(small, { encoding: 'binary', zlibBlockSize: 2048 });
    for (const text of [Buffer.from(header).toString('base64') + Buffer.from(payload).toString('base64'), Buffer.from(concat([header, payload])).toString('base64')]) {
      const t = new TextEncoder().encode(text);
      const got = await readBlocks(base64Source(t, 0, t.length, 'w'), { headerType: 'UInt32', littleEndian: true, compressed: true }, exp(5000));
      expect(Buffer.compare(Buffer.from(got), Buffer.from(small))).toBe(0);
    }
  });

  it('refuses inconsistent or corrupt blocks with a clear message', async () => {
    const fmt: BlockFormat = { headerType: 'UInt32', littleEndian: true, compressed: true };
    const z = new Uint8Array(deflateSync(data.subarray(0, 1000)));
    const good = (words: number[], body = z) => raw(concat([pack('UInt32', words, true), body]));
    await expect(readBlocks(good([1, 1000, 0, z.length]), fmt, exp(999))).rejects.toThrow('declares 999 values, zlib blocks hold 1000');
    await expect(readBlocks(good([1, 1000, 1001, z.length]), fmt, exp())).rejects.toThrow(/last block \(1001 bytes\) is larger than the block size/);
    await expect(readBlocks(good([1, 1000, 0, z.length + 50]), fmt, exp())).rejects.toThrow(/compressed blocks need \d+ bytes, only \d+ are left/);
    await expect(readBlocks(good([1, 2 ** 31, 0, z.length]), fmt, exp())).rejects.toThrow(/more than zlib can expand; the header is corrupt/);
    await expect(readBlocks(good([1, 1100, 0, z.length]), fmt, exp())).rejects.toThrow('zlib block 0 of 1 inflates to 1000 bytes, the header says 1100');
    await expect(readBlocks(good([2 ** 30, 1000, 0]), fmt, exp())).rejects.toThrow(/compression header declares 1073741824 blocks, but only \d+ bytes are left/);
    const corrupt = z.slice();
    corrupt[0] = 0x12;
    await expect(readBlocks(good([1, 1000, 0, z.length], corrupt), fmt, exp())).rejects.toThrow(/zlib block 0 of 1 is corrupt \(invalid zlib data/);
    const garbled = z.slice();
    for (let i = 2; i < garbled.length - 4; i++) garbled[i] = (garbled[i]! * 7 + 13) & 255;
    await expect(readBlocks(good([1, 1000, 0, z.length], garbled), fmt, exp())).rejects.toThrow(/zlib block 0 of 1 (is corrupt|inflates to)/);
  });
});
