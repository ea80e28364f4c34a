/**
 * Choosing surface groups by what they are rather than by an id: by name, by a box that contains them, by
 * the point they are nearest to, and by area. A selector's criteria all apply (AND); `nearest` then keeps
 * the one group (of those left) with the boundary face centroid nearest to the point, ties to the lower id.
 * Lengths in the dataset's length unit (in a probe set: the set's length unit, as every coordinate there),
 * areas in that unit². A selector that matches nothing is an error naming it and the known groups.
 */
import type { BoundaryFaces } from './boundaryFaces.ts';
import type { SurfaceGroups } from './surfaceGroups.ts';

/** A group chosen by what it is (every given criterion must hold). */
export interface GroupSelector {
  /** The group's name exactly (every group of that name). */
  readonly name?: string;
  /** `[xmin, xmax, ymin, ymax, zmin, zmax]`: groups whose bounds lie inside this box. */
  readonly within?: readonly [number, number, number, number, number, number];
  /** `[x, y, z]`: the one group with a face centroid nearest to this point. */
  readonly nearest?: readonly [number, number, number];
  /** Smallest area (length unit²), inclusive. */
  readonly areaFrom?: number;
  /** Largest area (length unit²), inclusive. */
  readonly areaTo?: number;
}

/** A reference to surface groups: an id, a name, or a selector. */
export type GroupRef = string | number | GroupSelector;

/** Members a selector may have (probe-set checker and CLI). */
export const SELECTOR_MEMBERS = ['name', 'within', 'nearest', 'areaFrom', 'areaTo'] as const;

const num = (x: number) => String(Number(x.toPrecision(12)));

/** A selector in words, for messages and result definitions. */
export function describeSelector(s: GroupSelector): string {
  const parts: string[] = [];
  if (s.name !== undefined) parts.push(`named "${s.name}"`);
  if (s.within) parts.push(`within x ${num(s.within[0])} … ${num(s.within[1])}, y ${num(s.within[2])} … ${num(s.within[3])}, z ${num(s.within[4])} … ${num(s.within[5])}`);
  if (s.areaFrom !== undefined || s.areaTo !== undefined) parts.push(`area ${s.areaFrom !== undefined ? num(s.areaFrom) : '0'} … ${s.areaTo !== undefined ? num(s.areaTo) : '∞'}`);
  if (s.nearest) parts.push(`nearest to (${s.nearest.map(num).join(', ')})`);
  return parts.length ? parts.join(', ') : 'any group';
}

/** A group reference in words: an id or name as written, a selector described (`within x … , area …`). */
export function refText(r: GroupRef): string {
  return typeof r === 'object' ? `(${describeSelector(r)})` : String(r);
}

/** Relative slack on box and area limits, so a group lying exactly on the box or at the limit area is in. */
const SLACK = 1e-9;

/** What a selector reads of a group besides its faces: id, name, area (length unit²), bounds (length unit). */
export interface GroupTraits {
  readonly id: number;
  readonly name: string;
  readonly area: number;
  readonly bounds: readonly number[];
}

/**
 * Indices (into `list`) of the groups whose name, bounds and area meet a selector's `name`, `within`,
 * `areaFrom` and `areaTo` (`nearest` needs the faces: see `selectGroups`). May be empty.
 */
export function selectByTraits(list: readonly GroupTraits[], s: GroupSelector): number[] {
  let keep = list.map((_, i) => i);
  if (s.name !== undefined) keep = keep.filter((i) => list[i]!.name === s.name);
  if (s.within) {
    const w = s.within, tol = SLACK * Math.hypot(w[1] - w[0], w[3] - w[2], w[5] - w[4]);
    keep = keep.filter((i) => {
      const b = list[i]!.bounds;
      return b[0]! >= w[0] - tol && b[1]! <= w[1] + tol && b[2]! >= w[2] - tol && b[3]! <= w[3] + tol && b[4]! >= w[4] - tol && b[5]! <= w[5] + tol;
    });
  }
  if (s.areaFrom !== undefined) keep = keep.filter((i) => list[i]!.area >= s.areaFrom! * (1 - SLACK));
  if (s.areaTo !== undefined) keep = keep.filter((i) => list[i]!.area <= s.areaTo! * (1 + SLACK));
  return keep;
}

/** The error for a selector that matched no group, naming it and the known groups. */
export function noGroupError(list: readonly GroupTraits[], s: GroupSelector): Error {
  const known = list.map((g) => `${g.id} "${g.name}" (area ${num(g.area)})`).join(', ');
  return new Error(`no surface group ${describeSelector(s)} (known: ${known || 'none'})`);
}

/**
 * Indices (into `groups.groups`, ascending by id) of the groups a selector picks.
 * @throws Error naming the selector and the known groups when none matches.
 */
export function selectGroups(groups: SurfaceGroups, faces: BoundaryFaces, s: GroupSelector): number[] {
  let keep = selectByTraits(groups.groups, s);
  if (s.nearest && keep.length > 0) {
    const want = new Uint8Array(groups.groups.length);
    for (const i of keep) want[i] = 1;
    const [px, py, pz] = s.nearest, c = faces.centroid;
    let best = -1, bestD = Infinity;
    for (let f = 0; f < faces.count; f++) {
      const g = groups.faceGroup[f]!;
      if (!want[g]) continue;
      const dx = c[3 * f]! - px, dy = c[3 * f + 1]! - py, dz = c[3 * f + 2]! - pz, d = dx * dx + dy * dy + dz * dz;
      if (d < bestD || (d === bestD && groups.groups[g]!.id < groups.groups[best]!.id)) { bestD = d; best = g; }
    }
    keep = best >= 0 ? [best] : [];
  }
  if (keep.length === 0) throw noGroupError(groups.groups, s);
  return keep.sort((a, b) => groups.groups[a]!.id - groups.groups[b]!.id);
}
