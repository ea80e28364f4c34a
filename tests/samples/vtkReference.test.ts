/**
 * The committed sample files as VTK reads them. Reference: VTK 9.1 (Debian python3-vtk9) via
 * tests/reference/sample_fields.py → tests/reference/expected/samples/sample-fields.json: counts, cell
 * types, total volume and area (vtkCellSizeFilter), array types, ranges and component sums. Here the
 * same figures come from our reader and src/samples/cellMeasures.ts.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readDataset } from '../../src/io/readDataset.ts';
import { fieldRange, type FieldArray } from '../../src/model/fieldArray.ts';
import { findField, type Piece } from '../../src/model/piece.ts';
import { cellVolumes } from '../../src/samples/cellMeasures.ts';

interface VtkArray { name: string; components: number; type: string; range: [number, number]; sums: number[] }
interface VtkFile {
  points: number; cells: number; cellTypes: Record<string, number>; volume: number; area: number;
  pointData: VtkArray[]; cellData: VtkArray[]; areaByGroup?: Record<string, number>;
}

const EXPECTED = JSON.parse(readFileSync(resolve(__dirname, '../reference/expected/samples/sample-fields.json'), 'utf8')) as Record<string, VtkFile>;
const VTK_TYPE: Record<string, string> = { double: 'Float64', float: 'Float32', int: 'Int32' };

/** Triangle areas (m²) of a piece, 0 for other cells. */
function triangleAreas(p: Piece): Float64Array {
  const out = new Float64Array(p.cellTypes.length), P = p.points;
  for (let c = 0; c < p.cellTypes.length; c++) {
    if (p.cellTypes[c] !== 5) continue;
    const o = p.offsets[c]!, [a, b, d] = [0, 1, 2].map((k) => 3 * p.connectivity[o + k]!) as [number, number, number];
    const u = [P[b]! - P[a]!, P[b + 1]! - P[a + 1]!, P[b + 2]! - P[a + 2]!], v = [P[d]! - P[a]!, P[d + 1]! - P[a + 1]!, P[d + 2]! - P[a + 2]!];
    out[c] = Math.hypot(u[1]! * v[2]! - u[2]! * v[1]!, u[2]! * v[0]! - u[0]! * v[2]!, u[0]! * v[1]! - u[1]! * v[0]!) / 2;
  }
  return out;
}

function expectArray(f: FieldArray | undefined, ref: VtkArray, where: string): void {
  expect(f, `${where}: array ${ref.name}`).toBeDefined();
  expect(f!.components, where).toBe(ref.components);
  expect(f!.sourceType, where).toBe(VTK_TYPE[ref.type]);
  const [lo, hi] = fieldRange(f!);
  const scale = Math.max(Math.abs(ref.range[0]), Math.abs(ref.range[1]), 1e-300);
  expect(Math.abs(lo - ref.range[0]) / scale, `${where} ${ref.name} min`).toBeLessThan(1e-14);
  expect(Math.abs(hi - ref.range[1]) / scale, `${where} ${ref.name} max`).toBeLessThan(1e-14);
  const n = f!.values.length / f!.components;
  for (let c = 0; c < f!.components; c++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += f!.values[i * f!.components + c]!;
    // Summation order may differ: allow rounding of n terms of the array's scale.
    expect(Math.abs(s - ref.sums[c]!), `${where} ${ref.name} sum ${c}`).toBeLessThanOrEqual(1e-14 * scale * n + 1e-12 * Math.abs(ref.sums[c]!));
  }
}

describe('committed sample files agree with VTK 9.1', () => {
  for (const [name, ref] of Object.entries(EXPECTED)) {
    it(name, async () => {
      const d = await readDataset(name, new Uint8Array(readFileSync(resolve(__dirname, '../../sample-fields', name))));
      const p = d.pieces[0]!;
      expect(d.pieces.length).toBe(1);
      expect(p.points.length / 3).toBe(ref.points);
      expect(p.cellTypes.length).toBe(ref.cells);
      expect(Object.fromEntries(Object.entries(d.fileCellTypes).map(([t, k]) => [t, k]))).toEqual(ref.cellTypes);
      const volume = cellVolumes(p).reduce((s, v) => s + v, 0);
      expect(volume / ref.volume).toBeCloseTo(1, 12);
      const areas = triangleAreas(p);
      const area = areas.reduce((s, v) => s + v, 0);
      expect(area).toBeCloseTo(ref.area, 15);
      if (ref.areaByGroup) {
        const group = findField(p, 'group', 'cell')!.values;
        const by: Record<string, number> = {};
        areas.forEach((a, c) => { if (a > 0) by[String(group[c])] = (by[String(group[c])] ?? 0) + a; });
        for (const [g, a] of Object.entries(ref.areaByGroup)) expect(by[g]! / a).toBeCloseTo(1, 12);
      }
      for (const a of ref.pointData) expectArray(findField(p, a.name, 'point'), a, `${name} point data`);
      for (const a of ref.cellData) expectArray(findField(p, a.name, 'cell'), a, `${name} cell data`);
      expect(p.pointData.length + p.cellData.length).toBe(ref.pointData.length + ref.cellData.length);
    });
  }
});
