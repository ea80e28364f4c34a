/**
 * One copy of a piece's mesh and point field for every worker of a pool, in a shared WebAssembly memory: the
 * moment kernel's held mesh (kernelMesh.ts) made once for the pool instead of once per worker.
 * The pool's thread opens the memory (`openSharedKernelMesh`), copies the connectivity and offsets and has the
 * kernel build the node → cells rows there (`buildSharedRows`), while each worker copies its node range of the
 * positions and the field, as doubles (`copySharedNodes`, op `kernelMesh` of src/parallel/shareHost.ts);
 * `makeSharedKernelMesh` does all of it on one thread. Each worker then works on it through an instance of the
 * shared-memory kernel module (bin/write-moment-kernel.mjs, `momentKernelBytes(true)`) whose `base` is the start of the worker's own area:
 * its header, its stamps per node and per cell, its two ring lists and its slots. Every address an instance
 * keeps in its CONFIG is relative to its `base` (the mesh, below the areas, at negative offsets), so the kernel's
 * code and the JavaScript around it (pairedFit.ts `walkInto`) are those of the private kernel: the same rings,
 * the same sums, the same bits.
 *
 * Layout (bytes): 0–1023 the pool thread's header; then positions (3 f64 per node), values (3 f64 per node),
 * connectivity and offsets (i32 as the piece has them), the node → cells starts (np + 3 i32) and cell ids, each
 * 16-byte aligned; then one area per worker (4096-aligned): header (KERNEL_LAYOUT.slotsAt bytes), node stamps,
 * cell stamps, ring1, ring2, then AREA_SLOTS slots of 3 components. A ring needing more slots grows the memory
 * and moves that worker's slots to the new end (growing a shared memory detaches nothing).
 */
import type { NumericArray } from '../model/fieldArray.ts';
import type { Piece } from '../model/piece.ts';
import { KERNEL_CONFIG, KERNEL_LAYOUT, KERNEL_STATS, momentKernel, sharedMomentKernel, sharedViews, type MomentKernel } from './momentKernel.ts';
import { buildIncidence, MAX_HELD_BYTES } from './kernelMesh.ts';
import { ONE_SIDED } from './fitTolerances.ts';
import { walkInto } from './pairedFit.ts';

/** What a worker needs of a shared kernel mesh (structured-clonable: the memory is shared, not copied). */
export interface SharedKernelMeshRef {
  /** This mesh's number (a worker keeps the last one attached). */
  id: number;
  memory: WebAssembly.Memory;
  nodes: number;
  cells: number;
  /** Byte addresses of the held parts: positions, values, connectivity, offsets, node → cells starts (np + 3 i32 from `inc`), cell ids. */
  parts: { pos: number; val: number; cn: number; off: number; inc: number; ids: number };
  /** Byte address of each worker's area. */
  areas: number[];
}

/** The pool thread's side of a shared kernel mesh. */
export interface SharedKernelMesh {
  readonly ref: SharedKernelMeshRef;
  readonly points: WeakRef<Float64Array>;
  readonly connectivity: WeakRef<Int32Array>;
  readonly offsets: WeakRef<Int32Array>;
  /** The values array last copied in and its components (null: none yet). */
  values: WeakRef<NumericArray> | null;
  nc: number;
}

/** Slots (of 3 components, 96 bytes each) an area starts with: a two-ring of tetrahedra rarely passes a few hundred. */
const AREA_SLOTS = 4096;
const SLOT_BYTES = 16 * (3 + 3);
const PAGE = 65536;
let nextId = 1;

const up16 = (n: number): number => Math.ceil(n / 16) * 16;
const up4k = (n: number): number => Math.ceil(n / 4096) * 4096;

/** Byte offsets within an area (from its start): header, node stamps, cell stamps, ring lists, slots, end. */
function areaLayout(np: number, cells: number) {
  const stamps = KERNEL_LAYOUT.slotsAt, cellStamps = stamps + up16(4 * np), ring1 = cellStamps + up16(4 * cells), ring2 = ring1 + up16(4 * np);
  const slots = ring2 + up16(4 * np);
  return { stamps, cellStamps, ring1, ring2, slots, end: up4k(slots + AREA_SLOTS * SLOT_BYTES) };
}

/**
 * Holds piece `p`'s mesh in a new shared memory with `workers` areas (see the file comment), its node → cells
 * rows built here. Null where the kernel is missing, shared memories are not to be had (no cross-origin
 * isolation in a browser), or the mesh with its areas would pass MAX_HELD_BYTES + one area per worker.
 */
export function makeSharedKernelMesh(p: Piece, workers: number): SharedKernelMesh | null {
  const m = openSharedKernelMesh(p, workers);
  if (m) { copySharedNodes(m.ref, p.points, null, 0, 0, m.ref.nodes); buildSharedRows(m, p); }
  return m;
}

/**
 * The memory of a shared kernel mesh for piece `p` and `workers` workers, its header written and nothing copied
 * yet: the positions (and a field's values) go in by node range (`copySharedNodes`, which the pool's workers run
 * side by side), the connectivity, offsets and rows by `buildSharedRows`. Null as for `makeSharedKernelMesh`.
 */
export function openSharedKernelMesh(p: Piece, workers: number): SharedKernelMesh | null {
  if (!momentKernel() || typeof SharedArrayBuffer === 'undefined') return null;
  const np = p.points.length / 3, cells = p.cellTypes.length, conn = p.connectivity.length;
  const pos = KERNEL_LAYOUT.slotsAt, val = pos + up16(24 * np), cn = val + up16(24 * np), off = cn + up16(4 * conn);
  const inc = off + up16(4 * (cells + 1)), ids = inc + up16(4 * (np + 3)), first = up4k(ids + up16(4 * conn));
  const area = areaLayout(np, cells).end, total = first + workers * area;
  if (first > MAX_HELD_BYTES || total > MAX_HELD_BYTES + workers * area) return null;
  let memory: WebAssembly.Memory, K: MomentKernel | null;
  try {
    memory = new WebAssembly.Memory({ initial: Math.ceil(total / PAGE), maximum: 65536, shared: true } as WebAssembly.MemoryDescriptor);
    K = sharedMomentKernel(memory, 0);
  } catch {
    return null;
  }
  if (!K) return null;
  const c = KERNEL_LAYOUT.configAt / 4, C = KERNEL_CONFIG;
  K.i32[c + C.connectivity / 4] = cn; K.i32[c + C.offsets / 4] = off; K.i32[c + C.incidence / 4] = inc + 8; K.i32[c + C.cells / 4] = ids;
  hosts.set(memory, K);
  const ref: SharedKernelMeshRef = {
    id: nextId++, memory, nodes: np, cells, parts: { pos, val, cn, off, inc, ids },
    areas: Array.from({ length: workers }, (_, w) => first + w * area),
  };
  return { ref, points: new WeakRef(p.points), connectivity: new WeakRef(p.connectivity), offsets: new WeakRef(p.offsets), values: null, nc: 0 };
}

/** The pool thread's kernel instance over each shared mesh's memory (base 0: the rows are built through it). */
const hosts = new WeakMap<WebAssembly.Memory, MomentKernel>();

/** Copies piece `p`'s connectivity and offsets into `m` (opened by `openSharedKernelMesh`) and builds its node → cells rows there. */
export function buildSharedRows(m: SharedKernelMesh, p: Piece): void {
  const K = hosts.get(m.ref.memory)!, { cn, off, inc } = m.ref.parts;
  K.i32.set(p.connectivity, cn / 4);
  K.i32.set(p.offsets, off / 4);
  // a new memory is all zeros: the counts need no clearing
  buildIncidence(K, m.ref.nodes, m.ref.cells, inc, true);
}

/**
 * Copies the positions of nodes `from .. to-1` (`points`: the whole piece's, 3 per node) into the shared mesh
 * `ref`, and the values of a point field of `nc` components at those nodes (`values`: the whole field; null: no
 * values). Any thread may copy any range, several at once: ranges write disjoint bytes.
 */
export function copySharedNodes(ref: SharedKernelMeshRef, points: NumericArray, values: NumericArray | null, nc: number, from: number, to: number): void {
  const b = ref.memory.buffer, { pos, val } = ref.parts;
  new Float64Array(b, pos + 24 * from, 3 * (to - from)).set(points.subarray(3 * from, 3 * to));
  if (values) new Float64Array(b, val + 8 * nc * from, nc * (to - from)).set(values.subarray(nc * from, nc * to));
}

/** Records that `values` (`nc` components) are in `m` already (copied by node ranges with `copySharedNodes`). */
export function valuesCopied(m: SharedKernelMesh, values: NumericArray, nc: number): void {
  m.values = new WeakRef(values); m.nc = nc;
}

/** True when `m` holds piece `p`'s mesh (the same geometry arrays) and room for `workers` workers. */
export function holdsMesh(m: SharedKernelMesh, p: Piece, workers: number): boolean {
  return m.points.deref() === p.points && m.connectivity.deref() === p.connectivity && m.offsets.deref() === p.offsets && m.ref.areas.length >= workers;
}

/**
 * Copies the point field `values` (`nc` = 1 or 3 components) into `m`, unless it is the array copied last. No
 * worker may be fitting on `m` meanwhile (the caller runs one request on it at a time).
 */
export function loadValues(m: SharedKernelMesh, values: NumericArray, nc: number): void {
  if (m.values?.deref() === values && m.nc === nc) return;
  new Float64Array(m.ref.memory.buffer, m.ref.parts.val, nc * m.ref.nodes).set(values);
  m.values = new WeakRef(values); m.nc = nc;
}

/** A worker's attachment: its kernel instance over the shared memory, and where its slots are. */
interface Attached { id: number; K: MomentKernel; ref: SharedKernelMeshRef; slotsAt: number; base: number }
let attached: Attached | null = null;

const TICK_LIMIT = 1 << 30;

/**
 * A worker takes `ref` for its own, working in the area at byte `base` (one of `ref.areas`): an instance of the
 * shared-memory kernel, its CONFIG pointing at the mesh and at its area. Returns false where the kernel cannot
 * run here (the worker then holds meshes itself, kernelMesh.ts).
 */
export function attachKernelMesh(ref: SharedKernelMeshRef, base: number): boolean {
  attached = null;
  const K = sharedMomentKernel(ref.memory, base);
  if (!K) return false;
  const a = areaLayout(ref.nodes, ref.cells), { pos, val, cn, off, inc, ids } = ref.parts;
  const c = KERNEL_LAYOUT.configAt / 4, C = KERNEL_CONFIG;
  // addresses relative to this instance's base; the mesh lies below it (negative, wrapping to the right address)
  K.i32[c + C.positions / 4] = pos - base; K.i32[c + C.values / 4] = val - base; K.i32[c + C.connectivity / 4] = cn - base;
  K.i32[c + C.offsets / 4] = off - base; K.i32[c + C.incidence / 4] = inc + 8 - base; K.i32[c + C.cells / 4] = ids - base;
  // the stamp counter is left as the area has it (0 in a new memory): an area taken again keeps its stamps
  K.i32[c + C.stamps / 4] = a.stamps; K.i32[c + C.cellStamps / 4] = a.cellStamps;
  K.i32[c + C.ring1 / 4] = a.ring1; K.i32[c + C.ring2 / 4] = a.ring2; K.i32[c + C.limit / 4] = a.end;
  K.f64[(KERNEL_LAYOUT.statsAt + KERNEL_STATS.oneSided) / 8] = ONE_SIDED;
  attached = { id: ref.id, K, ref, slotsAt: a.slots, base };
  return true;
}

/** True when this worker is attached to the shared kernel mesh numbered `id`. */
export function isAttached(id: number): boolean {
  return attached?.id === id;
}

/**
 * The gradient of the field held in the attached shared mesh (`nc` components, as loaded by the pool's thread)
 * at nodes `from .. to-1` (or, with `targets`, at entries `from .. to-1` of that node list), written to `out`
 * from `outStart` on, as pairedFit.ts `walkInto` writes it: the private kernel's values, bit for bit.
 */
export function sharedMeshInto(out: Float64Array, outStart: number, nc: number, targets: Int32Array | undefined, from: number, to: number): void {
  const a = attached;
  if (!a) throw new Error('gradient: no shared kernel mesh is attached to this worker');
  // the stamps are compared with a counter bumped per walk: start again from 0 long before it wraps
  const t = (KERNEL_LAYOUT.configAt + KERNEL_CONFIG.tick) / 4, K = a.K;
  if (K.i32[t]! > TICK_LIMIT) {
    const l = areaLayout(a.ref.nodes, a.ref.cells);
    K.i32.fill(0, l.stamps / 4, l.ring1 / 4);
    K.i32[t] = 0;
  }
  walkInto(K, a.slotsAt, moveSlots, out, outStart, nc, targets, from, to, undefined);
}

/**
 * `walkInto`'s room in a shared memory: grows the memory by enough pages for `need` slots (with a quarter more),
 * copies this worker's slots (lane 0 may be gathered already) to the start of the pages it got and points its
 * CONFIG there. Returns the slots' new address (relative to the area).
 */
function moveSlots(need: number, nc: number, at: number): number {
  const a = attached!, K = a.K, c = (KERNEL_LAYOUT.configAt + KERNEL_CONFIG.limit) / 4;
  const bytes = need * 16 * (3 + nc), limit = K.i32[c]!, pages = Math.ceil((bytes + (bytes >> 2)) / PAGE);
  // the pages from the old end on are this worker's, whoever else grows the memory at the same time
  const start = K.memory.grow(pages) * PAGE - a.base;
  sharedViews(K);
  K.f64.copyWithin(start / 8, at / 8, limit / 8);
  K.i32[c] = start + pages * PAGE;
  a.slotsAt = start;
  return start;
}
