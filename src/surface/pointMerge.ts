/**
 * One point numbering across the pieces of a dataset, so that faces between pieces (whose points are written
 * once per piece) are recognised as the same face.
 *
 * Global point numbers follow `pointStarts`: point `i` of piece `k` is `starts[k] + i`. The merged number of a
 * point is the global number of its representative: the first point of an *earlier* piece that is the same
 * point, or the point itself. Points are matched
 *  - by a global-id point array when every piece has one (role `globalIds`, or a one-component array named
 *    like `GlobalNodeId` / `GlobalPointIds` / `global_ids`), else
 *  - by coordinates, within `tolerance × (diagonal of the dataset's bounds)`.
 * Points of the same piece are never merged with each other (as in VTK's surface extraction, coincident but
 * distinct points of one piece stay distinct).
 */
import { datasetBounds, boundsDiagonal } from '../model/bounds.ts';
import { pointStarts, type Dataset } from '../model/dataset.ts';
import type { FieldArray } from '../model/fieldArray.ts';
import { pointCount } from '../model/piece.ts';
import { PointHash } from './pointHash.ts';

/** How the pieces' points were matched. */
export type MergeMethod = 'single-piece' | 'global-ids' | 'coordinates';

export interface PointMerge {
  /** Merged number of each global point (length = total points), or null when it is the identity (one piece). */
  readonly map: Int32Array | null;
  /** Running sums of point counts per piece (`pointStarts`). */
  readonly starts: Int32Array;
  readonly method: MergeMethod;
  /** Points mapped onto a point of an earlier piece. */
  readonly shared: number;
  /** Absolute match distance used for 'coordinates' (length unit); 0 otherwise. */
  readonly tolerance: number;
  /** Name of the global-id array used, for 'global-ids'. */
  readonly idArray?: string;
}

/** Options of `mergePiecePoints`. */
export interface MergeOptions {
  /** Match distance relative to the bounds' diagonal, for coordinate matching. Default 1e-7. */
  tolerance: number;
  /** Name of the global point-id array to use; `false` forces coordinate matching. Default: found by role or name. */
  globalIds: string | false | undefined;
}

export const MERGE_DEFAULTS: MergeOptions = { tolerance: 1e-7, globalIds: undefined };

const GLOBAL_ID_NAME = /^(global[ _-]?(node|point|vertex)?[ _-]?ids?|vtkGlobalIds)$/i;

function globalIdArray(d: Dataset, name: string | undefined): FieldArray[] | undefined {
  const arrays: FieldArray[] = [];
  for (const p of d.pieces) {
    const f = name !== undefined
      ? p.pointData.find((a) => a.name === name)
      : p.pointData.find((a) => a.role === 'globalIds' && a.components === 1) ??
        p.pointData.find((a) => a.components === 1 && GLOBAL_ID_NAME.test(a.name));
    if (!f || f.components !== 1) return undefined;
    arrays.push(f);
  }
  return arrays;
}

/** Open-addressing map from an integer-valued double (a global id) to a global point number. */
function mergeByIds(d: Dataset, starts: Int32Array, arrays: FieldArray[]): { map: Int32Array; shared: number } {
  const total = starts[starts.length - 1]!;
  let size = 1024;
  while (size < 2 * total) size *= 2;
  const mask = size - 1;
  const keys = new Float64Array(size), vals = new Int32Array(size).fill(-1);
  const map = new Int32Array(total);
  let shared = 0;
  for (let k = 0; k < d.pieces.length; k++) {
    const v = arrays[k]!.values, s0 = starts[k]!;
    for (let i = 0; i < v.length; i++) {
      const id = v[i]!;
      const lo = id % 4294967296 | 0, hi = Math.floor(id / 4294967296) | 0;
      let h = Math.imul(lo, 0x9e3779b1) ^ Math.imul(hi, 0x85ebca77);
      h ^= h >>> 15; h = Math.imul(h, 0x2c1b3c6d); h ^= h >>> 12;
      let s = h & mask;
      while (vals[s]! >= 0 && keys[s] !== id) s = (s + 1) & mask;
      const g = s0 + i;
      if (vals[s]! < 0) { keys[s] = id; vals[s] = g; map[g] = g; }
      else if (vals[s]! < s0) { map[g] = vals[s]!; shared++; }
      else map[g] = g;
    }
  }
  return { map, shared };
}

function mergeByCoordinates(d: Dataset, starts: Int32Array, tol: number): { map: Int32Array; shared: number } {
  const b = datasetBounds(d);
  const total = starts[starts.length - 1]!;
  const hash = new PointHash(total, [b[0], b[2], b[4]], tol);
  const map = new Int32Array(total);
  let shared = 0;
  for (let k = 0; k < d.pieces.length; k++) {
    const pts = d.pieces[k]!.points, s0 = starts[k]!, n = pointCount(d.pieces[k]!);
    for (let i = 0; i < n; i++) {
      const x = pts[3 * i]!, y = pts[3 * i + 1]!, z = pts[3 * i + 2]!;
      const g = s0 + i;
      const m = k > 0 ? hash.nearest(x, y, z, s0) : -1;
      // A point matched to an earlier piece maps to that point's representative.
      if (m >= 0) { map[g] = map[m]!; shared++; } else map[g] = g;
      hash.insert(x, y, z, g);
    }
  }
  return { map, shared };
}

/**
 * Merged point numbering of a dataset (see the file comment).
 * @throws Error when `globalIds` names an array that some piece lacks.
 */
export function mergePiecePoints(d: Dataset, options: Partial<MergeOptions> = {}): PointMerge {
  const o = { ...MERGE_DEFAULTS, ...options };
  const starts = pointStarts(d);
  if (d.pieces.length <= 1) return { map: null, starts, method: 'single-piece', shared: 0, tolerance: 0 };
  if (o.globalIds !== false) {
    const arrays = globalIdArray(d, o.globalIds);
    if (!arrays && o.globalIds !== undefined) {
      throw new Error(`${d.source}: global point-id array "${o.globalIds}" is missing from some piece (expected one component in every piece)`);
    }
    if (arrays) {
      const { map, shared } = mergeByIds(d, starts, arrays);
      return { map, starts, method: 'global-ids', shared, tolerance: 0, idArray: arrays[0]!.name };
    }
  }
  const tol = Math.max(o.tolerance * boundsDiagonal(datasetBounds(d)), 1e-300);
  const { map, shared } = mergeByCoordinates(d, starts, tol);
  return { map, starts, method: 'coordinates', shared, tolerance: tol };
}
