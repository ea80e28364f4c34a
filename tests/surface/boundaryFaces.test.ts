import { describe, expect, it } from 'vitest';
import { datasetOf, field, hexGrid, pieceFromCells, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { boundaryFaces, totalArea, type BoundaryFaces } from '../../src/surface/boundaryFaces.ts';

/** Σ A_f over all faces. */
function netArea(b: BoundaryFaces): [number, number, number] {
  const s: [number, number, number] = [0, 0, 0];
  for (let f = 0; f < b.count; f++) for (let c = 0; c < 3; c++) s[c] += b.areaVector[3 * f + c]!;
  return s;
}

/** Every face's area vector points away from `centre` (true for a convex domain around it). */
function allOutward(b: BoundaryFaces, centre: [number, number, number]): boolean {
  for (let f = 0; f < b.count; f++) {
    let d = 0;
    for (let c = 0; c < 3; c++) d += b.areaVector[3 * f + c]! * (b.centroid[3 * f + c]! - centre[c]!);
    if (!(d > 0)) return false;
  }
  return true;
}

const CUBE = [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0, 0, 1, 1, 0, 1, 1, 1, 1, 0, 1, 1];

/** The unit cube as six pyramids with their apex at the centre (point 8). */
function pyramidCube(): Dataset {
  const quads = [[0, 3, 2, 1], [4, 5, 6, 7], [0, 1, 5, 4], [1, 2, 6, 5], [2, 3, 7, 6], [3, 0, 4, 7]];
  // A pyramid with base (a, b, c, d) is positive when the base, seen from the apex, runs counter-clockwise: reverse the outward quads.
  const nodes = quads.map((q) => [q[3]!, q[2]!, q[1]!, q[0]!, 8]);
  return datasetOf([pieceFromCells([...CUBE, 0.5, 0.5, 0.5], { types: nodes.map(() => 14), nodes })]);
}

/** The unit cube as one polyhedron whose face list has face 2 written inward. */
function polyhedronCube(): Dataset {
  const faces = [[0, 3, 2, 1], [4, 5, 6, 7], [0, 4, 5, 1], [1, 2, 6, 5], [2, 3, 7, 6], [3, 0, 4, 7]];
  return datasetOf([pieceFromCells(CUBE, { types: [42], nodes: [[0, 1, 2, 3, 4, 5, 6, 7]], polyFaces: [faces] })]);
}

describe('boundary faces of a unit cube (area 6, ∮ n dA = 0)', () => {
  // Reference: geometry of the unit cube (area 6) and the divergence theorem (∮ n dA = 0 on a closed surface).
  const cases: [string, () => Dataset, number][] = [
    ['hexahedra 3×4×5', () => datasetOf([hexGrid(3, 4, 5)]), 2 * (12 + 15 + 20)],
    ['tetrahedra 3×4×5', () => datasetOf([tetGrid(3, 4, 5)]), 4 * (12 + 15 + 20)],
    ['six pyramids', pyramidCube, 6],
    ['one polyhedron (one face written inward)', polyhedronCube, 6],
    ['two wedges', () => datasetOf([pieceFromCells(CUBE, { types: [13, 13], nodes: [[0, 1, 3, 4, 5, 7], [1, 2, 3, 5, 6, 7]] })]), 8],
  ];
  for (const [name, make, count] of cases) {
    it(name, () => {
      const b = boundaryFaces(make());
      expect(b.count).toBe(count);
      expect(totalArea(b)).toBeCloseTo(6, 13);
      for (const s of netArea(b)) expect(Math.abs(s)).toBeLessThan(1e-14);
      expect(allOutward(b, [0.5, 0.5, 0.5])).toBe(true);
    });
  }

  it('turns the inward polyhedron face and reports it', () => {
    expect(boundaryFaces(polyhedronCube()).flipped).toBe(1);
  });

  it('orients the faces of inverted (mirrored) hexahedra outward', () => {
    const b = boundaryFaces(datasetOf([hexGrid(2, 2, 2, (u, v, w) => [1 - u, v, w])]));
    expect(b.count).toBe(24);
    expect(b.flipped).toBe(24);
    expect(allOutward(b, [0.5, 0.5, 0.5])).toBe(true);
    expect(totalArea(b)).toBeCloseTo(6, 13);
  });

  it('orders faces by owning cell, then local face, with nodes in merged and local numbering', () => {
    const b = boundaryFaces(datasetOf([hexGrid(2, 1, 1)]));
    expect(Array.from(b.cell)).toEqual([0, 0, 0, 0, 0, 1, 1, 1, 1, 1]);
    expect(Array.from(b.localFace)).toEqual([0, 2, 3, 4, 5, 1, 2, 3, 4, 5]);
    expect(Array.from(b.points)).toEqual(Array.from(b.nodes));
  });
});

describe('mixed cell types meeting face to face', () => {
  it('hexahedron + polyhedron + six pyramids + hexagonal prism: shared faces are interior', () => {
    // Three unit cubes along x (hex, polyhedron, pyramids); area of the 3×1×1 box is 14.
    const pts: number[] = [];
    for (let i = 0; i <= 3; i++) for (const [y, z] of [[0, 0], [1, 0], [1, 1], [0, 1]]) pts.push(i, y!, z!);
    // Node id of (i, corner) with corners 0:(0,0) 1:(1,0) 2:(1,1) 3:(0,1) in (y, z).
    const n = (i: number, c: number) => 4 * i + c;
    const hex = (i: number) => [n(i, 0), n(i + 1, 0), n(i + 1, 1), n(i, 1), n(i, 3), n(i + 1, 3), n(i + 1, 2), n(i, 2)];
    pts.push(2.5, 0.5, 0.5);
    const apex = pts.length / 3 - 1;
    const h2 = hex(2);
    const faces = [[0, 4, 7, 3], [1, 2, 6, 5], [0, 1, 5, 4], [3, 7, 6, 2], [0, 3, 2, 1], [4, 5, 6, 7]].map((f) => f.map((k) => h2[k]!));
    const h1 = hex(1);
    const polyFaces = [[0, 4, 7, 3], [1, 2, 6, 5], [0, 1, 5, 4], [3, 7, 6, 2], [0, 3, 2, 1], [4, 5, 6, 7]].map((f) => f.map((k) => h1[k]!));
    const types = [12, 42, ...faces.map(() => 14)];
    const nodes = [hex(0), h1, ...faces.map((f) => [f[3]!, f[2]!, f[1]!, f[0]!, apex])];
    const d = datasetOf([pieceFromCells(pts, { types, nodes, polyFaces: [undefined, polyFaces, ...faces.map(() => undefined)] })]);
    const b = boundaryFaces(d);
    expect(b.count).toBe(5 + 4 + 5);
    expect(totalArea(b)).toBeCloseTo(14, 13);
    for (const s of netArea(b)) expect(Math.abs(s)).toBeLessThan(1e-13);
    expect(allOutward(b, [1.5, 0.5, 0.5])).toBe(true);
  });

  it('hexagonal prism: area 2·(3√3/2)s² + 6sh', () => {
    // Reference: area of a regular hexagonal prism (side s, height h), elementary geometry.
    const s = 0.7, h = 1.3, pts: number[] = [];
    for (const z of [0, h]) for (let k = 0; k < 6; k++) pts.push(s * Math.cos((k * Math.PI) / 3), s * Math.sin((k * Math.PI) / 3), z);
    const b = boundaryFaces(datasetOf([pieceFromCells(pts, { types: [16], nodes: [[0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11]] })]));
    expect(b.count).toBe(8);
    expect(totalArea(b)).toBeCloseTo(3 * Math.sqrt(3) * s * s + 6 * s * h, 13);
    expect(allOutward(b, [0, 0, h / 2])).toBe(true);
  });
});

describe('faces between pieces are interior', () => {
  it('matches duplicated interface points by coordinates', () => {
    const a = hexGrid(3, 3, 3), b = hexGrid(3, 3, 3, (u, v, w) => [1 + u, v, w]);
    const res = boundaryFaces(datasetOf([a, b]));
    expect(res.merge.method).toBe('coordinates');
    expect(res.merge.shared).toBe(16);
    expect(res.count).toBe(2 * (18 + 18 + 9));
    expect(totalArea(res)).toBeCloseTo(10, 12);
    // One number per boundary point of the 7×4×4 lattice (112 − 20 inner points): interface points merged.
    expect(new Set(res.points).size).toBe(92);
  });

  it('uses a global point-id array when every piece has one (even if coordinates disagree)', () => {
    const a = hexGrid(2, 2, 2), b = hexGrid(2, 2, 2, (u, v, w) => [1 + u + (u === 0 ? 1e-3 : 0), v, w]);
    const ids = (offset: number) => Float64Array.from({ length: 27 }, (_, i) => offset + i);
    // Piece b's i = 0 layer is piece a's i = 2 layer: global id (2, j, k) of a.
    const idsB = Float64Array.from({ length: 27 }, (_, q) => { const i = q % 3, jk = Math.floor(q / 3); return i === 0 ? 2 + 3 * jk : 100 + q; });
    const d = datasetOf([withFields(a, [{ ...field('GlobalNodeId', 'point', 1, ids(0)), sourceType: 'Int64' }]),
      withFields(b, [{ ...field('GlobalNodeId', 'point', 1, idsB), sourceType: 'Int64' }])]);
    const res = boundaryFaces(d);
    expect(res.merge.method).toBe('global-ids');
    expect(res.merge.shared).toBe(9);
    expect(res.count).toBe(2 * (8 + 8 + 4));
    // Forcing coordinates instead misses the shifted layer: the interface shows up twice.
    expect(boundaryFaces(d, { globalIds: false }).count).toBe(2 * (8 + 8 + 4) + 8);
  });

  it('keeps coincident points of one piece apart (as VTK does)', () => {
    const a = hexGrid(1, 1, 1), b = hexGrid(1, 1, 1, (u, v, w) => [1 + u, v, w]);
    const one = datasetOf([pieceFromCells([...a.points, ...b.points], {
      types: [12, 12], nodes: [Array.from(a.connectivity), Array.from(b.connectivity, (q) => q + 8)],
    })]);
    expect(boundaryFaces(one).count).toBe(12);
  });
});
