/**
 * Builders for meshes made in code: the sample-field generator and tests use them. Not a reader:
 * inputs are trusted shapes, but every built piece still passes `validatePiece`.
 */
import { CellType } from './cellTypes.ts';
import type { Dataset } from './dataset.ts';
import type { FieldArray, NumericArray } from './fieldArray.ts';
import type { Piece, PolyFaces } from './piece.ts';
import { validatePiece } from './validate.ts';

/** Cells given as a flat list: `types[c]` with nodes `nodes[c]`. Convenient for small test meshes. */
export interface CellList {
  types: ArrayLike<number>;
  nodes: ArrayLike<ArrayLike<number>>;
  /** Faces of polyhedral cells (per cell, list of faces as node lists); undefined entries for other cells. */
  polyFaces?: (number[][] | undefined)[];
}

/** Builds a validated piece from points and a cell list. */
export function pieceFromCells(points: ArrayLike<number>, cells: CellList, data: { pointData?: FieldArray[]; cellData?: FieldArray[] } = {}): Piece {
  const n = cells.types.length;
  const offsets = new Int32Array(n + 1);
  for (let c = 0; c < n; c++) offsets[c + 1] = offsets[c]! + cells.nodes[c]!.length;
  const connectivity = new Int32Array(offsets[n]!);
  for (let c = 0; c < n; c++) connectivity.set(Array.from(cells.nodes[c]!), offsets[c]!);
  let polyFaces: PolyFaces | undefined;
  if (cells.polyFaces) {
    const cellFaceStart = new Int32Array(n + 1);
    const fo: number[] = [0], fc: number[] = [];
    for (let c = 0; c < n; c++) {
      const faces = cells.polyFaces[c] ?? [];
      for (const f of faces) { fc.push(...f); fo.push(fc.length); }
      cellFaceStart[c + 1] = cellFaceStart[c]! + faces.length;
    }
    polyFaces = { cellFaceStart, faceOffsets: Int32Array.from(fo), faceConnectivity: Int32Array.from(fc) };
  }
  const piece: Piece = {
    points: Float64Array.from(points), cellTypes: Uint8Array.from(cells.types), offsets, connectivity,
    ...(polyFaces ? { polyFaces } : {}),
    pointData: data.pointData ?? [], cellData: data.cellData ?? [],
  };
  validatePiece(piece, 'built mesh');
  return piece;
}

/** Wraps pieces into a dataset, with cell-type counts taken from the pieces. */
export function datasetOf(pieces: Piece[], source = 'built mesh', kind: Dataset['kind'] = 'unstructured'): Dataset {
  const fileCellTypes: Record<number, number> = {};
  for (const p of pieces) for (const t of p.cellTypes) fileCellTypes[t] = (fileCellTypes[t] ?? 0) + 1;
  return { source, kind, pieces, fieldData: [], warnings: [], fileCellTypes };
}

/** A field array from values. */
export function field(name: string, association: 'point' | 'cell', components: number, values: NumericArray): FieldArray {
  return { name, association, components, values, sourceType: values instanceof Float32Array ? 'Float32' : 'Float64' };
}

/** Maps a lattice point (i/nx, j/ny, k/nz in [0,1]³) to space. */
export type LatticeMap = (u: number, v: number, w: number) => [number, number, number];

const identity: LatticeMap = (u, v, w) => [u, v, w];

/** Points of an (nx+1)(ny+1)(nz+1) lattice, i fastest, mapped through `map`. */
function latticePoints(nx: number, ny: number, nz: number, map: LatticeMap): Float64Array {
  const pts = new Float64Array(3 * (nx + 1) * (ny + 1) * (nz + 1));
  let o = 0;
  for (let k = 0; k <= nz; k++) for (let j = 0; j <= ny; j++) for (let i = 0; i <= nx; i++) {
    const [x, y, z] = map(i / nx, j / ny, k / nz);
    pts[o++] = x; pts[o++] = y; pts[o++] = z;
  }
  return pts;
}

/** The 8 lattice node numbers of lattice cell (i, j, k) in VTK hexahedron order. */
function hexNodes(nx: number, ny: number, i: number, j: number, k: number, out: Int32Array, at: number): void {
  const sx = 1, sy = nx + 1, sz = (nx + 1) * (ny + 1);
  const n0 = i * sx + j * sy + k * sz;
  out[at] = n0; out[at + 1] = n0 + sx; out[at + 2] = n0 + sx + sy; out[at + 3] = n0 + sy;
  out[at + 4] = n0 + sz; out[at + 5] = n0 + sx + sz; out[at + 6] = n0 + sx + sy + sz; out[at + 7] = n0 + sy + sz;
}

/** A structured lattice of nx×ny×nz hexahedra on the unit cube, mapped through `map` (keep it orientation-preserving). */
export function hexGrid(nx: number, ny: number, nz: number, map: LatticeMap = identity): Piece {
  const n = nx * ny * nz;
  const connectivity = new Int32Array(8 * n);
  let c = 0;
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) hexNodes(nx, ny, i, j, k, connectivity, 8 * c++);
  const offsets = new Int32Array(n + 1);
  for (let q = 0; q <= n; q++) offsets[q] = 8 * q;
  const piece: Piece = {
    points: latticePoints(nx, ny, nz, map), cellTypes: new Uint8Array(n).fill(CellType.HEXAHEDRON),
    offsets, connectivity, pointData: [], cellData: [],
  };
  validatePiece(piece, 'hexGrid');
  return piece;
}

/** Local hexahedron nodes of the six tetrahedra around the 0–6 diagonal (a conforming split of a lattice). */
const KUHN_TETS = [[0, 1, 2, 6], [0, 2, 3, 6], [0, 3, 7, 6], [0, 7, 4, 6], [0, 4, 5, 6], [0, 5, 1, 6]] as const;

/** The same lattice as `hexGrid`, each hexahedron split into six positively oriented tetrahedra. */
export function tetGrid(nx: number, ny: number, nz: number, map: LatticeMap = identity): Piece {
  const n = 6 * nx * ny * nz;
  const connectivity = new Int32Array(4 * n);
  const hex = new Int32Array(8);
  let o = 0;
  for (let k = 0; k < nz; k++) for (let j = 0; j < ny; j++) for (let i = 0; i < nx; i++) {
    hexNodes(nx, ny, i, j, k, hex, 0);
    for (const t of KUHN_TETS) for (const q of t) connectivity[o++] = hex[q]!;
  }
  const offsets = new Int32Array(n + 1);
  for (let q = 0; q <= n; q++) offsets[q] = 4 * q;
  const piece: Piece = {
    points: latticePoints(nx, ny, nz, map), cellTypes: new Uint8Array(n).fill(CellType.TETRA),
    offsets, connectivity, pointData: [], cellData: [],
  };
  validatePiece(piece, 'tetGrid');
  return piece;
}

/**
 * The tetrahedra of `t` (a `tetGrid`), then a triangle on the first three nodes of every `every`-th of them, as
 * files store boundary 2D cells after the volume cells (warm-up meshes meet the scans' general loops with them).
 */
export function tetsWithTriangles(t: Piece, every: number): Piece {
  const nt = t.cellTypes.length, types: number[] = [], nodes: number[][] = [];
  for (let c = 0; c < nt; c++) { types.push(CellType.TETRA); nodes.push(Array.from(t.connectivity.subarray(4 * c, 4 * c + 4))); }
  for (let c = 0; c < nt; c += every) { types.push(CellType.TRIANGLE); nodes.push(Array.from(t.connectivity.subarray(4 * c, 4 * c + 3))); }
  return pieceFromCells(t.points, { types, nodes });
}

/** Returns a copy of `p` with extra point and cell fields attached. */
export function withFields(p: Piece, pointData: FieldArray[] = [], cellData: FieldArray[] = []): Piece {
  const out: Piece = { ...p, pointData: [...p.pointData, ...pointData], cellData: [...p.cellData, ...cellData] };
  validatePiece(out, 'withFields');
  return out;
}

/** A point field sampled from a function of position. */
export function pointFieldFrom(p: Piece, name: string, components: number, fn: (x: number, y: number, z: number, out: Float64Array) => void): FieldArray {
  const n = p.points.length / 3, v = new Float64Array(n * components), tmp = new Float64Array(components);
  for (let i = 0; i < n; i++) {
    fn(p.points[3 * i]!, p.points[3 * i + 1]!, p.points[3 * i + 2]!, tmp);
    v.set(tmp, i * components);
  }
  return field(name, 'point', components, v);
}
