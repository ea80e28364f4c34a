/**
 * Which cells a plane can cut: the candidates the cut kernel visits.
 *
 * Two sources, same answer up to extra candidates (the kernel decides exactly):
 *  - `tree`: the flat bounding-box tree of `src/locate/cellTree.ts` (built once per dataset, then each query
 *    visits only the boxes the plane touches);
 *  - `scan`: a sign test per cell (side code of each node: below, on or above the plane, OR-ed), over the
 *    blocks of `CELL_BLOCK` consecutive cells whose box the plane may meet, and inside them the runs of
 *    `FINE_BLOCK` cells whose box it may meet (`blockBoxes.ts`). The first `FULL_SCANS` scans of a piece
 *    with no polyhedra read every cell by side bytes; the one after computes the block boxes (rent or buy).
 *    A scan with block boxes tests them first and reads only the crossed blocks —
 *    by coordinates per node when they are few, by a side byte per point when they hold more node
 *    references than the piece has points. Pool workers compute the boxes of their share as they take it on.
 *    The scan returns exactly the cells the rule selects, in ascending order, whichever way it went.
 * `auto` uses the tree when it is already built for this dataset (by a probe, or by an earlier cut), and
 * otherwise scans, building the tree only on the cut that follows `AUTO_SCANS` scans of the same dataset.
 *
 * Why `AUTO_SCANS` is 12 (measured before the block boxes, on pipe-hex-1M appended raw, CPU time of one
 * process, warm kernels, machine under load): the tree build costs about 335 ms; a cut whose candidates
 * came from the full scan cost 34 ms (near cross-section) to 65 ms (oblique plane through the axis), from
 * the tree 6 to 47 ms. Renting the scan until the rent paid reaches about the purchase price never costs
 * more than twice the better of the two choices made in hindsight (the classic rent-or-buy bound). With the
 * block boxes a later scan costs 0.4 ms (near cross-section) to 11 ms (oblique) on that file, so the bound
 * now favours scanning longer; the number is kept so a session's first dozen cuts behave as before, and a
 * line or point probe builds the tree anyway.
 */
import { cellDimension, CellType } from '../model/cellTypes.ts';
import { cellStarts, type Dataset } from '../model/dataset.ts';
import { cellsCrossingPlane, getCellTree, hasCellTree } from '../locate/cellTree.ts';
import { cellLayout } from '../model/uniformCells.ts';
import { blockBoxes, boxMayCross, CELL_BLOCK, FINE_BLOCK, fineBoxes, rentFullScan } from './blockBoxes.ts';
import type { Piece } from '../model/piece.ts';

export type CandidateSource = 'auto' | 'tree' | 'scan';

/** Scans allowed per dataset before `auto` builds the tree (see the file comment for the measurement behind it). */
export const AUTO_SCANS = 12;

/**
 * Cost of one node read by coordinates in the scan, in points of the side pass (see `scan`), by the size of the
 * point range the side pass covers. A small range (up to `SMALL_POINT_RANGE` points, 12 MB of coordinates)
 * stays in cache, and a node by coordinates (three doubles read out of order, a dot product) costs about two
 * points of it: on the 1M-tetrahedron file's second share (its boundary triangles reach all 175 000 points; 34 000
 * cells read) that worker's first-cut CPU was 14.4–16.7 ms by coordinates against 10.9–12.7 ms by bytes (pool of
 * 2, load average 14). A large range is a stream from memory, and the nodes of a run of cells share their
 * points: on a 5M-cell share of the 10M lattice (x-normal plane, 600 000 cells read over 5.1M points) the share's
 * cut took 230–497 ms by coordinates against 484–507 ms by bytes (in-thread, load average 14–17), so a node
 * there weighs one point.
 */
const SMALL_POINT_RANGE = 1 << 19;

/** Fine blocks in a block. */
const FINE_PER_BLOCK = CELL_BLOCK / FINE_BLOCK;

const scansDone = new WeakMap<Dataset, number>();

let found = new Int32Array(1024);

/** Whether `auto` would use the tree for this dataset now. */
export function treeReady(d: Dataset): boolean { return hasCellTree(d); }

/**
 * Global ids of the cells the plane n·(x − o) = 0 may cut (every 3D cell with nodes on both sides, or
 * with nodes on the plane, is among them). `tol` is the distance below which a node counts as on the plane.
 * Returns a view of a scratch buffer, valid until the next call. `used` reports which source ran.
 */
export function candidateCells(d: Dataset, ox: number, oy: number, oz: number, nx: number, ny: number, nz: number,
  tol: number, source: CandidateSource = 'auto'): { cells: Int32Array; used: 'tree' | 'scan' } {
  let use: 'tree' | 'scan' = source === 'auto' ? 'scan' : source;
  if (source === 'auto') {
    if (hasCellTree(d)) use = 'tree';
    else {
      const n = scansDone.get(d) ?? 0;
      if (n >= AUTO_SCANS) use = 'tree'; else scansDone.set(d, n + 1);
    }
  }
  if (use === 'tree') {
    const tree = getCellTree(d);
    return { cells: cellsCrossingPlane(tree, ox, oy, oz, nx, ny, nz), used: 'tree' };
  }
  return { cells: scan(d, ox, oy, oz, nx, ny, nz, tol), used: 'scan' };
}

/** Computes now what the first scan of `d` would (each piece's `cellLayout` and block boxes), e.g. while a worker takes on its share. */
export function prepareScan(d: Dataset): void {
  for (const p of d.pieces) { cellLayout(p); blockBoxes(p); }
}

function scan(d: Dataset, ox: number, oy: number, oz: number, nx: number, ny: number, nz: number, tol: number): Int32Array {
  const starts = cellStarts(d);
  let nFound = 0;
  for (let k = 0; k < d.pieces.length; k++) {
    const p = d.pieces[k]!, lay = cellLayout(p), nc = p.cellTypes.length, g0 = starts[k]!;
    if (!p.polyFaces && rentFullScan(p)) {
      // A piece with no polyhedra scanned whole while its block boxes are not worth their price yet
      // (blockBoxes.ts, FULL_SCANS): every cell is read.
      nFound = fullScan(p, ox, oy, oz, nx, ny, nz, tol, g0, nFound);
      continue;
    }
    const boxes = blockBoxes(p), fine = fineBoxes(p), pf = p.polyFaces, nb = boxes.length / 6;
    // The blocks the plane may cross, then their fine blocks that it may cross, as runs of cells (see
    // blockBoxes.ts); the others hold no candidate and are never read.
    if (crossing.length < nb) crossing = new Int32Array(Math.max(nb, 2 * crossing.length));
    const nCross = blocksMayCross(boxes, nb, ox, oy, oz, nx, ny, nz, tol, crossing);
    const nf = fine.length / 6;
    if (runFrom.length < nf) { runFrom = new Int32Array(Math.max(nf, 2 * runFrom.length)); runTo = new Int32Array(runFrom.length); }
    const nRuns = fineRuns(fine, nf, nc, crossing, nCross, ox, oy, oz, nx, ny, nz, tol, runFrom, runTo);
    // Many cells to read: side bytes of every point once, then bytes per node (cheaper than coordinates per
    // node); a node by coordinates weighs two points of the side pass over a small range (`SMALL_POINT_RANGE`).
    const m = lay.leadSize, lead = lay.leadCells;
    const range = lay.endPoint - lay.firstPoint;
    const bytes = m > 0 && !pf && (range <= SMALL_POINT_RANGE ? 2 : 1) * runCells * m > range;
    if (bytes) {
      if (side.length < lay.endPoint) side = new Uint8Array(Math.max(lay.endPoint, 2 * side.length));
      pointSides(p.points, lay.firstPoint, lay.endPoint, ox, oy, oz, nx, ny, nz, tol, side);
    }
    for (let i = 0; i < nRuns; i++) {
      const c0 = runFrom[i]!, c1 = runTo[i]!, cl = Math.min(c1, lead), ct = Math.max(c0, lead);
      reserveFound(nFound + (c1 - c0));
      // The run's part in the lead run (fixed stride), then its part after it (types and offsets read per cell).
      if (c0 < cl) {
        if (bytes && m === 8) nFound = sideBytesOf8(p.connectivity, lay.base, c0, cl, side, g0, found, nFound);
        else if (bytes) nFound = sideBytesOf4(p.connectivity, lay.base, c0, cl, side, g0, found, nFound);
        else if (m === 8) nFound = blockOf8(p.points, p.connectivity, lay.base, c0, cl, ox, oy, oz, nx, ny, nz, tol, g0, found, nFound);
        else nFound = blockOf4(p.points, p.connectivity, lay.base, c0, cl, ox, oy, oz, nx, ny, nz, tol, g0, found, nFound);
      }
      if (ct < c1) {
        if (bytes) nFound = sideBytesOfAny(p.cellTypes, p.offsets, p.connectivity, ct, c1, side, g0, found, nFound);
        else {
          nFound = blockOfAny(p.points, p.cellTypes, p.offsets, p.connectivity, pf?.faceConnectivity, pf?.faceOffsets, pf?.cellFaceStart,
            ox, oy, oz, nx, ny, nz, tol, g0, ct, c1, found, nFound);
        }
      }
    }
  }
  return found.subarray(0, nFound);
}

/** Writes the indices of the blocks whose box may meet the plane into `out`; returns their count. */
function blocksMayCross(boxes: Float64Array, nb: number, ox: number, oy: number, oz: number, nx: number, ny: number, nz: number, tol: number, out: Int32Array): number {
  let n = 0;
  for (let b = 0; b < nb; b++) {
    out[n] = b;
    n += boxMayCross(boxes, 6 * b, ox, oy, oz, nx, ny, nz, tol) ? 1 : 0;
  }
  return n;
}

let runFrom = new Int32Array(0), runTo = new Int32Array(0), runCells = 0;

/**
 * The cells of the fine blocks the plane may cross inside the crossed blocks `crossing[0 … nCross − 1]`, as runs
 * of consecutive cells (`from[i]` … `to[i]` − 1, adjacent fine blocks joined) in ascending order; returns the
 * run count and leaves the cell count in `runCells`.
 */
function fineRuns(fine: Float64Array, nf: number, nc: number, crossing: Int32Array, nCross: number, ox: number, oy: number, oz: number,
  nx: number, ny: number, nz: number, tol: number, from: Int32Array, to: Int32Array): number {
  let n = 0, cells = 0;
  for (let i = 0; i < nCross; i++) {
    const b = crossing[i]!, f1 = Math.min(nf, (b + 1) * FINE_PER_BLOCK);
    for (let f = b * FINE_PER_BLOCK; f < f1; f++) {
      if (!boxMayCross(fine, 6 * f, ox, oy, oz, nx, ny, nz, tol)) continue;
      const c0 = f * FINE_BLOCK, c1 = Math.min(nc, c0 + FINE_BLOCK);
      cells += c1 - c0;
      if (n > 0 && to[n - 1] === c0) to[n - 1] = c1;
      else { from[n] = c0; to[n] = c1; n++; }
    }
  }
  runCells = cells;
  return n;
}

/** Side byte (1 below, 2 on, 4 above) of points first … end − 1 into `out`. */
function pointSides(pts: Float64Array, first: number, end: number, ox: number, oy: number, oz: number, nx: number, ny: number, nz: number, tol: number, out: Uint8Array): void {
  for (let i = first, j = 3 * first; i < end; i++, j += 3) {
    const s = nx * (pts[j]! - ox) + ny * (pts[j + 1]! - oy) + nz * (pts[j + 2]! - oz);
    out[i] = s <= tol && s >= -tol ? 2 : s < 0 ? 1 : 4;
  }
}

let crossing = new Int32Array(0);
let side = new Uint8Array(0);

/**
 * A scan of every cell of a piece with no polyhedra. One pass over the points: a side byte per point (1 below,
 * 2 on, 4 above). Then per cell the OR of its nodes' side bytes — the lead
 * run (`cellLayout`) with a fixed stride, the cells after it by their offsets: the candidates, exactly as the
 * scans over block boxes select them.
 */
function fullScan(p: Piece, ox: number, oy: number, oz: number, nx: number, ny: number, nz: number,
  tol: number, g0: number, nFound: number): number {
  const nc = p.cellTypes.length, np = p.points.length / 3;
  const lay = cellLayout(p), m = lay.leadSize, lead = lay.leadCells, base = lay.base;
  if (side.length < np) side = new Uint8Array(Math.max(np, 2 * side.length));
  pointSides(p.points, lay.firstPoint, lay.endPoint, ox, oy, oz, nx, ny, nz, tol, side);
  // Room for a chunk at a time: every cell's id is written, so room for all of them would be as many fresh
  // bytes as the piece has cells (40 MB at 10M cells), where the candidates are a small share.
  for (let c0 = 0; c0 < lead; c0 += SCAN_CHUNK) {
    const c1 = Math.min(lead, c0 + SCAN_CHUNK);
    reserveFound(nFound + (c1 - c0));
    nFound = m === 8 ? sideBytesOf8(p.connectivity, base, c0, c1, side, g0, found, nFound) : sideBytesOf4(p.connectivity, base, c0, c1, side, g0, found, nFound);
  }
  for (let c0 = lead; c0 < nc; c0 += SCAN_CHUNK) {
    const c1 = Math.min(nc, c0 + SCAN_CHUNK);
    reserveFound(nFound + (c1 - c0));
    nFound = sideBytesOfAny(p.cellTypes, p.offsets, p.connectivity, c0, c1, side, g0, found, nFound);
  }
  return nFound;
}

/** Cells a full scan reads between two checks of the room for candidates. */
const SCAN_CHUNK = 1 << 14;

/** Cells c0 … c1 − 1 of a piece of any cells but polyhedra, by their nodes' side bytes; same test as `blockOfAny`. */
function sideBytesOfAny(types: Uint8Array, off: Int32Array, conn: Int32Array, c0: number, c1: number, side: Uint8Array, g0: number,
  out: Int32Array, nFound: number): number {
  for (let c = c0; c < c1; c++) {
    let m = 0;
    for (let q = off[c]!, qe = off[c + 1]!; q < qe; q++) m |= side[conn[q]!]!;
    out[nFound] = g0 + c;
    nFound += SOLID[types[c]!]! & (m === 3 || m >= 5 ? 1 : 0);
  }
  return nFound;
}

/** Cells c0 … c1 − 1 of a lead run of hexahedra (8 nodes a cell, back to back from `base`) by their nodes' side bytes; same test as `blockOf8`. */
function sideBytesOf8(conn: Int32Array, base: number, c0: number, c1: number, side: Uint8Array, g0: number, out: Int32Array, nFound: number): number {
  for (let c = c0, q = base + 8 * c0; c < c1; c++, q += 8) {
    const m = side[conn[q]!]! | side[conn[q + 1]!]! | side[conn[q + 2]!]! | side[conn[q + 3]!]!
      | side[conn[q + 4]!]! | side[conn[q + 5]!]! | side[conn[q + 6]!]! | side[conn[q + 7]!]!;
    out[nFound] = g0 + c;
    nFound += m === 3 || m >= 5 ? 1 : 0;
  }
  return nFound;
}

/** `sideBytesOf8` for tetrahedra (4 nodes a cell). */
function sideBytesOf4(conn: Int32Array, base: number, c0: number, c1: number, side: Uint8Array, g0: number, out: Int32Array, nFound: number): number {
  for (let c = c0, q = base + 4 * c0; c < c1; c++, q += 4) {
    const m = side[conn[q]!]! | side[conn[q + 1]!]! | side[conn[q + 2]!]! | side[conn[q + 3]!]!;
    out[nFound] = g0 + c;
    nFound += m === 3 || m >= 5 ? 1 : 0;
  }
  return nFound;
}

/**
 * Side code of point id `i` (1 below, 2 on, 4 above): the kernel's snapped signed distance, the same
 * expression, so scan and kernel agree bit for bit. Cells OR their nodes' codes: 3, 5, 6, 7 mean a possible cut.
 */
function sideOf(pts: Float64Array, i: number, ox: number, oy: number, oz: number, nx: number, ny: number, nz: number, tol: number): number {
  const j = 3 * i;
  const s = nx * (pts[j]! - ox) + ny * (pts[j + 1]! - oy) + nz * (pts[j + 2]! - oz);
  return s <= tol && s >= -tol ? 2 : s < 0 ? 1 : 4;
}

/** Makes room in `found` for `n` entries. */
function reserveFound(n: number): void {
  if (found.length >= n) return;
  const g = new Int32Array(Math.max(n, 2 * found.length)); g.set(found); found = g;
}

/** 1 for the cell types the cut kernel cuts (3D: the fixed types and polyhedra), 0 for every other byte value. */
const SOLID = Uint8Array.from({ length: 256 }, (_, t) => (cellDimension(t) === 3 ? 1 : 0));

/*
 * The per-block passes write every cell's id and advance the count only for a crossing one (room is made
 * before the call): no branch that a first pass over a file may not have taken yet when the engine optimises
 * the loop, and no code after the loop (either threw the optimised loop away mid-pass on a file's first cut).
 */

/** Cells c0 … c1 − 1 of a piece of hexahedra only (8 nodes a cell, back to back from `base`). */
function blockOf8(pts: Float64Array, conn: Int32Array, base: number, c0: number, c1: number, ox: number, oy: number, oz: number,
  nx: number, ny: number, nz: number, tol: number, g0: number, out: Int32Array, nFound: number): number {
  for (let c = c0, q = base + 8 * c0; c < c1; c++, q += 8) {
    const m = sideOf(pts, conn[q]!, ox, oy, oz, nx, ny, nz, tol) | sideOf(pts, conn[q + 1]!, ox, oy, oz, nx, ny, nz, tol)
      | sideOf(pts, conn[q + 2]!, ox, oy, oz, nx, ny, nz, tol) | sideOf(pts, conn[q + 3]!, ox, oy, oz, nx, ny, nz, tol)
      | sideOf(pts, conn[q + 4]!, ox, oy, oz, nx, ny, nz, tol) | sideOf(pts, conn[q + 5]!, ox, oy, oz, nx, ny, nz, tol)
      | sideOf(pts, conn[q + 6]!, ox, oy, oz, nx, ny, nz, tol) | sideOf(pts, conn[q + 7]!, ox, oy, oz, nx, ny, nz, tol);
    out[nFound] = g0 + c;
    nFound += m === 3 || m >= 5 ? 1 : 0;
  }
  return nFound;
}

/** Cells c0 … c1 − 1 of a piece of tetrahedra only (4 nodes a cell, back to back from `base`). */
function blockOf4(pts: Float64Array, conn: Int32Array, base: number, c0: number, c1: number, ox: number, oy: number, oz: number,
  nx: number, ny: number, nz: number, tol: number, g0: number, out: Int32Array, nFound: number): number {
  for (let c = c0, q = base + 4 * c0; c < c1; c++, q += 4) {
    const m = sideOf(pts, conn[q]!, ox, oy, oz, nx, ny, nz, tol) | sideOf(pts, conn[q + 1]!, ox, oy, oz, nx, ny, nz, tol)
      | sideOf(pts, conn[q + 2]!, ox, oy, oz, nx, ny, nz, tol) | sideOf(pts, conn[q + 3]!, ox, oy, oz, nx, ny, nz, tol);
    out[nFound] = g0 + c;
    nFound += m === 3 || m >= 5 ? 1 : 0;
  }
  return nFound;
}

/** Cells c0 … c1 − 1 of any piece: the 3D cells with nodes on both sides (polyhedra by their face stream when their connectivity is empty). */
function blockOfAny(pts: Float64Array, types: Uint8Array, off: Int32Array, conn: Int32Array, faceConn: Int32Array | undefined,
  faceOff: Int32Array | undefined, cellFaceStart: Int32Array | undefined, ox: number, oy: number, oz: number,
  nx: number, ny: number, nz: number, tol: number, g0: number, c0: number, c1: number, out: Int32Array, nFound: number): number {
  for (let c = c0; c < c1; c++) {
    const t = types[c]!;
    let a = off[c]!, b = off[c + 1]!, ids = conn;
    if (t === CellType.POLYHEDRON && a === b && faceConn && faceOff && cellFaceStart) {
      ids = faceConn; a = faceOff[cellFaceStart[c]!]!; b = faceOff[cellFaceStart[c + 1]!]!;
    }
    let m = 0;
    for (let q = a; q < b; q++) m |= sideOf(pts, ids[q]!, ox, oy, oz, nx, ny, nz, tol);
    // A 3D cell below with anything else (3, 5, 7), or with on-plane nodes above the plane (6: a boundary
    // face may lie in it). Lower-dimensional cells (boundary faces stored with the volume) count for nothing.
    out[nFound] = g0 + c;
    nFound += SOLID[t]! & (m === 3 || m >= 5 ? 1 : 0);
  }
  return nFound;
}

let scanLoopsWarm = false;

/**
 * Runs the full scan's loops (point sides, the fixed-stride side-byte loops, the
 * per-cell loop over a tail of triangles) on a lattice-sized set of arrays of the loaded files' types, enough
 * times that the engine optimises them: a whole-mesh warm-up cut reads a few hundred cells of a tail, and the
 * first real scan then ran the tail loop (the boundary triangles a file stores after its tetrahedra)
 * unoptimised. Once per thread; results are thrown away.
 */
export function warmUpScanLoops(): void {
  if (scanLoopsWarm) return;
  scanLoopsWarm = true;
  const np = 4096, nc = 2048, pts = new Float64Array(3 * np), conn = new Int32Array(8 * nc);
  const types = new Uint8Array(nc).fill(CellType.TRIANGLE), off = new Int32Array(nc + 1);
  for (let i = 0; i < 3 * np; i++) pts[i] = ((i * 7919) % 1021) / 1021;
  for (let q = 0; q < conn.length; q++) conn[q] = (q * 2654435761 >>> 0) % np;
  for (let c = 0; c <= nc; c++) off[c] = 3 * c;
  for (let c = 0; c < nc; c += 5) types[c] = CellType.TETRA;
  const sides = new Uint8Array(np), out = new Int32Array(2 * nc);
  for (let r = 0; r < 40; r++) {
    const oz = 0.3 + 0.01 * r, nz = r % 2 === 0 ? 1 : -1;
    pointSides(pts, 0, np, 0.5, 0.5, oz, 0.1, 0.05, nz, 1e-12, sides);
    sideBytesOf8(conn, 0, 0, nc, sides, 0, out, 0);
    sideBytesOf4(conn, 0, 0, 2 * nc, sides, 0, out, 0);
    sideBytesOfAny(types, off, conn, 0, nc, sides, 0, out, 0);
  }
  // The boxed scan's loops (a piece's scans after its boxes are bought): box tests, then short runs of cells
  // by coordinates, as a file's later cuts call them thousands of times; they ran partly unoptimised there.
  const nf = nc / FINE_BLOCK, nb = nc / CELL_BLOCK, fine = new Float64Array(6 * nf), boxes = new Float64Array(6 * nb);
  for (let f = 0; f < nf; f++) {
    const x = ((f * 37) % 101) / 101, y = ((f * 53) % 97) / 97, z = ((f * 71) % 89) / 89;
    fine.set([x, y, z, x + 0.08, y + 0.08, z + 0.08], 6 * f);
  }
  for (let b = 0; b < nb; b++) boxes.set([0, 0, 0, 1, 1, 1], 6 * b);
  const cross = new Int32Array(nb), from = new Int32Array(nf), to = new Int32Array(nf);
  for (let r = 0; r < 12; r++) {
    const ox = 0.2 + 0.05 * r, nx = r % 2 === 0 ? 0.8 : -0.8;
    const n = blocksMayCross(boxes, nb, ox, 0.5, 0.5, nx, 0.6, 0, 1e-12, cross);
    const runs = fineRuns(fine, nf, nc, cross, n, ox, 0.5, 0.5, nx, 0.6, 0, 1e-12, from, to);
    for (let i = 0; i < runs; i++) {
      blockOf8(pts, conn, 0, from[i]!, to[i]!, ox, 0.5, 0.5, nx, 0.6, 0, 1e-12, 0, out, 0);
      blockOf4(pts, conn, 0, from[i]!, to[i]!, ox, 0.5, 0.5, nx, 0.6, 0, 1e-12, 0, out, 0);
      blockOfAny(pts, types, off, conn, undefined, undefined, undefined, ox, 0.5, 0.5, nx, 0.6, 0, 1e-12, 0, from[i]!, to[i]!, out, 0);
    }
  }
}
