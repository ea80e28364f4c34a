/**
 * Pieces made of one cell type stored back to back — only tetrahedra or only hexahedra, the common output
 * of mesh generators — let the whole-mesh passes (cut scan, cell-tree build) step through connectivity
 * with a fixed stride instead of reading each cell's type and offsets.
 */
import { CellType } from './cellTypes.ts';

const cache = new WeakMap<Int32Array, { types: Uint8Array; size: number }>();

/**
 * Node count of every cell (4 or 8) when a piece holds only tetrahedra or only hexahedra with offsets
 * c·size, else 0. Checked once per offsets array (a loaded piece's arrays never change) and cached.
 */
export function uniformSize(types: Uint8Array, off: Int32Array): number {
  const hit = cache.get(off);
  if (hit && hit.types === types) return hit.size;
  const size = uniformSizeOf(types, off);
  cache.set(off, { types, size });
  return size;
}

function uniformSizeOf(types: Uint8Array, off: Int32Array): number {
  const nc = types.length;
  if (nc === 0 || off.length !== nc + 1 || off[0] !== 0) return 0;
  const t = types[0]!, m = t === CellType.TETRA ? 4 : t === CellType.HEXAHEDRON ? 8 : 0;
  if (m === 0) return 0;
  for (let c = 0; c < nc; c++) if (types[c] !== t || off[c + 1] !== m * (c + 1)) return 0;
  return m;
}
