/**
 * Case tables of the cut for the linear cells with faces of at most four nodes — tetrahedron, voxel,
 * hexahedron, wedge, pyramid: for every pattern of nodes below (bit i set: node i has d < 0) and above
 * (d > 0) the plane, the polygons of the cut as loops of crossed edges, in the order the general polygon
 * builder of `cutPlane.ts` finds them.
 *
 * The tables are not typed in: each case is made the first time a cut meets it (`caseStart`; building all
 * 624 cases when the module loaded cost a one-shot `cut` 13–30 ms of cold code) by running the general builder's rules
 * on the cell's face list (`FACE_TABLE` of src/model/cellTypes.ts) with symbolic crossings — per face, in
 * face order, a crossing on each edge whose ends lie on opposite sides; a segment from each crossing where
 * the face's walk goes from above to below to the face's next crossing; segments chained into loops from
 * the first unused one, taking at each step the first unused segment that touches the current crossing.
 * So a cell cut through its table gives the polygons of the general path, vertex for vertex in the same
 * order; only the geometry (crossing points, orientation, triangulation) is left to do at run time.
 * Patterns with a node on the plane (d = 0) are not in the tables: those cells keep the general path.
 *
 * Layout: case (slot s of the type, pattern b) starts at `caseStart(s, b)` = 32·(256·s + b) in `CASE_DATA`: the
 * number of loops, then per loop its vertex count m followed by m pairs (local node below, local node above);
 * 255 in a case's first byte marks it not yet made.
 */
import { CellType, FACE_TABLE } from '../model/cellTypes.ts';

/** Cell types with case tables, in slot order. */
export const TABLE_TYPES: readonly number[] = [CellType.TETRA, CellType.VOXEL, CellType.HEXAHEDRON, CellType.WEDGE, CellType.PYRAMID];

/** Slot of a cell type in the tables (index by the VTK type byte), or −1 for a type without a table. */
export const TABLE_SLOT = Int8Array.from({ length: 256 }, (_, t) => TABLE_TYPES.indexOf(t));

/** Node count of each slot's type. */
export const SLOT_NODES = Int8Array.from(TABLE_TYPES, (t) => {
  let n = 0;
  for (let f = FACE_TABLE.start[t]!; f < FACE_TABLE.start[t + 1]!; f++) {
    for (let j = 0; j < FACE_TABLE.size[f]!; j++) n = Math.max(n, FACE_TABLE.nodes[FACE_TABLE.first[f]! + j]! + 1);
  }
  return n;
});

/** Loops of one sign pattern: each loop a list of [below, above] local node pairs, in the general builder's order. */
export function casePolygons(type: number, below: number): [number, number][][] {
  const fs = FACE_TABLE.start[type]!, fe = FACE_TABLE.start[type + 1]!;
  const isBelow = (l: number) => ((below >> l) & 1) === 1;
  const edges: [number, number][] = [];
  const crossing = (b: number, a: number): number => {
    const i = edges.findIndex(([x, y]) => x === b && y === a);
    if (i >= 0) return i;
    edges.push([b, a]);
    return edges.length - 1;
  };
  const segs: [number, number][] = [];
  for (let f = fs; f < fe; f++) {
    const m = FACE_TABLE.size[f]!, s0 = FACE_TABLE.first[f]!;
    if (m > 4) throw new Error(`caseTables: cell type ${type} has a face of ${m} nodes; tables cover faces of at most four`);
    const xs: number[] = [], entry: boolean[] = [];
    for (let j = 0; j < m; j++) {
      const a = FACE_TABLE.nodes[s0 + j]!, b = FACE_TABLE.nodes[s0 + (j + 1) % m]!;
      if (isBelow(a) && !isBelow(b)) { xs.push(crossing(a, b)); entry.push(false); }
      else if (!isBelow(a) && isBelow(b)) { xs.push(crossing(b, a)); entry.push(true); }
    }
    for (let i = 0; i < xs.length; i++) if (entry[i]) segs.push([xs[i]!, xs[(i + 1) % xs.length]!]);
  }
  const used = segs.map(() => false), loops: [number, number][][] = [];
  for (let s0 = 0; s0 < segs.length; s0++) {
    if (used[s0]) continue;
    used[s0] = true;
    const start = segs[s0]![0], loop = [start];
    let cur = segs[s0]![1];
    while (cur !== start) {
      const s = segs.findIndex((g, i) => !used[i] && (g[0] === cur || g[1] === cur));
      if (s < 0) throw new Error(`caseTables: open chain for cell type ${type}, pattern ${below}`);
      used[s] = true;
      loop.push(cur);
      cur = segs[s]![0] === cur ? segs[s]![1] : segs[s]![0];
    }
    loops.push(loop.map((e) => edges[e]!));
  }
  return loops;
}

/** Bytes kept per case: its loop count, then per loop m and m pairs — at most 1 + 4 + 2·12 = 29 (twelve crossed edges, four loops). */
const CASE_BYTES = 32;
/** First byte of a case not yet made (no cell has 255 loops). */
const UNMADE = 255;

/** The cases' loops (see the file comment); read a case only at `caseStart`. */
export const CASE_DATA: Uint8Array = new Uint8Array(256 * TABLE_TYPES.length * CASE_BYTES);
for (let i = 0; i < CASE_DATA.length; i += CASE_BYTES) CASE_DATA[i] = UNMADE;

/** Start in `CASE_DATA` of the case of slot `s` and pattern `below` (bit i: local node i below the plane), made on first use. */
export function caseStart(s: number, below: number): number {
  const p = (256 * s + below) * CASE_BYTES;
  if (CASE_DATA[p] === UNMADE) makeCase(s, below, p);
  return p;
}

function makeCase(s: number, below: number, p: number): void {
  const n = SLOT_NODES[s];
  if (n === undefined || !(below >= 0 && below < 1 << n)) throw new RangeError(`caseTables: no case ${below} for slot ${s}`);
  const loops = casePolygons(TABLE_TYPES[s]!, below);
  const size = loops.reduce((k, loop) => k + 1 + 2 * loop.length, 1);
  if (size > CASE_BYTES) throw new Error(`caseTables: case ${below} of cell type ${TABLE_TYPES[s]} needs ${size} bytes, more than ${CASE_BYTES}`);
  let q = p + 1;
  for (const loop of loops) {
    CASE_DATA[q++] = loop.length;
    for (const [lo, hi] of loop) { CASE_DATA[q++] = lo; CASE_DATA[q++] = hi; }
  }
  CASE_DATA[p] = loops.length;
}
