/**
 * Second-order viscous traction on boundary faces from a point velocity: the velocity gradient at each
 * corner node by the quadratic least-squares fit of src/derive (one-sided over two rings of neighbours at
 * a wall node), then t = −μ(∇u + ∇uᵀ)·n̂ per corner with n̂ the face's unit normal out of the fluid. With
 * the corners' tractions linear over each triangle of the face, the integrated viscous force is second
 * order in the wall spacing, where the wall cell's own (linear, Green–Gauss) gradient is first order.
 *
 * Layout: as `SurfaceLoads.traction`, three values per corner of the selected faces (pressure unit when
 * μ is in Pa·s and lengths and velocities are consistent).
 */
import type { Dataset } from '../model/dataset.ts';
import type { FieldArray } from '../model/fieldArray.ts';
import { sameBytes } from '../model/sameBytes.ts';
import { pointGradientAt } from '../derive/fieldGradient.ts';
import type { BoundaryFaces } from './boundaryFaces.ts';

/**
 * Which wall node each corner of the selected faces reads: per piece its wall nodes (local ids, each once, in
 * order of first use along the selection; empty when no selected face is on the piece), per corner its row in
 * its piece's list, per selected face its piece.
 */
export interface WallNodes { perPiece: Int32Array[]; cornerRow: Int32Array; facePiece: Int32Array }

/**
 * The last wall nodes made on each set of boundary faces, with what else they depend on: a copy of the selection
 * and each piece's node count (a wall's gradient is primed, then its traction computed: both ask for the same
 * wall). Kept no longer than the faces.
 */
const lastOn = new WeakMap<BoundaryFaces, { selection: Int32Array; nodeCounts: number[]; nodes: WallNodes }>();

/**
 * The wall nodes of the selected faces (`offsets`: the selection's corner offsets); see `WallNodes`. The result
 * is shared with the next caller asking for the same wall (read it, do not write it).
 */
export function wallNodes(d: Dataset, faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array): WallNodes {
  const counts = d.pieces.map((p) => p.points.length / 3);
  const last = lastOn.get(faces);
  if (last && sameBytes(last.selection, selection) && last.nodeCounts.length === counts.length
    && last.nodeCounts.every((n, k) => n === counts[k])) return last.nodes;
  const nodes = makeWallNodes(d, faces, selection, offsets);
  lastOn.set(faces, { selection: selection.slice(), nodeCounts: counts, nodes });
  return nodes;
}

function makeWallNodes(d: Dataset, faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array): WallNodes {
  const fo = faces.offsets, nodes = faces.nodes, facePieceOf = faces.piece, ns = selection.length;
  const facePiece = new Int32Array(ns), cornerRow = new Int32Array(offsets[offsets.length - 1]!);
  const slots: (Int32Array | undefined)[] = d.pieces.map(() => undefined);
  const lists: Int32Array[] = d.pieces.map(() => EMPTY), counts = new Int32Array(d.pieces.length);
  for (let s = 0; s < ns; s++) {
    const f = selection[s]!, k = facePieceOf[f]!;
    facePiece[s] = k;
    let slot = slots[k];
    // a piece's wall nodes are at most its nodes and the selection's corners
    if (!slot) { const np = d.pieces[k]!.points.length / 3; slots[k] = slot = new Int32Array(np).fill(-1); lists[k] = new Int32Array(Math.min(np, cornerRow.length)); }
    const list = lists[k]!;
    let n = counts[k]!;
    for (let j = fo[f]!, e = fo[f + 1]!, c = offsets[s]!; j < e; j++, c++) {
      const q = nodes[j]!;
      let r = slot[q]!;
      if (r === -1) { r = n++; slot[q] = r; list[r] = q; }
      cornerRow[c] = r;
    }
    counts[k] = n;
  }
  return { perPiece: lists.map((l, k) => l.slice(0, counts[k]!)), cornerRow, facePiece };
}
const EMPTY = new Int32Array(0);

/**
 * Per corner the 9 gradient values of its node (layout of `cornerGradients`), from `byPiece[k]`: 9 values
 * per wall node of piece k in the order of `w.perPiece[k]`.
 */
export function cornersFromNodes(w: WallNodes, offsets: Int32Array, byPiece: readonly (Float64Array | null)[]): Float64Array {
  const out = new Float64Array(9 * offsets[offsets.length - 1]!), rows = w.cornerRow;
  for (let s = 0; s < w.facePiece.length; s++) {
    const G = byPiece[w.facePiece[s]!]!;
    for (let c = offsets[s]!, e = offsets[s + 1]!, o = 9 * c; c < e; c++, o += 9) {
      const g = 9 * rows[c]!;
      out[o] = G[g]!; out[o + 1] = G[g + 1]!; out[o + 2] = G[g + 2]!; out[o + 3] = G[g + 3]!; out[o + 4] = G[g + 4]!;
      out[o + 5] = G[g + 5]!; out[o + 6] = G[g + 6]!; out[o + 7] = G[g + 7]!; out[o + 8] = G[g + 8]!;
    }
  }
  return out;
}

/**
 * Velocity gradients (9 per corner, ∂u_i/∂x_j at `9·corner + 3i + j`, velocity unit per length unit) at the
 * corners of the selected faces, each node fitted once.
 */
export function cornerGradients(d: Dataset, faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array, vel: readonly (FieldArray | undefined)[]): Float64Array {
  const w = wallNodes(d, faces, selection, offsets);
  return cornersFromNodes(w, offsets, w.perPiece.map((n, k) => (n.length ? pointGradientAt(d.pieces[k]!, vel[k]!, n) : null)));
}

/**
 * Traction −μ(G + Gᵀ)·n̂ per corner from `cornerGradients`. `muAt(s, j)` is μ (Pa·s) at corner j of the
 * s-th selected face.
 */
export function cornerTraction(faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array, G: Float64Array,
  muAt: (s: number, j: number) => number): Float64Array {
  const out = new Float64Array(3 * offsets[offsets.length - 1]!), area = faces.areaVector;
  for (let s = 0; s < selection.length; s++) {
    const f = selection[s]!;
    const ax = area[3 * f]!, ay = area[3 * f + 1]!, az = area[3 * f + 2]!;
    const len = Math.sqrt(ax * ax + ay * ay + az * az);
    if (len === 0) continue;
    const nx = ax / len, ny = ay / len, nz = az / len;
    for (let i = offsets[s]!, j = 0; i < offsets[s + 1]!; i++, j++) {
      const g = 9 * i, mu = muAt(s, j);
      out[3 * i] = -mu * (2 * G[g]! * nx + (G[g + 1]! + G[g + 3]!) * ny + (G[g + 2]! + G[g + 6]!) * nz);
      out[3 * i + 1] = -mu * ((G[g + 3]! + G[g + 1]!) * nx + 2 * G[g + 4]! * ny + (G[g + 5]! + G[g + 7]!) * nz);
      out[3 * i + 2] = -mu * ((G[g + 6]! + G[g + 2]!) * nx + (G[g + 7]! + G[g + 5]!) * ny + 2 * G[g + 8]! * nz);
    }
  }
  return out;
}

/**
 * `cornerTraction` read straight from the wall nodes' gradients (`byPiece[k]`: 9 values per wall node of piece
 * k in the order of `w.perPiece[k]`), without the per-corner copy of `cornersFromNodes`: the same arithmetic,
 * so the same values. `mu` is μ (Pa·s): a constant, or per corner j of the s-th selected face.
 */
export function nodeTraction(faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array, w: WallNodes,
  byPiece: readonly (Float64Array | null)[], mu: number | ((s: number, j: number) => number)): Float64Array {
  const out = new Float64Array(3 * offsets[offsets.length - 1]!), area = faces.areaVector, rows = w.cornerRow;
  const constant = typeof mu === 'number', m0 = constant ? mu : 0;
  for (let s = 0; s < selection.length; s++) {
    const f = selection[s]!, G = byPiece[w.facePiece[s]!]!;
    const ax = area[3 * f]!, ay = area[3 * f + 1]!, az = area[3 * f + 2]!;
    const len = Math.sqrt(ax * ax + ay * ay + az * az);
    if (len === 0) continue;
    const nx = ax / len, ny = ay / len, nz = az / len;
    for (let i = offsets[s]!, j = 0; i < offsets[s + 1]!; i++, j++) {
      const g = 9 * rows[i]!, m = constant ? m0 : (mu as (s: number, j: number) => number)(s, j);
      const g0 = G[g]!, g1 = G[g + 1]!, g2 = G[g + 2]!, g3 = G[g + 3]!, g4 = G[g + 4]!, g5 = G[g + 5]!, g6 = G[g + 6]!, g7 = G[g + 7]!, g8 = G[g + 8]!;
      out[3 * i] = -m * (2 * g0 * nx + (g1 + g3) * ny + (g2 + g6) * nz);
      out[3 * i + 1] = -m * ((g3 + g1) * nx + 2 * g4 * ny + (g5 + g7) * nz);
      out[3 * i + 2] = -m * ((g6 + g2) * nx + (g7 + g5) * ny + 2 * g8 * nz);
    }
  }
  return out;
}
