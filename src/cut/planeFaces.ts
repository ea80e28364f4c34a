/**
 * Cell faces lying in the cut plane: which cell's cut they belong to, so the cut has no gap and no
 * double layer when the plane runs through a layer of nodes.
 *
 * The rule (see `cutPlane.ts`): node distances are classified half-open — d < 0 is "below", d ≥ 0 "above"
 * (|d| ≤ tol counts as d = 0). A face whose nodes all have d = 0 is cut by the cell below it (that cell's
 * generic cut *is* the face) — such faces are "claimed". The cell above a face produces nothing, so a face
 * with no cell below (a boundary face, or a face on the interface of a piece whose neighbour is missing)
 * would be lost: cells above record their in-plane faces as "candidates", and a candidate with no matching
 * claim is added to the cut. Faces are matched by the exact positions of their nodes (order-free), so the
 * match works across pieces whose interface points are duplicated.
 *
 * Layout: flat growable arrays of face records (piece, global cell id, node count, start into `nodes`),
 * node ids local to the record's piece.
 */
import type { Piece } from '../model/piece.ts';
import { hashPoint } from './pointKey.ts';

let nodes = new Int32Array(256);
let recPiece = new Int32Array(32), recCell = new Int32Array(32), recStart = new Int32Array(32), recSize = new Int32Array(32);
let recHash = new Uint32Array(32), isClaim = new Uint8Array(32);
/** Per claim: 1 once a candidate of this cut matched it (the face is interior to the cells cut here). */
let matched = new Uint8Array(32);
let nNodes = 0, nRec = 0, nCand = 0;
let table = new Int32Array(64);

function growRecords(): void {
  const n = 2 * recPiece.length;
  const g = <T extends Int32Array | Uint32Array | Uint8Array>(a: T, ctor: new (n: number) => T): T => { const b = new ctor(n); b.set(a); return b; };
  recPiece = g(recPiece, Int32Array); recCell = g(recCell, Int32Array); recStart = g(recStart, Int32Array);
  recSize = g(recSize, Int32Array); recHash = g(recHash, Uint32Array); isClaim = g(isClaim, Uint8Array); matched = g(matched, Uint8Array);
}

/** Forgets every record (call at the start of each cut). */
export function resetPlaneFaces(): void { nNodes = 0; nRec = 0; nCand = 0; }

/** Number of candidate records so far (claims not counted). */
export function candidateCount(): number { return nCand; }

/**
 * Records an in-plane face: `ids[start .. start+m-1]` are point ids of piece `k`, whose coordinates are
 * `pts`. `claim` true for a face cut by the cell below it, false for a candidate of the cell above.
 */
export function recordPlaneFace(k: number, pts: Float64Array, cell: number, ids: Int32Array, start: number, m: number, claim: boolean): void {
  if (nRec === recPiece.length) growRecords();
  if (nNodes + m > nodes.length) { const b = new Int32Array(2 * (nNodes + m)); b.set(nodes); nodes = b; }
  // Order-free hash of the node positions, so the same face matches whatever its first node and direction.
  let h = m;
  for (let j = 0; j < m; j++) {
    const id = ids[start + j]!, p = 3 * id;
    nodes[nNodes + j] = id;
    h = (h + hashPoint(pts[p]!, pts[p + 1]!, pts[p + 2]!)) >>> 0;
  }
  recPiece[nRec] = k; recCell[nRec] = cell; recStart[nRec] = nNodes; recSize[nRec] = m; recHash[nRec] = h; isClaim[nRec] = claim ? 1 : 0;
  matched[nRec] = 0;
  nRec++;
  nNodes += m;
  if (!claim) nCand++;
}

/**
 * Order-free exact key of a face: its node positions as sorted `x,y,z` triples. Used only by the worker pool
 * (src/parallel/) to match in-plane faces across cell shares; the cut itself matches by hash and position.
 */
export function facePositionKey(pts: Float64Array, ids: Int32Array, start: number, m: number): string {
  const parts: string[] = [];
  for (let j = 0; j < m; j++) { const p = 3 * ids[start + j]!; parts.push(`${pts[p]! + 0},${pts[p + 1]! + 0},${pts[p + 2]! + 0}`); }
  return parts.sort().join(';');
}

/**
 * Keys (`facePositionKey`) of the faces claimed by cells below them in the last cut that no candidate of the
 * same cut matched (call after `forEachUnclaimedFace`): the faces whose cell above, if any, lies outside the
 * cells cut — on a worker's share border, or the mesh boundary. A face has at most one cell on each side, so a
 * claim matched here is met by no other share's candidate; keying only the rest spares the strings of every
 * interior face of a plane along a node layer.
 */
export function claimedFaceKeys(pieces: readonly Piece[]): string[] {
  const out: string[] = [];
  for (let r = 0; r < nRec; r++) if (isClaim[r] && !matched[r]) out.push(facePositionKey(pieces[recPiece[r]!]!.points, nodes, recStart[r]!, recSize[r]!));
  return out;
}

function sameFace(pieces: readonly Piece[], a: number, b: number): boolean {
  if (recSize[a] !== recSize[b] || recHash[a] !== recHash[b]) return false;
  const pa = pieces[recPiece[a]!]!.points, pb = pieces[recPiece[b]!]!.points;
  for (let i = 0; i < recSize[a]!; i++) {
    const p = 3 * nodes[recStart[a]! + i]!;
    let found = false;
    for (let j = 0; j < recSize[b]!; j++) {
      const q = 3 * nodes[recStart[b]! + j]!;
      if (pa[p] === pb[q] && pa[p + 1] === pb[q + 1] && pa[p + 2] === pb[q + 2]) { found = true; break; }
    }
    if (!found) return false;
  }
  return true;
}

/** Looks record r up in the table; inserts it when no equal face is there. Returns whether it was found. */
function findOrInsert(pieces: readonly Piece[], r: number, mask: number): boolean {
  let s = recHash[r]! & mask;
  for (;;) {
    const e = table[s]!;
    if (e === 0) { table[s] = r + 1; return false; }
    if (sameFace(pieces, e - 1, r)) { if (!isClaim[r]) matched[e - 1] = 1; return true; }
    s = (s + 1) & mask;
  }
}

/**
 * Calls `emit(k, cell, nodes, start, m)` for every candidate face that no claim (and no earlier candidate)
 * matches; returns how many. Cheap when there are no candidates.
 */
export function forEachUnclaimedFace(pieces: readonly Piece[],
  emit: (k: number, cell: number, ids: Int32Array, start: number, m: number) => void): number {
  if (nCand === 0) return 0;
  let size = 64;
  while (size < 2 * nRec) size *= 2;
  if (table.length < size) table = new Int32Array(size); else table.fill(0, 0, size);
  const mask = size - 1;
  for (let r = 0; r < nRec; r++) if (isClaim[r]) findOrInsert(pieces, r, mask);
  let emitted = 0;
  for (let r = 0; r < nRec; r++) {
    if (isClaim[r] || findOrInsert(pieces, r, mask)) continue;
    emit(recPiece[r]!, recCell[r]!, nodes, recStart[r]!, recSize[r]!);
    emitted++;
  }
  return emitted;
}
