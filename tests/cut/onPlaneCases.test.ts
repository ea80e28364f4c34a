/**
 * Cells with nodes on the plane through the on-plane case tables (`onPlaneCases.ts`) against the general
 * polygon builder (`caseTables: false`), which they must reproduce bit for bit — triangles, provenance, fields,
 * counts and the in-plane face records the pool's merge reads (`planeFaceKeys`): every below/on/above pattern
 * of a single cell of each table type, lattices cut along node layers and obliquely through node rows, and
 * several pieces. Reference for the areas: elementary geometry (every axis section of the unit cube has area 1,
 * its end faces included, the rule of `cutPlane.ts`).
 */
import { describe, expect, it } from 'vitest';
import { TABLE_TYPES, SLOT_NODES } from '../../src/cut/caseTables.ts';
import { cutPlane, type PlaneCut } from '../../src/cut/cutPlane.ts';
import { onPlaneData, onPlaneStart, ON_PLANE_GENERAL } from '../../src/cut/onPlaneCases.ts';
import { CellType } from '../../src/model/cellTypes.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { datasetOf, field, hexGrid, pieceFromCells, pointFieldFrom, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { boxMesh, setArea, type V3 } from './meshes.ts';
import { expectSameCut } from './sameCut.ts';

/** Base (x, y) of each node of a cell of each table type; nodes of a top layer are drawn in a little. */
const BASE: Record<number, [number, number][]> = {
  [CellType.TETRA]: [[0, 0], [1, 0], [0, 1], [0.3, 0.3]],
  [CellType.VOXEL]: [[0, 0], [1, 0], [0, 1], [1, 1], [0.1, 0.1], [0.9, 0.1], [0.1, 0.9], [0.9, 0.9]],
  [CellType.HEXAHEDRON]: [[0, 0], [1, 0], [1, 1], [0, 1], [0.1, 0.1], [0.9, 0.1], [0.9, 0.9], [0.1, 0.9]],
  [CellType.WEDGE]: [[0, 0], [1, 0], [0, 1], [0.1, 0.1], [0.8, 0.1], [0.1, 0.8]],
  [CellType.PYRAMID]: [[0, 0], [1, 0], [1, 1], [0, 1], [0.5, 0.5]],
};

function withFlow(p: Piece): Piece {
  return withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 0.3 + x * y; o[1] = -0.2 * z + x; o[2] = 1 + x - y * y; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 3 - x + 2 * y * z; }),
  ], [field('rank', 'cell', 1, Float64Array.from({ length: p.cellTypes.length }, (_, c) => c % 7))]);
}

function expectSame(a: PlaneCut, b: PlaneCut, where: string): void {
  expectSameCut(a, b, where);
  expect(a.stats.boundaryFaces, where).toBe(b.stats.boundaryFaces);
  expect(a.planeFaces, where).toEqual(b.planeFaces);
}

/** Cuts both ways with the face keys kept; returns the table path's cut. */
function compare(d: Dataset, o: V3, n: V3, where: string): PlaneCut {
  const fast = cutPlane(d, o, n, { candidates: 'scan', planeFaceKeys: true });
  const general = cutPlane(d, o, n, { candidates: 'scan', planeFaceKeys: true, caseTables: false });
  expectSame(fast, general, where);
  return fast;
}

describe('on-plane case tables', () => {
  it('give the general builder\'s cut for every below/on/above pattern of one cell of each type', () => {
    TABLE_TYPES.forEach((t, s) => {
      // One cell per pattern, side by side along x (no shared points or faces), cut once each way.
      const n = SLOT_NODES[s]!, base = BASE[t]!, pts: number[] = [], nodes: number[][] = [];
      let onPlane = 0;
      for (let code = 0; code < 3 ** n; code++) {
        // digit i of `code`: node i below (0), on (1) or above (2) the plane z = 0
        let zero = 0;
        for (let i = 0, r = code; i < n; i++, r = Math.floor(r / 3)) {
          const side = r % 3;
          zero |= (side === 1 ? 1 : 0) << i;
          pts.push(2 * code + base[i]![0], base[i]![1], side === 1 ? 0 : (side === 0 ? -1 : 1) * (0.5 + 0.1 * i));
        }
        nodes.push(Array.from({ length: n }, (_, i) => n * code + i));
        if (zero !== 0) onPlane++;
      }
      const d = datasetOf([pieceFromCells(pts, { types: nodes.map(() => t), nodes })]);
      const cut = compare(d, [0, 0, 0], [0, 0, 1], `type ${t}`);
      expect(cut.stats.tableCells, `type ${t}`).toBe(cut.stats.candidateCells);
      expect(cut.stats.boundaryFaces, `type ${t}`).toBeGreaterThan(0);
      expect(onPlane).toBe(3 ** n - 2 ** n);
    });
  });

  it('on lattices cut along node layers, obliquely through node rows and through a single node, every cell through the tables', () => {
    const meshes: [string, Piece[]][] = [
      ['hexahedra', [hexGrid(4, 4, 4)]], ['tetrahedra', [tetGrid(3, 3, 3)]], ['wedges', [boxMesh('wedge', 3, 3, 3)]],
      ['pyramids', [boxMesh('pyramid', 3, 3, 3)]],
      ['two pieces with duplicated interface points', [hexGrid(2, 4, 4, (u, v, w) => [u / 2, v, w]), hexGrid(2, 4, 4, (u, v, w) => [(1 + u) / 2, v, w])]],
    ];
    const planes: { o: V3; n: V3 }[] = [
      { o: [0, 0, 0.5], n: [0, 0, 1] }, { o: [0, 0.25, 0], n: [0, -1, 0] }, { o: [0.5, 0, 0], n: [1, 0, 0] },
      { o: [0, 0, 0], n: [0, 0, 1] }, { o: [1, 1, 1], n: [0, 0, 1] }, // the cube's own end faces
      { o: [0.5, 0.5, 0.5], n: [1, 1, 0] }, { o: [0.5, 0.5, 0.5], n: [1, -1, 1] }, { o: [0.25, 0.5, 0.5], n: [0.3, 0.7, -0.2] },
    ];
    for (const [name, pieces] of meshes) {
      const d = datasetOf(pieces.map(withFlow));
      planes.forEach(({ o, n }, i) => {
        const cut = compare(d, o, n, `${name}, plane ${i}`);
        expect(cut.stats.tableCells, `${name}, plane ${i}`).toBe(cut.stats.candidateCells);
        if (i < 5) expect(Math.abs(setArea(cut.positions, cut.indices) - 1), `${name}, plane ${i}`).toBeLessThan(1e-12);
      });
    }
  });

  it('make a case on first use, keep it, and refuse a pattern with no node on the plane or beyond the type', () => {
    const hex = TABLE_TYPES.indexOf(CellType.HEXAHEDRON);
    const p = onPlaneStart(hex, 0b0000_1111, 0b1111_0000);
    expect(onPlaneStart(hex, 0b0000_1111, 0b1111_0000)).toBe(p);
    // the cell below a node layer: its top face is the cut (one loop of four on-plane nodes) and is claimed
    const a = onPlaneData(hex);
    expect(a[p]).toBe(3);
    expect(a[p + 1]).toBe(4);
    expect(a[p]).not.toBe(ON_PLANE_GENERAL);
    expect(() => onPlaneStart(hex, 0b1, 0)).toThrow(/no case/);
    expect(() => onPlaneStart(hex, 0b1, 0b1)).toThrow(/no case/);
  });
});
