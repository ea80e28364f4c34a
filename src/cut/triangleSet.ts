/**
 * A triangle set: a surface of flat triangles with fields on it. The cut produces one; the surface
 * integrator (`integrals.ts`) consumes any, so boundary-surface groups integrate with the same code.
 *
 * Layout (struct-of-arrays, described here once):
 *  - `positions`: Float64Array, xyz interleaved; vertex `v` is at `positions[3v .. 3v+2]` (file's length unit).
 *  - `indices`: Uint32Array, three vertex numbers per triangle. The winding gives the orientation: the
 *    triangle's normal is along `(b − a) × (c − a)`, and fluxes are positive along it.
 *  - `sourceCell`: Int32Array, the global cell id (numbering of `cellStarts`) each triangle came from, or −1.
 *  - `fields`: per-vertex (`association: 'point'`, linear over each triangle) or per-triangle
 *    (`association: 'cell'`, constant over each triangle) values, tuple-interleaved Float64Array, file's units.
 * Vertices may be shared by triangles of one cell's polygon; triangles of neighbouring cells do not share
 * vertex numbers (their shared vertices have bit-identical positions instead).
 */

export type Vec3 = readonly [number, number, number];

/** One field on a triangle set. */
export interface SurfaceField {
  readonly name: string;
  /** 'point': one tuple per vertex; 'cell': one tuple per triangle. */
  readonly association: 'point' | 'cell';
  readonly components: number;
  readonly values: Float64Array;
}

export interface TriangleSet {
  readonly positions: Float64Array;
  readonly indices: Uint32Array;
  readonly sourceCell: Int32Array;
  readonly fields: readonly SurfaceField[];
}

/** Number of triangles. */
export const triangleCount = (s: TriangleSet): number => s.indices.length / 3;

/** Number of vertices. */
export const vertexCount = (s: TriangleSet): number => s.positions.length / 3;

/** The field of a set by name, preferring `association` when given; undefined when absent. */
export function findSurfaceField(s: TriangleSet, name: string, association?: 'point' | 'cell'): SurfaceField | undefined {
  if (association) return s.fields.find((f) => f.name === name && f.association === association);
  return s.fields.find((f) => f.name === name && f.association === 'point') ?? s.fields.find((f) => f.name === name);
}

/** An empty set carrying the same field list (with no tuples). */
export function emptyTriangleSet(fields: readonly SurfaceField[] = []): TriangleSet {
  return {
    positions: new Float64Array(0), indices: new Uint32Array(0), sourceCell: new Int32Array(0),
    fields: fields.map((f) => ({ name: f.name, association: f.association, components: f.components, values: new Float64Array(0) })),
  };
}

/**
 * The triangles of `s` with `keep[t] !== 0`, with their vertices renumbered compactly and every field
 * carried over. Triangle order is kept.
 */
export function subsetTriangles(s: TriangleSet, keep: Uint8Array): TriangleSet {
  const nt = triangleCount(s), nv = vertexCount(s);
  const map = new Int32Array(nv).fill(-1);
  let kt = 0, kv = 0;
  for (let t = 0; t < nt; t++) {
    if (!keep[t]) continue;
    kt++;
    for (let j = 0; j < 3; j++) { const v = s.indices[3 * t + j]!; if (map[v] < 0) map[v] = kv++; }
  }
  const positions = new Float64Array(3 * kv), indices = new Uint32Array(3 * kt), sourceCell = new Int32Array(kt);
  const vlist = new Int32Array(kv);
  for (let v = 0; v < nv; v++) if (map[v]! >= 0) vlist[map[v]!] = v;
  for (let i = 0; i < kv; i++) { const v = vlist[i]!; positions[3 * i] = s.positions[3 * v]!; positions[3 * i + 1] = s.positions[3 * v + 1]!; positions[3 * i + 2] = s.positions[3 * v + 2]!; }
  const tlist = new Int32Array(kt);
  for (let t = 0, o = 0; t < nt; t++) {
    if (!keep[t]) continue;
    tlist[o] = t;
    indices[3 * o] = map[s.indices[3 * t]!]!; indices[3 * o + 1] = map[s.indices[3 * t + 1]!]!; indices[3 * o + 2] = map[s.indices[3 * t + 2]!]!;
    sourceCell[o] = s.sourceCell[t]!;
    o++;
  }
  const fields = s.fields.map((f) => {
    const nc = f.components, list = f.association === 'point' ? vlist : tlist, out = new Float64Array(list.length * nc);
    for (let i = 0; i < list.length; i++) for (let c = 0; c < nc; c++) out[i * nc + c] = f.values[list[i]! * nc + c]!;
    return { name: f.name, association: f.association, components: nc, values: out };
  });
  return { positions, indices, sourceCell, fields };
}

/** Unit vector of (x, y, z), or throws naming `what` when it is zero or not finite. */
export function unitVector(v: Vec3, what: string): [number, number, number] {
  const [x, y, z] = v;
  const len = Math.hypot(x, y, z);
  if (!Number.isFinite(len) || len === 0) throw new Error(`${what}: expected a non-zero finite vector, got (${x}, ${y}, ${z})`);
  return [x / len, y / len, z / len];
}

/** Two unit vectors spanning the plane with normal `n` (unit), so that e1 × e2 = n. */
export function planeAxes(n: Vec3): [[number, number, number], [number, number, number]] {
  const [nx, ny, nz] = n;
  // Start from the coordinate axis least aligned with n, for a well-conditioned cross product.
  const ax = Math.abs(nx), ay = Math.abs(ny), az = Math.abs(nz);
  let tx = 0, ty = 0, tz = 0;
  if (ax <= ay && ax <= az) tx = 1; else if (ay <= az) ty = 1; else tz = 1;
  let e1x = ty * nz - tz * ny, e1y = tz * nx - tx * nz, e1z = tx * ny - ty * nx;
  const l = Math.hypot(e1x, e1y, e1z);
  e1x /= l; e1y /= l; e1z /= l;
  return [[e1x, e1y, e1z], [ny * e1z - nz * e1y, nz * e1x - nx * e1z, nx * e1y - ny * e1x]];
}
