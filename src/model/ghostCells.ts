/**
 * Ghost cells. A piece of a set written by a parallel solver or partitioner may repeat a layer of the cells
 * that a neighbouring piece owns, so each piece can be processed alone. VTK's convention marks them with a
 * cell array named `vtkGhostType` (one unsigned 8-bit flag per cell: bit 1 a duplicate of another piece's
 * cell, bit 32 a hidden cell) and marks repeated points with a point array of the same name.
 *
 * Kept, such cells would be counted twice: the flow through a cut-plane crossing the overlap doubled, and
 * the outer faces of a ghost layer taken for boundary in force totals. So the readers leave them out: the
 * piece keeps only cells with neither bit set, and only the points those cells use, renumbered in their
 * the file; both `vtkGhostType` arrays are dropped (they are bookkeeping, not a field).
 */
import { type FieldArray, type NumericArray, tupleCount } from './fieldArray.ts';
import type { Piece, PolyFaces } from './piece.ts';

/** The array name of VTK's ghost convention (cell and point data). */
export const GHOST_ARRAY = 'vtkGhostType';

/** Cell flags that leave a cell out: a duplicate of another piece's cell (1) or a hidden cell (32). */
export const GHOST_CELL_BITS = 1 | 32;

/** A piece without its ghost cells, and how many cells were left out. */
export interface GhostFree {
  readonly piece: Piece;
  /** Cells left out (0 when the piece had none, or no `vtkGhostType` array). */
  readonly leftOut: number;
  /** The cells left out by (linear) cell type. */
  readonly leftOutByType: Readonly<Record<number, number>>;
}

/** The cell flags of `f`, checked: one integer component in 0..255 per cell. `where` names the piece. */
function ghostFlags(f: FieldArray, nCells: number, where: string): NumericArray {
  if (f.components !== 1 || tupleCount(f) !== nCells) {
    throw new Error(`${where}: cell array "${GHOST_ARRAY}" has ${f.components} component(s) and ${tupleCount(f)} tuples; expected one 8-bit ghost flag per cell (${nCells} cells)`);
  }
  const v = f.values;
  for (let c = 0; c < v.length; c++) {
    const x = v[c]!;
    if (!(x >= 0 && x <= 255 && Math.floor(x) === x)) {
      throw new Error(`${where}: cell array "${GHOST_ARRAY}", cell ${c}: ${x} is not a ghost flag; expected an integer 0..255 (VTK's ghost-cell bits)`);
    }
  }
  return v;
}

/** The tuples `keep` of `f` (indices ascending), as the same array type. */
function takeTuples(f: FieldArray, keep: Int32Array): FieldArray {
  const k = f.components, src = f.values;
  const out = new (src.constructor as new (n: number) => NumericArray)(keep.length * k);
  for (let i = 0; i < keep.length; i++) {
    const s = keep[i]! * k, d = i * k;
    for (let j = 0; j < k; j++) out[d + j] = src[s + j]!;
  }
  return { ...f, values: out };
}

/** The face stream of the cells `keep`, renumbered through `newPoint`. */
function keptFaces(pf: PolyFaces, keep: Int32Array, newPoint: Int32Array): PolyFaces {
  const { cellFaceStart, faceOffsets, faceConnectivity } = pf;
  let nFaces = 0, nIds = 0;
  for (let i = 0; i < keep.length; i++) {
    const c = keep[i]!;
    nFaces += cellFaceStart[c + 1]! - cellFaceStart[c]!;
    nIds += faceOffsets[cellFaceStart[c + 1]!]! - faceOffsets[cellFaceStart[c]!]!;
  }
  const start = new Int32Array(keep.length + 1), offs = new Int32Array(nFaces + 1), conn = new Int32Array(nIds);
  let f = 0, e = 0;
  for (let i = 0; i < keep.length; i++) {
    const c = keep[i]!;
    for (let g = cellFaceStart[c]!; g < cellFaceStart[c + 1]!; g++) {
      for (let a = faceOffsets[g]!; a < faceOffsets[g + 1]!; a++) conn[e++] = newPoint[faceConnectivity[a]!]!;
      offs[++f] = e;
    }
    start[i + 1] = f;
  }
  return { cellFaceStart: start, faceOffsets: offs, faceConnectivity: conn };
}

/**
 * `p` without its ghost cells (see the module note), or `p` itself when it has no `vtkGhostType` array. A
 * piece with the arrays but no flagged cell loses only the two arrays. Throws, naming `where` (file and
 * piece), when the cell array is not one 8-bit flag per cell.
 */
export function withoutGhostCells(p: Piece, where: string): GhostFree {
  const cellGhost = p.cellData.find((f) => f.name === GHOST_ARRAY);
  const pointGhost = p.pointData.find((f) => f.name === GHOST_ARRAY);
  if (!cellGhost && !pointGhost) return { piece: p, leftOut: 0, leftOutByType: {} };
  const nCells = p.cellTypes.length;
  const cellData = p.cellData.filter((f) => f !== cellGhost), pointData = p.pointData.filter((f) => f !== pointGhost);
  const flags = cellGhost ? ghostFlags(cellGhost, nCells, where) : undefined;
  let kept = 0;
  if (flags) for (let c = 0; c < nCells; c++) if ((flags[c]! & GHOST_CELL_BITS) === 0) kept++;
  if (!flags || kept === nCells) return { piece: { ...p, cellData, pointData }, leftOut: 0, leftOutByType: {} };

  const keep = new Int32Array(kept);
  const leftOutByType: Record<number, number> = {};
  for (let c = 0, i = 0; c < nCells; c++) {
    if ((flags[c]! & GHOST_CELL_BITS) === 0) keep[i++] = c;
    else leftOutByType[p.cellTypes[c]!] = (leftOutByType[p.cellTypes[c]!] ?? 0) + 1;
  }
  // the points the kept cells use, in their order in the file
  const nPts = p.points.length / 3, off = p.offsets, conn = p.connectivity;
  const newPoint = new Int32Array(nPts).fill(-1);
  let nConn = 0;
  for (let i = 0; i < kept; i++) {
    const c = keep[i]!;
    for (let a = off[c]!; a < off[c + 1]!; a++) newPoint[conn[a]!] = 0;
    nConn += off[c + 1]! - off[c]!;
  }
  if (p.polyFaces) {
    const { cellFaceStart, faceOffsets, faceConnectivity } = p.polyFaces;
    for (let i = 0; i < kept; i++) {
      const c = keep[i]!;
      for (let a = faceOffsets[cellFaceStart[c]!]!; a < faceOffsets[cellFaceStart[c + 1]!]!; a++) newPoint[faceConnectivity[a]!] = 0;
    }
  }
  let nNew = 0;
  for (let q = 0; q < nPts; q++) if (newPoint[q] === 0) newPoint[q] = nNew++;
  const oldPoint = new Int32Array(nNew);
  for (let q = 0; q < nPts; q++) if (newPoint[q]! >= 0) oldPoint[newPoint[q]!] = q;
  const points = new Float64Array(nNew * 3);
  for (let i = 0; i < nNew; i++) { const q = oldPoint[i]! * 3; points[3 * i] = p.points[q]!; points[3 * i + 1] = p.points[q + 1]!; points[3 * i + 2] = p.points[q + 2]!; }
  const cellTypes = new Uint8Array(kept), offsets = new Int32Array(kept + 1), connectivity = new Int32Array(nConn);
  for (let i = 0, e = 0; i < kept; i++) {
    const c = keep[i]!;
    cellTypes[i] = p.cellTypes[c]!;
    for (let a = off[c]!; a < off[c + 1]!; a++) connectivity[e++] = newPoint[conn[a]!]!;
    offsets[i + 1] = e;
  }
  const piece: Piece = {
    points, cellTypes, offsets, connectivity,
    ...(p.polyFaces ? { polyFaces: keptFaces(p.polyFaces, keep, newPoint) } : {}),
    pointData: pointData.map((f) => takeTuples(f, oldPoint)),
    cellData: cellData.map((f) => takeTuples(f, keep)),
  };
  return { piece, leftOut: nCells - kept, leftOutByType };
}

/** The load report's line for `n` ghost cells left out of `where` (a file or `piece k`). */
export function ghostNote(where: string, n: number): string {
  return `${where}: ${n} ghost cell${n === 1 ? '' : 's'} (flagged in "${GHOST_ARRAY}" as another piece's or hidden) left out`;
}

/**
 * A file's cell-type counts less the ghost cells left out (by linear type), so the load report counts the
 * cells read. A higher-order file type is counted under its own number and keeps its count.
 */
export function countsWithoutGhosts(fileCellTypes: Readonly<Record<number, number>>, g: GhostFree): Record<number, number> {
  const out: Record<number, number> = { ...fileCellTypes };
  for (const [t, n] of Object.entries(g.leftOutByType)) {
    const k = Number(t), left = (out[k] ?? 0) - n;
    if (out[k] === undefined || left < 0) continue;
    if (left === 0) delete out[k]; else out[k] = left;
  }
  return out;
}
