/**
 * Polyhedron faces of a VTK XML unstructured piece, in either of the two layouts VTK has written, turned
 * into the model's per-cell face lists (`PolyFaces`, see `src/model/piece.ts`):
 *  - the classic layout: `faces` holds, per polyhedral cell, `[nFaces, n0, ids…, n1, ids…]`, and
 *    `faceoffsets[c]` is the end of cell c's part of `faces` (−1 for a cell that is not a polyhedron);
 *  - the layout of VTK 9.4 and later: faces are a cell array (`face_connectivity` with end offsets
 *    `face_offsets`), and each cell lists face numbers (`polyhedron_to_faces` with end offsets
 *    `polyhedron_offsets`, one per cell, non-polyhedral cells listing none). Faces may be shared by
 *    cells; the model gets a copy per cell.
 * Faces are attached to polyhedral cells (type 42) only. Point ids are range-checked by `validatePiece`.
 */
import { CellType } from '../model/cellTypes.ts';
import type { PolyFaces } from '../model/piece.ts';

/** Builds the face lists from the classic `faces` / `faceoffsets` arrays. */
export function facesFromStream(types: ArrayLike<number>, faces: Int32Array, faceEnds: Int32Array, where: string): PolyFaces {
  const nCells = types.length;
  if (faceEnds.length !== nCells) throw new Error(`${where}: "faceoffsets" holds ${faceEnds.length} values, expected one per cell (${nCells})`);
  const cellFaceStart = new Int32Array(nCells + 1);
  let cursor = 0, nFaces = 0, nConn = 0;
  for (let c = 0; c < nCells; c++) {
    const e = faceEnds[c]!;
    const poly = types[c] === CellType.POLYHEDRON;
    if (e < 0) {
      if (poly) throw new Error(`${where}: cell ${c} is a polyhedron but its faceoffsets entry is ${e}; expected the end of its faces`);
      cellFaceStart[c + 1] = nFaces;
      continue;
    }
    if (e < cursor || e > faces.length) {
      throw new Error(`${where}: faceoffsets entry ${c} is ${e}, expected ${cursor}..${faces.length} (faces hold ${faces.length} values)`);
    }
    if (poly) {
      if (e === cursor) throw new Error(`${where}: polyhedron cell ${c} has an empty face stream`);
      const nf = faces[cursor]!;
      let p = cursor + 1;
      for (let f = 0; f < nf; f++) {
        if (p >= e) throw new Error(`${where}: polyhedron cell ${c} declares ${nf} faces, its stream ends after ${f}`);
        const n = faces[p]!;
        if (n < 3 || p + 1 + n > e) throw new Error(`${where}: polyhedron cell ${c} face ${f} declares ${n} nodes; expected 3 or more within the cell's stream`);
        nConn += n;
        p += 1 + n;
      }
      if (p !== e) throw new Error(`${where}: polyhedron cell ${c}'s faces end at ${p}, faceoffsets says ${e}`);
      nFaces += nf;
    }
    cellFaceStart[c + 1] = nFaces;
    cursor = e;
  }
  const faceOffsets = new Int32Array(nFaces + 1), faceConnectivity = new Int32Array(nConn);
  cursor = 0;
  let f = 0, k = 0;
  for (let c = 0; c < nCells; c++) {
    const e = faceEnds[c]!;
    if (e < 0) continue;
    if (types[c] === CellType.POLYHEDRON) {
      const nf = faces[cursor]!;
      let p = cursor + 1;
      for (let j = 0; j < nf; j++) {
        const n = faces[p]!;
        faceConnectivity.set(faces.subarray(p + 1, p + 1 + n), k);
        k += n;
        faceOffsets[++f] = k;
        p += 1 + n;
      }
    }
    cursor = e;
  }
  return { cellFaceStart, faceOffsets, faceConnectivity };
}

/** The four arrays of the VTK 9.4 layout (end offsets, as in the file). */
export interface FaceTables {
  faceConnectivity: Int32Array;
  faceEnds: Int32Array;
  polyhedronToFaces: Int32Array;
  polyhedronEnds: Int32Array;
}

/** Builds the face lists from the VTK 9.4 face tables. */
export function facesFromTables(types: ArrayLike<number>, t: FaceTables, where: string): PolyFaces {
  const nCells = types.length, nFacesFile = t.faceEnds.length;
  if (t.polyhedronEnds.length !== nCells) throw new Error(`${where}: "polyhedron_offsets" holds ${t.polyhedronEnds.length} values, expected one per cell (${nCells})`);
  let prev = 0;
  for (let f = 0; f < nFacesFile; f++) {
    const e = t.faceEnds[f]!;
    if (e < prev || e > t.faceConnectivity.length) throw new Error(`${where}: "face_offsets" entry ${f} is ${e}, expected ${prev}..${t.faceConnectivity.length}`);
    prev = e;
  }
  const cellFaceStart = new Int32Array(nCells + 1);
  let nFaces = 0, nConn = 0;
  prev = 0;
  for (let c = 0; c < nCells; c++) {
    const e = t.polyhedronEnds[c]!;
    if (e < prev || e > t.polyhedronToFaces.length) throw new Error(`${where}: "polyhedron_offsets" entry ${c} is ${e}, expected ${prev}..${t.polyhedronToFaces.length}`);
    if (types[c] === CellType.POLYHEDRON) {
      for (let j = prev; j < e; j++) {
        const face = t.polyhedronToFaces[j]!;
        if (face >= nFacesFile) throw new Error(`${where}: polyhedron cell ${c} refers to face ${face}, but the file has ${nFacesFile} faces`);
        nConn += t.faceEnds[face]! - (face === 0 ? 0 : t.faceEnds[face - 1]!);
      }
      nFaces += e - prev;
    } else if (e > prev) {
      throw new Error(`${where}: cell ${c} is not a polyhedron (type ${types[c]}) but lists ${e - prev} faces`);
    }
    cellFaceStart[c + 1] = nFaces;
    prev = e;
  }
  const faceOffsets = new Int32Array(nFaces + 1), faceConnectivity = new Int32Array(nConn);
  let f = 0, k = 0;
  prev = 0;
  for (let c = 0; c < nCells; c++) {
    const e = t.polyhedronEnds[c]!;
    if (types[c] === CellType.POLYHEDRON) {
      for (let j = prev; j < e; j++) {
        const face = t.polyhedronToFaces[j]!;
        const s = face === 0 ? 0 : t.faceEnds[face - 1]!, en = t.faceEnds[face]!;
        faceConnectivity.set(t.faceConnectivity.subarray(s, en), k);
        k += en - s;
        faceOffsets[++f] = k;
      }
    }
    prev = e;
  }
  return { cellFaceStart, faceOffsets, faceConnectivity };
}
