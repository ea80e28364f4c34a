/**
 * Cell centroids and volumes of the sample meshes (centroids are where cell-data variants evaluate the
 * exact solution; volumes check the meshes).
 * Simplices (tetra, triangle, line, vertex): mean of the nodes (exact). Hexahedra, wedges and pyramids:
 * volume-weighted mean of the centroids of a tetrahedral split (exact for cells with planar faces,
 * which all sample meshes have). Other types: mean of the nodes. Volumes come from `src/model/cellMeasure.ts`.
 */
import { CellType } from '../model/cellTypes.ts';
import { cellVolume } from '../model/cellMeasure.ts';
import type { Piece } from '../model/piece.ts';

/** Local tetrahedra of each split cell type (a valid split of a positively oriented cell). */
const SPLITS: Readonly<Record<number, readonly (readonly [number, number, number, number])[]>> = {
  [CellType.HEXAHEDRON]: [[0, 1, 2, 6], [0, 2, 3, 6], [0, 3, 7, 6], [0, 7, 4, 6], [0, 4, 5, 6], [0, 5, 1, 6]],
  [CellType.WEDGE]: [[0, 1, 2, 3], [1, 2, 3, 4], [2, 3, 4, 5]],
  [CellType.PYRAMID]: [[0, 1, 2, 4], [0, 2, 3, 4]],
};

/** Volumes of the 3D cells of `p` (m³; 0 for other cells), by the model's divergence-theorem volume. */
export function cellVolumes(p: Piece): Float64Array {
  const n = p.cellTypes.length, out = new Float64Array(n);
  for (let c = 0; c < n; c++) out[c] = Math.abs(cellVolume(p, c));
  return out;
}

function volume6(P: Float64Array, a: number, b: number, c: number, d: number): number {
  const i0 = 3 * a, i1 = 3 * b, i2 = 3 * c, i3 = 3 * d;
  const ux = P[i1]! - P[i0]!, uy = P[i1 + 1]! - P[i0 + 1]!, uz = P[i1 + 2]! - P[i0 + 2]!;
  const vx = P[i2]! - P[i0]!, vy = P[i2 + 1]! - P[i0 + 1]!, vz = P[i2 + 2]! - P[i0 + 2]!;
  const wx = P[i3]! - P[i0]!, wy = P[i3 + 1]! - P[i0 + 1]!, wz = P[i3 + 2]! - P[i0 + 2]!;
  return ux * (vy * wz - vz * wy) - uy * (vx * wz - vz * wx) + uz * (vx * wy - vy * wx);
}

/** Centroids of all cells of `p`, xyz-interleaved (m), one triple per cell. */
export function cellCentroids(p: Piece): Float64Array {
  const n = p.cellTypes.length, out = new Float64Array(3 * n), P = p.points, conn = p.connectivity;
  for (let c = 0; c < n; c++) {
    const a = p.offsets[c]!, b = p.offsets[c + 1]!;
    const split = SPLITS[p.cellTypes[c]!];
    let x = 0, y = 0, z = 0;
    if (split) {
      let vol = 0;
      for (const t of split) {
        const i0 = conn[a + t[0]]!, i1 = conn[a + t[1]]!, i2 = conn[a + t[2]]!, i3 = conn[a + t[3]]!;
        // Absolute value: the split's tetrahedra need not share one orientation.
        const v = Math.abs(volume6(P, i0, i1, i2, i3));
        vol += v;
        x += v * (P[3 * i0]! + P[3 * i1]! + P[3 * i2]! + P[3 * i3]!);
        y += v * (P[3 * i0 + 1]! + P[3 * i1 + 1]! + P[3 * i2 + 1]! + P[3 * i3 + 1]!);
        z += v * (P[3 * i0 + 2]! + P[3 * i1 + 2]! + P[3 * i2 + 2]! + P[3 * i3 + 2]!);
      }
      const s = 1 / (4 * vol);
      out[3 * c] = x * s; out[3 * c + 1] = y * s; out[3 * c + 2] = z * s;
      continue;
    }
    for (let k = a; k < b; k++) { const i = 3 * conn[k]!; x += P[i]!; y += P[i + 1]!; z += P[i + 2]!; }
    const s = 1 / (b - a);
    out[3 * c] = x * s; out[3 * c + 1] = y * s; out[3 * c + 2] = z * s;
  }
  return out;
}
