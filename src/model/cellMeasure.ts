/**
 * Cell volumes by the divergence theorem over the cell's faces, each face split into triangles around
 * its vertex mean (symmetric, so neighbouring cells split a shared non-planar face the same way and
 * volumes add up to the domain's). Exact for cells with planar faces; works for every 3D type,
 * polyhedra included. Volumes in the file's length unit cubed.
 */
import { cellDimension, FACE_TABLE } from './cellTypes.ts';
import type { Dataset } from './dataset.ts';
import type { Piece } from './piece.ts';

/** Signed volume of one face's fan relative to (ox, oy, oz), over 6 (outward faces give positive volume). */
function faceVolume6(pts: Float64Array, ids: Int32Array, first: number, n: number, ox: number, oy: number, oz: number, map: Int32Array | null, mapBase: number): number {
  let cx = 0, cy = 0, cz = 0;
  for (let k = 0; k < n; k++) {
    const p = 3 * (map ? map[mapBase + ids[first + k]!]! : ids[first + k]!);
    cx += pts[p]!; cy += pts[p + 1]!; cz += pts[p + 2]!;
  }
  cx = cx / n - ox; cy = cy / n - oy; cz = cz / n - oz;
  let v = 0;
  for (let k = 0; k < n; k++) {
    const a = 3 * (map ? map[mapBase + ids[first + k]!]! : ids[first + k]!);
    const b = 3 * (map ? map[mapBase + ids[first + ((k + 1) % n)]!]! : ids[first + ((k + 1) % n)]!);
    const ax = pts[a]! - ox, ay = pts[a + 1]! - oy, az = pts[a + 2]! - oz;
    const bx = pts[b]! - ox, by = pts[b + 1]! - oy, bz = pts[b + 2]! - oz;
    v += cx * (ay * bz - az * by) + cy * (az * bx - ax * bz) + cz * (ax * by - ay * bx);
  }
  return v;
}

/** Signed volume of cell `c` of a piece (positive for standard orientation); 0 for cells that are not 3D. */
export function cellVolume(p: Piece, c: number): number {
  const t = p.cellTypes[c]!;
  if (cellDimension(t) !== 3) return 0;
  const conn = p.connectivity, o = p.offsets[c]!, pts = p.points;
  const ox = pts[3 * conn[o]!]!, oy = pts[3 * conn[o]! + 1]!, oz = pts[3 * conn[o]! + 2]!;
  let v6 = 0;
  if (t === 42) {
    const pf = p.polyFaces!;
    for (let f = pf.cellFaceStart[c]!; f < pf.cellFaceStart[c + 1]!; f++) {
      const a = pf.faceOffsets[f]!;
      v6 += faceVolume6(pts, pf.faceConnectivity, a, pf.faceOffsets[f + 1]! - a, ox, oy, oz, null, 0);
    }
    // Polyhedron faces in files are not reliably outward; the cell's volume is taken unsigned.
    return Math.abs(v6) / 6;
  }
  for (let f = FACE_TABLE.start[t]!; f < FACE_TABLE.start[t + 1]!; f++) {
    v6 += faceVolume6(pts, FACE_TABLE.nodes, FACE_TABLE.first[f]!, FACE_TABLE.size[f]!, ox, oy, oz, conn, o);
  }
  return v6 / 6;
}

/** Total and count of 3D cells: Σ|V| over 3D cells and their number. */
export function volumeSummary(d: Dataset): { volume: number; cells3D: number } {
  let volume = 0, cells3D = 0;
  for (const p of d.pieces) {
    for (let c = 0; c < p.cellTypes.length; c++) {
      if (cellDimension(p.cellTypes[c]!) !== 3) continue;
      volume += Math.abs(cellVolume(p, c));
      cells3D++;
    }
  }
  return { volume, cells3D };
}
