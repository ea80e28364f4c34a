/**
 * `LoadOptions.sharedArrays`: every format decodes straight into SharedArrayBuffers — zlib, base64, ASCII and raw
 * appended XML, binary and text legacy files (both cell-list layouts), from disk and from memory, with the
 * parallel inflater and text decoders too — holding exactly the bytes of a plain load, so a pool takes the
 * dataset without a copy (`toSharedDataset` returns the very arrays). Spoilt files give the plain load's message.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { LoadOptions } from '../../src/io/loadOptions.ts';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { readDataset } from '../../src/io/readDataset.ts';
import { writeLegacyVtk } from '../../src/io/writeLegacy.ts';
import { writeVtu, type VtuEncoding } from '../../src/io/writeVtu.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { datasetOf, field, hexGrid, pointFieldFrom, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import { startInflatePool } from '../../src/parallel/inflatePool.ts';
import { toSharedDataset } from '../../src/parallel/sharedDataset.ts';
import { startTextPool } from '../../src/parallel/textPool.ts';
import { arraysOf, expectSameArrays } from '../helpers/sameArrays.ts';

const dir = mkdtempSync(join(tmpdir(), 'fieldtally-shareddecode-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Hexahedra and tetrahedra in two pieces' worth of cells, with point and cell fields of several types. */
function sample(): Dataset {
  const q = hexGrid(6, 5, 4, (u, v, w) => [u + 0.1 * v, v, w * (1 + 0.1 * u)]);
  const nCells = q.cellTypes.length;
  return datasetOf([withFields(q, [
    pointFieldFrom(q, 'p', 1, (x, y, z, o) => { o[0] = 101325 + x * y - z / 3; }),
    pointFieldFrom(q, 'velocity', 3, (x, y, z, o) => { o[0] = Math.sin(x); o[1] = y * z; o[2] = -x / 7; }),
  ], [
    field('zone', 'cell', 1, Int32Array.from({ length: nCells }, (_, c) => (c % 5) - 2)),
    field('nut', 'cell', 1, Float32Array.from({ length: nCells }, (_, c) => c / 9)),
  ])]);
}

function write(name: string, bytes: Uint8Array): string {
  const f = join(dir, name);
  writeFileSync(f, bytes);
  return f;
}

/** Every array of `d` is in shared memory. */
function expectAllShared(d: Dataset): void {
  for (const [path, a] of arraysOf(d)) expect(a.buffer instanceof SharedArrayBuffer, path).toBe(true);
}

/** `toSharedDataset` keeps every array as it is: handing the dataset to a pool copies nothing. */
function expectNoCopy(d: Dataset): void {
  const s = arraysOf(toSharedDataset(d)), a = arraysOf(d);
  for (let i = 0; i < a.length; i++) expect(s[i]![1], a[i]![0]).toBe(a[i]![1]);
}

const XML: VtuEncoding[] = ['appended-raw', 'zlib', 'base64', 'appended-base64', 'zlib-base64', 'ascii'];

describe('sharedArrays: decoded straight into shared memory, the bytes of a plain load', () => {
  const d = sample();
  const tets = datasetOf([withFields(tetGrid(3, 3, 2), [])]);

  it.each(XML)('XML %s, from disk and from memory', async (encoding) => {
    for (const idType of ['Int32', 'Int64'] as const) {
      const bytes = writeVtu(d, { encoding, idType });
      const file = write(`case-${encoding}-${idType}.vtu`, bytes);
      const plain = await loadDatasetFile(file);
      for (const got of [await loadDatasetFile(file, { sharedArrays: true }), await readDataset('case.vtu', bytes, { sharedArrays: true })]) {
        expectSameArrays(got, plain);
        expectAllShared(got);
        expectNoCopy(got);
      }
      expect(arraysOf(plain).some(([, a]) => a.buffer instanceof SharedArrayBuffer)).toBe(false);
    }
  });

  it.each([[true, '5.1'], [true, '4.2'], [false, '5.1'], [false, '4.2']] as const)('legacy, binary %s, version %s', async (binary, version) => {
    for (const ds of [d, tets]) {
      const bytes = writeLegacyVtk(ds, { binary, version });
      const file = write(`case-${binary}-${version}-${ds === d ? 'hex' : 'tet'}.vtk`, bytes);
      const plain = await loadDatasetFile(file);
      const got = await loadDatasetFile(file, { sharedArrays: true });
      expectSameArrays(got, plain);
      expectSameArrays(await readDataset('case.vtk', bytes, { sharedArrays: true }), plain);
      // Text cell types are narrowed to bytes after reading (a copy toSharedDataset still makes); all else is shared.
      for (const [path, a] of arraysOf(got)) if (binary || !path.endsWith('cellTypes')) expect(a.buffer instanceof SharedArrayBuffer, path).toBe(true);
      if (binary) expectNoCopy(got);
    }
  });

  it('with the parallel inflater and text decoders (as loadForCompute loads)', async () => {
    const inflaters = startInflatePool(2), parsers = startTextPool(2);
    try {
      const opts: LoadOptions = { inflate: inflaters.inflate, parseText: parsers.parseText, decodeBase64: parsers.decodeBase64, sharedArrays: true };
      for (const encoding of ['zlib', 'ascii', 'base64'] as const) {
        const file = write(`pool-${encoding}.vtu`, writeVtu(d, { encoding }));
        const got = await loadDatasetFile(file, opts);
        expectSameArrays(got, await loadDatasetFile(file));
        expectAllShared(got);
        expectNoCopy(got);
      }
    } finally {
      await Promise.all([inflaters.close(), parsers.close()]);
    }
  });

  it('a spoilt file gives the plain load\'s message', async () => {
    const text = Buffer.from(writeVtu(d, { encoding: 'ascii' })).toString('latin1');
    const bad = write('bad.vtu', Buffer.from(text.replace(/(<DataArray type="Float64" Name="p"[^>]*>\s*\S+\s+)\S+/, '$1x7'), 'latin1'));
    const message = (p: Promise<unknown>) => p.then(() => 'loaded', (e: Error) => e.message);
    const plain = await message(loadDatasetFile(bad));
    expect(plain).toMatch(/DataArray "p"/);
    expect(await message(loadDatasetFile(bad, { sharedArrays: true }))).toBe(plain);
  });
});
