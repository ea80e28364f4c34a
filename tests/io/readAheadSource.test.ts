/**
 * The read-ahead source (src/io/readAheadSource.ts) hands out exactly the file's bytes for any range — inside
 * a planned piece (as a view), asked for twice, across pieces, out of order, past the end — and a dataset read
 * through it is the one read from the whole file's bytes (`readDataset`, itself checked against VTK 9.1 in
 * externalFiles.test.ts and vtkReference.test.ts), for every external file and every encoding our writers
 * produce. No external numbers are involved.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { basename, dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { appendedPieces, readAheadSource } from '../../src/io/readAheadSource.ts';
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

/** A small XML file of our own with raw appended arrays: head, `_`, then the arrays' bytes (0, 1, 2 … mod 251). */
function appendedFile(offsets: number[], dataBytes: number): Uint8Array {
  const arrays = offsets.map((o, k) => `<DataArray type="UInt8" Name="a${k}" format="appended" offset="${o}"/>`).join('');
  const head = new TextEncoder().encode(`<?xml version="1.0"?><VTKFile type="UnstructuredGrid"><X>${arrays}</X><AppendedData encoding="raw">\n   _`);
  const out = new Uint8Array(head.length + dataBytes + 20);
  out.set(head);
  for (let i = 0; i < dataBytes; i++) out[head.length + i] = i % 251;
  out.set(new TextEncoder().encode('\n</AppendedData>  '), head.length + dataBytes);
  return out;
}

describe('readAheadSource: the plan and the ranges', () => {
  it('finds the appended arrays\' places in the head: from each offset to the next, the last to the end of the file', () => {
    const f = appendedFile([500, 0, 200, 200], 1000);
    const base = f.indexOf(95 /* _ */) + 1;
    expect(appendedPieces(f, f.length)).toEqual([[base, base + 200], [base + 200, base + 500], [base + 500, f.length]]);
    // no appended data, or a head that ends before its marker: no plan
    expect(appendedPieces(new TextEncoder().encode('<VTKFile><Piece/></VTKFile>'), 30)).toEqual([]);
    expect(appendedPieces(f.subarray(0, f.indexOf(95)), f.length)).toEqual([]);
    // compressed arrays are read range by range
    const zipped = new TextEncoder().encode(new TextDecoder('latin1').decode(f).replace('<VTKFile ', '<VTKFile compressor="vtkZLibDataCompressor" '));
    expect(appendedPieces(zipped, zipped.length)).toEqual([]);
  });

  it('hands out each planned byte once as a view of its piece, anything else directly: always the file\'s bytes', async () => {
    const f = appendedFile([0, 3000, 7000], 9000);
    const base = f.indexOf(95) + 1;
    const s = readAheadSource(blobOf(f), 'a.vtu', { headBytes: 4096 });
    expect(s.size).toBe(f.length);
    const check = async (o: number, n: number) => {
      const got = await s.read(o, n);
      expect([...got]).toEqual([...f.subarray(o, Math.min(f.length, o + n))]);
      return got;
    };
    // the reader's first look at the head (across the head and the first piece): direct
    await check(0, 2048);
    expect(s.stats.planned).toBe(3);
    // a block header, then the data after it: views of the first piece's one buffer
    const header = await check(base, 8), data = await check(base + 8, 2992);
    expect(data.buffer).toBe(header.buffer);
    expect(data.byteOffset).toBe(8);
    // the same bytes again (e.g. a comparison): read directly, so a caller that swaps bytes in place harms no one
    data.fill(0);
    const again = await check(base + 8, 100);
    expect(again.buffer).not.toBe(data.buffer);
    // the third piece before the second (XML arrays are read in declared order); across two pieces; past the end
    await check(base + 7000, f.length - base - 7000);
    await check(base + 2990, 20);
    await check(base + 3000, 4000);
    await check(f.length - 5, 100);
    expect(await s.read(f.length, 4)).toHaveLength(0);
    // every piece was fetched once, ahead
    expect(s.stats.aheadBytes).toBe(f.length - base);
    await s.close();
    await check(base + 3000, 10);
  });

  it('holds at most maxAheadBytes unclaimed (plus what is in flight) and goes on as pieces are handed out', async () => {
    const f = appendedFile([0, 1000, 2000, 3000, 4000, 5000, 6000, 7000], 8000);
    const base = f.indexOf(95) + 1;
    const s = readAheadSource(blobOf(f), 'a.vtu', { headBytes: 4096, inFlight: 1, maxAheadBytes: 1500 });
    await s.read(base, 1000);
    await new Promise((r) => setTimeout(r, 50));
    // piece 0 handed out and dropped; piece 1 (1000 bytes) then piece 2 fetched; 1000 + 1000 ≥ 1500 stops it
    expect(s.stats.aheadBytes).toBe(3000);
    for (let o = 1000; o < 8000; o += 1000) expect([...(await s.read(base + o, 1000))]).toEqual([...f.subarray(base + o, base + o + 1000)]);
    expect(s.stats.directBytes).toBe(4096);
  });

  it('reads an array larger than maxAheadBytes range by range', async () => {
    const f = appendedFile([0, 1000, 5000], 6000);
    const base = f.indexOf(95) + 1;
    const s = readAheadSource(blobOf(f), 'a.vtu', { headBytes: 4096, maxAheadBytes: 2000 });
    expect([...(await s.read(base + 1000, 4000))]).toEqual([...f.subarray(base + 1000, base + 5000)]);
    expect([...(await s.read(base, 1000))]).toEqual([...f.subarray(base, base + 1000)]);
    expect(s.stats.planned).toBe(2);
    expect(s.stats.directBytes).toBe(4096 + 4000);
  });
});

describe('readAheadSource: datasets as from the whole bytes', () => {
  for (const path of walk(EXTERNAL)) {
    const rel = relative(EXTERNAL, path);
    it(rel, async () => {
      const name = basename(path), folder = dirname(path), bytes = bytesOf(path);
      const want = await outcome(() => readDataset(name, bytes, { resolve: async (p) => bytesOf(join(folder, p)) }));
      expectSameOutcome(await outcome(() => readDatasetFrom(readAheadSource(blobOf(bytes), name, { headBytes: 4096, inFlight: 1 }), {
        resolveSource: async (p) => readAheadSource(blobOf(bytesOf(join(folder, p))), basename(p), { headBytes: 4096, inFlight: 1 }),
      })), want, `${rel} read ahead`);
    });
  }
  for (const [name, bytes] of writtenFiles(writtenDataset())) {
    it(name, async () => {
      const want = await outcome(() => readDataset(name, bytes));
      expect('ok' in want).toBe(true);
      expectSameOutcome(await outcome(() => readDatasetFrom(readAheadSource(blobOf(bytes), name, { inFlight: 3, maxAheadBytes: 2048 }))), want, `${name} read ahead`);
    });
  }
});
