/**
 * The batch inflater on the platform's `DecompressionStream('deflate')` (Node has the same class as
 * browsers): blocks written by node:zlib (an independent zlib, RFC 1950/1951) come back byte for byte;
 * corrupt, short, long and bad-checksum blocks give exactly what fflate's single-block inflater gives, so
 * the reader's messages are unchanged; and whole files load to the same bytes as without it.
 */
import { deflateSync } from 'node:zlib';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { platformDecompressionStream, streamBatchInflate, streamInflateExact } from '../../src/io/streamBatchInflate.ts';
import { fflateInflate } from '../../src/io/xmlBlocks.ts';
import type { Dataset } from '../../src/model/dataset.ts';

const SAMPLES = resolve(__dirname, '../../sample-fields');

/** Deterministic test bytes: a slowly varying ramp with some noise, so the blocks compress but not trivially. */
function data(n: number, seed: number): Uint8Array {
  const b = new Uint8Array(n);
  let s = seed >>> 0;
  for (let i = 0; i < n; i++) { s = (Math.imul(s, 1664525) + 1013904223) >>> 0; b[i] = ((i >> 6) + (s >>> 29)) & 0xff; }
  return b;
}

/** What fflate's inflater gives for a block: the count, or its Error's message. */
function fflateResult(block: Uint8Array, size: number): number | string {
  try {
    return fflateInflate(block, new Uint8Array(size));
  } catch (e) {
    return (e as Error).message;
  }
}

const Stream = platformDecompressionStream();

describe('streamBatchInflate', () => {
  it('runs on this Node (DecompressionStream is a global since Node 18)', () => {
    expect(Stream).toBeTypeOf('function');
    expect(streamBatchInflate().batch).toBeTypeOf('function');
  });

  it('inflates a batch of node:zlib blocks to their bytes, several at once', async () => {
    const raw = Array.from({ length: 9 }, (_, i) => data(i === 8 ? 12_345 : 65_536, i + 1));
    const blocks = raw.map((r, i) => deflateSync(r, { level: i % 10 }));
    const outs = raw.map((r) => new Uint8Array(r.length));
    const got = await streamBatchInflate().batch!(blocks, outs);
    expect(got).toEqual(raw.map((r) => r.length));
    raw.forEach((r, i) => expect(Buffer.from(outs[i]!).equals(Buffer.from(r)), `block ${i}`).toBe(true));
  });

  it('takes the platform result only when exact: a sound block is true, a wrong size is false', async () => {
    const r = data(40_000, 7), z = deflateSync(r);
    expect(await streamInflateExact(Stream!, z, new Uint8Array(40_000))).toBe(true);
    expect(await streamInflateExact(Stream!, z, new Uint8Array(40_001))).toBe(false);
    expect(await streamInflateExact(Stream!, z, new Uint8Array(39_999))).toBe(false);
  });

  it('gives, for bad blocks, exactly what fflate gives (count or message), next to sound ones', async () => {
    const r = data(50_000, 3), z = deflateSync(r);
    const garbled = new Uint8Array(z); for (let i = 100; i < 164; i++) garbled[i] ^= 0x5a;
    const badSum = new Uint8Array(z); badSum[badSum.length - 1] ^= 1;
    const truncated = z.subarray(0, z.length - 10);
    const notZlib = new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8]);
    const cases: [Uint8Array, number][] = [[z, 50_000], [garbled, 50_000], [badSum, 50_000], [truncated, 50_000], [z, 60_000], [z, 1000], [notZlib, 10], [z, 50_000]];
    const outs = cases.map(([, n]) => new Uint8Array(n));
    const got = await streamBatchInflate().batch!(cases.map(([b]) => b), outs);
    const want = cases.map(([b, n]) => fflateResult(b, n));
    expect(got).toEqual(want);
    // the checks that name what went wrong (values fixed by RFC 1950 framing, not by this code)
    expect(want[0]).toBe(50_000);
    expect(want[2]).toBe('the Adler-32 checksum does not match the inflated data');
    expect(want[4]).toBe(50_000);
    expect(want[5] as number).toBeGreaterThan(1000);
    expect(Buffer.from(outs[7]!).equals(Buffer.from(r))).toBe(true);
  });

  it('stops a block that inflates far past its size (32 MiB of zeros) without inflating it whole', async () => {
    const bomb = deflateSync(new Uint8Array(32 << 20), { level: 9 });
    const got = await streamBatchInflate().batch!([bomb, bomb], [new Uint8Array(1000), new Uint8Array(24)]);
    expect(got).toEqual([fflateResult(bomb, 1000), fflateResult(bomb, 24)]);
    expect(got[0] as number).toBeGreaterThan(1000);
  });

  it('is the single-block inflater itself where the platform has no DecompressionStream', () => {
    const inflate = streamBatchInflate(fflateInflate, null);
    expect(inflate).toBe(fflateInflate);
    expect(inflate.batch).toBeUndefined();
  });
});

/** Every typed array of a dataset, in a fixed order. */
function arraysOf(d: Dataset): ArrayBufferView[] {
  return d.pieces.flatMap((p) => [p.points, p.cellTypes, p.offsets, p.connectivity, ...[...p.pointData, ...p.cellData].map((f) => f.values)]);
}

describe('loading zlib files with it', () => {
  it.each(['sphere-stokes.vtu', 'pipe-fine.vtu', 'duct.vtu'])('%s: every array byte for byte as with node:zlib', async (name) => {
    const inflate = streamBatchInflate();
    let batchedBytes = 0;
    const counting = Object.assign((b: Uint8Array, o: Uint8Array) => inflate(b, o), {
      batch: async (b: readonly Uint8Array[], o: readonly Uint8Array[]) => { for (const x of o) batchedBytes += x.length; return inflate.batch!(b, o); },
    });
    const one = await loadDatasetFile(`${SAMPLES}/${name}`);
    const a = arraysOf(one);
    const b = arraysOf(await loadDatasetFile(`${SAMPLES}/${name}`, { inflate: counting }));
    expect(b.length).toBe(a.length);
    a.forEach((v, i) => expect(Buffer.from(b[i]!.buffer, b[i]!.byteOffset, b[i]!.byteLength).equals(Buffer.from(v.buffer, v.byteOffset, v.byteLength)), `array ${i}`).toBe(true));
    // the Int64 connectivity (narrowed to Int32 through the scratch) and the Float64 points (inflated in place) went through batches
    const p = one.pieces[0]!;
    expect(batchedBytes).toBeGreaterThan(p.connectivity.length * 8 + p.points.length * 8);
  });
});
