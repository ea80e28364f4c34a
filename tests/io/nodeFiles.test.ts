/**
 * The Node loader's pieces: node:zlib's inflater (`nodeInflate`) against the reference zlib streams made
 * by node:zlib's deflate, including streams shorter and longer than declared, corrupt and cut streams,
 * and a good stream after a bad one. Reference: RFC 1950/1951 streams from Node's zlib (the zlib library).
 */
import { deflateSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { nodeInflate } from '../../src/io/nodeFiles.ts';
import { fflateInflate } from '../../src/io/xmlBlocks.ts';

const data = (n: number) => Uint8Array.from({ length: n }, (_, i) => (i * 7 + (i >> 5)) & 255);

describe('nodeInflate', () => {
  it('inflates into the buffer given, as fflate does', () => {
    for (const n of [1, 100, 32768, 100_000]) {
      const z = deflateSync(data(n));
      const a = new Uint8Array(n), b = new Uint8Array(n);
      expect(nodeInflate(z, a)).toBe(n);
      expect(fflateInflate(z, b)).toBe(n);
      expect(Buffer.compare(a, b)).toBe(0);
      expect(Buffer.compare(a, data(n))).toBe(0);
    }
  });

  it('says how much a stream holds when it is shorter or longer than declared', () => {
    const z = deflateSync(data(1000));
    expect(nodeInflate(z, new Uint8Array(1200))).toBe(1000);
    expect(nodeInflate(z, new Uint8Array(800))).toBeGreaterThan(800);
  });

  it('throws zlib’s message on corrupt and cut streams, and inflates the next good stream', () => {
    const z = deflateSync(data(5000));
    const bad = Uint8Array.from(z);
    bad[0] = 0x12; bad[1] = 0x34;
    expect(() => nodeInflate(bad, new Uint8Array(5000))).toThrow(/incorrect header check/);
    expect(() => nodeInflate(z.subarray(0, z.length - 10), new Uint8Array(5000))).toThrow(/unexpected end of file/);
    const out = new Uint8Array(5000);
    expect(nodeInflate(z, out)).toBe(5000);
    expect(Buffer.compare(out, data(5000))).toBe(0);
  });
});
