/**
 * Drawing arrays for a list of polygonal faces (the mesh boundary, or the 2D cells of a surface-only
 * file): fan triangulation into non-indexed triangles, flat normals, group ids, face outlines, and
 * per-vertex values of a field. Runs in the worker; every array it returns is newly allocated, so the
 * worker can transfer it.
 */
import { cellStarts, type Dataset } from '../model/dataset.ts';
import { cellDimension } from '../model/cellTypes.ts';
import type { FieldArray } from '../model/fieldArray.ts';
import type { TriangleSet } from '../cut/triangleSet.ts';
import { outlineEdges } from './outlineEdges.ts';

/** A field to colour by or to sample: a scalar, one component, or the magnitude (component −1). */
export interface FieldChoice {
  name: string;
  association: 'point' | 'cell';
  component: number;
}

/**
 * Triangles to draw, non-indexed (vertex v of triangle t is at `3t + v`), so cell data can stay
 * constant per face. `positions` and `normals` are xyz per vertex; `groups` is the group id per vertex
 * (float, for the shader).
 */
export interface TriangleDrawing {
  positions: Float32Array;
  normals: Float32Array;
  groups: Float32Array;
}

/**
 * The boundary surface for drawing, plus the outline of its faces as line segments (xyz pairs), each edge
 * once per group (`outlineEdges.ts`), with its group and the number of the group's faces sharing it per vertex.
 */
export interface SurfaceDrawing extends TriangleDrawing {
  edges: Float32Array;
  edgeGroups: Float32Array;
  edgeShares: Float32Array;
  /** Box around the triangles, [xmin, xmax, ymin, ymax, zmin, zmax] (m), so the view need not scan them. */
  box: [number, number, number, number, number, number];
}

/** Per-vertex values of a field in a drawing's vertex order, and their range (NaN range when empty). */
export interface DrawingValues {
  values: Float32Array;
  range: [number, number];
}


/** Polygonal faces over the pieces of a dataset (the subset of `BoundaryFaces` drawing needs). */
export interface FaceList {
  readonly count: number;
  /** `count + 1` offsets into `nodes`. */
  readonly offsets: Int32Array;
  /** Piece-local point ids. */
  readonly nodes: Int32Array;
  /** Piece of each face. */
  readonly piece: Int32Array;
  /** Global cell (numbering of `cellStarts`) each face belongs to; its cell data colours the face. */
  readonly cell: Int32Array;
  /** Outward area vectors, 3 per face. */
  readonly areaVector: Float64Array;
}

/** Faces made of the dataset's 2D cells (triangles, quads, pixels, polygons), for files with no volume cells. */
export function surfaceCellFaces(d: Dataset): FaceList {
  const starts = cellStarts(d);
  const offs: number[] = [0], nodes: number[] = [], piece: number[] = [], cell: number[] = [], area: number[] = [];
  d.pieces.forEach((p, k) => {
    for (let c = 0; c < p.cellTypes.length; c++) {
      const t = p.cellTypes[c]!;
      if (cellDimension(t) !== 2 || t === 6) continue;
      const a = p.offsets[c]!, b = p.offsets[c + 1]!;
      // pixels list their nodes x-fastest; swap the last two for a polygon outline
      const ids = Array.from(p.connectivity.subarray(a, b));
      if (t === 8) [ids[2], ids[3]] = [ids[3]!, ids[2]!];
      nodes.push(...ids);
      offs.push(nodes.length);
      piece.push(k);
      cell.push(starts[k]! + c);
      let ax = 0, ay = 0, az = 0;
      const P = p.points, x0 = P[3 * ids[0]!]!, y0 = P[3 * ids[0]! + 1]!, z0 = P[3 * ids[0]! + 2]!;
      for (let j = 1; j + 1 < ids.length; j++) {
        const i1 = 3 * ids[j]!, i2 = 3 * ids[j + 1]!;
        const ux = P[i1]! - x0, uy = P[i1 + 1]! - y0, uz = P[i1 + 2]! - z0;
        const vx = P[i2]! - x0, vy = P[i2 + 1]! - y0, vz = P[i2 + 2]! - z0;
        ax += (uy * vz - uz * vy) / 2; ay += (uz * vx - ux * vz) / 2; az += (ux * vy - uy * vx) / 2;
      }
      area.push(ax, ay, az);
    }
  });
  return {
    count: piece.length, offsets: Int32Array.from(offs), nodes: Int32Array.from(nodes), piece: Int32Array.from(piece),
    cell: Int32Array.from(cell), areaVector: Float64Array.from(area),
  };
}

/** Number of fan triangles of a face list. */
function triangleTotal(f: FaceList): number {
  let n = 0;
  for (let i = 0; i < f.count; i++) n += Math.max(0, f.offsets[i + 1]! - f.offsets[i]! - 2);
  return n;
}

/** Triangles, normals, group ids and outlines of the faces. `groupOfFace[f]` is face f's group (0 if absent). */
export function drawFaces(d: Dataset, f: FaceList, groupOfFace: Int32Array | null): SurfaceDrawing {
  const nt = triangleTotal(f);
  const positions = new Float32Array(9 * nt), normals = new Float32Array(9 * nt), groups = new Float32Array(3 * nt);
  let v = 0;
  for (let i = 0; i < f.count; i++) {
    const P = d.pieces[f.piece[i]!]!.points, a = f.offsets[i]!, m = f.offsets[i + 1]! - a;
    const ax = f.areaVector[3 * i]!, ay = f.areaVector[3 * i + 1]!, az = f.areaVector[3 * i + 2]!;
    const len = Math.hypot(ax, ay, az) || 1, nx = ax / len, ny = ay / len, nz = az / len;
    const g = groupOfFace ? groupOfFace[i]! : 0;
    const p0 = 3 * f.nodes[a]!;
    for (let j = 1; j + 1 < m; j++) {
      const p1 = 3 * f.nodes[a + j]!, p2 = 3 * f.nodes[a + j + 1]!;
      positions[3 * v] = P[p0]!; positions[3 * v + 1] = P[p0 + 1]!; positions[3 * v + 2] = P[p0 + 2]!;
      positions[3 * v + 3] = P[p1]!; positions[3 * v + 4] = P[p1 + 1]!; positions[3 * v + 5] = P[p1 + 2]!;
      positions[3 * v + 6] = P[p2]!; positions[3 * v + 7] = P[p2 + 1]!; positions[3 * v + 8] = P[p2 + 2]!;
      for (let k = 0; k < 3; k++) { normals[3 * (v + k)] = nx; normals[3 * (v + k) + 1] = ny; normals[3 * (v + k) + 2] = nz; groups[v + k] = g; }
      v += 3;
    }
  }
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity, z0 = Infinity, z1 = -Infinity;
  for (let i = 0; i < positions.length; i += 3) {
    const x = positions[i]!, y = positions[i + 1]!, z = positions[i + 2]!;
    if (x < x0) x0 = x; if (x > x1) x1 = x; if (y < y0) y0 = y; if (y > y1) y1 = y; if (z < z0) z0 = z; if (z > z1) z1 = z;
  }
  return { positions, normals, groups, ...outlineEdges(d, f, groupOfFace), box: [x0, x1, y0, y1, z0, z1] };
}

/** Value of tuple `i` of a field: one component, or the magnitude for component −1. */
function tupleValue(fa: FieldArray, i: number, component: number): number {
  const nc = fa.components, vals = fa.values;
  if (nc === 1) return vals[i]!;
  if (component >= 0) return vals[i * nc + component]!;
  let s = 0;
  for (let c = 0; c < nc; c++) { const x = vals[i * nc + c]!; s += x * x; }
  return Math.sqrt(s);
}

/**
 * Per-vertex values of a field on the faces' fan triangles (same vertex order as `drawFaces`).
 * Point data is taken at each node; cell data from the face's cell. Throws if a piece lacks the field.
 */
export function faceValues(d: Dataset, f: FaceList, field: FieldChoice): DrawingValues {
  const nt = triangleTotal(f);
  const values = new Float32Array(3 * nt);
  const starts = cellStarts(d);
  const arrays = d.pieces.map((p, k) => {
    const fa = (field.association === 'point' ? p.pointData : p.cellData).find((x) => x.name === field.name);
    if (!fa) throw new Error(`colour by ${field.association} field "${field.name}": piece ${k} does not have it`);
    if (field.component >= fa.components) throw new Error(`colour by "${field.name}": component ${field.component} asked, the field has ${fa.components}`);
    return fa;
  });
  let lo = Infinity, hi = -Infinity, v = 0;
  for (let i = 0; i < f.count; i++) {
    const k = f.piece[i]!, fa = arrays[k]!, a = f.offsets[i]!, m = f.offsets[i + 1]! - a;
    if (field.association === 'cell') {
      const x = tupleValue(fa, f.cell[i]! - starts[k]!, field.component);
      for (let j = 0; j < 3 * (m - 2); j++) values[v++] = x;
      if (m > 2) { if (x < lo) lo = x; if (x > hi) hi = x; }
      continue;
    }
    const x0 = tupleValue(fa, f.nodes[a]!, field.component);
    for (let j = 1; j + 1 < m; j++) {
      const x1 = tupleValue(fa, f.nodes[a + j]!, field.component), x2 = tupleValue(fa, f.nodes[a + j + 1]!, field.component);
      values[v++] = x0; values[v++] = x1; values[v++] = x2;
      lo = Math.min(lo, x0, x1, x2); hi = Math.max(hi, x0, x1, x2);
    }
  }
  return { values, range: v === 0 ? [NaN, NaN] : [lo, hi] };
}

/**
 * Drawing arrays of a triangle set (a cut): non-indexed triangles with the set's winding normal, group 0,
 * and per-vertex values of `field` (undefined: zeros, drawn grey by the caller).
 */
export function drawTriangleSet(set: TriangleSet, normal: readonly number[], field: FieldChoice | undefined): TriangleDrawing & DrawingValues {
  const nt = set.indices.length / 3, P = set.positions, I = set.indices;
  const positions = new Float32Array(9 * nt), normals = new Float32Array(9 * nt), groups = new Float32Array(3 * nt), values = new Float32Array(3 * nt);
  const f = field ? set.fields.find((x) => x.name === field.name && x.association === field.association) : undefined;
  let lo = Infinity, hi = -Infinity;
  for (let t = 0; t < nt; t++) {
    for (let j = 0; j < 3; j++) {
      const v = I[3 * t + j]!, o = 9 * t + 3 * j;
      positions[o] = P[3 * v]!; positions[o + 1] = P[3 * v + 1]!; positions[o + 2] = P[3 * v + 2]!;
      normals[o] = normal[0]!; normals[o + 1] = normal[1]!; normals[o + 2] = normal[2]!;
      if (f) {
        const x = tupleValueOf(f.values, f.components, f.association === 'point' ? v : t, field!.component);
        values[3 * t + j] = x;
        if (x < lo) lo = x; if (x > hi) hi = x;
      }
    }
  }
  return { positions, normals, groups, values, range: f && nt > 0 ? [lo, hi] : [NaN, NaN] };
}

function tupleValueOf(vals: ArrayLike<number>, nc: number, i: number, component: number): number {
  if (nc === 1) return vals[i]!;
  if (component >= 0) return vals[i * nc + component]!;
  let s = 0;
  for (let c = 0; c < nc; c++) { const x = vals[i * nc + c]!; s += x * x; }
  return Math.sqrt(s);
}
