/**
 * Iso-surface extraction: the surface f = v of a point scalar f, over every 3D cell of a dataset (tetra,
 * voxel, hexahedron, wedge, pyramid, pentagonal and hexagonal prisms, polyhedra from their face stream;
 * higher-order cells are read by their corner nodes, so they count as their linear parts), and the iso-lines
 * of the 2D cells (triangle, strip, pixel, quad, polygon).
 *
 * Method: f is interpolated linearly on a tetrahedral subdivision of each cell, then each tetrahedron is cut
 * by the plane where its linear f equals v (marching tetrahedra; Doi & Koide 1991, IEICE Trans. E74(1)).
 * A tetrahedron is itself; a pyramid is two tetrahedra (base triangle, apex). Any other cell gets a node at its vertex mean C with f(C) the mean of the node
 * values (so a field linear in space stays exact), and one tetrahedron (face triangle, C) per triangle of
 * its faces; a face of four or more nodes is fanned from its node with the lexicographically smallest
 * (x, y, z). That choice depends on the face alone, so the two cells sharing a face (in one piece or two)
 * split it alike and the surface has no cracks. The same holds for the position bits: a crossing on edge
 * (a below, b at or above) is x = (d_b·x_a − d_a·x_b)/(d_b − d_a) with d = f − v, identical in every cell
 * holding the edge, and exactly the node when d_b = 0. Nodes are classified half-open (below when d < 0), i.e.
 * the surface is that of f − v + ε for a vanishing ε (simulation of simplicity): a vertex is identified by its
 * edge, not its position, so a value met exactly at nodes still gives a manifold surface (some of its
 * vertices then share a position and some triangles have zero area).
 * Cell edges are thus cut at their exact linear-interpolation point; the interior edges (face diagonals,
 * edges to C) only carry the subdivision. A strongly warped cell can fold its subdivision (a warped face
 * passing on the far side of C): the folded tetrahedra are wound against the geometric gradient so the
 * surface stays consistently oriented and the enclosed volume exact, but the fold's triangles add their area.
 *
 * Triangles are wound so that their normal (b − a) × (c − a) points towards increasing f. Vertices keep their
 * provenance (two end points and the parameter t; an end point is a global point id ≥ 0 or −1 − g for the
 * vertex mean of global cell g) so other fields can be interpolated onto them (`isoFields.ts`). Positions are
 * welded later by that edge, its end points identified by exact position across pieces (`isoSurface.ts`).
 */
import { CellType, cellDimension, FACE_TABLE } from '../model/cellTypes.ts';
import { cellStarts, pointStarts, type Dataset } from '../model/dataset.ts';
import type { Piece } from '../model/piece.ts';

/** Raw extraction output: unwelded vertices (three per triangle, two per segment) with provenance. */
export interface RawIso {
  /** xyz per raw vertex (file's length unit). */
  readonly positions: Float64Array;
  /** Two end points per raw vertex: global point id, or −1 − global cell for a cell's vertex mean. */
  readonly ends: Int32Array;
  /** Parameter t per raw vertex: the value is (1 − t)·end0 + t·end1. */
  readonly t: Float64Array;
  /** Number of raw triangle vertices (the first `triVertices` raw vertices, three per triangle). */
  readonly triVertices: number;
  /** Global cell id of each triangle, then of each segment. */
  readonly cells: Int32Array;
  readonly triangles: number;
  readonly segments: number;
}

// ---- output (grows, never shrinks) ---------------------------------------------------------------------
let oPos = new Float64Array(3 * 4096), oEnd = new Int32Array(2 * 4096), oT = new Float64Array(4096), oCell = new Int32Array(2048);
let nV = 0, nPrim = 0;

function reserve(verts: number): void {
  if (nV + verts > oT.length) {
    const n = Math.max(2 * oT.length, nV + verts);
    const p = new Float64Array(3 * n); p.set(oPos); oPos = p;
    const e = new Int32Array(2 * n); e.set(oEnd); oEnd = e;
    const t = new Float64Array(n); t.set(oT); oT = t;
  }
  if (nPrim + verts > oCell.length) { const c = new Int32Array(Math.max(2 * oCell.length, nPrim + verts)); c.set(oCell); oCell = c; }
}

// ---- per-cell nodes: local index → position, value (d = f − v), provenance ------------------------------
let nX = new Float64Array(64), nY = new Float64Array(64), nZ = new Float64Array(64), nD = new Float64Array(64), nE = new Int32Array(64);
let faceLocal = new Int32Array(64);

function ensureNodes(n: number): void {
  if (n <= nX.length) return;
  const m = 2 * n;
  nX = new Float64Array(m); nY = new Float64Array(m); nZ = new Float64Array(m); nD = new Float64Array(m); nE = new Int32Array(m);
  faceLocal = new Int32Array(m);
}

/** Writes the crossing on edge (a below, b at or above) as the next raw vertex. */
function crossing(a: number, b: number): void {
  const o = nV++, da = nD[a]!, db = nD[b]!;
  if (db === 0) {
    // At the node, but kept as a vertex of this edge: the surface is that of f − v + ε (see the file comment).
    oPos[3 * o] = nX[b]!; oPos[3 * o + 1] = nY[b]!; oPos[3 * o + 2] = nZ[b]!;
    oEnd[2 * o] = nE[a]!; oEnd[2 * o + 1] = nE[b]!; oT[o] = 1;
    return;
  }
  const den = db - da;
  oPos[3 * o] = (db * nX[a]! - da * nX[b]!) / den;
  oPos[3 * o + 1] = (db * nY[a]! - da * nY[b]!) / den;
  oPos[3 * o + 2] = (db * nZ[a]! - da * nZ[b]!) / den;
  oEnd[2 * o] = nE[a]!; oEnd[2 * o + 1] = nE[b]!; oT[o] = -da / den;
}

/**
 * Writes the triangle of crossings on edges (b0, a0), (b1, a1), (b2, a2) (b below, a at or above), wound so
 * its normal has a positive component along (gx, gy, gz). The winding is judged on the edges' midpoints: the
 * crossings may coincide (a value met at a node), the midpoints do not, and as the crossings move along their
 * edges the triangle's winding does not change.
 */
function emitTriangle(b0: number, a0: number, b1: number, a1: number, b2: number, a2: number, gx: number, gy: number, gz: number, g: number): void {
  const mx0 = nX[b0]! + nX[a0]!, my0 = nY[b0]! + nY[a0]!, mz0 = nZ[b0]! + nZ[a0]!;
  const ux = nX[b1]! + nX[a1]! - mx0, uy = nY[b1]! + nY[a1]! - my0, uz = nZ[b1]! + nZ[a1]! - mz0;
  const vx = nX[b2]! + nX[a2]! - mx0, vy = nY[b2]! + nY[a2]! - my0, vz = nZ[b2]! + nZ[a2]! - mz0;
  const s = gx * (uy * vz - uz * vy) + gy * (uz * vx - ux * vz) + gz * (ux * vy - uy * vx);
  crossing(b0, a0);
  if (s >= 0) { crossing(b1, a1); crossing(b2, a2); } else { crossing(b2, a2); crossing(b1, a1); }
  oCell[nPrim++] = g;
}

const tb = new Int32Array(4), ta = new Int32Array(4);

/**
 * Marching tetrahedron on local nodes (i0, i1, i2, i3) of cell g. `flip`: the sub-tetrahedron is folded
 * against the rest of its cell (a warped face close to the vertex mean), so its triangles take the
 * opposite winding and stay consistent with their neighbours.
 */
function tetra(i0: number, i1: number, i2: number, i3: number, g: number, flip = false): void {
  let nb = 0, na = 0;
  if (nD[i0]! < 0) tb[nb++] = i0; else ta[na++] = i0;
  if (nD[i1]! < 0) tb[nb++] = i1; else ta[na++] = i1;
  if (nD[i2]! < 0) tb[nb++] = i2; else ta[na++] = i2;
  if (nD[i3]! < 0) tb[nb++] = i3; else ta[na++] = i3;
  if (nb === 0 || na === 0) return;
  // Direction of increasing f: from the mean of the nodes below to the mean of those at or above (the
  // plane separates them, so this has a positive component along the tetrahedron's gradient).
  let gx = 0, gy = 0, gz = 0;
  for (let k = 0; k < na; k++) { const i = ta[k]!; gx += nX[i]! / na; gy += nY[i]! / na; gz += nZ[i]! / na; }
  for (let k = 0; k < nb; k++) { const i = tb[k]!; gx -= nX[i]! / nb; gy -= nY[i]! / nb; gz -= nZ[i]! / nb; }
  if (flip) { gx = -gx; gy = -gy; gz = -gz; }
  reserve(6);
  if (nb === 1) {
    const b = tb[0]!;
    emitTriangle(b, ta[0]!, b, ta[1]!, b, ta[2]!, gx, gy, gz, g);
  } else if (nb === 3) {
    const a = ta[0]!;
    emitTriangle(tb[0]!, a, tb[1]!, a, tb[2]!, a, gx, gy, gz, g);
  } else {
    // Quad (b0a0, b0a1, b1a1, b1a0), split along b0a0–b1a1.
    const b0 = tb[0]!, b1 = tb[1]!, a0 = ta[0]!, a1 = ta[1]!;
    emitTriangle(b0, a0, b0, a1, b1, a1, gx, gy, gz, g);
    emitTriangle(b0, a0, b1, a1, b1, a0, gx, gy, gz, g);
  }
}

/** Marching triangle on local nodes (i0, i1, i2) of a 2D cell g: at most one segment. */
function triangle(i0: number, i1: number, i2: number, g: number): void {
  let nb = 0, na = 0;
  if (nD[i0]! < 0) tb[nb++] = i0; else ta[na++] = i0;
  if (nD[i1]! < 0) tb[nb++] = i1; else ta[na++] = i1;
  if (nD[i2]! < 0) tb[nb++] = i2; else ta[na++] = i2;
  if (nb === 0 || na === 0) return;
  reserve(2);
  if (nb === 1) { crossing(tb[0]!, ta[0]!); crossing(tb[0]!, ta[1]!); } else { crossing(tb[0]!, ta[0]!); crossing(tb[1]!, ta[0]!); }
  segCells.push(g);
}

let segCells: number[] = [];
let segPos: number[] = [], segEnd: number[] = [], segT: number[] = [];

/** Moves the segment vertices written after the triangles into their own lists (2D cells are rare and small). */
function takeSegmentVertices(from: number): void {
  for (let o = from; o < nV; o++) {
    segPos.push(oPos[3 * o]!, oPos[3 * o + 1]!, oPos[3 * o + 2]!);
    segEnd.push(oEnd[2 * o]!, oEnd[2 * o + 1]!); segT.push(oT[o]!);
  }
  nV = from;
}

/** Local index of the node of nodes[0..m-1] (local indices) with the smallest (x, y, z). */
function lexMin(nodes: Int32Array, m: number): number {
  let best = 0;
  for (let j = 1; j < m; j++) {
    const a = nodes[j]!, b = nodes[best]!;
    if (nX[a]! < nX[b]! || (nX[a] === nX[b] && (nY[a]! < nY[b]! || (nY[a] === nY[b] && nZ[a]! < nZ[b]!)))) best = j;
  }
  return best;
}

/** Six times the signed volume of the tetrahedron on local nodes (a, b, c, d). */
function tetVolume6(a: number, b: number, c: number, d: number): number {
  const ux = nX[b]! - nX[a]!, uy = nY[b]! - nY[a]!, uz = nZ[b]! - nZ[a]!;
  const vx = nX[c]! - nX[a]!, vy = nY[c]! - nY[a]!, vz = nZ[c]! - nZ[a]!;
  const wx = nX[d]! - nX[a]!, wy = nY[d]! - nY[a]!, wz = nZ[d]! - nZ[a]!;
  return wx * (uy * vz - uz * vy) + wy * (uz * vx - ux * vz) + wz * (ux * vy - uy * vx);
}

/**
 * The tetrahedra (face triangle, centre) of one face of m nodes held in faceLocal. With `emit` false only
 * sums their signed volumes (×6); with `emit` true writes them, flipping those whose sign differs from `sign`.
 */
function faceTetra(m: number, centre: number, g: number, emit: boolean, sign: number): number {
  const s = m === 3 ? 0 : lexMin(faceLocal, m);
  let sum = 0;
  for (let j = 1; j + 1 < m; j++) {
    const a = faceLocal[s]!, b = faceLocal[(s + j) % m]!, c = faceLocal[(s + j + 1) % m]!;
    const w = tetVolume6(a, b, c, centre);
    if (emit) tetra(a, b, c, centre, g, w * sign < 0); else sum += w;
  }
  return sum;
}

/**
 * Extracts the iso-surface f = `value` from the point scalars `scalars[k]` of each piece. Returns raw
 * triangles (wound towards increasing f) and segments (iso-lines of 2D cells).
 */
export function extractIso(d: Dataset, scalars: readonly Float64Array[], value: number): RawIso {
  nV = 0; nPrim = 0; segCells = []; segPos = []; segEnd = []; segT = [];
  const cStarts = cellStarts(d), pStarts = pointStarts(d);
  for (let k = 0; k < d.pieces.length; k++) extractPiece(d.pieces[k]!, scalars[k]!, value, cStarts[k]!, pStarts[k]!);
  const triangles = nPrim, triVertices = nV, segments = segCells.length;
  const total = triVertices + 2 * segments;
  const positions = new Float64Array(3 * total), ends = new Int32Array(2 * total), t = new Float64Array(total);
  positions.set(oPos.subarray(0, 3 * nV)); ends.set(oEnd.subarray(0, 2 * nV)); t.set(oT.subarray(0, nV));
  positions.set(segPos, 3 * nV); ends.set(segEnd, 2 * nV); t.set(segT, nV);
  const cells = new Int32Array(triangles + segments);
  cells.set(oCell.subarray(0, triangles)); cells.set(segCells, triangles);
  segCells = []; segPos = []; segEnd = []; segT = [];
  return { positions, ends, t, triVertices, cells, triangles, segments };
}

function extractPiece(p: Piece, f: Float64Array, value: number, g0: number, pt0: number): void {
  const pts = p.points, conn = p.connectivity, off = p.offsets, pf = p.polyFaces, types = p.cellTypes;
  for (let c = 0; c < types.length; c++) {
    const type = types[c]!, isPoly = type === CellType.POLYHEDRON;
    let a = off[c]!, b = off[c + 1]!, ids = conn;
    if (isPoly) {
      if (!pf) continue;
      if (a === b) { ids = pf.faceConnectivity; a = pf.faceOffsets[pf.cellFaceStart[c]!]!; b = pf.faceOffsets[pf.cellFaceStart[c + 1]!]!; }
    }
    const dim = cellDimension(type);
    if (dim < 2 || b - a < 3) continue;
    // Quick reject: every node on one side (NaN values count as neither and drop the cell).
    let below = 0, above = 0;
    for (let q = a; q < b; q++) { const s = f[ids[q]!]! - value; if (s < 0) below++; else if (s >= 0) above++; }
    if (below + above !== b - a || below === 0 || above === 0) continue;
    const m = b - a;
    ensureNodes(m + 2);
    for (let q = a, i = 0; q < b; q++, i++) {
      const id = ids[q]!;
      nX[i] = pts[3 * id]!; nY[i] = pts[3 * id + 1]!; nZ[i] = pts[3 * id + 2]!; nD[i] = f[id]! - value; nE[i] = pt0 + id;
    }
    const g = g0 + c;
    if (dim === 2) { surfaceCell(type, m, g); continue; }
    if (type === CellType.TETRA) { tetra(0, 1, 2, 3, g); continue; }
    if (type === CellType.PYRAMID && m === 5) {
      // The apex sees the whole base: two tetrahedra (base triangle, apex), no vertex mean needed.
      faceLocal[0] = 0; faceLocal[1] = 1; faceLocal[2] = 2; faceLocal[3] = 3;
      faceTetra(4, 4, g, true, faceTetra(4, 4, g, false, 0));
      continue;
    }
    // Vertex mean (and mean value) as local node m; it sees every node once (a face stream repeats them).
    let cx = 0, cy = 0, cz = 0, cd = 0, count = 0;
    for (let i = 0; i < m; i++) {
      let seen = false;
      for (let j = 0; j < i && !seen; j++) if (nE[j] === nE[i]) seen = true;
      if (seen) continue;
      cx += nX[i]!; cy += nY[i]!; cz += nZ[i]!; cd += nD[i]!; count++;
    }
    nX[m] = cx / count; nY[m] = cy / count; nZ[m] = cz / count; nD[m] = cd / count; nE[m] = -1 - g;
    if (isPoly) {
      // Face streams may wind faces either way: each face's sub-tetrahedra are judged against their face.
      const fo = pf!.faceOffsets, fc = pf!.faceConnectivity;
      for (let fIdx = pf!.cellFaceStart[c]!; fIdx < pf!.cellFaceStart[c + 1]!; fIdx++) {
        const s0 = fo[fIdx]!, fm = fo[fIdx + 1]! - s0;
        if (fm < 3) continue;
        ensureNodes(fm + m + 2);
        for (let j = 0; j < fm; j++) {
          const id = pt0 + fc[s0 + j]!;
          let l = 0;
          while (l < m && nE[l] !== id) l++;
          faceLocal[j] = l;
        }
        faceTetra(fm, m, g, true, faceTetra(fm, m, g, false, 0));
      }
      continue;
    }
    const f0 = FACE_TABLE.start[type]!, f1 = FACE_TABLE.start[type + 1]!;
    let total = 0;
    for (let pass = 0; pass < 2; pass++) {
      for (let fIdx = f0; fIdx < f1; fIdx++) {
        const s0 = FACE_TABLE.first[fIdx]!, fm = FACE_TABLE.size[fIdx]!;
        for (let j = 0; j < fm; j++) faceLocal[j] = FACE_TABLE.nodes[s0 + j]!;
        if (pass === 0) total += faceTetra(fm, m, g, false, 0); else faceTetra(fm, m, g, true, total);
      }
    }
  }
}

/** Iso-line segments of a 2D cell whose m nodes are loaded. */
function surfaceCell(type: number, m: number, g: number): void {
  const from = nV;
  if (type === CellType.TRIANGLE_STRIP) {
    for (let i = 0; i + 2 < m; i++) triangle(i, i + 1, i + 2, g);
  } else {
    // Pixel nodes run x-fastest: its cycle is 0, 1, 3, 2.
    const m2 = type === CellType.PIXEL ? 4 : m;
    for (let j = 0; j < m2; j++) faceLocal[j] = type === CellType.PIXEL ? [0, 1, 3, 2][j]! : j;
    const s = lexMin(faceLocal, m2);
    for (let j = 1; j + 1 < m2; j++) triangle(faceLocal[s]!, faceLocal[(s + j) % m2]!, faceLocal[(s + j + 1) % m2]!, g);
  }
  takeSegmentVertices(from);
}
