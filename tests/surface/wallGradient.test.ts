import { describe, expect, it } from 'vitest';
import { REFERENCE_NODES } from '../../src/model/cellTypes.ts';
import { pieceFromCells } from '../../src/model/meshBuild.ts';
import { cellVelocityGradient } from '../../src/surface/wallGradient.ts';

// A linear velocity u = A x + b: Green–Gauss on the triangulated cell surface is exact for it on any shape.
// Reference: divergence theorem, ∫_V ∇u dV = ∮ u ⊗ n dA, with a linear integrand integrated exactly per triangle.
const A = [[0.3, -1.2, 0.5], [2.0, 0.1, -0.7], [-0.4, 0.9, 1.1]];
const b = [0.2, -0.3, 0.4];
const lin = (x: number, y: number, z: number) => [0, 1, 2].flatMap((i) => [A[i]![0]! * x + A[i]![1]! * y + A[i]![2]! * z + b[i]!]);

/** Distorts reference nodes with a fixed affine-plus-bump map so cells are irregular (faces may warp). */
function distort(nodes: readonly number[], warp: number): number[] {
  const out: number[] = [];
  for (let i = 0; i < nodes.length; i += 3) {
    const x = nodes[i]!, y = nodes[i + 1]!, z = nodes[i + 2]!;
    out.push(1.3 * x + 0.2 * y + warp * x * y * z, 0.1 * x + 0.9 * y - 0.3 * z, 0.2 * x + 1.1 * z + warp * x * y);
  }
  return out;
}

function gradientOf(type: number, pts: number[], nodes: number[], polyFaces?: number[][]) {
  const n = pts.length / 3, u = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) u.set(lin(pts[3 * i]!, pts[3 * i + 1]!, pts[3 * i + 2]!), 3 * i);
  const piece = pieceFromCells(pts, { types: [type], nodes: [nodes], ...(polyFaces ? { polyFaces: [polyFaces] } : {}) });
  const g = new Float64Array(9);
  const vol = cellVelocityGradient(piece, 0, u, g);
  return { g, vol };
}

describe('cell velocity gradient (Green–Gauss over the triangulated cell surface)', () => {
  for (const [type, name] of [[10, 'tetrahedron'], [12, 'hexahedron (warped faces)'], [11, 'voxel'], [13, 'wedge'], [14, 'pyramid']] as const) {
    it(`is exact for a linear field on a ${name}`, () => {
      const ref = REFERENCE_NODES[type]!;
      const { g, vol } = gradientOf(type, distort(ref, type === 11 ? 0 : 0.25), Array.from({ length: ref.length / 3 }, (_, i) => i));
      expect(vol).toBeGreaterThan(0);
      for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) expect(g[3 * i + j]).toBeCloseTo(A[i]![j]!, 12);
    });
  }

  it('is exact on an inverted hexahedron and on a polyhedron with an inward face; volume 1 for the unit cube', () => {
    const ref = REFERENCE_NODES[12]!;
    const inverted = gradientOf(12, ref.map((v, i) => (i % 3 === 0 ? -v : v)), [0, 1, 2, 3, 4, 5, 6, 7]);
    expect(inverted.vol).toBeCloseTo(1, 14);
    for (let i = 0; i < 9; i++) expect(inverted.g[i]).toBeCloseTo(A[Math.floor(i / 3)]![i % 3]!, 12);
    const faces = [[0, 3, 2, 1], [4, 5, 6, 7], [0, 4, 5, 1], [1, 2, 6, 5], [2, 3, 7, 6], [3, 0, 4, 7]];
    const poly = gradientOf(42, [...ref], [0, 1, 2, 3, 4, 5, 6, 7], faces);
    expect(poly.vol).toBeCloseTo(1, 14);
    for (let i = 0; i < 9; i++) expect(poly.g[i]).toBeCloseTo(A[Math.floor(i / 3)]![i % 3]!, 12);
  });
});
