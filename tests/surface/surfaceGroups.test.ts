import { describe, expect, it } from 'vitest';
import { datasetOf, field, hexGrid, pieceFromCells } from '../../src/model/meshBuild.ts';
import { sphereCase, sphereExact } from '../../src/samples/sphere.ts';
import { boundaryFaces } from '../../src/surface/boundaryFaces.ts';
import { facesByGroup, facesOfGroups, renameGroups, resolveGroups, surfaceGroups } from '../../src/surface/surfaceGroups.ts';

describe('feature-angle parts', () => {
  // Reference: geometry of the unit cube: six unit faces at 90° to each other.
  it('a cube splits into its six sides, ranked by centroid x, y, z, with area 1 and the side centres', () => {
    const d = datasetOf([hexGrid(3, 3, 3)]);
    const faces = boundaryFaces(d), g = surfaceGroups(d, faces);
    expect(g.groups.map((x) => x.id)).toEqual([0, 1, 2, 3, 4, 5]);
    expect(g.groups.map((x) => x.name)).toEqual(['part 0', 'part 1', 'part 2', 'part 3', 'part 4', 'part 5']);
    // Ranked by centroid x, then y, then z.
    const want = [[0, 0.5, 0.5], [0.5, 0, 0.5], [0.5, 0.5, 0], [0.5, 0.5, 1], [0.5, 1, 0.5], [1, 0.5, 0.5]];
    g.groups.forEach((x, i) => x.centroid.forEach((v, k) => expect(v).toBeCloseTo(want[i]![k]!, 14)));
    for (const x of g.groups) {
      expect(x.faces).toBe(9);
      expect(x.area).toBeCloseTo(1, 14);
      expect(x.source).toBe('feature-angle');
    }
    expect(g.groups[3]!.bounds).toEqual([0, 1, 0, 1, 1, 1]);
  });

  it('a feature angle above 90° keeps the cube whole; the same file always gives the same ids', () => {
    const d = datasetOf([hexGrid(2, 2, 2)]);
    const faces = boundaryFaces(d);
    expect(surfaceGroups(d, faces, { featureAngle: 91 }).groups.length).toBe(1);
    const a = surfaceGroups(d, faces), b = surfaceGroups(d, boundaryFaces(d));
    expect(Array.from(a.faceGroup)).toEqual(Array.from(b.faceGroup));
  });

  it('a faceted sphere with no group array stays one part at the default angle', () => {
    const d = sphereCase({ refinement: 0 });
    const faces = boundaryFaces(d);
    const g = surfaceGroups(d, faces, { groupArray: false });
    // Two parts: the wall and the outer sphere (not connected).
    expect(g.groups.length).toBe(2);
    expect(g.groups.every((x) => x.source === 'feature-angle')).toBe(true);
  });
});

describe('groups from the file', () => {
  // Reference: sphere sample (src/samples/sphere.ts): Int32 cell array `group`, 1 on the wall triangles, 2 outside;
  // wall area → 4πa² as the mesh is refined (sphere geometry).
  it('the 2D cells\' group array names the boundary faces: ids = array values', () => {
    const d = sphereCase({ refinement: 1 }), e = sphereExact({ refinement: 1 });
    const faces = boundaryFaces(d), g = surfaceGroups(d, faces);
    expect(g.groupArray).toBe('group');
    expect(g.groups.map((x) => [x.id, x.name, x.source])).toEqual([[1, 'group 1', 'cell-array'], [2, 'group 2', 'cell-array']]);
    expect(g.groups[0]!.area / (4 * Math.PI * e.a ** 2)).toBeGreaterThan(0.99);
    expect(g.groups[0]!.area / (4 * Math.PI * e.a ** 2)).toBeLessThan(1);
    expect(g.unmatched2d).toBe(0);
    // Every boundary face knows its file triangle, for cell data on walls.
    expect(Array.from(g.faceSurfaceCell).every((c) => c >= 0)).toBe(true);
    expect(Math.hypot(...g.groups[0]!.centroid)).toBeLessThan(1e-15);
  });

  it('faces no 2D cell covers become feature parts with ids after the largest group value', () => {
    // The unit cube as two hexahedra along x: one quad with zone 7 covers the x = 0 side only (a 2D cell must
    // have the face's nodes); the other five sides become parts 8 … 12.
    const piece = hexGrid(2, 1, 1);
    const pts = Array.from(piece.points);
    const nodes = [...Array.from({ length: 2 }, (_, c) => Array.from(piece.connectivity.subarray(8 * c, 8 * c + 8))), [0, 3, 9, 6], [0, 1, 4]];
    const types = [12, 12, 9, 5];
    const d = datasetOf([pieceFromCells(pts, { types, nodes }, { cellData: [{ ...field('zone', 'cell', 1, Int32Array.from([0, 0, 7, 7])), sourceType: 'Int32' }] })]);
    const faces = boundaryFaces(d), g = surfaceGroups(d, faces);
    expect(g.groupArray).toBe('zone');
    expect(g.groups[0]!).toMatchObject({ id: 7, name: 'zone 7', faces: 1 });
    expect(g.groups[0]!.area).toBeCloseTo(1, 14);
    expect(g.groups.slice(1).map((x) => x.id)).toEqual([8, 9, 10, 11, 12]);
    for (const x of g.groups.slice(1)) expect(x.area).toBeCloseTo(1, 14);
    // The triangle (0, 1, 4) is half of a boundary quad: it matches no face and is counted, not forced in.
    expect(g.unmatched2d).toBe(1);
  });

  it('a separate surface file groups the faces it matches by coordinates (within tolerance)', () => {
    const d = datasetOf([hexGrid(2, 2, 2)]);
    const faces = boundaryFaces(d);
    // The z = 1 side as four quads with group value 3, coordinates off by 1e-9.
    const pts = [0, 0, 1, 0.5, 0, 1, 1, 0, 1, 0, 1, 1, 0.5, 1, 1, 1, 1, 1, 0, 0.5, 1, 0.5, 0.5, 1, 1, 0.5, 1].map((v) => v + 1e-9);
    const surfPieces = [pieceFromCells(pts, { types: [9, 9, 9, 9], nodes: [[0, 1, 7, 6], [1, 2, 8, 7], [6, 7, 4, 3], [7, 8, 5, 4]] },
      { cellData: [{ ...field('patch', 'cell', 1, Int32Array.from([3, 3, 3, 3])), sourceType: 'Int32' }] })];
    const surface = datasetOf(surfPieces, 'lid.vtp', 'polydata');
    const g = surfaceGroups(d, faces, { surface });
    expect(g.groups[0]).toMatchObject({ id: 3, name: 'patch 3', source: 'surface-file', faces: 4 });
    expect(g.groups[0]!.area).toBeCloseTo(1, 14);
    expect(g.unmatched2d).toBe(0);
    expect(g.groups.length).toBe(6);
  });
});

describe('naming, lookup and merging', () => {
  it('renames by id or name, resolves references, merges groups for a total', () => {
    const d = sphereCase({ refinement: 0 });
    const faces = boundaryFaces(d), g0 = surfaceGroups(d, faces);
    const g = renameGroups(g0, { 1: 'bead wall', 'group 2': 'far field' });
    expect(g.groups.map((x) => x.name)).toEqual(['bead wall', 'far field']);
    expect(g0.groups[0]!.name).toBe('group 1');
    expect(resolveGroups(g, ['bead wall'])).toEqual([0]);
    expect(resolveGroups(g, ['2', 'bead wall'])).toEqual([1, 0]);
    expect(() => resolveGroups(g, ['wing'])).toThrow(/no surface group "wing" \(known: 1 "bead wall", 2 "far field"\)/);
    const both = facesOfGroups(g, [0, 1]);
    expect(both.length).toBe(faces.count);
    const by = facesByGroup(g);
    expect(by[0]!.length + by[1]!.length).toBe(faces.count);
    expect(Array.from(facesOfGroups(g, [1]))).toEqual(Array.from(by[1]!));
  });

  it('a named group array that is missing or not integer-valued is an error naming it', () => {
    const d = sphereCase({ refinement: 0 });
    const faces = boundaryFaces(d);
    expect(() => surfaceGroups(d, faces, { groupArray: 'nope' })).toThrow(/group array "nope" is not a one-component cell array/);
    const p = d.pieces[0]!;
    const bad = datasetOf([{ ...p, cellData: [field('frac', 'cell', 1, new Float64Array(p.cellTypes.length).fill(0.5))] }]);
    expect(() => surfaceGroups(bad, boundaryFaces(bad), { groupArray: 'frac' })).toThrow(/group array "frac" holds 0.5 at cell/);
  });
});
