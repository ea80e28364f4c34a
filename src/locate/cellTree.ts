/**
 * A flat bounding-volume tree over the bounds of every cell of a dataset (all pieces, global cell numbers
 * as in `cellStarts`), built once per dataset on first need and shared by every probe and the cut.
 *
 * Build: cells are sorted by the Morton code of their box centre (mortonOrder.ts); the tree is split
 * top-down over that order at the highest Morton bit that differs in a range (so children are spatially
 * separated), falling back to the middle of the range when that split would leave a side with fewer than
 * max(LEAF/2, n/8) cells — which bounds the depth by O(log n) and the node count by 4n/LEAF. Ranges of
 * at most LEAF cells become leaves. Besides what the tree keeps, the build allocates only the cells' padded
 * boxes (24 bytes a cell, dropped after the build; first touch of fresh memory is a large part of the
 * cost): the radix sort runs in the node-box array before it holds boxes.
 *
 * Layout (everything the tree keeps, all typed arrays; boxes are `[xmin, xmax, ymin, ymax, zmin, zmax]`):
 *  - `order`: Int32Array(n), tree slot → global cell id. The cells of a leaf occupy consecutive slots.
 *  - `nodeRef`: Int32Array(2 · nodes). Nodes are stored in depth-first pre-order, so the left child of an
 *    inner node `i` is `i + 1`. Leaf: `nodeRef[2i] = first slot`, `nodeRef[2i+1] = cell count (≥ 1)`.
 *    Inner node: `nodeRef[2i] = index of the right child`, `nodeRef[2i+1] = −1`.
 *  - `nodeBounds`: Float32Array (6 per node, first 6 · nodes entries used; its capacity is the radix
 *    sort's scratch during the build), node → box of its cells, relative to `origin` (the centre of the
 *    dataset's bounds, so Float32 keeps its precision far from 0).
 *  - `cellBoxes`: Uint8Array(6n), slot → the cell's box quantised within its leaf's box: with leaf box
 *    [L, L + E] on an axis, the cell spans L + lo·E/255 … L + hi·E/255 (lo rounded down, hi up).
 * Every cell box is padded outward by PAD × the cell's largest extent plus the Float32 rounding before
 * it is stored, so a box never misses a point of its cell, nor one within PAD of it. Walks (queries in
 * treeWalks.ts) go by index with an explicit stack: no recursion, no objects. Coordinates are in the
 * file's length unit.
 */
import { cellDimension, CellType } from '../model/cellTypes.ts';
import { datasetBounds, isEmptyBounds } from '../model/bounds.ts';
import { cellStarts, type Dataset } from '../model/dataset.ts';
import { geometryOnly, meshKey, type MeshKey } from '../model/meshKey.ts';
import type { Piece } from '../model/piece.ts';
import { scratchFloat32 } from '../model/scratchMemory.ts';
import { uniformSize } from '../model/uniformCells.ts';
import { lattice, MORTON, radixSort30 } from './mortonOrder.ts';

export { cellsAlongSegment, cellsAtPoint, cellsCrossingPlane, cellsInBox, leafBoxes } from './treeWalks.ts';

/** Most cells per leaf. */
export const LEAF = 8;
/** Outward padding of each cell box, relative to the cell's largest extent: the largest locate tolerance honoured. */
export const PAD = 1e-4;

export interface CellTree {
  readonly dataset: Dataset;
  /** Cells indexed: every cell of every piece. */
  readonly cellCount: number;
  /** Cells of dimension 3 (the ones point location can return). */
  readonly volumeCellCount: number;
  /** `cellStarts(dataset)`: global id → piece. */
  readonly starts: Int32Array;
  /** Boxes are stored relative to this point (x, y, z). */
  readonly origin: Float64Array;
  readonly nodeCount: number;
  /** Deepest node (root = 0); walks need a stack of maxDepth + 2 entries. */
  readonly maxDepth: number;
  readonly order: Int32Array;
  readonly nodeRef: Int32Array;
  readonly nodeBounds: Float32Array;
  readonly cellBoxes: Uint8Array;
  /** Bytes of every array the tree keeps (order, nodeRef, nodeBounds, cellBoxes, starts, origin). */
  readonly bytes: number;
  /** Wall time of the build in milliseconds, and of its phases (for the benchmark). */
  readonly buildMs: number;
  readonly buildPhasesMs: Readonly<Record<'codes' | 'sort' | 'split' | 'boxes', number>>;
}

const cache = new WeakMap<MeshKey, CellTree>();

/**
 * The tree of a dataset, built on first call and cached by the dataset's mesh (`meshKey`): datasets that
 * share their geometry arrays (steps of a series on one mesh) share one tree. The cached tree keeps only
 * the geometry (`geometryOnly`), never a step's fields.
 */
export function getCellTree(dataset: Dataset): CellTree {
  const key = meshKey(dataset);
  let t = cache.get(key);
  if (!t) { t = buildCellTree(geometryOnly(dataset)); cache.set(key, t); }
  return t;
}

/** Whether the tree of a dataset (or of another dataset on the same mesh) is already built. */
export function hasCellTree(dataset: Dataset): boolean {
  return cache.has(meshKey(dataset));
}

/** Builds a tree without touching the cache (for benchmarks). */
export function buildCellTree(dataset: Dataset): CellTree {
  const t0 = performance.now();
  const starts = cellStarts(dataset);
  const n = starts[starts.length - 1]!;
  const db = datasetBounds(dataset);
  const empty = isEmptyBounds(db);
  const ox = empty ? 0 : 0.5 * (db[0] + db[1]), oy = empty ? 0 : 0.5 * (db[2] + db[3]), oz = empty ? 0 : 0.5 * (db[4] + db[5]);
  const half = empty ? 1 : 0.5 * Math.max(db[1] - db[0], db[3] - db[2], db[5] - db[4]) || 1;
  // Covers Float32 rounding of any coordinate relative to the origin (|v| ≤ √3·half, error ≤ 2^-24·|v|), twice over.
  const roundPad = 2.4e-7 * half;

  const order = new Int32Array(n);
  const nodeCap = n === 0 ? 0 : n <= LEAF ? 1 : 2 * Math.ceil((2 * n) / LEAF) - 1;
  // Kept by the tree, but it is also the sort's scratch, written whole in the first passes: outside malloc too.
  const nodeBounds = scratchFloat32(Math.max(6 * nodeCap, 3 * n));
  const buf = nodeBounds.buffer;
  const codes = new Uint32Array(buf, 0, n), keyB = new Uint32Array(buf, 4 * n, n), valB = new Int32Array(buf, 8 * n, n);
  // Each phase is its own function: V8 optimises a hot loop by on-stack replacement, and a phase sharing
  // a function with loops that have not run yet would drop back to the interpreter when it reached them.
  // Padded cell boxes (Float32, relative to the origin), by global id: computed in the sequential pass, so
  // the boxes pass, which visits cells in Morton order, reads 24 bytes per cell instead of its points.
  // Scratch memory outside malloc (scratchMemory.ts): its first touch cost the 10M build most of its extra time.
  const boxes = scratchFloat32(6 * n);
  let volumeCells = 0;
  for (let k = 0; k < dataset.pieces.length; k++) {
    volumeCells += mortonCodes(dataset.pieces[k]!, starts[k]!, ox, oy, oz, 511.5 / half, roundPad, codes, boxes);
  }
  iota(order);
  const t1 = performance.now();
  radixSort30(codes, order, keyB, valB);
  const t2 = performance.now();
  const { count: nodeCount, maxDepth } = splitRanges(codes, null);
  const nodeRef = new Int32Array(2 * nodeCount);
  splitRanges(codes, nodeRef);
  const t3 = performance.now();
  // From here the node-box array holds boxes; the sorted codes are no longer needed.
  const cellBoxes = new Uint8Array(6 * n);
  boxesBottomUp(boxes, order, nodeRef, nodeCount, nodeBounds, cellBoxes);
  const t4 = performance.now();
  const origin = Float64Array.of(ox, oy, oz);
  const bytes = order.byteLength + nodeRef.byteLength + nodeBounds.byteLength + cellBoxes.byteLength + starts.byteLength + origin.byteLength;
  return {
    dataset, cellCount: n, volumeCellCount: volumeCells, starts, origin, nodeCount, maxDepth,
    order, nodeRef, nodeBounds, cellBoxes, bytes,
    buildMs: performance.now() - t0, buildPhasesMs: { codes: t1 - t0, sort: t2 - t1, split: t3 - t2, boxes: t4 - t3 },
  };
}

/** 1 for volume cell types, by type number. */
const DIM3 = (() => {
  const t = new Uint8Array(256);
  for (let i = 0; i < 256; i++) t[i] = cellDimension(i) === 3 ? 1 : 0;
  return t;
})();

function iota(a: Int32Array): void {
  for (let i = 0; i < a.length; i++) a[i] = i;
}

/** Point-id range of cell c: its connectivity, or a polyhedron's face stream when it has none. */
function idsOf(p: Piece, c: number, out: Int32Array): Int32Array {
  const a = p.offsets[c]!, b = p.offsets[c + 1]!;
  if (a === b && p.cellTypes[c] === CellType.POLYHEDRON && p.polyFaces) {
    const pf = p.polyFaces;
    out[0] = pf.faceOffsets[pf.cellFaceStart[c]!]!; out[1] = pf.faceOffsets[pf.cellFaceStart[c + 1]!]!;
    return pf.faceConnectivity;
  }
  out[0] = a; out[1] = b;
  return p.connectivity;
}
const RANGE = new Int32Array(2);

/**
 * Morton code of each cell's box centre (piece `p`, global ids from `g0`): a 1024³ lattice over ±half
 * around (ox, oy, oz), `scale` = 511.5/half; and the cell's padded box relative to the origin into `boxes`
 * (6 per global id; an inverted box for a cell without points, which gets code 0). Returns the piece's
 * count of volume cells.
 */
function mortonCodes(p: Piece, g0: number, ox: number, oy: number, oz: number, scale: number, roundPad: number, codes: Uint32Array, boxes: Float32Array): number {
  const pts = p.points, types = p.cellTypes, off = p.offsets, conn = p.connectivity, nc = types.length;
  // Pieces of only tetrahedra or only hexahedra: fixed stride through connectivity, no type or offset reads.
  const m = uniformSize(types, off), base = off[0] ?? 0;
  let volume = m > 0 ? nc : 0;
  for (let c = 0; c < nc; c++) {
    let a = base + m * c, b = a + m, ids = conn;
    if (m === 0) {
      const type = types[c]!;
      volume += DIM3[type]!;
      a = off[c]!; b = off[c + 1]!;
      if (a === b && type === CellType.POLYHEDRON) { ids = idsOf(p, c, RANGE); a = RANGE[0]!; b = RANGE[1]!; }
    }
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity, z0 = Infinity, z1 = -Infinity;
    for (let q = a; q < b; q++) {
      const i = 3 * ids[q]!, x = pts[i]!, y = pts[i + 1]!, z = pts[i + 2]!;
      if (x < x0) x0 = x; if (x > x1) x1 = x;
      if (y < y0) y0 = y; if (y > y1) y1 = y;
      if (z < z0) z0 = z; if (z > z1) z1 = z;
    }
    const g = g0 + c, o = 6 * g;
    if (x0 > x1) {
      codes[g] = 0;
      boxes[o] = Infinity; boxes[o + 1] = -Infinity; boxes[o + 2] = Infinity; boxes[o + 3] = -Infinity; boxes[o + 4] = Infinity; boxes[o + 5] = -Infinity;
      continue;
    }
    codes[g] = MORTON[lattice(((x0 + x1) * 0.5 - ox) * scale)]!
      | (MORTON[lattice(((y0 + y1) * 0.5 - oy) * scale)]! << 1) | (MORTON[lattice(((z0 + z1) * 0.5 - oz) * scale)]! << 2);
    let ext = x1 - x0;
    if (y1 - y0 > ext) ext = y1 - y0;
    if (z1 - z0 > ext) ext = z1 - z0;
    ext = ext * PAD + roundPad;
    boxes[o] = x0 - ox - ext; boxes[o + 1] = x1 - ox + ext;
    boxes[o + 2] = y0 - oy - ext; boxes[o + 3] = y1 - oy + ext;
    boxes[o + 4] = z0 - oz - ext; boxes[o + 5] = z1 - oz + ext;
  }
  return volume;
}

/**
 * Splits the Morton-sorted slots into the node hierarchy (layout in the file comment). With `ref` null it
 * only counts the nodes (so `ref` can be allocated at its exact size).
 */
function splitRanges(codes: Uint32Array, ref: Int32Array | null): { count: number; maxDepth: number } {
  const n = codes.length;
  if (n === 0) return { count: 0, maxDepth: 0 };
  // Stack entries: lo, hi, node whose right-child slot waits for this node (−1 if none), depth.
  let stack = new Int32Array(4 * 256);
  let sp = 1, nodes = 0, maxDepth = 0;
  stack[0] = 0; stack[1] = n; stack[2] = -1; stack[3] = 0;
  while (sp > 0) {
    sp--;
    const lo = stack[4 * sp]!, hi = stack[4 * sp + 1]!, parent = stack[4 * sp + 2]!, depth = stack[4 * sp + 3]!;
    const i = nodes++;
    if (ref && parent >= 0) ref[2 * parent] = i;
    if (depth > maxDepth) maxDepth = depth;
    const size = hi - lo;
    if (size <= LEAF) { if (ref) { ref[2 * i] = lo; ref[2 * i + 1] = size; } continue; }
    if (ref) ref[2 * i + 1] = -1;
    const minSide = Math.max(LEAF >> 1, Math.ceil(size / 8));
    let m = (lo + hi) >> 1;
    const c0 = codes[lo]!, c1 = codes[hi - 1]!;
    if (c0 !== c1) {
      const bit = 31 - Math.clz32(c0 ^ c1);
      // First slot in the range whose code has `bit` set (all share the higher bits).
      let a = lo + 1, b = hi - 1;
      while (a < b) { const mid = (a + b) >> 1; if ((codes[mid]! >>> bit) & 1) b = mid; else a = mid + 1; }
      if (a - lo >= minSide && hi - a >= minSide) m = a;
    }
    if (4 * (sp + 2) > stack.length) { const s2 = new Int32Array(stack.length * 2); s2.set(stack); stack = s2; }
    stack[4 * sp] = m; stack[4 * sp + 1] = hi; stack[4 * sp + 2] = i; stack[4 * sp + 3] = depth + 1; sp++;
    stack[4 * sp] = lo; stack[4 * sp + 1] = m; stack[4 * sp + 2] = -1; stack[4 * sp + 3] = depth + 1; sp++;
  }
  return { count: nodes, maxDepth };
}

/**
 * Node boxes bottom-up (pre-order walked backwards meets children before parents). A leaf's box is the
 * union of its cells' padded boxes (`boxes`, by global id); then each cell box is quantised within it.
 * Storing a cell box as Float32 rounds it by at most 2^-24 of its coordinate, which the padding covers
 * (`roundPad`); the union and the outward quantisation add no rounding.
 */
function boxesBottomUp(boxes: Float32Array, order: Int32Array, nodeRef: Int32Array, nodeCount: number, nb: Float32Array, cellBoxes: Uint8Array): void {
  for (let i = nodeCount - 1; i >= 0; i--) {
    const cnt = nodeRef[2 * i + 1]!, o = 6 * i;
    if (cnt < 0) {
      const l = 6 * (i + 1), r = 6 * nodeRef[2 * i]!;
      nb[o] = Math.min(nb[l]!, nb[r]!); nb[o + 1] = Math.max(nb[l + 1]!, nb[r + 1]!);
      nb[o + 2] = Math.min(nb[l + 2]!, nb[r + 2]!); nb[o + 3] = Math.max(nb[l + 3]!, nb[r + 3]!);
      nb[o + 4] = Math.min(nb[l + 4]!, nb[r + 4]!); nb[o + 5] = Math.max(nb[l + 5]!, nb[r + 5]!);
      continue;
    }
    const first = nodeRef[2 * i]!;
    let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity, z0 = Infinity, z1 = -Infinity;
    for (let j = 0; j < cnt; j++) {
      const b = 6 * order[first + j]!;
      if (boxes[b]! < x0) x0 = boxes[b]!; if (boxes[b + 1]! > x1) x1 = boxes[b + 1]!;
      if (boxes[b + 2]! < y0) y0 = boxes[b + 2]!; if (boxes[b + 3]! > y1) y1 = boxes[b + 3]!;
      if (boxes[b + 4]! < z0) z0 = boxes[b + 4]!; if (boxes[b + 5]! > z1) z1 = boxes[b + 5]!;
    }
    nb[o] = x0; nb[o + 1] = x1; nb[o + 2] = y0; nb[o + 3] = y1; nb[o + 4] = z0; nb[o + 5] = z1;
    const sx = 255 / (x1 - x0), sy = 255 / (y1 - y0), sz = 255 / (z1 - z0);
    for (let j = 0; j < cnt; j++) {
      const q = 6 * (first + j), b = 6 * order[first + j]!;
      if (boxes[b]! > boxes[b + 1]!) {
        // A cell without points: an inverted box that nothing meets.
        cellBoxes[q] = 255; cellBoxes[q + 1] = 0; cellBoxes[q + 2] = 255; cellBoxes[q + 3] = 0; cellBoxes[q + 4] = 255; cellBoxes[q + 5] = 0;
        continue;
      }
      cellBoxes[q] = quantLo((boxes[b]! - x0) * sx); cellBoxes[q + 1] = quantHi((boxes[b + 1]! - x0) * sx);
      cellBoxes[q + 2] = quantLo((boxes[b + 2]! - y0) * sy); cellBoxes[q + 3] = quantHi((boxes[b + 3]! - y0) * sy);
      cellBoxes[q + 4] = quantLo((boxes[b + 4]! - z0) * sz); cellBoxes[q + 5] = quantHi((boxes[b + 5]! - z0) * sz);
    }
  }
}

/** Quantum at or below u (a position in 1/255 steps of the leaf box), clamped to 0..255; 0 when u is NaN. */
function quantLo(u: number): number {
  return u > 0 ? (u < 255 ? u | 0 : 255) : 0;
}

/** Quantum at or above u, clamped to 0..255; 255 when u is NaN (a leaf box of zero width). */
function quantHi(u: number): number {
  if (!(u < 255)) return 255;
  if (!(u > 0)) return 0;
  const q = u | 0;
  return q < u ? q + 1 : q;
}
