/**
 * The writers (src/io/writeVtu.ts, src/io/writeLegacy.ts): every encoding read back with `readDataset`
 * gives identical arrays; the block layout follows VTK's XML file-format description (header of byte
 * counts; compressed: [blocks, block size, last partial size (0 when full), compressed sizes…]).
 * Reference for base64: Node's Buffer encoder. That VTK 9.1 reads the committed files identically is
 * checked in vtkReference.test.ts.
 */
import { unzlibSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { formatFloat32, formatFloat64 } from '../../src/io/asciiFormat.ts';
import { base64Encode } from '../../src/io/base64Encode.ts';
import { readDataset } from '../../src/io/readDataset.ts';
import { writeLegacyVtk } from '../../src/io/writeLegacy.ts';
import { writeVtu, type VtuEncoding } from '../../src/io/writeVtu.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import type { FieldArray, NumericArray } from '../../src/model/fieldArray.ts';
import { datasetOf, field, pieceFromCells } from '../../src/model/meshBuild.ts';
import { pipeCase } from '../../src/samples/pipe.ts';
import { sphereCase } from '../../src/samples/sphere.ts';

const ENCODINGS: VtuEncoding[] = ['ascii', 'base64', 'appended-raw', 'appended-base64', 'zlib', 'zlib-base64'];

const typed = (name: string, values: NumericArray, components = 1, association: 'point' | 'cell' = 'point'): FieldArray =>
  ({ name, association, components, values, sourceType: values.constructor.name.replace('Array', '').replace('Uint', 'UInt') });

/** Every cell kind the model knows (a polyhedral cube among them) with arrays of every element type and awkward values. */
function mixedDataset(): Dataset {
  const pts = [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0, 0, 1, 1, 0, 1, 1, 1, 1, 0, 1, 1, 2, 0, 0, 2, 1, 0, 1.5, 0.5, 1];
  const cube = [[0, 3, 2, 1], [4, 5, 6, 7], [0, 1, 5, 4], [1, 2, 6, 5], [2, 3, 7, 6], [3, 0, 4, 7]];
  const types = [42, 10, 14, 13, 12, 5, 9, 3, 1, 7];
  const nodes = [[0, 1, 2, 3, 4, 5, 6, 7], [1, 8, 2, 5], [1, 8, 9, 2, 10], [1, 8, 5, 2, 9, 6], [0, 1, 2, 3, 4, 5, 6, 7], [0, 1, 4], [0, 1, 2, 3], [9, 10], [10], [0, 1, 8, 9, 2]];
  const n = 11, c = types.length;
  const f64 = new Float64Array(n * 3).map((_, i) => (i - 7) * 0.1);
  f64[0] = -0; f64[1] = 1e-310; f64[2] = 1.7976931348623157e308; f64[3] = -5e-324; f64[4] = 1 / 3; f64[5] = 123456789.123456789;
  const f32 = new Float32Array(n).map((_, i) => Math.fround((i - 3) / 7));
  f32[0] = -0; f32[1] = Math.fround(1e-40); f32[2] = 3.4028234663852886e38;
  const pointData = [
    typed('velocity', f64, 3), typed('p 32', f32), typed('i8', Int8Array.from({ length: n }, (_, i) => i * 23 - 128)),
    typed('u8', Uint8Array.from({ length: n }, (_, i) => 255 - i)), typed('i16', Int16Array.from({ length: n }, (_, i) => -32768 + i * 5000)),
    typed('u16', Uint16Array.from({ length: n }, (_, i) => 65535 - i * 999)), typed('i32', Int32Array.from({ length: n }, (_, i) => (i % 2 ? -2147483648 : 2147483647) - i)),
    typed('u32 & <"odd">', Uint32Array.from({ length: n }, (_, i) => 4294967295 - i)), typed('tensor', new Float64Array(9 * n).map((_, i) => Math.sin(i)), 9),
  ];
  const cellData = [typed('group', Int32Array.from({ length: c }, (_, i) => i - 4), 1, 'cell'), typed('flux', new Float32Array(2 * c).map((_, i) => i / 3), 2, 'cell')];
  const piece = pieceFromCells(pts, { types, nodes, polyFaces: types.map((t) => (t === 42 ? cube : undefined)) }, { pointData, cellData });
  return { ...datasetOf([piece], 'mixed'), fieldData: [{ ...typed('TimeValue', Float64Array.of(12.5)), association: 'dataset' }, { ...typed('steps', Int32Array.of(3, -4), 2), association: 'dataset' }] };
}

function expectSameFields(got: readonly FieldArray[], want: readonly FieldArray[], where: string): void {
  expect(got.map((f) => f.name), where).toEqual(want.map((f) => f.name));
  for (const w of want) {
    const g = got.find((f) => f.name === w.name)!;
    expect(g.components, `${where} ${w.name}`).toBe(w.components);
    expect(g.values.constructor.name, `${where} ${w.name}`).toBe(w.values.constructor.name);
    expect(Array.from(g.values), `${where} ${w.name}`).toEqual(Array.from(w.values));
  }
}

/** The dataset read back equals the one written: geometry, cells, polyhedron faces, every array value (−0 included). */
function expectSameDataset(got: Dataset, want: Dataset, where: string, fieldOrder = true): void {
  expect(got.pieces.length, where).toBe(want.pieces.length);
  want.pieces.forEach((w, k) => {
    const g = got.pieces[k]!;
    expect(Array.from(g.points), where).toEqual(Array.from(w.points));
    expect(Array.from(g.cellTypes), where).toEqual(Array.from(w.cellTypes));
    expect(Array.from(g.offsets), where).toEqual(Array.from(w.offsets));
    expect(Array.from(g.connectivity), where).toEqual(Array.from(w.connectivity));
    if (w.polyFaces) {
      expect(Array.from(g.polyFaces!.cellFaceStart), where).toEqual(Array.from(w.polyFaces.cellFaceStart));
      expect(Array.from(g.polyFaces!.faceOffsets), where).toEqual(Array.from(w.polyFaces.faceOffsets));
      expect(Array.from(g.polyFaces!.faceConnectivity), where).toEqual(Array.from(w.polyFaces.faceConnectivity));
    }
    const order = (l: readonly FieldArray[]) => (fieldOrder ? l : [...l].sort((a, b) => a.name.localeCompare(b.name)));
    expectSameFields(order(g.pointData), order(w.pointData), `${where} point data`);
    expectSameFields(order(g.cellData), order(w.cellData), `${where} cell data`);
  });
  expectSameFields(got.fieldData, want.fieldData, `${where} field data`);
}

const SAMPLES: [string, () => Dataset][] = [
  ['mixed cells and types', mixedDataset],
  ['pipe, 2 pieces, hex + wedge, cell data', () => pipeCase({ nTheta: 8, nRadial: 2, nAxial: 3, core: 'wedge', pieces: 2, association: 'cell' })],
  ['sphere, tetra + triangles, Float32 + Int32', () => sphereCase({ refinement: 0, precision: 'Float32' })],
  ['points without cells (empty cell arrays)', () => datasetOf([pieceFromCells([0, 0, 0, 1, 1, 1], { types: [], nodes: [] })])],
];

describe('writeVtu → readDataset round trip', () => {
  for (const [label, make] of SAMPLES) {
    const d = make();
    for (const encoding of ENCODINGS) {
      it(`${label}: ${encoding}, every header and id type`, async () => {
        for (const headerType of ['UInt32', 'UInt64'] as const) for (const idType of ['Int32', 'Int64'] as const) {
          // Block size 24 divides the point arrays exactly (last partial size 0); 1000 leaves a partial block.
          for (const blockSize of !encoding.startsWith('zlib') ? [32768] : label.startsWith('sphere') ? [1000] : [24, 1000]) {
            const bytes = writeVtu(d, { encoding, headerType, idType, blockSize });
            expectSameDataset(await readDataset('t.vtu', bytes), d, `${encoding}/${headerType}/${idType}/${blockSize}`);
          }
        }
      });
    }
  }
});

describe('writeLegacyVtk → readDataset round trip', () => {
  for (const [label, make] of SAMPLES) {
    const d = make();
    if (d.pieces.length !== 1) continue;
    it(`${label}: ASCII and binary, versions 4.2 and 5.1`, async () => {
      for (const binary of [true, false]) for (const version of ['4.2', '5.1'] as const) {
        const got = await readDataset('t.vtk', writeLegacyVtk(d, { binary, version }));
        // Legacy attribute sections are grouped (SCALARS, VECTORS, then FIELD), so compare by name.
        expectSameDataset(got, d, `${binary ? 'binary' : 'ascii'} ${version}`, false);
      }
    });
  }

  it('refuses a multi-piece dataset and a title that is not one line', () => {
    expect(() => writeLegacyVtk(SAMPLES[1]![1]())).toThrow(/2 pieces, a legacy file holds exactly 1/);
    expect(() => writeLegacyVtk(mixedDataset(), { title: 'a\nb' })).toThrow(/one line/);
  });
});

describe('writer block layout (VTK XML format description)', () => {
  const tiny = datasetOf([pieceFromCells([0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1], { types: [10], nodes: [[0, 1, 2, 3]] }, { pointData: [field('p', 'point', 1, Float64Array.of(1, 2, 3, 4))] })]);

  it('appended raw: offsets point at a byte-count header followed by the data', () => {
    const bytes = writeVtu(tiny, { encoding: 'appended-raw', headerType: 'UInt32' });
    const text = new TextDecoder('latin1').decode(bytes);
    const start = text.indexOf('_', text.indexOf('<AppendedData')) + 1;
    const offsets = [...text.matchAll(/offset="(\d+)"/g)].map((m) => Number(m[1]));
    const view = new DataView(bytes.buffer, bytes.byteOffset);
    // First array: p, 4 doubles.
    expect(view.getUint32(start + offsets[0]!, true)).toBe(32);
    expect(view.getFloat64(start + offsets[0]! + 4 + 24, true)).toBe(4);
    // Points follow p: 12 doubles.
    expect(offsets[1]).toBe(4 + 32);
    expect(view.getUint32(start + offsets[1]!, true)).toBe(96);
  });

  it('zlib: header [blocks, block size, last partial size, compressed sizes], blocks inflate to the data', () => {
    const bytes = writeVtu(tiny, { encoding: 'zlib', headerType: 'UInt64', blockSize: 16 });
    const text = new TextDecoder('latin1').decode(bytes);
    const start = text.indexOf('_', text.indexOf('<AppendedData')) + 1;
    const view = new DataView(bytes.buffer, bytes.byteOffset);
    const h = (k: number) => Number(view.getBigUint64(start + 8 * k, true));
    expect([h(0), h(1), h(2)]).toEqual([2, 16, 0]);
    const c0 = h(3), c1 = h(4);
    const b0 = unzlibSync(bytes.subarray(start + 40, start + 40 + c0)), b1 = unzlibSync(bytes.subarray(start + 40 + c0, start + 40 + c0 + c1));
    expect([b0.length, b1.length]).toEqual([16, 16]);
    expect(Array.from(new Float64Array(Uint8Array.from([...b0, ...b1]).buffer))).toEqual([1, 2, 3, 4]);
  });

  it('inline base64: header and data are separately padded runs, as VTK writes them', () => {
    const text = new TextDecoder().decode(writeVtu(tiny, { encoding: 'base64', headerType: 'UInt32' }));
    const run = /Name="p" format="binary">\s*(\S+)\s*</.exec(text)![1]!;
    expect(run.slice(0, 8)).toBe(Buffer.from(Uint32Array.of(32).buffer).toString('base64'));
    expect(Array.from(new Float64Array(Uint8Array.from(Buffer.from(run.slice(8), 'base64')).buffer))).toEqual([1, 2, 3, 4]);
  });

  it('ASCII text of numbers reads back to the same number (Float32 shortest of 7–9 digits, −0 kept)', () => {
    let s = 12345;
    const next = () => { s = (Math.imul(s, 1103515245) + 12345) >>> 0; return s; };
    const f32 = new Float32Array(1), u32 = new Uint32Array(f32.buffer);
    for (let i = 0; i < 20000; i++) {
      u32[0] = next();
      const x = f32[0]!;
      if (!Number.isFinite(x)) continue;
      const t = formatFloat32(x);
      expect(Math.fround(Number(t))).toBe(x);
      expect(t.length).toBeLessThanOrEqual(16);
      const d = x * 1.0000001 + 1e-300;
      expect(Number(formatFloat64(d))).toBe(d);
    }
    expect(formatFloat32(-0)).toBe('-0');
    expect(formatFloat64(-0)).toBe('-0');
    expect(formatFloat32(Math.fround(0.1))).toBe('0.1');
  });

  it('base64 encoding equals Node Buffer for every length 0–300', () => {
    const src = Uint8Array.from({ length: 300 }, (_, i) => (i * 97 + 13) & 255);
    for (let n = 0; n <= 300; n++) {
      expect(new TextDecoder().decode(base64Encode(src.subarray(0, n)))).toBe(Buffer.from(src.subarray(0, n)).toString('base64'));
    }
  });
});
