/**
 * The cut's geometry and bookkeeping: a unit cube has section area 1 at any height, including planes through
 * layers of nodes and the cube's own faces; no gaps and no double layers across pieces; empty cuts flagged;
 * non-convex polyhedra; 2D cells skipped; both candidate searches agree.
 * Reference: elementary geometry (section areas of a unit cube: 1 for axis planes; the regular hexagon
 * 3√3/4 for x + y + z = 3/2; √2 for the diagonal plane x = y).
 */
import { describe, expect, it } from 'vitest';
import { cutPlane } from '../../src/cut/cutPlane.ts';
import { pointFieldOnCut } from '../../src/cut/cutFields.ts';
import { integrateSurface } from '../../src/cut/integrals.ts';
import { datasetOf, hexGrid, pieceFromCells, pointFieldFrom, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { boxMesh, setArea, type V3 } from './meshes.ts';

const area = (c: { positions: Float64Array; indices: Uint32Array }) => setArea(c.positions, c.indices);

/** The unit cube as `n` pieces split at x = k/n, each with its own copy of the interface points. */
function piecesAlongX(n: number, cells: number): Piece[] {
  return Array.from({ length: n }, (_, k) => hexGrid(cells, cells * n, cells * n, (u, v, w) => [(k + u) / n, v, w]));
}

describe('unit cube: section area 1 at any height', () => {
  const meshes: [string, () => Piece[]][] = [
    ['hexahedra 4³', () => [hexGrid(4, 4, 4)]],
    ['tetrahedra 4³×6', () => [tetGrid(4, 4, 4)]],
    ['wedges 4³×2', () => [boxMesh('wedge', 4, 4, 4)]],
    ['pyramids 3³×6', () => [boxMesh('pyramid', 3, 3, 3)]],
    ['polyhedra 4³', () => [boxMesh('polyhedron', 4, 4, 4)]],
    ['three pieces with duplicated interface points', () => piecesAlongX(3, 2)],
  ];
  for (const [label, make] of meshes) {
    it(`${label}: planes between, through node layers, and on both end faces`, () => {
      const d = datasetOf(make());
      for (const axis of [0, 1, 2]) {
        const n: V3 = [0, 0, 0];
        n[axis] = 1;
        for (const h of [0, 1 / 3, 0.25, 0.5, 0.6, 2 / 3, 0.75, 1]) {
          const o: V3 = [0.5, 0.5, 0.5];
          o[axis] = h;
          for (const sign of [1, -1]) {
            const c = cutPlane(d, o, [sign * n[0], sign * n[1], sign * n[2]]);
            expect(Math.abs(area(c) - 1), `${label} axis ${axis} h ${h} sign ${sign}`).toBeLessThan(1e-13);
          }
        }
      }
      expect(Math.abs(area(cutPlane(d, [0.5, 0.5, 0.5], [1, 1, 1])) - 3 * Math.sqrt(3) / 4)).toBeLessThan(1e-13);
      expect(Math.abs(area(cutPlane(d, [0.5, 0.5, 0.5], [1, -1, 0])) - Math.SQRT2)).toBeLessThan(1e-13);
    });
  }

  it('a plane through a node layer gives each triangle once (same triangles as a plane just beside it)', () => {
    const d = datasetOf([hexGrid(5, 5, 5)]);
    const on = cutPlane(d, [0, 0, 0.4], [0, 0, 1]);
    const beside = cutPlane(d, [0, 0, 0.4 + 1e-7], [0, 0, 1]);
    expect(on.indices.length).toBe(beside.indices.length);
    expect(new Set(on.sourceCell).size).toBe(25);
  });

  it('the plane along the interface of two pieces (each holding the interface points) counts the interface once', () => {
    const d = datasetOf(piecesAlongX(2, 3));
    for (const nx of [1, -1]) {
      const c = cutPlane(d, [0.5, 0.2, 0.7], [nx, 0, 0]);
      expect(Math.abs(area(c) - 1)).toBeLessThan(1e-13);
    }
    // On the outer faces, the cell above is the only owner and its face is added.
    const end = cutPlane(d, [0, 0.2, 0.7], [1, 0, 0]);
    expect(end.stats.boundaryFaces).toBe(36);
    expect(Math.abs(area(end) - 1)).toBeLessThan(1e-13);
  });
});

describe('empty, flagged cuts', () => {
  it('a plane that misses the mesh gives empty: true, no triangles, and null numbers', () => {
    let p = hexGrid(2, 2, 2);
    p = withFields(p, [pointFieldFrom(p, 'velocity', 3, (_x, _y, _z, o) => { o[0] = 0; o[1] = 0; o[2] = 1; })]);
    const c = cutPlane(datasetOf([p]), [0, 0, 1.5], [0, 0, 1]);
    expect(c.empty).toBe(true);
    expect(c.indices.length).toBe(0);
    const r = integrateSurface(c, { density: 1 });
    expect(r.empty).toBe(true);
    expect(r.reason).toMatch(/no triangles/);
    expect(r.area).toBeNull();
    expect(r.volumeFlowRate).toBeNull();
    expect(r.massFlowRate).toBeNull();
    expect(r.centroid).toBeNull();
    expect(r.uniformityIndex).toBeNull();
    expect(r.totalPressure).toBeNull();
    expect(Object.keys(r.areaMean)).toHaveLength(0);
    // A plane touching the mesh only along an edge or at a corner has no area either.
    expect(cutPlane(datasetOf([hexGrid(1, 1, 1)]), [1, 1, 1], [1, 1, 1]).empty).toBe(true);
    expect(cutPlane(datasetOf([hexGrid(1, 1, 1)]), [1, 1, 0], [1, 1, 0]).empty).toBe(true);
  });

  it('2D, 1D and 0D cells are skipped: a surface-only dataset gives an empty cut', () => {
    const pts = [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0, 0, 1, 1, 0, 1];
    const p = pieceFromCells(pts, { types: [9, 5, 3, 1], nodes: [[0, 1, 4, 5], [0, 3, 4], [0, 2], [1]] });
    expect(cutPlane(datasetOf([p]), [0.5, 0.5, 0.5], [0, 0, 1]).empty).toBe(true);
    // Mixed with 3D cells, only the 3D cells are cut.
    const hex = hexGrid(1, 1, 1), tri = pieceFromCells(pts, { types: [5], nodes: [[0, 1, 4]] });
    expect(Math.abs(area(cutPlane(datasetOf([hex, tri]), [0.5, 0.5, 0.5], [0, 0, 1])) - 1)).toBeLessThan(1e-14);
  });
});

describe('non-convex polyhedra', () => {
  // An L-shaped (or U-shaped) prism written as one polyhedron, plus hexahedra filling the notch: a unit cube.
  function notchedCube(shape: 'L' | 'U'): Piece {
    const outline = shape === 'L'
      ? [[0, 0], [1, 0], [1, 0.5], [0.5, 0.5], [0.5, 1], [0, 1]]
      : [[0, 0], [1, 0], [1, 1], [0.7, 1], [0.7, 0.4], [0.3, 0.4], [0.3, 1], [0, 1]];
    const m = outline.length, pts: number[] = [];
    for (const z of [0, 1]) for (const [x, y] of outline) pts.push(x!, y!, z);
    const bottom = Array.from({ length: m }, (_, i) => m - 1 - i), top = Array.from({ length: m }, (_, i) => m + i);
    const sides = Array.from({ length: m }, (_, i) => [i, (i + 1) % m, m + ((i + 1) % m), m + i]);
    // One side face written inward, as some writers do: the cut must not depend on face orientation.
    sides[1]!.reverse();
    const fillers = shape === 'L' ? [[[0.5, 0.5], [1, 0.5], [1, 1], [0.5, 1]]] : [[[0.3, 0.4], [0.7, 0.4], [0.7, 1], [0.3, 1]]];
    const types = [42], nodes = [Array.from({ length: 2 * m }, (_, i) => i)], polyFaces: (number[][] | undefined)[] = [[bottom, top, ...sides]];
    for (const f of fillers) {
      const base = pts.length / 3;
      for (const z of [0, 1]) for (const [x, y] of f) pts.push(x!, y!, z);
      types.push(12); nodes.push(Array.from({ length: 8 }, (_, i) => base + i)); polyFaces.push(undefined);
    }
    return pieceFromCells(pts, { types, nodes, polyFaces });
  }

  it('an L-shaped cell cut across gives a non-convex polygon, triangulated exactly (area 0.75 + filler 0.25)', () => {
    const d = datasetOf([notchedCube('L')]);
    for (const o of [[0.5, 0.5, 0.3], [0.5, 0.5, 0.77]] as V3[]) {
      const c = cutPlane(d, o, [0, 0.1, 1]);
      const polyArea = setArea(c.positions, c.indices.filter((_, i) => c.sourceCell[Math.floor(i / 3)] === 0) as Uint32Array);
      expect(Math.abs(polyArea - 0.75 * Math.hypot(0.1, 1))).toBeLessThan(1e-13);
      expect(Math.abs(area(c) - Math.hypot(0.1, 1))).toBeLessThan(1e-13);
    }
  });

  it('a U-shaped cell cut across both arms gives two polygons from one cell', () => {
    const d = datasetOf([notchedCube('U')]);
    const c = cutPlane(d, [0.5, 0.7, 0.5], [0, 1, 0]);
    expect(Math.abs(area(c) - 1)).toBeLessThan(1e-13);
    const uTris = c.sourceCell.filter((g) => g === 0).length;
    expect(uTris).toBe(4); // two quads (x ∈ [0, 0.3] and [0.7, 1]), two triangles each
    const uArea = setArea(c.positions, Uint32Array.from(Array.from(c.indices).filter((_, i) => c.sourceCell[Math.floor(i / 3)] === 0)));
    expect(Math.abs(uArea - 0.6)).toBeLessThan(1e-13);
  });
});

describe('bookkeeping', () => {
  it('tree and scan candidate searches give the same cut', () => {
    const d = datasetOf([tetGrid(6, 5, 4, (u, v, w) => [u + 0.2 * v * w, v, w + 0.1 * u])]);
    for (const [o, n] of [[[0.4, 0.5, 0.5], [0.3, 1, 0.2]], [[0.5, 0.5, 0.5], [0, 0, 1]]] as [V3, V3][]) {
      const a = cutPlane(d, o, n, { candidates: 'scan' }), b = cutPlane(d, o, n, { candidates: 'tree' });
      expect(b.indices.length).toBe(a.indices.length);
      expect(Math.abs(area(a) - area(b))).toBeLessThan(1e-14);
      expect(a.stats.candidateSource).toBe('scan');
      expect(b.stats.candidateSource).toBe('tree');
    }
  });

  it('triangles are wound counter-clockwise about the normal, every vertex lies in the plane, and fields can be added later', () => {
    let p = hexGrid(3, 3, 3, (u, v, w) => [u, v + 0.3 * u * u, w]);
    p = withFields(p, [pointFieldFrom(p, 'phi', 1, (x, y, z, o) => { o[0] = x - 2 * y + 3 * z; })]);
    const n: V3 = [0.2, -0.5, 1], o: V3 = [0.5, 0.6, 0.5];
    const c = cutPlane(datasetOf([p]), o, n, { fields: 'none' });
    expect(c.fields).toHaveLength(0);
    const P = c.positions, I = c.indices;
    for (let t = 0; t < I.length; t += 3) {
      const a = 3 * I[t]!, b = 3 * I[t + 1]!, d = 3 * I[t + 2]!;
      const ux = P[b]! - P[a]!, uy = P[b + 1]! - P[a + 1]!, uz = P[b + 2]! - P[a + 2]!;
      const vx = P[d]! - P[a]!, vy = P[d + 1]! - P[a + 1]!, vz = P[d + 2]! - P[a + 2]!;
      expect((uy * vz - uz * vy) * n[0] + (uz * vx - ux * vz) * n[1] + (ux * vy - uy * vx) * n[2]).toBeGreaterThanOrEqual(0);
    }
    const len = Math.hypot(...n);
    for (let v = 0; v < P.length / 3; v++) {
      expect(Math.abs(((P[3 * v]! - o[0]) * n[0] + (P[3 * v + 1]! - o[1]) * n[1] + (P[3 * v + 2]! - o[2]) * n[2]) / len)).toBeLessThan(1e-14);
    }
    const phi = pointFieldOnCut(datasetOf([p]), c, 'phi');
    for (let v = 0; v < P.length / 3; v++) expect(Math.abs(phi.values[v]! - (P[3 * v]! - 2 * P[3 * v + 1]! + 3 * P[3 * v + 2]!))).toBeLessThan(1e-14);
  });

  it('collapsed hexahedra (repeated nodes, as wedge-like cells) are cut without gaps', () => {
    // A unit cube as two hexahedra collapsed along a diagonal: nodes 2 = 3 and 6 = 7 in the first.
    const pts = [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0, 0, 1, 1, 0, 1, 1, 1, 1, 0, 1, 1];
    const p = pieceFromCells(pts, { types: [12, 12], nodes: [[0, 1, 2, 2, 4, 5, 6, 6], [0, 2, 3, 3, 4, 6, 7, 7]] });
    for (const z of [0, 0.3, 1]) expect(Math.abs(area(cutPlane(datasetOf([p]), [0, 0, z], [0, 0, 1])) - 1)).toBeLessThan(1e-14);
  });
});
