/**
 * A conforming tetrahedral mesh of the spherical shell a ≤ r ≤ R_o, with triangle cells on both
 * boundary spheres.
 *
 * Construction: a geodesic triangulation of the sphere is repeated on `layers + 1` concentric spheres
 * (radii in geometric progression, so cells keep their shape as they grow), each triangle between two
 * spheres spans a prism, and each prism is split into three tetrahedra. Each side quadrilateral of a
 * prism is cut along the diagonal through its lowest-numbered node; the two prisms sharing that
 * quadrilateral therefore cut it alike, and that rule always admits a three-tetrahedron split. Result:
 * no hanging faces and no mismatched face diagonals.
 */
import { CellType } from '../model/cellTypes.ts';
import type { Piece } from '../model/piece.ts';
import { validatePiece } from '../model/validate.ts';
import { geodesicSphere } from './geodesicSphere.ts';

export interface ShellMesh {
  /** Points, tetrahedra, then inner-sphere triangles, then outer-sphere triangles (no fields). */
  piece: Piece;
  /** Cell counts of the three groups, in order. */
  tetrahedra: number; innerTriangles: number; outerTriangles: number;
  /** Points per sphere; point `s + k·pointsPerSphere` is direction `s` on sphere `k` (k = 0 is r = a). */
  pointsPerSphere: number;
  /** Sphere radii (m), `layers + 1` of them. */
  radii: Float64Array;
}

/** Prism node order after moving the lowest-numbered node to local 0 (rotations, and swapping the triangles). */
const PRISM_ROTATIONS = [
  [0, 1, 2, 3, 4, 5], [1, 2, 0, 4, 5, 3], [2, 0, 1, 5, 3, 4],
  [3, 5, 4, 0, 2, 1], [4, 3, 5, 1, 0, 2], [5, 4, 3, 2, 1, 0],
] as const;

/**
 * Mesh of the shell between radii `inner` and `outer` (m), `divisions` per icosahedron edge on each
 * sphere and `layers` cells through the thickness. Boundary triangles are oriented out of the meshed
 * region: towards the centre on the inner sphere, away from it on the outer sphere.
 */
export function shellMesh(inner: number, outer: number, divisions: number, layers: number): ShellMesh {
  if (!(inner > 0) || !(outer > inner)) throw new Error(`shellMesh: need 0 < inner < outer radius, got ${inner}, ${outer}`);
  if (!Number.isInteger(layers) || layers < 1) throw new Error(`shellMesh: layers must be a positive integer, got ${layers}`);
  const sphere = geodesicSphere(divisions);
  const nS = sphere.dirs.length / 3, nT = sphere.triangles.length / 3;
  const radii = new Float64Array(layers + 1);
  for (let k = 0; k <= layers; k++) radii[k] = k === 0 ? inner : k === layers ? outer : inner * (outer / inner) ** (k / layers);
  const points = new Float64Array(3 * nS * (layers + 1));
  for (let k = 0, o = 0; k <= layers; k++) {
    const r = radii[k]!;
    for (let s = 0; s < nS; s++, o += 3) {
      points[o] = r * sphere.dirs[3 * s]!; points[o + 1] = r * sphere.dirs[3 * s + 1]!; points[o + 2] = r * sphere.dirs[3 * s + 2]!;
    }
  }
  const nTet = 3 * nT * layers, nCells = nTet + 2 * nT;
  const cellTypes = new Uint8Array(nCells), offsets = new Int32Array(nCells + 1);
  const connectivity = new Int32Array(4 * nTet + 3 * 2 * nT);
  const prism = new Int32Array(6), q = new Int32Array(6);
  let c = 0, o = 0;
  const emitTet = (a: number, b: number, cc: number, d: number) => {
    if (signedVolume6(points, a, b, cc, d) < 0) { const t = b; b = cc; cc = t; }
    connectivity[o] = a; connectivity[o + 1] = b; connectivity[o + 2] = cc; connectivity[o + 3] = d;
    o += 4; cellTypes[c] = CellType.TETRA; offsets[++c] = o;
  };
  for (let k = 0; k < layers; k++) {
    for (let t = 0; t < nT; t++) {
      for (let v = 0; v < 3; v++) {
        prism[v] = k * nS + sphere.triangles[3 * t + v]!;
        prism[v + 3] = prism[v]! + nS;
      }
      let m = 0;
      for (let v = 1; v < 6; v++) if (prism[v]! < prism[m]!) m = v;
      const rot = PRISM_ROTATIONS[m]!;
      for (let v = 0; v < 6; v++) q[v] = prism[rot[v]!]!;
      // Local 0 is the lowest node, so both side faces through it are cut through it; the opposite side face
      // (1, 2, 5, 4) is cut through its own lowest node.
      if (Math.min(q[1]!, q[5]!) < Math.min(q[2]!, q[4]!)) {
        emitTet(q[0]!, q[1]!, q[2]!, q[5]!); emitTet(q[0]!, q[1]!, q[5]!, q[4]!); emitTet(q[0]!, q[4]!, q[5]!, q[3]!);
      } else {
        emitTet(q[0]!, q[1]!, q[2]!, q[4]!); emitTet(q[0]!, q[4]!, q[2]!, q[5]!); emitTet(q[0]!, q[4]!, q[5]!, q[3]!);
      }
    }
  }
  for (const side of [0, 1]) {
    const base = side === 0 ? 0 : layers * nS;
    for (let t = 0; t < nT; t++) {
      const a = base + sphere.triangles[3 * t]!, b = base + sphere.triangles[3 * t + 1]!, cc = base + sphere.triangles[3 * t + 2]!;
      // The sphere triangulation faces outward; the inner boundary faces the centre.
      connectivity[o] = a; connectivity[o + 1] = side === 0 ? cc : b; connectivity[o + 2] = side === 0 ? b : cc;
      o += 3; cellTypes[c] = CellType.TRIANGLE; offsets[++c] = o;
    }
  }
  const piece: Piece = { points, cellTypes, offsets, connectivity, pointData: [], cellData: [] };
  validatePiece(piece, 'shellMesh');
  return { piece, tetrahedra: nTet, innerTriangles: nT, outerTriangles: nT, pointsPerSphere: nS, radii };
}

/** Six times the signed volume of tetrahedron (a, b, c, d) of an xyz-interleaved point array (m³). */
export function signedVolume6(P: Float64Array, a: number, b: number, c: number, d: number): number {
  const ax = 3 * a, bx = 3 * b, cx = 3 * c, dx = 3 * d;
  const ux = P[bx]! - P[ax]!, uy = P[bx + 1]! - P[ax + 1]!, uz = P[bx + 2]! - P[ax + 2]!;
  const vx = P[cx]! - P[ax]!, vy = P[cx + 1]! - P[ax + 1]!, vz = P[cx + 2]! - P[ax + 2]!;
  const wx = P[dx]! - P[ax]!, wy = P[dx + 1]! - P[ax + 1]!, wz = P[dx + 2]! - P[ax + 2]!;
  return ux * (vy * wz - vz * wy) - uy * (vx * wz - vz * wx) + uz * (vx * wy - vy * wx);
}
