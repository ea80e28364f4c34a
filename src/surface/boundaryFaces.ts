/**
 * Boundary faces: the faces used by exactly one 3D cell, over all pieces, for every 3D type including
 * polyhedra (by their face stream). 2D and lower cells are not faces of the volume and are ignored here
 * (surface groups read them separately).
 *
 * Matching: every face of every 3D cell is keyed by its sorted node ids in the merged point numbering
 * (`pointMerge.ts`: faces between pieces meet through global ids or coordinates; keys as `faceKey` in
 * `faceTable.ts`) and toggled in lists under each face's smallest node (`faceLists.ts`): a face met a second
 * time is interior and leaves its list. A face shared by three or more cells (an invalid mesh) is therefore
 * decided by parity.
 *
 * Orientation: faces come from the cell-type face tables, outward for cells with the standard VTK
 * orientation, and polyhedron faces in stream order. Each boundary face is then checked against its owning
 * cell: when its area vector points towards the cell's vertex average (an inverted cell, or a polyhedron
 * face written inward), its node order is reversed. The result is oriented outward from the fluid domain,
 * i.e. into a body wall. The check is exact for convex cells and for mildly non-convex ones.
 *
 * Output layout (struct-of-arrays, boundary face `f`):
 *  - `cell[f]` owning global cell (numbering of `cellStarts`), `localFace[f]` its face number (type table order,
 *    or position in a polyhedron's face list), `piece[f]` the owning piece;
 *  - nodes `nodes[offsets[f] .. offsets[f+1]-1]` as piece-local point ids (index that piece's points and
 *    point fields directly), and the same nodes in the merged global numbering in `points[...]`;
 *  - `areaVector[3f..3f+2]` outward, |·| = area (length unit²); `centroid[3f..3f+2]` (length unit).
 * Faces are ordered by owning cell, then local face: deterministic for a given dataset.
 */
import { CellType, FACE_TABLE } from '../model/cellTypes.ts';
import { cellStarts, pieceOfCell, type Dataset } from '../model/dataset.ts';
import { cellCount } from '../model/piece.ts';
import { faceAreaCentroid, vertexAverage } from './faceGeometry.ts';
import { FaceLists } from './faceLists.ts';
import { faceKey } from './faceTable.ts';
import { mergePiecePoints, type MergeOptions, type PointMerge } from './pointMerge.ts';

export interface BoundaryFaces {
  readonly count: number;
  readonly cell: Int32Array;
  readonly localFace: Int32Array;
  readonly piece: Int32Array;
  /** `count + 1` offsets into `nodes` / `points`. */
  readonly offsets: Int32Array;
  /** Piece-local point ids, outward node order. */
  readonly nodes: Int32Array;
  /** Merged global point numbers (see `merge`), same order as `nodes`. */
  readonly points: Int32Array;
  /** Outward area vectors, 3 per face (length unit²). */
  readonly areaVector: Float64Array;
  /** Face centroids, 3 per face (length unit). */
  readonly centroid: Float64Array;
  /** Faces whose table or stream orientation pointed into the owning cell and were reversed. */
  readonly flipped: number;
  /** The merged point numbering used for matching. */
  readonly merge: PointMerge;
  /** Global cell numbering (`cellStarts` of the dataset). */
  readonly cellStarts: Int32Array;
  /** 3D cells examined. */
  readonly cells3d: number;
}

/** Options of `boundaryFaces`: how points of different pieces are matched (see `pointMerge.ts`). */
export type BoundaryOptions = Partial<MergeOptions>;

/** Largest number of faces a cell may have in the (cell, face) sort key `cell × FACE_SLOTS + face`. */
export const FACE_SLOTS = 65536;

/** Extracts the boundary faces of a dataset's 3D cells (see the file comment for layout and orientation). */
export function boundaryFaces(d: Dataset, options: BoundaryOptions = {}): BoundaryFaces {
  const merge = mergePiecePoints(d, options);
  const starts = cellStarts(d);
  // Entries in use: the unmatched front and the boundary found so far (~4 n^(2/3) faces each); they double when needed.
  const table = new FaceLists(merge.starts[merge.starts.length - 1]!, Math.ceil(8 * Math.cbrt(starts[starts.length - 1]!) ** 2));
  const key = new Int32Array(4);
  const fStart = FACE_TABLE.start, fSize = FACE_TABLE.size, fFirst = FACE_TABLE.first, fNodes = FACE_TABLE.nodes;
  const map = merge.map;
  // Type numbers copied to locals: imported bindings can cost a getter call per access in the hot loop.
  const TETRA = CellType.TETRA, LAST_FIXED = CellType.HEXAGONAL_PRISM, POLYHEDRON = CellType.POLYHEDRON;
  let cells3d = 0;
  for (let k = 0; k < d.pieces.length; k++) {
    const p = d.pieces[k]!, conn = p.connectivity, offs = p.offsets, types = p.cellTypes;
    const s0 = merge.starts[k]!, g0 = starts[k]!, n = cellCount(p);
    const pf = p.polyFaces;
    for (let c = 0; c < n; c++) {
      const t = types[c]!;
      if (t < TETRA || t > LAST_FIXED) {
        if (t === POLYHEDRON && pf) {
          cells3d++;
          const fa = pf.cellFaceStart[c]!, fb = pf.cellFaceStart[c + 1]!;
          if (fb - fa >= FACE_SLOTS) throw new Error(`${d.source}: polyhedron ${c} of piece ${k} has ${fb - fa} faces, more than the ${FACE_SLOTS - 1} supported`);
          for (let f = fa; f < fb; f++) {
            const a = pf.faceOffsets[f]!;
            faceKey(pf.faceConnectivity, a, pf.faceOffsets[f + 1]! - a, map, s0, key);
            table.toggle(key[0]!, key[1]!, key[2]!, key[3]!, g0 + c, f - fa);
          }
        }
        continue;
      }
      cells3d++;
      const o = offs[c]!, fa = fStart[t]!, fb = fStart[t + 1]!;
      for (let f = fa; f < fb; f++) {
        const m = fSize[f]!, q = fFirst[f]!;
        if (m === 3) {
          let a = conn[o + fNodes[q]!]!, b = conn[o + fNodes[q + 1]!]!, e = conn[o + fNodes[q + 2]!]!;
          if (map) { a = map[s0 + a]!; b = map[s0 + b]!; e = map[s0 + e]!; }
          let x: number;
          if (a > b) { x = a; a = b; b = x; }
          if (b > e) { x = b; b = e; e = x; }
          if (a > b) { x = a; a = b; b = x; }
          table.toggle(a, b, e, -1, g0 + c, f - fa);
        } else if (m === 4) {
          let a = conn[o + fNodes[q]!]!, b = conn[o + fNodes[q + 1]!]!, e = conn[o + fNodes[q + 2]!]!, h = conn[o + fNodes[q + 3]!]!;
          if (map) { a = map[s0 + a]!; b = map[s0 + b]!; e = map[s0 + e]!; h = map[s0 + h]!; }
          let x: number;
          if (a > b) { x = a; a = b; b = x; }
          if (e > h) { x = e; e = h; h = x; }
          if (a > e) { x = a; a = e; e = x; }
          if (b > h) { x = b; b = h; h = x; }
          if (b > e) { x = b; b = e; e = x; }
          table.toggle(a, b, e, h, g0 + c, f - fa);
        } else {
          faceKeyFixed(conn, o, fNodes, q, m, map, s0, key);
          table.toggle(key[0]!, key[1]!, key[2]!, key[3]!, g0 + c, f - fa);
        }
      }
    }
  }
  return assemble(d, table, merge, starts, cells3d);
}

let gatherBuf = new Int32Array(64);

/** Key of a face of a fixed-size type with more than four nodes (prisms' end faces). */
function faceKeyFixed(conn: Int32Array, o: number, fNodes: Int32Array, q: number, m: number, map: Int32Array | null, s0: number, out: Int32Array): void {
  if (gatherBuf.length < m) gatherBuf = new Int32Array(2 * m);
  for (let j = 0; j < m; j++) gatherBuf[j] = conn[o + fNodes[q + j]!]!;
  faceKey(gatherBuf, 0, m, map, s0, out);
}

/** Collects the faces left in the lists, orders them by (cell, face), and computes nodes and geometry. */
function assemble(d: Dataset, table: FaceLists, merge: PointMerge, starts: Int32Array, cells3d: number): BoundaryFaces {
  const count = table.live;
  const order = new Float64Array(count);
  table.valueKeys(FACE_SLOTS, order, 0);
  order.sort();
  const cell = new Int32Array(count), localFace = new Int32Array(count), piece = new Int32Array(count);
  const offsets = new Int32Array(count + 1);
  for (let f = 0; f < count; f++) {
    const g = Math.floor(order[f]! / FACE_SLOTS);
    cell[f] = g; localFace[f] = order[f]! - g * FACE_SLOTS;
    const k = pieceOfCell(starts, g);
    piece[f] = k;
    const p = d.pieces[k]!, c = g - starts[k]!, t = p.cellTypes[c]!;
    offsets[f + 1] = offsets[f]! + (t === CellType.POLYHEDRON
      ? p.polyFaces!.faceOffsets[p.polyFaces!.cellFaceStart[c]! + localFace[f]! + 1]! - p.polyFaces!.faceOffsets[p.polyFaces!.cellFaceStart[c]! + localFace[f]!]!
      : FACE_TABLE.size[FACE_TABLE.start[t]! + localFace[f]!]!);
  }
  const nodes = new Int32Array(offsets[count]!), points = new Int32Array(offsets[count]!);
  const areaVector = new Float64Array(3 * count), centroid = new Float64Array(3 * count);
  const cc = new Float64Array(3);
  let flipped = 0;
  for (let f = 0; f < count; f++) {
    const k = piece[f]!, p = d.pieces[k]!, c = cell[f]! - starts[k]!, t = p.cellTypes[c]!;
    const a = offsets[f]!, m = offsets[f + 1]! - a, o = p.offsets[c]!;
    if (t === CellType.POLYHEDRON) {
      const pf = p.polyFaces!, fo = pf.faceOffsets[pf.cellFaceStart[c]! + localFace[f]!]!;
      for (let j = 0; j < m; j++) nodes[a + j] = pf.faceConnectivity[fo + j]!;
    } else {
      const q = FACE_TABLE.first[FACE_TABLE.start[t]! + localFace[f]!]!;
      for (let j = 0; j < m; j++) nodes[a + j] = p.connectivity[o + FACE_TABLE.nodes[q + j]!]!;
    }
    faceAreaCentroid(p.points, nodes, a, m, areaVector, centroid, f);
    vertexAverage(p.points, p.connectivity, o, p.offsets[c + 1]! - o, cc);
    const dot = areaVector[3 * f]! * (centroid[3 * f]! - cc[0]!) + areaVector[3 * f + 1]! * (centroid[3 * f + 1]! - cc[1]!) +
      areaVector[3 * f + 2]! * (centroid[3 * f + 2]! - cc[2]!);
    if (dot < 0) {
      // Reverse the node order (keeping the first node) and the area vector.
      for (let i = 1, j = m - 1; i < j; i++, j--) { const x = nodes[a + i]!; nodes[a + i] = nodes[a + j]!; nodes[a + j] = x; }
      areaVector[3 * f] = -areaVector[3 * f]!; areaVector[3 * f + 1] = -areaVector[3 * f + 1]!; areaVector[3 * f + 2] = -areaVector[3 * f + 2]!;
      flipped++;
    }
    const s0 = merge.starts[k]!;
    for (let j = 0; j < m; j++) points[a + j] = merge.map ? merge.map[s0 + nodes[a + j]!]! : s0 + nodes[a + j]!;
  }
  return { count, cell, localFace, piece, offsets, nodes, points, areaVector, centroid, flipped, merge, cellStarts: starts, cells3d };
}

/** Total boundary area (length unit²): Σ |area vector| over the faces, or over `selection` when given. */
export function totalArea(faces: BoundaryFaces, selection?: ArrayLike<number>): number {
  const a = faces.areaVector;
  let s = 0;
  const n = selection ? selection.length : faces.count;
  for (let i = 0; i < n; i++) {
    const f = selection ? selection[i]! : i;
    const x = a[3 * f]!, y = a[3 * f + 1]!, z = a[3 * f + 2]!;
    s += Math.sqrt(x * x + y * y + z * z);
  }
  return s;
}
