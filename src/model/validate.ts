/**
 * Checks a piece once, at the edge (readers and builders), so kernels can trust it afterwards.
 * Every failure throws an Error naming the source, the item and what was expected.
 */
import { cellDimension, fixedNodeCount, CELL_TYPE_NAMES } from './cellTypes.ts';
import { tupleCount } from './fieldArray.ts';
import type { Piece } from './piece.ts';

/** Throws unless `p` is a consistent piece. `where` prefixes messages, e.g. `mesh.vtu piece 2`. */
export function validatePiece(p: Piece, where: string): void {
  const nPts = p.points.length / 3;
  if (!Number.isInteger(nPts)) throw new Error(`${where}: points array holds ${p.points.length} numbers, not a multiple of 3`);
  for (let i = 0; i < p.points.length; i++) {
    if (!Number.isFinite(p.points[i]!)) {
      throw new Error(`${where}: point ${Math.floor(i / 3)} has a non-finite coordinate (${p.points[i]}); expected finite numbers`);
    }
  }
  const nCells = p.cellTypes.length;
  if (p.offsets.length !== nCells + 1) {
    throw new Error(`${where}: ${nCells} cells need ${nCells + 1} offsets, found ${p.offsets.length}`);
  }
  if (p.offsets[0] !== 0) throw new Error(`${where}: first cell offset is ${p.offsets[0]}, expected 0`);
  if (p.offsets[nCells] !== p.connectivity.length) {
    throw new Error(`${where}: offsets end at ${p.offsets[nCells]}, but connectivity holds ${p.connectivity.length} ids`);
  }
  for (let c = 0; c < nCells; c++) {
    const t = p.cellTypes[c]!, n = p.offsets[c + 1]! - p.offsets[c]!;
    if (n < 0) throw new Error(`${where}: cell ${c} has a decreasing offset (${p.offsets[c]} → ${p.offsets[c + 1]})`);
    if (t !== 0 && cellDimension(t) < 0) {
      throw new Error(`${where}: cell ${c} has cell type ${t} (${CELL_TYPE_NAMES[t] ?? 'unknown'}), which is not supported`);
    }
    const want = fixedNodeCount(t);
    if (want > 0 && n !== want) {
      throw new Error(`${where}: cell ${c} is a ${CELL_TYPE_NAMES[t]} with ${n} nodes, expected ${want}`);
    }
  }
  const conn = p.connectivity;
  for (let i = 0; i < conn.length; i++) {
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
      if (p.cellTypes[c] === 42 && cellFaceStart[c + 1]! - cellFaceStart[c]! < 4) {
        throw new Error(`${where}: polyhedron cell ${c} has ${cellFaceStart[c + 1]! - cellFaceStart[c]!} faces, expected at least 4`);
      }
    }
    for (let i = 0; i < faceConnectivity.length; i++) {
      const id = faceConnectivity[i]!;
      if (id < 0 || id >= nPts) throw new Error(`${where}: polyhedron face stream entry ${i} is point ${id}, outside 0..${nPts - 1}`);
    }
  } else {
    for (let c = 0; c < nCells; c++) {
      if (p.cellTypes[c] === 42) throw new Error(`${where}: cell ${c} is a polyhedron but the piece has no face stream`);
    }
  }
  for (const f of [...p.pointData, ...p.cellData]) {
    const want = f.association === 'point' ? nPts : nCells;
    if (f.components < 1 || tupleCount(f) !== want || !Number.isInteger(tupleCount(f))) {
      throw new Error(`${where}: ${f.association} array "${f.name}" holds ${f.values.length} values in ${f.components} components, expected ${want} tuples`);
    }
    const v = f.values;
    if (v instanceof Float64Array || v instanceof Float32Array) {
      for (let i = 0; i < v.length; i++) {
        if (!Number.isFinite(v[i]!)) {
          throw new Error(`${where}: ${f.association} array "${f.name}" has a non-finite value (${v[i]}) at tuple ${Math.floor(i / f.components)}; expected finite numbers`);
        }
      }
    }
  }
}
