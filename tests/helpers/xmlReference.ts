/**
 * Comparison of what fieldtally read with what VTK 9.1 read from the same file, as recorded by
 * tests/reference/xml_probe.py in tests/reference/expected/xml/*.json.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { expect } from 'vitest';
import type { FieldArray } from '../../src/model/fieldArray.ts';
import { componentRange, fieldRange } from '../../src/model/fieldArray.ts';
import type { Piece } from '../../src/model/piece.ts';

export interface VtkArrayRef {
  name: string; components: number; tuples: number; class: string;
  componentRanges?: [number, number][]; range?: [number, number] | null; sum?: number; values?: number[];
}

export interface VtkLeafRef {
  points: number; cells: number; cellTypes: Record<string, number>; bounds: number[] | null;
  pointSum: number; connSum: number;
  pointData: VtkArrayRef[]; cellData: VtkArrayRef[]; fieldData: VtkArrayRef[];
  coords?: number[]; cellPoints?: number[][]; types?: number[]; faces?: (number[][] | null)[];
}

export interface VtkFileRef { file: string; vtkVersion: string; leaves: VtkLeafRef[] }

/** The probe's record for an external file (path relative to the external folder). */
export function vtkReference(rel: string): VtkFileRef {
  const p = resolve(__dirname, '../reference/expected/xml', `${rel.replace(/\//g, '__')}.json`);
  return JSON.parse(readFileSync(p, 'utf8')) as VtkFileRef;
}

const close = (a: number, b: number, tol = 1e-12) => Math.abs(a - b) <= tol * Math.max(1, Math.abs(a), Math.abs(b));

/** Concatenation of a field over pieces (VTK appends pieces of one file into one dataset). */
function joined(pieces: readonly Piece[], assoc: 'point' | 'cell', name: string): FieldArray {
  const parts = pieces.map((p) => (assoc === 'point' ? p.pointData : p.cellData).find((f) => f.name === name)!);
  expect(parts.every((f) => f !== undefined), `${assoc} array "${name}" in every piece`).toBe(true);
  const n = parts.reduce((s, f) => s + f.values.length, 0);
  const values = new Float64Array(n);
  let o = 0;
  for (const f of parts) { values.set(f.values, o); o += f.values.length; }
  return { ...parts[0]!, values };
}

function sameArrays(pieces: readonly Piece[], assoc: 'point' | 'cell', refs: VtkArrayRef[]): void {
  const ours = (assoc === 'point' ? pieces[0]!.pointData : pieces[0]!.cellData).map((f) => f.name);
  expect(ours, `${assoc} array names`).toEqual(refs.map((r) => r.name));
  for (const r of refs) {
    const f = joined(pieces, assoc, r.name);
    const what = `${assoc} array "${r.name}"`;
    expect(f.components, `${what} components`).toBe(r.components);
    expect(f.values.length / f.components, `${what} tuples`).toBe(r.tuples);
    if (r.range) {
      const [lo, hi] = fieldRange(f);
      expect(close(lo, r.range[0]) && close(hi, r.range[1]), `${what} range ${lo}..${hi} vs VTK ${r.range}`).toBe(true);
      r.componentRanges!.forEach(([a, b], c) => {
        const [x, y] = componentRange(f, c);
        expect(x === a && y === b, `${what} component ${c} range ${x}..${y} vs VTK ${a}..${b}`).toBe(true);
      });
    }
    if (r.sum !== undefined) {
      let s = 0;
      for (let i = 0; i < f.values.length; i++) s += f.values[i]!;
      expect(close(s, r.sum, 1e-11), `${what} sum ${s} vs VTK ${r.sum}`).toBe(true);
    }
    if (r.values) expect(Array.from(f.values), `${what} values`).toEqual(r.values);
  }
}

/**
 * Asserts that `pieces` (read by fieldtally from one file, or the pieces of one set) hold what VTK read
 * as one leaf: counts, cell types, bounds, coordinate and connectivity sums, arrays; and for small
 * leaves every coordinate, cell, polyhedron face and value. Point ids of later pieces are offset by the
 * points of earlier ones, as VTK appends pieces.
 */
export function expectMatchesVtk(pieces: readonly Piece[], fileCellTypes: Readonly<Record<number, number>>, fieldData: readonly FieldArray[], ref: VtkLeafRef): void {
  const nPts = pieces.reduce((s, p) => s + p.points.length / 3, 0);
  const nCells = pieces.reduce((s, p) => s + p.cellTypes.length, 0);
  expect(nPts, 'points').toBe(ref.points);
  expect(nCells, 'cells').toBe(ref.cells);
  const types: Record<string, number> = {};
  for (const [t, n] of Object.entries(fileCellTypes)) if (n > 0) types[t] = n;
  expect(types, 'cell types').toEqual(ref.cellTypes);
  const coords: number[] = [], cellPoints: number[][] = [], cellTypes: number[] = [], faces: (number[][] | null)[] = [];
  let base = 0, pointSum = 0, connSum = 0;
  for (const p of pieces) {
    for (let i = 0; i < p.points.length; i++) { coords.push(p.points[i]!); pointSum += p.points[i]!; }
    for (let c = 0; c < p.cellTypes.length; c++) {
      const ids = Array.from(p.connectivity.subarray(p.offsets[c]!, p.offsets[c + 1]!), (id) => id + base);
      connSum += ids.reduce((s, x) => s + x, 0);
      cellPoints.push(ids);
      cellTypes.push(p.cellTypes[c]!);
      const pf = p.polyFaces;
      if (pf && pf.cellFaceStart[c + 1]! > pf.cellFaceStart[c]!) {
        const list: number[][] = [];
        for (let f = pf.cellFaceStart[c]!; f < pf.cellFaceStart[c + 1]!; f++) {
          list.push(Array.from(pf.faceConnectivity.subarray(pf.faceOffsets[f]!, pf.faceOffsets[f + 1]!), (id) => id + base));
        }
        faces.push(list);
      } else {
        faces.push(null);
      }
    }
    base += p.points.length / 3;
  }
  expect(close(pointSum, ref.pointSum, 1e-11), `coordinate sum ${pointSum} vs VTK ${ref.pointSum}`).toBe(true);
  expect(connSum, 'sum of cell point ids').toBe(ref.connSum);
  if (ref.bounds) {
    for (let k = 0; k < 3; k++) {
      let lo = Infinity, hi = -Infinity;
      for (let i = k; i < coords.length; i += 3) { lo = Math.min(lo, coords[i]!); hi = Math.max(hi, coords[i]!); }
      expect([lo, hi], `bounds axis ${k}`).toEqual([ref.bounds[2 * k], ref.bounds[2 * k + 1]]);
    }
  }
  if (ref.coords) {
    expect(coords, 'coordinates').toEqual(ref.coords);
    expect(cellPoints, 'cell point ids').toEqual(ref.cellPoints);
    expect(cellTypes, 'cell types per cell').toEqual(ref.types);
    expect(faces, 'polyhedron faces').toEqual(ref.faces);
  }
  if (pieces.length > 0) {
    sameArrays(pieces, 'point', ref.pointData);
    sameArrays(pieces, 'cell', ref.cellData);
  }
  expect(fieldData.map((f) => f.name), 'field data names').toEqual(ref.fieldData.map((r) => r.name));
}
