/**
 * Queries of the cell tree (layout in cellTree.ts): cells whose padded box holds a point, meets a box,
 * a plane or a segment. Each walk goes by node index with an explicit stack; a leaf's cell boxes are
 * decoded from their 8-bit quantisation within the leaf box on the fly.
 *
 * Each query returns global cell ids (any cell dimension) in tree order, as a subarray of its own growable
 * module buffer — valid until the next call of the same query — or of `out` when given and long enough.
 * Boxes are padded (cellTree.ts), so a few cells that only come near the query may be included; callers
 * decide exactly.
 */
import type { Bounds } from '../model/bounds.ts';
import type { CellTree } from './cellTree.ts';
import { segmentMeetsBox } from './segmentBox.ts';

let walkStack: Int32Array = new Int32Array(512);
function stackFor(tree: CellTree): Int32Array {
  if (walkStack.length < tree.maxDepth + 4) walkStack = new Int32Array(2 * (tree.maxDepth + 4));
  return walkStack;
}

function grow(buf: Int32Array, need: number): Int32Array {
  const b = new Int32Array(Math.max(need, 2 * buf.length));
  b.set(buf);
  return b;
}

let pointScratch: Int32Array = new Int32Array(64);
/** Global ids of cells whose padded box contains the point (x, y, z). */
export function cellsAtPoint(tree: CellTree, x: number, y: number, z: number, out?: Int32Array): Int32Array {
  let buf: Int32Array = out ?? pointScratch;
  let found = 0;
  if (tree.nodeCount === 0) return buf.subarray(0, 0);
  const px = x - tree.origin[0]!, py = y - tree.origin[1]!, pz = z - tree.origin[2]!;
  const nb = tree.nodeBounds, nr = tree.nodeRef, cb = tree.cellBoxes, order = tree.order;
  const stack = stackFor(tree);
  let sp = 0;
  stack[sp++] = 0;
  while (sp > 0) {
    const i = stack[--sp]!, o = 6 * i;
    const lx = nb[o]!, ly = nb[o + 2]!, lz = nb[o + 4]!;
    if (px < lx || px > nb[o + 1]! || py < ly || py > nb[o + 3]! || pz < lz || pz > nb[o + 5]!) continue;
    const cnt = nr[2 * i + 1]!;
    if (cnt < 0) { stack[sp++] = nr[2 * i]!; stack[sp++] = i + 1; continue; }
    const wx = (nb[o + 1]! - lx) / 255, wy = (nb[o + 3]! - ly) / 255, wz = (nb[o + 5]! - lz) / 255;
    for (let slot = nr[2 * i]!, end = slot + cnt; slot < end; slot++) {
      const q = 6 * slot;
      if (px < lx + cb[q]! * wx || px > lx + cb[q + 1]! * wx || py < ly + cb[q + 2]! * wy || py > ly + cb[q + 3]! * wy
        || pz < lz + cb[q + 4]! * wz || pz > lz + cb[q + 5]! * wz) continue;
      if (found === buf.length) { buf = grow(buf, found + 1); if (!out) pointScratch = buf; }
      buf[found++] = order[slot]!;
    }
  }
  return buf.subarray(0, found);
}

let planeScratch: Int32Array = new Int32Array(1024);
/**
 * Global ids of cells whose padded box the plane through (ox, oy, oz) with normal (nx, ny, nz) crosses or
 * touches. The normal need not be unit length.
 */
export function cellsCrossingPlane(tree: CellTree, ox: number, oy: number, oz: number,
  nx: number, ny: number, nz: number, out?: Int32Array): Int32Array {
  let buf: Int32Array = out ?? planeScratch;
  let found = 0;
  if (tree.nodeCount === 0) return buf.subarray(0, 0);
  // Plane in tree coordinates: n·p = d.
  const d = nx * (ox - tree.origin[0]!) + ny * (oy - tree.origin[1]!) + nz * (oz - tree.origin[2]!);
  const ax = Math.abs(nx), ay = Math.abs(ny), az = Math.abs(nz);
  const nb = tree.nodeBounds, nr = tree.nodeRef, cb = tree.cellBoxes, order = tree.order;
  const stack = stackFor(tree);
  let sp = 0;
  stack[sp++] = 0;
  while (sp > 0) {
    const i = stack[--sp]!, o = 6 * i;
    const lx = nb[o]!, ly = nb[o + 2]!, lz = nb[o + 4]!, ex = nb[o + 1]! - lx, ey = nb[o + 3]! - ly, ez = nb[o + 5]! - lz;
    const rad = 0.5 * (ax * ex + ay * ey + az * ez);
    if (!(Math.abs(nx * (lx + 0.5 * ex) + ny * (ly + 0.5 * ey) + nz * (lz + 0.5 * ez) - d) <= rad)) continue;
    const cnt = nr[2 * i + 1]!;
    if (cnt < 0) { stack[sp++] = nr[2 * i]!; stack[sp++] = i + 1; continue; }
    const wx = ex / 255, wy = ey / 255, wz = ez / 255;
    for (let slot = nr[2 * i]!, end = slot + cnt; slot < end; slot++) {
      const q = 6 * slot;
      const x0 = lx + cb[q]! * wx, x1 = lx + cb[q + 1]! * wx, y0 = ly + cb[q + 2]! * wy, y1 = ly + cb[q + 3]! * wy;
      const z0 = lz + cb[q + 4]! * wz, z1 = lz + cb[q + 5]! * wz;
      if (x0 > x1 || y0 > y1 || z0 > z1) continue;
      const r = 0.5 * (ax * (x1 - x0) + ay * (y1 - y0) + az * (z1 - z0));
      if (!(Math.abs(0.5 * (nx * (x0 + x1) + ny * (y0 + y1) + nz * (z0 + z1)) - d) <= r)) continue;
      if (found === buf.length) { buf = grow(buf, found + 1); if (!out) planeScratch = buf; }
      buf[found++] = order[slot]!;
    }
  }
  return buf.subarray(0, found);
}

let boxScratch: Int32Array = new Int32Array(1024);
/** Global ids of cells whose padded box overlaps `bounds` = [xmin, xmax, ymin, ymax, zmin, zmax]. */
export function cellsInBox(tree: CellTree, bounds: Bounds, out?: Int32Array): Int32Array {
  let buf: Int32Array = out ?? boxScratch;
  let found = 0;
  if (tree.nodeCount === 0) return buf.subarray(0, 0);
  const x0 = bounds[0] - tree.origin[0]!, x1 = bounds[1] - tree.origin[0]!;
  const y0 = bounds[2] - tree.origin[1]!, y1 = bounds[3] - tree.origin[1]!;
  const z0 = bounds[4] - tree.origin[2]!, z1 = bounds[5] - tree.origin[2]!;
  const nb = tree.nodeBounds, nr = tree.nodeRef, cb = tree.cellBoxes, order = tree.order;
  const stack = stackFor(tree);
  let sp = 0;
  stack[sp++] = 0;
  while (sp > 0) {
    const i = stack[--sp]!, o = 6 * i;
    const lx = nb[o]!, ly = nb[o + 2]!, lz = nb[o + 4]!;
    if (x1 < lx || x0 > nb[o + 1]! || y1 < ly || y0 > nb[o + 3]! || z1 < lz || z0 > nb[o + 5]!) continue;
    const cnt = nr[2 * i + 1]!;
    if (cnt < 0) { stack[sp++] = nr[2 * i]!; stack[sp++] = i + 1; continue; }
    const wx = (nb[o + 1]! - lx) / 255, wy = (nb[o + 3]! - ly) / 255, wz = (nb[o + 5]! - lz) / 255;
    for (let slot = nr[2 * i]!, end = slot + cnt; slot < end; slot++) {
      const q = 6 * slot;
      if (cb[q]! > cb[q + 1]!) continue;
      if (x1 < lx + cb[q]! * wx || x0 > lx + cb[q + 1]! * wx || y1 < ly + cb[q + 2]! * wy || y0 > ly + cb[q + 3]! * wy
        || z1 < lz + cb[q + 4]! * wz || z0 > lz + cb[q + 5]! * wz) continue;
      if (found === buf.length) { buf = grow(buf, found + 1); if (!out) boxScratch = buf; }
      buf[found++] = order[slot]!;
    }
  }
  return buf.subarray(0, found);
}

let segScratch: Int32Array = new Int32Array(1024);
/** Global ids of cells whose padded box the segment (ax, ay, az) → (bx, by, bz) meets. */
export function cellsAlongSegment(tree: CellTree, ax: number, ay: number, az: number,
  bx: number, by: number, bz: number, out?: Int32Array): Int32Array {
  let buf: Int32Array = out ?? segScratch;
  let found = 0;
  if (tree.nodeCount === 0) return buf.subarray(0, 0);
  const px = ax - tree.origin[0]!, py = ay - tree.origin[1]!, pz = az - tree.origin[2]!;
  const dx = bx - ax, dy = by - ay, dz = bz - az;
  const nb = tree.nodeBounds, nr = tree.nodeRef, cb = tree.cellBoxes, order = tree.order;
  const stack = stackFor(tree);
  let sp = 0;
  stack[sp++] = 0;
  while (sp > 0) {
    const i = stack[--sp]!, o = 6 * i;
    const lx = nb[o]!, ly = nb[o + 2]!, lz = nb[o + 4]!;
    if (!segmentMeetsBox(lx, nb[o + 1]!, ly, nb[o + 3]!, lz, nb[o + 5]!, px, py, pz, dx, dy, dz)) continue;
    const cnt = nr[2 * i + 1]!;
    if (cnt < 0) { stack[sp++] = nr[2 * i]!; stack[sp++] = i + 1; continue; }
    const wx = (nb[o + 1]! - lx) / 255, wy = (nb[o + 3]! - ly) / 255, wz = (nb[o + 5]! - lz) / 255;
    for (let slot = nr[2 * i]!, end = slot + cnt; slot < end; slot++) {
      const q = 6 * slot;
      if (!segmentMeetsBox(lx + cb[q]! * wx, lx + cb[q + 1]! * wx, ly + cb[q + 2]! * wy, ly + cb[q + 3]! * wy,
        lz + cb[q + 4]! * wz, lz + cb[q + 5]! * wz, px, py, pz, dx, dy, dz)) continue;
      if (found === buf.length) { buf = grow(buf, found + 1); if (!out) segScratch = buf; }
      buf[found++] = order[slot]!;
    }
  }
  return buf.subarray(0, found);
}

/**
 * The decoded padded boxes of the cells of leaf `node`, in absolute coordinates, 6 per cell into `out`
 * (slot order); returns the number of cells, or 0 when `node` is not a leaf. For tests and inspection.
 */
export function leafBoxes(tree: CellTree, node: number, out: Float64Array): number {
  const cnt = tree.nodeRef[2 * node + 1]!;
  if (cnt < 0) return 0;
  const nb = tree.nodeBounds, cb = tree.cellBoxes, o = 6 * node, first = tree.nodeRef[2 * node]!;
  for (let j = 0; j < cnt; j++) {
    for (let a = 0; a < 6; a += 2) {
      const lo = nb[o + a]!, w = (nb[o + a + 1]! - lo) / 255, q = 6 * (first + j) + a, org = tree.origin[a >> 1]!;
      out[6 * j + a] = org + lo + cb[q]! * w;
      out[6 * j + a + 1] = org + lo + cb[q + 1]! * w;
    }
  }
  return cnt;
}
