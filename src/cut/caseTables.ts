/**
 * Case tables of the cut for the linear cells with faces of at most four nodes — tetrahedron, voxel,
 * hexahedron, wedge, pyramid: for every pattern of nodes below (bit i set: node i has d < 0) and above
 * (d > 0) the plane, the polygons of the cut as loops of crossed edges, in the order the general polygon
 * builder of `cutPlane.ts` finds them.
 *
 * The tables are not typed in: they are made when the module loads by running the general builder's rules
 * on the cell's face list (`FACE_TABLE` of src/model/cellTypes.ts) with symbolic crossings — per face, in
 * face order, a crossing on each edge whose ends lie on opposite sides; a segment from each crossing where
 * the face's walk goes from above to below to the face's next crossing; segments chained into loops from
 * the first unused one, taking at each step the first unused segment that touches the current crossing.
 * So a cell cut through its table gives the polygons of the general path, vertex for vertex in the same
 * order; only the geometry (crossing points, orientation, triangulation) is left to do at run time.
 * Patterns with a node on the plane (d = 0) are not in the tables: those cells keep the general path.
 *
 * Layout: case (slot s of the type, pattern b) starts at `CASE_START[256·s + b]` in `CASE_DATA`: the number
 * of loops, then per loop its vertex count m followed by m pairs (local node below, local node above).
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

function build(): { start: Int32Array; data: Uint8Array } {
  const start = new Int32Array(256 * TABLE_TYPES.length).fill(-1), data: number[] = [];
  TABLE_TYPES.forEach((t, s) => {
    const n = SLOT_NODES[s]!;
    for (let b = 0; b < 1 << n; b++) {
      start[256 * s + b] = data.length;
      const loops = casePolygons(t, b);
      data.push(loops.length);
      for (const loop of loops) { data.push(loop.length); for (const [lo, hi] of loop) data.push(lo, hi); }
    }
  });
  return { start, data: Uint8Array.from(data) };
}

const built = build();

/** Start of each case in `CASE_DATA` (see the file comment), −1 for patterns beyond the type's node count. */
export const CASE_START: Int32Array = built.start;
/** The cases' loops (see the file comment). */
export const CASE_DATA: Uint8Array = built.data;
