/**
 * A piece: one unstructured block of points and cells with its point and cell fields.
 *
 * Layout (struct-of-arrays, described here once):
 *  - `points`: Float64Array, xyz interleaved; point `p` is at `points[3p], points[3p+1], points[3p+2]`.
 *  - `cellTypes`: Uint8Array, the linear VTK type of cell `c` (higher-order cells are stored by corners).
 *  - `offsets`: Int32Array of length `nCells + 1`; the nodes of cell `c` are
 *    `connectivity[offsets[c] .. offsets[c+1]-1]`.
 *  - `connectivity`: Int32Array of point indices into this piece's `points`.
 *  - `polyFaces`: only when the piece has polyhedra (type 42): the faces of cell `c` are face numbers
 *    `cellFaceStart[c] .. cellFaceStart[c+1]-1`; face `f` has nodes
 *    `faceConnectivity[faceOffsets[f] .. faceOffsets[f+1]-1]`. Non-polyhedral cells own no faces here.
 *  - `pointData` / `cellData`: fields with `association` 'point' / 'cell', one tuple per point / cell.
 * Coordinates and fields are in the file's units.
 */
import type { FieldArray } from './fieldArray.ts';

/** Face stream of the polyhedral cells of a piece. */
export interface PolyFaces {
  readonly cellFaceStart: Int32Array;
  readonly faceOffsets: Int32Array;
  readonly faceConnectivity: Int32Array;
}

export interface Piece {
  readonly points: Float64Array;
  readonly cellTypes: Uint8Array;
  readonly offsets: Int32Array;
  readonly connectivity: Int32Array;
  readonly polyFaces?: PolyFaces;
  readonly pointData: readonly FieldArray[];
  readonly cellData: readonly FieldArray[];
}

/** Number of points of a piece. */
export const pointCount = (p: Piece): number => p.points.length / 3;

/** Number of cells of a piece. */
export const cellCount = (p: Piece): number => p.cellTypes.length;

/** Number of nodes of cell `c`. */
export const cellSize = (p: Piece, c: number): number => p.offsets[c + 1]! - p.offsets[c]!;

/** Finds a field of a piece by name and association, or undefined. */
export function findField(p: Piece, name: string, association: 'point' | 'cell'): FieldArray | undefined {
  return (association === 'point' ? p.pointData : p.cellData).find((f) => f.name === name);
}
