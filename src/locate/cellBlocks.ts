/**
 * Boxes of runs of consecutive cells ("blocks"), the cheap alternative to the cell tree for a dataset's
 * first line probes: one sequential pass over the connectivity, no sort, no per-cell output.
 *
 * Mesh generators write cells in an order that keeps neighbours near each other (an advancing front, a
 * sweep, a lattice), so the box of BLOCK consecutive cells is small and a line meets few of them; a line
 * then visits only the cells of those blocks (scanLocate.ts). A file whose cells are scattered gives large
 * boxes, the line meets most blocks, and the caller builds the tree instead (`blockScanCost`).
 *
 * Layout (all typed arrays; boxes are `[xmin, xmax, ymin, ymax, zmin, zmax]` in the file's length unit):
 *  - block j of piece k covers that piece's cells `BLOCK·(j − pieceBlocks[k]) …` (BLOCK of them, fewer in
 *    the piece's last block); blocks never straddle two pieces;
 *  - `boxes`: Float32Array(6 · blocks), the box of every point the block's cells use (2D cells included),
 *    padded outward by 2·PAD × the box's largest extent, so it holds every padded cell box of the block
 *    (cellTree.ts pads a cell's box by PAD × the cell's own extent). A block without points has an
 *    inverted box that nothing meets;
 *  - `groupBoxes`: Float32Array(6 · groups), the union of GROUP consecutive block boxes, and
 *    `superBoxes` the union of GROUP consecutive group boxes: a walk tests super-groups, then the groups of
 *    those met, then their blocks.
 */
import { cellDimension, CellType } from '../model/cellTypes.ts';
import { cellStarts, type Dataset } from '../model/dataset.ts';
import { geometryOnly, meshKey, type MeshKey } from '../model/meshKey.ts';
import type { Piece } from '../model/piece.ts';
import { PAD } from './cellTree.ts';

/** Cells per block. */
export const BLOCK = 8;
/** Blocks per group, and groups per super-group (the first test of a walk). */
export const GROUP = 16;

export interface CellBlocks {
  readonly dataset: Dataset;
  /** Cells of every piece. */
  readonly cellCount: number;
  /** Cells of dimension 3 (the ones point location can return). */
  readonly volumeCellCount: number;
  /** `cellStarts(dataset)`: global id → piece. */
  readonly starts: Int32Array;
  /** First block of each piece; the last entry is the block count. */
  readonly pieceBlocks: Int32Array;
  readonly boxes: Float32Array;
  readonly groupBoxes: Float32Array;
  readonly superBoxes: Float32Array;
  /** Bytes of the arrays kept. */
  readonly bytes: number;
  /** Wall time of the build, milliseconds. */
  readonly buildMs: number;
}

const cache = new WeakMap<MeshKey, CellBlocks>();

/** The blocks of a dataset, built on first call and cached by its mesh (`meshKey`), geometry only. */
export function getCellBlocks(dataset: Dataset): CellBlocks {
  const key = meshKey(dataset);
  let b = cache.get(key);
  if (!b) { b = buildCellBlocks(geometryOnly(dataset)); cache.set(key, b); }
  return b;
}

/** Builds the blocks without touching the cache. */
export function buildCellBlocks(dataset: Dataset): CellBlocks {
  const t0 = performance.now();
  const starts = cellStarts(dataset);
  const pieces = dataset.pieces;
  const pieceBlocks = new Int32Array(pieces.length + 1);
  for (let k = 0; k < pieces.length; k++) pieceBlocks[k + 1] = pieceBlocks[k]! + Math.ceil(pieces[k]!.cellTypes.length / BLOCK);
  const nb = pieceBlocks[pieces.length]!;
  const ng = Math.ceil(nb / GROUP), ns = Math.ceil(ng / GROUP);
  const boxes = new Float32Array(6 * nb), groupBoxes = new Float32Array(6 * ng), superBoxes = new Float32Array(6 * ns);
  for (let o = 0; o < groupBoxes.length; o += 2) { groupBoxes[o] = Infinity; groupBoxes[o + 1] = -Infinity; }
  // The group boxes and the volume-cell count are made in the pass over the connectivity: as passes of their
  // own they ran unoptimised over a million cells on a file's first line (5–9 ms after the warm-up).
  let volume = 0;
  for (let k = 0; k < pieces.length; k++) {
    const p = pieces[k]!;
    volume += p.polyFaces ? polyBlockBoxes(p, boxes, groupBoxes, pieceBlocks[k]!)
      : blockBoxes(p.points, p.connectivity, p.offsets, p.cellTypes, boxes, groupBoxes, pieceBlocks[k]!);
  }
  unionGroups(groupBoxes, ng, superBoxes);
  return {
    dataset, cellCount: starts[starts.length - 1]!, volumeCellCount: volume, starts, pieceBlocks, boxes, groupBoxes, superBoxes,
    bytes: starts.byteLength + pieceBlocks.byteLength + boxes.byteLength + groupBoxes.byteLength + superBoxes.byteLength,
    buildMs: performance.now() - t0,
  };
}

/** 1 for volume cell types, by type number. */
const DIM3 = (() => {
  const t = new Uint8Array(256);
  for (let i = 0; i < 256; i++) t[i] = cellDimension(i) === 3 ? 1 : 0;
  return t;
})();

/**
 * Box of the points each block's connectivity range names (the cells of a block are consecutive, so are
 * their ids): one sequential read of the connectivity, whatever the cell types. Each box is joined into its
 * group's box in `groups`; returns the piece's count of volume cells.
 */
function blockBoxes(pts: Float64Array, conn: Int32Array, off: Int32Array, types: Uint8Array, out: Float32Array, groups: Float32Array, b0: number): number {
  const nc = types.length;
  let volume = 0;
  for (let c0 = 0, j = b0; c0 < nc; c0 += BLOCK, j++) {
    const ce = Math.min(nc, c0 + BLOCK), a = off[c0]!, e = off[ce]!;
    for (let c = c0; c < ce; c++) volume += DIM3[types[c]!]!;
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity, z0 = Infinity, z1 = -Infinity;
    for (let q = a; q < e; q++) {
      const i = 3 * conn[q]!, x = pts[i]!, y = pts[i + 1]!, z = pts[i + 2]!;
      if (x < x0) x0 = x; if (x > x1) x1 = x;
      if (y < y0) y0 = y; if (y > y1) y1 = y;
      if (z < z0) z0 = z; if (z > z1) z1 = z;
    }
    writePadded(out, 6 * j, x0, x1, y0, y1, z0, z1);
    joinGroup(out, 6 * j, groups, 6 * Math.floor(j / GROUP));
  }
  return volume;
}

/** As `blockBoxes` for a piece with polyhedra: each cell's connectivity, or its face stream when it has none. */
function polyBlockBoxes(p: Piece, out: Float32Array, groups: Float32Array, b0: number): number {
  const pts = p.points, nc = p.cellTypes.length, pf = p.polyFaces!;
  let volume = 0;
  for (let c0 = 0, j = b0; c0 < nc; c0 += BLOCK, j++) {
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity, z0 = Infinity, z1 = -Infinity;
    for (let c = c0, ce = Math.min(nc, c0 + BLOCK); c < ce; c++) {
      volume += DIM3[p.cellTypes[c]!]!;
      let ids = p.connectivity, a = p.offsets[c]!, e = p.offsets[c + 1]!;
      if (a === e && p.cellTypes[c] === CellType.POLYHEDRON) {
        ids = pf.faceConnectivity; a = pf.faceOffsets[pf.cellFaceStart[c]!]!; e = pf.faceOffsets[pf.cellFaceStart[c + 1]!]!;
      }
      for (let q = a; q < e; q++) {
        const i = 3 * ids[q]!, x = pts[i]!, y = pts[i + 1]!, z = pts[i + 2]!;
        if (x < x0) x0 = x; if (x > x1) x1 = x;
        if (y < y0) y0 = y; if (y > y1) y1 = y;
        if (z < z0) z0 = z; if (z > z1) z1 = z;
      }
    }
    writePadded(out, 6 * j, x0, x1, y0, y1, z0, z1);
    joinGroup(out, 6 * j, groups, 6 * Math.floor(j / GROUP));
  }
  return volume;
}

/** Joins the block box at b[o …] into the group box at g[q …] (an inverted block box, a block without points, adds nothing). */
function joinGroup(b: Float32Array, o: number, g: Float32Array, q: number): void {
  if (!(b[o]! <= b[o + 1]!)) return;
  if (b[o]! < g[q]!) g[q] = b[o]!; if (b[o + 1]! > g[q + 1]!) g[q + 1] = b[o + 1]!;
  if (b[o + 2]! < g[q + 2]!) g[q + 2] = b[o + 2]!; if (b[o + 3]! > g[q + 3]!) g[q + 3] = b[o + 3]!;
  if (b[o + 4]! < g[q + 4]!) g[q + 4] = b[o + 4]!; if (b[o + 5]! > g[q + 5]!) g[q + 5] = b[o + 5]!;
}

/**
 * Writes a block's box padded by PAD × its largest extent (twice over), and a little more for rounding: of the
 * padded cell boxes, and of storing the box as Float32 (at most 2^-24 of a coordinate, covered twice over, so
 * the stored box is never smaller; half the memory of doubles, the pass's fresh memory being part of its cost);
 * a block without points keeps its inverted box.
 */
function writePadded(out: Float32Array, o: number, x0: number, x1: number, y0: number, y1: number, z0: number, z1: number): void {
  let pad = 0;
  if (x0 <= x1) {
    const ext = Math.max(x1 - x0, y1 - y0, z1 - z0);
    const big = Math.max(Math.abs(x0), Math.abs(x1), Math.abs(y0), Math.abs(y1), Math.abs(z0), Math.abs(z1));
    pad = 2 * PAD * ext + 2.4e-7 * big + 1e-37;
  }
  out[o] = x0 - pad; out[o + 1] = x1 + pad; out[o + 2] = y0 - pad; out[o + 3] = y1 + pad; out[o + 4] = z0 - pad; out[o + 5] = z1 + pad;
}

function unionGroups(b: Float32Array, nb: number, out: Float32Array): void {
  for (let g = 0, j0 = 0; j0 < nb; g++, j0 += GROUP) {
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity, z0 = Infinity, z1 = -Infinity;
    for (let j = j0, je = Math.min(nb, j0 + GROUP); j < je; j++) {
      const o = 6 * j;
      if (!(b[o]! <= b[o + 1]!)) continue;
      if (b[o]! < x0) x0 = b[o]!; if (b[o + 1]! > x1) x1 = b[o + 1]!;
      if (b[o + 2]! < y0) y0 = b[o + 2]!; if (b[o + 3]! > y1) y1 = b[o + 3]!;
      if (b[o + 4]! < z0) z0 = b[o + 4]!; if (b[o + 5]! > z1) z1 = b[o + 5]!;
    }
    const o = 6 * g;
    out[o] = x0; out[o + 1] = x1; out[o + 2] = y0; out[o + 3] = y1; out[o + 4] = z0; out[o + 5] = z1;
  }
}
