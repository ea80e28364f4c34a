/**
 * Test meshes and independent references for the cut tests (not a test file).
 *
 * Meshes fill a box — the unit cube mapped by an affine map (skewed, rotated, scaled) — with one cell type,
 * interior nodes optionally jittered (warped cells), so the exact cut of the mesh is the exact section of
 * the box. The reference section is computed by a different algorithm than the cutter: intersect the
 * plane with the box's 12 edges, order the points by angle around their mean, and use the shoelace formula;
 * integrals over it use Gauss–Legendre on collapsed squares (Duffy), exact for polynomials of degree ≤ 7.
 */
import { CELL_FACES } from '../../src/model/cellTypes.ts';
import { pieceFromCells, type CellList } from '../../src/model/meshBuild.ts';
import type { Piece } from '../../src/model/piece.ts';
import { gaussLegendre } from '../../src/cut/quadrature.ts';

export type V3 = [number, number, number];

/** A fixed affine map: rotation about (1, 2, 3) by 0.7 rad, shear and unequal scaling, then a shift. */
export const SKEW: { m: number[]; t: V3 } = (() => {
  const [ax, ay, az] = [1, 2, 3].map((v) => v / Math.sqrt(14)) as V3, th = 0.7, c = Math.cos(th), s = Math.sin(th), C = 1 - c;
  const rot = [
    c + ax * ax * C, ax * ay * C - az * s, ax * az * C + ay * s,
    ay * ax * C + az * s, c + ay * ay * C, ay * az * C - ax * s,
    az * ax * C - ay * s, az * ay * C + ax * s, c + az * az * C,
  ];
  const shear = [2, 0.6, 0.3, 0, 1.5, -0.4, 0, 0, 0.8];
  const m = new Array<number>(9).fill(0);
  for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) for (let k = 0; k < 3; k++) m[3 * i + j]! += rot[3 * i + k]! * shear[3 * k + j]!;
  return { m, t: [0.3, -1.2, 2.5] };
})();

export function applyAffine(a: { m: number[]; t: V3 }, p: V3): V3 {
  const { m, t } = a;
  return [m[0]! * p[0] + m[1]! * p[1] + m[2]! * p[2] + t[0], m[3]! * p[0] + m[4]! * p[1] + m[5]! * p[2] + t[1], m[6]! * p[0] + m[7]! * p[1] + m[8]! * p[2] + t[2]];
}

const IDENTITY = { m: [1, 0, 0, 0, 1, 0, 0, 0, 1], t: [0, 0, 0] as V3 };

/** Deterministic pseudo-random numbers in [0, 1). */
export function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => { s = (Math.imul(s, 1664525) + 1013904223) >>> 0; return s / 4294967296; };
}

export type BoxKind = 'hex' | 'tet' | 'wedge' | 'pyramid' | 'polyhedron' | 'voxel';

/**
 * A box mesh of one cell kind on an nx×ny×nz lattice of the unit cube, interior nodes moved by up to
 * `jitter` lattice spacings, all points then mapped by `map`. Pyramids add a node at each hexahedron's
 * vertex mean; polyhedra are the hexahedra written as face streams (every other cell with its faces
 * reversed, as some writers do).
 */
export function boxMesh(kind: BoxKind, nx: number, ny: number, nz: number, jitter = 0, map = IDENTITY, seed = 7): Piece {
  const rand = rng(seed);
  const pts: number[] = [];
  const id = (i: number, j: number, k: number) => i + (nx + 1) * (j + (ny + 1) * k);
  for (let k = 0; k <= nz; k++) for (let j = 0; j <= ny; j++) for (let i = 0; i <= nx; i++) {
    const inner = i > 0 && i < nx && j > 0 && j < ny && k > 0 && k < nz;
    const d = () => (inner ? jitter * (rand() - 0.5) : 0);
    pts.push(...applyAffine(map, [(i + d()) / nx, (j + d()) / ny, (k + d()) / nz]));
  }
  const cells: CellList & { types: number[]; nodes: number[][]; polyFaces: (number[][] | undefined)[] } = { types: [], nodes: [], polyFaces: [] };
  let count = 0;
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    const h = [id(i, j, k), id(i + 1, j, k), id(i + 1, j + 1, k), id(i, j + 1, k), id(i, j, k + 1), id(i + 1, j, k + 1), id(i + 1, j + 1, k + 1), id(i, j + 1, k + 1)];
    const add = (t: number, n: number[], f?: number[][]) => { cells.types.push(t); cells.nodes.push(n); cells.polyFaces.push(f); };
    if (kind === 'hex') add(12, h);
    else if (kind === 'voxel') add(11, [h[0]!, h[1]!, h[3]!, h[2]!, h[4]!, h[5]!, h[7]!, h[6]!]);
    else if (kind === 'tet') for (const t of [[0, 1, 2, 6], [0, 2, 3, 6], [0, 3, 7, 6], [0, 7, 4, 6], [0, 4, 5, 6], [0, 5, 1, 6]]) add(10, t.map((q) => h[q]!));
    else if (kind === 'wedge') { add(13, [h[0]!, h[3]!, h[1]!, h[4]!, h[7]!, h[5]!]); add(13, [h[1]!, h[3]!, h[2]!, h[5]!, h[7]!, h[6]!]); }
    else if (kind === 'pyramid') {
      const c = pts.length / 3;
      const mean: V3 = [0, 0, 0];
      for (const q of h) for (let a = 0; a < 3; a++) mean[a]! += pts[3 * q + a]! / 8;
      pts.push(...mean);
      for (const f of CELL_FACES[12]!) add(14, [...f.map((q) => h[q]!).reverse(), c]);
    } else {
      const faces = CELL_FACES[12]!.map((f) => f.map((q) => h[q]!));
      add(42, h, count % 2 ? faces.map((f) => [...f].reverse()) : faces);
    }
    count++;
  }
  return pieceFromCells(pts, kind === 'polyhedron' ? cells : { types: cells.types, nodes: cells.nodes });
}

/** The 8 corners of the unit cube mapped by `map`, and the cube's 12 edges (corner pairs). */
export function boxCorners(map = IDENTITY): { corners: V3[]; edges: [number, number][] } {
  const corners: V3[] = [];
  for (let c = 0; c < 8; c++) corners.push(applyAffine(map, [c & 1, (c >> 1) & 1, (c >> 2) & 1]));
  const edges: [number, number][] = [];
  for (let a = 0; a < 8; a++) for (const bit of [1, 2, 4]) if (!(a & bit)) edges.push([a, a | bit]);
  return { corners, edges };
}

/** Section polygon of a convex body (corners + edges) by the plane n·(x − o) = 0, ordered counter-clockwise about n. */
export function sectionPolygon(body: { corners: V3[]; edges: [number, number][] }, o: V3, n: V3): V3[] {
  const len = Math.hypot(...n), u: V3 = [n[0] / len, n[1] / len, n[2] / len];
  const d = (p: V3) => u[0] * (p[0] - o[0]) + u[1] * (p[1] - o[1]) + u[2] * (p[2] - o[2]);
  const pts: V3[] = [];
  for (const [a, b] of body.edges) {
    const pa = body.corners[a]!, pb = body.corners[b]!, da = d(pa), db = d(pb);
    if ((da < 0) !== (db < 0) && da !== db) {
      const t = da / (da - db);
      pts.push([pa[0] + t * (pb[0] - pa[0]), pa[1] + t * (pb[1] - pa[1]), pa[2] + t * (pb[2] - pa[2])]);
    }
  }
  const c: V3 = [0, 0, 0];
  for (const p of pts) for (let i = 0; i < 3; i++) c[i]! += p[i]! / pts.length;
  const e1 = orthonormal(u), e2 = cross(u, e1);
  const ang = (p: V3) => Math.atan2(dot(sub(p, c), e2), dot(sub(p, c), e1));
  return pts.sort((p, q) => ang(p) - ang(q));
}

export const dot = (a: V3, b: V3) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
export const sub = (a: V3, b: V3): V3 => [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
export const cross = (a: V3, b: V3): V3 => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
function orthonormal(u: V3): V3 {
  const t: V3 = Math.abs(u[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
  const v = cross(u, t), l = Math.hypot(...v);
  return [v[0] / l, v[1] / l, v[2] / l];
}

const GL = gaussLegendre(4);

/**
 * ∫ f dA over a convex polygon (3D vertices in order): fan from the vertex mean, each triangle mapped from
 * the unit square by the Duffy collapse, 4×4 Gauss–Legendre (exact for polynomial f of degree ≤ 6).
 */
export function polygonIntegral(poly: V3[], f: (x: number, y: number, z: number) => number): number {
  const c: V3 = [0, 0, 0];
  for (const p of poly) for (let i = 0; i < 3; i++) c[i]! += p[i]! / poly.length;
  let total = 0;
  for (let k = 0; k < poly.length; k++) {
    const a = poly[k]!, b = poly[(k + 1) % poly.length]!;
    const area2 = Math.hypot(...cross(sub(a, c), sub(b, c)));
    for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) {
      const s = 0.5 * (GL.x[i]! + 1), t = 0.5 * (GL.x[j]! + 1);
      // Duffy: (s, t) ∈ [0,1]² → barycentric (1 − s, s(1 − t), s t), Jacobian s.
      const l0 = 1 - s, l1 = s * (1 - t), l2 = s * t, w = 0.25 * GL.w[i]! * GL.w[j]! * s * area2;
      total += w * f(l0 * c[0] + l1 * a[0] + l2 * b[0], l0 * c[1] + l1 * a[1] + l2 * b[1], l0 * c[2] + l1 * a[2] + l2 * b[2]);
    }
  }
  return total;
}

/** Area of a set's triangles by their cross products (independent of the integrator). */
export function setArea(positions: Float64Array, indices: Uint32Array): number {
  let A = 0;
  for (let t = 0; t < indices.length; t += 3) {
    const a = 3 * indices[t]!, b = 3 * indices[t + 1]!, c = 3 * indices[t + 2]!;
    const u: V3 = [positions[b]! - positions[a]!, positions[b + 1]! - positions[a + 1]!, positions[b + 2]! - positions[a + 2]!];
    const v: V3 = [positions[c]! - positions[a]!, positions[c + 1]! - positions[a + 1]!, positions[c + 2]! - positions[a + 2]!];
    A += 0.5 * Math.hypot(...cross(u, v));
  }
  return A;
}
