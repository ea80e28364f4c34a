/**
 * Base64 decoding from bytes. References: the test vectors of RFC 4648 §10, and Node's own base64
 * decoder (`Buffer.from(s, 'base64')`) on seeded random data.
 */
import { describe, expect, it } from 'vitest';
import { Base64Reader, decodeBase64 } from '../../src/io/base64.ts';
import { seededRandom as rng } from '../../src/model/seededRandom.ts';

const bytesOf = (s: string) => new TextEncoder().encode(s);
const decodeAll = (s: string) => Array.from(decodeBase64(bytesOf(s), 0, s.length, 'test'));


describe('decodeBase64', () => {
  it('decodes the RFC 4648 §10 test vectors', () => {
    // Reference: RFC 4648 §10 (BASE64("f") = "Zg==", … BASE64("foobar") = "Zm9vYmFy").
    const vectors: [string, string][] = [['', ''], ['f', 'Zg=='], ['fo', 'Zm8='], ['foo', 'Zm9v'], ['foob', 'Zm9vYg=='], ['fooba', 'Zm9vYmE='], ['foobar', 'Zm9vYmFy']];
    for (const [plain, enc] of vectors) expect(decodeAll(enc)).toEqual(Array.from(bytesOf(plain)));
  });

  it('matches Node’s decoder on random data of every length 0..300, with and without line breaks', () => {
    // Reference: Node's Buffer base64 codec.
    const r = rng(7);
    for (let n = 0; n <= 300; n++) {
      const data = Uint8Array.from({ length: n }, () => Math.floor(r() * 256));
      const enc = Buffer.from(data).toString('base64');
      expect(decodeAll(enc)).toEqual(Array.from(data));
      const wrapped = `\n  ${enc.replace(/(.{76})/g, '$1\n')}\r\n\t`;
      expect(decodeAll(wrapped)).toEqual(Array.from(data));
    }
  });

  it('decodes separately padded runs as one byte stream (VTK writes header and data as two runs)', () => {
    const header = Uint8Array.from([16, 0, 0, 0, 0, 0, 0, 0]);
    const data = Uint8Array.from({ length: 16 }, (_, i) => i * 7);
    const two = Buffer.from(header).toString('base64') + Buffer.from(data).toString('base64');
    expect(two).toContain('=A');
    expect(decodeAll(two)).toEqual([...header, ...data]);
  });

  it('hands out bytes across group boundaries in any split (header first, then data)', () => {
    const data = Uint8Array.from({ length: 50 }, (_, i) => (i * 37) & 255);
    const enc = bytesOf(Buffer.from(data).toString('base64'));
    for (const first of [1, 2, 3, 4, 5, 8, 13]) {
      const r = new Base64Reader(enc, 0, enc.length, 'test');
      const a = r.read(first), b = r.read(50 - first);
      expect([...a, ...b]).toEqual(Array.from(data));
      expect(() => r.read(1)).toThrow(/test: base64 data end after 0 of 1 bytes/);
    }
  });

  it('reports an upper bound of the bytes left before decoding', () => {
    const enc = bytesOf('Zm9vYmFy');
    const r = new Base64Reader(enc, 0, enc.length, 'test');
    expect(r.available()).toBe(6);
    r.read(4);
    expect(r.available()).toBe(2);
  });

  it('names the array and the character for invalid input', () => {
    expect(() => decodeAll('Zm9v#mFy')).toThrow('test: invalid base64 character "#" at byte 4');
    expect(() => decodeAll('Zm9v\u0001mFy')).toThrow('test: invalid base64 character byte 0x01 at byte 4');
    expect(() => decodeAll('Z===')).toThrow(/test: misplaced base64 padding/);
    expect(() => decodeAll('Zg=a')).toThrow(/test: base64 character after "=" padding/);
    expect(() => decodeAll('Zm9vY')).toThrow(/test: base64 data end inside a 4-character group/);
  });

  it('decodes a large buffer correctly (fast path)', () => {
    const r = rng(11);
    const data = Uint8Array.from({ length: 1 << 20 }, () => Math.floor(r() * 256));
    const enc = bytesOf(Buffer.from(data).toString('base64'));
    const out = decodeBase64(enc, 0, enc.length, 'big');
    expect(out.length).toBe(data.length);
    expect(Buffer.compare(Buffer.from(out), Buffer.from(data))).toBe(0);
  });
});
