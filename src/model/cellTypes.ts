/**
 * Cell-type topology as constant tables, indexed by the VTK cell-type number.
 *
 * Faces are listed so that, on a cell with the standard VTK orientation, the right-hand rule gives the
 * outward normal. Edges are derived from the faces once, at module load. Quadratic and higher-order
 * types map to the linear type of their corner nodes (the corner nodes come first in VTK's ordering).
 */

/** VTK cell-type numbers used in the model. */
export const CellType = {
  EMPTY: 0,
  VERTEX: 1,
  POLY_VERTEX: 2,
  LINE: 3,
  POLY_LINE: 4,
  TRIANGLE: 5,
  TRIANGLE_STRIP: 6,
  POLYGON: 7,
  PIXEL: 8,
  QUAD: 9,
  TETRA: 10,
  VOXEL: 11,
  HEXAHEDRON: 12,
  WEDGE: 13,
  PYRAMID: 14,
  PENTAGONAL_PRISM: 15,
  HEXAGONAL_PRISM: 16,
  POLYHEDRON: 42,
} as const;

/** Human-readable names, for load reports and errors. */
export const CELL_TYPE_NAMES: Readonly<Record<number, string>> = {
  0: 'empty', 1: 'vertex', 2: 'poly-vertex', 3: 'line', 4: 'poly-line', 5: 'triangle',
  6: 'triangle strip', 7: 'polygon', 8: 'pixel', 9: 'quad', 10: 'tetra', 11: 'voxel',
  12: 'hexahedron', 13: 'wedge', 14: 'pyramid', 15: 'pentagonal prism', 16: 'hexagonal prism',
  21: 'quadratic edge', 22: 'quadratic triangle', 23: 'quadratic quad', 24: 'quadratic tetra',
  25: 'quadratic hexahedron', 26: 'quadratic wedge', 27: 'quadratic pyramid', 28: 'biquadratic quad',
  29: 'triquadratic hexahedron', 30: 'quadratic polygon', 31: 'biquadratic triangle',
  32: 'biquadratic quadratic wedge', 33: 'quadratic linear quad', 34: 'quadratic linear wedge',
  35: 'cubic line', 36: 'biquadratic quadratic hexahedron', 37: 'triquadratic pyramid',
  42: 'polyhedron', 68: 'Lagrange curve', 69: 'Lagrange triangle', 70: 'Lagrange quadrilateral',
  71: 'Lagrange tetrahedron', 72: 'Lagrange hexahedron', 73: 'Lagrange wedge', 74: 'Lagrange pyramid',
  75: 'Bezier curve', 76: 'Bezier triangle', 77: 'Bezier quadrilateral', 78: 'Bezier tetrahedron',
  79: 'Bezier hexahedron', 80: 'Bezier wedge', 81: 'Bezier pyramid',
};

/**
 * Higher-order type → [linear type, number of corner nodes]. A quadratic polygon (30) keeps the first
 * half of its nodes, which the reader handles as a special case (count depends on the cell).
 */
export const HIGHER_ORDER_TO_LINEAR: Readonly<Record<number, readonly [number, number]>> = {
  21: [3, 2], 35: [3, 2], 68: [3, 2], 75: [3, 2],
  22: [5, 3], 31: [5, 3], 69: [5, 3], 76: [5, 3],
  23: [9, 4], 28: [9, 4], 33: [9, 4], 70: [9, 4], 77: [9, 4],
  24: [10, 4], 71: [10, 4], 78: [10, 4],
  25: [12, 8], 29: [12, 8], 36: [12, 8], 72: [12, 8], 79: [12, 8],
  26: [13, 6], 32: [13, 6], 34: [13, 6], 73: [13, 6], 80: [13, 6],
  27: [14, 5], 37: [14, 5], 74: [14, 5], 81: [14, 5],
};

/** The quadratic polygon keeps its first n/2 nodes as a linear polygon. */
export const QUADRATIC_POLYGON = 30;

/** Topological dimension of each linear type supported by the model (−1: not supported). */
export function cellDimension(type: number): number {
  switch (type) {
    case 1: case 2: return 0;
    case 3: case 4: return 1;
    case 5: case 6: case 7: case 8: case 9: return 2;
    case 10: case 11: case 12: case 13: case 14: case 15: case 16: case 42: return 3;
    default: return -1;
  }
}

/** Number of nodes of a fixed-size linear type, or −1 for variable-size types (poly-vertex, poly-line, strip, polygon, polyhedron). */
export function fixedNodeCount(type: number): number {
  switch (type) {
    case 1: return 1;
    case 3: return 2;
    case 5: return 3;
    case 8: case 9: case 10: return 4;
    case 14: return 5;
    case 13: return 6;
    case 11: case 12: return 8;
    case 15: return 10;
    case 16: return 12;
    default: return -1;
  }
}

/**
 * Faces of the fixed-size 3D types as local node indices, outward by the right-hand rule on a cell
 * with the standard VTK orientation. Keyed by type number.
 */
export const CELL_FACES: Readonly<Record<number, readonly (readonly number[])[]>> = {
  10: [[0, 1, 3], [1, 2, 3], [2, 0, 3], [0, 2, 1]],
  11: [[0, 4, 6, 2], [1, 3, 7, 5], [0, 1, 5, 4], [2, 6, 7, 3], [0, 2, 3, 1], [4, 5, 7, 6]],
  12: [[0, 4, 7, 3], [1, 2, 6, 5], [0, 1, 5, 4], [3, 7, 6, 2], [0, 3, 2, 1], [4, 5, 6, 7]],
  13: [[0, 1, 2], [3, 5, 4], [0, 3, 4, 1], [1, 4, 5, 2], [2, 5, 3, 0]],
  14: [[0, 3, 2, 1], [0, 1, 4], [1, 2, 4], [2, 3, 4], [3, 0, 4]],
  15: [[0, 4, 3, 2, 1], [5, 6, 7, 8, 9], [0, 1, 6, 5], [1, 2, 7, 6], [2, 3, 8, 7], [3, 4, 9, 8], [4, 0, 5, 9]],
  16: [[0, 5, 4, 3, 2, 1], [6, 7, 8, 9, 10, 11], [0, 1, 7, 6], [1, 2, 8, 7], [2, 3, 9, 8], [3, 4, 10, 9],
    [4, 5, 11, 10], [5, 0, 6, 11]],
};

/** Edges of the 2D fixed-size types (pixel in its x-fastest node order). */
const SURFACE_EDGES: Readonly<Record<number, readonly (readonly [number, number])[]>> = {
  5: [[0, 1], [1, 2], [2, 0]],
  8: [[0, 1], [1, 3], [3, 2], [2, 0]],
  9: [[0, 1], [1, 2], [2, 3], [3, 0]],
};

function edgesFromFaces(faces: readonly (readonly number[])[]): [number, number][] {
  const seen = new Set<number>();
  const out: [number, number][] = [];
  for (const f of faces) {
    for (let i = 0; i < f.length; i++) {
      const a = f[i]!, b = f[(i + 1) % f.length]!;
      const key = Math.min(a, b) * 64 + Math.max(a, b);
      if (!seen.has(key)) { seen.add(key); out.push([Math.min(a, b), Math.max(a, b)]); }
    }
  }
  return out;
}

/** Edges (pairs of local node indices) of each fixed-size type with edges. */
export const CELL_EDGES: Readonly<Record<number, readonly (readonly [number, number])[]>> = (() => {
  const table: Record<number, readonly (readonly [number, number])[]> = { 3: [[0, 1]], ...SURFACE_EDGES };
  for (const [type, faces] of Object.entries(CELL_FACES)) table[Number(type)] = edgesFromFaces(faces);
  return table;
})();

/**
 * Flat typed-array form of CELL_FACES for hot loops: for type t, faces are
 * `FACE_TABLE.start[t] .. FACE_TABLE.start[t+1]-1`; face f has `FACE_TABLE.size[f]` nodes at
 * `FACE_TABLE.nodes[FACE_TABLE.first[f] + k]`.
 */
export const FACE_TABLE = (() => {
  const start = new Int32Array(257);
  const size: number[] = [], first: number[] = [], nodes: number[] = [];
  for (let t = 0; t < 256; t++) {
    start[t] = size.length;
    for (const f of CELL_FACES[t] ?? []) { size.push(f.length); first.push(nodes.length); nodes.push(...f); }
  }
  start[256] = size.length;
  return { start, size: Int32Array.from(size), first: Int32Array.from(first), nodes: Int32Array.from(nodes) };
})();

/** Flat typed-array form of CELL_EDGES: edges of type t are `EDGE_TABLE.start[t] .. start[t+1]-1`, nodes at `nodes[2e], nodes[2e+1]`. */
export const EDGE_TABLE = (() => {
  const start = new Int32Array(257);
  const nodes: number[] = [];
  for (let t = 0; t < 256; t++) {
    start[t] = nodes.length / 2;
    for (const [a, b] of CELL_EDGES[t] ?? []) nodes.push(a, b);
  }
  start[256] = nodes.length / 2;
  return { start, nodes: Int32Array.from(nodes) };
})();

/**
 * Reference node coordinates of each fixed-size 3D type with the standard (positive) orientation.
 * Used by tests and by shape-function code. Wedge: triangle (0,1,2) with its normal pointing away
 * from (3,4,5), as the VTK documentation defines it.
 */
export const REFERENCE_NODES: Readonly<Record<number, readonly number[]>> = {
  10: [0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1],
  11: [0, 0, 0, 1, 0, 0, 0, 1, 0, 1, 1, 0, 0, 0, 1, 1, 0, 1, 0, 1, 1, 1, 1, 1],
  12: [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0, 0, 1, 1, 0, 1, 1, 1, 1, 0, 1, 1],
  13: [0, 0, 0, 0, 1, 0, 1, 0, 0, 0, 0, 1, 0, 1, 1, 1, 0, 1],
  14: [0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0.5, 0.5, 1],
};
