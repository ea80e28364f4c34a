/**
 * The quadratic gradient fit of quadraticGradient.ts (`fusedInto`, 1 or 3 components) with the moments and
 * right-hand sides summed by the WebAssembly SIMD kernel (momentKernel.ts), two sites at a time, one per lane.
 * This file gathers each site's neighbour offsets and value differences into the kernel's slots (the shorter
 * ring padded with empty slots, which add nothing), runs the kernel, then assembles, factorises and solves
 * each lane's system as the scalar code does. Site choice (one-ring, two-ring when one-sided or
 * ill-conditioned), every product and every sum are the scalar code's, so each site's gradient is the same to
 * the bit (tests/derive/momentKernel.test.ts).
 */
import type { NumericArray } from '../model/fieldArray.ts';
import { ONE_SIDED, PIVOT_TOLERANCE, SKEWED, WIDEN_TOLERANCE } from './fitTolerances.ts';
import { KERNEL_LAYOUT, kernelSlots, type MomentKernel } from './momentKernel.ts';
import { ringIds, twoRing } from './neighbourRing.ts';
import { factorNine, gradientNine } from './solveNine.ts';
import type { Stencil } from './stencils.ts';

const Mp = new Float64Array(45);
const Lp = new Float64Array(45);
const inv = new Float64Array(9);
const B = new Float64Array(27);
const Y = new Float64Array(27);
/** Per lane: target index, slot count, scale 1/h, 1 when the lane holds a one-ring (it may still widen). */
const laneK = new Int32Array(2), laneN = new Int32Array(2), laneOne = new Uint8Array(2);
const laneIh = new Float64Array(2);

/** What one call of `pairedInto` works on (module scratch, so the helpers take no long argument lists). */
const job = {
  K: null as unknown as MomentKernel, out: new Float64Array(0), outStart: 0, positions: new Float64Array(0),
  values: new Float64Array(0) as NumericArray, nc: 1, so: new Int32Array(0), sid: new Int32Array(0),
  targets: undefined as Int32Array | undefined, from: 0, ringSizes: undefined as Int32Array | undefined,
};

/**
 * `gradientInto` for 1 or 3 components on the kernel `K`: the gradients of sites `from .. to-1` (indices into
 * `targets`, or sites themselves) written to `out` from `outStart` on, as quadraticGradient.ts lays them out.
 */
export function pairedInto(K: MomentKernel, out: Float64Array, outStart: number, positions: Float64Array, values: NumericArray,
  nc: number, stencil: Stencil, targets: Int32Array | undefined, from: number, to: number, ringSizes: Int32Array | undefined): void {
  Object.assign(job, { K, out, outStart, positions, values, nc, so: stencil.offsets, sid: stencil.ids, targets, from, ringSizes });
  const run = nc === 3 ? K.sums3 : K.sums1;
  let k = from;
  while (k < to) {
    let lanes = 0;
    while (lanes < 2 && k < to) { if (prepare(lanes, k)) lanes++; k++; }
    if (lanes === 0) break;
    let n = laneN[0]!;
    if (lanes === 1) clearLane(1, 0, n);
    else if (laneN[1]! < n) clearLane(1, laneN[1]!, n);
    else if (laneN[1]! > n) { clearLane(0, n, laneN[1]!); n = laneN[1]!; }
    run(n);
    const redo0 = !finish(0), redo1 = lanes === 2 && !finish(1);
    if (redo0) widen(laneK[0]!, run);
    if (redo1) widen(laneK[1]!, run);
  }
}

/** Site `i` of target `k`. */
const siteOf = (k: number): number => (job.targets ? job.targets[k]! : k);

/**
 * Gathers target `k`'s ring into lane `lane`: the one-ring, or the two-ring when the one-ring is one-sided or
 * has no neighbour apart from the site. Returns false (the site's result written as NaN) when neither has one.
 */
function prepare(lane: number, k: number): boolean {
  const i = siteOf(k), { so, sid } = job;
  let n = gather(i, sid, so[i]!, so[i + 1]!, lane, true);
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

/** Refits target `k` over its two-ring (its one-ring was ill-conditioned), alone in lane 0. */
function widen(k: number, run: (n: number) => void): void {
  const i = siteOf(k), { so, sid } = job;
  const m = twoRing(so, sid, i, k);
  const n = gather(i, ringIds(), 0, m, 0, false);
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
  const step = 2 * (3 + nc), first = kernelSlots(K, n, nc) + lane, F = K.f64;
  const x0 = positions[3 * i]!, y0 = positions[3 * i + 1]!, z0 = positions[3 * i + 2]!;
  const three = nc === 3;
  const f0 = values[i * nc]!, f1 = three ? values[i * nc + 1]! : 0, f2 = three ? values[i * nc + 2]! : 0;
  let h2 = 0, used = 0, mx = 0, my = 0, mz = 0;
  for (let s = lo, o = first; s < hi; s++, o += step) {
    const j = list[s]!, q = 3 * j, dx = positions[q]! - x0, dy = positions[q + 1]! - y0, dz = positions[q + 2]! - z0;
    F[o] = dx; F[o + 2] = dy; F[o + 4] = dz;
    const r2 = dx * dx + dy * dy + dz * dz;
    if (r2 > 0) { h2 += r2; used++; mx += dx; my += dy; mz += dz; }
    const v = j * nc;
    F[o + 6] = values[v]! - f0;
    if (three) { F[o + 8] = values[v + 1]! - f1; F[o + 10] = values[v + 2]! - f2; }
  }
  if (used === 0) return -1;
  const ih = 1 / Math.sqrt(h2 / used);
  if (skipOneSided && Math.hypot(mx, my, mz) / used * ih > ONE_SIDED) return SKEWED;
  F[KERNEL_LAYOUT.scaleAt / 8 + lane] = ih;
  laneIh[lane] = ih;
  return n;
}

/** Empties lane `lane`'s slots `a .. b-1` (padding: a zero offset adds nothing to any sum). */
function clearLane(lane: number, a: number, b: number): void {
  const { K, nc } = job, step = 2 * (3 + nc), F = K.f64, first = KERNEL_LAYOUT.slotsAt / 8 + lane;
  for (let t = a, o = first + a * step; t < b; t++, o += step) for (let e = 0; e < step; e += 2) F[o + e] = 0;
}

/**
 * Assembles and factorises lane `lane`'s normal equations from the kernel's sums and, unless a one-ring turns
 * out ill-conditioned (returns false: the caller widens it), solves them and writes the site's gradient.
 */
function finish(lane: number): boolean {
  const { K, nc } = job, S = K.f64, b = KERNEL_LAYOUT.sumsAt / 8 + lane;
  const sxx = S[b]!, syy = S[b + 2]!, szz = S[b + 4]!, sxy = S[b + 6]!, sxz = S[b + 8]!, syz = S[b + 10]!;
  const txxx = S[b + 12]!, txxy = S[b + 14]!, txxz = S[b + 16]!, txyy = S[b + 18]!, tyyy = S[b + 20]!, tyyz = S[b + 22]!;
  const txzz = S[b + 24]!, tyzz = S[b + 26]!, tzzz = S[b + 28]!, txyz = S[b + 30]!;
  const qxxxx = S[b + 32]!, qyyyy = S[b + 34]!, qzzzz = S[b + 36]!, qxxxy = S[b + 38]!, qxxxz = S[b + 40]!, qxyyy = S[b + 42]!;
  const qyyyz = S[b + 44]!, qxzzz = S[b + 46]!, qyzzz = S[b + 48]!, qxxyy = S[b + 50]!, qxxzz = S[b + 52]!, qyyzz = S[b + 54]!;
  const qxxyz = S[b + 56]!, qxyyz = S[b + 58]!, qxyzz = S[b + 60]!;
  Mp[0] = sxx; Mp[1] = sxy; Mp[2] = sxz; Mp[3] = 0.5 * txxx; Mp[4] = 0.5 * txyy; Mp[5] = 0.5 * txzz; Mp[6] = txxy; Mp[7] = txxz; Mp[8] = txyz;
  Mp[9] = syy; Mp[10] = syz; Mp[11] = 0.5 * txxy; Mp[12] = 0.5 * tyyy; Mp[13] = 0.5 * tyzz; Mp[14] = txyy; Mp[15] = txyz; Mp[16] = tyyz;
  Mp[17] = szz; Mp[18] = 0.5 * txxz; Mp[19] = 0.5 * tyyz; Mp[20] = 0.5 * tzzz; Mp[21] = txyz; Mp[22] = txzz; Mp[23] = tyzz;
  Mp[24] = 0.25 * qxxxx; Mp[25] = 0.25 * qxxyy; Mp[26] = 0.25 * qxxzz; Mp[27] = 0.5 * qxxxy; Mp[28] = 0.5 * qxxxz; Mp[29] = 0.5 * qxxyz;
  Mp[30] = 0.25 * qyyyy; Mp[31] = 0.25 * qyyzz; Mp[32] = 0.5 * qxyyy; Mp[33] = 0.5 * qxyyz; Mp[34] = 0.5 * qyyyz;
  Mp[35] = 0.25 * qzzzz; Mp[36] = 0.5 * qxyzz; Mp[37] = 0.5 * qxzzz; Mp[38] = 0.5 * qyzzz;
  Mp[39] = qxxyy; Mp[40] = qxxyz; Mp[41] = qxyyz;
  Mp[42] = qxxzz; Mp[43] = qxyzz;
  Mp[44] = qyyzz;
  const ok = factorNine(Mp, Lp, inv, PIVOT_TOLERANCE);
  if (laneOne[lane] && !(ok >= WIDEN_TOLERANCE)) return false;
  const k = laneK[lane]!, w = 3 * nc, ob = job.outStart + (k - job.from) * w, ih = laneIh[lane]!, out = job.out;
  if (job.ringSizes) job.ringSizes[k] = ok < 0 ? 0 : laneN[lane]!;
  for (let c = 0, r = b + 62; c < nc; c++, r += 18) {
    const o = 9 * c;
    B[o] = S[r]!; B[o + 1] = S[r + 2]!; B[o + 2] = S[r + 4]!; B[o + 3] = 0.5 * S[r + 6]!; B[o + 4] = 0.5 * S[r + 8]!;
    B[o + 5] = 0.5 * S[r + 10]!; B[o + 6] = S[r + 12]!; B[o + 7] = S[r + 14]!; B[o + 8] = S[r + 16]!;
    gradientNine(Lp, inv, B, Y, o);
    out[ob + 3 * c] = Y[o]! * ih; out[ob + 3 * c + 1] = Y[o + 1]! * ih; out[ob + 3 * c + 2] = Y[o + 2]! * ih;
  }
  return true;
}
