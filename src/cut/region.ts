/**
 * Region of a cut: the whole cut, or its part that passes every given filter —
 *  (a) `seed`: the connected part containing a seed point (`regionConnected.ts`);
 *  (b) `rectangle` / `disk`: the part inside a shape drawn in the plane, clipped exactly (`regionClip.ts`);
 *  (c) `groups`: triangles whose source cell's integer group id (a cell field) is in a set.
 * Filters apply in that order — groups, seed, rectangle, disk — whatever order they are given in, so the
 * seed's part is found among the chosen groups and the disk (whose arc pieces are quadrature points) comes
 * last. An empty outcome carries the reason (seed off the cut, no cell in the groups, shape misses the cut).
 */
import type { ArcCloud } from './integrals.ts';
import { clipDisk, clipRectangle } from './regionClip.ts';
import { seedRegion, type SeedSnap } from './regionConnected.ts';
import { subsetTriangles, triangleCount, type TriangleSet, type Vec3 } from './triangleSet.ts';

export type RegionSpec =
  /** The part connected to `point`; `maxDistance` (length unit) bounds how far from the cut the seed may be. */
  | { kind: 'seed'; point: Vec3; maxDistance?: number }
  /** Inside the circle of `radius` around `centre` (projected onto the plane). */
  | { kind: 'disk'; centre: Vec3; radius: number }
  /** Inside the rectangle centred at `centre`, sides along `axis` (projected into the plane) and normal × axis, half-sizes `half`. */
  | { kind: 'rectangle'; centre: Vec3; axis: Vec3; half: readonly [number, number] }
  /** Triangles whose integer cell field `field` is one of `ids`. */
  | { kind: 'groups'; field: string; ids: readonly number[] };

/** A planar triangle set (a cut). */
export interface PlanarSet extends TriangleSet {
  readonly origin: Vec3;
  readonly normal: Vec3;
}

export interface Region {
  set: TriangleSet;
  /** Quadrature points of the arc pieces of a disk region, else null. */
  arcs: ArcCloud | null;
  /** Why the region is empty, or null when it is not (or is empty because the cut is). */
  reason: string | null;
  /** Where the seed snapped, for a seed region. */
  seed: SeedSnap | null;
  /** Filters applied, in order, as text for reports. */
  applied: string[];
}

const ORDER = { groups: 0, seed: 1, rectangle: 2, disk: 3 } as const;

/** Applies the filters (see the file comment). Units: the file's length unit. */
export function selectRegion(cut: PlanarSet, specs: readonly RegionSpec[] = []): Region {
  const sorted = [...specs].sort((a, b) => ORDER[a.kind] - ORDER[b.kind]);
  for (let i = 1; i < sorted.length; i++) {
    if (sorted[i]!.kind === sorted[i - 1]!.kind) throw new Error(`region: at most one ${sorted[i]!.kind} filter`);
  }
  let set: TriangleSet = cut, arcs: ArcCloud | null = null, reason: string | null = null, seed: SeedSnap | null = null;
  const applied: string[] = [];
  for (const s of sorted) {
    if (s.kind === 'groups') {
      set = groupRegion(set, s.field, s.ids);
      applied.push(`cells with ${s.field} in {${s.ids.join(', ')}}`);
      if (triangleCount(set) === 0 && triangleCount(cut) > 0) reason ??= `no cut cell has ${s.field} in {${s.ids.join(', ')}}`;
    } else if (s.kind === 'seed') {
      const r = seedRegion(set, s.point, cut, s.maxDistance);
      set = r.set; seed = r.snap;
      applied.push(`part connected to (${s.point.join(', ')})`);
      if (r.reason && triangleCount(cut) > 0) reason ??= r.reason;
    } else if (s.kind === 'rectangle') {
      const before = triangleCount(set);
      set = clipRectangle(set, cut.normal, s.centre, s.axis, s.half);
      applied.push(`rectangle at (${s.centre.join(', ')}), half-sizes ${s.half.join(' × ')}`);
      if (before > 0 && triangleCount(set) === 0) reason ??= 'the rectangle does not overlap the cut';
    } else {
      const before = triangleCount(set);
      const d = clipDisk(set, cut.normal, s.centre, s.radius);
      set = d.set; arcs = d.arcs;
      applied.push(`disk at (${s.centre.join(', ')}), radius ${s.radius}`);
      if (before > 0 && triangleCount(set) === 0 && arcs.weights.length === 0) reason ??= 'the disk does not overlap the cut';
    }
  }
  return { set, arcs, reason, seed, applied };
}

/** Triangles whose cell field `field` (integer group ids, compared after rounding) is in `ids`. */
export function groupRegion(set: TriangleSet, field: string, ids: readonly number[]): TriangleSet {
  const f = set.fields.find((g) => g.name === field && g.association === 'cell');
  if (!f) {
    const names = set.fields.filter((g) => g.association === 'cell').map((g) => g.name).join(', ') || 'none';
    throw new Error(`group region: the cut carries no cell field "${field}" (cell fields: ${names})`);
  }
  if (f.components !== 1) throw new Error(`group region: cell field "${field}" has ${f.components} components, expected 1 (integer group ids)`);
  const want = new Set(ids.map((v) => Math.round(v)));
  const nt = triangleCount(set), keep = new Uint8Array(nt);
  for (let t = 0; t < nt; t++) keep[t] = want.has(Math.round(f.values[t]!)) ? 1 : 0;
  return subsetTriangles(set, keep);
}
