/**
 * Evenly spaced line samples located without the cell tree: the cells of the blocks (cellBlocks.ts) that
 * the segment meets are visited one by one, and each cell is evaluated at the samples inside its padded
 * box. The result is the one `locatePoint` gives along the line (lineProbe.ts), sample for sample:
 *
 * `locatePoint` keeps, among the cells whose padded box holds the point, the one with the smallest
 * max(violation, 0), ties to the lowest global id; it stops early at a cell holding the point deeper than
 * the tolerance, and accepts the previous sample's cell at once when it holds the point that deep. Both
 * shortcuts change the answer only where two cells both hold the point (violation ≤ 0) and one of them
 * deeper than the tolerance — overlapping cells, never a conforming mesh. Here every candidate is
 * evaluated and the rule applied in full, which does not depend on the order of the visit; a sample where
 * two cells hold the point with one that deep is reported (`ambiguous`) and the caller takes the tree path,
 * so the answer is the tree's answer there too.
 *
 * Cost: the cells of the blocks met, about BLOCK × (blocks met), known before any cell is visited, so the
 * caller can build the tree instead when a line would visit too many (`maxCells`).
 * Coordinates in the file's length unit; tolerance parametric (locatePoint.ts).
 */
import { cellDimension, CellType } from '../model/cellTypes.ts';
import { BLOCK, GROUP, type CellBlocks } from './cellBlocks.ts';
import { PAD } from './cellTree.ts';
import { evaluateCell } from './locatePoint.ts';
import { segmentMeetsBox } from './segmentBox.ts';
import type { Piece } from '../model/piece.ts';

export type Vec3 = readonly [number, number, number];

/** Where each sample lies: the rule of `locatePoint` applied to every candidate. */
export interface ScannedSamples {
  /** Global cell id per sample, −1 where no volume cell holds it. */
  readonly cell: Int32Array;
  /** max(violation, 0) of that cell (Infinity where none). */
  readonly rank: Float64Array;
  /** True when some sample lies in two cells, one deeper than the tolerance (use the tree for this line). */
  readonly ambiguous: boolean;
  /** Cells visited. */
  readonly visited: number;
}

let hitBlocks = new Int32Array(0);

/**
 * Blocks whose padded box the segment meets (super-groups, then groups, then blocks), into the module buffer;
 * returns their count. The walk below a super-group is a function of its own, called for each one met, so it
 * is optimised with feedback for all of it (code run once, before a loop, has none).
 */
function blocksMet(b: CellBlocks, from: Vec3, to: Vec3): number {
  const sb = b.superBoxes, ns = sb.length / 6;
  const px = from[0], py = from[1], pz = from[2], dx = to[0] - px, dy = to[1] - py, dz = to[2] - pz;
  // Room for every block before the walk: a branch first taken late would throw the optimised walk away.
  if (hitBlocks.length < b.boxes.length / 6) hitBlocks = new Int32Array(b.boxes.length / 6);
  let found = 0;
  for (let s = 0; s < ns; s++) {
    if (meets(sb, s, px, py, pz, dx, dy, dz)) found = blocksUnder(b.groupBoxes, b.boxes, s, px, py, pz, dx, dy, dz, hitBlocks, found);
  }
  return found;
}

/** Appends to `hit` (from `found`) the blocks of super-group s that the segment meets; returns the new count. */
function blocksUnder(gb: Float32Array, bb: Float32Array, s: number, px: number, py: number, pz: number, dx: number, dy: number, dz: number,
  hit: Int32Array, found: number): number {
  const nb = bb.length / 6, ng = gb.length / 6;
  for (let g = s * GROUP, ge = Math.min(ng, g + GROUP); g < ge; g++) {
    if (!meets(gb, g, px, py, pz, dx, dy, dz)) continue;
    for (let j = g * GROUP, je = Math.min(nb, j + GROUP); j < je; j++) {
      if (!meets(bb, j, px, py, pz, dx, dy, dz)) continue;
      hit[found++] = j;
    }
  }
  return found;
}

function meets(boxes: Float32Array, i: number, px: number, py: number, pz: number, dx: number, dy: number, dz: number): boolean {
  const o = 6 * i;
  return segmentMeetsBox(boxes[o]!, boxes[o + 1]!, boxes[o + 2]!, boxes[o + 3]!, boxes[o + 4]!, boxes[o + 5]!, px, py, pz, dx, dy, dz);
}

/**
 * Locates `n` (≥ 2) evenly spaced samples of A→B (sample i at τ = i/(n − 1), the last exactly at B, as
 * lineProbe.ts places them) with parametric tolerance `tolerance`; null, before any cell is visited, when
 * the blocks met hold more than `maxCells` cells.
 */
export function scanLineSamples(b: CellBlocks, from: Vec3, to: Vec3, n: number, tolerance: number, maxCells = Infinity): ScannedSamples | null {
  const nbm = blocksMet(b, from, to);
  if (nbm * BLOCK > maxCells) return null;
  const cell = new Int32Array(n).fill(-1), rank = new Float64Array(n).fill(Infinity);
  // Per sample: bits 0–1 count the cells holding it (violation ≤ 0, capped at 2), bit 2 one holding it deeper than the tolerance.
  const flags = new Uint8Array(n);
  const pieces = b.dataset.pieces, pb = b.pieceBlocks;
  let visited = 0, k = 0;
  for (let h = 0; h < nbm; h++) {
    const j = hitBlocks[h]!;
    while (j >= pb[k + 1]!) k++;
    const p = pieces[k]!, c0 = (j - pb[k]!) * BLOCK, c1 = Math.min(p.cellTypes.length, c0 + BLOCK);
    visited += c1 - c0;
    scanBlock(p, c0, c1, b.starts[k]!, from, to, n, tolerance, cell, rank, flags);
  }
  let ambiguous = false;
  for (let i = 0; i < n; i++) if ((flags[i]! & 3) >= 2 && (flags[i]! & 4) !== 0) { ambiguous = true; break; }
  return { cell, rank, ambiguous, visited };
}

/** Each volume cell c0 … c1 − 1 of piece `p` (global ids from g0) evaluated at the samples in its padded box. */
function scanBlock(p: Piece, c0: number, c1: number, g0: number, from: Vec3, to: Vec3, n: number,
  tolerance: number, cell: Int32Array, rank: Float64Array, flags: Uint8Array): void {
  const pts = p.points, types = p.cellTypes, off = p.offsets, pf = p.polyFaces;
  const ax = from[0], ay = from[1], az = from[2], dx = to[0] - ax, dy = to[1] - ay, dz = to[2] - az, last = n - 1;
  for (let c = c0; c < c1; c++) {
    const type = types[c]!;
    if (cellDimension(type) !== 3) continue;
    let ids = p.connectivity, a = off[c]!, e = off[c + 1]!;
    if (a === e && type === CellType.POLYHEDRON && pf) {
      ids = pf.faceConnectivity; a = pf.faceOffsets[pf.cellFaceStart[c]!]!; e = pf.faceOffsets[pf.cellFaceStart[c + 1]!]!;
    }
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity, z0 = Infinity, z1 = -Infinity;
    for (let q = a; q < e; q++) {
      const i = 3 * ids[q]!, x = pts[i]!, y = pts[i + 1]!, z = pts[i + 2]!;
      if (x < x0) x0 = x; if (x > x1) x1 = x;
      if (y < y0) y0 = y; if (y > y1) y1 = y;
      if (z < z0) z0 = z; if (z > z1) z1 = z;
    }
    if (!(x0 <= x1)) continue;
    // The tree's padding (cellTree.ts), and a hair more for rounding.
    const pad = Math.max(x1 - x0, y1 - y0, z1 - z0) * PAD * (1 + 1e-9) + 1e-300;
    x0 -= pad; x1 += pad; y0 -= pad; y1 += pad; z0 -= pad; z1 += pad;
    // Parameter range of the segment inside the box, widened by a sample each way; each sample is then tested itself.
    let t0 = 0, t1 = 1;
    if (dx !== 0) { const u = (x0 - ax) / dx, v = (x1 - ax) / dx; t0 = Math.max(t0, Math.min(u, v)); t1 = Math.min(t1, Math.max(u, v)); }
    if (dy !== 0) { const u = (y0 - ay) / dy, v = (y1 - ay) / dy; t0 = Math.max(t0, Math.min(u, v)); t1 = Math.min(t1, Math.max(u, v)); }
    if (dz !== 0) { const u = (z0 - az) / dz, v = (z1 - az) / dz; t0 = Math.max(t0, Math.min(u, v)); t1 = Math.min(t1, Math.max(u, v)); }
    if (!(t0 <= t1)) continue;
    const i0 = Math.max(0, Math.ceil(t0 * last) - 1), i1 = Math.min(last, Math.floor(t1 * last) + 1);
    const g = g0 + c;
    for (let i = i0; i <= i1; i++) {
      const t = i / last;
      const px = i === last ? to[0] : ax + t * dx, py = i === last ? to[1] : ay + t * dy, pz = i === last ? to[2] : az + t * dz;
      if (px < x0 || px > x1 || py < y0 || py > y1 || pz < z0 || pz > z1) continue;
      const v = evaluateCell(p, c, px, py, pz);
      const score = v > 0 ? v : 0;
      if (!(score <= tolerance)) continue;
      if (v <= 0) { const f = flags[i]!; flags[i] = (f & 4) | Math.min((f & 3) + 1, 2) | (v < -tolerance ? 4 : 0); }
      // Both read every time: a tie (a sample on a shared face) first met on a later line would otherwise
      // meet code without type feedback and throw the optimised loop away.
      const r = rank[i]!, held = cell[i]!, less = score < r, equal = score === r, lower = g < held;
      if (less || (equal && lower)) { rank[i] = score; cell[i] = g; }
    }
  }
}
