/**
 * The legacy .vtk reader against VTK 9.1 itself, on real files and on files written by VTK's own legacy
 * writers. Reference: tests/reference/legacy_probe.py → tests/reference/expected/legacy/*.json, produced
 * with Debian's python3-vtk9 (vtkGenericDataObjectReader with every ReadAll… switch on). The fixtures
 * in expected/legacy/fixtures/ were written by vtkUnstructuredGridWriter / vtkPolyDataWriter (file
 * versions 4.2 and 5.1, ASCII and BINARY) in the same script.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { basename, join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readLegacyVtk } from '../../src/io/vtkLegacy.ts';
import { HIGHER_ORDER_TO_LINEAR } from '../../src/model/cellTypes.ts';
import type { Dataset, FieldStrings } from '../../src/model/dataset.ts';
import { componentRange, fieldRange, tupleCount, type FieldArray } from '../../src/model/fieldArray.ts';
import { cellCount, pointCount } from '../../src/model/piece.ts';

const EXTERNAL = resolve(__dirname, '../fixtures/external');
const EXPECTED = resolve(__dirname, '../reference/expected/legacy');

interface VtkArray {
  name: string; components: number; tuples: number; class: string;
  componentRanges?: [number, number][]; range?: [number, number]; sum?: number;
}
interface VtkReport {
  file: string; dataset: string; points: number; cells: number; cellTypes: Record<string, number>;
  pointSum: number; bounds: number[] | null; firstCell: number[] | null; lastCell: number[] | null;
  cornerIdSum: number; polyhedronFaces: number;
  pointData: VtkArray[]; cellData: VtkArray[]; fieldData: VtkArray[];
}

/** The element type our reader reports for each VTK array class (vtkIdType is 32-bit in legacy files). */
const SOURCE_TYPE: Record<string, string> = {
  vtkFloatArray: 'Float32', vtkDoubleArray: 'Float64', vtkIntArray: 'Int32', vtkIdTypeArray: 'Int32',
  vtkUnsignedCharArray: 'UInt8', vtkCharArray: 'Int8', vtkSignedCharArray: 'Int8', vtkShortArray: 'Int16',
  vtkUnsignedShortArray: 'UInt16', vtkUnsignedIntArray: 'UInt32', vtkLongArray: 'Int64', vtkTypeInt64Array: 'Int64',
  vtkLongLongArray: 'Int64', vtkUnsignedLongArray: 'UInt64', vtkTypeUInt64Array: 'UInt64',
};

const near = (a: number, b: number, rel = 1e-12) => Math.abs(a - b) <= rel * Math.max(1, Math.abs(a), Math.abs(b));

function expectNear(ours: number, vtk: number, what: string, rel = 1e-12): void {
  expect(near(ours, vtk, rel), `${what}: ours ${ours}, VTK ${vtk}`).toBe(true);
}

/** A cell's nodes as our model keeps them: corners of higher-order cells, distinct sorted ids of polyhedra. */
function modelNodes(type: number, vtkIds: number[]): number[] {
  if (type === 42) return [...new Set(vtkIds)].sort((a, b) => a - b);
  const lin = HIGHER_ORDER_TO_LINEAR[type];
  return lin ? vtkIds.slice(0, lin[1]) : vtkIds;
}

/** `strings`: the dataset's field-data string arrays (dataset-level string arrays are read, others skipped). */
function compareArrays(ours: readonly FieldArray[], vtk: VtkArray[], what: string, warnings: readonly string[], strings?: readonly FieldStrings[]): void {
  const numeric = vtk.filter((a) => a.class !== 'vtkStringArray');
  expect(ours.map((a) => a.name), `${what} names`).toEqual(numeric.map((a) => a.name));
  if (strings) expect(strings.map((a) => [a.name, a.values.length]), `${what} string arrays`).toEqual(vtk.filter((a) => a.class === 'vtkStringArray').map((a) => [a.name, a.tuples]));
  for (const v of vtk) {
    if (v.class === 'vtkStringArray' && strings) continue;
    if (v.class === 'vtkStringArray') {
      expect(warnings.some((w) => w.includes(`"${v.name}"`) && w.includes('string array skipped')), `${what} string array "${v.name}" skipped with a warning`).toBe(true);
      continue;
    }
    const a = ours.find((f) => f.name === v.name)!;
    const label = `${what} "${v.name}"`;
    expect(a.components, `${label} components`).toBe(v.components);
    expect(tupleCount(a), `${label} tuples`).toBe(v.tuples);
    expect(a.sourceType, `${label} type`).toBe(SOURCE_TYPE[v.class]);
    if (!v.range) continue;
    const [lo, hi] = fieldRange(a);
    expectNear(lo, v.range[0], `${label} range min`);
    expectNear(hi, v.range[1], `${label} range max`);
    v.componentRanges!.forEach(([clo, chi], c) => {
      const [olo, ohi] = componentRange(a, c);
      expect([olo, ohi], `${label} component ${c} range`).toEqual([clo, chi]);
    });
    let sum = 0;
    for (let i = 0; i < a.values.length; i++) sum += a.values[i]!;
    expectNear(sum, v.sum!, `${label} sum of values`);
  }
}

function compareWithVtk(d: Dataset, vtk: VtkReport): void {
  expect(d.kind).toBe(vtk.dataset === 'vtkPolyData' ? 'polydata' : 'unstructured');
  expect(d.pieces.length).toBe(1);
  const p = d.pieces[0]!;
  expect(pointCount(p), 'points').toBe(vtk.points);
  expect(cellCount(p), 'cells').toBe(vtk.cells);
  expect(Object.fromEntries(Object.entries(d.fileCellTypes).map(([t, n]) => [t, n])), 'cell types as declared').toEqual(vtk.cellTypes);

  let pointSum = 0;
  for (let i = 0; i < p.points.length; i++) pointSum += p.points[i]!;
  expectNear(pointSum, vtk.pointSum, 'sum of coordinates');
  if (vtk.bounds) {
    for (let k = 0; k < 3; k++) {
      let lo = Infinity, hi = -Infinity;
      for (let i = k; i < p.points.length; i += 3) { lo = Math.min(lo, p.points[i]!); hi = Math.max(hi, p.points[i]!); }
      expect([lo, hi], `bounds axis ${k}`).toEqual([vtk.bounds[2 * k], vtk.bounds[2 * k + 1]]);
    }
  }

  const fileTypes = Object.entries(vtk.cellTypes).map(([t]) => Number(t));
  const lastType = (ids: number[]) => fileTypes.find((t) => modelNodes(t, ids).length === cellSizeOf(p, cellCount(p) - 1)) ?? 0;
  if (vtk.firstCell) {
    const first = Array.from(p.connectivity.subarray(p.offsets[0]!, p.offsets[1]!));
    const t0 = fileTypes.find((t) => arraysEqual(modelNodes(t, vtk.firstCell!), first));
    expect(t0, `first cell ${first} vs VTK ${vtk.firstCell}`).toBeDefined();
    const n = cellCount(p);
    const last = Array.from(p.connectivity.subarray(p.offsets[n - 1]!, p.offsets[n]!));
    expect(last, 'last cell').toEqual(modelNodes(lastType(vtk.lastCell!), vtk.lastCell!));
  }
  let idSum = 0;
  for (let i = 0; i < p.connectivity.length; i++) idSum += p.connectivity[i]!;
  expect(idSum, 'sum of cell node ids (corners of higher-order cells)').toBe(vtk.cornerIdSum);
  const faces = p.polyFaces ? p.polyFaces.faceOffsets.length - 1 : 0;
  expect(faces, 'polyhedron faces').toBe(vtk.polyhedronFaces);

  compareArrays(p.pointData, vtk.pointData, 'point data', d.warnings);
  compareArrays(p.cellData, vtk.cellData, 'cell data', d.warnings);
  compareArrays(d.fieldData, vtk.fieldData, 'field data', d.warnings, d.fieldStrings ?? []);
}

const cellSizeOf = (p: Dataset['pieces'][number], c: number) => p.offsets[c + 1]! - p.offsets[c]!;
const arraysEqual = (a: number[], b: number[]) => a.length === b.length && a.every((x, i) => x === b[i]);

const reports = readdirSync(EXPECTED).filter((f) => f.endsWith('.json')).map((f) => JSON.parse(readFileSync(join(EXPECTED, f), 'utf8')) as VtkReport);
const external = reports.filter((r) => !r.file.startsWith('fixtures/'));
const fixtures = reports.filter((r) => r.file.startsWith('fixtures/'));

async function load(path: string): Promise<Dataset> {
  return readLegacyVtk(basename(path), new Uint8Array(readFileSync(path)));
}

describe('external legacy files against VTK 9.1', () => {
  it('covers the eight legacy files of tests/fixtures/external (SOURCES.md)', () => {
    expect(external.map((r) => r.file).sort()).toEqual([
      'vtk-data/AngularSector.vtk', 'vtk-data/Quadratic/CylinderLinear.vtk', 'vtk-data/Quadratic/CylinderQuadratic.vtk',
      'vtk-data/VTKCellTypes.vtk', 'vtk-data/opal_mound_fault.vtk', 'vtk-data/post.vtk',
      'vtkio/pygmsh/ascii.vtk', 'vtkio/triangle_vtkidtype.vtk',
    ]);
  });
  for (const vtk of external) {
    it(`${vtk.file}: counts, cell types, ids, arrays and ranges equal VTK's`, async () => {
      compareWithVtk(await load(join(EXTERNAL, vtk.file)), vtk);
    });
  }
});

describe('files written by VTK\'s legacy writers (4.2 / 5.1, ASCII / BINARY) against VTK 9.1', () => {
  it('has the twelve fixtures', () => expect(fixtures.length).toBe(12));
  for (const vtk of fixtures) {
    it(`${vtk.file}: equals VTK's reading`, async () => {
      compareWithVtk(await load(join(EXPECTED, vtk.file)), vtk);
    });
  }
});

describe('details of the external files (SOURCES.md, checked against VTK above)', () => {
  it('post.vtk: dataset FIELD before POINTS becomes field data Properties = (1, 1, 1000, 46)', async () => {
    // Reference: SOURCES.md (post.vtk row) and expected/legacy/vtk-data__post.vtk.json (sum 1048).
    const d = await load(join(EXTERNAL, 'vtk-data/post.vtk'));
    expect(d.fieldData.map((f) => [f.name, f.association, f.components, Array.from(f.values)])).toEqual([['Properties', 'dataset', 1, [1, 1, 1000, 46]]]);
  });

  it('CylinderQuadratic.vtk: 1522 quadratic tetra read by their 4 corners, with a warning, same-named point and cell arrays kept apart', async () => {
    // Reference: SOURCES.md (CylinderQuadratic row); VTK 9.1 reports cell type 24 for every cell.
    const d = await load(join(EXTERNAL, 'vtk-data/Quadratic/CylinderQuadratic.vtk'));
    const p = d.pieces[0]!;
    expect(d.fileCellTypes).toEqual({ 24: 1522 });
    expect(new Set(p.cellTypes)).toEqual(new Set([10]));
    expect(p.connectivity.length).toBe(4 * 1522);
    expect(d.warnings.some((w) => w.includes('1522 quadratic tetra') && w.includes('corner nodes'))).toBe(true);
    expect(p.pointData.find((f) => f.name === 'pressure')!.association).toBe('point');
    expect(p.cellData.find((f) => f.name === 'pressure')!.association).toBe('cell');
  });

  it('triangle_vtkidtype.vtk: 64-bit OFFSETS/CONNECTIVITY next to 32-bit vtkIdType field arrays', async () => {
    // Reference: SOURCES.md (triangle_vtkidtype row) and its VTK 9.1 JSON: point ids 95364 … 95691, cell id 186229.
    const d = await load(join(EXTERNAL, 'vtkio/triangle_vtkidtype.vtk'));
    const p = d.pieces[0]!;
    expect(Array.from(p.connectivity)).toEqual([1, 2, 0]); // VTK: firstCell [1, 2, 0]
    expect(Array.from(p.cellData[0]!.values)).toEqual([186229]);
    expect(Math.min(...p.pointData[0]!.values)).toBe(95364);
  });

  it('pygmsh/ascii.vtk: CELLS 39 94 counts offsets, giving 38 cells', async () => {
    // Reference: SOURCES.md (pygmsh/ascii.vtk row): 4 vertex, 12 line, 22 triangle.
    const d = await load(join(EXTERNAL, 'vtkio/pygmsh/ascii.vtk'));
    expect(d.pieces[0]!.cellTypes.length).toBe(38);
    expect(d.fileCellTypes).toEqual({ 1: 4, 3: 12, 5: 22 });
  });

  it('VTKCellTypes.vtk: the inline LOOKUP_TABLE CellColors 11 is skipped, the cell scalars are 0..10', async () => {
    // Reference: SOURCES.md (VTKCellTypes row); values read off the file text.
    const d = await load(join(EXTERNAL, 'vtk-data/VTKCellTypes.vtk'));
    expect(Array.from(d.pieces[0]!.cellData[0]!.values)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    expect(d.pieces[0]!.pointData.map((f) => [f.name, f.role])).toEqual([['scalars', 'scalars'], ['vectors', 'vectors']]);
  });
});
