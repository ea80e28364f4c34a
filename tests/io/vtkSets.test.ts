/**
 * Multi-file sets (.pvtu, .vtm, nested sets). References: VTK 9.1's vtkXMLPUnstructuredGridReader and
 * vtkXMLMultiBlockDataReader on the external sets (tests/reference/xml_probe.py →
 * tests/reference/expected/xml/*.json); hand-built sets for the edge cases, whose expected contents are
 * the hand-built pieces themselves.
 */
import { describe, expect, it } from 'vitest';
import { joinPath, readVtkSet } from '../../src/io/vtkSets.ts';
import { externalBytes, externalResolver, loadExternal } from '../helpers/external.ts';
import { buildXml, tetPyramidPiece, type PieceSpec } from '../helpers/vtkXmlFixtures.ts';
import { expectMatchesVtk, vtkReference } from '../helpers/xmlReference.ts';

const PVTU = 'vtu11/parallel_write/pyramids_3D/tester/pyramids3D_parallel_test.pvtu';
const VTM = 'vtk-data/ex-blow_5.vtm';
const enc = (s: string) => new TextEncoder().encode(s);

const readSet = (rel: string) => readVtkSet(rel.split('/').pop()!, externalBytes(rel), { resolve: externalResolver(rel) });

describe('external sets against VTK 9.1', () => {
  it('pyramids3D_parallel_test.pvtu: three pieces in mixed encodings (appended raw UInt64, ASCII) read as VTK merges them', async () => {
    const d = await readSet(PVTU);
    expect(d.pieces.length).toBe(3);
    expect(d.kind).toBe('unstructured');
    expect(d.warnings).toEqual([]);
    expectMatchesVtk(d.pieces, d.fileCellTypes, d.fieldData, vtkReference(PVTU).leaves[0]!);
  });

  it('ex-blow_5.vtm: 16 leaf files flattened into 16 pieces, each as VTK reads that leaf', async () => {
    const d = await readSet(VTM);
    const ref = vtkReference(VTM);
    expect(d.pieces.length).toBe(16);
    expect(ref.leaves.length).toBe(16);
    expect(d.kind).toBe('unstructured');
    d.pieces.forEach((p, i) => {
      const leafTypes: Record<number, number> = {};
      for (const t of p.cellTypes) leafTypes[t] = (leafTypes[t] ?? 0) + 1;
      expectMatchesVtk([p], leafTypes, [], ref.leaves[i]!);
    });
    expect(d.fileCellTypes).toEqual({ 5: 928, 9: 129 });
  });

  it('loads sets through the app entry point (loadDatasetFile)', async () => {
    const d = await loadExternal(VTM);
    expect(d.source).toBe('ex-blow_5.vtm');
    expect(d.pieces.length).toBe(16);
  });
});

/** An in-memory folder of files for `resolve`. */
function folder(files: Record<string, Uint8Array | string>) {
  const asked: string[] = [];
  const resolve = async (p: string) => {
    asked.push(p);
    const f = files[p];
    if (f === undefined) throw new Error(`no such file "${p}"`);
    return typeof f === 'string' ? enc(f) : f;
  };
  return { resolve, asked };
}

const vtu = (piece: PieceSpec = tetPyramidPiece(), encoding: 'ascii' | 'appended-raw' | 'binary' = 'ascii') => buildXml('UnstructuredGrid', [piece], { encoding });
const tri: PieceSpec = {
  attrs: { NumberOfPoints: 3, NumberOfPolys: 1 },
  sections: [
    { tag: 'Points', arrays: [{ type: 'Float32', components: 3, values: [0, 0, 0, 1, 0, 0, 0, 1, 0] }] },
    { tag: 'Polys', arrays: [{ name: 'connectivity', type: 'Int32', values: [0, 1, 2] }, { name: 'offsets', type: 'Int32', values: [3] }] },
  ],
};
const vtp = () => buildXml('PolyData', [tri], { encoding: 'binary' });

describe('hand-built sets', () => {
  it('flattens nested Blocks, skips empty blocks and DataSets without a file, and mixes polydata with unstructured leaves', async () => {
    const vtm = `<?xml version="1.0"?>
<VTKFile type="vtkMultiBlockDataSet" version="1.0">
  <vtkMultiBlockDataSet>
    <Block index="0" name="walls">
      <DataSet index="0" name="inlet" file="m/inlet.vtp"/>
      <Block index="0"/>
      <DataSet index="1" name="missing on purpose"/>
      <Block index="1"><Piece index="0"><DataSet index="0" file="m/./core.vtu"/></Piece></Block>
    </Block>
    <Block index="1"></Block>
    <DataSet index="2" file="m/sub/../core.vtu"/>
  </vtkMultiBlockDataSet>
</VTKFile>`;
    const { resolve, asked } = folder({ 'm/inlet.vtp': vtp(), 'm/core.vtu': vtu() });
    const d = await readVtkSet('case.vtm', enc(vtm), { resolve });
    expect(asked).toEqual(['m/inlet.vtp', 'm/core.vtu', 'm/core.vtu']);
    expect(d.kind).toBe('unstructured');
    expect(d.pieces.map((p) => Array.from(p.cellTypes))).toEqual([[5], [14, 10], [14, 10]]);
    expect(d.fileCellTypes).toEqual({ 5: 1, 14: 2, 10: 2 });
  });

  it('gives kind polydata when every leaf is polygonal data (.pvtp)', async () => {
    const pvtp = '<VTKFile type="PPolyData" version="1.0"><PPolyData GhostLevel="0"><PPoints><PDataArray type="Float32" NumberOfComponents="3"/></PPoints><Piece Source="a.vtp"/><Piece Source="b.vtp"/></PPolyData></VTKFile>';
    const { resolve } = folder({ 'a.vtp': vtp(), 'b.vtp': vtp() });
    const d = await readVtkSet('s.pvtp', enc(pvtp), { resolve });
    expect(d.kind).toBe('polydata');
    expect(d.pieces.length).toBe(2);
  });

  it('reads a .pvtu named by a .vtm, resolving its pieces from its own folder', async () => {
    const pvtu = '<VTKFile type="PUnstructuredGrid" version="0.1"><PUnstructuredGrid><Piece Source="parts/p0.vtu"/><Piece Source="parts/p1.vtu"/></PUnstructuredGrid></VTKFile>';
    const vtm = '<VTKFile type="vtkMultiBlockDataSet" version="1.0"><vtkMultiBlockDataSet><DataSet index="0" file="run/field.pvtu"/></vtkMultiBlockDataSet></VTKFile>';
    const { resolve, asked } = folder({ 'run/field.pvtu': pvtu, 'run/parts/p0.vtu': vtu(tetPyramidPiece(), 'appended-raw'), 'run/parts/p1.vtu': vtu(tetPyramidPiece(), 'binary') });
    const d = await readVtkSet('top.vtm', enc(vtm), { resolve });
    expect(asked).toEqual(['run/field.pvtu', 'run/parts/p0.vtu', 'run/parts/p1.vtu']);
    expect(d.pieces.length).toBe(2);
    expect(Array.from(d.pieces[1]!.pointData[0]!.values)).toEqual([101325, 101300.5, 101290.25, 101310, 101280.125, 101305]);
  });

  it('warns when a piece lacks an array the .pvtu declares', async () => {
    const pvtu = '<VTKFile type="PUnstructuredGrid" version="0.1"><PUnstructuredGrid><PPointData><PDataArray type="Float64" Name="static pressure"/><PDataArray type="Float64" Name="k"/></PPointData><Piece Source="p0.vtu"/></PUnstructuredGrid></VTKFile>';
    const { resolve } = folder({ 'p0.vtu': vtu() });
    const d = await readVtkSet('w.pvtu', enc(pvtu), { resolve });
    expect(d.warnings).toEqual(['p0.vtu: point arrays declared by the set are missing: "k"']);
  });

  it('names the set file and the missing piece path', async () => {
    const { resolve } = folder({ 'p0.vtu': vtu() });
    const pvtu = '<VTKFile type="PUnstructuredGrid" version="0.1"><PUnstructuredGrid><Piece Source="p0.vtu"/><Piece Source="sub/p1.vtu"/></PUnstructuredGrid></VTKFile>';
    await expect(readVtkSet('flow.pvtu', enc(pvtu), { resolve })).rejects.toThrow('flow.pvtu: piece file "sub/p1.vtu" is missing or unreadable (no such file "sub/p1.vtu")');
  });

  it('names the set file and the missing piece path when loading from disk', async () => {
    const { mkdtempSync, writeFileSync, mkdirSync } = await import('node:fs');
    const { join } = await import('node:path');
    const { tmpdir } = await import('node:os');
    const { loadDatasetFile } = await import('../../src/io/nodeFiles.ts');
    const dir = mkdtempSync(join(tmpdir(), 'ft-set-'));
    mkdirSync(join(dir, 'parts'));
    writeFileSync(join(dir, 'parts', 'p0.vtu'), vtu());
    writeFileSync(join(dir, 'flow.pvtu'), '<VTKFile type="PUnstructuredGrid" version="0.1"><PUnstructuredGrid><Piece Source="parts/p0.vtu"/><Piece Source="parts/p1.vtu"/></PUnstructuredGrid></VTKFile>');
    await expect(loadDatasetFile(join(dir, 'flow.pvtu'))).rejects.toThrow(/^flow\.pvtu: piece file "parts\/p1\.vtu" is missing or unreadable/);
  });

  it('names the set and the piece file in errors inside a piece', async () => {
    const bad = enc(new TextDecoder().decode(vtu()).replace('0 1 2 3 4 0 1 3 5', '0 1 2 3 4 0 1 3 9'));
    const { resolve } = folder({ 'p0.vtu': bad });
    const pvtu = '<VTKFile type="PUnstructuredGrid" version="0.1"><PUnstructuredGrid><Piece Source="p0.vtu"/></PUnstructuredGrid></VTKFile>';
    await expect(readVtkSet('flow.pvtu', enc(pvtu), { resolve })).rejects.toThrow('flow.pvtu: p0.vtu: piece 0: connectivity entry 8 is point 9, but the piece has 6 points (expected 0..5)');
  });

  it('refuses a piece of the wrong type, structured sets, a missing resolver, Pieces without Source, and self-reference', async () => {
    const pvtu = '<VTKFile type="PUnstructuredGrid" version="0.1"><PUnstructuredGrid><Piece Source="a.vtp"/></PUnstructuredGrid></VTKFile>';
    await expect(readVtkSet('t.pvtu', enc(pvtu), folder({ 'a.vtp': vtp() }))).rejects.toThrow('t.pvtu: a.vtp: piece file holds "PolyData", but a PUnstructuredGrid set needs "UnstructuredGrid" pieces');
    const pvti = '<VTKFile type="PImageData" version="0.1"><PImageData/></VTKFile>';
    await expect(readVtkSet('i.pvti', enc(pvti), folder({}))).rejects.toThrow('i.pvti: VTK XML "PImageData" (a structured grid type) is not supported');
    await expect(readVtkSet('n.pvtu', enc(pvtu))).rejects.toThrow('n.pvtu: a multi-file set needs its piece files, but no way to fetch them was given (LoadOptions.resolve)');
    const noSource = '<VTKFile type="PUnstructuredGrid" version="0.1"><PUnstructuredGrid><Piece/></PUnstructuredGrid></VTKFile>';
    await expect(readVtkSet('s.pvtu', enc(noSource), folder({}))).rejects.toThrow('s.pvtu: <Piece> 0 has no Source attribute');
    const loop = '<VTKFile type="vtkMultiBlockDataSet" version="1.0"><vtkMultiBlockDataSet><DataSet file="loop.vtm"/></vtkMultiBlockDataSet></VTKFile>';
    await expect(readVtkSet('loop.vtm', enc(loop), folder({ 'loop.vtm': loop }))).rejects.toThrow(/sets nested more than 8 deep/);
  });

  it('returns an empty dataset with a warning for a set without leaves', async () => {
    const d = await readVtkSet('e.vtm', enc('<VTKFile type="vtkMultiBlockDataSet" version="1.0"><vtkMultiBlockDataSet><Block index="0"/></vtkMultiBlockDataSet></VTKFile>'), folder({}));
    expect(d.pieces.length).toBe(0);
    expect(d.warnings).toEqual(['e.vtm: the set names no piece files (empty dataset)']);
  });
});

describe('joinPath', () => {
  it('joins and normalises relative paths, keeping absolute ones', () => {
    expect(joinPath('run', 'parts/p0.vtu')).toBe('run/parts/p0.vtu');
    expect(joinPath('', './a/../b.vtu')).toBe('b.vtu');
    expect(joinPath('a/b', '../../c.vtu')).toBe('c.vtu');
    expect(joinPath('a', '../../c.vtu')).toBe('../c.vtu');
    expect(joinPath('a', 'sub\\p.vtu')).toBe('a/sub/p.vtu');
    expect(joinPath('a', '/abs/p.vtu')).toBe('/abs/p.vtu');
  });
});
