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
 * Patterns with a node on the plane (d = 0) have tables of their own (`onPlaneCases.ts`), made by the same
 * symbolic run (`patternCut`).
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
  const c = patternCut(type, below, 0);
  if (c.open) throw new Error(`caseTables: open chain for cell type ${type}, pattern ${below}`);
  return c.loops;
}

/**
 * What the general builder of `cutPlane.ts` does with a cell of `type` whose local nodes in `below` lie below
 * the plane and those in `zero` on it (the rest above), run on symbols: its loops, each a list of
 * [below node, above node] pairs — [l, l] for a vertex at on-plane node l, where the general path merges the
 * crossings of every edge that ends there — the faces it records as lying in the plane (indices into the
 * type's face list; claimed by a cell with nodes below, candidates of a cell with none: `planeFaces.ts`), and
 * whether a chain stayed open (those cells keep the general path, which counts it).
 */
export function patternCut(type: number, below: number, zero: number): { loops: [number, number][][]; planeFaces: number[]; open: boolean } {
  // Plain loops over small typed arrays: each case is made once, in code the engine has not optimised, so
  // closures and array searches here cost a cut meeting new patterns several milliseconds.
  const fs = FACE_TABLE.start[type]!, fe = FACE_TABLE.start[type + 1]!, fsize = FACE_TABLE.size, ffirst = FACE_TABLE.first, fnodes = FACE_TABLE.nodes;
  const nodes = SLOT_NODES[TABLE_SLOT[type]!]!, full = (1 << nodes) - 1;
  let zeros = 0;
  for (let l = 0; l < nodes; l++) zeros += (zero >> l) & 1;
  const planeFaces: number[] = [];
  // A cell with no node below cuts nothing; with three nodes on the plane and one above, its in-plane faces are candidates.
  if (below === 0) {
    if (zeros >= 3 && zero !== full) for (let f = fs; f < fe; f++) if ((faceMask(f) & zero) === faceMask(f)) planeFaces.push(f - fs);
    return { loops: [], planeFaces, open: false };
  }
  if (below === full) return { loops: [], planeFaces, open: false };
  let nEdges = 0, nSegs = 0;
  for (let f = fs; f < fe; f++) {
    const m = fsize[f]!, s0 = ffirst[f]!, fm = faceMask(f), fb = below & fm;
    if (m > 4) throw new Error(`caseTables: cell type ${type} has a face of ${m} nodes; tables cover faces of at most four`);
    if (fb === 0 || fb === fm) {
      if (zeros >= 3 && (zero & fm) === fm) planeFaces.push(f - fs);
      continue;
    }
    let nx = 0;
    for (let j = 0; j < m; j++) {
      const a = fnodes[s0 + j]!, b = fnodes[s0 + (j + 1 === m ? 0 : j + 1)]!, ba = (below >> a) & 1, bb = (below >> b) & 1;
      if (ba === bb) continue;
      // The crossing from the node below to the node above; at an on-plane node above, that node itself.
      const lo = ba ? a : b, hi = ba ? b : a, key = (zero >> hi) & 1 ? hi : lo;
      let e = 0;
      while (e < nEdges && !(edgeLo[e] === key && edgeHi[e] === hi)) e++;
      if (e === nEdges) { edgeLo[e] = key; edgeHi[e] = hi; nEdges++; }
      faceX[nx] = e; faceEntry[nx] = ba ? 0 : 1; nx++;
    }
    for (let i = 0; i < nx; i++) {
      const u = faceX[i]!, v = faceX[i + 1 === nx ? 0 : i + 1]!;
      if (faceEntry[i] && u !== v) { segU[nSegs] = u; segV[nSegs] = v; nSegs++; }
    }
  }
  segUsed.fill(0, 0, nSegs);
  const loops: [number, number][][] = [];
  let open = false;
  for (let s0 = 0; s0 < nSegs; s0++) {
    if (segUsed[s0]) continue;
    segUsed[s0] = 1;
    const start = segU[s0]!, loop: [number, number][] = [[edgeLo[start]!, edgeHi[start]!]];
    let cur = segV[s0]!, closed = true;
    while (cur !== start) {
      let s = 0;
      while (s < nSegs && (segUsed[s] || (segU[s] !== cur && segV[s] !== cur))) s++;
      if (s === nSegs) { closed = false; break; }
      segUsed[s] = 1;
      loop.push([edgeLo[cur]!, edgeHi[cur]!]);
      cur = segU[s] === cur ? segV[s]! : segU[s]!;
    }
    if (closed) loops.push(loop); else open = true;
  }
  return { loops, planeFaces, open };
}

/** Scratch of `patternCut`: crossings (below node, or the on-plane node, and the node above), one face's crossings, segments. */
const edgeLo = new Int8Array(32), edgeHi = new Int8Array(32), faceX = new Int8Array(8), faceEntry = new Uint8Array(8);
const segU = new Int8Array(32), segV = new Int8Array(32), segUsed = new Uint8Array(32);

/** Bit mask of the local nodes of face f of FACE_TABLE. */
function faceMask(f: number): number {
  let m = 0;
  for (let j = 0; j < FACE_TABLE.size[f]!; j++) m |= 1 << FACE_TABLE.nodes[FACE_TABLE.first[f]! + j]!;
  return m;
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
