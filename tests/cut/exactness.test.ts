/**
 * Exactness of the cut and its integrals on meshes where the answer is known: the mesh fills a skewed,
 * rotated box, so every cut is the box's section polygon (computed independently in `meshes.ts`).
 * Reference: elementary geometry — ∫f dA over a polygon for f linear is area × f(centroid); for the
 * quadratic and cubic integrands, Gauss–Legendre on collapsed squares (exact to degree 6) over the same polygon.
 */
import { describe, expect, it } from 'vitest';
import { cutPlane } from '../../src/cut/cutPlane.ts';
import { integrateSurface } from '../../src/cut/integrals.ts';
import { datasetOf, field, pieceFromCells, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { SKEW, boxCorners, boxMesh, polygonIntegral, rng, sectionPolygon, setArea, type BoxKind, type V3 } from './meshes.ts';

const lin = (x: number, y: number, z: number) => 1.5 + 0.7 * x - 2.1 * y + 0.9 * z;
const vel = (x: number, y: number, z: number): V3 => [0.3 + 0.2 * x - 0.1 * z, -0.4 + 0.5 * y + 0.3 * x, 1.1 + 0.4 * x - 0.6 * y + 0.2 * z];

function withLinearFields(p: Piece): Piece {
  return withFields(p, [
    pointFieldFrom(p, 'phi', 1, (x, y, z, o) => { o[0] = lin(x, y, z); }),
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o.set(vel(x, y, z)); }),
  ], [field('one', 'cell', 1, new Float64Array(p.cellTypes.length).fill(2.5))]);
}

/** Planes through the box: random unit normals through random interior points (fixed seed). */
function planes(count: number, seed: number): { o: V3; n: V3 }[] {
  const r = rng(seed), out: { o: V3; n: V3 }[] = [];
  for (let i = 0; i < count; i++) {
    const u: V3 = [0.25 + 0.5 * r(), 0.25 + 0.5 * r(), 0.25 + 0.5 * r()];
    const o: V3 = [
      SKEW.m[0]! * u[0] + SKEW.m[1]! * u[1] + SKEW.m[2]! * u[2] + SKEW.t[0],
      SKEW.m[3]! * u[0] + SKEW.m[4]! * u[1] + SKEW.m[5]! * u[2] + SKEW.t[1],
      SKEW.m[6]! * u[0] + SKEW.m[7]! * u[1] + SKEW.m[8]! * u[2] + SKEW.t[2],
    ];
    out.push({ o, n: [r() - 0.5, r() - 0.5, r() - 0.5] });
  }
  return out;
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

function checkMesh(pieces: Piece[], label: string): void {
  const d = datasetOf(pieces, label);
  const box = boxCorners(SKEW);
  for (const { o, n } of planes(6, label.length * 17 + 3)) {
    const poly = sectionPolygon(box, o, n);
    const refA = polygonIntegral(poly, () => 1);
    const cut = cutPlane(d, o, n);
    expect(cut.empty).toBe(false);
    expect(rel(setArea(cut.positions, cut.indices), refA)).toBeLessThan(1e-12);
    const r = integrateSurface(cut, { density: 1.2 });
    expect(rel(r.area!, refA)).toBeLessThan(1e-12);
    const len = Math.hypot(...n), nu: V3 = [n[0] / len, n[1] / len, n[2] / len];
    const refPhi = polygonIntegral(poly, lin);
    expect(rel(r.integral.phi as number, refPhi)).toBeLessThan(1e-12);
    expect(rel(r.integral.one as number, 2.5 * refA)).toBeLessThan(1e-12);
    for (let c = 0; c < 3; c++) {
      const ref = polygonIntegral(poly, (x, y, z) => vel(x, y, z)[c]!);
      expect(Math.abs((r.integral.velocity as number[])[c]! - ref)).toBeLessThan(1e-12 * Math.max(Math.abs(ref), refA));
      const cen = polygonIntegral(poly, (x, y, z) => [x, y, z][c]!) / refA;
      expect(Math.abs(r.centroid![c]! - cen)).toBeLessThan(1e-12 * Math.max(1, Math.abs(cen)));
    }
    // Q = ∫u·n dA (linear); mass-flow-weighted mean of a quadratic quantity (φ·u_n is cubic in the numerator).
    const un = (x: number, y: number, z: number) => { const u = vel(x, y, z); return u[0] * nu[0] + u[1] * nu[1] + u[2] * nu[2]; };
    const refQ = polygonIntegral(poly, un);
    expect(rel(r.volumeFlowRate!, refQ)).toBeLessThan(1e-12);
    const refU2 = polygonIntegral(poly, (x, y, z) => { const u = vel(x, y, z); return un(x, y, z) * (u[0] ** 2 + u[1] ** 2 + u[2] ** 2); }) / refQ;
    expect(rel(r.massFlowMean.phi as number, polygonIntegral(poly, (x, y, z) => un(x, y, z) * lin(x, y, z)) / refQ)).toBeLessThan(1e-12);
    // Total pressure with the linear φ as the pressure: p₀ = φ + ½ρ|u|²; its mass-flow mean is ∫ρu_n p₀ / ṁ.
    const t = integrateSurface(cut, { density: 1.2, pressure: 'phi' });
    const refP0m = polygonIntegral(poly, (x, y, z) => un(x, y, z) * lin(x, y, z)) / refQ + 0.6 * refU2;
    expect(rel(t.totalPressure!.massFlowMean!, refP0m)).toBeLessThan(1e-12);
  }
}

describe('a field linear in x, y, z integrates exactly on every cell type (skewed, rotated, warped cells)', () => {
  // Reference: ∫ over the box's section polygon, computed independently (meshes.ts).
  const kinds: BoxKind[] = ['tet', 'hex', 'wedge', 'pyramid', 'polyhedron'];
  for (const kind of kinds) {
    it(`${kind}: area, ∫φ, ∫u, centroid, Q and mass-flow means match the section polygon to 1e-12`, () => {
      const p = withLinearFields(boxMesh(kind, 3, 4, 3, 0.35, SKEW));
      checkMesh([p], `${kind} mesh`);
    });
  }

  it('voxels (axis-aligned, unit cube) and hexagonal/pentagonal prisms by the same loop', () => {
    const d = datasetOf([withLinearFields(boxMesh('voxel', 3, 3, 3))]);
    const cut = cutPlane(d, [0.4, 0.5, 0.6], [0.3, -0.2, 1]);
    const poly = sectionPolygon(boxCorners(), [0.4, 0.5, 0.6], [0.3, -0.2, 1]);
    expect(rel(setArea(cut.positions, cut.indices), polygonIntegral(poly, () => 1))).toBeLessThan(1e-12);
    // A hexagonal prism (type 16) and a pentagonal prism (type 15), each alone: their sections are convex polygons.
    for (const m of [5, 6]) {
      const pts: number[] = [];
      for (const z of [0, 1]) for (let i = 0; i < m; i++) pts.push(Math.cos((2 * Math.PI * i) / m), Math.sin((2 * Math.PI * i) / m), z + 0.2 * Math.cos((2 * Math.PI * i) / m));
      const prism = withLinearFields(boxPrism(pts, m));
      const o: V3 = [0.1, -0.2, 0.5], n: V3 = [0.2, 0.1, 1];
      const corners = Array.from({ length: 2 * m }, (_, i) => [pts[3 * i]!, pts[3 * i + 1]!, pts[3 * i + 2]!] as V3);
      const edges: [number, number][] = [];
      for (let i = 0; i < m; i++) edges.push([i, (i + 1) % m], [m + i, m + ((i + 1) % m)], [i, m + i]);
      const polyP = sectionPolygon({ corners, edges }, o, n);
      const r = integrateSurface(cutPlane(datasetOf([prism]), o, n), { density: 1 });
      expect(rel(r.area!, polygonIntegral(polyP, () => 1))).toBeLessThan(1e-12);
      expect(rel(r.integral.phi as number, polygonIntegral(polyP, lin))).toBeLessThan(1e-12);
    }
  });

  it('a mixed mesh over several pieces (hexahedra, wedges, pyramids, polyhedra, tetrahedra) integrates exactly', () => {
    // Planar faces (affine map, no jitter) so the tetrahedra's split faces meet their neighbours' quads exactly.
    const pieces = (['hex', 'wedge', 'pyramid', 'polyhedron', 'tet'] as BoxKind[]).map((k, i) => {
      const slab = { m: SKEW.m.map((v, j) => (j % 3 === 0 ? v / 5 : v)), t: [0, 0, 0] as V3 };
      // Slab i covers x ∈ [i/5, (i+1)/5] of the unit cube before the skew.
      slab.t = [SKEW.m[0]! * i / 5 + SKEW.t[0], SKEW.m[3]! * i / 5 + SKEW.t[1], SKEW.m[6]! * i / 5 + SKEW.t[2]];
      return withLinearFields(boxMesh(k, 1, 3, 3, 0, slab));
    });
    checkMesh(pieces, 'mixed five-piece mesh');
  });
});

/** One pentagonal (m = 5) or hexagonal (m = 6) prism cell. */
function boxPrism(pts: number[], m: number): Piece {
  return pieceFromCells(pts, { types: [m === 5 ? 15 : 16], nodes: [Array.from({ length: 2 * m }, (_, i) => i)] });
}
