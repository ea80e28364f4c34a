/**
 * The velocity gradient in a wall-adjacent cell, for the viscous traction τ·n when a file stores no wall
 * shear stress.
 *
 * Method: Green–Gauss over the cell's triangulated faces, ∇u = (1/V) ∮ u ⊗ n dA, with the point velocities
 * linear on each triangle (faces with more than three nodes are fanned around their vertex average, whose
 * value is the nodes' average) and the volume from the same triangulated surface, V = (1/3) ∮ x·n dA. Both
 * integrals are exact for a linear field on the closed triangulated surface, so the gradient is exact for a
 * linear velocity on any cell shape (tetrahedron to polyhedron). For a curved profile it is the cell mean,
 * first-order accurate at the wall.
 *
 * Faces of fixed-size types come from the type tables (an inverted cell flips V and the surface integral
 * together, so the ratio is still right); polyhedron faces are turned outward one by one against the cell's
 * vertex average, as in boundary extraction.
 */
import { FACE_TABLE } from '../model/cellTypes.ts';
import type { NumericArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';

let ids = new Int32Array(64);

/**
 * Writes ∂u_i/∂x_j of cell `c` of `p` into `out[3i + j]` (velocity unit per length unit) from the point
 * velocity `u` (3 components per point of `p`). Returns the cell volume (length unit³, > 0), or 0 for a
 * degenerate cell, in which case `out` is zeros.
 */
export function cellVelocityGradient(p: Piece, c: number, u: NumericArray, out: Float64Array): number {
  const pts = p.points, conn = p.connectivity, o = p.offsets[c]!, nc = p.offsets[c + 1]! - o, t = p.cellTypes[c]!;
  let ox = 0, oy = 0, oz = 0;
  for (let j = 0; j < nc; j++) { const q = 3 * conn[o + j]!; ox += pts[q]!; oy += pts[q + 1]!; oz += pts[q + 2]!; }
  ox /= nc; oy /= nc; oz /= nc;
  out.fill(0);
  let vol = 0;
  const poly = t === 42;
  const fa = poly ? p.polyFaces!.cellFaceStart[c]! : FACE_TABLE.start[t]!;
  const fb = poly ? p.polyFaces!.cellFaceStart[c + 1]! : FACE_TABLE.start[t + 1]!;
  for (let f = fa; f < fb; f++) {
    let m: number;
    if (poly) {
      const pf = p.polyFaces!, a = pf.faceOffsets[f]!;
      m = pf.faceOffsets[f + 1]! - a;
      if (ids.length < m) ids = new Int32Array(2 * m);
      for (let j = 0; j < m; j++) ids[j] = pf.faceConnectivity[a + j]!;
    } else {
      m = FACE_TABLE.size[f]!;
      const q = FACE_TABLE.first[f]!;
      for (let j = 0; j < m; j++) ids[j] = conn[o + FACE_TABLE.nodes[q + j]!]!;
    }
    vol += faceContribution(pts, u, ids, m, ox, oy, oz, poly, out);
  }
  if (!(Math.abs(vol) > 0)) { out.fill(0); return 0; }
  for (let i = 0; i < 9; i++) out[i] = out[i]! / vol;
  return Math.abs(vol);
}

/**
 * Adds ∮ u ⊗ n dA of one face into `g` and returns its (1/3)∮ x·n dA, coordinates relative to the cell
 * centre (ox, oy, oz). With `orient`, a face pointing towards the centre is counted reversed.
 */
function faceContribution(pts: Float64Array, u: NumericArray, ids: Int32Array, m: number,
  ox: number, oy: number, oz: number, orient: boolean, g: Float64Array): number {
  let cx = 0, cy = 0, cz = 0, cu = 0, cv = 0, cw = 0;
  for (let j = 0; j < m; j++) {
    const q = ids[j]!;
    cx += pts[3 * q]! - ox; cy += pts[3 * q + 1]! - oy; cz += pts[3 * q + 2]! - oz;
    cu += u[3 * q]!; cv += u[3 * q + 1]!; cw += u[3 * q + 2]!;
  }
  cx /= m; cy /= m; cz /= m; cu /= m; cv /= m; cw /= m;
  // Accumulate per face first, so a face found inward can be reversed as a whole.
  let g0 = 0, g1 = 0, g2 = 0, g3 = 0, g4 = 0, g5 = 0, g6 = 0, g7 = 0, g8 = 0, v = 0, sx = 0, sy = 0, sz = 0;
  const tris = m === 3 ? 1 : m;
  for (let k = 0; k < tris; k++) {
    let ax: number, ay: number, az: number, au: number, av: number, aw: number;
    let i1: number, i2: number;
    if (m === 3) {
      const i0 = ids[0]!;
      ax = pts[3 * i0]! - ox; ay = pts[3 * i0 + 1]! - oy; az = pts[3 * i0 + 2]! - oz;
      au = u[3 * i0]!; av = u[3 * i0 + 1]!; aw = u[3 * i0 + 2]!;
      i1 = ids[1]!; i2 = ids[2]!;
    } else {
      ax = cx; ay = cy; az = cz; au = cu; av = cv; aw = cw;
      i1 = ids[k]!; i2 = ids[k + 1 === m ? 0 : k + 1]!;
    }
    const bx = pts[3 * i1]! - ox, by = pts[3 * i1 + 1]! - oy, bz = pts[3 * i1 + 2]! - oz;
    const ex = pts[3 * i2]! - ox, ey = pts[3 * i2 + 1]! - oy, ez = pts[3 * i2 + 2]! - oz;
    const ux = bx - ax, uy = by - ay, uz = bz - az, wx = ex - ax, wy = ey - ay, wz = ez - az;
    const nx = 0.5 * (uy * wz - uz * wy), ny = 0.5 * (uz * wx - ux * wz), nz = 0.5 * (ux * wy - uy * wx);
    const mu = (au + u[3 * i1]! + u[3 * i2]!) / 3, mv = (av + u[3 * i1 + 1]! + u[3 * i2 + 1]!) / 3;
    const mw = (aw + u[3 * i1 + 2]! + u[3 * i2 + 2]!) / 3;
    g0 += mu * nx; g1 += mu * ny; g2 += mu * nz;
    g3 += mv * nx; g4 += mv * ny; g5 += mv * nz;
    g6 += mw * nx; g7 += mw * ny; g8 += mw * nz;
    v += ((ax + bx + ex) * nx + (ay + by + ey) * ny + (az + bz + ez) * nz) / 9;
    sx += nx; sy += ny; sz += nz;
  }
  const sign = orient && sx * cx + sy * cy + sz * cz < 0 ? -1 : 1;
  g[0] += sign * g0; g[1] += sign * g1; g[2] += sign * g2;
  g[3] += sign * g3; g[4] += sign * g4; g[5] += sign * g5;
  g[6] += sign * g6; g[7] += sign * g7; g[8] += sign * g8;
  return sign * v;
}
