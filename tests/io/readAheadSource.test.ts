/**
 * The read-ahead source (src/io/readAheadSource.ts) hands out exactly the file's bytes for any range — across
 * slices, asked for twice, after a slice was dropped, past the end — and a dataset read through it is the one
 * read from the whole file's bytes (`readDataset`, itself checked against VTK 9.1 in externalFiles.test.ts
 * and vtkReference.test.ts), for every external file and every encoding our writers produce, with slices
 * small enough that every array spans several. No external numbers are involved.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { basename, dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readAheadSource } from '../../src/io/readAheadSource.ts';
import { readDataset, readDatasetFrom } from '../../src/io/readDataset.ts';
import { expectSameOutcome, outcome } from '../helpers/sources.ts';
import { writtenDataset, writtenFiles } from '../helpers/writtenFiles.ts';

const EXTERNAL = resolve(__dirname, '../fixtures/external');
const bytesOf = (path: string) => new Uint8Array(readFileSync(path));
const blobOf = (b: Uint8Array) => new Blob([b as Uint8Array<ArrayBuffer>]);

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? walk(p) : /\.(vtk|vtu|vtp|pvtu|vtm)$/.test(f) ? [p] : [];
  });
}

/** Bytes 0, 1, 2 … (mod 251), so a byte's value tells its position. */
function numbered(n: number): Uint8Array {
  const b = new Uint8Array(n);
  for (let i = 0; i < n; i++) b[i] = i % 251;
  return b;
}

describe('readAheadSource: ranges', () => {
  it('hands out exactly the asked bytes in fresh buffers, across slices, repeated, out of order and past the end', async () => {
    const bytes = numbered(10_000);
    const s = readAheadSource(blobOf(bytes), 'n.bin', { sliceBytes: 1000, inFlight: 2 });
    expect(s.size).toBe(10_000);
    expect(s.chunkBytes).toBe(1000);
    // [offset, length]: inside one slice, across three, the last slice, out of order, twice, past the end, empty
    const asks: [number, number][] = [[0, 10], [5, 2500], [9_000, 1000], [3_999, 2], [0, 10], [7_000, 1500], [1_000, 1000], [1_000, 1000], [9_990, 100], [10_000, 5], [42, 0]];
    for (const [o, n] of asks) {
      const got = await s.read(o, n);
      const want = bytes.subarray(o, Math.min(bytes.length, o + n));
      expect(got.byteOffset).toBe(0);
      expect(got.buffer.byteLength).toBe(want.length);
      expect([...got]).toEqual([...want]);
    }
    // every slice was fetched by the sweep once; bytes asked for again after their slice was dropped came directly
    expect(s.stats.sweptBytes).toBe(10_000);
    expect(s.stats.directBytes).toBeGreaterThan(0);
    await s.close();
    // after close, reads still give the file's bytes (directly)
    expect([...(await s.read(2_500, 3))]).toEqual([...bytes.subarray(2_500, 2_503)]);
  });

  it('pauses the sweep while maxAheadBytes wait unclaimed, and goes on as they are handed out', async () => {
    const bytes = numbered(8_000);
    const s = readAheadSource(blobOf(bytes), 'n.bin', { sliceBytes: 1000, inFlight: 4, maxAheadBytes: 2000 });
    expect([...(await s.read(0, 1000))]).toEqual([...bytes.subarray(0, 1000)]);
    await new Promise((r) => setTimeout(r, 50));
    // slice 0 handed out; at most 2000 bytes (2 slices) plus those in flight when the limit was reached are held
    expect(s.stats.sweptBytes).toBeLessThanOrEqual(1000 + 2000 + 4 * 1000);
    for (let o = 1000; o < 8000; o += 1000) expect([...(await s.read(o, 1000))]).toEqual([...bytes.subarray(o, o + 1000)]);
    expect(s.stats.sweptBytes).toBe(8_000);
    expect(s.stats.directBytes).toBe(0);
  });
});

describe('readAheadSource: datasets as from the whole bytes', () => {
  for (const path of walk(EXTERNAL)) {
    const rel = relative(EXTERNAL, path);
    it(rel, async () => {
      const name = basename(path), folder = dirname(path), bytes = bytesOf(path);
      const want = await outcome(() => readDataset(name, bytes, { resolve: async (p) => bytesOf(join(folder, p)) }));
      expectSameOutcome(await outcome(() => readDatasetFrom(readAheadSource(blobOf(bytes), name, { sliceBytes: 4096 }), {
        resolveSource: async (p) => readAheadSource(blobOf(bytesOf(join(folder, p))), basename(p), { sliceBytes: 4096 }),
      })), want, `${rel} read ahead`);
    });
  }
  for (const [name, bytes] of writtenFiles(writtenDataset())) {
    it(name, async () => {
      const want = await outcome(() => readDataset(name, bytes));
      expect('ok' in want).toBe(true);
      expectSameOutcome(await outcome(() => readDatasetFrom(readAheadSource(blobOf(bytes), name, { sliceBytes: 1024, inFlight: 3 }))), want, `${name} read ahead`);
    });
  }
});
