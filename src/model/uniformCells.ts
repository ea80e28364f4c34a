/**
 * Facts about a piece's cell arrays that let the whole-mesh passes (cut scan, cell-tree build) do less
 * work, computed once per offsets array (a loaded piece's arrays never change) and cached:
 *  - single-type pieces — only tetrahedra or only hexahedra stored back to back, the common output of mesh
 *    generators — are stepped through with a fixed stride instead of reading each cell's type and offsets;
 *  - the range of point ids the cells use: a worker's share of the cells (`src/parallel/shares.ts`, views
 *    into the whole arrays) classifies only the points its cells can reach, not every point of the file
 *    (for a piece's full cell list the answer is the whole piece, without a pass).
 */
import { CellType } from './cellTypes.ts';
import type { Piece } from './piece.ts';

/** See the file comment. Cell c's nodes are `connectivity[base + size·c … base + size·(c + 1) − 1]` when size > 0. */
export interface CellLayout {
  /** Nodes of every cell (4 or 8) of a single-type piece, else 0. */
  readonly size: number;
  /** `offsets[0]` (not 0 for a share's view of a piece). */
  readonly base: number;
  /** The cells use point ids `firstPoint … endPoint − 1` only (the whole piece for its full cell list or with polyhedra). */
  readonly firstPoint: number;
  readonly endPoint: number;
}

const cache = new WeakMap<Int32Array, { types: Uint8Array; size: number; range?: Int32Array }>();

function entry(types: Uint8Array, off: Int32Array): { types: Uint8Array; size: number; range?: Int32Array } {
  let hit = cache.get(off);
  if (!hit || hit.types !== types) { hit = { types, size: uniformSizeOf(types, off) }; cache.set(off, hit); }
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
  return { size: e.size, base: p.offsets[0] ?? 0, firstPoint: e.range[0]!, endPoint: e.range[1]! };
}

function uniformSizeOf(types: Uint8Array, off: Int32Array): number {
  const nc = types.length;
  if (nc === 0 || off.length !== nc + 1) return 0;
  const t = types[0]!, m = t === CellType.TETRA ? 4 : t === CellType.HEXAHEDRON ? 8 : 0;
  if (m === 0) return 0;
  const b = off[0]!;
  for (let c = 0; c < nc; c++) if (types[c] !== t || off[c + 1] !== b + m * (c + 1)) return 0;
  return m;
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
