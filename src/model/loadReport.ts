/**
 * The load report: what a file holds, as the `info` verb prints it and the app shows after loading.
 * Arrays with the same name and association in several pieces are reported once, with the range over
 * all pieces. Ranges of vectors are of the magnitude. Values are in the file's units.
 */
import { datasetBounds, isEmptyBounds, type Bounds } from './bounds.ts';
import { totalCells, totalPoints, type Dataset } from './dataset.ts';
import { fieldRange, type Association, type FieldArray } from './fieldArray.ts';

export interface ArraySummary {
  name: string;
  association: Association;
  components: number;
  /** Element type in the file, e.g. `Float32`. */
  type: string;
  /** [min, max] of the scalar, or of the magnitude for several components; null when the array is empty. */
  range: [number, number] | null;
  /** Pieces that carry the array (for sets where not all do). */
  pieces: number;
}

export interface LoadReport {
  source: string;
  kind: Dataset['kind'];
  pieces: number;
  points: number;
  cells: number;
  /** VTK cell-type number → count, as declared in the file. */
  cellTypes: Record<string, number>;
  pointData: ArraySummary[];
  cellData: ArraySummary[];
  fieldData: ArraySummary[];
  /** [xmin, xmax, ymin, ymax, zmin, zmax], or null without points. */
  bounds: Bounds | null;
  warnings: string[];
}

function summarise(lists: readonly (readonly FieldArray[])[], association: Association): ArraySummary[] {
  const byName = new Map<string, ArraySummary>();
  for (const list of lists) {
    for (const f of list) {
      const [lo, hi] = fieldRange(f);
      const prev = byName.get(f.name);
      if (!prev) {
        byName.set(f.name, {
          name: f.name, association, components: f.components, type: f.sourceType,
          range: Number.isNaN(lo) ? null : [lo, hi], pieces: 1,
        });
      } else {
        prev.pieces++;
        if (!Number.isNaN(lo)) prev.range = prev.range ? [Math.min(prev.range[0], lo), Math.max(prev.range[1], hi)] : [lo, hi];
      }
    }
  }
  return [...byName.values()];
}

/** Builds the load report of a dataset. */
export function loadReport(d: Dataset): LoadReport {
  const b = datasetBounds(d);
  const cellTypes: Record<string, number> = {};
  for (const [t, n] of Object.entries(d.fileCellTypes)) if (n > 0) cellTypes[t] = n;
  return {
    source: d.source,
    kind: d.kind,
    pieces: d.pieces.length,
    points: totalPoints(d),
    cells: totalCells(d),
    cellTypes,
    pointData: summarise(d.pieces.map((p) => p.pointData), 'point'),
    cellData: summarise(d.pieces.map((p) => p.cellData), 'cell'),
    fieldData: summarise([d.fieldData], 'dataset'),
    bounds: isEmptyBounds(b) ? null : b,
    warnings: [...d.warnings],
  };
}
