/**
 * A piece's mesh and one point field held in the moment kernel's memory (momentKernel.ts), so the kernel finds
 * and gathers each node's ring itself: no neighbour rows are built in JavaScript and no offset is copied per
 * neighbour (pairedFit.ts `meshInto`). The node → cells rows are built once per mesh by the kernel
 * (`incidence`: two passes over the connectivity) and kept with it; a later field or a later step on the same
 * geometry arrays (a series, src/series/meshReuse.ts) copies only its values.
 *
 * Layout from byte `KERNEL_LAYOUT.slotsAt` on, each part 16-byte aligned: positions (3 f64 per node), values
 * (room for 3 f64 per node), connectivity and cell offsets (i32, as the piece has them), node → cells starts
 * (np + 3 i32, the kernel's fill trick) and cell ids, stamps (i32 per node, then per cell), two ring lists (np i32 each),
 * then the neighbour slots, which grow at the end and are shared with the fit fed from JavaScript.
 *
 * One mesh at a time per thread (the last one asked for). A mesh whose copy would pass MAX_HELD_BYTES is not
 * held (its fit builds rows in JavaScript instead), so a very large file does not keep a second copy of itself
 * in every worker.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';
import { KERNEL_CONFIG, KERNEL_LAYOUT, KERNEL_STATS, kernelBytes, type MomentKernel } from './momentKernel.ts';
import { ONE_SIDED } from './fitTolerances.ts';

/** Largest copy of a mesh the kernel's memory holds (bytes; the kernel addresses at most 4 GiB). */
export const MAX_HELD_BYTES = 1 << 30;

/** A mesh held in the kernel's memory: byte addresses of its ring lists and of the slots after it. */
export interface HeldMesh {
  /** The piece's arrays the copy was made from (weakly: holding a mesh does not keep it alive). */
  readonly points: WeakRef<Float64Array>;
  readonly connectivity: WeakRef<Int32Array>;
  readonly offsets: WeakRef<Int32Array>;
  readonly nodes: number;
  readonly cells: number;
  /** Byte address of neighbour slot 0 (the end of the held mesh). */
  readonly slots: number;
  /** The values array last copied in and its components (null: none yet). */
  values: WeakRef<NumericArray> | null;
  nc: number;
}

let held: HeldMesh | null = null;
const TICK_LIMIT = 1 << 30;

const up16 = (n: number): number => Math.ceil(n / 16) * 16;

/** Byte address of the slots: after the held mesh, or `KERNEL_LAYOUT.slotsAt` when none is held. */
export function slotsBase(): number {
  return held ? held.slots : KERNEL_LAYOUT.slotsAt;
}

/** Byte addresses of the parts of piece `p`'s mesh held from `KERNEL_LAYOUT.slotsAt` on (see the file comment). */
function layout(p: Piece) {
  const np = p.points.length / 3, cells = p.cellTypes.length, conn = p.connectivity.length;
  const pos = KERNEL_LAYOUT.slotsAt, val = pos + up16(24 * np), cn = val + up16(24 * np), off = cn + up16(4 * conn), inc = off + up16(4 * (cells + 1));
  const ids = inc + up16(4 * (np + 3)), stamps = ids + up16(4 * conn), cellStamps = stamps + up16(4 * np);
  const ring1 = cellStamps + up16(4 * cells), ring2 = ring1 + up16(4 * np);
  return { pos, val, cn, off, inc, ids, stamps, cellStamps, ring1, ring2, slots: ring2 + up16(4 * np) };
}

/** True when this thread's kernel holds piece `p`'s mesh now (the same geometry arrays). */
export function isHeld(p: Piece): boolean {
  const h = held;
  return h !== null && h.points.deref() === p.points && h.connectivity.deref() === p.connectivity && h.offsets.deref() === p.offsets;
}

/** True when piece `p`'s mesh is small enough for the kernel to hold (MAX_HELD_BYTES). */
export function holdable(p: Piece): boolean {
  return layout(p).slots <= MAX_HELD_BYTES;
}

/**
 * Holds piece `p`'s mesh and the point field `values` (`nc` = 1 or 3 components per node) in kernel `K`'s
 * memory, reusing what is held already (same geometry arrays; same values array). Returns null when the copy
 * would pass MAX_HELD_BYTES or the memory cannot grow (the caller fits from rows built in JavaScript).
 */
export function holdMesh(K: MomentKernel, p: Piece, values: NumericArray, nc: number): HeldMesh | null {
  const np = p.points.length / 3, cells = p.cellTypes.length;
  let h = held;
  if (!h || !isHeld(p)) {
    held = h = null;
    const { pos, val, cn, off, inc, ids, stamps, cellStamps, ring1, ring2, slots } = layout(p);
    if (slots > MAX_HELD_BYTES) return null;
    // a new memory is all zeros past the header: the stamps and counts need no clearing
    const fresh = K.bytes < slots;
    try {
      // nothing of the memory is kept but the header (every part is written anew)
      kernelBytes(K, slots, KERNEL_LAYOUT.slotsAt);
    } catch {
      return null;
    }
    K.f64.set(p.points, pos / 8);
    K.i32.set(p.connectivity, cn / 4);
    K.i32.set(p.offsets, off / 4);
    if (!fresh) K.i32.fill(0, stamps / 4, cellStamps / 4 + cells);
    const c = (KERNEL_LAYOUT.configAt) / 4, C = KERNEL_CONFIG;
    K.i32[c + C.positions / 4] = pos; K.i32[c + C.values / 4] = val; K.i32[c + C.connectivity / 4] = cn; K.i32[c + C.offsets / 4] = off;
    K.i32[c + C.incidence / 4] = inc + 8; K.i32[c + C.cells / 4] = ids; K.i32[c + C.stamps / 4] = stamps; K.i32[c + C.tick / 4] = 0;
    K.i32[c + C.cellStamps / 4] = cellStamps; K.i32[c + C.ring1 / 4] = ring1; K.i32[c + C.ring2 / 4] = ring2;
    K.f64[(KERNEL_LAYOUT.statsAt + KERNEL_STATS.oneSided) / 8] = ONE_SIDED;
    buildIncidence(K, np, cells, inc, fresh);
    h = { points: new WeakRef(p.points), connectivity: new WeakRef(p.connectivity), offsets: new WeakRef(p.offsets), nodes: np, cells, slots, values: null, nc: 0 };
  }
  if (h.values?.deref() !== values || h.nc !== nc) {
    const val = K.i32[(KERNEL_LAYOUT.configAt + KERNEL_CONFIG.values) / 4]!;
    K.f64.set(values, val / 8);
    h.values = new WeakRef(values); h.nc = nc;
  }
  // the stamps are compared with a counter bumped per walk: start again from 0 long before it wraps
  const t = (KERNEL_LAYOUT.configAt + KERNEL_CONFIG.tick) / 4;
  if (K.i32[t]! > TICK_LIMIT) {
    // node stamps, then cell stamps (laid out one after the other)
    const s = K.i32[(KERNEL_LAYOUT.configAt + KERNEL_CONFIG.stamps) / 4]! / 4, e = K.i32[(KERNEL_LAYOUT.configAt + KERNEL_CONFIG.cellStamps) / 4]! / 4;
    K.i32.fill(0, s, e + cells);
    K.i32[t] = 0;
  }
  held = h;
  return h;
}

/** Cells per call of the kernel's incidence passes (the first calls run in the baseline tier). */
const CHUNK = 1 << 15;

/**
 * The node → cells rows of the mesh kernel `K` holds (its CONFIG set): starts from byte `inc` + 8, np + 3 entries
 * from `inc`; `zeroed`: they are 0 already. Also sharedKernelMesh.ts's.
 */
export function buildIncidence(K: MomentKernel, np: number, cells: number, inc: number, zeroed: boolean): void {
  if (!zeroed) K.i32.fill(0, inc / 4, inc / 4 + np + 3);
  for (let c = 0; c < cells; c += CHUNK) K.incidence(np, c, Math.min(cells, c + CHUNK), 0);
  K.incidence(np, 0, 0, 1);
  for (let c = cells; c > 0; c -= CHUNK) K.incidence(np, Math.max(0, c - CHUNK), c, 2);
}

/** Lets go of the held mesh (its memory is reused by the next). */
export function releaseMesh(): void {
  held = null;
}
