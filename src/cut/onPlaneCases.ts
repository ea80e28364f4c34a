/**
 * Case tables of the cut for cells with nodes on the plane (|d| ≤ tolerance): tetrahedron, voxel,
 * hexahedron, wedge, pyramid. A plane through lattice nodes (an axis plane at a node layer, an oblique
 * plane through a row of nodes) gives many such cells; without these tables each one took the general
 * polygon builder of `cutPlane.ts`.
 *
 * A case is a pair of node masks, `below` (d < 0) and `zero` (on the plane); the rest are above. Its loops
 * are the general builder's, made by the same symbolic run as the tables of `caseTables.ts`
 * (`patternCut`): a vertex is a crossed edge (below node, above node) or an on-plane node (written [l, l]),
 * which the general builder shares between every edge that ends at it. The case also lists the cell's faces
 * that lie in the plane, which the cut records (`planeFaces.ts`: claimed by a cell with nodes below,
 * candidates of a cell with none) so a face in the plane is cut once. A case whose chains do not close
 * (none for these linear types; kept for safety) is marked for the general path, which counts open chains.
 *
 * Layout, per slot of `TABLE_TYPES`, made on first use: case (below, zero) at `onPlaneStart(s, below, zero)` =
 * `ON_CASE_BYTES`·(below + 2^n·zero) in `onPlaneData(s)`, n the type's node count. First byte 0: not made
 * yet; 1: general path; 2 + L: L loops follow, each its vertex count m and m pairs (below node, above node),
 * then the count of in-plane faces and each face's index in the type's face list. A slot's array is
 * ON_CASE_BYTES·4^n bytes (4 MiB for hexahedra and voxels), allocated when the slot's first on-plane cell
 * comes; pages of cases never met are never touched.
 */
import { patternCut, SLOT_NODES, TABLE_TYPES } from './caseTables.ts';

/** Bytes per case: 2 + loops·(1 + 2m) + 1 + faces, at most 2 + 2·(1 + 2·12) + 1 + 6 = 59. */
const ON_CASE_BYTES = 64;
/** First byte of a case the general path keeps. */
export const ON_PLANE_GENERAL = 1;

const data: (Uint8Array | null)[] = TABLE_TYPES.map(() => null);

/** The case array of slot `s` (see the file comment), allocated on first use. */
export function onPlaneData(s: number): Uint8Array {
  let a = data[s];
  if (!a) { a = new Uint8Array(ON_CASE_BYTES << (2 * SLOT_NODES[s]!)); data[s] = a; }
  return a;
}

/**
 * Start in `onPlaneData(s)` of the case of slot `s` with local nodes `below` below the plane and `zero` on it
 * (disjoint bit masks, `zero` not 0), made on first use.
 */
export function onPlaneStart(s: number, below: number, zero: number): number {
  const n = SLOT_NODES[s]!, a = onPlaneData(s), p = (below + (zero << n)) * ON_CASE_BYTES;
  if (a[p] === 0) makeCase(s, n, below, zero, a, p);
  return p;
}

function makeCase(s: number, n: number, below: number, zero: number, a: Uint8Array, p: number): void {
  if (!(below >= 0 && zero > 0 && (below | zero) < 1 << n && (below & zero) === 0)) {
    throw new RangeError(`onPlaneCases: no case (below ${below}, on ${zero}) for slot ${s}`);
  }
  const type = TABLE_TYPES[s]!, c = patternCut(type, below, zero);
  if (c.open) { a[p] = ON_PLANE_GENERAL; return; }
  const size = c.loops.reduce((k, loop) => k + 1 + 2 * loop.length, 2) + 1 + c.planeFaces.length;
  if (size > ON_CASE_BYTES) throw new Error(`onPlaneCases: case (below ${below}, on ${zero}) of cell type ${type} needs ${size} bytes, more than ${ON_CASE_BYTES}`);
  let q = p + 1;
  for (const loop of c.loops) {
    a[q++] = loop.length;
    for (const [lo, hi] of loop) { a[q++] = lo; a[q++] = hi; }
  }
  a[q++] = c.planeFaces.length;
  for (const f of c.planeFaces) a[q++] = f;
  a[p] = 2 + c.loops.length;
}
