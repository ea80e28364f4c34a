/**
 * The readers' WebAssembly chunk kernel (src/io/chunkKernel.ts) and the synchronous reads of files on disk
 * (`readIntoSync`, src/io/sourceArrays.ts `readOnThisThread`): arrays, messages and noted scans are those of a
 * reference written here, one value at a time through DataView (ECMAScript's byte-order-explicit reader), with
 * the kernel on and off (`useChunkKernel`) — 64-bit ids with the bad value anywhere (lane 0–3 of a vector, the
 * tail, a chunk's edges), and floats with NaN/±∞ anywhere. The generated module must be what
 * bin/write-chunk-kernel.mjs writes now.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, afterEach, describe, expect, it } from 'vitest';
import { KERNEL_IDS, countBytesInKernel, kernelInput, narrowIdsInKernel, nonFiniteInKernel, useChunkKernel } from '../../src/io/chunkKernel.ts';
import { linearizeCells } from '../../src/io/cellAssembly.ts';
import { convertChunk, type ArrayPlan } from '../../src/io/elementConvert.ts';
import { openFileSource } from '../../src/io/nodeFiles.ts';
import { readArray } from '../../src/io/sourceArrays.ts';
import { notedCounts, notedFirstNonFinite, notedWithin } from '../../src/model/arrayScans.ts';

const dir = mkdtempSync(join(tmpdir(), 'fieldtally-chunk-kernel-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
afterEach(() => { useChunkKernel(true); });

/** A file holding `bytes` after a 5-byte head (so nothing is aligned in the file), read back as a source. */
async function onDisk(name: string, bytes: Uint8Array) {
  const path = join(dir, name);
  writeFileSync(path, Buffer.concat([Buffer.from('head!'), Buffer.from(bytes.buffer, bytes.byteOffset, bytes.length)]));
  return openFileSource(path);
}

function int64s(values: bigint[], unsigned: boolean): Uint8Array {
  const out = new Uint8Array(8 * values.length), dv = new DataView(out.buffer);
  values.forEach((v, i) => (unsigned ? dv.setBigUint64(8 * i, v, true) : dv.setBigInt64(8 * i, v, true)));
  return out;
}

/** The ids a value-by-value check gives (lead slot first), or its message for the first value outside [min, max]. */
function idReference(bytes: Uint8Array, unsigned: boolean, lead: number, max: number, where: string): number[] | string {
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.length), out: number[] = new Array(lead).fill(0);
  for (let i = 0; i < bytes.length / 8; i++) {
    const v = unsigned ? dv.getBigUint64(8 * i, true) : dv.getBigInt64(8 * i, true);
    if (v < 0n || v > BigInt(max)) return `${where}: value ${v} at index ${i} is not an id in 0..${max}`;
    out.push(Number(v));
  }
  return out;
}

async function readIds(name: string, bytes: Uint8Array, plan: ArrayPlan): Promise<{ ids: number[] | string; noted: boolean }> {
  const src = await openFileSource(join(dir, name));
  try {
    const a = await readArray(src, 5, bytes.length / 8, plan);
    const ids = Array.from(a), body = ids.slice(plan.lead ?? 0);
    const lo = body.reduce((m, v) => Math.min(m, v), Infinity), hi = body.reduce((m, v) => Math.max(m, v), -Infinity);
    return { ids, noted: notedWithin(a, lo, hi) && !notedWithin(a, lo + 1, Infinity) && !notedWithin(a, -Infinity, hi - 1) };
  } catch (e) {
    return { ids: (e as Error).message, noted: false };
  } finally {
    await src.close();
  }
}

describe('chunk kernel', () => {
  it('is present in Node and is what the generator writes', async () => {
    expect(useChunkKernel(true)).toBe(true);
    const gen = (await import('../../bin/write-chunk-kernel.mjs' as string)) as { chunkKernelSource(): string };
    expect(readFileSync(new URL('../../src/io/chunkKernelWasm.ts', import.meta.url), 'utf8')).toBe(gen.chunkKernelSource());
  });

  it('narrows 64-bit ids as the JavaScript loop does: low words, sign test, least and greatest, every length and lane', () => {
    const range = new Int32Array(2);
    for (let n = 1; n <= 13; n++) {
      for (let bad = -1; bad < n; bad++) {
        for (const high of [1, -1, 0x7fffffff]) {
          const values = Array.from({ length: n }, (_, i) => BigInt(((i * 7919) % 1000) - 3));
          if (bad >= 0) values[bad] = (BigInt(high) << 32n) + BigInt(bad);
          const bytes = int64s(values, false), out = new Int32Array(n + 2);
          const sign = narrowIdsInKernel(bytes, n, out, 2, range)!;
          const dv = new DataView(bytes.buffer);
          let wantSign = 0, lo = Infinity, hi = -Infinity;
          for (let i = 0; i < n; i++) {
            const l = dv.getInt32(8 * i, true), h = dv.getInt32(8 * i + 4, true);
            wantSign |= h ^ (l >> 31);
            lo = Math.min(lo, l); hi = Math.max(hi, l);
            expect(out[2 + i]).toBe(l);
          }
          expect(sign === 0).toBe(wantSign === 0);
          expect([range[0], range[1]]).toEqual([lo, hi]);
        }
      }
    }
  });

  it('tests floats for NaN and ±∞ wherever they lie, single and double precision', () => {
    for (const size of [4, 8] as const) {
      for (let n = 1; n <= 11; n++) {
        for (let at = -1; at < n; at++) {
          for (const bad of [NaN, Infinity, -Infinity]) {
            const input = kernelInput(n * size)!;
            const view = size === 4 ? new Float32Array(input.buffer, input.byteOffset, n + 4) : new Float64Array(input.buffer, input.byteOffset, n + 4);
            view.fill(-1.25e-3);
            view[n] = NaN; // past the chunk: not looked at
            if (at >= 0) view[at] = bad;
            expect(nonFiniteInKernel(input, n, size)).toBe(at >= 0);
          }
        }
      }
    }
    // the largest finite values are finite
    const input = kernelInput(16)!;
    new Float32Array(input.buffer, input.byteOffset, 4).set([3.4028234663852886e38, -3.4028234663852886e38, 1e-45, -0]);
    expect(nonFiniteInKernel(input, 4, 4)).toBe(false);
    new Float64Array(input.buffer, input.byteOffset, 2).set([Number.MAX_VALUE, -Number.MIN_VALUE]);
    expect(nonFiniteInKernel(input, 2, 8)).toBe(false);
  });

  it('leaves chunks it was not handed and a switched-off kernel to JavaScript', () => {
    expect(nonFiniteInKernel(new Uint8Array(16), 2, 8)).toBeUndefined();
    expect(useChunkKernel(false)).toBe(false);
    expect(kernelInput(8)).toBeUndefined();
    expect(narrowIdsInKernel(new Uint8Array(8), 1, new Int32Array(1), 0, new Int32Array(2))).toBeUndefined();
  });
});

describe('files on disk read by positional reads, kernel on and off', () => {
  const n = KERNEL_IDS + KERNEL_IDS / 2 + 3; // two chunks and a ragged end
  const where = 'f.vtu: DataArray "connectivity"';
  // bad values: first id, lane 1 and 3 of a vector, last of chunk 0, first of chunk 1, the last id
  const places = [-1, 0, 5, 7, KERNEL_IDS - 1, KERNEL_IDS, n - 1];
  for (const unsigned of [false, true]) {
    for (const at of places) {
      for (const bad of unsigned ? [2n ** 31n, 2n ** 63n + 5n] : [-1n, 2n ** 31n, -(2n ** 40n)]) {
        if (at < 0 && bad !== (unsigned ? 2n ** 31n : -1n)) continue;
        it(`${unsigned ? 'UInt64' : 'Int64'} ids, ${at < 0 ? 'all good' : `${bad} at ${at}`}`, async () => {
          const values = Array.from({ length: n }, (_, i) => BigInt((i * 104729) % 2000003));
          if (at >= 0) values[at] = bad;
          const bytes = int64s(values, unsigned);
          (await onDisk('ids.bin', bytes)).close();
          const plan: ArrayPlan = { type: unsigned ? 'UInt64' : 'Int64', littleEndian: true, target: 'ids', where, max: 0x7fffffff, lead: 1 };
          const want = idReference(bytes, unsigned, 1, 0x7fffffff, where);
          for (const on of [true, false]) {
            useChunkKernel(on);
            const got = await readIds('ids.bin', bytes, plan);
            expect(got.ids).toEqual(want);
            if (typeof want !== 'string') expect(got.noted).toBe(true);
          }
        });
      }
    }
  }

  for (const size of [4, 8] as const) {
    it(`Float${size * 8} values: the same bits and the same first non-finite index`, async () => {
      const count = (3 << 20) / size + 5;
      const values = size === 4 ? new Float32Array(count) : new Float64Array(count);
      for (let i = 0; i < count; i++) values[i] = Math.sin(i) * 1e3;
      const step = (1 << 20) / size;
      for (const at of [-1, 2, step - 1, step, 2 * step + 3, count - 1]) {
        const v = values.slice();
        if (at >= 0) { v[at] = at % 2 ? Infinity : NaN; v[count - 1 - (at % 3)] = -Infinity; }
        const bytes = new Uint8Array(v.buffer);
        const src = await onDisk('floats.bin', bytes);
        await src.close();
        let first = -1;
        for (let i = 0; i < count; i++) if (!Number.isFinite(v[i]!)) { first = i; break; }
        for (const on of [true, false]) {
          useChunkKernel(on);
          const s = await openFileSource(join(dir, 'floats.bin'));
          try {
            const a = await readArray(s, 5, count, { type: size === 4 ? 'Float32' : 'Float64', littleEndian: true, target: 'values', where: 'f' });
            expect(Buffer.from(a.buffer, a.byteOffset, a.byteLength).equals(Buffer.from(bytes))).toBe(true);
            expect(notedFirstNonFinite(a)).toBe(first);
          } finally {
            await s.close();
          }
        }
      }
    });
  }

  it('a file that ends inside an array says so, as the asynchronous read did', async () => {
    const src = await onDisk('short.bin', new Uint8Array(1000));
    try {
      await expect(readArray(src, 5, 1000, { type: 'Float32', littleEndian: true, target: 'values', where: 'f' }))
        .rejects.toThrow('short.bin: cannot read bytes 5..4005: the file holds 1005 bytes (did it change while loading?)');
    } finally {
      await src.close();
    }
  });
});

describe('cell types counted by runs', () => {
  it('counts as a cell-by-cell tally does, for one type, runs of types and a lone last cell', () => {
    const cases = [new Uint8Array(1003).fill(12), new Uint8Array([10, 10, 10, 10, 10, 12, 12, 10, 14, 14, 14, 14, 13]), new Uint8Array([12, 12, 12, 12, 12, 12, 12, 12, 10])];
    for (const types of cases) {
      const tally: Record<number, number> = {};
      for (const t of types) tally[t] = (tally[t] ?? 0) + 1;
      const nodes = (t: number) => ({ 10: 4, 12: 8, 13: 6, 14: 5 } as Record<number, number>)[t]!;
      const offsets = new Int32Array(types.length + 1);
      for (let c = 0; c < types.length; c++) offsets[c + 1] = offsets[c]! + nodes(types[c]!);
      const lin = linearizeCells(types, offsets, new Int32Array(offsets[types.length]!), 'f');
      expect(lin.fileCellTypes).toEqual(tally);
    }
  });
});

describe('cell types counted by the kernel', () => {
  /** A cell-by-cell tally (the reference), as 256 counts. */
  const tally = (types: Uint8Array) => { const t = new Float64Array(256); for (const x of types) t[x]! += 1; return t; };

  it('counts every byte value as a tally does: one value, runs, every value, a lone first and last byte, none', () => {
    const every = Uint8Array.from({ length: 3000 }, (_, i) => (i * 7919) % 256);
    const cases = [new Uint8Array(1003).fill(12), new Uint8Array([10, 10, 10, 10, 10, 12, 12, 10, 14, 14, 14, 14, 13]), every,
      new Uint8Array([255, 0, 0, 0, 0]), new Uint8Array([3]), new Uint8Array(0), new Uint8Array((1 << 20) + 7).fill(10)];
    cases[6]![0] = 12; cases[6]![(1 << 20) - 1] = 0; cases[6]![1 << 20] = 255; // across the kernel input's end
    for (const types of cases) {
      const counts = new Float64Array(256);
      expect(countBytesInKernel(types, counts)).toBe(true);
      expect(Array.from(counts)).toEqual(Array.from(tally(types)));
      countBytesInKernel(types, counts); // adds on
      expect(Array.from(counts)).toEqual(Array.from(tally(types)).map((x) => 2 * x));
    }
    useChunkKernel(false);
    const counts = new Float64Array(256);
    expect(countBytesInKernel(cases[0]!, counts)).toBe(false);
    expect(counts.every((x) => x === 0)).toBe(true);
  });

  it('a file\'s cell types are counted as they are read (noted), and linearizeCells takes the counts: same types, same message', async () => {
    const n = (1 << 20) + (1 << 19) + 3; // two chunks and a ragged end
    const types = new Uint8Array(n).fill(12);
    types[5] = 10; types[(1 << 20) - 1] = 10; types[1 << 20] = 14; types[n - 1] = 13;
    (await onDisk('types.bin', types)).close();
    const plan: ArrayPlan = { type: 'UInt8', littleEndian: true, target: 'cellTypes', where: 'f' };
    const nodes = (t: number) => ({ 10: 4, 12: 8, 13: 6, 14: 5 } as Record<number, number>)[t]!;
    const want: Record<number, number> = {};
    for (const t of types) want[t] = (want[t] ?? 0) + 1;
    for (const on of [true, false]) {
      useChunkKernel(on);
      const src = await openFileSource(join(dir, 'types.bin'));
      try {
        const a = await readArray(src, 5, n, plan) as Uint8Array;
        expect(Buffer.from(a).equals(Buffer.from(types))).toBe(true);
        expect(notedCounts(a) ? Array.from(notedCounts(a)!) : undefined).toEqual(on ? Array.from(tally(types)) : undefined);
        const offsets = new Int32Array(n + 1);
        for (let c = 0; c < n; c++) offsets[c + 1] = offsets[c]! + nodes(a[c]!);
        expect(linearizeCells(a, offsets, new Int32Array(offsets[n]!), 'f').fileCellTypes).toEqual(want);
        // a type fieldtally does not read is still named by its first cell
        const bad = await readArray(src, 5, n, plan) as Uint8Array;
        bad[7] = 200;
        const noted = notedCounts(bad);
        if (noted) { noted[12]! -= 1; noted[200]! += 1; }
        expect(() => linearizeCells(bad, offsets, new Int32Array(offsets[n]!), 'f')).toThrow('f: cell 7 has cell type 200');
      } finally {
        await src.close();
      }
    }
  });
});

// A chunk converted through convertChunk (the zlib and in-memory paths) takes the kernel too, copied in.
describe('convertChunk with the kernel', () => {
  it('gives the JavaScript loop\'s ids and message for a chunk outside the kernel\'s memory', () => {
    const values = Array.from({ length: 1001 }, (_, i) => BigInt(i * 3));
    values[998] = 2n ** 32n;
    const bytes = int64s(values, false), plan: ArrayPlan = { type: 'Int64', littleEndian: true, target: 'ids', where: 'w', max: 5000 };
    const run = (on: boolean) => {
      useChunkKernel(on);
      try {
        const out = new Int32Array(1001);
        convertChunk(plan, bytes.slice(0, 4000), 500, out, 0);
        convertChunk(plan, bytes.slice(4000), 501, out, 500);
        return Array.from(out);
      } catch (e) {
        return (e as Error).message;
      }
    };
    expect(run(true)).toEqual('w: value 4294967296 at index 998 is not an id in 0..5000');
    expect(run(false)).toEqual(run(true));
  });
});
