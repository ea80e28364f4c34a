/**
 * PNG encoding and checksums. Reference implementations: Node's zlib.crc32 and node:crypto's SHA-256
 * (general-purpose libraries); the PNG reader of tests/system/png.ts (which inflates with fflate) for
 * decoding; the PNG specification (ISO/IEC 15948) for the chunk layout.
 */
import { createHash, randomBytes } from 'node:crypto';
import { crc32 as zlibCrc32 } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { crc32, encodePng } from '../../src/study/pngEncode.ts';
import { sha256Hex, sha256Plain } from '../../src/study/sha256.ts';
import { readPng } from '../system/png.ts';

describe('encodePng', () => {
  it('round-trips RGB pictures (opaque) and RGBA ones through a PNG reader', () => {
    const w = 37, h = 23, rgba = new Uint8Array(4 * w * h);
    for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) {
      const i = 4 * (y * w + x);
      rgba[i] = (x * 7) & 255; rgba[i + 1] = (y * 11) & 255; rgba[i + 2] = (x * y) & 255; rgba[i + 3] = 255;
    }
    const png = encodePng(w, h, rgba);
    expect(png[25]).toBe(2); // colour type RGB
    const back = readPng(png);
    expect([back.width, back.height]).toEqual([w, h]);
    expect(back.rgba).toEqual(rgba);
    rgba[3] = 128;
    const withAlpha = encodePng(w, h, rgba);
    expect(withAlpha[25]).toBe(6); // colour type RGBA
    expect(readPng(withAlpha).rgba).toEqual(rgba);
  });

  it('writes each chunk with its length and CRC-32 (ISO/IEC 15948 §5.3)', () => {
    const png = encodePng(2, 1, new Uint8Array([255, 0, 0, 255, 0, 0, 255, 255]));
    const dv = new DataView(png.buffer, png.byteOffset);
    const types: string[] = [];
    for (let p = 8; p < png.length;) {
      const len = dv.getUint32(p), type = String.fromCharCode(...png.subarray(p + 4, p + 8));
      types.push(type);
      expect(dv.getUint32(p + 8 + len)).toBe(zlibCrc32(png.subarray(p + 4, p + 8 + len)));
      p += 12 + len;
    }
    expect(types).toEqual(['IHDR', 'IDAT', 'IEND']);
  });

  it('crc32 equals zlib\'s on random data', () => {
    for (const n of [0, 1, 7, 1000, 65537]) {
      const b = new Uint8Array(randomBytes(n));
      expect(crc32(b)).toBe(zlibCrc32(b));
    }
  });

  it('refuses a buffer of the wrong size', () => {
    expect(() => encodePng(3, 3, new Uint8Array(10))).toThrow('png: 10 bytes for 3 × 3 RGBA pixels, expected 36');
  });
});

describe('sha256', () => {
  it('the plain implementation and Web Crypto equal node:crypto around the padding boundaries', async () => {
    for (const n of [0, 1, 55, 56, 63, 64, 65, 119, 120, 1000, 100_003]) {
      const b = new Uint8Array(randomBytes(n));
      const ref = createHash('sha256').update(b).digest('hex');
      expect(Buffer.from(sha256Plain(b)).toString('hex')).toBe(ref);
      expect(await sha256Hex(b)).toBe(ref);
    }
  });
});
