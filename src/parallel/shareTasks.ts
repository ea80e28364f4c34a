/**
 * What one compute worker does on its share of the cells (see `shares.ts`): the single-thread kernels run
 * on the share dataset, and each result comes back as a partial result that `merge*.ts` combine.
 *
 * Every partial result is made of fresh typed arrays (transferable) and plain numbers; cell ids are already
 * global (share cell + `share.start`). A cut is the exception: it is counted first and then written by each
 * share straight into its place in the merged cut's shared arrays (`placeCuts.ts`).
 */
import { CUT_DEFAULTS, cutPlane, releaseCut, type CutOptions, type PlaneCut, type PlaneFaceKeys } from '../cut/cutPlane.ts';
import { cutFieldInto, cutFieldLayout } from '../cut/cutFields.ts';
import { blockSums, sumLayout, type IntegralOptions } from '../cut/integrals.ts';
import type { Vec3 } from '../cut/triangleSet.ts';
import type { Dataset } from '../model/dataset.ts';
import { lineLocator, locateLineSamples } from '../locate/lineSamples.ts';
import { checkTolerance, createLocation, DEFAULT_TOLERANCE } from '../locate/locatePoint.ts';
import { allocateColumns, resolveProbeFields, writeSample, type SampledField } from '../locate/probeFields.ts';
import { boundaryFaces } from '../surface/boundaryFaces.ts';
import type { PointMerge } from '../surface/pointMerge.ts';
import type { CellShare } from './shares.ts';

/**
 * What a share reports of its cut; its arrays stay in the worker until the host has placed every share's
 * triangles in the merged cut (`placeCutShare`, src/parallel/placeCuts.ts).
 */
export interface CutCounts {
  vertices: number;
  triangles: number;
  fields: { name: string; association: 'point' | 'cell'; components: number }[];
  candidateCells: number;
  candidateSource: 'tree' | 'scan';
  cutCells: number;
  openChains: number;
  tolerance: number;
  planeFaces: PlaneFaceKeys;
  /** Time the share's cut took in its worker (ms). */
  ms: number;
}

/** The merged cut's arrays (layout of `PlaneCut`), in shared memory; each share writes its runs into them. */
export interface SharedCutArrays {
  positions: Float64Array;
  indices: Uint32Array;
  sourceCell: Int32Array;
  vertexEdges: Int32Array;
  vertexT: Float64Array;
  /** Values of each field of `CutCounts.fields`, in that order. */
  fields: Float64Array[];
}

/**
 * Room for the blocks of the integral's triangle pass (`integrals.ts` `blockSums`) over a merged cut of `total`
 * triangles, in shared memory: `K` sums a block (`sumLayout(fields, options).K`) in `sums`, `done[b]` set to 1 by
 * the worker that summed block b, and each triangle's u·n, density (3 a triangle) and area at its place.
 */
export interface ShareSums {
  options: Partial<IntegralOptions>;
  total: number;
  sums: Float64Array;
  done: Uint8Array;
  un: Float64Array;
  rho: Float64Array;
  area: Float64Array;
}

/** Cuts held until placed, by the host's key (a few at most: a cut whose placement never came is let go), with their share and fields. */
const held = new Map<number, { cut: PlaneCut; share: Dataset; fields: CutCounts['fields'] }>();
const HELD_MAX = 4;

/**
 * Cuts the share's cells (`cutPlane` with the in-plane face keys kept for the merge) and keeps the result under
 * `key`. Its fields are not made here: `placeCutShare` writes them straight into the merged arrays.
 */
export function cutShare(share: Dataset, key: number, origin: Vec3, normal: Vec3, options: Partial<CutOptions>): CutCounts {
  const fields = cutFieldLayout(share, options.fields ?? CUT_DEFAULTS.fields);
  // Lent buffers: the cut lives only until placed (copied into the merged arrays), so no fresh memory a cut.
  const c = cutPlane(share, origin, normal, { ...options, fields: 'none', planeFaceKeys: true, lendOutput: true });
  held.set(key, { cut: c, share, fields });
  for (const k of held.keys()) if (held.size > HELD_MAX) held.delete(k);
  return {
    vertices: c.vertexT.length, triangles: c.sourceCell.length, fields,
    candidateCells: c.stats.candidateCells, candidateSource: c.stats.candidateSource, cutCells: c.stats.cutCells,
    openChains: c.stats.openChains, tolerance: c.stats.tolerance, planeFaces: c.planeFaces!, ms: c.stats.ms,
  };
}

/**
 * Writes the runs of the cut held under `key` into the merged arrays and lets it go. `runs` holds 6 numbers a
 * run: source triangles t0 … t1 − 1 with their vertices v0 … v1 − 1, to triangle `dt` and vertex `dv` of the
 * merged cut; vertex numbers are moved by dv − v0 and cell ids by the share's first cell. The fields are
 * interpolated straight into their places. `into` null: only let go.
 */
export function placeCutShare(key: number, range: CellShare, runs: Int32Array, into: SharedCutArrays | null): null {
  const h = held.get(key);
  held.delete(key);
  if (!into) { if (h) releaseCut(h.cut); return null; }
  if (!h) throw new Error('worker pool: no cut is held for this placement');
  const c = h.cut;
  for (let r = 0; r < runs.length; r += 6) {
    const t0 = runs[r]!, t1 = runs[r + 1]!, v0 = runs[r + 2]!, v1 = runs[r + 3]!, dt = runs[r + 4]!, dv = runs[r + 5]!;
    into.positions.set(c.positions.subarray(3 * v0, 3 * v1), 3 * dv);
    into.vertexEdges.set(c.vertexEdges.subarray(2 * v0, 2 * v1), 2 * dv);
    into.vertexT.set(c.vertexT.subarray(v0, v1), dv);
    shiftInto(c.indices, 3 * t0, 3 * t1, dv - v0, into.indices, 3 * dt);
    cellsInto(c.sourceCell, t0, t1, range.start, into.sourceCell, dt);
    for (let j = 0; j < into.fields.length; j++) cutFieldInto(h.share, c, h.fields[j]!, v0, v1, t0, t1, into.fields[j]!, h.fields[j]!.association === 'point' ? dv : dt);
  }
  releaseCut(c);
  return null;
}

/**
 * Sums blocks b0 … b1 − 1 of the integral's triangle pass (`integrals.ts` `blockSums`) over the merged cut, read
 * from its shared arrays once every share has placed its runs, into `s`; the same triangles in the same order
 * as one thread sums them, so the same bits whichever thread sums a block.
 */
export function sumCutBlocks(into: SharedCutArrays, layout: CutCounts['fields'], s: ShareSums, b0: number, b1: number): null {
  if (b1 <= b0) return null;
  const fields = layout.map((f, j) => ({ ...f, values: into.fields[j]! }));
  const set = { positions: into.positions, indices: into.indices, sourceCell: into.sourceCell, fields };
  blockSums(set, sumLayout(fields, s.options), 0, s.total, b0, b1, { un: s.un, rho: s.rho, area: s.area }, s.sums);
  s.done.fill(1, b0, b1);
  return null;
}

function shiftInto(src: Uint32Array, a: number, b: number, shift: number, out: Uint32Array, o: number): void {
  for (let i = a; i < b; i++, o++) out[o] = src[i]! + shift;
}

function cellsInto(src: Int32Array, a: number, b: number, start: number, out: Int32Array, o: number): void {
  for (let i = a; i < b; i++, o++) { const g = src[i]!; out[o] = g >= 0 ? g + start : g; }
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
