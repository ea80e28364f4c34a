/**
 * Small hand-written legacy .vtk files, one per feature of the format. Reference for the layouts: the
 * VTK file-format document ("VTK File Formats", legacy section, docs.vtk.org), checked against what
 * VTK 9.1's own legacy writer emits (tests/reference/expected/legacy/fixtures/*.vtk). Expected values
 * are read off the file text written in each test, so they are exact.
 */
import { describe, expect, it } from 'vitest';
import { readLegacyVtk } from '../../src/io/vtkLegacy.ts';
import type { FieldArray } from '../../src/model/fieldArray.ts';
import { findField } from '../../src/model/piece.ts';
import { be, fileOf, text } from './legacyBytes.ts';

const values = (f: FieldArray | undefined) => Array.from(f!.values);

describe('legacy .vtk formats', () => {
  it('v2.0 BINARY unstructured grid (big-endian, written with DataView): points, packed cells, attributes, field arrays', async () => {
    const bytes = fileOf(
      '# vtk DataFile Version 2.0\nbinary test\nBINARY\nDATASET UNSTRUCTURED_GRID\n',
      'POINTS 5 float\n', be('f32', [0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1, 1, 1, 1]), '\n',
      'CELLS 2 10\n', be('i32', [4, 0, 1, 2, 3, 4, 1, 2, 3, 4]), '\n',
      'CELL_TYPES 2\n', be('i32', [10, 10]), '\n',
      'POINT_DATA 5\nSCALARS p double 1\nLOOKUP_TABLE default\n', be('f64', [101325, 101300.5, 101290.25, 101280, -1e-300]), '\n',
      'VECTORS velocity float\n', be('f32', [1, 0, 0, 0.5, 0.25, 0, 0, 0, 2, 0, 0, 0, -1, -1, -1]), '\n',
      // The first byte of this block is 0x0a (a newline) and the second 0x20 (a space): binary data are not text.
      'CELL_DATA 2\nFIELD FieldData 3\nflag 1 2 unsigned_char\n', be('u8', [10, 32]), '\n',
      'owner 1 2 vtktypeint64\n', be('i64', [2 ** 40, -7]), '\n',
      'zone 2 2 short\n', be('i16', [-3, 4, 5, -6]), '\n',
    );
    const d = await readLegacyVtk('tet2.vtk', bytes);
    const p = d.pieces[0]!;
    expect(Array.from(p.points)).toEqual([0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1, 1, 1, 1]);
    expect(Array.from(p.offsets)).toEqual([0, 4, 8]);
    expect(Array.from(p.connectivity)).toEqual([0, 1, 2, 3, 1, 2, 3, 4]);
    expect(Array.from(p.cellTypes)).toEqual([10, 10]);
    expect(values(findField(p, 'p', 'point'))).toEqual([101325, 101300.5, 101290.25, 101280, -1e-300]);
    expect(findField(p, 'velocity', 'point')!.components).toBe(3);
    expect(values(findField(p, 'velocity', 'point'))).toEqual([1, 0, 0, 0.5, 0.25, 0, 0, 0, 2, 0, 0, 0, -1, -1, -1]);
    expect(values(findField(p, 'flag', 'cell'))).toEqual([10, 32]);
    expect(findField(p, 'flag', 'cell')!.values.buffer).not.toBe(bytes.buffer); // a copy, not a view that pins the file
    expect(values(findField(p, 'owner', 'cell'))).toEqual([2 ** 40, -7]);
    expect(findField(p, 'owner', 'cell')!.sourceType).toBe('Int64');
    expect(values(findField(p, 'zone', 'cell'))).toEqual([-3, 4, 5, -6]);
    expect(d.fileCellTypes).toEqual({ 10: 2 });
  });

  it('v5.1 ASCII: CELLS n m counts offsets (cells + 1), then OFFSETS and CONNECTIVITY arrays', async () => {
    const d = await readLegacyVtk('tri51.vtk', text(`# vtk DataFile Version 5.1
written by hand
ASCII
DATASET UNSTRUCTURED_GRID
POINTS 4 double
0 0 0  1 0 0  1 1 0  0 1 0
CELLS 3 7
OFFSETS vtktypeint64
0
3
7
CONNECTIVITY vtktypeint64
0 1 2
0 1 2 3
CELL_TYPES 2
5
9
CELL_DATA 2
SCALARS area double
LOOKUP_TABLE default
0.5 1
`));
    const p = d.pieces[0]!;
    expect(Array.from(p.offsets)).toEqual([0, 3, 7]);
    expect(Array.from(p.connectivity)).toEqual([0, 1, 2, 0, 1, 2, 3]);
    expect(Array.from(p.cellTypes)).toEqual([5, 9]);
    expect(values(p.cellData[0])).toEqual([0.5, 1]);
  });

  it('v5.1 BINARY: Int32 OFFSETS with Int64 CONNECTIVITY, METADATA after POINTS and after an array', async () => {
    const bytes = fileOf(
      '# vtk DataFile Version 5.1\nvtk output\nBINARY\nDATASET UNSTRUCTURED_GRID\n',
      'POINTS 4 double\n', be('f64', [0, 0, 0, 2, 0, 0, 0, 2, 0, 0, 0, 2]), '\n',
      'METADATA\nINFORMATION 1\nNAME L2_NORM_RANGE LOCATION vtkDataArray\nDATA 2 0 2 \n\n',
      'CELLS 2 4\nOFFSETS vtktypeint32\n', be('i32', [0, 4]), '\n',
      'CONNECTIVITY vtktypeint64\n', be('i64', [3, 2, 1, 0]), '\n',
      'CELL_TYPES 1\n', be('i32', [10]), '\n',
      'POINT_DATA 4\nVECTORS u double\n', be('f64', [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]), '\n',
      'METADATA\nCOMPONENT_NAMES\nu%20x\nu%20y\nu%20z\n\n',
      'SCALARS T float\nLOOKUP_TABLE default\n', be('f32', [300, 301, 302, 303]), '\n',
    );
    const d = await readLegacyVtk('tet51.vtk', bytes);
    const p = d.pieces[0]!;
    expect(Array.from(p.connectivity)).toEqual([3, 2, 1, 0]);
    expect(values(findField(p, 'u', 'point'))).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
    expect(values(findField(p, 'T', 'point'))).toEqual([300, 301, 302, 303]);
  });

  const polyOutOfOrder = `# vtk DataFile Version 3.0
sections out of VTK's order
ASCII
DATASET POLYDATA
POINTS 8 float
0 0 0 1 0 0 1 1 0 0 1 0 0 0 1 1 0 1 1 1 1 0 1 1
POLYGONS 3 15
3 0 1 2
4 0 1 2 3
5 4 5 6 7 0
TRIANGLE_STRIPS 1 6
5 0 1 2 3 4
VERTICES 2 5
1 7
2 5 6
LINES 2 7
2 0 4
3 1 5 6
CELL_DATA 8
SCALARS order int 1
LOOKUP_TABLE default
0 1 2 3 4 5 6 7
`;

  it('POLYDATA: VERTICES, LINES, POLYGONS, TRIANGLE_STRIPS in any file order become cells in VTK order (verts, lines, polys, strips)', async () => {
    const d = await readLegacyVtk('poly.vtk', text(polyOutOfOrder));
    const p = d.pieces[0]!;
    expect(d.kind).toBe('polydata');
    expect(Array.from(p.cellTypes)).toEqual([1, 2, 3, 4, 5, 9, 7, 6]);
    expect(Array.from(p.connectivity)).toEqual([7, 5, 6, 0, 4, 1, 5, 6, 0, 1, 2, 0, 1, 2, 3, 4, 5, 6, 7, 0, 0, 1, 2, 3, 4]);
    // Cell data are stored in that same order, so tuple k belongs to cell k.
    expect(values(p.cellData[0])).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    expect(d.fileCellTypes).toEqual({ 1: 1, 2: 1, 3: 1, 4: 1, 5: 1, 6: 1, 7: 1, 9: 1 });
  });

  it('POLYDATA in the 5.1 layout, BINARY, gives the same cells as the packed ASCII layout', async () => {
    const section = (kw: string, offsets: number[], conn: number[]) => [
      `${kw} ${offsets.length} ${conn.length}\nOFFSETS vtktypeint64\n`, be('i64', offsets), '\n',
      'CONNECTIVITY vtktypeint64\n', be('i64', conn), '\n',
    ];
    const bytes = fileOf(
      '# vtk DataFile Version 5.1\nvtk output\nBINARY\nDATASET POLYDATA\n',
      'POINTS 8 float\n', be('f32', [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0, 0, 1, 1, 0, 1, 1, 1, 1, 0, 1, 1]), '\n',
      ...section('TRIANGLE_STRIPS', [0, 5], [0, 1, 2, 3, 4]),
      ...section('POLYGONS', [0, 3, 7, 12], [0, 1, 2, 0, 1, 2, 3, 4, 5, 6, 7, 0]),
      ...section('LINES', [0, 2, 5], [0, 4, 1, 5, 6]),
      ...section('VERTICES', [0, 1, 3], [7, 5, 6]),
    );
    const bin = (await readLegacyVtk('poly51.vtk', bytes)).pieces[0]!;
    const asc = (await readLegacyVtk('poly.vtk', text(polyOutOfOrder))).pieces[0]!;
    expect(Array.from(bin.cellTypes)).toEqual(Array.from(asc.cellTypes));
    expect(Array.from(bin.offsets)).toEqual(Array.from(asc.offsets));
    expect(Array.from(bin.connectivity)).toEqual(Array.from(asc.connectivity));
  });

  const oneTet = (format: 'ASCII' | 'BINARY') => `# vtk DataFile Version 3.0\none tetra\n${format}\nDATASET UNSTRUCTURED_GRID\n`;

  it('an inline LOOKUP_TABLE name size (size × 4 floats in ASCII) is skipped; the arrays after it are read', async () => {
    const d = await readLegacyVtk('lut.vtk', text(`${oneTet('ASCII')}POINTS 4 float
0 0 0 1 0 0 0 1 0 0 0 1
CELLS 1 5
4 0 1 2 3
CELL_TYPES 1
10
POINT_DATA 4
SCALARS s float 1
LOOKUP_TABLE mine
1 2 3 4
LOOKUP_TABLE mine 3
0 0 1 1
0 1 0 1
1 0 0 0.5
VECTORS after float
1 0 0 0 1 0 0 0 1 1 1 1
`));
    const p = d.pieces[0]!;
    expect(p.pointData.map((f) => f.name)).toEqual(['s', 'after']);
    expect(values(findField(p, 'after', 'point'))).toEqual([1, 0, 0, 0, 1, 0, 0, 0, 1, 1, 1, 1]);
  });

  it('an inline LOOKUP_TABLE in BINARY (size × 4 unsigned bytes) is skipped', async () => {
    const bytes = fileOf(oneTet('BINARY'),
      'POINTS 4 float\n', be('f32', [0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1]), '\n',
      'CELLS 1 5\n', be('i32', [4, 0, 1, 2, 3]), '\n', 'CELL_TYPES 1\n', be('i32', [10]), '\n',
      'POINT_DATA 4\nSCALARS s float\nLOOKUP_TABLE mine\n', be('f32', [1, 2, 3, 4]), '\n',
      'LOOKUP_TABLE mine 2\n', be('u8', [10, 10, 32, 255, 0, 1, 2, 3]), '\n',
      'SCALARS after double\nLOOKUP_TABLE default\n', be('f64', [5, 6, 7, 8]), '\n');
    const p = (await readLegacyVtk('lutb.vtk', bytes)).pieces[0]!;
    expect(values(findField(p, 'after', 'point'))).toEqual([5, 6, 7, 8]);
  });

  it('METADATA blocks after POINTS, after an attribute and inside a FIELD block are skipped up to their blank line', async () => {
    const d = await readLegacyVtk('meta.vtk', text(`${oneTet('ASCII')}POINTS 4 float
0 0 0 1 0 0 0 1 0 0 0 1
METADATA
INFORMATION 2
NAME L2_NORM_RANGE LOCATION vtkDataArray
DATA 2 0 1
NAME L2_NORM_FINITE_RANGE LOCATION vtkDataArray
DATA 2 0 1

CELLS 1 5
4 0 1 2 3
CELL_TYPES 1
10
POINT_DATA 4
VECTORS v float
1 2 3 4 5 6 7 8 9 10 11 12
METADATA
COMPONENT_NAMES
v%20x
v%20y
v%20z

FIELD FieldData 2
a 1 4 float
1 2 3 4
METADATA
COMPONENT_NAMES
only

b 2 4 int
1 2 3 4 5 6 7 8
`));
    const p = d.pieces[0]!;
    expect(p.pointData.map((f) => [f.name, f.components])).toEqual([['v', 3], ['a', 1], ['b', 2]]);
    expect(values(findField(p, 'b', 'point'))).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
  });

  it('TENSORS (9 components), TENSORS6, NORMALS, TEXTURE_COORDINATES, COLOR_SCALARS and GLOBAL_IDS', async () => {
    const d = await readLegacyVtk('attrs.vtk', text(`${oneTet('ASCII')}POINTS 4 float
0 0 0 1 0 0 0 1 0 0 0 1
CELLS 1 5
4 0 1 2 3
CELL_TYPES 1
10
CELL_DATA 1
TENSORS stress double
1 2 3 4 5 6 7 8 9
TENSORS6 strain float
1 2 3 4 5 6
NORMALS n float
0 0 1
TEXTURE_COORDINATES uv 2 float
0.25 0.75
COLOR_SCALARS rgb 3
1 0.5 0
GLOBAL_IDS gid vtkIdType
42
`));
    const c = d.pieces[0]!.cellData;
    expect(c.map((f) => [f.name, f.components, f.role])).toEqual([
      ['stress', 9, 'tensors'], ['strain', 6, 'tensors'], ['n', 3, 'normals'], ['uv', 2, 'tcoords'], ['rgb', 3, 'scalars'], ['gid', 1, 'globalIds'],
    ]);
    expect(values(c[0])).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9]);
    // VTK's reader turns text colours in 0..1 into bytes: round(255 v).
    expect(values(c[4])).toEqual([255, 128, 0]);
    expect(c[4]!.sourceType).toBe('UInt8');
    expect(values(c[5])).toEqual([42]);
  });

  it('%20 (and other %XX) escapes in names are decoded', async () => {
    const d = await readLegacyVtk('names.vtk', text(`${oneTet('ASCII')}POINTS 4 float
0 0 0 1 0 0 0 1 0 0 0 1
CELLS 1 5
4 0 1 2 3
CELL_TYPES 1
10
POINT_DATA 4
SCALARS wall%20shear%20stress float
LOOKUP_TABLE default
1 2 3 4
FIELD FieldData 1
total%20pressure%20%25 1 4 double
5 6 7 8
`));
    expect(d.pieces[0]!.pointData.map((f) => f.name)).toEqual(['wall shear stress', 'total pressure %']);
  });

  it('a polyhedron (type 42) in the packed layout: its face stream becomes faces, its nodes the distinct ids', async () => {
    // The cell list below is what VTK 9.1's writer emits for a tetra given as a polyhedron (file version 4.2).
    const d = await readLegacyVtk('polyh.vtk', text(`# vtk DataFile Version 4.2
vtk output
ASCII
DATASET UNSTRUCTURED_GRID
POINTS 4 float
0 0 0 1 0 0 0 1 0
0 0 1
CELLS 1 18
17 4 3 0 2 1 3 0 1 3 3 0 3 2 3 1 2 3

CELL_TYPES 1
42
`));
    const p = d.pieces[0]!;
    expect(Array.from(p.connectivity)).toEqual([0, 1, 2, 3]);
    expect(Array.from(p.polyFaces!.cellFaceStart)).toEqual([0, 4]);
    expect(Array.from(p.polyFaces!.faceOffsets)).toEqual([0, 3, 6, 9, 12]);
    expect(Array.from(p.polyFaces!.faceConnectivity)).toEqual([0, 2, 1, 0, 1, 3, 0, 3, 2, 1, 2, 3]);
  });

  it('dataset FIELD with a NULL_ARRAY entry; lower-case keywords; CRLF line ends', async () => {
    const src = `# vtk DataFile Version 3.0
crlf
ascii
dataset unstructured_grid
field FieldData 2
NULL_ARRAY
Time 1 1 double
12.5
points 2 float
0 0 0 1 0 0
cells 1 3
2 0 1
cell_types 1
3
`.replace(/\n/g, '\r\n');
    const d = await readLegacyVtk('crlf.vtk', text(src));
    expect(d.fieldData.map((f) => [f.name, f.association, values(f)])).toEqual([['Time', 'dataset', [12.5]]]);
    expect(Array.from(d.pieces[0]!.cellTypes)).toEqual([3]);
  });

  it('a version newer than 5.1 is read as 5.1, with a warning', async () => {
    const d = await readLegacyVtk('future.vtk', text('# vtk DataFile Version 6.0\nt\nASCII\nDATASET POLYDATA\nPOINTS 1 float\n0 0 0\nVERTICES 2 1\nOFFSETS vtktypeint64\n0 1\nCONNECTIVITY vtktypeint64\n0\n'));
    expect(d.warnings).toEqual(['future.vtk: file version 6 is newer than 5.1, the newest this reader knows; read as 5.1']);
    expect(Array.from(d.pieces[0]!.cellTypes)).toEqual([1]);
  });

  it('empty sections: POINTS 0, CELLS 0 0, CELL_TYPES 0 give an empty piece', async () => {
    const d = await readLegacyVtk('empty.vtk', text(`${oneTet('ASCII')}POINTS 0 float
CELLS 0 0
CELL_TYPES 0
`));
    expect(d.pieces[0]!.points.length).toBe(0);
    expect(d.pieces[0]!.cellTypes.length).toBe(0);
  });

  it('POINTS declared float are rounded to single precision, as VTK stores them; double stays exact', async () => {
    const src = (t: string) => text(`${oneTet('ASCII')}POINTS 1 ${t}\n0.1 0.2 0.3\n`);
    expect(Array.from((await readLegacyVtk('f.vtk', src('float'))).pieces[0]!.points)).toEqual([Math.fround(0.1), Math.fround(0.2), Math.fround(0.3)]);
    expect(Array.from((await readLegacyVtk('d.vtk', src('double'))).pieces[0]!.points)).toEqual([0.1, 0.2, 0.3]);
  });

  it('reports progress on a long ASCII file and stops with an AbortError when cancelled', async () => {
    // A million points as text (about 20 MB): long enough for several 50 ms checkpoints.
    const n = 1_000_000;
    const rows: string[] = [];
    for (let i = 0; i < n; i++) rows.push(`${i} ${(i % 977) * 0.5} ${i % 13}`);
    const bytes = text(`${oneTet('ASCII')}POINTS ${n} double\n${rows.join('\n')}\n`);
    const seen: number[] = [];
    const d = await readLegacyVtk('long.vtk', bytes, { onProgress: (p) => { seen.push(p.bytesDone); expect(p.bytesTotal).toBe(bytes.length); } });
    expect(d.pieces[0]!.points.length).toBe(3 * n);
    expect(d.pieces[0]!.points[3 * 12345 + 1]).toBe((12345 % 977) * 0.5);
    expect(seen.length).toBeGreaterThan(0);

    const ctrl = new AbortController();
    ctrl.abort();
    await expect(readLegacyVtk('long.vtk', bytes, { signal: ctrl.signal })).rejects.toMatchObject({ name: 'AbortError', message: 'long.vtk: loading cancelled' });

    const late = new AbortController();
    await expect(readLegacyVtk('long.vtk', bytes, { signal: late.signal, onProgress: () => late.abort() })).rejects.toMatchObject({ name: 'AbortError' });
    expect(seen.every((b, i) => i === 0 || b >= seen[i - 1]!)).toBe(true);
  });
});
