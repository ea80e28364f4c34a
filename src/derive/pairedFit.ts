/**
 * The quadratic gradient fit of quadraticGradient.ts (`fusedInto`, 1 or 3 components) on the WebAssembly SIMD
 * kernel (momentKernel.ts), two sites at a time, one per lane. This file gathers each site's neighbour offsets
 * and value differences into the kernel's slots (the shorter ring padded with empty slots, which add nothing)
 * and its scale; the kernel sums, factorises and solves; this file reads each lane's gradient back. Site
 * choice (one-ring, two-ring when one-sided or ill-conditioned), every product and every sum are the scalar
 * code's, so each site's gradient is the same to the bit (tests/derive/momentKernel.test.ts).
 *
 * For a range of nodes of a piece (`meshInto`) the kernel walks and gathers the rings itself from the mesh it
 * holds (kernelMesh.ts): the rows are not built in JavaScript and nothing is copied per neighbour here; this
 * file keeps the pairing, the one-sided test and the reading of results — same rings, same bits.
 */
import type { NumericArray } from '../model/fieldArray.ts';
import { ONE_SIDED, PIVOT_TOLERANCE, SKEWED, WIDEN_TOLERANCE } from './fitTolerances.ts';
import type { Piece } from '../model/piece.ts';
import { KERNEL_CONFIG, KERNEL_LAYOUT, KERNEL_RING, KERNEL_STATS, kernelSlots, useSlotsAt, type MomentKernel } from './momentKernel.ts';
import { holdMesh, slotsBase } from './kernelMesh.ts';
import { ringIds, twoRing } from './neighbourRing.ts';
import type { Stencil } from './stencils.ts';

/** Per lane: target index, slot count, 1 when the lane holds a one-ring (it may still widen). */
const laneK = new Int32Array(2), laneN = new Int32Array(2), laneOne = new Uint8Array(2);

/** What one call of `pairedInto` works on (module scratch, so the helpers take no long argument lists). */
const job = {
  K: null as unknown as MomentKernel, out: new Float64Array(0) as Float64Array, outStart: 0, positions: new Float64Array(0) as Float64Array,
  values: new Float64Array(0) as NumericArray, nc: 1, so: new Int32Array(0) as Int32Array, sid: new Int32Array(0) as Int32Array,
  targets: undefined as Int32Array | undefined, from: 0, ringSizes: undefined as Int32Array | undefined,
  /** True: rings walked in the mesh the kernel holds; false: rings from `so`/`sid`. Slot 0's byte address. */
  walked: false, slotsAt: 0,
  /** Makes room for `need` slots of `nc` components from byte `at`; returns where the slots are now. */
  room: growSlots,
};

/** The private kernel's `job.room`: a larger memory, the slots where they were (momentKernel.ts `kernelSlots`). */
function growSlots(need: number, nc: number, at: number): number {
  kernelSlots(job.K, need, nc, at);
  return at;
}

/**
 * `gradientInto` for 1 or 3 components on the kernel `K`: the gradients of sites `from .. to-1` (indices into
 * `targets`, or sites themselves) written to `out` from `outStart` on, as quadraticGradient.ts lays them out.
 */
export function pairedInto(K: MomentKernel, out: Float64Array, outStart: number, positions: Float64Array, values: NumericArray,
  nc: number, stencil: Stencil, targets: Int32Array | undefined, from: number, to: number, ringSizes: Int32Array | undefined): void {
  Object.assign(job, { K, out, outStart, positions, values, nc, so: stencil.offsets, sid: stencil.ids, targets, from, ringSizes, walked: false, slotsAt: slotsBase(), room: growSlots });
  pairs(to);
}

/**
 * `pairedInto` for the nodes `from .. to-1` of piece `p` (every node: no node list), with the rings found and
 * gathered by the kernel in the mesh it holds (kernelMesh.ts). Returns false, having written nothing, when the
 * mesh is too large to hold (the caller fits from rows instead).
 */
export function meshInto(K: MomentKernel, out: Float64Array, outStart: number, p: Piece, values: NumericArray, nc: number,
  from: number, to: number, ringSizes: Int32Array | undefined): boolean {
  const mesh = holdMesh(K, p, values, nc);
  if (!mesh) return false;
  walkInto(K, mesh.slots, growSlots, out, outStart, nc, undefined, from, to, ringSizes);
  return true;
}

/**
 * The pairing loop over rings walked by kernel `K` in the mesh it holds (kernelMesh.ts, or a shared one:
 * sharedKernelMesh.ts) for a field of `nc` components held there, for sites `from .. to-1` (indices into
 * `targets`, or nodes themselves), written to `out` from `outStart` on. `slotsAt`: slot 0's byte address (in `K`'s
 * views); `room(need, nc, at)` makes room for `need` slots and returns their address then.
 */
export function walkInto(K: MomentKernel, slotsAt: number, room: (need: number, nc: number, at: number) => number, out: Float64Array,
  outStart: number, nc: number, targets: Int32Array | undefined, from: number, to: number, ringSizes: Int32Array | undefined): void {
  Object.assign(job, { K, out, outStart, nc, targets, from, ringSizes, walked: true, slotsAt, room });
  pairs(to);
}

/**
 * `meshInto` for the chosen nodes `targets` of piece `p` (a wall's nodes), written to `out` from 0 in the list's
 * order (`3·nc` values per entry): each node's ring walked in the held mesh, so no rows are built for the list.
 * False, having written nothing, when the mesh is too large to hold.
 */
export function meshAtInto(K: MomentKernel, out: Float64Array, p: Piece, values: NumericArray, nc: number, targets: Int32Array): boolean {
  const mesh = holdMesh(K, p, values, nc);
  if (!mesh) return false;
  walkInto(K, mesh.slots, growSlots, out, 0, nc, targets, 0, targets.length, undefined);
  return true;
}

/** The pairing loop over `job`'s sites from `job.from` up to `to`: rings from rows, or walked in the held mesh. */
function pairs(to: number): void {
  const held = job.walked;
  try {
    const run = begin();
    let k = job.from;
    while (k < to) {
      let lanes = 0;
      while (lanes < 2 && k < to) { if (held ? prepareHeld(lanes, k) : prepare(lanes, k)) lanes++; k++; }
      if (lanes === 0) break;
      const redo = fitLanes(lanes, run);
      if (redo & 1) (held ? widenHeld : widen)(laneK[0]!, run);
      if (redo & 2) (held ? widenHeld : widen)(laneK[1]!, run);
    }
  } finally {
    end();
  }
}

/**
 * Readies the kernel for `job` (slots after any held mesh, the pivot tolerance); returns its fit for `job.nc`,
 * looked up at each call (making room may put the kernel on a new instance: momentKernel.ts `kernelBytes`).
 */
function begin(): (n: number) => void {
  const { K, nc } = job;
  useSlotsAt(K, job.slotsAt);
  const t = KERNEL_LAYOUT.toleranceAt / 8;
  K.f64[t] = PIVOT_TOLERANCE; K.f64[t + 1] = PIVOT_TOLERANCE;
  return nc === 3 ? fit3 : fit1;
}

const fit3 = (n: number): void => job.K.fit3(n), fit1 = (n: number): void => job.K.fit1(n);

/** Lets go of the caller's arrays, so the module does not keep the last mesh alive. */
function end(): void {
  Object.assign(job, { out: NO_VALUES, positions: NO_VALUES, values: NO_VALUES, so: NO_IDS, sid: NO_IDS, targets: undefined, ringSizes: undefined, walked: false });
}

/**
 * Pads the shorter lane, fits the `lanes` lanes prepared and writes their results; returns the lanes whose
 * one-ring turned out ill-conditioned (bit 0: lane 0, bit 1: lane 1), to be widened.
 */
function fitLanes(lanes: number, run: (n: number) => void): number {
  let n = laneN[0]!;
  if (lanes === 1) clearLane(1, 0, n);
  else if (laneN[1]! < n) clearLane(1, laneN[1]!, n);
  else if (laneN[1]! > n) { clearLane(0, n, laneN[1]!); n = laneN[1]!; }
  run(n);
  return (finish(0) ? 0 : 1) | (lanes === 2 && !finish(1) ? 2 : 0);
}

const NO_VALUES = new Float64Array(0), NO_IDS = new Int32Array(0);

/** Site `i` of target `k`. */
const siteOf = (k: number): number => (job.targets ? job.targets[k]! : k);

/**
 * Gathers target `k`'s ring into lane `lane`: the one-ring, or the two-ring when the one-ring is one-sided or
 * has no neighbour apart from the site. Returns false (the site's result written as NaN) when neither has one.
 */
function prepare(lane: number, k: number): boolean {
  const i = siteOf(k), { so, sid } = job;
  // a node list (a wall's nodes) is mostly one-sided: test the one-ring before writing it into the slots
  let n = job.targets && !fittedApart(i, so[i]!, so[i + 1]!) ? -1 : gather(i, sid, so[i]!, so[i + 1]!, lane, true);
  laneOne[lane] = 1;
  if (n < 0) {
    const m = twoRing(so, sid, i, k);
    n = gather(i, ringIds(), 0, m, lane, false);
    laneOne[lane] = 0;
    if (n < 0) { noResult(k); return false; }
  }
  laneK[lane] = k; laneN[lane] = n;
  return true;
}

/** `prepare` over the held mesh: target k's one-ring walked and gathered by the kernel, its two-ring likewise. */
function prepareHeld(lane: number, k: number): boolean {
  const i = siteOf(k);
  let n = ringHeld(lane, i, 1, 0);
  laneOne[lane] = 1;
  if (n < 0) {
    n = ringHeld(lane, i, 2, 0);
    laneOne[lane] = 0;
    if (n < 0) { noResult(k); return false; }
  }
  laneK[lane] = k; laneN[lane] = n;
  return true;
}

/**
 * Node i's one-ring (`ring` 1, with the one-sided test) or two-ring (2; from the one-ring just walked, or walked
 * again when `fresh` is 1) gathered by the kernel into lane `lane`: the slot count, or < 0 as `gather` returns.
 */
function ringHeld(lane: number, i: number, ring: 1 | 2, fresh: number): number {
  const { K, nc } = job;
  for (;;) {
    const n = ring === 1 ? (nc === 3 ? K.one3(lane, i) : K.one1(lane, i)) : (nc === 3 ? K.two3(lane, i, fresh) : K.two1(lane, i, fresh));
    if (n === KERNEL_RING.room) {
      job.slotsAt = job.room(K.i32[(KERNEL_LAYOUT.configAt + KERNEL_CONFIG.need) / 4]!, nc, job.slotsAt);
      useSlotsAt(K, job.slotsAt); fresh = 1; continue;
    }
    if (n !== KERNEL_RING.ask) return n;
    // near the bound: the one-sided test as `gather` makes it, on the sums the kernel left
    const F = K.f64, s = KERNEL_LAYOUT.statsAt / 8, S = KERNEL_STATS;
    return Math.hypot(F[s + S.mx / 8]!, F[s + S.my / 8]!, F[s + S.mz / 8]!) / F[s + S.used / 8]! * F[s + S.ih / 8]! > ONE_SIDED
      ? SKEWED : laneSlots(K);
  }
}

/** The slot count of the last gather (the kernel left it at CONFIG.n1 for a one-ring). */
const laneSlots = (K: MomentKernel): number => K.i32[(KERNEL_LAYOUT.configAt + KERNEL_CONFIG.n1) / 4]!;

/** Refits target `k` over its two-ring (its one-ring was ill-conditioned), alone in lane 0. */
function widen(k: number, run: (n: number) => void): void {
  const i = siteOf(k), m = twoRing(job.so, job.sid, i, k);
  refit(k, gather(i, ringIds(), 0, m, 0, false), run);
}

/** `widen` over the held mesh (target k's two-ring walked and gathered by the kernel). */
function widenHeld(k: number, run: (n: number) => void): void {
  refit(k, ringHeld(0, siteOf(k), 2, 1), run);
}

/** Fits target `k` alone in lane 0 over the `n` slots gathered there (none: NaN). */
function refit(k: number, n: number, run: (n: number) => void): void {
  if (n < 0) { noResult(k); return; }
  laneK[0] = k; laneN[0] = n; laneOne[0] = 0;
  clearLane(1, 0, n);
  run(n);
  finish(0);
}

function noResult(k: number): void {
  const w = 3 * job.nc, ob = job.outStart + (k - job.from) * w;
  for (let c = 0; c < w; c++) job.out[ob + c] = NaN;
  if (job.ringSizes) job.ringSizes[k] = 0;
}

/**
 * Writes the offsets and value differences of site `i`'s neighbours `list[lo .. hi-1]` into lane `lane`'s
 * slots and its scale 1/h (as fitSums computes them). Returns the slot count, −1 when no neighbour lies
 * apart from the site, SKEWED when `skipOneSided` and the ring is one-sided.
 */
function gather(i: number, list: Int32Array, lo: number, hi: number, lane: number, skipOneSided: boolean): number {
  const { K, positions, values, nc } = job, n = hi - lo;
  const step = 2 * (3 + nc), first = kernelSlots(K, n, nc, job.slotsAt) + lane, F = K.f64;
  const x0 = positions[3 * i]!, y0 = positions[3 * i + 1]!, z0 = positions[3 * i + 2]!;
  let h2 = 0, used = 0, mx = 0, my = 0, mz = 0;
  // offsets and value differences in one pass over the ring (a one-sided one-ring's values are written and
  // then not fitted: a few boundary nodes, against a second walk of every ring)
  if (nc === 3) {
    const f0 = values[3 * i]!, f1 = values[3 * i + 1]!, f2 = values[3 * i + 2]!;
    for (let s = lo, o = first; s < hi; s++, o += step) {
      const j = list[s]!, q = 3 * j, dx = positions[q]! - x0, dy = positions[q + 1]! - y0, dz = positions[q + 2]! - z0;
      F[o] = dx; F[o + 2] = dy; F[o + 4] = dz;
      F[o + 6] = values[q]! - f0; F[o + 8] = values[q + 1]! - f1; F[o + 10] = values[q + 2]! - f2;
      const r2 = dx * dx + dy * dy + dz * dz;
      if (r2 > 0) { h2 += r2; used++; mx += dx; my += dy; mz += dz; }
    }
  } else {
    const f0 = values[i]!;
    for (let s = lo, o = first; s < hi; s++, o += step) {
      const j = list[s]!, q = 3 * j, dx = positions[q]! - x0, dy = positions[q + 1]! - y0, dz = positions[q + 2]! - z0;
      F[o] = dx; F[o + 2] = dy; F[o + 4] = dz; F[o + 6] = values[j]! - f0;
      const r2 = dx * dx + dy * dy + dz * dz;
      if (r2 > 0) { h2 += r2; used++; mx += dx; my += dy; mz += dz; }
    }
  }
  if (used === 0) return -1;
  const ih = 1 / Math.sqrt(h2 / used);
  if (skipOneSided && Math.hypot(mx, my, mz) / used * ih > ONE_SIDED) return SKEWED;
  F[KERNEL_LAYOUT.scaleAt / 8 + lane] = ih;
  return n;
}

/**
 * False when `gather(i, sid, lo, hi, …, true)` would return −1 or SKEWED (the same sums in the same order),
 * without writing anything.
 */
function fittedApart(i: number, lo: number, hi: number): boolean {
  const { positions, sid } = job;
  const x0 = positions[3 * i]!, y0 = positions[3 * i + 1]!, z0 = positions[3 * i + 2]!;
  let h2 = 0, used = 0, mx = 0, my = 0, mz = 0;
  for (let s = lo; s < hi; s++) {
    const q = 3 * sid[s]!, dx = positions[q]! - x0, dy = positions[q + 1]! - y0, dz = positions[q + 2]! - z0;
    const r2 = dx * dx + dy * dy + dz * dz;
    if (r2 > 0) { h2 += r2; used++; mx += dx; my += dy; mz += dz; }
  }
  return used > 0 && !(Math.hypot(mx, my, mz) / used * (1 / Math.sqrt(h2 / used)) > ONE_SIDED);
}

/** Empties lane `lane`'s slots `a .. b-1` (padding: a zero offset adds nothing to any sum). */
function clearLane(lane: number, a: number, b: number): void {
  const { K, nc } = job, step = 2 * (3 + nc), F = K.f64, first = job.slotsAt / 8 + lane;
  for (let t = a, o = first + a * step; t < b; t++, o += step) for (let e = 0; e < step; e += 2) F[o + e] = 0;
}

/**
 * Reads lane `lane`'s fit from the kernel: unless a one-ring turns out ill-conditioned (returns false: the caller
 * widens it), writes the site's gradient and ring size.
 */
function finish(lane: number): boolean {
  const { K, nc } = job, F = K.f64, r = KERNEL_LAYOUT.resultAt / 8 + lane;
  const ok = F[r]!;
  if (laneOne[lane] && !(ok >= WIDEN_TOLERANCE)) return false;
  const k = laneK[lane]!, w = 3 * nc, ob = job.outStart + (k - job.from) * w, out = job.out;
  if (job.ringSizes) job.ringSizes[k] = laneN[lane]!;
  for (let c = 0; c < w; c++) out[ob + c] = F[r + 2 + 2 * c]!;
  return true;
}
