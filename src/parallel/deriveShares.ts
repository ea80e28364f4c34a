/**
 * Derived fields on the worker pool: the velocity gradient — the costly part of vorticity, Q-criterion, λ₂,
 * helicity — is computed by the pool's workers, each filling one contiguous range of nodes of a shared
 * result (`pointGradientRange`, src/derive/rangeGradient.ts), and handed to the gradient cache, so the
 * derived fields are then attached here by the single-thread code without computing it again. Every node's
 * value is the single-thread kernel's, bit for bit, for any number of workers.
 *
 * When only quantities made node by node from the gradient are asked for (vorticity, Q-criterion, λ₂, …; not the
 * gradient itself), each worker computes them for its own range from its range's gradient and writes them into
 * shared arrays (`pool.pointDerived`): the gradient never crosses to this thread and nothing is left to compute
 * here but attaching them (`primeQuantity`).
 *
 * Point velocities only: a cell velocity's gradient (cell-centre fit) is left to the single-thread path.
 */
import type { DeriveOptions, DerivedName } from '../derive/derivedFields.ts';
import { derivedNamesIn, DERIVED_FIELDS, gradientFieldFor, gradientQuantity, hasPrimedQuantity, NODE_QUANTITIES, primeQuantity } from '../derive/derivedFields.ts';
import { pointGradientAt, primeGradient, primeGradientAt } from '../derive/fieldGradient.ts';
import { pointGradientRange, pointGradientRangeInto } from '../derive/rangeGradient.ts';
import { momentKernel } from '../derive/momentKernel.ts';
import { holdable } from '../derive/kernelMesh.ts';
import { attachKernelMesh, buildSharedRows, copySharedNodes, holdsMesh, isAttached, loadValues, openSharedKernelMesh, sharedMeshInto, valuesCopied,
  type SharedKernelMesh, type SharedKernelMeshRef } from '../derive/sharedKernelMesh.ts';
import type { Piece } from '../model/piece.ts';
import type { Dataset } from '../model/dataset.ts';
import { findField } from '../model/piece.ts';
import type { ComputePool } from './pool.ts';
import type { FieldArray, NumericArray } from '../model/fieldArray.ts';
import type { BoundaryFaces } from '../surface/boundaryFaces.ts';
import { findArray, SHEAR_NAME, VELOCITY_NAME } from '../surface/surfaceLoads.ts';
import { wallNodes } from '../surface/wallTraction.ts';
import { WALL_DEFAULTS, type WallOptions } from '../surface/wallQuantities.ts';

/**
 * A worker's part of a gradient of piece `piece`'s point field `field`, into `out`: nodes `from .. to-1` of the
 * piece (`out` in the whole piece's layout) or, with `nodes`, the entries `from .. to-1` of a chosen node list
 * (`nodes` holding just those entries' nodes; `out` in the list's layout).
 */
export interface GradientShare {
  piece: number; field: string; from: number; to: number; out: Float64Array; nodes?: Int32Array;
  /**
   * Instead of the gradient (`out` then unused): quantities of it (NODE_QUANTITIES of derivedFields.ts, the
   * field a velocity) for nodes `from .. to-1`, each into its `out` in the whole piece's layout.
   */
  quantities?: { name: DerivedName; out: Float64Array }[];
  /**
   * The shared kernel mesh (src/derive/sharedKernelMesh.ts) holding this piece and field, by id: the worker fits
   * there when it is attached to it, else on a mesh of its own.
   */
  kernelMesh?: number;
}

/**
 * A worker's part of a shared kernel mesh (src/derive/sharedKernelMesh.ts): its area `area`, and with `copy` the
 * node range `from .. to-1` of piece `piece`'s positions and point field `field` to copy into the mesh first.
 */
export interface KernelMeshShare {
  mesh: SharedKernelMeshRef; area: number; copy?: { piece: number; field: string; from: number; to: number };
}

/**
 * The worker side of `pool.attachKernelMesh`: copies its node range (if any) from the dataset `d` it holds, then
 * attaches to its area. Returns false where the kernel cannot run here.
 */
export function kernelMeshShare(d: Dataset | undefined, s: KernelMeshShare): boolean {
  if (s.copy) {
    const p = d?.pieces[s.copy.piece], f = p && findField(p, s.copy.field, 'point');
    if (!p || !f) throw new Error(`worker pool: no point field "${s.copy.field}" on piece ${s.copy.piece} to copy into the shared kernel mesh`);
    copySharedNodes(s.mesh, p.points, f.values, f.components, s.copy.from, s.copy.to);
  }
  return attachKernelMesh(s.mesh, s.area);
}

/**
 * Runs one share on the dataset a worker holds (the worker side of `pool.pointGradient`). Returns null when
 * `out` is shared memory (the values are already in place), else the range's values (a platform without
 * shared memory posted a copy of `out`).
 */
export function gradientShare(d: Dataset, s: GradientShare): Float64Array | Float64Array[] | null {
  const p = d.pieces[s.piece];
  const f = p && findField(p, s.field, 'point');
  if (!p || !f) throw new Error(`worker pool: no point field "${s.field}" on piece ${s.piece} of ${d.source}`);
  const w = 3 * f.components, nc = f.components;
  const shared = s.kernelMesh !== undefined && !s.nodes && (nc === 1 || nc === 3) && isAttached(s.kernelMesh);
  if (s.quantities) {
    // on the kernel's copy of the mesh (the pool's shared one, or the worker's own), in blocks: a block's gradient
    // stays in the cache, and no gradient array of the whole range is made (its first touch alone cost more than
    // the quantities)
    const block = shared || (momentKernel() && holdable(p)) ? QUANTITY_BLOCK : s.to - s.from;
    return quantityShare(p.points.length / 3, f.values, nc, s, block, shared
      ? (a, b, g) => sharedMeshInto(g, 0, nc, undefined, a, b)
      : (a, b, g) => pointGradientRangeInto(p, f.values, nc, a, b, g, 0));
  }
  if (shared) {
    if (s.out.length !== w * p.points.length / 3) throw new Error(`worker pool: gradient result holds ${s.out.length} values, expected ${w * p.points.length / 3}`);
    sharedMeshInto(s.out, w * s.from, nc, undefined, s.from, s.to);
    return s.out.buffer instanceof ArrayBuffer ? s.out.slice(w * s.from, w * s.to) : null;
  }
  if (s.nodes) {
    if (s.nodes.length !== s.to - s.from || s.out.length < w * s.to) throw new Error(`worker pool: gradient share ${s.from}..${s.to} does not match its ${s.nodes.length} nodes`);
    s.out.set(pointGradientAt(p, f, s.nodes), w * s.from);
  } else pointGradientRange(p, f.values, f.components, s.from, s.to, s.out);
  return s.out.buffer instanceof ArrayBuffer ? s.out.slice(w * s.from, w * s.to) : null;
}

/** Nodes per block of a quantity share: their gradient (9 doubles each, 1.2 MB) stays in the cache. */
const QUANTITY_BLOCK = 16384;

/**
 * The quantities of a share (`s.quantities`), `block` nodes at a time: the block's gradient (`fit(a, b, g)`
 * fills `g` for nodes a .. b-1), then each quantity of it, written into its `out`. Null when every `out` is
 * shared memory, else the range's values per quantity.
 */
function quantityShare(np: number, values: NumericArray, nc: number, s: GradientShare, block: number,
  fit: (a: number, b: number, g: Float64Array) => void): Float64Array[] | null {
  if (nc !== 3) throw new Error(`worker pool: derived quantities need a velocity of 3 components, "${s.field}" has ${nc}`);
  const qs = s.quantities!, comps = qs.map((q) => DERIVED_FIELDS[q.name].components);
  qs.forEach((q, k) => { if (q.out.length !== comps[k]! * np) throw new Error(`worker pool: "${q.name}" result holds ${q.out.length} values, expected ${comps[k]! * np}`); });
  const g = new Float64Array(9 * Math.min(block, s.to - s.from));
  for (let a = s.from; a < s.to; a += block) {
    const b = Math.min(s.to, a + block), gb = g.subarray(0, 9 * (b - a)), u = values.subarray(3 * a, 3 * b);
    fit(a, b, gb);
    qs.forEach((q, k) => gradientQuantity(q.name, gb, u, q.out, comps[k]! * a));
  }
  if (qs.every((q) => !(q.out.buffer instanceof ArrayBuffer))) return null;
  return qs.map((q, k) => q.out.slice(comps[k]! * s.from, comps[k]! * s.to));
}

/**
 * Computes on `pool` what `withDerivedFields(pool.dataset, names, options)` needs of the velocity gradient and
 * primes it: when every requested gradient field is made node by node from it (NODE_QUANTITIES), those
 * quantities, computed by the workers (`primeQuantity`); else the gradient itself (the gradient cache). Does
 * nothing when no requested field needs a gradient, the velocity is cell data, or it is primed already.
 * Returns the number of pieces the workers worked on.
 */
export async function primeDerivedGradients(pool: ComputePool, names: readonly string[], options: Partial<DeriveOptions> = {}): Promise<number> {
  const d = pool.dataset, info = gradientFieldFor(d, names, options);
  if (!info || info.association !== 'point') return 0;
  const wanted = derivedNamesIn(d, names).filter((n) => n === 'velocity-gradient' || NODE_QUANTITIES.includes(n));
  const quantities = wanted.every((n) => NODE_QUANTITIES.includes(n)) ? wanted : null;
  let done = 0;
  for (let k = 0; k < d.pieces.length; k++) {
    const f = findField(d.pieces[k]!, info.name, 'point')!;
    const p = d.pieces[k]!;
    if (quantities) {
      const missing = quantities.filter((n) => !hasPrimedQuantity(f.values, n));
      if (!missing.length) continue;
      const v = await onKernelMesh(pool, k, p, f, (id) => pool.pointDerived(k, info.name, missing.map((name) => ({ name, components: DERIVED_FIELDS[name].components })), id));
      missing.forEach((n, i) => primeQuantity(f.values, n, v[i]!));
    } else primeGradient(f.values, await onKernelMesh(pool, k, p, f, (id) => pool.pointGradient(k, info.name, id)));
    done++;
  }
  return done;
}

/** Each pool's shared kernel mesh (the last piece it held) and its queue of requests (one at a time on it). */
const kernelMeshes = new WeakMap<ComputePool, { mesh: SharedKernelMesh | null; queue: Promise<unknown> }>();

/**
 * Runs `request` with the id of a shared kernel mesh holding piece `p` (number `k`) and field `f` for `pool`'s workers
 * (src/derive/sharedKernelMesh.ts: made once here and handed to every worker, instead of each worker copying the
 * mesh into its own kernel), or with no id where there is none to be had: a pool of one worker (its own copy
 * costs the same and saves this thread's), a field of other than 1 or 3 components, no kernel or shared memory,
 * a mesh too large. Requests on a pool's shared mesh run one at a time, since each may load its field's values.
 */
function onKernelMesh<T>(pool: ComputePool, k: number, p: Piece, f: FieldArray, request: (id: number | undefined) => Promise<T>): Promise<T> {
  let entry = kernelMeshes.get(pool);
  if (!entry) kernelMeshes.set(pool, entry = { mesh: null, queue: Promise.resolve() });
  const e = entry, nc = f.components;
  const run = async (): Promise<T> => {
    if (pool.size < 2 || (nc !== 1 && nc !== 3)) return request(undefined);
    if (!e.mesh || !holdsMesh(e.mesh, p, pool.size)) {
      // the workers copy the positions and values by node range while this thread copies the connectivity and
      // offsets and builds the rows (disjoint bytes); the fits start after both
      e.mesh = null;
      const m = openSharedKernelMesh(p, pool.size);
      if (m) {
        const attached = pool.attachKernelMesh(m.ref, { piece: k, field: f.name });
        buildSharedRows(m, p);
        if (await attached) { valuesCopied(m, f.values, nc); e.mesh = m; }
      }
    }
    if (!e.mesh) return request(undefined);
    loadValues(e.mesh, f.values, nc);
    return request(e.mesh.ref.id);
  };
  const next = e.queue.then(run, run);
  e.queue = next.catch(() => undefined);
  return next;
}

/**
 * Fits the velocity gradient at the wall nodes of the boundary faces `selection` — the gradient `wallQuantities`
 * (and `surfaceLoads`) will read for the second-order wall traction with these `options` — on `pool`'s workers
 * (each a run of the wall nodes, `pool.pointGradientAt`), or on this thread when `pool` is null, and hands it to
 * `pointGradientAt` (`primeGradientAt`), so the wall quantities then computed here do not fit again. Either way
 * the values are the kernel's at each node, bit for bit, so results do not depend on the number of workers.
 * Does nothing (returns 0) when the traction will not come from a point velocity's second-order gradient (a
 * wall-shear array, the first-order route, no μ, no point velocity); errors are left to `wallQuantities`.
 * Returns the number of pieces primed.
 */
export async function primeWallGradients(pool: ComputePool | null, d: Dataset, faces: BoundaryFaces, selection: Int32Array,
  options: Partial<WallOptions> = {}): Promise<number> {
  const o = { ...WALL_DEFAULTS, ...options }, loads = o.loads;
  if (selection.length === 0 || o.viscosity === undefined || loads.wallGradient === 'first-order' || o.source === 'wall-shear') return 0;
  const offsets = new Int32Array(selection.length + 1), used = new Uint8Array(d.pieces.length);
  for (let k = 0; k < selection.length; k++) {
    const f = selection[k]!;
    offsets[k + 1] = offsets[k]! + faces.offsets[f + 1]! - faces.offsets[f]!;
    used[faces.piece[f]!] = 1;
  }
  const pieces = [...used.keys()].filter((k) => used[k]);
  let vel: FieldArray[] | undefined;
  try {
    if (o.source === 'auto' && findArray(d, pieces, loads.wallShear, SHEAR_NAME, 3)) return 0;
    vel = findArray(d, pieces, loads.velocity, VELOCITY_NAME, 3);
  } catch {
    return 0;
  }
  if (!vel || pieces.some((k) => vel![k]!.association !== 'point')) return 0;
  const nodes = wallNodes(d, faces, selection, offsets).perPiece;
  let done = 0;
  for (const k of pieces) {
    const f = vel[k]!, list = nodes[k]!;
    if (!list.length) continue;
    primeGradientAt(f.values, list, pool ? await pool.pointGradientAt(k, f.name, list) : pointGradientAt(d.pieces[k]!, f, list));
    done++;
  }
  return done;
}
