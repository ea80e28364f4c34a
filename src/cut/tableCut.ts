/**
 * The cut of one linear cell through its case table (`caseTables.ts`, and `onPlaneCases.ts` for cells with
 * nodes on the plane): signed distances of its nodes, the below/on-plane patterns as bit masks, the pattern's
 * loops of crossed edges and on-plane nodes, their points, then the shared polygon writer (`cutOutput.ts`);
 * faces of the cell lying in the plane are recorded as the general path records them (`planeFaces.ts`). No
 * per-cell allocation; module-level scratch only.
 *
 * The result is the general path's (`cutPlane.ts`) bit for bit: the same snapped distance expression, the
 * same crossing formula with the below node first, an on-plane node as the vertex of every edge ending there,
 * the same loops in the same vertex order, the same orientation and triangulation, the same in-plane face
 * records in the same order. Cells the tables do not cover answer −1 and go to the general path: types
 * without a table, and a node repeated in the cell (collapsed cells, whose crossings the general path merges
 * by point id).
 */
import { FACE_TABLE } from '../model/cellTypes.ts';
import { CASE_DATA, caseStart, SLOT_NODES, TABLE_SLOT, TABLE_TYPES } from './caseTables.ts';
import { writePolygon } from './cutOutput.ts';
import { ON_PLANE_GENERAL, onPlaneData, onPlaneStart } from './onPlaneCases.ts';
import { recordPlaneFace } from './planeFaces.ts';

let OX = 0, OY = 0, OZ = 0, NX = 0, NY = 0, NZ = 1, TOL = 0;
let P: Float64Array = new Float64Array(0);

const nodeId = new Int32Array(8), nodeD = new Float64Array(8);
const xA = new Int32Array(16), xB = new Int32Array(16), xT = new Float64Array(16);
const xX = new Float64Array(16), xY = new Float64Array(16), xZ = new Float64Array(16);
const ring = new Int32Array(16), faceIds = new Int32Array(4);

/** Sets the plane (origin o, unit normal n; `tol` the absolute node-on-plane tolerance, file's length unit) for the following cells. */
export function setTablePlane(ox: number, oy: number, oz: number, nx: number, ny: number, nz: number, tol: number): void {
  OX = ox; OY = oy; OZ = oz; NX = nx; NY = ny; NZ = nz; TOL = tol;
}

/** Sets the points (xyz interleaved) of the piece whose cells follow; pass an empty array to let go of them. */
export function setTablePoints(points: Float64Array): void { P = points; }

/**
 * Cuts cell `c` (types, offsets, connectivity of piece `k`) as global cell `g`, writing point ids plus
 * `pointBase`. Returns 1 when it wrote triangles, 0 when the plane gives it none, −1 when the cell is not
 * covered by the tables (the caller then cuts it by the general path).
 */
export function cutByTable(types: Uint8Array, off: Int32Array, conn: Int32Array, c: number, k: number, g: number, pointBase: number): number {
  const s = TABLE_SLOT[types[c]!]!;
  if (s < 0) return -1;
  const n = SLOT_NODES[s]!, q0 = off[c]!;
  if (off[c + 1]! - q0 !== n) return -1;
  // The plane and points in locals: a module-level `let` is read through its context, with a check, at every use.
  const pts = P, ox = OX, oy = OY, oz = OZ, nx = NX, ny = NY, nz = NZ, tol = TOL;
  let below = 0, zero = 0;
  for (let i = 0; i < n; i++) {
    const id = conn[q0 + i]!, j = 3 * id;
    const d = nx * (pts[j]! - ox) + ny * (pts[j + 1]! - oy) + nz * (pts[j + 2]! - oz);
    const on = d <= tol && d >= -tol;
    nodeId[i] = id; nodeD[i] = d;
    below |= (d < 0 && !on ? 1 : 0) << i;
    zero |= (on ? 1 : 0) << i;
  }
  if (zero !== 0) return cutOnPlane(s, n, below, zero, k, g, pointBase);
  if (below === 0 || below === (1 << n) - 1) return 0;
  if (repeatsNode(n)) return -1;
  let p = caseStart(s, below);
  const loops = CASE_DATA[p++]!;
  let any = 0;
  for (let l = 0; l < loops; l++) {
    const m = CASE_DATA[p++]!;
    for (let i = 0; i < m; i++, p += 2) crossingAt(pts, i, CASE_DATA[p]!, CASE_DATA[p + 1]!);
    if (writePolygon(xX, xY, xZ, xA, xB, xT, ring, m, nx, ny, nz, g, pointBase)) any = 1;
  }
  return any;
}

/** `cutByTable` for a cell with nodes on the plane (mask `zero`), through `onPlaneCases.ts`. */
function cutOnPlane(s: number, n: number, below: number, zero: number, k: number, g: number, pointBase: number): number {
  if (repeatsNode(n)) return -1;
  const a = onPlaneData(s);
  let p = onPlaneStart(s, below, zero);
  const head = a[p++]!;
  if (head === ON_PLANE_GENERAL) return -1;
  let any = 0;
  for (let l = 2; l < head; l++) {
    const m = a[p++]!;
    for (let i = 0; i < m; i++, p += 2) {
      const lb = a[p]!, la = a[p + 1]!;
      if (lb === la) nodeAt(i, la); else crossingAt(P, i, lb, la);
    }
    if (writePolygon(xX, xY, xZ, xA, xB, xT, ring, m, NX, NY, NZ, g, pointBase)) any = 1;
  }
  const nf = a[p++]!;
  if (nf > 0) planeFaces(TABLE_TYPES[s]!, a, p, nf, k, g, below !== 0);
  return any;
}

/** Records the cell's in-plane faces `a[p … p + nf − 1]` (indices in its type's face list): claims of a cell with nodes below, else candidates. */
function planeFaces(type: number, a: Uint8Array, p: number, nf: number, k: number, g: number, claim: boolean): void {
  for (let i = 0; i < nf; i++) {
    const f = FACE_TABLE.start[type]! + a[p + i]!, m = FACE_TABLE.size[f]!, s0 = FACE_TABLE.first[f]!;
    for (let j = 0; j < m; j++) faceIds[j] = nodeId[FACE_TABLE.nodes[s0 + j]!]!;
    recordPlaneFace(k, P, g, faceIds, 0, m, claim);
  }
}

/** Vertex i of the current loop at on-plane local node `l`: the node itself, as the general path makes it. */
function nodeAt(i: number, l: number): void {
  const id = nodeId[l]!, j = 3 * id;
  xX[i] = P[j]!; xY[i] = P[j + 1]!; xZ[i] = P[j + 2]!;
  xA[i] = id; xB[i] = id; xT[i] = 0;
  ring[i] = i;
}

/** Whether a point id appears twice among the cell's n nodes. */
function repeatsNode(n: number): boolean {
  for (let i = 1; i < n; i++) {
    const id = nodeId[i]!;
    for (let j = 0; j < i; j++) if (nodeId[j] === id) return true;
  }
  return false;
}

/** Crossing i of the current loop on the edge from local node `lb` (below) to `la` (above) of points `P`; provenance from the lower point id. */
function crossingAt(P: Float64Array, i: number, lb: number, la: number): void {
  const a = nodeId[lb]!, b = nodeId[la]!, da = nodeD[lb]!, db = nodeD[la]!;
  const ja = 3 * a, jb = 3 * b, den = db - da;
  xX[i] = (db * P[ja]! - da * P[jb]!) / den;
  xY[i] = (db * P[ja + 1]! - da * P[jb + 1]!) / den;
  xZ[i] = (db * P[ja + 2]! - da * P[jb + 2]!) / den;
  if (a < b) { xA[i] = a; xB[i] = b; xT[i] = -da / den; } else { xA[i] = b; xB[i] = a; xT[i] = db / den; }
  ring[i] = i;
}
