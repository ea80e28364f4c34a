/**
 * The dataset part of a partial-results document (`partialDoc.ts`): a task's pieces cut down to the cells
 * its probe set needs (`footprint.ts`, `subPiece.ts`), with the task's bounds, dataset kind, declared cell
 * types, field data and reader warnings. A task with no piece gives kind 'none' and null bounds.
 */
import type { Dataset } from '../model/dataset.ts';
import { cellCount } from '../model/piece.ts';
import type { ProbeSet } from '../study/probeSet.ts';
import { footprint } from './footprint.ts';
import { encodeField, encodePiece, type PartialDoc } from './partialDoc.ts';
import { subPiece } from './subPiece.ts';

/** `dataset` and `pieces` of the document of task dataset `d` evaluated for `set`. */
export function encodeTask(d: Dataset, set: ProbeSet): Pick<PartialDoc, 'dataset' | 'pieces'> {
  const fp = d.pieces.length ? footprint(d, set) : undefined;
  const pieces = d.pieces.map((p, k) => {
    const sub = subPiece(p, fp!.cells[k]!, fp!.boundary[k]!);
    return encodePiece(sub.piece, sub.boundary, cellCount(p));
  });
  return {
    dataset: {
      kind: fp ? d.kind : 'none', bounds: fp ? [...fp.bounds] : null,
      fileCellTypes: Object.fromEntries(Object.entries(d.fileCellTypes)),
      fieldData: d.fieldData.map(encodeField), warnings: [...d.warnings],
    },
    pieces,
  };
}
