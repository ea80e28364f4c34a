/**
 * `LoadOptions.geometryBefore` (src/io/sameBlock.ts): a VTK XML file whose raw appended points, cell types,
 * offsets and connectivity hold exactly the bytes of a dataset read before gets that dataset's arrays —
 * the same objects, not decoded again — while its fields are always its own; a file whose geometry differs
 * in a single coordinate or node id, or is stored in another encoding (zlib, base64, 64-bit ids), is decoded
 * as usual and gives exactly what a load without the option gives. Files on disk (read by ranges) and
 * bytes in memory both.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { readDataset } from '../../src/io/readDataset.ts';
import { writeVtu, type VtuWriteOptions } from '../../src/io/writeVtu.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { datasetOf, field, hexGrid, tetGrid } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';

const dir = mkdtempSync(join(tmpdir(), 'fieldtally-geometry-before-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Two pieces (hexahedra and tetrahedra) with a field p = a·(x + 2y) and velocity (a, 0, z). */
function dataset(a: number, change?: (h: Piece, t: Piece) => void): Dataset {
  const h = hexGrid(3, 4, 2), t = tetGrid(2, 2, 2, (u, v, w) => [u + 2, v, w]);
  change?.(h, t);
  const withData = (p: Piece): Piece => {
    const n = p.points.length / 3, pv = new Float64Array(n), u = new Float64Array(3 * n);
    for (let i = 0; i < n; i++) { pv[i] = a * (p.points[3 * i]! + 2 * p.points[3 * i + 1]!); u[3 * i] = a; u[3 * i + 2] = p.points[3 * i + 2]!; }
    return { ...p, pointData: [field('p', 'point', 1, pv), field('velocity', 'point', 3, u)], cellData: [field('id', 'cell', 1, Float64Array.from({ length: p.cellTypes.length }, (_, c) => c * a))] };
  };
  return datasetOf([withData(h), withData(t)], `step ${a}`);
}

const RAW: Partial<VtuWriteOptions> = { encoding: 'appended-raw', idType: 'Int32' };

async function fromDisk(name: string, d: Dataset, o: Partial<VtuWriteOptions>, before?: Dataset): Promise<Dataset> {
  const path = join(dir, name);
  writeFileSync(path, writeVtu(d, o));
  return loadDatasetFile(path, before ? { geometryBefore: before } : {});
}

function expectSameContent(a: Dataset, b: Dataset): void {
  expect(a.pieces.length).toBe(b.pieces.length);
  a.pieces.forEach((p, k) => {
    const q = b.pieces[k]!;
    expect(p.points).toEqual(q.points);
    expect(p.cellTypes).toEqual(q.cellTypes);
    expect(p.offsets).toEqual(q.offsets);
    expect(p.connectivity).toEqual(q.connectivity);
    expect(p.pointData.map((f) => [f.name, Array.from(f.values)])).toEqual(q.pointData.map((f) => [f.name, Array.from(f.values)]));
    expect(p.cellData.map((f) => [f.name, Array.from(f.values)])).toEqual(q.cellData.map((f) => [f.name, Array.from(f.values)]));
  });
  expect(a.fileCellTypes).toEqual(b.fileCellTypes);
}

describe('geometry taken from the dataset read before', () => {
  it('same raw bytes: the very same geometry arrays, the step\'s own fields (file on disk and in memory)', async () => {
    const first = await fromDisk('a1.vtu', dataset(1), RAW);
    const second = await fromDisk('a2.vtu', dataset(2), RAW, first);
    const plain = await fromDisk('a2.vtu', dataset(2), RAW);
    expectSameContent(second, plain);
    second.pieces.forEach((p, k) => {
      const q = first.pieces[k]!;
      expect(p.points).toBe(q.points);
      expect(p.cellTypes).toBe(q.cellTypes);
      expect(p.offsets).toBe(q.offsets);
      expect(p.connectivity).toBe(q.connectivity);
      expect(p.pointData[0]!.values).not.toBe(q.pointData[0]!.values);
      expect(p.pointData[0]!.values[5]).toBe(2 * q.pointData[0]!.values[5]!);
    });
    const mem = await readDataset('m.vtu', writeVtu(dataset(3), RAW), { geometryBefore: first });
    expect(mem.pieces[1]!.connectivity).toBe(first.pieces[1]!.connectivity);
    expect(mem.pieces[1]!.points).toBe(first.pieces[1]!.points);
  });

  it('the fields of a step on the same geometry are still checked', async () => {
    const first = await fromDisk('n1.vtu', dataset(1), RAW);
    const bad = dataset(2);
    bad.pieces[1]!.pointData[0]!.values[3] = NaN;
    await expect(fromDisk('n2.vtu', bad, RAW, first)).rejects.toThrow(/n2\.vtu: piece 1: point array "p" has a non-finite value \(NaN\) at tuple 3/);
  });

  it('one coordinate or one node id changed: decoded afresh, as without the option', async () => {
    const first = await fromDisk('b1.vtu', dataset(1), RAW);
    const moved = (h: Piece) => { h.points[3 * 7 + 1] = h.points[3 * 7 + 1]! + 1e-12; };
    const m = await fromDisk('b2.vtu', dataset(2, moved), RAW, first);
    expect(m.pieces[0]!.points).not.toBe(first.pieces[0]!.points);
    expect(m.pieces[0]!.connectivity).toBe(first.pieces[0]!.connectivity);
    expect(m.pieces[1]!.points).toBe(first.pieces[1]!.points);
    expectSameContent(m, await fromDisk('b2.vtu', dataset(2, moved), RAW));
    // the last node id of the second piece's last cell swapped with its neighbour
    const renumbered = (_h: Piece, t: Piece) => { const c = t.connectivity, n = c.length; const s = c[n - 1]!; c[n - 1] = c[n - 2]!; c[n - 2] = s; };
    const r = await fromDisk('b3.vtu', dataset(2, renumbered), RAW, first);
    expect(r.pieces[1]!.connectivity).not.toBe(first.pieces[1]!.connectivity);
    expect(r.pieces[1]!.connectivity[r.pieces[1]!.connectivity.length - 1]).toBe(first.pieces[1]!.connectivity[first.pieces[1]!.connectivity.length - 2]);
    expectSameContent(r, await fromDisk('b3.vtu', dataset(2, renumbered), RAW));
  });

  for (const o of [{ encoding: 'zlib' }, { encoding: 'appended-base64', idType: 'Int32' }, { encoding: 'appended-raw', idType: 'Int64' }, { encoding: 'ascii' }] as Partial<VtuWriteOptions>[]) {
    it(`other encodings are decoded as usual (${o.encoding}${o.idType ? `, ${o.idType} ids` : ''})`, async () => {
      const first = await fromDisk('c1.vtu', dataset(1), o);
      const second = await fromDisk('c2.vtu', dataset(2), o, first);
      expectSameContent(second, await fromDisk('c2.vtu', dataset(2), o));
      expect(second.pieces[0]!.connectivity).not.toBe(first.pieces[0]!.connectivity);
    });
  }

  it('a dataset with fewer pieces or another kind is no hint at all', async () => {
    const one = datasetOf([dataset(1).pieces[1]!]);
    const second = await fromDisk('d2.vtu', dataset(2), RAW, one);
    expectSameContent(second, await fromDisk('d2.vtu', dataset(2), RAW));
    const poly = { ...(await fromDisk('d1.vtu', dataset(1), RAW)), kind: 'polydata' as const };
    const third = await fromDisk('d3.vtu', dataset(3), RAW, poly);
    expect(third.pieces[0]!.points).not.toBe(poly.pieces[0]!.points);
  });
});
