/**
 * Where the evenly spaced samples of a line lie, and their values: by the cell tree once it is built,
 * otherwise by a scan of the cell blocks the line meets (scanLocate.ts) while that is the cheaper way.
 *
 * The tree costs about a dozen whole-mesh passes to build (cellTree.ts); a scan visits only the cells of
 * the blocks a line meets (a few per cent of a 1M-cell mesh whose cells come in generator order). So a
 * line scans unless the tree exists, unless it would visit more than 1/SCAN_LINE_SHARE of the cells, and
 * until the lines of a mesh have visited SCAN_BUDGET whole meshes' worth of cells — then the tree is built
 * and pays for itself over the lines that follow. Both ways give the same cells and values (scanLocate.ts).
 */
import type { Dataset } from '../model/dataset.ts';
import { getCellBlocks, type CellBlocks } from './cellBlocks.ts';
import { getCellTree, hasCellTree, type CellTree } from './cellTree.ts';
import { createLocation, locateInCell, locatePoint } from './locatePoint.ts';
import { writeSample, type ProbeField, type SampledField } from './probeFields.ts';
import { scanLineSamples, type Vec3 } from './scanLocate.ts';

/** A line visiting more than 1/SCAN_LINE_SHARE of the mesh's cells (and more than SCAN_SMALL) uses (builds) the tree. */
export const SCAN_LINE_SHARE = 8;
/** Cells visited by the scans of one mesh, in whole meshes (and at least SCAN_SMALL), after which the next line builds the tree. */
export const SCAN_BUDGET = 4;
/** Cells any scan may visit: a small mesh is scanned whole at less than the cost of its tree. */
export const SCAN_SMALL = 4096;

/** Cells visited by scans so far, per block set. */
const spent = new WeakMap<CellBlocks, number>();

/** What locates a dataset's line samples: its tree when built, else its blocks (both carry the counts `assertLocatable` reads). */
export function lineLocator(dataset: Dataset): CellTree | CellBlocks {
  return hasCellTree(dataset) ? getCellTree(dataset) : getCellBlocks(dataset);
}

/** Per sample: the global cell holding it (−1: none) and max(violation, 0) there (Infinity: none). */
export interface LineSampleCells {
  readonly cell: Int32Array;
  readonly rank: Float64Array;
  /** How the samples were located. */
  readonly source: 'tree' | 'scan';
}

const loc = createLocation();

/**
 * Locates the `n` evenly spaced samples of A→B (sample i at τ = i/(n − 1), the last exactly at B) and writes
 * each one's values into `columns` (NaN where no volume cell holds it). The dataset must have volume cells.
 */
export function locateLineSamples(dataset: Dataset, from: Vec3, to: Vec3, n: number, tolerance: number,
  fields: readonly ProbeField[], columns: readonly SampledField[]): LineSampleCells {
  const cell = new Int32Array(n).fill(-1), rank = new Float64Array(n).fill(Infinity);
  const dx = to[0] - from[0], dy = to[1] - from[1], dz = to[2] - from[2];
  if (!hasCellTree(dataset)) {
    const blocks = getCellBlocks(dataset);
    const used = spent.get(blocks) ?? 0;
    if (used <= Math.max(SCAN_BUDGET * blocks.cellCount, SCAN_SMALL)) {
      const s = scanLineSamples(blocks, from, to, n, tolerance, Math.max(Math.floor(blocks.cellCount / SCAN_LINE_SHARE), SCAN_SMALL));
      if (s) spent.set(blocks, used + s.visited);
      if (s && !s.ambiguous) {
        for (let i = 0; i < n; i++) {
          const g = s.cell[i]!;
          if (g < 0) { loc.cell = -1; loc.count = 0; writeSample(fields, columns, i, loc); continue; }
          const t = i / (n - 1);
          locateInCell(blocks, g, t === 1 ? to[0] : from[0] + t * dx, t === 1 ? to[1] : from[1] + t * dy, t === 1 ? to[2] : from[2] + t * dz, loc);
          writeSample(fields, columns, i, loc);
          cell[i] = g; rank[i] = s.rank[i]!;
        }
        return { cell, rank, source: 'scan' };
      }
    }
  }
  const tree = getCellTree(dataset);
  let hint = -1;
  for (let i = 0; i < n; i++) {
    const t = i / (n - 1);
    const px = t === 1 ? to[0] : from[0] + t * dx, py = t === 1 ? to[1] : from[1] + t * dy, pz = t === 1 ? to[2] : from[2] + t * dz;
    const ok = locatePoint(tree, px, py, pz, loc, tolerance, hint);
    writeSample(fields, columns, i, loc);
    if (ok) { cell[i] = loc.cell; rank[i] = Math.max(loc.violation, 0); hint = loc.cell; }
  }
  return { cell, rank, source: 'tree' };
}
