/**
 * The VTK XML reader (.vtu/.vtp) on real files and on hand-built ones.
 *  - External files: counts, cell types, arrays, ranges, sums and (for small files) every value, as VTK
 *    9.1 reads them. Reference: tests/reference/xml_probe.py → tests/reference/expected/xml/*.json.
 *  - cow.vtp: points and polygon connectivity as vtk.js's XMLPolyDataReader reads them. Reference: vtk.js.
 *  - box.vtu: the values listed by vtkio's own test (`make_box_vtu` in elrnv/vtkio tests/xml.rs).
 *  - The five encodings of vtu11/pyramids_3D hold identical arrays (vtu11 wrote them from one mesh).
 *  - Hand-built files (tests/helpers/vtkXmlFixtures.ts, packed from VTK's file-format description).
 */
import { describe, expect, it, vi } from 'vitest';
import { readVtkXml } from '../../src/io/vtkXml.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import type { Piece } from '../../src/model/piece.ts';
import { externalBytes, loadExternal } from '../helpers/external.ts';
import { buildXml, tetPyramidPiece, type BuildOptions, type PieceSpec, type XmlType } from '../helpers/vtkXmlFixtures.ts';
import { expectMatchesVtk, vtkReference } from '../helpers/xmlReference.ts';

const SINGLE_FILES = [
  'vtk-data/Wedge.vtu', 'vtk-data/polyhedron2pieces.vtu', 'vtk-data/cow.vtp',
  'vtkio/box.vtu', 'vtkio/hexahedron_ascii.vtu', 'vtkio/hexahedron_inline_binary.vtu',
  'vtu11/pyramids_3D/ascii.vtu', 'vtu11/pyramids_3D/base64.vtu', 'vtu11/pyramids_3D/base64appended.vtu',
  'vtu11/pyramids_3D/raw.vtu', 'vtu11/pyramids_3D/raw_compressed.vtu',
  'vtu11/parallel_write/pyramids_3D/tester/pyramids3D_parallel_test/pyramids3D_parallel_test_0.vtu',
  'vtu11/parallel_write/pyramids_3D/tester/pyramids3D_parallel_test/pyramids3D_parallel_test_1.vtu',
  'vtu11/parallel_write/pyramids_3D/tester/pyramids3D_parallel_test/pyramids3D_parallel_test_2.vtu',
  ...Array.from({ length: 16 }, (_, i) => `vtk-data/ex-blow_5/ex-blow_5_${i >> 3}_${i & 7}.vtu`),
];

const readExternal = (rel: string) => readVtkXml(rel.split('/').pop()!, externalBytes(rel));

describe('external XML files against VTK 9.1', () => {
  for (const rel of SINGLE_FILES) {
    it(rel, async () => {
      const d = await readExternal(rel);
      const ref = rel.includes('ex-blow_5/') ? vtkReference('vtk-data/ex-blow_5.vtm').leaves[Number(rel.slice(-7, -6)) * 8 + Number(rel.slice(-5, -4))]! : vtkReference(rel).leaves[0]!;
      expectMatchesVtk(d.pieces, d.fileCellTypes, d.fieldData, ref);
      expect(d.kind).toBe(rel.endsWith('.vtp') ? 'polydata' : 'unstructured');
    });
  }

  it('polyhedron2pieces.vtu gives two pieces, each with a pyramid and a six-face polyhedron', async () => {
    const d = await readExternal('vtk-data/polyhedron2pieces.vtu');
    expect(d.pieces.length).toBe(2);
    for (const p of d.pieces) {
      expect(Array.from(p.cellTypes)).toEqual([14, 42]);
      expect(Array.from(p.polyFaces!.cellFaceStart)).toEqual([0, 0, 6]);
    }
  });

  it('ex-blow_5 pieces mark their id arrays (GlobalIds=, PedigreeIds=) and nothing else', async () => {
    const d = await readExternal('vtk-data/ex-blow_5/ex-blow_5_0_0.vtu');
    const roles = Object.fromEntries(d.pieces[0]!.pointData.map((f) => [f.name, f.role]));
    expect(roles).toEqual({ GlobalNodeId: 'globalIds', PedigreeNodeId: 'pedigreeIds', DISPLACEMENT_: undefined, THICKNESS: undefined });
    const cellRoles = Object.fromEntries(d.pieces[0]!.cellData.map((f) => [f.name, f.role]));
    expect(cellRoles).toEqual({ GlobalElementId: 'globalIds', PedigreeElementId: 'pedigreeIds', ObjectId: undefined, vtkOriginalCellIds: undefined });
    expect(d.pieces[0]!.pointData.find((f) => f.name === 'GlobalNodeId')!.sourceType).toBe('Int64');
  });

  it('refuses the LZMA-compressed file, naming the file, the compressor and zlib', async () => {
    await expect(readExternal('vtkio/hexahedron_lzma_inline_binary.vtu')).rejects.toThrow(
      'hexahedron_lzma_inline_binary.vtu: piece 0: DataArray "Points": compressor "vtkLZMADataCompressor" is not supported; fieldtally reads only zlib-compressed (vtkZLibDataCompressor) or uncompressed binary data');
  });

  it('loads through the app entry point (loadDatasetFile) as well', async () => {
    const d = await loadExternal('vtk-data/Wedge.vtu');
    expect(d.source).toBe('Wedge.vtu');
    expect(d.fileCellTypes).toEqual({ 13: 16 });
  });
});

/** Every array of a piece, by a stable key, as plain numbers. */
function arraysOf(p: Piece): Record<string, number[]> {
  const out: Record<string, number[]> = {
    points: Array.from(p.points), connectivity: Array.from(p.connectivity), offsets: Array.from(p.offsets), types: Array.from(p.cellTypes),
  };
  for (const f of p.pointData) out[`point:${f.name}`] = Array.from(f.values);
  for (const f of p.cellData) out[`cell:${f.name}`] = Array.from(f.values);
  return out;
}

describe('vtu11 pyramids_3D: five encodings of one mesh', () => {
  it('ascii, base64, base64appended, raw and raw_compressed give identical arrays, element by element', async () => {
    // Reference: vtu11 wrote all five from the same mesh (SOURCES.md: "checked with VTK").
    const names = ['ascii', 'base64', 'base64appended', 'raw', 'raw_compressed'];
    const all = await Promise.all(names.map((n) => readExternal(`vtu11/pyramids_3D/${n}.vtu`)));
    const first = arraysOf(all[0]!.pieces[0]!);
    expect(Object.keys(first).sort()).toEqual(['cell:cell Colour', 'connectivity', 'offsets', 'point:Flash Strength Points', 'points', 'types']);
    for (let i = 1; i < names.length; i++) expect(arraysOf(all[i]!.pieces[0]!), names[i]).toEqual(first);
  });
});

describe('box.vtu (big-endian, UInt64 headers, version 4.2) against vtkio', () => {
  it('holds exactly the values vtkio’s test lists', async () => {
    // Reference: elrnv/vtkio tests/xml.rs, make_box_vtu (the expected content of assets/box.vtu).
    const d = await readExternal('vtkio/box.vtu');
    const p = d.pieces[0]!;
    const a = 0.5208333134651184;
    expect(Array.from(p.points)).toEqual([a, -0.5, 0.5, -a, -0.5, 0.5, a, 0.5, 0.5, -a, 0.5, 0.5, -a, -0.5, -0.5, a, -0.5, -0.5, -a, 0.5, -0.5, a, 0.5, -0.5]);
    expect(Array.from(p.connectivity)).toEqual([0, 1, 3, 2, 4, 5, 7, 6, 6, 7, 2, 3, 5, 4, 1, 0, 5, 0, 2, 7, 1, 4, 6, 3]);
    expect(Array.from(p.offsets)).toEqual([0, 4, 8, 12, 16, 20, 24]);
    expect(Array.from(p.cellTypes)).toEqual([7, 7, 7, 7, 7, 7]);
    const [pressure, cd, mtl] = p.pointData;
    expect(pressure!.name).toBe('pressure');
    expect(pressure!.role).toBe('scalars');
    expect(Array.from(pressure!.values)).toEqual([-0.5, -0.5, 0.5, 0.5, -0.5, -0.5, 0.5, 0.5]);
    expect(cd!.name).toBe('Cd');
    expect(cd!.role).toBe('vectors');
    expect(cd!.components).toBe(3);
    expect(Array.from(cd!.values)).toEqual([0.2, 0, 1, 0.2, 0, 1, 0, 1, 0.1, 0, 1, 0.1, 0.2, 0, 1, 0.2, 0, 1, 0, 1, 0.1, 0, 1, 0.1].map(Math.fround));
    expect(mtl!.name).toBe('mtl_id');
    expect(mtl!.values).toBeInstanceOf(Int32Array);
    expect(Array.from(mtl!.values)).toEqual([1, 1, 1, 1, 1, 1, 1, 1]);
    expect(p.cellData.map((f) => [f.name, f.role, Array.from(f.values)])).toEqual([['mtl_id', 'scalars', [0, 0, 0, 0, 0, 0]]]);
  });
});

describe('cow.vtp against vtk.js', () => {
  it('gives the same points and polygon connectivity as vtk.js’s XMLPolyDataReader', async () => {
    // Reference: vtk.js (@kitware/vtk.js XMLPolyDataReader). Its XML layer looks for a DOM `Node` global.
    (globalThis as { Node?: unknown }).Node ??= { ELEMENT_NODE: 1, TEXT_NODE: 3 };
    const { default: reader } = await import('@kitware/vtk.js/IO/XML/XMLPolyDataReader.js');
    const bytes = externalBytes('vtk-data/cow.vtp');
    const r = reader.newInstance();
    expect(r.parseAsArrayBuffer(bytes.slice().buffer)).toBe(true);
    const pd = r.getOutputData(0);
    const d = await readExternal('vtk-data/cow.vtp');
    const p = d.pieces[0]!;
    expect(Array.from(p.points)).toEqual(Array.from(pd.getPoints().getData() as Float32Array));
    const legacy = pd.getPolys().getData() as Int32Array;
    const ours: number[] = [];
    for (let c = 0; c < p.cellTypes.length; c++) ours.push(p.offsets[c + 1]! - p.offsets[c]!, ...p.connectivity.subarray(p.offsets[c]!, p.offsets[c + 1]!));
    expect(ours).toEqual(Array.from(legacy));
    expect(pd.getVerts().getNumberOfCells() + pd.getLines().getNumberOfCells() + pd.getStrips().getNumberOfCells()).toBe(0);
  });
});

/** What tetPyramidPiece must read back as. */
function expectTetPyramid(d: Dataset): void {
  const p = d.pieces[0]!;
  expect(Array.from(p.points)).toEqual([0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0.5, 0.5, 1, 0.5, 0.5, -1]);
  expect(Array.from(p.connectivity)).toEqual([0, 1, 2, 3, 4, 0, 1, 3, 5]);
  expect(Array.from(p.offsets)).toEqual([0, 5, 9]);
  expect(Array.from(p.cellTypes)).toEqual([14, 10]);
  expect(d.fileCellTypes).toEqual({ 14: 1, 10: 1 });
  const [pr, u] = p.pointData;
  expect(pr!.name).toBe('static pressure');
  expect(pr!.role).toBe('scalars');
  expect(Array.from(pr!.values)).toEqual([101325, 101300.5, 101290.25, 101310, 101280.125, 101305]);
  expect(u!.components).toBe(3);
  expect(u!.values).toBeInstanceOf(Float32Array);
  expect(Array.from(u!.values)).toEqual([1, 0, 0, 2, 0.5, 0, 3, 0, 0.25, 1.5, 1, 1, 0, 0, 0, -1, 2, 0.5]);
  expect(p.cellData[0]!.values).toBeInstanceOf(Int16Array);
  expect(Array.from(p.cellData[0]!.values)).toEqual([3, -7]);
}

const fileOf = (opts: BuildOptions, piece: PieceSpec = tetPyramidPiece(), type: 'UnstructuredGrid' | 'PolyData' = 'UnstructuredGrid') => buildXml(type, [piece], opts);

describe('hand-built files: every encoding and header layout', () => {
  const encodings = ['ascii', 'binary', 'appended-raw', 'appended-base64'] as const;
  for (const encoding of encodings) {
    for (const headerType of ['UInt32', 'UInt64'] as const) {
      for (const bigEndian of [false, true]) {
        for (const zlib of encoding === 'ascii' ? [0] : [0, 16]) {
          const label = `${encoding}, ${headerType}, ${bigEndian ? 'BigEndian' : 'LittleEndian'}${zlib ? ', zlib in 16-byte blocks' : ''}`;
          it(label, async () => {
            const opts: BuildOptions = { encoding, headerType, bigEndian, ...(zlib ? { zlibBlockSize: zlib } : {}) };
            expectTetPyramid(await readVtkXml('hand.vtu', fileOf(opts)));
          });
        }
      }
    }
  }

  it('defaults to UInt32 headers when header_type is absent (version 0.1 and 1.0)', async () => {
    for (const version of ['0.1', '1.0']) {
      expectTetPyramid(await readVtkXml('v.vtu', fileOf({ encoding: 'binary', omitHeaderType: true, version })));
      expectTetPyramid(await readVtkXml('v.vtu', fileOf({ encoding: 'appended-raw', omitHeaderType: true, version, zlibBlockSize: 24 })));
    }
  });

  it('reads UInt64 headers on a version 0.1 file', async () => {
    expectTetPyramid(await readVtkXml('v01.vtu', fileOf({ encoding: 'appended-raw', headerType: 'UInt64', version: '0.1' })));
  });

  it('reads header and data encoded as one base64 run as well as two', async () => {
    for (const zlibBlockSize of [0, 20]) {
      expectTetPyramid(await readVtkXml('j.vtu', fileOf({ encoding: 'binary', headerType: 'UInt64', jointBase64: true, ...(zlibBlockSize ? { zlibBlockSize } : {}) })));
      expectTetPyramid(await readVtkXml('j.vtu', fileOf({ encoding: 'appended-base64', jointBase64: true, ...(zlibBlockSize ? { zlibBlockSize } : {}) })));
    }
  });

  it('reads 64-bit ids and Int8 cell types', async () => {
    expectTetPyramid(await readVtkXml('i64.vtu', fileOf({ encoding: 'appended-raw', headerType: 'UInt64' }, tetPyramidPiece('Int64', 'Int8'))));
    expectTetPyramid(await readVtkXml('u64.vtu', fileOf({ encoding: 'binary', bigEndian: true }, tetPyramidPiece('UInt64', 'Int8'))));
  });

  it('reads data that are not aligned in the file (odd appended offsets, file at an odd byte offset)', async () => {
    for (const lead of [1, 3, 5, 7]) {
      expectTetPyramid(await readVtkXml('odd64.vtu', fileOf({ encoding: 'appended-raw', appendedLead: lead, headerType: 'UInt64' }, tetPyramidPiece('Int64'))));
      expectTetPyramid(await readVtkXml('odd64.vtu', fileOf({ encoding: 'appended-raw', appendedLead: lead, bigEndian: true }, tetPyramidPiece('Int64'))));
      const bytes = fileOf({ encoding: 'appended-raw', appendedLead: lead });
      const shifted = new Uint8Array(bytes.length + 1);
      shifted.set(bytes, 1);
      expectTetPyramid(await readVtkXml('odd.vtu', bytes));
      expectTetPyramid(await readVtkXml('odd.vtu', shifted.subarray(1)));
      expectTetPyramid(await readVtkXml('odd.vtu', fileOf({ encoding: 'appended-raw', appendedLead: lead, bigEndian: true })));
    }
  });

  it('reads every numeric type into the matching model array', async () => {
    const types: [XmlType, ArrayConstructor | Function, number[]][] = [
      ['Int8', Int8Array, [-128, 127, 0, 1, -1, 5]], ['UInt8', Uint8Array, [0, 255, 1, 2, 3, 4]],
      ['Int16', Int16Array, [-32768, 32767, 0, 1, -1, 5]], ['UInt16', Uint16Array, [0, 65535, 1, 2, 3, 4]],
      ['Int32', Int32Array, [-2147483648, 2147483647, 0, 1, -1, 5]], ['UInt32', Uint32Array, [0, 4294967295, 1, 2, 3, 4]],
      ['Int64', Float64Array, [-(2 ** 53), 2 ** 53, 0, 1, -1, 5]], ['UInt64', Float64Array, [0, 2 ** 53, 1, 2, 3, 4]],
      ['Float32', Float32Array, [-1.5, 3.25, 0, 1e-3, -1e30, 5]], ['Float64', Float64Array, [-1.5, 3.25, 0, 1e-300, -1e300, Math.PI]],
    ];
    const piece = tetPyramidPiece();
    piece.sections[0]!.arrays = types.map(([t, , v]) => ({ name: `a ${t}`, type: t, values: t.endsWith('64') && t !== 'Float64' ? v.map(BigInt) : v }));
    for (const encoding of ['ascii', 'binary', 'appended-raw'] as const) {
      for (const bigEndian of [false, true]) {
        const d = await readVtkXml('types.vtu', fileOf({ encoding, bigEndian }, piece));
        types.forEach(([t, ctor, v], i) => {
          const f = d.pieces[0]!.pointData[i]!;
          expect(f.name).toBe(`a ${t}`);
          expect(f.sourceType).toBe(t);
          expect(f.values).toBeInstanceOf(ctor);
          expect(Array.from(f.values), `${t} ${encoding}`).toEqual(t === 'Float32' ? v.map(Math.fround) : v);
        });
      }
    }
  });

  it('reads several pieces, roles, dataset field data, and field-data text arrays as strings', async () => {
    const second = tetPyramidPiece();
    second.sections[0]!.attrs = { Scalars: 'static pressure', Vectors: 'U' };
    const bytes = buildXml('UnstructuredGrid', [tetPyramidPiece(), second], {
      encoding: 'appended-raw',
      fieldData: [
        { name: 'TimeValue', type: 'Float64', values: [0.125], extra: 'NumberOfTuples="1"' },
        { name: 'run id', type: 'Int32', values: [7, 8, 9], extra: 'NumberOfTuples="3"' },
        { name: 'solver note', type: 'String', values: [104, 105, 0], extra: 'NumberOfTuples="1"' },
      ],
    });
    const d = await readVtkXml('multi.vtu', bytes);
    expect(d.pieces.length).toBe(2);
    expect(d.pieces[1]!.pointData.map((f) => f.role)).toEqual(['scalars', 'vectors']);
    expect(d.fieldData.map((f) => [f.name, f.association, Array.from(f.values)])).toEqual([['TimeValue', 'dataset', [0.125]], ['run id', 'dataset', [7, 8, 9]]]);
    // a String array holds each string's bytes and a 0 (VTK's XML layout): "hi"
    expect(d.fieldStrings).toEqual([{ name: 'solver note', values: ['hi'] }]);
    expect(d.warnings).toEqual([]);
    expect(d.fileCellTypes).toEqual({ 14: 2, 10: 2 });
  });

  it('reads an unnamed point array and names it', async () => {
    const piece = tetPyramidPiece();
    piece.sections[0]!.arrays = [{ type: 'Float32', values: [1, 2, 3, 4, 5, 6] }];
    const d = await readVtkXml('noname.vtu', fileOf({ encoding: 'ascii' }, piece));
    expect(d.pieces[0]!.pointData[0]!.name).toBe('point array 0');
  });
});

describe('hand-built files: polyhedra, higher-order cells, polygonal data', () => {
  /** A cube (points 0–7) as one polyhedron plus a tetra on top (point 8), in a given face layout. */
  function polyPiece(layout: 'classic' | 'vtk94'): PieceSpec {
    const cubeFaces = [[0, 3, 2, 1], [4, 5, 6, 7], [0, 1, 5, 4], [1, 2, 6, 5], [2, 3, 7, 6], [3, 0, 4, 7]];
    const cells = layout === 'classic'
      ? [
        { name: 'faces', type: 'Int64', values: [6, ...cubeFaces.flatMap((f) => [4, ...f])].map(BigInt) },
        { name: 'faceoffsets', type: 'Int64', values: [31n, -1n] },
      ]
      : [
        // Faces listed once in a shared table, the polyhedron referring to them out of order.
        { name: 'face_connectivity', type: 'Int32', values: [9, 9, 9, ...cubeFaces.slice().reverse().flat()] },
        { name: 'face_offsets', type: 'Int32', values: [3, 7, 11, 15, 19, 23, 27] },
        { name: 'polyhedron_to_faces', type: 'Int32', values: [6, 5, 4, 3, 2, 1] },
        { name: 'polyhedron_offsets', type: 'Int32', values: [6, 6] },
      ];
    return {
      attrs: { NumberOfPoints: 10, NumberOfCells: 2 },
      sections: [
        { tag: 'Points', arrays: [{ type: 'Float32', components: 3, values: [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0, 0, 1, 1, 0, 1, 1, 1, 1, 0, 1, 1, 0.5, 0.5, 2, 9, 9, 9] }] },
        { tag: 'Cells', arrays: [
          { name: 'connectivity', type: 'Int32', values: [0, 1, 2, 3, 4, 5, 6, 7, 4, 5, 6, 8] },
          { name: 'offsets', type: 'Int32', values: [8, 12] },
          { name: 'types', type: 'UInt8', values: [42, 10] },
          ...cells,
        ] },
      ],
    };
  }

  for (const layout of ['classic', 'vtk94'] as const) {
    for (const encoding of ['ascii', 'appended-raw'] as const) {
      it(`reads polyhedron faces, ${layout === 'classic' ? 'faces/faceoffsets' : 'VTK 9.4 face tables'} (${encoding})`, async () => {
        const d = await readVtkXml('poly.vtu', fileOf({ encoding }, polyPiece(layout)));
        const pf = d.pieces[0]!.polyFaces!;
        expect(Array.from(pf.cellFaceStart)).toEqual([0, 6, 6]);
        const faces = [];
        for (let f = 0; f < 6; f++) faces.push(Array.from(pf.faceConnectivity.subarray(pf.faceOffsets[f]!, pf.faceOffsets[f + 1]!)));
        const cube = [[0, 3, 2, 1], [4, 5, 6, 7], [0, 1, 5, 4], [1, 2, 6, 5], [2, 3, 7, 6], [3, 0, 4, 7]];
        expect(faces).toEqual(cube);
        expect(d.fileCellTypes).toEqual({ 42: 1, 10: 1 });
      });
    }
  }

  it('reads higher-order cells by their corners, with a warning', async () => {
    const piece: PieceSpec = {
      attrs: { NumberOfPoints: 10, NumberOfCells: 1 },
      sections: [
        { tag: 'Points', arrays: [{ type: 'Float64', components: 3, values: [0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1, 0.5, 0, 0, 0.5, 0.5, 0, 0, 0.5, 0, 0, 0, 0.5, 0.5, 0, 0.5, 0, 0.5, 0.5] }] },
        { tag: 'Cells', arrays: [
          { name: 'connectivity', type: 'Int32', values: [0, 1, 2, 3, 4, 5, 6, 7, 8, 9] },
          { name: 'offsets', type: 'Int32', values: [10] },
          { name: 'types', type: 'UInt8', values: [24] },
        ] },
      ],
    };
    const d = await readVtkXml('quad.vtu', fileOf({ encoding: 'binary' }, piece));
    expect(Array.from(d.pieces[0]!.cellTypes)).toEqual([10]);
    expect(Array.from(d.pieces[0]!.connectivity)).toEqual([0, 1, 2, 3]);
    expect(d.fileCellTypes).toEqual({ 24: 1 });
    expect(d.warnings).toEqual(['1 quadratic tetra cell(s) (type 24) read by their corner nodes only; mid-side nodes are ignored, so curved edges become straight']);
  });

  it('reads all four polygonal-data sections in VTK’s order, with cell data in that order', async () => {
    const sec = (tag: string, conn: number[], ends: number[]) => ({ tag, arrays: [{ name: 'connectivity', type: 'Int32', values: conn }, { name: 'offsets', type: 'Int32', values: ends }] });
    const piece: PieceSpec = {
      attrs: { NumberOfPoints: 5, NumberOfVerts: 1, NumberOfLines: 1, NumberOfStrips: 1, NumberOfPolys: 2 },
      sections: [
        { tag: 'Points', arrays: [{ type: 'Float32', components: 3, values: [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 2, 2, 0] }] },
        { tag: 'CellData', attrs: { Scalars: 'id' }, arrays: [{ name: 'id', type: 'Int32', values: [10, 11, 12, 13, 14] }] },
        sec('Strips', [0, 1, 3, 2], [4]),
        sec('Polys', [0, 1, 2, 3, 1, 4, 2], [4, 7]),
        sec('Lines', [0, 4], [2]),
        sec('Verts', [4], [1]),
      ],
    };
    for (const encoding of ['ascii', 'appended-base64'] as const) {
      const d = await readVtkXml('all.vtp', fileOf({ encoding }, piece, 'PolyData'));
      const p = d.pieces[0]!;
      expect(d.kind).toBe('polydata');
      expect(Array.from(p.cellTypes)).toEqual([1, 3, 9, 5, 6]);
      expect(Array.from(p.offsets)).toEqual([0, 1, 3, 7, 10, 14]);
      expect(Array.from(p.connectivity)).toEqual([4, 0, 4, 0, 1, 2, 3, 1, 4, 2, 0, 1, 3, 2]);
      expect(Array.from(p.cellData[0]!.values)).toEqual([10, 11, 12, 13, 14]);
    }
  });
});

describe('refusals', () => {
  it('refuses LZ4 and unknown compressors, naming file, array and compressor', async () => {
    const bytes = fileOf({ encoding: 'binary', compressor: 'vtkLZ4DataCompressor' });
    await expect(readVtkXml('lz4.vtu', bytes)).rejects.toThrow('lz4.vtu: piece 0: DataArray (Points): compressor "vtkLZ4DataCompressor" is not supported; fieldtally reads only zlib-compressed (vtkZLibDataCompressor) or uncompressed binary data');
  });

  it('ignores the compressor for ASCII arrays', async () => {
    expectTetPyramid(await readVtkXml('a.vtu', fileOf({ encoding: 'ascii', compressor: 'vtkLZMADataCompressor' })));
  });

  it('refuses structured and other dataset types clearly', async () => {
    for (const t of ['ImageData', 'RectilinearGrid', 'StructuredGrid', 'PImageData', 'PStructuredGrid', 'PRectilinearGrid']) {
      const bytes = new TextEncoder().encode(`<VTKFile type="${t}" version="1.0"><${t} WholeExtent="0 1 0 1 0 1"></${t}></VTKFile>`);
      await expect(readVtkXml('s.vti', bytes)).rejects.toThrow(`s.vti: VTK XML "${t}" (a structured grid type) is not supported; fieldtally reads UnstructuredGrid (.vtu) and PolyData (.vtp) files and their sets (.pvtu, .pvtp, .vtm)`);
    }
    const table = new TextEncoder().encode('<VTKFile type="Table" version="1.0"><Table/></VTKFile>');
    await expect(readVtkXml('t.vtt', table)).rejects.toThrow('t.vtt: VTK XML type "Table" is not supported');
  });
});

describe('progress and cancellation', () => {
  /** A zlib file of 20 000 points in 4 KB blocks: about 120 blocks, each a checkpoint. */
  function blockyFile(): Uint8Array {
    const n = 20_000;
    const pts = Array.from({ length: 3 * n }, (_, i) => Math.sin(i));
    return buildXml('UnstructuredGrid', [{ attrs: { NumberOfPoints: n, NumberOfCells: 0 }, sections: [{ tag: 'Points', arrays: [{ type: 'Float64', components: 3, values: pts }] }] }], { encoding: 'appended-raw', zlibBlockSize: 4096 });
  }

  it('reports progress per block and stops with an AbortError when cancelled', async () => {
    // A clock that advances 20 ms per reading makes the 50 ms checkpoint interval elapse deterministically.
    let now = 0;
    const clock = vi.spyOn(performance, 'now').mockImplementation(() => (now += 20));
    try {
      const bytes = blockyFile();
      const seen: number[] = [];
      const d = await readVtkXml('blocky.vtu', bytes, { onProgress: (p) => { seen.push(p.bytesDone); expect(p.bytesTotal).toBe(bytes.length); } });
      expect(d.pieces[0]!.points.length).toBe(60_000);
      expect(seen.length).toBeGreaterThan(20);
      expect(seen.every((b, i) => i === 0 || b >= seen[i - 1]!), String(seen)).toBe(true);
      const ctl = new AbortController();
      let calls = 0;
      const err = await readVtkXml('blocky.vtu', bytes, { signal: ctl.signal, onProgress: () => { if (++calls === 3) ctl.abort(); } }).then(() => undefined, (e: Error) => e);
      expect(calls).toBe(3);
      expect(err?.name).toBe('AbortError');
      expect(err?.message).toBe('blocky.vtu: loading cancelled');
    } finally {
      clock.mockRestore();
    }
  });
});
