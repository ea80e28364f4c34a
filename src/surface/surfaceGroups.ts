/**
 * Surface groups: the boundary faces split into named parts (a body wall, an inlet, the far field…).
 *
 * Where the groups come from, in this order:
 *  (a) 2D cells in the file (triangles, quads, polygons, pixels) that carry an integer group array: each 2D
 *      cell is matched to the boundary face with the same nodes (merged numbering, so any piece may hold it)
 *      and gives that face its group; or a separate surface dataset (`options.surface`, e.g. a `.vtp`),
 *      matched by point coordinates within `tolerance × bounds diagonal`, grouped by its own group array or,
 *      without one, by its pieces;
 *  (b) boundary faces no 2D cell or surface polygon covers are split into connected parts separated by
 *      feature edges: an edge whose two faces' normals differ by more than `featureAngle` (default 50°: a
 *      cube splits into its six sides while a coarse sphere or a 12-sided cylinder wall stays whole), or an
 *      edge not shared by exactly two faces.
 *
 *  Without a group array, the 2D cells of pieces a set names (`.vtm` blocks, `Dataset.pieceNames`) form one
 *  group per name (`block-name`, id = the name's rank in order of first appearance).
 *
 * Ids do not depend on cell order: a group from a group array has the array's value as id; feature parts get
 * ids after the largest such value (from 0 when there is none), ranked by a geometric key — smaller centroid
 * x, then y, then z, then (concentric parts) smaller area first; coordinates within 1e-9 of the bounds
 * diagonal and areas within 1e-9 relative count as equal — so the same wall gets the same id in two files
 * whose cells are numbered differently (a pipe along z: inlet, wall, outlet). Names come from the file where it has them (a group array's name table, block names; see
 * `groupNames.ts`), else `<array> <value>` / `surface <piece>` / `part <id>`, and are renamed by
 * `renameGroups` (the caller keeps the name map). Areas in length unit², centroids (area-weighted) and
 * bounds in the length unit. Groups can also be chosen by what they are (`groupSelect.ts`).
 */
import { emptyBounds, datasetBounds, boundsDiagonal, type Bounds } from '../model/bounds.ts';
import { cellDimension, CellType } from '../model/cellTypes.ts';
import { cellStarts, type Dataset } from '../model/dataset.ts';
import type { FieldArray } from '../model/fieldArray.ts';
import { cellCount, pointCount, type Piece } from '../model/piece.ts';
import type { BoundaryFaces } from './boundaryFaces.ts';
import { faceEdges } from './faceEdges.ts';
import { FaceTable, faceKey } from './faceTable.ts';
import { PointHash } from './pointHash.ts';
import { groupNameTable, pieceNameIndex } from './groupNames.ts';
import { describeSelector, selectGroups, type GroupRef } from './groupSelect.ts';

export type GroupSource = 'cell-array' | 'surface-file' | 'feature-angle' | 'block-name';

export interface SurfaceGroup {
  /** Stable id (see the file comment). */
  readonly id: number;
  readonly name: string;
  /** Where the name came from when the file gave it (`groupNames.ts`); absent for a default name. */
  readonly nameFrom?: 'name-table' | 'block-name';
  readonly source: GroupSource;
  /** Value of the group array (cell-array and surface-file groups with an array). */
  readonly value?: number;
  readonly faces: number;
  /** Σ|A_f| (length unit²). */
  readonly area: number;
  /** Area-weighted centroid (length unit). */
  readonly centroid: [number, number, number];
  readonly bounds: Bounds;
}

export interface SurfaceGroups {
  readonly groups: readonly SurfaceGroup[];
  /** Group index (into `groups`) of each boundary face. */
  readonly faceGroup: Int32Array;
  /** Global cell number of the file's 2D cell lying on each boundary face, or −1 (for cell data on walls). */
  readonly faceSurfaceCell: Int32Array;
  /** Name of the group array used, if any. */
  readonly groupArray?: string;
  readonly featureAngle: number;
  /** 2D cells (or surface-file polygons) that lie on no boundary face. */
  readonly unmatched2d: number;
  /** Why the file's names were not used (a name table that fits no values), if anything. */
  readonly notes?: readonly string[];
}

/** Options of `surfaceGroups`. */
export interface GroupOptions {
  /** Group array name; `false` ignores group arrays; default: found by name or as the first integer cell array. */
  groupArray: string | false | undefined;
  /** Feature angle (degrees) between face normals that separates parts. Default 50. */
  featureAngle: number;
  /** A separate surface dataset (polygons) whose polygons define groups. */
  surface: Dataset | undefined;
  /** Point-match distance for `surface`, relative to the volume's bounds diagonal. Default 1e-6. */
  tolerance: number;
}

export const GROUP_DEFAULTS: GroupOptions = { groupArray: undefined, featureAngle: 50, surface: undefined, tolerance: 1e-6 };

const GROUP_NAME = /^(groups?|group[ _-]?ids?|boundary[ _-]?ids?|zones?|zone[ _-]?ids?|patch(es)?|patch[ _-]?ids?|tags?|markers?|regions?|region[ _-]?ids?|object[ _-]?ids?|surface[ _-]?ids?)$/i;
const NOT_GROUP_NAME = /original|global|pedigree/i;

const isIntegerArray = (f: FieldArray): boolean => /int/i.test(f.sourceType) || f.values instanceof Int32Array ||
  f.values instanceof Int16Array || f.values instanceof Int8Array || f.values instanceof Uint8Array ||
  f.values instanceof Uint16Array || f.values instanceof Uint32Array;

/** The group array of the pieces that hold surface cells: by name, or found. Undefined when none. */
function pickGroupArray(pieces: readonly Piece[], name: string | false | undefined, where: string): string | undefined {
  if (name === false) return undefined;
  const withSurface = pieces.filter((p) => p.cellTypes.some((t) => cellDimension(t) === 2));
  if (withSurface.length === 0) return undefined;
  if (name !== undefined) {
    for (const p of withSurface) {
      const f = p.cellData.find((a) => a.name === name);
      if (!f || f.components !== 1) throw new Error(`${where}: group array "${name}" is not a one-component cell array of every piece with surface cells`);
    }
    return name;
  }
  const first = withSurface[0]!.cellData.filter((f) => f.components === 1 && f.role !== 'globalIds' && f.role !== 'pedigreeIds');
  const common = first.filter((f) => withSurface.every((p) => p.cellData.some((g) => g.name === f.name && g.components === 1)));
  return (common.find((f) => GROUP_NAME.test(f.name)) ?? common.find((f) => isIntegerArray(f) && !NOT_GROUP_NAME.test(f.name)))?.name;
}

/** Checks a group value is an integer, naming the array and cell otherwise. */
function groupValue(f: FieldArray, c: number, where: string): number {
  const v = f.values[c]!;
  if (!Number.isInteger(v)) throw new Error(`${where}: group array "${f.name}" holds ${v} at cell ${c}; expected an integer`);
  return v;
}

/** A face table of the boundary faces keyed by their merged point numbers (value: boundary face number). */
function boundaryTable(faces: BoundaryFaces): FaceTable {
  const t = new FaceTable(faces.count), key = new Int32Array(4);
  for (let f = 0; f < faces.count; f++) {
    const a = faces.offsets[f]!;
    faceKey(faces.points, a, faces.offsets[f + 1]! - a, null, 0, key);
    t.insert(key[0]!, key[1]!, key[2]!, key[3]!, f, 0);
  }
  return t;
}

interface Labels { faceValue: Float64Array; labelled: Uint8Array; faceSurfaceCell: Int32Array; unmatched: number; array?: string; pieceNames?: boolean; blockNames?: string[] }

/** (a) Labels from the dataset's own 2D cells. */
function labelsFromCells(d: Dataset, faces: BoundaryFaces, table: FaceTable, arrayName: string | false | undefined, has2d: boolean): Labels {
  const faceValue = new Float64Array(faces.count), labelled = new Uint8Array(faces.count);
  const faceSurfaceCell = new Int32Array(faces.count).fill(-1);
  if (!has2d) return { faceValue, labelled, faceSurfaceCell, unmatched: 0 };
  const array = pickGroupArray(d.pieces, arrayName, d.source);
  // without a group array, named blocks of a set label their own 2D cells
  const blocks = array === undefined && arrayName !== false ? pieceNameIndex(d) : undefined;
  const starts = cellStarts(d), key = new Int32Array(4), map = faces.merge.map;
  let unmatched = 0;
  for (let k = 0; k < d.pieces.length; k++) {
    const p = d.pieces[k]!, s0 = faces.merge.starts[k]!;
    const f = array !== undefined ? p.cellData.find((a) => a.name === array) : undefined;
    for (let c = 0; c < cellCount(p); c++) {
      const t = p.cellTypes[c]!;
      if (cellDimension(t) !== 2 || t === CellType.TRIANGLE_STRIP) continue;
      const o = p.offsets[c]!, n = p.offsets[c + 1]! - o;
      if (n < 3) continue;
      // A pixel's nodes are in lattice order; its key is order-free, so no reordering is needed.
      faceKey(p.connectivity, o, n, map, s0, key);
      const slot = table.find(key[0]!, key[1]!, key[2]!, key[3]!);
      if (slot < 0) { unmatched++; continue; }
      const face = table.vals[2 * slot]!;
      faceSurfaceCell[face] = starts[k]! + c;
      if (f) { faceValue[face] = groupValue(f, c, `${d.source} piece ${k}`); labelled[face] = 1; }
      else if (blocks && blocks.ofPiece[k]! >= 0) { faceValue[face] = blocks.ofPiece[k]!; labelled[face] = 1; }
    }
  }
  return { faceValue, labelled, faceSurfaceCell, unmatched, ...(array !== undefined ? { array } : blocks ? { blockNames: blocks.names } : {}) };
}

/** (a) Labels from a separate surface dataset, matched by coordinates. */
function labelsFromSurface(d: Dataset, surface: Dataset, faces: BoundaryFaces, table: FaceTable, o: GroupOptions): Labels {
  const faceValue = new Float64Array(faces.count), labelled = new Uint8Array(faces.count);
  const faceSurfaceCell = new Int32Array(faces.count).fill(-1);
  const b = datasetBounds(d);
  const tol = Math.max(o.tolerance * boundsDiagonal(b), 1e-300);
  // Hash the boundary points once each, by merged number.
  const seen = new Uint8Array(faces.merge.starts[faces.merge.starts.length - 1]!);
  const hash = new PointHash(faces.points.length, [b[0], b[2], b[4]], tol);
  for (let f = 0; f < faces.count; f++) {
    const pts = d.pieces[faces.piece[f]!]!.points;
    for (let j = faces.offsets[f]!; j < faces.offsets[f + 1]!; j++) {
      const g = faces.points[j]!;
      if (seen[g]) continue;
      seen[g] = 1;
      const l = 3 * faces.nodes[j]!;
      hash.insert(pts[l]!, pts[l + 1]!, pts[l + 2]!, g);
    }
  }
  const array = pickGroupArray(surface.pieces, o.groupArray, surface.source);
  const key = new Int32Array(4);
  let unmatched = 0, ids = new Int32Array(64);
  for (let k = 0; k < surface.pieces.length; k++) {
    const p = surface.pieces[k]!;
    const f = array !== undefined ? p.cellData.find((a) => a.name === array) : undefined;
    const local = new Int32Array(pointCount(p));
    for (let i = 0; i < local.length; i++) local[i] = hash.nearest(p.points[3 * i]!, p.points[3 * i + 1]!, p.points[3 * i + 2]!);
    for (let c = 0; c < cellCount(p); c++) {
      const t = p.cellTypes[c]!;
      if (cellDimension(t) !== 2 || t === CellType.TRIANGLE_STRIP) continue;
      const a = p.offsets[c]!, n = p.offsets[c + 1]! - a;
      if (n < 3) continue;
      if (ids.length < n) ids = new Int32Array(2 * n);
      let miss = false;
      for (let j = 0; j < n; j++) { const g = local[p.connectivity[a + j]!]!; ids[j] = g; if (g < 0) miss = true; }
      const slot = miss ? -1 : (faceKey(ids, 0, n, null, 0, key), table.find(key[0]!, key[1]!, key[2]!, key[3]!));
      if (slot < 0) { unmatched++; continue; }
      const face = table.vals[2 * slot]!;
      faceValue[face] = f ? groupValue(f, c, `${surface.source} piece ${k}`) : k;
      labelled[face] = 1;
    }
  }
  return { faceValue, labelled, faceSurfaceCell, unmatched, ...(array !== undefined ? { array } : { pieceNames: true }) };
}

/** (b) Connected parts of the faces in `selection`, split at feature edges; returns a part number per selected face. */
function featureParts(faces: BoundaryFaces, selection: Int32Array, featureAngle: number): { part: Int32Array; parts: number } {
  const n = selection.length, parent = new Int32Array(n);
  for (let i = 0; i < n; i++) parent[i] = i;
  const find = (i: number): number => {
    while (parent[i] !== i) { parent[i] = parent[parent[i]!]!; i = parent[i]!; }
    return i;
  };
  const position = new Int32Array(faces.count).fill(-1);
  for (let i = 0; i < n; i++) position[selection[i]!] = i;
  const e = faceEdges(faces, selection), av = faces.areaVector;
  const cosLimit = Math.cos((featureAngle * Math.PI) / 180);
  for (let i = 0; i < e.count; i++) {
    if (e.uses[i] !== 2) continue;
    const f = e.face0[i]!, g = e.face1[i]!;
    const ax = av[3 * f]!, ay = av[3 * f + 1]!, az = av[3 * f + 2]!, bx = av[3 * g]!, by = av[3 * g + 1]!, bz = av[3 * g + 2]!;
    const la = Math.sqrt(ax * ax + ay * ay + az * az), lb = Math.sqrt(bx * bx + by * by + bz * bz);
    if (la === 0 || lb === 0 || (ax * bx + ay * by + az * bz) < cosLimit * la * lb) continue;
    const r = find(position[f]!), s = find(position[g]!);
    if (r !== s) parent[r < s ? s : r] = r < s ? r : s;
  }
  // Number parts by their smallest face (selection is ascending), so numbering is stable.
  const part = new Int32Array(n), label = new Int32Array(n).fill(-1);
  let parts = 0;
  for (let i = 0; i < n; i++) {
    const r = find(i);
    if (label[r] === -1) label[r] = parts++;
    part[i] = label[r]!;
  }
  return { part, parts };
}

/** Area, centroid and bounds of every group, from the per-face group index. */
function groupStats(d: Dataset, faces: BoundaryFaces, faceGroup: Int32Array, count: number) {
  const area = new Float64Array(count), cen = new Float64Array(3 * count), nf = new Int32Array(count);
  const bounds: Bounds[] = Array.from({ length: count }, () => emptyBounds());
  for (let f = 0; f < faces.count; f++) {
    const g = faceGroup[f]!, av = faces.areaVector, c = faces.centroid;
    const x = av[3 * f]!, y = av[3 * f + 1]!, z = av[3 * f + 2]!, a = Math.sqrt(x * x + y * y + z * z);
    area[g] += a; nf[g]!++;
    cen[3 * g] += a * c[3 * f]!; cen[3 * g + 1] += a * c[3 * f + 1]!; cen[3 * g + 2] += a * c[3 * f + 2]!;
    const pts = d.pieces[faces.piece[f]!]!.points, b = bounds[g]!;
    for (let j = faces.offsets[f]!; j < faces.offsets[f + 1]!; j++) {
      const l = 3 * faces.nodes[j]!, x = pts[l]!, y = pts[l + 1]!, z = pts[l + 2]!;
      if (x < b[0]) b[0] = x; if (x > b[1]) b[1] = x;
      if (y < b[2]) b[2] = y; if (y > b[3]) b[3] = y;
      if (z < b[4]) b[4] = z; if (z > b[5]) b[5] = z;
    }
  }
  return { area, cen, nf, bounds };
}

type Stats = ReturnType<typeof groupStats>;

/**
 * Renumbers the feature parts (group indices `first…`) by their geometric key (see the file comment),
 * rewriting `faceGroup` in place; returns the stats in the new order.
 */
function rankFeatureParts(s: Stats, faceGroup: Int32Array, first: number, diagonal: number): Stats {
  const n = s.area.length - first;
  if (n < 2) return s;
  const tol = 1e-9 * diagonal;
  const order = Array.from({ length: n }, (_, i) => first + i).sort((a, b) => {
    const da = s.area[a]!, db = s.area[b]!;
    for (let k = 0; k < 3; k++) {
      const ca = s.cen[3 * a + k]! / (da || 1), cb = s.cen[3 * b + k]! / (db || 1);
      if (Math.abs(ca - cb) > tol) return ca - cb;
    }
    return Math.abs(da - db) > 1e-9 * Math.max(da, db) ? da - db : 0;
  });
  const newIndex = new Int32Array(s.area.length);
  for (let g = 0; g < first; g++) newIndex[g] = g;
  order.forEach((g, i) => { newIndex[g] = first + i; });
  for (let f = 0; f < faceGroup.length; f++) faceGroup[f] = newIndex[faceGroup[f]!]!;
  const area = new Float64Array(s.area.length), cen = new Float64Array(s.cen.length), nf = new Int32Array(s.nf.length);
  const bounds = s.bounds.slice();
  for (let g = 0; g < s.area.length; g++) {
    const h = newIndex[g]!;
    area[h] = s.area[g]!; nf[h] = s.nf[g]!; bounds[h] = s.bounds[g]!;
    cen[3 * h] = s.cen[3 * g]!; cen[3 * h + 1] = s.cen[3 * g + 1]!; cen[3 * h + 2] = s.cen[3 * g + 2]!;
  }
  return { area, cen, nf, bounds };
}

/**
 * Splits the boundary faces into groups (see the file comment).
 * @throws Error when a named group array is missing or holds non-integer values.
 */
export function surfaceGroups(d: Dataset, faces: BoundaryFaces, options: Partial<GroupOptions> = {}): SurfaceGroups {
  const o = { ...GROUP_DEFAULTS, ...options };
  // The face table is only needed to match 2D cells or a surface file.
  const cells2d = d.pieces.some((p) => p.cellTypes.some((t) => t >= CellType.TRIANGLE && t <= CellType.QUAD));
  const table = cells2d || o.surface ? boundaryTable(faces) : new FaceTable(0);
  const fromCells = labelsFromCells(d, faces, table, o.surface ? false : o.groupArray, cells2d);
  const labels = o.surface ? { ...labelsFromSurface(d, o.surface, faces, table, o), faceSurfaceCell: fromCells.faceSurfaceCell } : fromCells;
  const source: GroupSource = o.surface ? 'surface-file' : 'cell-array';
  const faceGroup = new Int32Array(faces.count).fill(-1);
  // Labelled faces: one group per distinct value, in ascending value order.
  const seen = new Set<number>();
  for (let f = 0; f < faces.count; f++) if (labels.labelled[f]) seen.add(labels.faceValue[f]!);
  const values = [...seen].sort((x, y) => x - y);
  const index = new Map(values.map((v, i) => [v, i]));
  let nRest = 0;
  for (let f = 0; f < faces.count; f++) {
    if (labels.labelled[f]) faceGroup[f] = index.get(labels.faceValue[f]!)!;
    else nRest++;
  }
  const rest = new Int32Array(nRest);
  for (let f = 0, i = 0; f < faces.count; f++) if (faceGroup[f] === -1) rest[i++] = f;
  const { part, parts } = featureParts(faces, rest, o.featureAngle);
  for (let i = 0; i < rest.length; i++) faceGroup[rest[i]!] = values.length + part[i]!;
  const firstFeatureId = values.length ? Math.max(0, values[values.length - 1]! + 1) : 0;
  const total = values.length + parts;
  const s = rankFeatureParts(groupStats(d, faces, faceGroup, total), faceGroup, values.length, boundsDiagonal(datasetBounds(d)));
  const nameTable = labels.array !== undefined ? groupNameTable(d, labels.array, values) : undefined;
  const named = nameTable && 'names' in nameTable ? nameTable.names : undefined;
  const groups: SurfaceGroup[] = [];
  for (let g = 0; g < total; g++) {
    const a = s.area[g]!;
    const centroid: [number, number, number] = a > 0 ? [s.cen[3 * g]! / a, s.cen[3 * g + 1]! / a, s.cen[3 * g + 2]! / a] : [NaN, NaN, NaN];
    const common = { faces: s.nf[g]!, area: a, centroid, bounds: s.bounds[g]! };
    if (g < values.length) {
      const v = values[g]!, block = labels.blockNames?.[v], fromTable = named?.get(v);
      if (block !== undefined) { groups.push({ id: v, name: block, nameFrom: 'block-name', source: 'block-name', ...common }); continue; }
      const name = fromTable ?? (labels.array !== undefined ? `${labels.array} ${v}` : `surface ${v}`);
      groups.push({ id: v, name, ...(fromTable !== undefined ? { nameFrom: 'name-table' as const } : {}), source, value: v, ...common });
    } else {
      const id = firstFeatureId + g - values.length;
      groups.push({ id, name: `part ${id}`, source: 'feature-angle', ...common });
    }
  }
  return {
    groups, faceGroup, faceSurfaceCell: labels.faceSurfaceCell, featureAngle: o.featureAngle, unmatched2d: labels.unmatched,
    ...(labels.array !== undefined ? { groupArray: labels.array } : {}),
    ...(nameTable && 'note' in nameTable ? { notes: [nameTable.note] } : {}),
  };
}

/**
 * Returns the groups with new names. `names` maps a group id (as a string) or a current name to the new name;
 * groups not in the map keep theirs. Arrays are shared with the input.
 */
export function renameGroups(groups: SurfaceGroups, names: Readonly<Record<string, string>>): SurfaceGroups {
  return { ...groups, groups: groups.groups.map((g) => ({ ...g, name: names[String(g.id)] ?? names[g.name] ?? g.name })) };
}

/**
 * Resolves group references (an id such as `3`, a name, or a selector of `groupSelect.ts`) to group indices.
 * `faces` (the boundary faces the groups were made from) is needed only by a selector with `nearest`.
 * @throws Error naming the reference and the known groups when one matches nothing or a name is ambiguous.
 */
export function resolveGroups(groups: SurfaceGroups, refs: readonly GroupRef[], faces?: BoundaryFaces): number[] {
  const out: number[] = [];
  for (const r of refs) {
    if (typeof r === 'object') {
      if (r.nearest && !faces) throw new Error(`surface group ${describeSelector(r)}: choosing the nearest group needs the boundary faces`);
      for (const i of selectGroups(groups, faces!, r)) if (!out.includes(i)) out.push(i);
      continue;
    }
    const text = String(r).trim();
    let i = groups.groups.findIndex((g) => g.name === text);
    if (i >= 0 && groups.groups.findIndex((g, j) => j > i && g.name === text) >= 0) {
      throw new Error(`group name "${text}" is used by several groups; refer to it by id`);
    }
    if (i < 0 && /^-?\d+$/.test(text)) i = groups.groups.findIndex((g) => g.id === Number(text));
    if (i < 0) {
      const known = groups.groups.map((g) => `${g.id} "${g.name}"`).join(', ');
      throw new Error(`no surface group "${text}" (known: ${known || 'none'})`);
    }
    if (!out.includes(i)) out.push(i);
  }
  return out;
}

/** Boundary face numbers (ascending) of the merged groups given by index (see `resolveGroups`). */
export function facesOfGroups(groups: SurfaceGroups, indices: readonly number[]): Int32Array {
  const want = new Uint8Array(groups.groups.length);
  for (const i of indices) want[i] = 1;
  let n = 0;
  for (let f = 0; f < groups.faceGroup.length; f++) if (want[groups.faceGroup[f]!]) n++;
  const out = new Int32Array(n);
  for (let f = 0, k = 0; f < groups.faceGroup.length; f++) if (want[groups.faceGroup[f]!]) out[k++] = f;
  return out;
}

/** Boundary face numbers (ascending) of every group, in one pass: `result[i]` for group index i. */
export function facesByGroup(groups: SurfaceGroups): Int32Array[] {
  const n = groups.groups.length, count = new Int32Array(n);
  for (let f = 0; f < groups.faceGroup.length; f++) count[groups.faceGroup[f]!]!++;
  const out = Array.from({ length: n }, (_, i) => new Int32Array(count[i]!)), fill = new Int32Array(n);
  for (let f = 0; f < groups.faceGroup.length; f++) { const g = groups.faceGroup[f]!; out[g]![fill[g]!++] = f; }
  return out;
}
