/**
 * Shape functions (and their parametric derivatives) of the linear volume cells, and interpolation of
 * point data with them. Cell data needs none: it is constant over its cell.
 *
 * Parametric coordinates (r, s, t), node k at the listed parametric position (the same conventions as the
 * VTK documentation for these cell types):
 *  - tetra (10):      N = [1−r−s−t, r, s, t]; nodes (0,0,0) (1,0,0) (0,1,0) (0,0,1); inside: r,s,t ≥ 0, r+s+t ≤ 1.
 *  - voxel (11):      trilinear on [0,1]³, node k at (k&1, (k>>1)&1, (k>>2)&1) (x fastest).
 *  - hexahedron (12): trilinear on [0,1]³, nodes (0,0,0) (1,0,0) (1,1,0) (0,1,0), then the same at t = 1.
 *  - wedge (13):      N = [(1−r−s)(1−t), r(1−t), s(1−t), (1−r−s)t, rt, st]; inside: r,s ≥ 0, r+s ≤ 1, 0 ≤ t ≤ 1.
 *  - pyramid (14):    N = [(1−r)(1−s)(1−t), r(1−s)(1−t), rs(1−t), (1−r)s(1−t), t]; base on t = 0, apex at t = 1;
 *                     inside: r,s,t in [0,1] (the map collapses the face t = 1 onto the apex).
 * These functions reproduce every linear field exactly (they sum to one and reproduce x, y, z), and the
 * hexahedron/voxel ones reproduce trilinear fields exactly.
 *
 * Derivative layout: `dN[3k] = ∂N_k/∂r`, `dN[3k+1] = ∂N_k/∂s`, `dN[3k+2] = ∂N_k/∂t`.
 */
import { CellType } from '../model/cellTypes.ts';
import type { NumericArray } from '../model/fieldArray.ts';

/** Types with isoparametric shape functions here. */
export function hasShapeFunctions(type: number): boolean {
  return type === CellType.TETRA || type === CellType.VOXEL || type === CellType.HEXAHEDRON
    || type === CellType.WEDGE || type === CellType.PYRAMID;
}

/** Writes the shape functions of `type` at (r, s, t) into `N`; returns the node count (0 for other types). */
export function shapeFunctions(type: number, r: number, s: number, t: number, N: Float64Array): number {
  switch (type) {
    case CellType.TETRA:
      N[0] = 1 - r - s - t; N[1] = r; N[2] = s; N[3] = t;
      return 4;
    case CellType.HEXAHEDRON: {
      const a = 1 - r, b = 1 - s, c = 1 - t;
      N[0] = a * b * c; N[1] = r * b * c; N[2] = r * s * c; N[3] = a * s * c;
      N[4] = a * b * t; N[5] = r * b * t; N[6] = r * s * t; N[7] = a * s * t;
      return 8;
    }
    case CellType.VOXEL: {
      const a = 1 - r, b = 1 - s, c = 1 - t;
      N[0] = a * b * c; N[1] = r * b * c; N[2] = a * s * c; N[3] = r * s * c;
      N[4] = a * b * t; N[5] = r * b * t; N[6] = a * s * t; N[7] = r * s * t;
      return 8;
    }
    case CellType.WEDGE: {
      const u = 1 - r - s, c = 1 - t;
      N[0] = u * c; N[1] = r * c; N[2] = s * c; N[3] = u * t; N[4] = r * t; N[5] = s * t;
      return 6;
    }
    case CellType.PYRAMID: {
      const a = 1 - r, b = 1 - s, c = 1 - t;
      N[0] = a * b * c; N[1] = r * b * c; N[2] = r * s * c; N[3] = a * s * c; N[4] = t;
      return 5;
    }
    default:
      return 0;
  }
}

/** Writes ∂N/∂(r,s,t) of `type` at (r, s, t) into `dN` (layout in the file comment); returns the node count. */
export function shapeDerivatives(type: number, r: number, s: number, t: number, dN: Float64Array): number {
  switch (type) {
    case CellType.TETRA:
      dN[0] = -1; dN[1] = -1; dN[2] = -1;
      dN[3] = 1; dN[4] = 0; dN[5] = 0;
      dN[6] = 0; dN[7] = 1; dN[8] = 0;
      dN[9] = 0; dN[10] = 0; dN[11] = 1;
      return 4;
    case CellType.HEXAHEDRON: {
      const a = 1 - r, b = 1 - s, c = 1 - t;
      dN[0] = -b * c; dN[1] = -a * c; dN[2] = -a * b;
      dN[3] = b * c; dN[4] = -r * c; dN[5] = -r * b;
      dN[6] = s * c; dN[7] = r * c; dN[8] = -r * s;
      dN[9] = -s * c; dN[10] = a * c; dN[11] = -a * s;
      dN[12] = -b * t; dN[13] = -a * t; dN[14] = a * b;
      dN[15] = b * t; dN[16] = -r * t; dN[17] = r * b;
      dN[18] = s * t; dN[19] = r * t; dN[20] = r * s;
      dN[21] = -s * t; dN[22] = a * t; dN[23] = a * s;
      return 8;
    }
    case CellType.VOXEL: {
      const a = 1 - r, b = 1 - s, c = 1 - t;
      dN[0] = -b * c; dN[1] = -a * c; dN[2] = -a * b;
      dN[3] = b * c; dN[4] = -r * c; dN[5] = -r * b;
      dN[6] = -s * c; dN[7] = a * c; dN[8] = -a * s;
      dN[9] = s * c; dN[10] = r * c; dN[11] = -r * s;
      dN[12] = -b * t; dN[13] = -a * t; dN[14] = a * b;
      dN[15] = b * t; dN[16] = -r * t; dN[17] = r * b;
      dN[18] = -s * t; dN[19] = a * t; dN[20] = a * s;
      dN[21] = s * t; dN[22] = r * t; dN[23] = r * s;
      return 8;
    }
    case CellType.WEDGE: {
      const u = 1 - r - s, c = 1 - t;
      dN[0] = -c; dN[1] = -c; dN[2] = -u;
      dN[3] = c; dN[4] = 0; dN[5] = -r;
      dN[6] = 0; dN[7] = c; dN[8] = -s;
      dN[9] = -t; dN[10] = -t; dN[11] = u;
      dN[12] = t; dN[13] = 0; dN[14] = r;
      dN[15] = 0; dN[16] = t; dN[17] = s;
      return 6;
    }
    case CellType.PYRAMID: {
      const a = 1 - r, b = 1 - s, c = 1 - t;
      dN[0] = -b * c; dN[1] = -a * c; dN[2] = -a * b;
      dN[3] = b * c; dN[4] = -r * c; dN[5] = -r * b;
      dN[6] = s * c; dN[7] = r * c; dN[8] = -r * s;
      dN[9] = -s * c; dN[10] = a * c; dN[11] = -a * s;
      dN[12] = 0; dN[13] = 0; dN[14] = 1;
      return 5;
    }
    default:
      return 0;
  }
}

/**
 * How far (r, s, t) lies outside the parametric cell of `type`, in parametric units: ≤ 0 inside (its
 * negative is the distance to the nearest face in parametric units), > 0 outside.
 */
export function parametricViolation(type: number, r: number, s: number, t: number): number {
  switch (type) {
    case CellType.TETRA:
      return Math.max(-r, -s, -t, r + s + t - 1);
    case CellType.WEDGE:
      return Math.max(-r, -s, r + s - 1, -t, t - 1);
    default:
      return Math.max(-r, r - 1, -s, s - 1, -t, t - 1);
  }
}

/**
 * Parametric position of local node `k` of `type` (conventions in the file comment), written to `out[0..2]`.
 */
export function nodeParametric(type: number, k: number, out: Float64Array): void {
  const at = 3 * k;
  const table = type === CellType.TETRA ? TET_NODES : type === CellType.VOXEL ? VOXEL_NODES
    : type === CellType.WEDGE ? WEDGE_NODES : type === CellType.PYRAMID ? PYRAMID_NODES : HEX_NODES;
  out[0] = table[at]!; out[1] = table[at + 1]!; out[2] = table[at + 2]!;
}

const TET_NODES = Float64Array.of(0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1);
const HEX_NODES = Float64Array.of(0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0, 0, 1, 1, 0, 1, 1, 1, 1, 0, 1, 1);
const VOXEL_NODES = Float64Array.of(0, 0, 0, 1, 0, 0, 0, 1, 0, 1, 1, 0, 0, 0, 1, 1, 0, 1, 0, 1, 1, 1, 1, 1);
const WEDGE_NODES = Float64Array.of(0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1, 1, 0, 1, 0, 1, 1);
const PYRAMID_NODES = Float64Array.of(0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0, 0.5, 0.5, 1);

/**
 * Interpolates one component of a point field: Σ w_k · values[ids[k] · components + component].
 * `ids` are point numbers of the piece that owns `values`; `weights` come from a cell location.
 */
export function interpolateComponent(values: NumericArray, components: number, component: number,
  ids: Int32Array, weights: Float64Array, count: number): number {
  let v = 0;
  for (let k = 0; k < count; k++) v += weights[k]! * values[ids[k]! * components + component]!;
  return v;
}
