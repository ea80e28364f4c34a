/**
 * The case-table path of the cut against the general polygon builder (`caseTables: false`), which it must
 * reproduce bit for bit: every linear cell type with random planes, planes through nodes, along edges and
 * along faces, collapsed cells, several pieces, and the external files of tests/fixtures/external (written
 * by other open-source libraries, see SOURCES.md there). Areas and every integral agree to 1e-12 (they are
 * in fact equal, as the arrays are). The tables themselves are checked against the cell's edge list
 * (CELL_EDGES, an independent table of src/model/cellTypes.ts): each pattern's loops cross exactly the edges
 * whose two ends lie on opposite sides, each once — the marching-cubes principle (Lorensen & Cline 1987,
 * "Marching cubes: a high resolution 3D surface construction algorithm", SIGGRAPH '87).
 */
import { describe, expect, it } from 'vitest';
import { CASE_DATA, caseStart, casePolygons, SLOT_NODES, TABLE_TYPES } from '../../src/cut/caseTables.ts';
import { cutPlane, type PlaneCut } from '../../src/cut/cutPlane.ts';
import { integrateSurface } from '../../src/cut/integrals.ts';
import { datasetBounds } from '../../src/model/bounds.ts';
import { CELL_EDGES, CellType } from '../../src/model/cellTypes.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { datasetOf, hexGrid, pieceFromCells, pointFieldFrom, tetGrid, withFields, field } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { loadExternal } from '../helpers/external.ts';
import { meshesOfEveryType, voxelGrid } from '../locate/meshes.ts';
import { rng } from './meshes.ts';
import { expectSameCut } from './sameCut.ts';

type V3 = [number, number, number];

function withFlow(p: Piece): Piece {
  return withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 0.3 + x * y; o[1] = -0.2 * z + x; o[2] = 1 + x - y * y; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 3 - x + 2 * y * z; }),
  ], [field('rank', 'cell', 1, Float64Array.from({ length: p.cellTypes.length }, (_, c) => c % 7))]);
}

/** Random planes through the box, a plane through a node, along lattice faces, along an edge, oblique through lattice nodes. */
function planesFor(d: Dataset, seed: number): { o: V3; n: V3 }[] {
  const b = datasetBounds(d), r = rng(seed), out: { o: V3; n: V3 }[] = [];
  const at = (u: number, v: number, w: number): V3 => [b[0]! + u * (b[1]! - b[0]!), b[2]! + v * (b[3]! - b[2]!), b[4]! + w * (b[5]! - b[4]!)];
  for (let i = 0; i < 10; i++) out.push({ o: at(r(), r(), r()), n: [r() - 0.5, r() - 0.5, r() - 0.5] });
  const p0 = d.pieces[0]!, k = 3 * Math.floor(r() * (p0.points.length / 3));
  out.push({ o: [p0.points[k]!, p0.points[k + 1]!, p0.points[k + 2]!], n: [0.6, -0.3, 0.8] });
  out.push({ o: at(0.5, 0.5, 0.5), n: [0, 0, 1] }, { o: at(0, 1 / 3, 0), n: [0, 1, 0] }, { o: at(2 / 3, 0, 0), n: [1, 0, 0] });
  // through a lattice edge family (x = y diagonal planes) and through lattice nodes obliquely
  out.push({ o: at(0, 0, 0), n: [1, -1, 0] }, { o: at(1 / 3, 1 / 3, 1 / 3), n: [1, 1, 1] });
  return out;
}


const close = (x: number, y: number, scale: number) => Math.abs(x - y) <= 1e-12 * Math.max(Math.abs(y), scale);

function expectSameIntegrals(a: PlaneCut, b: PlaneCut, where: string): void {
  const ia = integrateSurface(a, { density: 1.2 }), ib = integrateSurface(b, { density: 1.2 });
  expect(ia.empty, where).toBe(ib.empty);
  if (ib.empty) return;
  const A = ib.area!;
  expect(close(ia.area!, A, 0), where).toBe(true);
  const scale = A * 10;
  expect(close(ia.volumeFlowRate!, ib.volumeFlowRate!, scale), where).toBe(true);
  expect(close(ia.massFlowRate!, ib.massFlowRate!, scale), where).toBe(true);
  for (const [key, v] of Object.entries(ib.integral)) {
    const w = ia.integral[key]!;
    const xs = Array.isArray(v) ? v : [v], ys = Array.isArray(w) ? w : [w];
    xs.forEach((x, i) => expect(close(ys[i]!, x, scale), `${where} ∫${key}`).toBe(true));
  }
}

/** Cuts `d` with every plane both ways and compares; returns how many cells went through the tables. */
function compareOn(d: Dataset, seed: number, label: string): number {
  let viaTables = 0;
  planesFor(d, seed).forEach(({ o, n }, i) => {
    const fast = cutPlane(d, o, n, { candidates: 'scan' });
    const general = cutPlane(d, o, n, { candidates: 'scan', caseTables: false });
    expect(general.stats.tableCells).toBe(0);
    viaTables += fast.stats.tableCells!;
    expectSameCut(fast, general, `${label}, plane ${i}`);
    expectSameIntegrals(fast, general, `${label}, plane ${i}`);
  });
  return viaTables;
}

describe('case tables', () => {
  it('cross exactly the edges with ends on opposite sides, each once, in closed loops, for every pattern of every type', () => {
    TABLE_TYPES.forEach((t, s) => {
      const n = SLOT_NODES[s]!, edges = CELL_EDGES[t]!;
      expect(n).toBe(Math.max(...edges.flat()) + 1);
      for (let below = 0; below < 1 << n; below++) {
        const crossed = edges.filter(([a, b]) => ((below >> a) & 1) !== ((below >> b) & 1)).map(([a, b]) => `${Math.min(a, b)}-${Math.max(a, b)}`).sort();
        const loops = casePolygons(t, below);
        const got = loops.flat().map(([lo, hi]) => {
          expect((below >> lo) & 1).toBe(1);
          expect((below >> hi) & 1).toBe(0);
          return `${Math.min(lo, hi)}-${Math.max(lo, hi)}`;
        }).sort();
        expect(got, `type ${t}, pattern ${below}`).toEqual(crossed);
        for (const loop of loops) expect(loop.length).toBeGreaterThanOrEqual(3);
        // The flat form holds the same loops.
        let p = caseStart(s, below);
        expect(CASE_DATA[p++]).toBe(loops.length);
        for (const loop of loops) {
          expect(CASE_DATA[p++]).toBe(loop.length);
          for (const [lo, hi] of loop) { expect(CASE_DATA[p++]).toBe(lo); expect(CASE_DATA[p++]).toBe(hi); }
        }
      }
    });
  });

  it('a tetrahedron has one triangle or one quadrilateral; a hexahedron with two opposite corners below has two triangles', () => {
    expect(casePolygons(CellType.TETRA, 0b0001).map((l) => l.length)).toEqual([3]);
    expect(casePolygons(CellType.TETRA, 0b0011).map((l) => l.length)).toEqual([4]);
    expect(casePolygons(CellType.HEXAHEDRON, 0b0100_0001).map((l) => l.length)).toEqual([3, 3]);
    expect(casePolygons(CellType.HEXAHEDRON, 0b0000_1111).map((l) => l.length)).toEqual([4]);
  });
});

describe('case-table cut equals the general cut', () => {
  for (const { name, dataset } of meshesOfEveryType(4)) {
    it(`on ${name} cells (jittered), bit for bit`, () => {
      const d = datasetOf(dataset.pieces.map(withFlow), name);
      const via = compareOn(d, name.length * 31 + 7, name);
      if (name !== 'polyhedron') expect(via).toBeGreaterThan(0); else expect(via).toBe(0);
    });
  }

  it('on unjittered lattices, where planes run along faces and edges and through nodes', () => {
    for (const p of [hexGrid(5, 5, 5), tetGrid(4, 4, 4), voxelGrid(4)]) expect(compareOn(datasetOf([withFlow(p)]), 11, 'lattice')).toBeGreaterThan(0);
  });

  it('on collapsed hexahedra (repeated nodes) and several pieces mixing types', () => {
    const h = hexGrid(3, 3, 3), nodes: number[][] = [];
    for (let c = 0; c < h.cellTypes.length; c++) {
      const q = Array.from(h.connectivity.subarray(8 * c, 8 * c + 8));
      // collapse the top face's last edge: a wedge stored as a hexahedron
      nodes.push(c % 2 ? [q[0]!, q[1]!, q[2]!, q[3]!, q[4]!, q[5]!, q[5]!, q[4]!] : q);
    }
    const collapsed = pieceFromCells(h.points, { types: nodes.map(() => CellType.HEXAHEDRON), nodes });
    const mixed = meshesOfEveryType(3).map((m) => withFlow(m.dataset.pieces[0]!));
    expect(compareOn(datasetOf([withFlow(collapsed)]), 5, 'collapsed')).toBeGreaterThan(0);
    expect(compareOn(datasetOf(mixed), 6, 'mixed pieces')).toBeGreaterThan(0);
  });

  for (const file of ['vtk-data/Wedge.vtu', 'vtk-data/AngularSector.vtk', 'vtk-data/ex-blow_5.vtm', 'vtk-data/polyhedron2pieces.vtu',
    'vtu11/pyramids_3D/raw.vtu', 'vtkio/hexahedron_ascii.vtu', 'vtkio/box.vtu', 'vtk-data/VTKCellTypes.vtk', 'vtk-data/Quadratic/CylinderLinear.vtk']) {
    it(`on the external file ${file}`, async () => {
      const d = await loadExternal(file);
      compareOn(d, file.length, file);
    });
  }
});

describe('cases made on first use', () => {
  it('a case is made when first asked for, stays where it is, and a pattern beyond the type is refused', () => {
    const hex = TABLE_TYPES.indexOf(CellType.HEXAHEDRON), tet = TABLE_TYPES.indexOf(CellType.TETRA);
    const p = caseStart(hex, 0b0110_1001);
    expect(caseStart(hex, 0b0110_1001)).toBe(p);
    expect(CASE_DATA[p]).toBe(casePolygons(CellType.HEXAHEDRON, 0b0110_1001).length);
    expect(() => caseStart(tet, 16)).toThrow(/no case 16 for slot/);
  });
});
