/**
 * Candidate cells of a cut from the scan: the fixed-stride loops for pieces of only hexahedra or only
 * tetrahedra must return exactly the cells the rule selects. Reference: a brute-force pass over every
 * cell written here from the rule in crossingCells.ts (a 3D cell with a node below the plane and a node on
 * or above it, or with nodes on the plane and above it), on random planes, planes through nodes and planes
 * along lattice faces.
 */
import { describe, expect, it } from 'vitest';
import { candidateCells } from '../../src/cut/crossingCells.ts';
import { CellType } from '../../src/model/cellTypes.ts';
import { datasetOf, hexGrid, pieceFromCells, tetGrid, tetsWithTriangles } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import type { Piece } from '../../src/model/piece.ts';
import { shareDataset, splitCells } from '../../src/parallel/shares.ts';
import { jitteredHex, jitteredTet, rng } from '../locate/meshes.ts';

type V3 = [number, number, number];

function bruteForce(d: Dataset, o: V3, n: V3, tol: number): number[] {
  const out: number[] = [];
  let g0 = 0;
  for (const p of d.pieces) {
    for (let c = 0; c < p.cellTypes.length; c++) {
      const t = p.cellTypes[c]!;
      if (t < CellType.TETRA || t > CellType.HEXAGONAL_PRISM) continue;
      let below = false, on = false, above = false;
      for (let q = p.offsets[c]!; q < p.offsets[c + 1]!; q++) {
        const i = 3 * p.connectivity[q]!;
        const s = n[0] * (p.points[i]! - o[0]) + n[1] * (p.points[i + 1]! - o[1]) + n[2] * (p.points[i + 2]! - o[2]);
        if (Math.abs(s) <= tol) on = true; else if (s < 0) below = true; else above = true;
      }
      if ((below && (on || above)) || (on && above)) out.push(g0 + c);
    }
    g0 += p.cellTypes.length;
  }
  return out;
}

function planes(seed: number, p: Piece): { o: V3; n: V3 }[] {
  const r = rng(seed), out: { o: V3; n: V3 }[] = [];
  for (let i = 0; i < 12; i++) {
    const n: V3 = [r() - 0.5, r() - 0.5, r() - 0.5], l = Math.hypot(...n);
    out.push({ o: [r(), r(), r()], n: [n[0] / l, n[1] / l, n[2] / l] });
  }
  // through a node, with a random normal
  const k = 3 * Math.floor(r() * (p.points.length / 3));
  out.push({ o: [p.points[k]!, p.points[k + 1]!, p.points[k + 2]!], n: [0.6, 0, 0.8] });
  // along lattice faces (nodes exactly on the plane)
  out.push({ o: [0.5, 0.5, 0.5], n: [0, 0, 1] }, { o: [0.25, 0, 0], n: [1, 0, 0] }, { o: [0, 0, 0], n: [0, 1, 0] });
  return out;
}

function expectSame(d: Dataset, seed: number): void {
  for (const { o, n } of planes(seed, d.pieces[0]!)) {
    const tol = 1e-10;
    const got = candidateCells(d, ...o, ...n, tol, 'scan');
    expect(got.used).toBe('scan');
    expect(Array.from(got.cells)).toEqual(bruteForce(d, o, n, tol));
  }
}

describe('candidateCells scan', () => {
  it('selects exactly the rule\'s cells on hexahedra (fixed stride 8)', () => {
    expectSame(datasetOf([hexGrid(4, 4, 4)]), 1);
    expectSame(datasetOf([jitteredHex(5)]), 2);
  });

  it('selects exactly the rule\'s cells on tetrahedra (fixed stride 4)', () => {
    expectSame(datasetOf([tetGrid(4, 4, 4)]), 3);
    expectSame(datasetOf([jitteredTet(4)]), 4);
  });

  it('selects exactly the rule\'s cells on several pieces mixing the fixed-stride and general loops', () => {
    const h = hexGrid(2, 2, 2);
    const nodes = [Array.from(h.connectivity.subarray(0, 8)), Array.from(h.connectivity.subarray(8, 12)), Array.from(h.connectivity.subarray(16, 22))];
    const mixed = pieceFromCells(h.points, { types: [CellType.HEXAHEDRON, CellType.TETRA, CellType.WEDGE], nodes });
    expectSame(datasetOf([jitteredTet(3), mixed, jitteredHex(3)]), 5);
  });

  it('selects exactly the rule\'s cells across the scan\'s blocks of 4096 cells, with surface cells among the volume cells', () => {
    expectSame(datasetOf([hexGrid(17, 17, 17)]), 7);
    expectSame(datasetOf([tetGrid(10, 10, 10)]), 8);
    // General loop: hexahedra with quadrilaterals and triangles (surface cells, never candidates) between them.
    const h = hexGrid(17, 17, 17), types: number[] = [], nodes: number[][] = [];
    for (let c = 0; c < h.cellTypes.length; c++) {
      const hex = Array.from(h.connectivity.subarray(8 * c, 8 * c + 8));
      types.push(CellType.HEXAHEDRON); nodes.push(hex);
      if (c % 5 === 0) { types.push(CellType.QUAD); nodes.push(hex.slice(0, 4)); }
      if (c % 7 === 0) { types.push(CellType.TRIANGLE); nodes.push(hex.slice(4, 7)); }
    }
    expect(types.length).toBeGreaterThan(4096);
    expectSame(datasetOf([pieceFromCells(h.points, { types, nodes })]), 9);
  });

  it('selects exactly the rule\'s cells on a lead run of one type followed by other cells (stride, then offsets)', () => {
    // tetrahedra then their boundary triangles, as a volume mesh written with its faces
    expectSame(datasetOf([tetsWithTriangles(jitteredTet(4), 3)]), 10);
    expectSame(datasetOf([tetsWithTriangles(tetGrid(10, 10, 10), 7)]), 11);
    // hexahedra, a wedge, hexahedra again: the lead ends at the wedge, the later hexahedra go by offsets
    const h = hexGrid(17, 17, 17), types: number[] = [], nodes: number[][] = [];
    for (let c = 0; c < h.cellTypes.length; c++) {
      const hex = Array.from(h.connectivity.subarray(8 * c, 8 * c + 8));
      if (c === 3000) { types.push(CellType.WEDGE); nodes.push(hex.slice(0, 6)); }
      types.push(CellType.HEXAHEDRON); nodes.push(hex);
    }
    expectSame(datasetOf([pieceFromCells(h.points, { types, nodes })]), 12);
    // shares whose first one ends inside the lead and whose last one holds only the tail
    const d = datasetOf([tetsWithTriangles(jitteredTet(4), 2)]);
    for (const share of splitCells(d.pieces[0]!.cellTypes.length, 3)) expectSame(shareDataset(d, share), 13);
  });

  it('selects exactly the rule\'s cells on a worker\'s share of the cells (views; only the share\'s points classified)', () => {
    for (const d of [datasetOf([jitteredHex(5)]), datasetOf([jitteredTet(4)]), datasetOf([jitteredTet(3), jitteredHex(3)])]) {
      for (const share of splitCells(d.pieces.reduce((n, p) => n + p.cellTypes.length, 0), 3)) expectSame(shareDataset(d, share), 6);
    }
  });
});
