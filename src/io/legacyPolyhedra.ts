/**
 * Polyhedra (cell type 42) in legacy `.vtk` files. VTK's legacy writer stores a polyhedron's entry of
 * the cell list as its face stream: the number of faces, then for each face its node count and point
 * ids (in both the packed and the 5.x OFFSETS/CONNECTIVITY layouts). This turns those entries into the
 * model's form: the cell's nodes are its distinct point ids in increasing order (the order VTK's reader
 * reports them), and its faces go into the piece's `PolyFaces` (layout in src/model/piece.ts).
 */
import type { PolyFaces } from '../model/piece.ts';

/** Cells after splitting out the polyhedron face streams. */
export interface SplitCells {
  offsets: Int32Array;
  connectivity: Int32Array;
  polyFaces?: PolyFaces;
}

const POLYHEDRON = 42;

/** Checks the face stream of cell `c` and returns its face count and number of face-node entries. */
function streamSize(conn: Int32Array, s: number, e: number, c: number, where: string): [number, number] {
  if (e <= s) throw new Error(`${where}: polyhedron cell ${c} has an empty face stream; expected a face count, then each face's node count and ids`);
  const nFaces = conn[s]!;
  let p = s + 1, ids = 0;
  for (let f = 0; f < nFaces; f++) {
    if (p >= e) throw new Error(`${where}: polyhedron cell ${c} declares ${nFaces} faces, but its face stream ends after ${f}`);
    const n = conn[p]!;
    if (p + 1 + n > e) throw new Error(`${where}: face ${f} of polyhedron cell ${c} declares ${n} nodes, more than its face stream holds`);
    p += 1 + n;
    ids += n;
  }
  if (p !== e) throw new Error(`${where}: polyhedron cell ${c} has ${e - s} face-stream entries, but its ${nFaces} faces use ${p - s}`);
  return [nFaces, ids];
}

/**
 * Splits the face streams of type-42 cells out of a cell list. Without polyhedra the input is returned
 * unchanged. Throws naming `where` if a face stream is inconsistent.
 */
export function splitPolyhedra(types: ArrayLike<number>, offsets: Int32Array, connectivity: Int32Array, where: string): SplitCells {
  const nCells = types.length;
  let nFaces = 0, nFaceIds = 0, any = false;
  for (let c = 0; c < nCells; c++) {
    if (types[c] !== POLYHEDRON) continue;
    any = true;
    const [f, ids] = streamSize(connectivity, offsets[c]!, offsets[c + 1]!, c, where);
    nFaces += f;
    nFaceIds += ids;
  }
  if (!any) return { offsets, connectivity };

  const cellFaceStart = new Int32Array(nCells + 1), faceOffsets = new Int32Array(nFaces + 1), faceConnectivity = new Int32Array(nFaceIds);
  const newOffsets = new Int32Array(nCells + 1), out = new Int32Array(connectivity.length);
  let face = 0, fq = 0, q = 0;
  for (let c = 0; c < nCells; c++) {
    const s = offsets[c]!, e = offsets[c + 1]!;
    if (types[c] !== POLYHEDRON) {
      out.set(connectivity.subarray(s, e), q);
      q += e - s;
    } else {
      const nf = connectivity[s]!, idStart = fq;
      let p = s + 1;
      for (let f = 0; f < nf; f++) {
        const n = connectivity[p]!;
        faceConnectivity.set(connectivity.subarray(p + 1, p + 1 + n), fq);
        fq += n;
        p += 1 + n;
        faceOffsets[++face] = fq;
      }
      const sorted = faceConnectivity.slice(idStart, fq).sort();
      for (let i = 0; i < sorted.length; i++) if (i === 0 || sorted[i] !== sorted[i - 1]) out[q++] = sorted[i]!;
    }
    newOffsets[c + 1] = q;
    cellFaceStart[c + 1] = face;
  }
  return { offsets: newOffsets, connectivity: out.slice(0, q), polyFaces: { cellFaceStart, faceOffsets, faceConnectivity } };
}
