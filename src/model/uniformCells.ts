/**
 * Facts about a piece's cell arrays that let the whole-mesh passes (cut scan, cell-tree build) do less
 * work, computed once per offsets array (a loaded piece's arrays never change) and cached:
 *  - the lead run: the cells from the first on that are all tetrahedra or all hexahedra stored back to back
 *    (`leadCells` of `leadSize` nodes each) — the whole piece for the common output of mesh generators, and
 *    all but the tail for a volume mesh followed by its boundary faces (tetrahedra, then triangles). The scans
 *    step through the lead with a fixed stride instead of reading each cell's type and offsets; `size` is the
 *    stride only when the lead is the whole piece;
 *  - the range of point ids the cells use: a worker's share of the cells (`src/parallel/shares.ts`, views
 *    into the whole arrays) classifies only the points its cells can reach, not every point of the file
 *    (for a piece's full cell list the answer is the whole piece, without a pass).
 */
import { CellType } from './cellTypes.ts';
import type { Piece } from './piece.ts';

/** See the file comment. Cell c < leadCells has nodes `connectivity[base + leadSize·c … base + leadSize·(c + 1) − 1]`. */
export interface CellLayout {
  /** Nodes of every cell (4 or 8) of a single-type piece, else 0 (`leadSize` when `leadCells` is every cell). */
  readonly size: number;
  /** Nodes of each cell of the lead run (4 or 8), 0 when the first cell is neither a tetrahedron nor a hexahedron. */
  readonly leadSize: number;
  /** Cells of the lead run: cells 0 … leadCells − 1 are all of one type with `leadSize` nodes back to back. */
  readonly leadCells: number;
  /** `offsets[0]` (not 0 for a share's view of a piece). */
  readonly base: number;
  /** The cells use point ids `firstPoint … endPoint − 1` only (the whole piece for its full cell list or with polyhedra). */
  readonly firstPoint: number;
  readonly endPoint: number;
}

interface Entry { types: Uint8Array; leadSize: number; leadCells: number; size: number; range?: Int32Array }

const cache = new WeakMap<Int32Array, Entry>();

function entry(types: Uint8Array, off: Int32Array): Entry {
  let hit = cache.get(off);
  if (!hit || hit.types !== types) {
    const nc = types.length, t = nc > 0 && off.length === nc + 1 ? types[0]! : -1;
    const m = t === CellType.TETRA ? 4 : t === CellType.HEXAHEDRON ? 8 : 0;
    const lead = m === 0 ? 0 : leadRun(types, off, t, m);
    hit = { types, leadSize: lead > 0 ? m : 0, leadCells: lead, size: lead === nc && lead > 0 ? m : 0 };
    cache.set(off, hit);
  }
  return hit;
}

/**
 * Node count of every cell (4 or 8) when the cells are only tetrahedra or only hexahedra with offsets
 * `offsets[0] + c·size`, else 0.
 */
export function uniformSize(types: Uint8Array, off: Int32Array): number {
  return entry(types, off).size;
}

/** The layout of a piece's cells (see `CellLayout`); the point range costs one pass over the cells' connectivity, once. */
export function cellLayout(p: Piece): CellLayout {
  const e = entry(p.cellTypes, p.offsets), np = p.points.length / 3;
  if (!e.range) e.range = pointRangeOf(p, np);
  return { size: e.size, leadSize: e.leadSize, leadCells: e.leadCells, base: p.offsets[0] ?? 0, firstPoint: e.range[0]!, endPoint: e.range[1]! };
}

/** Cells from the first on of type `t` with offsets `offsets[0] + c·m` (c ≤ the count): the lead run's length. */
function leadRun(types: Uint8Array, off: Int32Array, t: number, m: number): number {
  const nc = types.length, b = off[0]!;
  let c = 0;
  while (c < nc && types[c] === t && off[c + 1] === b + m * (c + 1)) c++;
  return c;
}

function pointRangeOf(p: Piece, np: number): Int32Array {
  const nc = p.cellTypes.length;
  if (p.polyFaces || nc === 0) return Int32Array.of(0, np);
  const conn = p.connectivity, a = p.offsets[0]!, b = p.offsets[nc]!;
  // All of the piece's cells (not a share's view): no pass needed, the whole piece is a safe answer.
  if (a === 0 && b === conn.length) return Int32Array.of(0, np);
  let lo = np, hi = -1;
  for (let q = a; q < b; q++) { const id = conn[q]!; if (id < lo) lo = id; if (id > hi) hi = id; }
  return hi < lo ? Int32Array.of(0, 0) : Int32Array.of(lo, hi + 1);
}
