/**
 * Mesh reuse between consecutive steps of a series. When a step's geometry (every piece's points, cell
 * types, offsets, connectivity and polyhedral faces) holds the same bytes as the step before, its pieces
 * are given the previous step's geometry arrays — the same objects — so every structure cached by the
 * mesh (`meshKey`: the cell tree, boundary faces, surface groups) is found again instead of rebuilt, and
 * the freshly read copies are dropped. The check is cheap: counts first, then a word-by-word comparison
 * that stops at the first difference.
 */
import type { Dataset } from '../model/dataset.ts';
import type { Piece } from '../model/piece.ts';

import { sameBytes } from '../model/sameBytes.ts';

export { sameBytes };

function samePieceGeometry(a: Piece, b: Piece): boolean {
  if (a.points.length !== b.points.length || a.cellTypes.length !== b.cellTypes.length || a.connectivity.length !== b.connectivity.length) return false;
  if (!!a.polyFaces !== !!b.polyFaces) return false;
  if (a.polyFaces && b.polyFaces && !(sameBytes(a.polyFaces.cellFaceStart, b.polyFaces.cellFaceStart)
    && sameBytes(a.polyFaces.faceOffsets, b.polyFaces.faceOffsets) && sameBytes(a.polyFaces.faceConnectivity, b.polyFaces.faceConnectivity))) return false;
  return sameBytes(a.cellTypes, b.cellTypes) && sameBytes(a.offsets, b.offsets) && sameBytes(a.connectivity, b.connectivity) && sameBytes(a.points, b.points);
}

/** Whether two datasets have the same mesh, piece by piece, byte for byte. */
export function sameGeometry(a: Dataset, b: Dataset): boolean {
  return a.kind === b.kind && a.pieces.length === b.pieces.length && a.pieces.every((p, k) => samePieceGeometry(p, b.pieces[k]!));
}

/**
 * `next` with the geometry arrays of `prev` when both have the same mesh (`reused` true), else `next`
 * as it is. Fields always come from `next`.
 */
export function reuseMesh(prev: Dataset | null, next: Dataset): { dataset: Dataset; reused: boolean } {
  if (!prev || !sameGeometry(prev, next)) return { dataset: next, reused: false };
  const pieces: Piece[] = next.pieces.map((p, k) => {
    const q = prev.pieces[k]!;
    return { ...p, points: q.points, cellTypes: q.cellTypes, offsets: q.offsets, connectivity: q.connectivity, ...(q.polyFaces ? { polyFaces: q.polyFaces } : {}) };
  });
  return { dataset: { ...next, pieces }, reused: true };
}
