/**
 * A dataset: what one result file (or one multi-file set) holds — one or more pieces, plus
 * dataset-level field data and the reader's warnings.
 *
 * Cells are numbered globally across pieces: global cell `g` is local cell `g - cellStart[k]` of
 * piece `k`, where `cellStart` is the running sum of piece cell counts (see `cellStarts`).
 */
import type { FieldArray } from './fieldArray.ts';
import { cellCount, pointCount, type Piece } from './piece.ts';

/** Which VTK dataset model the file declared. Polygonal data is stored as pieces of surface cells. */
export type DatasetKind = 'unstructured' | 'polydata';

export interface Dataset {
  /** File name (or set-file name) the dataset was read from, for messages. */
  readonly source: string;
  readonly kind: DatasetKind;
  readonly pieces: readonly Piece[];
  /** Dataset-level field data (association 'dataset'). */
  readonly fieldData: readonly FieldArray[];
  /** Reader warnings, such as higher-order cells read by their corner nodes. */
  readonly warnings: readonly string[];
  /** Cell counts per cell type as declared in the file (before higher-order cells were linearised). */
  readonly fileCellTypes: Readonly<Record<number, number>>;
  /**
   * Names a set gave its pieces (a `.vtm`/`.vtpc` block or dataset `name`), one per piece, '' where none;
   * absent when no piece is named. Surface groups take them as labels (src/surface/groupNames.ts).
   */
  readonly pieceNames?: readonly string[];
  /** Dataset-level string arrays (field data of type String), e.g. the name table of a group array. */
  readonly fieldStrings?: readonly FieldStrings[];
  /** Only on a dataset assembled from the parts of a larger piece set that its probes need (see `AssembledParts`). */
  readonly assembled?: AssembledParts;
}

/**
 * What a dataset assembled by `fieldtally reduce` (src/pieces/) knows of the whole piece set it was cut from:
 * the whole set's bounds, so every tolerance scales as on the whole set, and per piece the faces that were
 * boundary faces in the task that read the piece. Such a dataset holds only the cells its probes need, so
 * faces towards the cells left out look like boundary; the boundary of the assembled dataset is the listed
 * faces that no cell of another piece meets (a face between two tasks' pieces is listed by both and
 * matched like any face between pieces).
 */
export interface AssembledParts {
  /** `[xmin, xmax, ymin, ymax, zmin, zmax]` of the whole set (file's length unit). */
  readonly bounds: readonly [number, number, number, number, number, number];
  /** Per piece, ascending keys `localCell × 65536 + localFace` (face numbering of `boundaryFaces`). */
  readonly boundary: readonly Float64Array[];
}

/** A field-data string array: one string per tuple. */
export interface FieldStrings {
  readonly name: string;
  readonly values: readonly string[];
}

/** Total number of points over all pieces. */
export function totalPoints(d: Dataset): number {
  let n = 0;
  for (const p of d.pieces) n += pointCount(p);
  return n;
}

/** Total number of cells over all pieces. */
export function totalCells(d: Dataset): number {
  let n = 0;
  for (const p of d.pieces) n += cellCount(p);
  return n;
}

/** Running sums of cell counts: `starts[k]` is the global number of piece k's first cell; `starts[pieces]` is the total. */
export function cellStarts(d: Dataset): Int32Array {
  const s = new Int32Array(d.pieces.length + 1);
  for (let k = 0; k < d.pieces.length; k++) s[k + 1] = s[k]! + cellCount(d.pieces[k]!);
  return s;
}

/** Running sums of point counts, as `cellStarts` for points. */
export function pointStarts(d: Dataset): Int32Array {
  const s = new Int32Array(d.pieces.length + 1);
  for (let k = 0; k < d.pieces.length; k++) s[k + 1] = s[k]! + pointCount(d.pieces[k]!);
  return s;
}

/** Piece index that holds global cell `g`, by binary search in `starts` (from `cellStarts`). */
export function pieceOfCell(starts: Int32Array, g: number): number {
  let lo = 0, hi = starts.length - 2;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (starts[mid]! <= g) lo = mid; else hi = mid - 1;
  }
  return lo;
}

/** Names of the fields present in every piece with the given association (pieces of a set may differ). */
export function commonFieldNames(d: Dataset, association: 'point' | 'cell'): string[] {
  if (d.pieces.length === 0) return [];
  const lists = d.pieces.map((p) => (association === 'point' ? p.pointData : p.cellData).map((f) => f.name));
  return lists[0]!.filter((n) => lists.every((l) => l.includes(n)));
}
