/**
 * Identity of a dataset's mesh, for caches of structures that depend only on the geometry (the cell tree,
 * boundary faces, surface groups). Two datasets share a mesh key when every piece holds the very same
 * typed-array objects for points, cell types, offsets, connectivity and polyhedral faces — which is what
 * the series reader arranges when consecutive steps carry identical geometry bytes (src/series/meshReuse.ts).
 * A key is a plain object, used as a WeakMap key: it lives as long as some dataset built on that mesh.
 *
 * The key does not keep any field array alive, so a cache keyed by it never retains a step's fields.
 */
import type { Dataset } from './dataset.ts';
import type { Piece } from './piece.ts';

/** Opaque mesh identity (see the file comment). */
export interface MeshKey {
  readonly pieces: number;
}

interface Entry { key: MeshKey; refs: readonly object[] }

/** Entries by the points array of the first piece (several when meshes share that array but differ elsewhere). */
const byPoints = new WeakMap<Float64Array, Entry[]>();
/** Datasets without pieces get a key of their own. */
const lone = new WeakMap<Dataset, MeshKey>();
const memo = new WeakMap<Dataset, MeshKey>();

function geometryRefs(p: Piece): object[] {
  const r: object[] = [p.points, p.cellTypes, p.offsets, p.connectivity];
  if (p.polyFaces) r.push(p.polyFaces.cellFaceStart, p.polyFaces.faceOffsets, p.polyFaces.faceConnectivity);
  else r.push(NO_POLY);
  return r;
}
const NO_POLY = Object.freeze({});

/** The mesh key of a dataset: the same object for every dataset whose pieces hold the same geometry arrays. */
export function meshKey(d: Dataset): MeshKey {
  const known = memo.get(d);
  if (known) return known;
  let key: MeshKey;
  if (d.pieces.length === 0) {
    key = lone.get(d) ?? { pieces: 0 };
    lone.set(d, key);
  } else {
    const refs = d.pieces.flatMap(geometryRefs);
    const first = d.pieces[0]!.points;
    let list = byPoints.get(first);
    if (!list) { list = []; byPoints.set(first, list); }
    const hit = list.find((e) => e.refs.length === refs.length && e.refs.every((r, i) => r === refs[i]));
    if (hit) key = hit.key;
    else { key = { pieces: d.pieces.length }; list.push({ key, refs }); }
  }
  memo.set(d, key);
  return key;
}

/**
 * The dataset reduced to its geometry (pieces without point or cell fields, no field data), so a cached
 * structure that keeps it for geometry lookups does not keep any step's field arrays alive.
 */
export function geometryOnly(d: Dataset): Dataset {
  const g: Dataset = { ...d, fieldData: [], pieces: d.pieces.map((p) => ({ ...p, pointData: [], cellData: [] })) };
  memo.set(g, meshKey(d));
  return g;
}
