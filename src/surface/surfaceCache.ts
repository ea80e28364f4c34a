/**
 * Boundary faces and surface groups of a dataset, computed once and kept with the dataset's mesh (a
 * WeakMap keyed by `meshKey`, like the cell tree), so the worker's description, force totals, probe sets
 * and every step of a series on one mesh share one extraction. Only default extraction options are
 * cached; groups are cached per grouping. Groups named by an integer cell array are taken from the first
 * dataset of a mesh: such arrays mark boundary parts, which a series does not renumber between steps.
 */
import type { Dataset } from '../model/dataset.ts';
import { meshKey, type MeshKey } from '../model/meshKey.ts';
import { boundaryFaces, type BoundaryFaces } from './boundaryFaces.ts';
import { listedFaces } from './faceSubset.ts';
import { surfaceGroups, type SurfaceGroups } from './surfaceGroups.ts';

/** How a boundary is split into groups (see `GroupOptions` in surfaceGroups.ts; a `.vtp` surface file is not cached). */
export interface GroupingKey {
  /** Feature angle in degrees. */
  featureAngle?: number;
  /** Integer cell array naming groups, or false to ignore group arrays. */
  groupArray?: string | false;
}

interface Entry { faces: BoundaryFaces; groups: Map<string, SurfaceGroups> }

const cache = new WeakMap<MeshKey, Entry>();

function entry(d: Dataset): Entry {
  const key = meshKey(d);
  let e = cache.get(key);
  if (!e) {
    // An assembled dataset (src/pieces/) keeps only the faces its tasks found on the boundary.
    const all = boundaryFaces(d);
    e = { faces: d.assembled ? listedFaces(all, d.assembled.boundary) : all, groups: new Map() };
    cache.set(key, e);
  }
  return e;
}

/** The boundary faces of a dataset with default options, extracted on first call. */
export function getBoundaryFaces(d: Dataset): BoundaryFaces {
  return entry(d).faces;
}

/** The surface groups of a dataset's boundary for one grouping, computed on first call. */
export function getSurfaceGroups(d: Dataset, g: GroupingKey = {}): SurfaceGroups {
  const e = entry(d);
  const key = `${g.featureAngle ?? ''}|${g.groupArray ?? ''}`;
  let groups = e.groups.get(key);
  if (!groups) {
    groups = surfaceGroups(d, e.faces, {
      ...(g.featureAngle !== undefined ? { featureAngle: g.featureAngle } : {}),
      ...(g.groupArray !== undefined ? { groupArray: g.groupArray } : {}),
    });
    e.groups.set(key, groups);
  }
  return groups;
}

/**
 * Stores boundary faces extracted elsewhere (the worker pool merges its shares' faces into exactly what
 * `boundaryFaces` gives) as the dataset's default boundary, unless one is already cached.
 */
export function primeBoundaryFaces(d: Dataset, faces: BoundaryFaces): void {
  const key = meshKey(d);
  if (!cache.has(key)) cache.set(key, { faces, groups: new Map() });
}
