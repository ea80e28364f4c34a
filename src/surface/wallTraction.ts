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
import { pointGradientAt } from '../derive/fieldGradient.ts';
import type { BoundaryFaces } from './boundaryFaces.ts';

/**
 * Velocity gradients (9 per corner, ∂u_i/∂x_j at `9·corner + 3i + j`, velocity unit per length unit) at the
 * corners of the selected faces, each node fitted once.
 */
export function cornerGradients(d: Dataset, faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array, vel: readonly (FieldArray | undefined)[]): Float64Array {
  const out = new Float64Array(9 * offsets[offsets.length - 1]!);
  const fo = faces.offsets, nodes = faces.nodes;
  for (let k = 0; k < d.pieces.length; k++) {
    const p = d.pieces[k]!, np = p.points.length / 3;
    const slot = new Int32Array(np).fill(-1);
    const list: number[] = [];
    for (let s = 0; s < selection.length; s++) {
      const f = selection[s]!;
      if (faces.piece[f] !== k) continue;
      for (let j = fo[f]!; j < fo[f + 1]!; j++) { const q = nodes[j]!; if (slot[q] === -1) { slot[q] = list.length; list.push(q); } }
    }
    if (list.length === 0) continue;
    const G = pointGradientAt(p, vel[k]!, Int32Array.from(list));
    for (let s = 0; s < selection.length; s++) {
      const f = selection[s]!;
      if (faces.piece[f] !== k) continue;
      for (let j = 0, a = fo[f]!; j < fo[f + 1]! - a; j++) {
        const g = 9 * slot[nodes[a + j]!]!, o = 9 * (offsets[s]! + j);
        for (let c = 0; c < 9; c++) out[o + c] = G[g + c]!;
      }
    }
  }
  return out;
}

/**
 * Traction −μ(G + Gᵀ)·n̂ per corner from `cornerGradients`. `muAt(s, j)` is μ (Pa·s) at corner j of the
 * s-th selected face.
 */
export function cornerTraction(faces: BoundaryFaces, selection: Int32Array, offsets: Int32Array, G: Float64Array,
  muAt: (s: number, j: number) => number): Float64Array {
  const out = new Float64Array(3 * offsets[offsets.length - 1]!);
  for (let s = 0; s < selection.length; s++) {
    const f = selection[s]!;
    const ax = faces.areaVector[3 * f]!, ay = faces.areaVector[3 * f + 1]!, az = faces.areaVector[3 * f + 2]!;
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
