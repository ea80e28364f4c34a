/**
 * A piece cut down to some of its cells: the cells in their order, the points they use in their order
 * (renumbered compactly), every point and cell field gathered into arrays of the same element type, the
 * polyhedra's face streams, and the boundary-face keys renumbered to the kept cells.
 */
import type { FieldArray, NumericArray } from '../model/fieldArray.ts';
import type { Piece, PolyFaces } from '../model/piece.ts';
import { FACE_SLOTS } from '../surface/boundaryFaces.ts';

type ArrayCtor = new (n: number) => NumericArray;

function gather(f: FieldArray, index: Int32Array): FieldArray {
  const nc = f.components, src = f.values;
  const out = new (src.constructor as ArrayCtor)(index.length * nc);
  for (let i = 0; i < index.length; i++) {
    const a = index[i]! * nc, b = i * nc;
    for (let j = 0; j < nc; j++) out[b + j] = src[a + j]!;
  }
  return { ...f, values: out };
}

/** The piece `p` holding only the ascending local cells `cells`; `boundary` keys (`cell × FACE_SLOTS + face`) renumbered to them. */
export function subPiece(p: Piece, cells: Int32Array, boundary: Float64Array): { piece: Piece; boundary: Float64Array } {
  const nPoints = p.points.length / 3;
  const pointMap = new Int32Array(nPoints).fill(-1);
  const offsets = new Int32Array(cells.length + 1);
  for (let i = 0; i < cells.length; i++) {
    const c = cells[i]!;
    offsets[i + 1] = offsets[i]! + p.offsets[c + 1]! - p.offsets[c]!;
    for (let q = p.offsets[c]!; q < p.offsets[c + 1]!; q++) pointMap[p.connectivity[q]!] = 0;
  }
  const pf = p.polyFaces;
  if (pf) {
    for (let i = 0; i < cells.length; i++) {
      const c = cells[i]!;
      for (let q = pf.faceOffsets[pf.cellFaceStart[c]!]!; q < pf.faceOffsets[pf.cellFaceStart[c + 1]!]!; q++) pointMap[pf.faceConnectivity[q]!] = 0;
    }
  }
  let nKept = 0;
  for (let i = 0; i < nPoints; i++) if (pointMap[i] === 0) pointMap[i] = nKept++;
  const pointIndex = new Int32Array(nKept);
  for (let i = 0; i < nPoints; i++) if (pointMap[i]! >= 0) pointIndex[pointMap[i]!] = i;
  const points = new Float64Array(3 * nKept);
  for (let i = 0; i < nKept; i++) for (let j = 0; j < 3; j++) points[3 * i + j] = p.points[3 * pointIndex[i]! + j]!;
  const connectivity = new Int32Array(offsets[cells.length]!);
  const cellTypes = new Uint8Array(cells.length);
  for (let i = 0; i < cells.length; i++) {
    const c = cells[i]!, a = p.offsets[c]!;
    cellTypes[i] = p.cellTypes[c]!;
    for (let q = 0; q < offsets[i + 1]! - offsets[i]!; q++) connectivity[offsets[i]! + q] = pointMap[p.connectivity[a + q]!]!;
  }
  let polyFaces: PolyFaces | undefined;
  if (pf) {
    const cellFaceStart = new Int32Array(cells.length + 1);
    let nf = 0, nn = 0;
    for (let i = 0; i < cells.length; i++) {
      const c = cells[i]!, fa = pf.cellFaceStart[c]!, fb = pf.cellFaceStart[c + 1]!;
      nf += fb - fa; nn += pf.faceOffsets[fb]! - pf.faceOffsets[fa]!;
      cellFaceStart[i + 1] = nf;
    }
    const faceOffsets = new Int32Array(nf + 1), faceConnectivity = new Int32Array(nn);
    let f = 0, q = 0;
    for (let i = 0; i < cells.length; i++) {
      const c = cells[i]!;
      for (let g = pf.cellFaceStart[c]!; g < pf.cellFaceStart[c + 1]!; g++) {
        for (let r = pf.faceOffsets[g]!; r < pf.faceOffsets[g + 1]!; r++) faceConnectivity[q++] = pointMap[pf.faceConnectivity[r]!]!;
        faceOffsets[++f] = q;
      }
    }
    polyFaces = { cellFaceStart, faceOffsets, faceConnectivity };
  }
  // Kept cells' new numbers, for the boundary keys (cells absent from `cells` have no boundary face listed).
  const keys = new Float64Array(boundary.length);
  for (let i = 0, j = 0; i < boundary.length; i++) {
    const c = Math.floor(boundary[i]! / FACE_SLOTS), face = boundary[i]! - c * FACE_SLOTS;
    while (cells[j]! < c) j++;
    if (cells[j] !== c) throw new Error(`subPiece: boundary face of cell ${c} whose cell is not kept`);
    keys[i] = j * FACE_SLOTS + face;
  }
  const piece: Piece = {
    points, cellTypes, offsets, connectivity, ...(polyFaces ? { polyFaces } : {}),
    pointData: p.pointData.map((f) => gather(f, pointIndex)),
    cellData: p.cellData.map((f) => gather(f, cells)),
  };
  return { piece, boundary: keys };
}
