/**
 * The boundary faces of a dataset assembled from parts of a larger piece set (`Dataset.assembled`): of the
 * faces `boundaryFaces` finds there, only those the tasks listed as boundary are kept. The others face a
 * cell the assembled dataset left out (it holds only the cells its probes need), so they are interior in
 * the whole set. A face between pieces read by different tasks is listed by both tasks and, its two cells
 * being both present, already matched away by `boundaryFaces` (global ids or coordinates, `pointMerge.ts`).
 */
import type { BoundaryFaces } from './boundaryFaces.ts';
import { FACE_SLOTS } from './boundaryFaces.ts';

/** True when ascending `keys` holds `k` (binary search). */
function has(keys: Float64Array, k: number): boolean {
  let lo = 0, hi = keys.length - 1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1, v = keys[mid]!;
    if (v === k) return true;
    if (v < k) lo = mid + 1; else hi = mid - 1;
  }
  return false;
}

/**
 * The faces of `faces` whose key `localCell × FACE_SLOTS + localFace` is in `listed[piece]` (ascending keys
 * per piece), in the same order, with the same layout and merged point numbering. Cells examined and
 * reversed faces are those of the assembled dataset.
 */
export function listedFaces(faces: BoundaryFaces, listed: readonly Float64Array[]): BoundaryFaces {
  const keep = new Uint8Array(faces.count);
  let count = 0, nodes = 0;
  for (let f = 0; f < faces.count; f++) {
    const k = faces.piece[f]!, keys = listed[k];
    if (!keys || !has(keys, (faces.cell[f]! - faces.cellStarts[k]!) * FACE_SLOTS + faces.localFace[f]!)) continue;
    keep[f] = 1; count++; nodes += faces.offsets[f + 1]! - faces.offsets[f]!;
  }
  if (count === faces.count) return faces;
  const cell = new Int32Array(count), localFace = new Int32Array(count), piece = new Int32Array(count), offsets = new Int32Array(count + 1);
  const outNodes = new Int32Array(nodes), points = new Int32Array(nodes);
  const areaVector = new Float64Array(3 * count), centroid = new Float64Array(3 * count);
  for (let f = 0, g = 0; f < faces.count; f++) {
    if (!keep[f]) continue;
    cell[g] = faces.cell[f]!; localFace[g] = faces.localFace[f]!; piece[g] = faces.piece[f]!;
    const a = faces.offsets[f]!, b = faces.offsets[f + 1]!, o = offsets[g]!;
    outNodes.set(faces.nodes.subarray(a, b), o);
    points.set(faces.points.subarray(a, b), o);
    offsets[g + 1] = o + b - a;
    for (let j = 0; j < 3; j++) { areaVector[3 * g + j] = faces.areaVector[3 * f + j]!; centroid[3 * g + j] = faces.centroid[3 * f + j]!; }
    g++;
  }
  return { ...faces, count, cell, localFace, piece, offsets, nodes: outNodes, points, areaVector, centroid };
}
