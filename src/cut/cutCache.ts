/**
 * Cut geometry kept with the mesh. A cut's triangles and each vertex's provenance (edge and parameter)
 * depend only on the mesh, the plane and the snapping tolerance — fields are interpolated afterwards
 * (`cutFields.ts`). So when the same plane is asked again on a dataset with the same mesh (`meshKey`: every
 * step of a series on one mesh, a probe set evaluated again), the geometry is taken from here and only the
 * fields are interpolated: the result is bit for bit the one `cutPlane` gives.
 *
 * A plane's geometry is kept from its second request on (a plane dragged in the view is asked once, so
 * nothing accumulates), at most `CUT_CACHE_ENTRIES` planes and `CUT_CACHE_MAX_BYTES` per mesh, oldest
 * dropped first. Cuts that record in-plane face keys (the worker pool's cell shares) are never cached.
 */
import { meshKey, type MeshKey } from '../model/meshKey.ts';
import type { Dataset } from '../model/dataset.ts';
import { interpolateCutFields } from './cutFields.ts';
import { CUT_DEFAULTS, cutPlane, datasetScale, type CutOptions, type PlaneCut } from './cutPlane.ts';
import { integrateCut, type PlaneQuery, type PlaneResult } from './planeIntegrals.ts';
import type { Vec3 } from './triangleSet.ts';

/** Planes kept per mesh. */
export const CUT_CACHE_ENTRIES = 16;
/** Bytes of cut geometry kept per mesh. */
export const CUT_CACHE_MAX_BYTES = 32 * 1024 * 1024;

type Geometry = Omit<PlaneCut, 'fields'>;

interface Entry { geometry: Geometry | null; bytes: number }
interface MeshCuts { entries: Map<string, Entry>; bytes: number }

const byMesh = new WeakMap<MeshKey, MeshCuts>();

function geometryBytes(g: Geometry): number {
  return g.positions.byteLength + g.indices.byteLength + g.sourceCell.byteLength + g.vertexEdges.byteLength + g.vertexT.byteLength;
}

function evict(m: MeshCuts): void {
  for (const [k, e] of m.entries) {
    if (m.entries.size <= CUT_CACHE_ENTRIES && m.bytes <= CUT_CACHE_MAX_BYTES) return;
    m.entries.delete(k);
    m.bytes -= e.bytes;
  }
}

/**
 * `cutPlane(dataset, origin, normal, options)` with the geometry reused from an earlier cut of the same plane
 * on the same mesh (see the file comment). Same units and layout as `cutPlane`.
 */
export function cachedCutPlane(dataset: Dataset, origin: Vec3, normal: Vec3, options: Partial<CutOptions> = {}): PlaneCut {
  const o = { ...CUT_DEFAULTS, ...options };
  if (o.planeFaceKeys) return cutPlane(dataset, origin, normal, options);
  const t0 = performance.now();
  const tol = o.tolerance * datasetScale(dataset);
  const key = `${origin.join(',')}|${normal.join(',')}|${tol}`;
  const mk = meshKey(dataset);
  let m = byMesh.get(mk);
  if (!m) { m = { entries: new Map(), bytes: 0 }; byMesh.set(mk, m); }
  const e = m.entries.get(key);
  if (e?.geometry) {
    const fields = interpolateCutFields(dataset, e.geometry, o.fields);
    return { ...e.geometry, fields, stats: { ...e.geometry.stats, ms: performance.now() - t0 } };
  }
  const cut = cutPlane(dataset, origin, normal, options);
  if (!e) m.entries.set(key, { geometry: null, bytes: 0 });
  else {
    const { fields: _unused, ...geometry } = cut;
    const bytes = geometryBytes(geometry);
    m.entries.delete(key);
    m.entries.set(key, { geometry, bytes });
    m.bytes += bytes;
  }
  evict(m);
  return cut;
}

/** `integratePlane` (planeIntegrals.ts) with the cut from `cachedCutPlane`: same result, units of the file. */
export function integratePlaneReusingCut(dataset: Dataset, q: PlaneQuery): PlaneResult {
  return integrateCut(cachedCutPlane(dataset, q.origin, q.normal, q.cut), q);
}

/** Bytes of cut geometry kept for the mesh of `d` (for memory accounting). */
export function cutCacheBytes(d: Dataset): number {
  return byMesh.get(meshKey(d))?.bytes ?? 0;
}
