/**
 * One part of an array read on its own (src/io/partReads.ts): parts laid end to end give the bytes of one read of
 * the whole array, whatever the part boundaries, and their joined scans equal a scan of the whole array (first
 * non-finite value, least and greatest id). Part ranges cover the array once, on chunk boundaries. A one-thread
 * read notes the same scans.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import type { ArrayPlan } from '../../src/io/elementConvert.ts';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { joinScans, partRanges, readPartSync } from '../../src/io/partReads.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { notedFirstNonFinite, notedWithin } from '../../src/model/arrayScans.ts';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';

/** A `fill` over bytes in memory. */
const fillFrom = (file: Uint8Array) => (at: number, t: Uint8Array) => { t.set(file.subarray(at, at + t.length)); };

describe('partRanges', () => {
  it('covers [0, count) once, each part but the last a whole number of chunks', () => {
    for (const [count, step, workers] of [[1000, 64, 3], [10, 64, 4], [129, 64, 2], [64 * 7, 64, 3], [1, 1, 5], [0, 8, 2]] as const) {
      const r = partRanges(count, step, workers);
      expect(r.length).toBeLessThanOrEqual(workers);
      let at = 0;
      for (const [a, b] of r) { expect(a).toBe(at); expect(a % step).toBe(0); at = b; }
      expect(at).toBe(count === 0 ? 0 : count);
    }
    expect(partRanges(1000, 64, 3)).toEqual([[0, 384], [384, 768], [768, 1000]]);
  });
});

describe('readPartSync', () => {
  it('Int64 ids in parts: the values and the range of one whole read, the lead slot kept', () => {
    const n = 300, file = new Uint8Array(16 + 8 * n), dv = new DataView(file.buffer);
    for (let i = 0; i < n; i++) dv.setBigInt64(16 + 8 * i, BigInt((i * 7919) % 1013), false);
    const plan: ArrayPlan = { type: 'Int64', littleEndian: false, target: 'ids', min: 0, lead: 1, where: 'f: DataArray "offsets"' };
    const whole = new Int32Array(n + 1), parts = new Int32Array(n + 1), scratch = new Uint8Array(8 * 16);
    const one = readPartSync(plan, whole, 16, 0, n, 16, fillFrom(file), scratch);
    const scans = partRanges(n, 16, 3).map(([a, b]) => readPartSync(plan, parts, 16, a, b, 16, fillFrom(file), scratch));
    expect(Array.from(parts)).toEqual(Array.from(whole));
    expect(whole[0]).toBe(0);
    expect(whole[1 + 5]).toBe((5 * 7919) % 1013);
    let lo = Infinity, hi = -Infinity;
    for (let i = 1; i <= n; i++) { lo = Math.min(lo, whole[i]!); hi = Math.max(hi, whole[i]!); }
    expect(one).toEqual({ min: lo, max: hi });
    expect(joinScans(scans)).toEqual({ min: lo, max: hi });
  });

  it('floats: the first non-finite value over all parts is the first of the whole array', () => {
    const n = 200, file = new Uint8Array(8 * n), dv = new DataView(file.buffer);
    for (let i = 0; i < n; i++) dv.setFloat64(8 * i, i === 150 ? Infinity : i === 90 ? Number.NaN : i / 3, true);
    const plan: ArrayPlan = { type: 'Float64', littleEndian: true, target: 'float64', where: 'f: DataArray (Points)' };
    const out = new Float64Array(n), scratch = new Uint8Array(8 * 32);
    const scans = partRanges(n, 32, 3).map(([a, b]) => readPartSync(plan, out, 0, a, b, 32, fillFrom(file), scratch));
    expect(scans.map((s) => s.firstNonFinite)).toEqual([90, 150, -1]);
    expect(joinScans(scans)).toEqual({ firstNonFinite: 90 });
    expect(out[3]).toBe(1);
  });

  it('a bad id throws the one-thread message with the index in the whole array', () => {
    const n = 100, file = new Uint8Array(4 * n), dv = new DataView(file.buffer);
    for (let i = 0; i < n; i++) dv.setInt32(4 * i, i === 77 ? -3 : i, true);
    const plan: ArrayPlan = { type: 'Int32', littleEndian: true, target: 'ids', min: 0, where: 'f: DataArray "connectivity"' };
    expect(() => readPartSync(plan, new Int32Array(n), 0, 64, 100, 16, fillFrom(file), new Uint8Array(64)))
      .toThrow('f: DataArray "connectivity": value -3 at index 77 is not an id in 0..2147483647');
  });
});

describe('one-thread reads note their scans too (raw, zlib and base64 arrays)', () => {
  // The piece checks then take the noted scan instead of reading the points, fields and connectivity again.
  it('a file read on one thread notes the ids range and the first non-finite value, as parts do', async () => {
    const q = hexGrid(5, 4, 3);
    const d = datasetOf([withFields(q, [pointFieldFrom(q, 'p', 1, (x, y, z, o) => { o[0] = x - y * z; })])]);
    const dir = mkdtempSync(join(tmpdir(), 'fieldtally-scans-'));
    try {
      for (const [idType, encoding] of [['Int32', 'appended-raw'], ['Int64', 'appended-raw'], ['Int64', 'zlib'], ['Int32', 'zlib'], ['Int64', 'base64']] as const) {
        const file = join(dir, `lattice-${idType}-${encoding}.vtu`);
        writeFileSync(file, writeVtu(d, { encoding, idType, blockSize: 256 }));
        const piece = (await loadDatasetFile(file)).pieces[0]!;
        expect(notedWithin(piece.connectivity, 0, 119)).toBe(true);
        expect(notedWithin(piece.connectivity, 1, 119)).toBe(false);
        expect(notedWithin(piece.connectivity, 0, 118)).toBe(false);
        expect(notedFirstNonFinite(piece.points)).toBe(-1);
        expect(notedFirstNonFinite(piece.pointData[0]!.values)).toBe(-1);
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
