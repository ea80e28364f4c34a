/**
 * Bounding boxes of runs of consecutive cells ("blocks" of `CELL_BLOCK` cells), computed once per piece and
 * reused by every later scan for a cut: a block whose box lies wholly on one side of the plane (beyond the
 * node-on-plane tolerance and a rounding margin) holds no candidate, so the scan never reads its cells.
 * Mesh generators and solvers write cells in a spatially coherent order (layers, sweeps, space-filling
 * curves), so a plane meets a small share of the blocks.
 *
 * Two levels: the box of every `FINE_BLOCK` (8) consecutive cells (`fineBoxes`), and of every `CELL_BLOCK`
 * (128) cells (`blockBoxes`, the join of its 16 fine boxes). A scan tests the coarse boxes, then the fine boxes
 * of the blocks the plane crosses: a plane along the cell order's short runs (the pipe sample's lengthwise
 * plane, a lattice's x-normal plane) crosses most 128-cell blocks but few 8-cell ones (1M-hexahedron pipe,
 * lengthwise plane: 74 % of the coarse blocks, 744 000 cells, against 12 % of the fine ones, 123 000 cells).
 *
 * Layout: `Float64Array` of 6 numbers per block — min x, min y, min z, max x, max y, max z (file's length
 * unit) — over the point ids the scan reads for the block's cells (a polyhedron stored with empty
 * connectivity: its face stream). A block with no 3D cell keeps the empty box +∞ … −∞, which no plane crosses.
 * The boxes are exact (the nodes' own extremes). They were once joined from the boxes of 32-point runs left by
 * the first scan; on the 1M sample files those runs span much of a cross-section (44 % of the pipe's runs meet
 * its lengthwise plane), so the joined boxes let most cells through and cost as much as exact ones (see
 * DEVELOPERS.md, "Later cut, fifth round").
 */
import { cellDimension, CellType } from '../model/cellTypes.ts';
import type { Piece } from '../model/piece.ts';
import { cellLayout } from '../model/uniformCells.ts';

/** Cells per block: small enough that a plane's blocks hold few cells it misses, large enough that the box test is cheap per cell. */
export const CELL_BLOCK = 128;
/** Cells per fine block; `CELL_BLOCK` is a whole number of them. */
export const FINE_BLOCK = 8;
const FINE_PER_BLOCK = CELL_BLOCK / FINE_BLOCK;

const cache = new WeakMap<Int32Array, { types: Uint8Array; conn: Int32Array; points: Float64Array; boxes: Float64Array; fine: Float64Array }>();

/**
 * Full scans of a piece (every cell read, its first scan included) before its block boxes are computed: rent or
 * buy, as `AUTO_SCANS` in crossingCells.ts. The boxes cost about four full scans of the 1M-hexahedron pipe
 * sample (79–92 ms of CPU against 21 ms a full scan, cold, load average ~2) and pay back on every later scan
 * (that file's cross-section 21 → 0.8 ms, its lengthwise plane 21 → 13 ms); so four scans are rented, and a
 * session that cuts up to four times never pays for them.
 */
export const FULL_SCANS = 4;

const scansOf = new WeakMap<Int32Array, { types: Uint8Array; conn: Int32Array; points: Float64Array; n: number }>();

/**
 * Whether a scan of `p` should read every cell instead of computing the block boxes now (see `FULL_SCANS`);
 * counts the scan when it should.
 */
export function rentFullScan(p: Piece): boolean {
  if (hasBlockBoxes(p)) return false;
  let e = scansOf.get(p.offsets);
  if (!e || e.types !== p.cellTypes || e.conn !== p.connectivity || e.points !== p.points) {
    e = { types: p.cellTypes, conn: p.connectivity, points: p.points, n: 0 };
    scansOf.set(p.offsets, e);
  }
  if (e.n >= FULL_SCANS) return false;
  e.n++;
  return true;
}

/** Whether the boxes of `p` are already computed. */
export function hasBlockBoxes(p: Piece): boolean {
  const hit = cache.get(p.offsets);
  return !!hit && hit.types === p.cellTypes && hit.conn === p.connectivity && hit.points === p.points;
}

/** The block boxes of piece `p` (see the file comment), computed on the first call for these arrays. */
export function blockBoxes(p: Piece): Float64Array {
  return boxesOf(p).boxes;
}

/** The fine boxes of piece `p` (`FINE_BLOCK` cells each; see the file comment), computed with its block boxes. */
export function fineBoxes(p: Piece): Float64Array {
  return boxesOf(p).fine;
}

function boxesOf(p: Piece): { boxes: Float64Array; fine: Float64Array } {
  const hit = cache.get(p.offsets);
  if (hit && hit.types === p.cellTypes && hit.conn === p.connectivity && hit.points === p.points) return hit;
  const nc = p.cellTypes.length, nf = Math.ceil(nc / FINE_BLOCK);
  const fine = new Float64Array(6 * nf);
  const lay = cellLayout(p);
  for (let b = 0; b < nf; b++) {
    const c0 = b * FINE_BLOCK, c1 = Math.min(nc, c0 + FINE_BLOCK);
    if (c1 <= lay.leadCells) boxOfRun(p.points, p.connectivity, lay.base + lay.leadSize * c0, lay.base + lay.leadSize * c1, fine, 6 * b);
    else boxOfCells(p, c0, c1, fine, 6 * b);
  }
  const nb = Math.ceil(nc / CELL_BLOCK), boxes = new Float64Array(6 * nb);
  for (let b = 0; b < nb; b++) joinBoxes(fine, b * FINE_PER_BLOCK, Math.min(nf, (b + 1) * FINE_PER_BLOCK), boxes, 6 * b);
  const entry = { types: p.cellTypes, conn: p.connectivity, points: p.points, boxes, fine };
  cache.set(p.offsets, entry);
  return entry;
}

/** Join of boxes f0 … f1 − 1 of `boxes` into `out[o … o + 5]`. */
function joinBoxes(boxes: Float64Array, f0: number, f1: number, out: Float64Array, o: number): void {
  let x0 = Infinity, y0 = Infinity, z0 = Infinity, x1 = -Infinity, y1 = -Infinity, z1 = -Infinity;
  for (let k = 6 * f0; k < 6 * f1; k += 6) {
    x0 = Math.min(x0, boxes[k]!); y0 = Math.min(y0, boxes[k + 1]!); z0 = Math.min(z0, boxes[k + 2]!);
    x1 = Math.max(x1, boxes[k + 3]!); y1 = Math.max(y1, boxes[k + 4]!); z1 = Math.max(z1, boxes[k + 5]!);
  }
  out[o] = x0; out[o + 1] = y0; out[o + 2] = z0; out[o + 3] = x1; out[o + 4] = y1; out[o + 5] = z1;
}

/** Box of the points `ids[q0 … q1 − 1]` into `out[o … o + 5]`. */
function boxOfRun(pts: Float64Array, ids: Int32Array, q0: number, q1: number, out: Float64Array, o: number): void {
  let x0 = Infinity, y0 = Infinity, z0 = Infinity, x1 = -Infinity, y1 = -Infinity, z1 = -Infinity;
  for (let q = q0; q < q1; q++) {
    const j = 3 * ids[q]!, x = pts[j]!, y = pts[j + 1]!, z = pts[j + 2]!;
    x0 = x < x0 ? x : x0; x1 = x > x1 ? x : x1;
    y0 = y < y0 ? y : y0; y1 = y > y1 ? y : y1;
    z0 = z < z0 ? z : z0; z1 = z > z1 ? z : z1;
  }
  out[o] = x0; out[o + 1] = y0; out[o + 2] = z0; out[o + 3] = x1; out[o + 4] = y1; out[o + 5] = z1;
}

/**
 * Box of the 3D cells among cells c0 … c1 − 1 of a piece with mixed cells (polyhedra by their face stream when
 * their connectivity is empty). Faces, lines and vertices stored with the volume (a file's boundary triangles
 * after its tetrahedra) are never candidates, so their nodes are left out: a block of them alone keeps the
 * empty box, which `boxMayCross` skips.
 */
function boxOfCells(p: Piece, c0: number, c1: number, out: Float64Array, o: number): void {
  const off = p.offsets, pf = p.polyFaces;
  let x0 = Infinity, y0 = Infinity, z0 = Infinity, x1 = -Infinity, y1 = -Infinity, z1 = -Infinity;
  for (let c = c0; c < c1; c++) {
    if (cellDimension(p.cellTypes[c]!) !== 3) continue;
    let a = off[c]!, b = off[c + 1]!, ids = p.connectivity;
    if (p.cellTypes[c] === CellType.POLYHEDRON && a === b && pf) {
      ids = pf.faceConnectivity; a = pf.faceOffsets[pf.cellFaceStart[c]!]!; b = pf.faceOffsets[pf.cellFaceStart[c + 1]!]!;
    }
    boxOfRun(p.points, ids, a, b, out, o);
    x0 = Math.min(x0, out[o]!); y0 = Math.min(y0, out[o + 1]!); z0 = Math.min(z0, out[o + 2]!);
    x1 = Math.max(x1, out[o + 3]!); y1 = Math.max(y1, out[o + 4]!); z1 = Math.max(z1, out[o + 5]!);
  }
  out[o] = x0; out[o + 1] = y0; out[o + 2] = z0; out[o + 3] = x1; out[o + 4] = y1; out[o + 5] = z1;
}

/**
 * Whether the box at `boxes[o … o + 5]` may hold a node within `tol` of the plane n·(x − o) = 0 or nodes on
 * both sides of it. False only when every point of the box is farther than `tol` on one side, with a margin
 * far above the rounding of the per-node distance, so a block skipped here holds no candidate of the scan.
 * A box with a NaN coordinate is never skipped.
 */
export function boxMayCross(boxes: Float64Array, o: number, ox: number, oy: number, oz: number, nx: number, ny: number, nz: number, tol: number): boolean {
  // the empty box (+∞ … −∞: a block with no 3D cell, see `boxOfCells`) holds no candidate
  if (boxes[o]! > boxes[o + 3]!) return false;
  const hx = 0.5 * (boxes[o + 3]! - boxes[o]!), hy = 0.5 * (boxes[o + 4]! - boxes[o + 1]!), hz = 0.5 * (boxes[o + 5]! - boxes[o + 2]!);
  const cx = boxes[o]! + hx, cy = boxes[o + 1]! + hy, cz = boxes[o + 2]! + hz;
  const dc = nx * (cx - ox) + ny * (cy - oy) + nz * (cz - oz);
  const r = Math.abs(nx) * hx + Math.abs(ny) * hy + Math.abs(nz) * hz;
  // Rounding of n·(x − o) at a node is a few ulps of Σ|n_i|(|x_i| + |o_i|); 1e-12 of it is far more.
  const slack = 1e-12 * (Math.abs(nx) * (Math.abs(cx) + hx + Math.abs(ox)) + Math.abs(ny) * (Math.abs(cy) + hy + Math.abs(oy))
    + Math.abs(nz) * (Math.abs(cz) + hz + Math.abs(oz)));
  const reach = r + tol + slack;
  return !(dc > reach || dc < -reach);
}
