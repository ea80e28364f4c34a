/**
 * Checks a piece once, at the edge (readers and builders), so kernels can trust it afterwards.
 * Every failure throws an Error naming the source, the item and what was expected.
 */
import { cellDimension, fixedNodeCount, CELL_TYPE_NAMES } from './cellTypes.ts';
import { tupleCount } from './fieldArray.ts';
import type { Piece } from './piece.ts';
import { notedFirstNonFinite, notedWithin } from './arrayScans.ts';

/** Per cell-type byte: its fixed node count (> 0), −1 for a supported variable-size type or 0 (empty), −2 unsupported. */
const TYPE_RULE = (() => {
  const t = new Int8Array(256);
  for (let i = 0; i < 256; i++) t[i] = i !== 0 && cellDimension(i) < 0 ? -2 : fixedNodeCount(i);
  return t;
})();

/** Index of the first non-finite value of `a`, or −1 (x − x is 0 exactly for finite x); what the reader noted, when it did. */
function firstNonFinite(a: Float64Array | Float32Array): number {
  const noted = notedFirstNonFinite(a);
  if (noted !== undefined) return noted;
  for (let i = 0; i < a.length; i++) { const x = a[i]!; if (x - x !== 0) return i; }
  return -1;
}

/** Throws unless `p` is a consistent piece. `where` prefixes messages, e.g. `mesh.vtu piece 2`. */
export function validatePiece(p: Piece, where: string): void {
  const pts = p.points;
  const nPts = pts.length / 3;
  if (!Number.isInteger(nPts)) throw new Error(`${where}: points array holds ${pts.length} numbers, not a multiple of 3`);
  const bad = firstNonFinite(pts);
  if (bad >= 0) throw new Error(`${where}: point ${Math.floor(bad / 3)} has a non-finite coordinate (${pts[bad]}); expected finite numbers`);
  const types = p.cellTypes, off = p.offsets;
  const nCells = types.length;
  if (off.length !== nCells + 1) {
    throw new Error(`${where}: ${nCells} cells need ${nCells + 1} offsets, found ${off.length}`);
  }
  if (off[0] !== 0) throw new Error(`${where}: first cell offset is ${off[0]}, expected 0`);
  if (off[nCells] !== p.connectivity.length) {
    throw new Error(`${where}: offsets end at ${off[nCells]}, but connectivity holds ${p.connectivity.length} ids`);
  }
  const rule = TYPE_RULE;
  for (let c = 0, a = off[0]!; c < nCells; c++) {
    const b = off[c + 1]!, n = b - a, r = rule[types[c]!]!;
    a = b;
    if (n < 0 || r === -2 || (r > 0 && n !== r)) cellError(p, c, where);
  }
  const conn = p.connectivity;
  // A reader that noted the ids' range leaves nothing to find; otherwise (or when it is off) the scan names the entry.
  if (!notedWithin(conn, 0, nPts - 1)) for (let i = 0; i < conn.length; i++) {
    const id = conn[i]!;
    if (id < 0 || id >= nPts) {
      throw new Error(`${where}: connectivity entry ${i} is point ${id}, but the piece has ${nPts} points (expected 0..${nPts - 1})`);
    }
  }
  if (p.polyFaces) {
    const { cellFaceStart, faceOffsets, faceConnectivity } = p.polyFaces;
    if (cellFaceStart.length !== nCells + 1) throw new Error(`${where}: polyhedron face index has ${cellFaceStart.length} entries, expected ${nCells + 1}`);
    const nFaces = faceOffsets.length - 1;
    if (cellFaceStart[nCells] !== nFaces) throw new Error(`${where}: polyhedron face index ends at ${cellFaceStart[nCells]}, but there are ${nFaces} faces`);
    for (let c = 0; c < nCells; c++) {
      if (types[c] === 42 && cellFaceStart[c + 1]! - cellFaceStart[c]! < 4) {
        throw new Error(`${where}: polyhedron cell ${c} has ${cellFaceStart[c + 1]! - cellFaceStart[c]!} faces, expected at least 4`);
      }
    }
    for (let i = 0; i < faceConnectivity.length; i++) {
      const id = faceConnectivity[i]!;
      if (id < 0 || id >= nPts) throw new Error(`${where}: polyhedron face stream entry ${i} is point ${id}, outside 0..${nPts - 1}`);
    }
  } else if (types.indexOf(42) >= 0) {
    throw new Error(`${where}: cell ${types.indexOf(42)} is a polyhedron but the piece has no face stream`);
  }
  validateFields(p, where);
}

/**
 * The field checks of `validatePiece` alone (tuple counts against the piece's points and cells, finite
 * floats), for a piece whose geometry arrays are those of a piece checked before (a series step read with
 * the previous step's geometry).
 */
export function validateFields(p: Piece, where: string): void {
  const nPts = p.points.length / 3, nCells = p.cellTypes.length;
  for (const f of [...p.pointData, ...p.cellData]) {
    const want = f.association === 'point' ? nPts : nCells;
    if (f.components < 1 || tupleCount(f) !== want || !Number.isInteger(tupleCount(f))) {
      throw new Error(`${where}: ${f.association} array "${f.name}" holds ${f.values.length} values in ${f.components} components, expected ${want} tuples`);
    }
    const v = f.values;
    if (v instanceof Float64Array || v instanceof Float32Array) {
      const i = firstNonFinite(v);
      if (i >= 0) {
        throw new Error(`${where}: ${f.association} array "${f.name}" has a non-finite value (${v[i]}) at tuple ${Math.floor(i / f.components)}; expected finite numbers`);
      }
    }
  }
}

/** Throws the message for the first problem of cell `c` (a decreasing offset, an unsupported type, a wrong node count). */
function cellError(p: Piece, c: number, where: string): never {
  const t = p.cellTypes[c]!, n = p.offsets[c + 1]! - p.offsets[c]!;
  if (n < 0) throw new Error(`${where}: cell ${c} has a decreasing offset (${p.offsets[c]} → ${p.offsets[c + 1]})`);
  if (t !== 0 && cellDimension(t) < 0) {
    throw new Error(`${where}: cell ${c} has cell type ${t} (${CELL_TYPE_NAMES[t] ?? 'unknown'}), which is not supported`);
  }
  throw new Error(`${where}: cell ${c} is a ${CELL_TYPE_NAMES[t]} with ${n} nodes, expected ${fixedNodeCount(t)}`);
}
