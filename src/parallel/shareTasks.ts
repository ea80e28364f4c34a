/**
 * What one compute worker does on its share of the cells (see `shares.ts`): the single-thread kernels run
 * on the share dataset, and each result comes back as a partial result that `merge*.ts` combine.
 *
 * Every partial result is made of fresh typed arrays (transferable) and plain numbers; cell ids are already
 * global (share cell + `share.start`).
 */
import { cutPlane, type CutOptions, type PlaneFaceKeys } from '../cut/cutPlane.ts';
import type { SurfaceField, Vec3 } from '../cut/triangleSet.ts';
import type { Dataset } from '../model/dataset.ts';
import { lineLocator, locateLineSamples } from '../locate/lineSamples.ts';
import { checkTolerance, createLocation, DEFAULT_TOLERANCE } from '../locate/locatePoint.ts';
import { allocateColumns, resolveProbeFields, writeSample, type SampledField } from '../locate/probeFields.ts';
import { boundaryFaces } from '../surface/boundaryFaces.ts';
import type { PointMerge } from '../surface/pointMerge.ts';
import type { CellShare } from './shares.ts';

/** A share's cut: its triangles (cell triangles first, then in-plane faces), cell ids global. */
export interface CutPart {
  positions: Float64Array;
  indices: Uint32Array;
  sourceCell: Int32Array;
  vertexEdges: Int32Array;
  vertexT: Float64Array;
  fields: SurfaceField[];
  candidateCells: number;
  candidateSource: 'tree' | 'scan';
  cutCells: number;
  openChains: number;
  tolerance: number;
  planeFaces: PlaneFaceKeys;
}

/** Cuts the share's cells (`cutPlane` with the in-plane face keys kept for the merge). */
export function cutShare(share: Dataset, range: CellShare, origin: Vec3, normal: Vec3, options: Partial<CutOptions>): CutPart {
  const c = cutPlane(share, origin, normal, { ...options, planeFaceKeys: true });
  const sourceCell = c.sourceCell;
  for (let i = 0; i < sourceCell.length; i++) if (sourceCell[i]! >= 0) sourceCell[i] = sourceCell[i]! + range.start;
  return {
    positions: c.positions, indices: c.indices, sourceCell, vertexEdges: c.vertexEdges, vertexT: c.vertexT,
    fields: c.fields.map((f) => ({ name: f.name, association: f.association, components: f.components, values: f.values })),
    candidateCells: c.stats.candidateCells, candidateSource: c.stats.candidateSource, cutCells: c.stats.cutCells,
    openChains: c.stats.openChains, tolerance: c.stats.tolerance, planeFaces: c.planeFaces!,
  };
}

/** Evenly spaced line samples on one share: which share cell holds each sample, how well, and the values there. */
export interface LinePart {
  /** Global cell id per sample, −1 where no cell of the share holds it. */
  cell: Int32Array;
  /** max(parametric violation, 0) per sample (the locate tie rule's key), Infinity where not held. */
  rank: Float64Array;
  fields: SampledField[];
  /** Volume cells of the share (a dataset with none cannot locate). */
  volumeCells: number;
}

/** Line options the pool passes to every share (already checked by `mergeLines`' caller). */
export interface LineShareOptions {
  samples: number;
  fields?: readonly string[];
  tolerance?: number;
}

/**
 * Locates the evenly spaced samples of A→B in the share's cells and writes their values: what `probeLine`
 * (lineProbe.ts) does, through the same `locateLineSamples` (the share's tree when built, else a scan of
 * its blocks), keeping each holder's rank.
 */
export function lineShare(share: Dataset, range: CellShare, from: Vec3, to: Vec3, o: LineShareOptions): LinePart {
  const n = o.samples, tol = o.tolerance ?? DEFAULT_TOLERANCE;
  checkTolerance(tol, 'line probe');
  const fields = resolveProbeFields(share, o.fields);
  const columns = allocateColumns(fields, n);
  const volumeCells = lineLocator(share).volumeCellCount;
  if (volumeCells === 0) {
    const none = createLocation();
    for (let i = 0; i < n; i++) writeSample(fields, columns, i, none);
    return { cell: new Int32Array(n).fill(-1), rank: new Float64Array(n).fill(Infinity), fields: columns, volumeCells };
  }
  const { cell, rank } = locateLineSamples(share, from, to, n, tol, fields, columns);
  for (let i = 0; i < n; i++) if (cell[i]! >= 0) cell[i] = cell[i]! + range.start;
  return { cell, rank, fields: columns, volumeCells };
}

/** A share's boundary faces (faces used once by the share's 3D cells), cell ids global. */
export interface BoundaryPart {
  count: number;
  cell: Int32Array;
  localFace: Int32Array;
  piece: Int32Array;
  offsets: Int32Array;
  nodes: Int32Array;
  points: Int32Array;
  areaVector: Float64Array;
  centroid: Float64Array;
  flipped: number;
  cells3d: number;
  /** The merged point numbering (the same for every share: it depends on the points only); sent by share 0 only. */
  merge: PointMerge | null;
}

/** Boundary faces of the share's cells (`boundaryFaces`); faces between two shares come back from both. */
export function boundaryShare(share: Dataset, range: CellShare, withMerge: boolean): BoundaryPart {
  const b = boundaryFaces(share);
  const cell = b.cell;
  for (let i = 0; i < cell.length; i++) cell[i] = cell[i]! + range.start;
  return {
    count: b.count, cell, localFace: b.localFace, piece: b.piece, offsets: b.offsets, nodes: b.nodes, points: b.points,
    areaVector: b.areaVector, centroid: b.centroid, flipped: b.flipped, cells3d: b.cells3d, merge: withMerge ? b.merge : null,
  };
}
