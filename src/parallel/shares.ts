/**
 * Cell shares: a dataset's cells split into contiguous ranges of the global cell numbering (`cellStarts`),
 * one per compute worker, and each share seen as a dataset of its own without copying anything.
 *
 * A share dataset keeps every piece of the whole dataset, in the same order, with the same points, point
 * fields and connectivity arrays; only the cell-indexed arrays are narrowed to the share's cells
 * (`cellTypes`, `offsets`, `cellData`, `polyFaces.cellFaceStart` become subarray views, so a piece outside
 * the share has zero cells). Hence:
 *  - global cell `g` of the whole dataset is cell `g − share.start` of the share dataset;
 *  - point numbers (piece-local, and the `pointStarts` numbering) are the same in both;
 *  - the bounds, and every tolerance scaled by them, are the same in both;
 *  - offsets keep indexing the whole connectivity array (so `offsets[0]` need not be 0).
 * The single-thread kernels run unchanged on a share dataset.
 */
import { cellStarts, type Dataset } from '../model/dataset.ts';
import type { FieldArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';

/** One share: global cells `start … end − 1`. */
export interface CellShare {
  readonly start: number;
  readonly end: number;
}

/**
 * Splits `cells` cells into `count` contiguous shares of nearly equal size (sizes differ by at most one;
 * the first `cells mod count` shares get one more). `count` is clamped to 1 … max(1, cells).
 */
export function splitCells(cells: number, count: number): CellShare[] {
  if (!(Number.isInteger(cells) && cells >= 0)) throw new Error(`cell shares: cell count must be a whole number ≥ 0, got ${cells}`);
  if (!(Number.isInteger(count) && count >= 1)) throw new Error(`cell shares: share count must be a whole number ≥ 1, got ${count}`);
  const n = Math.max(1, Math.min(count, cells));
  const base = Math.floor(cells / n), extra = cells % n;
  const out: CellShare[] = [];
  let s = 0;
  for (let i = 0; i < n; i++) {
    const e = s + base + (i < extra ? 1 : 0);
    out.push({ start: s, end: e });
    s = e;
  }
  return out;
}

function narrowFields(fields: readonly FieldArray[], a: number, b: number): FieldArray[] {
  return fields.map((f) => ({ ...f, values: f.values.subarray(a * f.components, b * f.components) }));
}

/** Piece `p` narrowed to its local cells `a … b − 1` (views, no copy). */
function narrowPiece(p: Piece, a: number, b: number): Piece {
  const pf = p.polyFaces;
  return {
    points: p.points,
    cellTypes: p.cellTypes.subarray(a, b),
    offsets: p.offsets.subarray(a, b + 1),
    connectivity: p.connectivity,
    ...(pf ? { polyFaces: { ...pf, cellFaceStart: pf.cellFaceStart.subarray(a, b + 1) } } : {}),
    pointData: p.pointData,
    cellData: narrowFields(p.cellData, a, b),
  };
}

/** The share's cells of `d` as a dataset of views (see the file comment for what stays and what narrows). */
export function shareDataset(d: Dataset, share: CellShare): Dataset {
  const starts = cellStarts(d);
  const total = starts[starts.length - 1]!;
  if (!(share.start >= 0 && share.start <= share.end && share.end <= total)) {
    throw new Error(`cell shares: share ${share.start}…${share.end} is outside the dataset's ${total} cells`);
  }
  const pieces = d.pieces.map((p, k) => {
    const a = Math.min(Math.max(share.start - starts[k]!, 0), starts[k + 1]! - starts[k]!);
    const b = Math.min(Math.max(share.end - starts[k]!, 0), starts[k + 1]! - starts[k]!);
    return narrowPiece(p, a, b);
  });
  return { ...d, pieces };
}
