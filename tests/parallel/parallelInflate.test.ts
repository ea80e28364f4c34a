/**
 * Parallel decoding of zlib-compressed arrays: files loaded with 1, 2 and 3 inflate workers hold exactly the
 * bytes of the one-thread load (zlib is deterministic: RFC 1950/1951), on the committed sample fields
 * (appended raw, zlib, several blocks per array) and on external zlib files written by other programs
 * (VTK's example data, the vtu11 library's test output). A corrupt block is reported like the one-thread
 * reader does: file, array and block number.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { deflateSync } from 'node:zlib';
import { afterAll, describe, expect, it } from 'vitest';
import { bytesSource } from '../../src/io/byteSource.ts';
import { loadDatasetFile, nodeInflate } from '../../src/io/nodeFiles.ts';
import { readDatasetFrom } from '../../src/io/readDataset.ts';
import { startInflatePool, type InflatePool } from '../../src/parallel/inflatePool.ts';
import { externalPath } from '../helpers/external.ts';
import { expectSameArrays } from '../helpers/sameArrays.ts';

const SAMPLES = resolve(__dirname, '../../sample-fields');
const FILES = [
  `${SAMPLES}/sphere-stokes.vtu`, `${SAMPLES}/pipe-fine.vtu`, `${SAMPLES}/duct.vtu`, `${SAMPLES}/sphere-stokes-celldata.vtu`,
  externalPath('vtk-data/polyhedron2pieces.vtu'), externalPath('vtk-data/cow.vtp'), externalPath('vtu11/pyramids_3D/raw_compressed.vtu'),
];

const pools: InflatePool[] = [];
afterAll(async () => { for (const p of pools) await p.close(); });

describe.each([1, 2, 3])('loading with %i inflate worker(s)', (n) => {
  const pool = startInflatePool(n);
  pools.push(pool);

  it('ready: every worker answers an empty batch, counted as no batch and no block', async () => {
    const before = { ...pool.done };
    await pool.ready();
    expect(pool.done).toEqual(before);
  });

  it.each(FILES)('%s, arrays decoded into shared memory: blocks inflated in place, every array byte for byte as the one-thread load', async (file) => {
    const one = await loadDatasetFile(file);
    const before = pool.done.inPlace, blocks = pool.done.blocks;
    const many = await loadDatasetFile(file, { inflate: pool.inflate, sharedArrays: true });
    // Every batch, of arrays taken as they are and of converted ones (64-bit ids) alike, went straight into shared memory.
    if (file.startsWith(SAMPLES) && file.includes('sphere')) {
      expect(pool.done.inPlace).toBeGreaterThan(before);
      expect(pool.done.inPlace - before).toBe(pool.done.blocks - blocks);
    }
    expectSameArrays(many, one);
  });

  it.each(FILES)('%s: every array byte for byte as the one-thread load', async (file) => {
    const one = await loadDatasetFile(file);
    const before = pool.done.blocks;
    const many = await loadDatasetFile(file, { inflate: pool.inflate });
    // the sample fields have arrays of several blocks: the workers inflated them
    if (file.startsWith(SAMPLES) && file.includes('sphere')) expect(pool.done.blocks).toBeGreaterThan(before);
    expectSameArrays(many, one);
  });
});

describe('a batch of blocks of declared and other lengths', () => {
  it('gives what the loading thread\'s inflater gives — lengths, bytes, a corrupt block\'s message — into shared memory or not', async () => {
    const text = (n: number) => Uint8Array.from({ length: n }, (_, i) => (i * 31 + (i >> 7)) & 255);
    const garbled = deflateSync(text(900)).map((b, i) => (i > 8 ? b ^ 0x5a : b));
    // declared 1000 bytes each: exact, longer than declared, shorter, corrupt
    const blocks = [deflateSync(text(1000)), deflateSync(text(1200)), deflateSync(text(800)), garbled, deflateSync(text(1000))];
    const pool = startInflatePool(2);
    try {
      for (const shared of [true, false]) {
        const buf = shared ? new SharedArrayBuffer(1000 * blocks.length) : new ArrayBuffer(1000 * blocks.length);
        const outs = blocks.map((_, i) => new Uint8Array(buf, 1000 * i, 1000));
        const got = await pool.inflate.batch!(blocks, outs);
        blocks.forEach((b, i) => {
          const want = new Uint8Array(1000);
          let n: number | string;
          try { n = nodeInflate(b, want); } catch (e) { n = (e as Error).message; }
          expect(got[i], `block ${i}, shared ${shared}`).toEqual(n);
          if (typeof n === 'number') expect(Array.from(outs[i]!.subarray(0, Math.min(n, 1000)))).toEqual(Array.from(want.subarray(0, Math.min(n, 1000))));
        });
        expect(got.slice(0, 3)).toEqual([1000, 1200, 800]);
      }
    } finally {
      await pool.close();
    }
  });
});

describe('a corrupt zlib block', () => {
  it('is named with its file, array and block number, as the one-thread reader does', async () => {
    const bytes = new Uint8Array(readFileSync(`${SAMPLES}/sphere-stokes.vtu`));
    const text = Buffer.from(bytes).toString('latin1');
    // Deep inside the appended data: past the first array's header and first block.
    const at = text.indexOf('<AppendedData') + 200_000;
    const bad = bytes.slice();
    for (let i = 0; i < 64; i++) bad[at + i] = bad[at + i]! ^ 0x5a;
    const pool = startInflatePool(2);
    try {
      const one = await readDatasetFrom(bytesSource('bad.vtu', bad), { inflate: nodeInflate }).then(() => '', (e: Error) => e.message);
      const two = await readDatasetFrom(bytesSource('bad.vtu', bad), { inflate: pool.inflate }).then(() => '', (e: Error) => e.message);
      expect(one).toMatch(/^bad\.vtu: .*DataArray ".*": zlib block \d+ of \d+ (is corrupt|inflates to)/);
      // the same array and block (the zlib library's own words in parentheses may differ)
      expect(two.replace(/\(.*\)$/, '')).toBe(one.replace(/\(.*\)$/, ''));
      // Inflated in place into shared final arrays: the same message.
      const before = pool.done.inPlace;
      const inPlace = await readDatasetFrom(bytesSource('bad.vtu', bad), { inflate: pool.inflate, sharedArrays: true }).then(() => '', (e: Error) => e.message);
      expect(pool.done.inPlace).toBeGreaterThan(before);
      expect(inPlace.replace(/\(.*\)$/, '')).toBe(one.replace(/\(.*\)$/, ''));
    } finally {
      await pool.close();
    }
  });
});
