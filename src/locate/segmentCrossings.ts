/**
 * Where a segment A→B crosses the faces of the mesh's volume cells, as parameters τ in [0, 1]
 * (point = A + τ(B − A)), so a line probe can sample at the mesh's own resolution.
 *
 * Candidate cells come from the cell tree (boxes the segment meets). Faces come from the cell-type face
 * table (polyhedra: their face stream) and are intersected exactly:
 *  - triangles: Möller–Trumbore (a 3×3 solve);
 *  - quadrilateral faces of hexahedra, voxels, wedges and pyramids: the face of the isoparametric cell is
 *    the bilinear patch P(u,v) = (1−u)(1−v)p0 + u(1−v)p1 + uv·p2 + (1−u)v·p3; the segment is written as
 *    the meet of two planes that contain it, which turns P(u,v) on both planes into a quadratic in v
 *    (solved in closed form, the stable root formula) and a linear equation for u. This is exact up to
 *    rounding, and it reduces to the plane intersection when the quad is flat;
 *  - faces of polyhedra and of pentagonal/hexagonal prisms with four or more points: fanned into triangles
 *    around the face's centre (mean of its points), as point location splits those cells.
 * The result is sorted, holds A and B (τ = 0 and 1), and merges parameters closer than MERGE.
 */
import { cellDimension, CellType, FACE_TABLE } from '../model/cellTypes.ts';
import { pieceOfCell } from '../model/dataset.ts';
import { cellsAlongSegment, type CellTree } from './cellTree.ts';

/** Crossings closer than this (in τ, i.e. relative to the segment length) are merged into one. */
export const MERGE = 1e-9;
/** Slack on the face parameters (u, v) so a segment through a shared edge is caught by at least one face. */
const EDGE_SLACK = 1e-9;

let taus = new Float64Array(256);
let nTau = 0;

function push(t: number): void {
  if (t < -EDGE_SLACK || t > 1 + EDGE_SLACK) return;
  if (nTau === taus.length) { const b = new Float64Array(2 * taus.length); b.set(taus); taus = b; }
  taus[nTau++] = t < 0 ? 0 : t > 1 ? 1 : t;
}

/**
 * Sorted, merged crossing parameters of the segment (ax, ay, az) → (bx, by, bz) with the faces of every
 * volume cell, including 0 and 1. Returns a subarray of a module buffer, valid until the next call.
 */
export function segmentCrossings(tree: CellTree, ax: number, ay: number, az: number,
  bx: number, by: number, bz: number): Float64Array {
  nTau = 0;
  push(0); push(1);
  const dx = bx - ax, dy = by - ay, dz = bz - az;
  const dd = dx * dx + dy * dy + dz * dz;
  // Two unit normals perpendicular to the segment: the planes whose meet is the segment's line.
  const ux = Math.abs(dx), uy = Math.abs(dy), uz = Math.abs(dz);
  let e1x = 0, e1y = 0, e1z = 0;
  if (ux <= uy && ux <= uz) { e1y = dz; e1z = -dy; } else if (uy <= uz) { e1x = -dz; e1z = dx; } else { e1x = dy; e1y = -dx; }
  const l1 = Math.hypot(e1x, e1y, e1z);
  e1x /= l1; e1y /= l1; e1z /= l1;
  let e2x = dy * e1z - dz * e1y, e2y = dz * e1x - dx * e1z, e2z = dx * e1y - dy * e1x;
  const l2 = Math.hypot(e2x, e2y, e2z);
  e2x /= l2; e2y /= l2; e2z /= l2;

  const cells = cellsAlongSegment(tree, ax, ay, az, bx, by, bz);
  const pieces = tree.dataset.pieces, starts = tree.starts;
  for (let q = 0; q < cells.length; q++) {
    const g = cells[q]!;
    const k = pieces.length === 1 ? 0 : pieceOfCell(starts, g);
    const p = pieces[k]!, c = g - starts[k]!, type = p.cellTypes[c]!;
    if (cellDimension(type) !== 3) continue;
    const pts = p.points, conn = p.connectivity, base = p.offsets[c]!;
    if (type === CellType.POLYHEDRON) {
      const pf = p.polyFaces!;
      for (let f = pf.cellFaceStart[c]!, fe = pf.cellFaceStart[c + 1]!; f < fe; f++) {
        polygon(pts, pf.faceConnectivity, pf.faceOffsets[f]!, pf.faceOffsets[f + 1]! - pf.faceOffsets[f]!, null, 0, ax, ay, az, dx, dy, dz);
      }
      continue;
    }
    const fan = type === CellType.PENTAGONAL_PRISM || type === CellType.HEXAGONAL_PRISM;
    for (let f = FACE_TABLE.start[type]!, fe = FACE_TABLE.start[type + 1]!; f < fe; f++) {
      const size = FACE_TABLE.size[f]!, first = FACE_TABLE.first[f]!;
      if (fan || size > 4) { polygon(pts, FACE_TABLE.nodes, first, size, conn, base, ax, ay, az, dx, dy, dz); continue; }
      const i0 = 3 * conn[base + FACE_TABLE.nodes[first]!]!, i1 = 3 * conn[base + FACE_TABLE.nodes[first + 1]!]!;
      const i2 = 3 * conn[base + FACE_TABLE.nodes[first + 2]!]!;
      if (size === 3) {
        triangle(pts[i0]!, pts[i0 + 1]!, pts[i0 + 2]!, pts[i1]!, pts[i1 + 1]!, pts[i1 + 2]!, pts[i2]!, pts[i2 + 1]!, pts[i2 + 2]!, ax, ay, az, dx, dy, dz);
      } else {
        const i3 = 3 * conn[base + FACE_TABLE.nodes[first + 3]!]!;
        bilinear(pts, i0, i1, i2, i3, ax, ay, az, dx, dy, dz, dd, e1x, e1y, e1z, e2x, e2y, e2z);
      }
    }
  }
  const sorted = taus.subarray(0, nTau).sort();
  let m = 0;
  for (let i = 0; i < sorted.length; i++) {
    if (m > 0 && sorted[i]! - sorted[m - 1]! <= MERGE) continue;
    sorted[m++] = sorted[i]!;
  }
  // Keep the end point exactly 1 after merging.
  if (m > 1 && sorted[m - 1]! < 1) { if (1 - sorted[m - 1]! <= MERGE) sorted[m - 1] = 1; }
  return sorted.subarray(0, m);
}

/**
 * A polygon face with `size` points: `ids[first..first+size-1]`, mapped through `conn[base + id]` when
 * `conn` is given (face-table faces) or used as point numbers directly (polyhedron face stream).
 * Triangles as they are; larger faces fanned around their centre.
 */
function polygon(pts: Float64Array, ids: Int32Array, first: number, size: number, conn: Int32Array | null, base: number,
  ax: number, ay: number, az: number, dx: number, dy: number, dz: number): void {
  if (size === 3) {
    const a = at(ids, first, conn, base), b = at(ids, first + 1, conn, base), c = at(ids, first + 2, conn, base);
    triangle(pts[a]!, pts[a + 1]!, pts[a + 2]!, pts[b]!, pts[b + 1]!, pts[b + 2]!, pts[c]!, pts[c + 1]!, pts[c + 2]!, ax, ay, az, dx, dy, dz);
    return;
  }
  let cx = 0, cy = 0, cz = 0;
  for (let q = 0; q < size; q++) { const i = at(ids, first + q, conn, base); cx += pts[i]!; cy += pts[i + 1]!; cz += pts[i + 2]!; }
  cx /= size; cy /= size; cz /= size;
  for (let q = 0; q < size; q++) {
    const a = at(ids, first + q, conn, base), b = at(ids, first + ((q + 1) % size), conn, base);
    triangle(pts[a]!, pts[a + 1]!, pts[a + 2]!, pts[b]!, pts[b + 1]!, pts[b + 2]!, cx, cy, cz, ax, ay, az, dx, dy, dz);
  }
}

/** Coordinate offset of polygon entry `q`: through the cell's connectivity for face-table faces. */
function at(ids: Int32Array, q: number, conn: Int32Array | null, base: number): number {
  return 3 * (conn ? conn[base + ids[q]!]! : ids[q]!);
}

/** Möller–Trumbore: pushes τ where A + τD meets the triangle (p, q, r), edges included within EDGE_SLACK. */
function triangle(px: number, py: number, pz: number, qx: number, qy: number, qz: number, rx: number, ry: number, rz: number,
  ax: number, ay: number, az: number, dx: number, dy: number, dz: number): void {
  const e1x = qx - px, e1y = qy - py, e1z = qz - pz;
  const e2x = rx - px, e2y = ry - py, e2z = rz - pz;
  const hx = dy * e2z - dz * e2y, hy = dz * e2x - dx * e2z, hz = dx * e2y - dy * e2x;
  const det = e1x * hx + e1y * hy + e1z * hz;
  const scale = Math.hypot(e1x, e1y, e1z) * Math.hypot(e2x, e2y, e2z) * Math.hypot(dx, dy, dz);
  // A segment parallel to the face meets it only along a line; the neighbouring faces give those crossings.
  if (!(Math.abs(det) > 1e-13 * scale)) return;
  const inv = 1 / det;
  const sx = ax - px, sy = ay - py, sz = az - pz;
  const u = (sx * hx + sy * hy + sz * hz) * inv;
  if (u < -EDGE_SLACK || u > 1 + EDGE_SLACK) return;
  const qx2 = sy * e1z - sz * e1y, qy2 = sz * e1x - sx * e1z, qz2 = sx * e1y - sy * e1x;
  const v = (dx * qx2 + dy * qy2 + dz * qz2) * inv;
  if (v < -EDGE_SLACK || u + v > 1 + EDGE_SLACK) return;
  push((e2x * qx2 + e2y * qy2 + e2z * qz2) * inv);
}

/**
 * The segment against the bilinear patch through points i0, i1, i2, i3 (coordinate offsets into `pts`,
 * cyclic order). (e1, e2): unit normals of two planes containing the segment's line.
 */
function bilinear(pts: Float64Array, i0: number, i1: number, i2: number, i3: number,
  ax: number, ay: number, az: number, dx: number, dy: number, dz: number, dd: number,
  e1x: number, e1y: number, e1z: number, e2x: number, e2y: number, e2z: number): void {
  const p0x = pts[i0]!, p0y = pts[i0 + 1]!, p0z = pts[i0 + 2]!;
  // P(u,v) = a + u·b + v·c + uv·d.
  const axx = p0x - ax, axy = p0y - ay, axz = p0z - az;
  const bx = pts[i1]! - p0x, by = pts[i1 + 1]! - p0y, bz = pts[i1 + 2]! - p0z;
  const cx = pts[i3]! - p0x, cy = pts[i3 + 1]! - p0y, cz = pts[i3 + 2]! - p0z;
  const qx = p0x - pts[i1]! + pts[i2]! - pts[i3]!, qy = p0y - pts[i1 + 1]! + pts[i2 + 1]! - pts[i3 + 1]!, qz = p0z - pts[i1 + 2]! + pts[i2 + 2]! - pts[i3 + 2]!;
  const A1 = e1x * axx + e1y * axy + e1z * axz, B1 = e1x * bx + e1y * by + e1z * bz;
  const C1 = e1x * cx + e1y * cy + e1z * cz, D1 = e1x * qx + e1y * qy + e1z * qz;
  const A2 = e2x * axx + e2y * axy + e2z * axz, B2 = e2x * bx + e2y * by + e2z * bz;
  const C2 = e2x * cx + e2y * cy + e2z * cz, D2 = e2x * qx + e2y * qy + e2z * qz;
  // (A2 + vC2)(B1 + vD1) − (A1 + vC1)(B2 + vD2) = 0.
  const qa = C2 * D1 - C1 * D2, qb = A2 * D1 + C2 * B1 - A1 * D2 - C1 * B2, qc = A2 * B1 - A1 * B2;
  const size = Math.abs(qa) + Math.abs(qb) + Math.abs(qc);
  if (size === 0) return;
  if (Math.abs(qa) <= 1e-14 * size) {
    if (Math.abs(qb) <= 1e-14 * size) return;
    patchRoot(-qc / qb, dx, dy, dz, dd, axx, axy, axz, bx, by, bz, cx, cy, cz, qx, qy, qz, A1, B1, C1, D1, A2, B2, C2, D2);
    return;
  }
  const disc = qb * qb - 4 * qa * qc;
  if (disc < -1e-14 * qb * qb) return;
  const sq = Math.sqrt(disc > 0 ? disc : 0);
  // Stable roots: q = −(b + sign(b)√disc)/2, v = q/a and c/q.
  const qq = -0.5 * (qb + (qb >= 0 ? sq : -sq));
  const v1 = qq / qa;
  patchRoot(v1, dx, dy, dz, dd, axx, axy, axz, bx, by, bz, cx, cy, cz, qx, qy, qz, A1, B1, C1, D1, A2, B2, C2, D2);
  if (qq !== 0) {
    const v2 = qc / qq;
    if (v2 !== v1) patchRoot(v2, dx, dy, dz, dd, axx, axy, axz, bx, by, bz, cx, cy, cz, qx, qy, qz, A1, B1, C1, D1, A2, B2, C2, D2);
  }
}

/** Given a root v, solves for u, checks both lie on the patch and pushes τ of the patch point. */
function patchRoot(v: number, dx: number, dy: number, dz: number, dd: number,
  axx: number, axy: number, axz: number, bx: number, by: number, bz: number, cx: number, cy: number, cz: number,
  qx: number, qy: number, qz: number, A1: number, B1: number, C1: number, D1: number, A2: number, B2: number, C2: number, D2: number): void {
  if (!(v >= -EDGE_SLACK && v <= 1 + EDGE_SLACK)) return;
  const den1 = B1 + v * D1, den2 = B2 + v * D2;
  let u: number;
  if (Math.abs(den1) >= Math.abs(den2)) { if (den1 === 0) return; u = -(A1 + v * C1) / den1; } else u = -(A2 + v * C2) / den2;
  if (!(u >= -EDGE_SLACK && u <= 1 + EDGE_SLACK)) return;
  // Patch point relative to A, projected on the segment direction.
  const px = axx + u * bx + v * cx + u * v * qx, py = axy + u * by + v * cy + u * v * qy, pz = axz + u * bz + v * cz + u * v * qz;
  push((px * dx + py * dy + pz * dz) / dd);
}
