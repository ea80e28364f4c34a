/**
 * Raw appended arrays read in parts on 1, 2 and 3 read workers (src/parallel/readPool.ts) hold exactly the bytes
 * of the one-thread read, in shared memory: both byte orders, 32- and 64-bit ids and headers, signed and unsigned
 * ids, Float32 and Float64 points and fields, cell data; zlib files are untouched by it. Bad values, truncated files
 * and bad offsets are refused with the one-thread read's message (file, array, index), also when two parts hold a
 * bad value. Files are hand-built from the format description (tests/helpers/vtkXmlFixtures.ts); a small chunk
 * size (`ByteSource.chunkBytes`) makes each array span several parts. Parts read by the loading thread while the
 * workers start (here: all of them, workers held back) give the same arrays and messages.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { ByteSource } from '../../src/io/byteSource.ts';
import type { LoadOptions } from '../../src/io/loadOptions.ts';
import { loadDatasetFile, nodeInflate, openFileSource } from '../../src/io/nodeFiles.ts';
import { readDatasetFrom } from '../../src/io/readDataset.ts';
import { notedFirstNonFinite, notedWithin } from '../../src/model/arrayScans.ts';
import { hexGrid } from '../../src/model/meshBuild.ts';
import { startReadPool, type ReadPool } from '../../src/parallel/readPool.ts';
import { buildXml, type BuildOptions, type PieceSpec, type XmlType } from '../helpers/vtkXmlFixtures.ts';
import { expectSameArrays } from '../helpers/sameArrays.ts';

const dir = mkdtempSync(join(tmpdir(), 'fieldtally-readparts-'));
const pools: ReadPool[] = [];
afterAll(async () => {
  for (const p of pools) await p.close();
  rmSync(dir, { recursive: true, force: true });
});

/** A 5 × 4 × 3 hexahedron lattice (120 points, 60 cells) with point and cell fields, ids as `idType`. */
function latticeSpec(idType: XmlType, pointType: 'Float32' | 'Float64', edit?: (conn: (number | bigint)[]) => void): PieceSpec {
  const p = hexGrid(5, 4, 3);
  const conn: (number | bigint)[] = Array.from(p.connectivity);
  edit?.(conn);
  const nPts = p.points.length / 3, nCells = p.cellTypes.length;
  return {
    attrs: { NumberOfPoints: nPts, NumberOfCells: nCells },
    sections: [
      { tag: 'PointData', arrays: [
        { name: 'p', type: 'Float64', values: Array.from({ length: nPts }, (_, i) => 101325 + i * 0.125 - (i % 7) * 1e-9) },
        { name: 'U', type: 'Float32', components: 3, values: Array.from({ length: 3 * nPts }, (_, i) => Math.sin(i) * 3) },
      ] },
      { tag: 'CellData', arrays: [{ name: 'zone', type: 'Int16', values: Array.from({ length: nCells }, (_, c) => (c % 5) - 2) }] },
      { tag: 'Points', arrays: [{ type: pointType, components: 3, values: Array.from(p.points) }] },
      { tag: 'Cells', arrays: [
        { name: 'connectivity', type: idType, values: conn },
        { name: 'offsets', type: idType, values: Array.from(p.offsets.subarray(1)) },
        { name: 'types', type: 'UInt8', values: Array.from(p.cellTypes) },
      ] },
    ],
  };
}

let fileNo = 0;
function write(bytes: Uint8Array): string {
  const f = join(dir, `case-${fileNo++}.vtu`);
  writeFileSync(f, bytes);
  return f;
}

/** Loads `file` through its descriptor with chunks of `chunkBytes` (so arrays span several parts). */
async function load(file: string, opts: LoadOptions, chunkBytes = 64) {
  const src = await openFileSource(file);
  const small: ByteSource = { ...src, chunkBytes };
  try {
    return await readDatasetFrom(small, { inflate: nodeInflate, ...opts });
  } finally {
    await src.close();
  }
}

const message = (p: Promise<unknown>) => p.then(() => 'loaded', (e: Error) => e.message);

const CASES: [string, XmlType, 'Float32' | 'Float64', BuildOptions][] = [
  ['little-endian, Int32 ids', 'Int32', 'Float64', { encoding: 'appended-raw' }],
  ['big-endian, Int32 ids', 'Int32', 'Float64', { encoding: 'appended-raw', bigEndian: true }],
  ['little-endian, Int64 ids, UInt64 headers', 'Int64', 'Float64', { encoding: 'appended-raw', headerType: 'UInt64' }],
  ['big-endian, Int64 ids, UInt64 headers', 'Int64', 'Float64', { encoding: 'appended-raw', headerType: 'UInt64', bigEndian: true }],
  ['big-endian, UInt32 ids, Float32 points', 'UInt32', 'Float32', { encoding: 'appended-raw', bigEndian: true }],
  ['little-endian, UInt64 ids, Float32 points, odd alignment', 'UInt64', 'Float32', { encoding: 'appended-raw', appendedLead: 3 }],
  ['zlib (not read in parts)', 'Int64', 'Float64', { encoding: 'appended-raw', zlibBlockSize: 200, headerType: 'UInt64' }],
];

describe.each([[1, false], [2, false], [3, false], [2, true]] as const)('reading in parts on %i worker(s), workers held back: %s', (n, held) => {
  const pool = startReadPool(n, 0, held);
  pools.push(pool);

  it.each(CASES)('%s: every array byte for byte as the one-thread read', async (_, idType, pointType, opts) => {
    const file = write(buildXml('UnstructuredGrid', [latticeSpec(idType, pointType)], opts));
    const one = await load(file, {});
    const before = pool.done.parts;
    const many = await load(file, { readParts: pool.readParts });
    expectSameArrays(many, one);
    expectSameArrays(many, await loadDatasetFile(file));
    const piece = many.pieces[0]!;
    if (opts.zlibBlockSize) {
      expect(pool.done.parts).toBe(before);
    } else {
      // every large array came in shared memory, in more parts than one when there are workers for them
      for (const a of [piece.points, piece.connectivity, piece.offsets, piece.pointData[0]!.values]) expect(a.buffer).toBeInstanceOf(SharedArrayBuffer);
      expect(pool.done.parts - before).toBeGreaterThanOrEqual(n === 1 ? 6 : 12);
      // held back, the workers never count as started and the loading thread reads every part
      if (held) expect(pool.done.partsHere).toBe(pool.done.parts);
      // what the parts found while in cache, as a scan of the whole array finds it
      expect(notedWithin(piece.connectivity, 0, 119)).toBe(true);
      expect(notedWithin(piece.connectivity, 0, 118)).toBe(false);
      expect(notedWithin(piece.connectivity, 1, 119)).toBe(false);
      expect(notedFirstNonFinite(piece.points)).toBe(-1);
      expect(notedFirstNonFinite(piece.pointData[1]!.values)).toBe(-1);
    }
  });

  it('refuses a bad id with the one-thread message, naming the first of two bad values in different parts', async () => {
    for (const [idType, bad] of [['Int32', -4], ['Int64', 2n ** 33n], ['UInt32', 2 ** 31 + 5]] as const) {
      const spec = latticeSpec(idType, 'Float64', (conn) => { conn[130] = bad; conn[400] = -1; });
      const file = write(buildXml('UnstructuredGrid', [spec], { encoding: 'appended-raw', bigEndian: idType === 'UInt32' }));
      const one = await message(load(file, {}));
      expect(one).toMatch(/^case-\d+\.vtu: piece 0: DataArray "connectivity": value \S+ at index 130 is not an id in 0\.\.2147483647$/);
      expect(await message(load(file, { readParts: pool.readParts }))).toBe(one);
    }
  });

  it('refuses what the piece checks refuse (a point id past the points, a non-finite coordinate) with the same message', async () => {
    const far = write(buildXml('UnstructuredGrid', [latticeSpec('Int64', 'Float64', (conn) => { conn[300] = 120n; })], { encoding: 'appended-raw' }));
    const oneFar = await message(load(far, {}));
    expect(oneFar).toMatch(/connectivity entry 300 is point 120, but the piece has 120 points/);
    expect(await message(load(far, { readParts: pool.readParts }))).toBe(oneFar);
    const spec = latticeSpec('Int32', 'Float64');
    const pts = spec.sections[2]!.arrays[0]!.values as number[];
    pts[250] = Number.NaN;
    const nan = write(buildXml('UnstructuredGrid', [spec], { encoding: 'appended-raw', bigEndian: true }));
    const oneNan = await message(load(nan, {}));
    expect(oneNan).toMatch(/point 83 has a non-finite coordinate \(NaN\)/);
    expect(await message(load(nan, { readParts: pool.readParts }))).toBe(oneNan);
  });

  it('refuses a truncated file and an offset past the appended data with the one-thread message', async () => {
    const whole = buildXml('UnstructuredGrid', [latticeSpec('Int64', 'Float64')], { encoding: 'appended-raw' });
    const text = Buffer.from(whole).toString('latin1');
    const cut = write(whole.subarray(0, text.indexOf('_') + 2000));
    const oneCut = await message(load(cut, {}));
    expect(oneCut).toMatch(/^case-\d+\.vtu: /);
    expect(oneCut).not.toBe('loaded');
    expect(await message(load(cut, { readParts: pool.readParts }))).toBe(oneCut);
    const moved = write(Buffer.from(text.replace(/offset="(\d+)"\/>\n(\s*)<DataArray type="Int64" Name="offsets"/, 'offset="99999999"/>\n$2<DataArray type="Int64" Name="offsets"'), "latin1"));
    const oneMoved = await message(load(moved, {}));
    expect(oneMoved).toMatch(/DataArray "connectivity": offset 99999999 lies beyond the appended data/);
    expect(await message(load(moved, { readParts: pool.readParts }))).toBe(oneMoved);
  });
});

describe('the committed sample fields', () => {
  const SAMPLES = resolve(__dirname, '../../sample-fields');
  it.each(['pipe-fine.vtu', 'sphere-stokes.vtu', 'duct.vtu'])('%s loads the same with 2 read workers and default chunks', async (name) => {
    const pool = startReadPool(2, 0);
    try {
      expectSameArrays(await loadDatasetFile(`${SAMPLES}/${name}`, { readParts: pool.readParts }), await loadDatasetFile(`${SAMPLES}/${name}`));
    } finally {
      await pool.close();
    }
  });
});

describe('two loads at once on one read pool', () => {
  it('both finish with the one-thread bytes, whether the workers start before, during or after them', async () => {
    const files = (['Int32', 'Int64'] as const).map((id) => write(buildXml('UnstructuredGrid', [latticeSpec(id, 'Float64')], { encoding: 'appended-raw' })));
    const one = await Promise.all(files.map((f) => load(f, {})));
    for (const wait of [false, true]) {
      const pool = startReadPool(2, 0);
      pools.push(pool);
      // A pool just started (workers still starting) or one whose workers have started.
      if (wait) await new Promise((r) => setTimeout(r, 1500));
      const both = await Promise.all(files.map((f) => load(f, { readParts: pool.readParts })));
      both.forEach((d, i) => expectSameArrays(d, one[i]!));
    }
  });
});

describe('ready', () => {
  it('resolves once every worker has started: every part is then read on a worker, with the one-thread bytes', async () => {
    const file = write(buildXml('UnstructuredGrid', [latticeSpec('Int64', 'Float64')], { encoding: 'appended-raw' }));
    const pool = startReadPool(2, 0);
    pools.push(pool);
    await pool.ready();
    const d = await load(file, { readParts: pool.readParts });
    expectSameArrays(d, await load(file, {}));
    expect(pool.done.parts).toBeGreaterThan(0);
    expect(pool.done.partsHere).toBe(0);
  });
});
