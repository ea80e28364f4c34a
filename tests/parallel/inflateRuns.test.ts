/**
 * The pure parts of the browser's parallel inflater: runs of blocks split by compressed bytes cover every
 * block once, in order; a job list inflates blocks written by node:zlib (an independent zlib, RFC 1950/1951)
 * back to their bytes with fflate, and reports a corrupt, a short and a long block as fflate's single-block
 * inflater does (its count or its message), so the reader's messages are those of a one-thread load.
 */
import { deflateSync } from 'node:zlib';
import { describe, expect, it } from 'vitest';
import { inflateRun, splitRuns } from '../../src/parallel/inflateRuns.ts';
import { fflateInflate } from '../../src/io/xmlBlocks.ts';

/** Deterministic bytes that compress, but not trivially. */
function data(n: number, seed: number): Uint8Array {
  const b = new Uint8Array(n);
  let s = seed >>> 0;
  for (let i = 0; i < n; i++) { s = (Math.imul(s, 1664525) + 1013904223) >>> 0; b[i] = ((i >> 6) + (s >>> 29)) & 0xff; }
  return b;
}

describe('splitRuns', () => {
  it('splits by compressed bytes into contiguous runs covering every block once', () => {
    expect(splitRuns([10, 10, 10, 10], 2)).toEqual([[0, 2], [2, 4]]);
    expect(splitRuns([30, 10, 10, 10], 2)).toEqual([[0, 1], [1, 4]]);
    expect(splitRuns([5, 5, 5], 1)).toEqual([[0, 3]]);
    // more lanes than blocks: one block each, no empty run
    expect(splitRuns([5, 5], 4)).toEqual([[0, 1], [1, 2]]);
    expect(splitRuns([], 3)).toEqual([]);
    for (const lanes of [1, 2, 3, 7]) {
      const sizes = Array.from({ length: 50 }, (_, i) => 100 + ((i * 37) % 23));
      const runs = splitRuns(sizes, lanes);
      expect(runs.length).toBeLessThanOrEqual(lanes);
      expect(runs[0]![0]).toBe(0);
      expect(runs.at(-1)![1]).toBe(50);
      runs.forEach(([a, b], i) => { expect(b).toBeGreaterThan(a); if (i > 0) expect(a).toBe(runs[i - 1]![1]); });
    }
  });
});

describe('inflateRun', () => {
  it('inflates node:zlib blocks by a job list into their places, and reports bad blocks as fflate does', () => {
    const raw = [data(65_536, 1), data(65_536, 2), data(1_234, 3)];
    const good = raw.map((r, i) => deflateSync(r, { level: 3 * i + 1 }));
    const garbled = new Uint8Array(good[0]!); for (let i = 40; i < 104; i++) garbled[i] ^= 0x5a;
    const badSum = new Uint8Array(good[1]!); badSum[badSum.length - 1] ^= 1;
    // blocks, and the size each is declared to inflate to (the last two: declared too long, too short)
    const cases: [Uint8Array, number][] = [[good[0]!, 65_536], [good[1]!, 65_536], [good[2]!, 1_234], [garbled, 65_536], [badSum, 65_536], [good[2]!, 2_000], [good[0]!, 1_000]];
    const input = new Uint8Array(cases.reduce((n, [b]) => n + b.length, 0));
    const output = new Uint8Array(cases.reduce((n, [, m]) => n + m, 0));
    const jobs: number[] = [];
    for (let i = 0, a = 0, o = 0; i < cases.length; i++) {
      const [b, m] = cases[i]!;
      input.set(b, a);
      jobs.push(a, b.length, o, m);
      a += b.length; o += m;
    }
    const got = inflateRun(input, output, jobs, fflateInflate);
    const single = cases.map(([b, m]) => { try { return fflateInflate(b, new Uint8Array(m)); } catch (e) { return (e as Error).message; } });
    expect(got).toEqual(single);
    expect(got.slice(0, 3)).toEqual([65_536, 65_536, 1_234]);
    expect(got[4]).toBe('the Adler-32 checksum does not match the inflated data');
    expect(got[5]).toBe(1_234);
    expect(got[6] as number).toBeGreaterThan(1_000);
    expect(Buffer.from(output.subarray(0, 65_536)).equals(Buffer.from(raw[0]!))).toBe(true);
    expect(Buffer.from(output.subarray(65_536, 131_072)).equals(Buffer.from(raw[1]!))).toBe(true);
    expect(Buffer.from(output.subarray(131_072, 131_072 + 1_234)).equals(Buffer.from(raw[2]!))).toBe(true);
  });
});
