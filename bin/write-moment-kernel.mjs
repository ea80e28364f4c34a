#!/usr/bin/env node
// Writes src/derive/momentKernelWasm.ts: a WebAssembly module (SIMD, f64x2) that fits the quadratic gradient
// (src/derive/quadraticGradient.ts: `fitSums`, then the 9×9 Cholesky solve of solveNine.ts) for two sites at
// once, one per lane. The bytes are assembled here by hand — no toolchain — and written as base64. Every
// product, sum and pivot test is the scalar code's, in its order (no fused multiply-add; a dropped pivot is a
// lane mask), so each lane's gradient is the scalar one to the bit. Run `node bin/write-moment-kernel.mjs`
// after changing this generator; tests/derive/momentKernel.test.ts checks the written file is its output.
//
// Memory (imported as `env.memory` and exported as `memory`; the caller gives a larger memory to a new instance
// instead of growing it: growing detaches the old buffer, which makes V8 check every typed-array access in the
// whole thread from then on), one f64x2 (lane 0 the first site) per value: bytes 0–15
// the two sites' scales 1/h; 16–31 the pivot tolerance; from byte 32 the results: the smallest relative
// pivot (as factorNine returns it), then ∂f_c/∂x_d (component c, direction d: at 32 + 16·(1 + 3c + d), in the
// field's unit per length unit); from byte 1024 the neighbour slots, one per neighbour: offsets dx, dy, dz
// (unscaled) and the value differences Δf of each component. Functions `fit1(n)` and `fit3(n)` (1 or 3
// components) read n slots from the byte address held at CONFIG_AT (SLOTS_AT for a fit fed from JavaScript).
//
// A mesh held in the memory (src/derive/kernelMesh.ts lays it out and writes the byte addresses of its parts
// from CONFIG_AT on, as `CONFIG` says) lets the kernel find and gather each node's ring itself, with no copy
// per neighbour in JavaScript: `incidence(np, c0, c1, phase)` builds the node → cells rows from the cells'
// connectivity (a count, then a fill from the last cell back, so each node's cells come out ascending, as
// stencils.ts has them; in chunks of cells); `one1`/`one3(lane, i)` walk node i's one-ring (the nodes of its cells, cells ascending, nodes in
// connectivity order, i and repeats left out: stencils.ts `pointStencil`'s row) and gather it into lane
// `lane`'s slots — offsets and value differences, the ring statistics and the scale 1/h as pairedFit.ts
// `gather` computes them — then make the one-sided test (RING.skewed), leaving to JavaScript (RING.ask) the
// rare case within BAND of the bound, where squares and Math.hypot might disagree; `two1`/`two3(lane, i,
// fresh)` gather the two-ring (neighbourRing.ts's order) from the one-ring just walked (or walked again). Stamps
// per node and per cell, compared with a counter bumped per walk, leave repeats out without clearing.
//
// Every header address above (scales, tolerance, results, CONFIG, statistics) is taken from the global `base`
// (exported; 0 unless the caller sets it), and every address held in CONFIG is relative to `base`. A private
// memory leaves it at 0. The second module, `momentKernelBytes(true)`, imports a shared memory: several
// instances (one per pool worker, src/derive/sharedKernelMesh.ts) walk one held mesh, each from its own area
// (header, stamps, ring lists, slots at `base` on; the mesh below it, at negative relative addresses that wrap to
// the right bytes), and a gather checks its slots against CONFIG.limit, the end of its area, instead of the memory's size.

import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const SCALE_AT = 0, TOLERANCE_AT = 16, RESULT_AT = 32, CONFIG_AT = 512, STATS_AT = 576, SLOTS_AT = 1024;
/** Byte offsets from CONFIG_AT of the i32 addresses (and the stamp counter) a held mesh uses. */
export const CONFIG = {
  slots: 0, positions: 4, values: 8, connectivity: 12, offsets: 16, incidence: 20, cells: 24, stamps: 28, tick: 32, cellStamps: 36,
  ring1: 40, ring2: 44, n1: 48, need: 52, limit: 56,
};
/** CONFIG fields that hold numbers, not addresses (every other field is an address from `base` on). */
const COUNTS = [CONFIG.tick, CONFIG.n1, CONFIG.need];
/** Byte offsets from STATS_AT of the last gather's f64 statistics: Σdx, Σdy, Σdz over the neighbours apart, their count, 1/h. */
export const STATS = { mx: 0, my: 8, mz: 16, used: 24, ih: 32, oneSided: 40 };
/** What `one` and `two` return besides a slot count. */
export const RING = { none: -1, skewed: -2, ask: -3, room: -4 };
/**
 * The one-sided test's band: the kernel decides |Σd|·(1/h)/used > ONE_SIDED on squares, which may differ from
 * JavaScript's Math.hypot in the last bits; within this relative band of the bound it leaves the test to
 * JavaScript (RING.ask), so the decision is always JavaScript's.
 */
const BAND = 1e-9;

/** WebAssembly binary encoding helpers (LEB128 numbers, names, sections, vectors); bin/write-chunk-kernel.mjs uses them too. */
export const uleb = (n) => { const b = []; do { let x = n & 0x7f; n >>>= 7; if (n) x |= 0x80; b.push(x); } while (n); return b; };
export const sleb = (n) => {
  const b = [];
  for (;;) { const x = n & 0x7f; n >>= 7; if ((n === 0 && !(x & 0x40)) || (n === -1 && x & 0x40)) { b.push(x); return b; } b.push(x | 0x80); }
};
export const name = (s) => [...uleb(s.length), ...Buffer.from(s, 'utf8')];
export const section = (id, body) => [id, ...uleb(body.length), ...body];
export const vec = (items) => [...uleb(items.length), ...items.flat()];

const I32 = 0x7f, V128 = 0x7b;
const simd = (op) => [0xfd, ...uleb(op)];
const OP = { load: 0x00, store: 0x0b, splat: 0x14, lt: 0x49, gt: 0x4a, and: 0x4e, bitselect: 0x52, sqrt: 0xef, add: 0xf0, sub: 0xf1, mul: 0xf2, div: 0xf3 };
const memarg = (offset) => [4, ...uleb(offset)];

/**
 * Slots per step of the fit's loop (see `accumulate`). Measured (the fit of a pair over 26 slots, interleaved
 * in one process): 2 took 0.66–0.72 of one's time, 3 about 0.78, 4 about 0.82 (more values live at once).
 */
const UNROLL = 2;

/** The body of `fit<nc>(n)`. */
function fitBody(nc) {
  const code = [];
  const emit = (...b) => code.push(...b.flat());
  const P_LOCAL = 1, END_LOCAL = 2; // local 0 is n
  const v = {};
  let next = 3;
  /** The v128 local called `k` (made on first use). */
  const V = (k) => (v[k] ??= next++);
  const get = (l) => emit(0x20, uleb(l)), set = (l) => emit(0x21, uleb(l));
  /** Pushes an expression: a local's name, or [op, …operands] (operands pushed in order). */
  const push = (e) => {
    if (typeof e === 'string') { get(V(e)); return; }
    const [o, ...args] = e;
    for (const a of args) push(a);
    emit(simd(OP[o]));
  };
  const let_ = (name, e) => { push(e); set(V(name)); };
  const mul = (a, b) => ['mul', a, b], add = (a, b) => ['add', a, b], sub = (a, b) => ['sub', a, b];
  const splat = (name, bytes) => { emit(0x44, bytes); emit(simd(OP.splat)); set(V(name)); };
  const stride = 16 * (3 + nc);
  // ih = the two scales, tol = the pivot tolerance; p = first slot; end = p + n·stride
  emit(BASE); emit(simd(OP.load), memarg(SCALE_AT)); set(V('ih'));
  emit(BASE); emit(simd(OP.load), memarg(TOLERANCE_AT)); set(V('tol'));
  const f64 = (x) => [...new Uint8Array(new Float64Array([x]).buffer)];
  splat('one', f64(1)); splat('half', f64(0.5)); splat('quarter', f64(0.25));
  emit(BASE); emit(0x28, 2, uleb(CONFIG_AT + CONFIG.slots)); emit(BASE, 0x6a); set(P_LOCAL);
  get(P_LOCAL); get(0); emit(0x41, sleb(stride), 0x6c, 0x6a); set(END_LOCAL);
  // A slot's values and products, in locals named with the suffix `sfx` (slot `k` of the step: bytes from
  // P + k·stride on).
  const slotValues = (sfx, k) => {
    const L = (n) => n + sfx;
    const load = (slot, dst, scaled) => {
      get(P_LOCAL); emit(simd(OP.load), memarg(k * stride + 16 * slot));
      if (scaled) { get(V('ih')); emit(simd(OP.mul)); }
      set(V(L(dst)));
    };
    load(0, 'x', true); load(1, 'y', true); load(2, 'z', true);
    // r2 = x·x + y·y + z·z; w = 1/r2 where r2 > 0, else 0 (a coincident or padding slot adds nothing)
    let_(L('r2'), add(add(mul(L('x'), L('x')), mul(L('y'), L('y'))), mul(L('z'), L('z'))));
    get(V(L('r2'))); emit(0xfd, 0x0c, new Array(16).fill(0)); emit(simd(OP.gt)); set(V(L('mask')));
    let_(L('w'), ['and', ['div', 'one', L('r2')], L('mask')]);
    for (const [n, a, b] of [['wx', 'w', 'x'], ['wy', 'w', 'y'], ['wz', 'w', 'z'], ['wxx', 'wx', 'x'], ['wyy', 'wy', 'y'], ['wzz', 'wz', 'z'],
      ['wxy', 'wx', 'y'], ['wxz', 'wx', 'z'], ['wyz', 'wy', 'z'], ['xx', 'x', 'x'], ['yy', 'y', 'y'], ['zz', 'z', 'z'],
      ['xy', 'x', 'y'], ['xz', 'x', 'z'], ['yz', 'y', 'z']]) let_(L(n), mul(L(a), L(b)));
    for (let c = 0; c < nc; c++) {
      // Δf masked like w, so a non-finite value at a coincident neighbour adds nothing (the scalar code skips it)
      get(P_LOCAL); emit(simd(OP.load), memarg(k * stride + 16 * (3 + c))); get(V(L('mask'))); emit(simd(OP.and)); set(V(L(`g${c}`)));
    }
  };
  // Every sum: [sum, a] adds a, [sum, a, b] adds a·b (operands named without the slot's suffix)
  const sums = [['sxx', 'wxx'], ['syy', 'wyy'], ['szz', 'wzz'], ['sxy', 'wxy'], ['sxz', 'wxz'], ['syz', 'wyz'],
    ['txxx', 'wxx', 'x'], ['txxy', 'wxx', 'y'], ['txxz', 'wxx', 'z'], ['txyy', 'wyy', 'x'], ['tyyy', 'wyy', 'y'],
    ['tyyz', 'wyy', 'z'], ['txzz', 'wzz', 'x'], ['tyzz', 'wzz', 'y'], ['tzzz', 'wzz', 'z'], ['txyz', 'wxy', 'z'],
    ['qxxxx', 'wxx', 'xx'], ['qyyyy', 'wyy', 'yy'], ['qzzzz', 'wzz', 'zz'], ['qxxxy', 'wxx', 'xy'], ['qxxxz', 'wxx', 'xz'],
    ['qxyyy', 'wyy', 'xy'], ['qyyyz', 'wyy', 'yz'], ['qxzzz', 'wzz', 'xz'], ['qyzzz', 'wzz', 'yz'], ['qxxyy', 'wxx', 'yy'],
    ['qxxzz', 'wxx', 'zz'], ['qyyzz', 'wyy', 'zz'], ['qxxyz', 'wxx', 'yz'], ['qxyyz', 'wyy', 'xz'], ['qxyzz', 'wzz', 'xy']];
  const m = ['wx', 'wy', 'wz', 'wxx', 'wyy', 'wzz', 'wxy', 'wxz', 'wyz'];
  for (let c = 0; c < nc; c++) for (let a = 0; a < 9; a++) sums.push([`b${a}_${c}`, m[a], `g${c}`]);
  // each sum takes the step's slots one after the other, in slot order (the scalar code's order): ((s + t0) + t1)
  const accumulate = (sfxs) => {
    for (const [sum, a, b] of sums) for (const x of sfxs) let_(sum, add(sum, b ? mul(a + x, b + x) : a + x));
  };
  // two slots a step: a sum is read and written once per two slots (the ~60 sums do not fit in registers, so
  // each is spilled: one load and one store per step instead of per slot); an odd last slot alone
  const step = Array.from({ length: UNROLL }, (_, k) => `_${k}`);
  emit(0x02, 0x40, 0x03, 0x40); // block, loop
  get(P_LOCAL); emit(0x41, sleb((UNROLL - 1) * stride), 0x6a); get(END_LOCAL); emit(0x4f, 0x0d, 1); // fewer than UNROLL left: br_if 1
  step.forEach((x, k) => slotValues(x, k)); accumulate(step);
  get(P_LOCAL); emit(0x41, sleb(UNROLL * stride), 0x6a); set(P_LOCAL);
  emit(0x0c, 0, 0x0b, 0x0b); // br 0; end loop; end block
  // the last slots one at a time
  emit(0x02, 0x40, 0x03, 0x40);
  get(P_LOCAL); get(END_LOCAL); emit(0x4f, 0x0d, 1);
  slotValues('_0', 0); accumulate(['_0']);
  get(P_LOCAL); emit(0x41, sleb(stride), 0x6a); set(P_LOCAL);
  emit(0x0c, 0, 0x0b, 0x0b);

  // the normal matrix (unknowns g_x, g_y, g_z, H_xx, H_yy, H_zz, H_xy, H_xz, H_yz), as fitSums assembles it
  const M = [['sxx', 'sxy', 'sxz', ['h', 'txxx'], ['h', 'txyy'], ['h', 'txzz'], 'txxy', 'txxz', 'txyz'],
    ['syy', 'syz', ['h', 'txxy'], ['h', 'tyyy'], ['h', 'tyzz'], 'txyy', 'txyz', 'tyyz'],
    ['szz', ['h', 'txxz'], ['h', 'tyyz'], ['h', 'tzzz'], 'txyz', 'txzz', 'tyzz'],
    [['q', 'qxxxx'], ['q', 'qxxyy'], ['q', 'qxxzz'], ['h', 'qxxxy'], ['h', 'qxxxz'], ['h', 'qxxyz']],
    [['q', 'qyyyy'], ['q', 'qyyzz'], ['h', 'qxyyy'], ['h', 'qxyyz'], ['h', 'qyyyz']],
    [['q', 'qzzzz'], ['h', 'qxyzz'], ['h', 'qxzzz'], ['h', 'qyzzz']],
    ['qxxyy', 'qxxyz', 'qxyyz'], ['qxxzz', 'qxyzz'], ['qyyzz']];
  for (let i = 0; i < 9; i++) {
    M[i].forEach((e, k) => {
      const j = i + k;
      let_(`m${i}${j}`, typeof e === 'string' ? e : mul(e[0] === 'h' ? 'half' : 'quarter', e[1]));
    });
  }
  // Cholesky with dropped pivots (solveNine.ts factorNine): a lane whose pivot fails the test gets 1/pivot 0
  // and its worst pivot 0; every value the scalar code computes, the lanes compute alike
  splat('worst', f64(1));
  for (let j = 0; j < 9; j++) {
    let sj = `m${j}${j}`;
    for (let k = 0; k < j; k++) sj = sub(sj, mul(`l${j}${k}`, `l${j}${k}`));
    let_(`s${j}`, sj);
    // cond = s > tol·m && m > 0
    push(['gt', `s${j}`, mul('tol', `m${j}${j}`)]); push(`m${j}${j}`); emit(0xfd, 0x0c, new Array(16).fill(0)); emit(simd(OP.gt));
    emit(simd(OP.and)); set(V('cond'));
    // worst = cond ? (s < worst·m ? s/m : worst) : 0
    push(['div', `s${j}`, `m${j}${j}`]); push('worst'); push(['and', ['lt', `s${j}`, mul('worst', `m${j}${j}`)], 'cond']);
    emit(simd(OP.bitselect)); push('cond'); emit(simd(OP.and)); set(V('worst'));
    let_(`i${j}`, ['and', ['div', 'one', ['sqrt', `s${j}`]], 'cond']);
    for (let i = j + 1; i < 9; i++) {
      let t = `m${j}${i}`;
      for (let k = 0; k < j; k++) t = sub(t, mul(`l${i}${k}`, `l${j}${k}`));
      let_(`l${i}${j}`, mul(t, `i${j}`));
    }
  }
  const store = (k, name) => { emit(BASE); get(V(name)); emit(simd(OP.store), memarg(RESULT_AT + 16 * k)); };
  store(0, 'worst');
  // forward and back substitution per component (solveNine.ts gradientNine), the ½ of the square terms'
  // right-hand sides applied first; the gradient scaled back by ih
  for (let c = 0; c < nc; c++) {
    for (let j = 0; j < 9; j++) {
      let t = j >= 3 && j <= 5 ? mul('half', `b${j}_${c}`) : `b${j}_${c}`;
      for (let k = 0; k < j; k++) t = sub(t, mul(`l${j}${k}`, `z${k}`));
      let_(`z${j}`, mul(t, `i${j}`));
    }
    for (let j = 8; j >= 0; j--) {
      let t = `z${j}`;
      for (let k = j + 1; k < 9; k++) t = sub(t, mul(`l${k}${j}`, `y${k}`));
      let_(`y${j}`, mul(t, `i${j}`));
    }
    for (let d = 0; d < 3; d++) { let_('g', mul(`y${d}`, 'ih')); store(1 + 3 * c + d, 'g'); }
  }
  emit(0x0b);
  const locals = vec([[...uleb(2), I32], [...uleb(next - 3), V128]]);
  const body = [...locals, ...code];
  return [...uleb(body.length), ...body];
}
/**
 * A small assembler for the scalar functions: `a.local(type)` makes a local, and each helper emits one
 * instruction (i32 arithmetic wraps; addresses are compared unsigned).
 */
function assembler(nParams) {
  const code = [], types = [];
  const e = (...b) => code.push(...b.flat());
  const a = {
    code, e,
    local: (t) => { types.push(t); return nParams + types.length - 1; },
    get: (l) => e(0x20, uleb(l)), set: (l) => e(0x21, uleb(l)), tee: (l) => e(0x22, uleb(l)),
    i32: (n) => e(0x41, sleb(n)),
    load: (off = 0) => e(0x28, 2, uleb(off)), store: (off = 0) => e(0x36, 2, uleb(off)),
    fload: (off = 0) => e(0x2b, 3, uleb(off)), fstore: (off = 0) => e(0x39, 3, uleb(off)),
    add: () => e(0x6a), sub: () => e(0x6b), mul: () => e(0x6c), shl: () => e(0x74), shrU: () => e(0x76),
    ne: () => e(0x47), geU: () => e(0x4f), eqz: () => e(0x45),
    fadd: () => e(0xa0), fsub: () => e(0xa1), fmul: () => e(0xa2), fdiv: () => e(0xa3), fsqrt: () => e(0x9f), fgt: () => e(0x64),
    /** A counted loop: `body` runs while local `p` is below local `end` (unsigned), then p += step. */
    each: (p, end, step, body) => {
      e(0x02, 0x40, 0x03, 0x40);
      a.get(p); a.get(end); a.geU(); e(0x0d, 1);
      body();
      a.get(p); a.i32(step); a.add(); a.set(p);
      e(0x0c, 0, 0x0b, 0x0b);
    },
    ifThen: (body) => { e(0x04, 0x40); body(); e(0x0b); },
    /** Pushes the i32 at CONFIG_AT + field. */
    /** Pushes `base` (the start of this instance's header: the first byte of its area of a shared memory, else 0). */
    base: () => e(BASE),
    /** Pushes the CONFIG field `field`: a number, or an address (held relative to `base`) made absolute. */
    config: (field) => { a.base(); a.load(CONFIG_AT + field); if (!COUNTS.includes(field)) { a.base(); a.add(); } },
    finish: () => {
      const groups = [];
      for (const t of types) { if (groups.length && groups[groups.length - 1][1] === t) groups[groups.length - 1][0]++; else groups.push([1, t]); }
      const body = [...vec(groups.map(([n, t]) => [...uleb(n), t])), ...code, 0x0b];
      return [...uleb(body.length), ...body];
    },
  };
  return a;
}

const F64 = 0x7c;
/** `global.get 0`: the instance's `base`. */
const BASE = [0x23, 0];
/** True while the shared-memory module is written (`momentKernelBytes(true)`). */
let SHARED = false;

/**
 * `incidence(np, c0, c1, phase)`: node → cells rows (at CONFIG.incidence: np + 1 starts; ids at CONFIG.cells),
 * built in three phases, the first and last in chunks of cells, so the optimising tier takes over after the
 * first chunks (a function's first call runs to its end in the baseline code): 0 counts the entries of cells
 * c0 .. c1-1 (the counts zeroed first by the caller), 1 sums them (np nodes), 2 fills cells c1-1 down to c0
 * (called from the last chunk back).
 */
function incidenceBody() {
  const a = assembler(4), NP = 0, C0 = 1, C1 = 2, PHASE = 3;
  const A = a.local(I32), conn = a.local(I32), off = a.local(I32), cells = a.local(I32), p = a.local(I32), end = a.local(I32);
  const acc = a.local(I32), q = a.local(I32), c = a.local(I32), lo = a.local(I32), v = a.local(I32);
  // A = the starts' array less two entries: counts go to A[q + 2], so that after the prefix sum A[q + 2] ends
  // node q's list and, after the fill from the back, starts it (the starts then read from A + 2)
  a.config(CONFIG.incidence); a.i32(8); a.sub(); a.set(A);
  a.config(CONFIG.connectivity); a.set(conn); a.config(CONFIG.offsets); a.set(off); a.config(CONFIG.cells); a.set(cells);
  a.get(PHASE); a.eqz();
  a.ifThen(() => {
    // count: every connectivity entry of cells c0 .. c1-1
    a.get(off); a.get(C0); a.i32(2); a.shl(); a.add(); a.load(); a.i32(2); a.shl(); a.get(conn); a.add(); a.set(p);
    a.get(off); a.get(C1); a.i32(2); a.shl(); a.add(); a.load(); a.i32(2); a.shl(); a.get(conn); a.add(); a.set(end);
    a.each(p, end, 4, () => {
      a.get(p); a.load(); a.i32(2); a.shl(); a.get(A); a.add(); a.tee(q);
      a.get(q); a.load(8); a.i32(1); a.add(); a.store(8);
    });
    a.e(0x0f);
  });
  a.get(PHASE); a.i32(1); a.e(0x46); // i32.eq
  a.ifThen(() => {
    // prefix sums over A[2 .. np+1]; A[np+2] = the total
    a.get(A); a.load(8); a.set(acc);
    a.get(A); a.i32(12); a.add(); a.set(p);
    a.get(NP); a.i32(2); a.add(); a.i32(2); a.shl(); a.get(A); a.add(); a.set(end);
    a.each(p, end, 4, () => { a.get(p); a.get(acc); a.get(p); a.load(); a.add(); a.tee(acc); a.store(); });
    a.get(end); a.get(acc); a.store();
    a.e(0x0f);
  });
  // fill from the last cell back, each cell's entries from its last back: each node's cells come out ascending
  a.get(C1); a.set(c);
  a.e(0x02, 0x40, 0x03, 0x40);
  a.get(C0); a.get(c); a.geU(); a.e(0x0d, 1);
  a.get(c); a.i32(1); a.sub(); a.set(c);
  a.get(off); a.get(c); a.i32(2); a.shl(); a.add(); a.tee(p); a.load(); a.i32(2); a.shl(); a.get(conn); a.add(); a.set(lo);
  a.get(p); a.load(4); a.i32(2); a.shl(); a.get(conn); a.add(); a.set(p);
  a.e(0x02, 0x40, 0x03, 0x40);
  a.get(lo); a.get(p); a.geU(); a.e(0x0d, 1);
  a.get(p); a.i32(4); a.sub(); a.tee(p); a.load(); a.i32(2); a.shl(); a.get(A); a.add(); a.tee(q);
  a.get(q); a.load(8); a.i32(1); a.sub(); a.tee(v); a.store(8);
  a.get(v); a.i32(2); a.shl(); a.get(cells); a.add(); a.get(c); a.store();
  a.e(0x0c, 0, 0x0b, 0x0b);
  a.e(0x0c, 0, 0x0b, 0x0b);
  return a.finish();
}

/**
 * Emits the walk of node `node`'s cells: every node of them not yet stamped `tick` is stamped and appended at
 * byte address `n` (n advances). Locals are the caller's.
 */
function emitCellWalk(a, L, node, skipWalkedCells) {
  const { tick, stamps, cellStamps, conn, off, inc, cells, ca, cb, b, be, q, sq, n } = L;
  a.get(node); a.i32(2); a.shl(); a.get(inc); a.add(); a.tee(ca); a.load(4); a.i32(2); a.shl(); a.get(cells); a.add(); a.set(cb);
  a.get(ca); a.load(); a.i32(2); a.shl(); a.get(cells); a.add(); a.set(ca);
  const walkCell = () => {
    a.get(q); a.i32(2); a.shl(); a.get(off); a.add(); a.tee(b); a.load(4); a.i32(2); a.shl(); a.get(conn); a.add(); a.set(be);
    a.get(b); a.load(); a.i32(2); a.shl(); a.get(conn); a.add(); a.set(b);
    a.each(b, be, 4, () => {
      a.get(b); a.load(); a.tee(q); a.i32(2); a.shl(); a.get(stamps); a.add(); a.tee(sq); a.load(); a.get(tick); a.ne();
      a.ifThen(() => { a.get(sq); a.get(tick); a.store(); a.get(n); a.get(q); a.store(); a.get(n); a.i32(4); a.add(); a.set(n); });
    });
  };
  a.each(ca, cb, 4, () => {
    a.get(ca); a.load(); a.set(q);
    if (!skipWalkedCells) { walkCell(); return; }
    // a cell already walked under this tick adds nothing: skip it (a two-ring meets each cell many times; a
    // one-ring meets each once)
    a.get(q); a.i32(2); a.shl(); a.get(cellStamps); a.add(); a.tee(sq); a.load(); a.get(tick); a.ne();
    a.ifThen(() => { a.get(sq); a.get(tick); a.store(); walkCell(); });
  });
}

/** Locals of a ring walk; stamps `first` with a new tick. */
function ringLocals(a, first) {
  const L = {};
  for (const k of ['tick', 'stamps', 'cellStamps', 'conn', 'off', 'inc', 'cells', 'ca', 'cb', 'b', 'be', 'q', 'sq', 'n']) L[k] = a.local(I32);
  a.config(CONFIG.stamps); a.set(L.stamps); a.config(CONFIG.cellStamps); a.set(L.cellStamps); a.config(CONFIG.connectivity); a.set(L.conn); a.config(CONFIG.offsets); a.set(L.off);
  a.config(CONFIG.incidence); a.set(L.inc); a.config(CONFIG.cells); a.set(L.cells);
  a.base(); a.config(CONFIG.tick); a.i32(1); a.add(); a.tee(L.tick); a.store(CONFIG_AT + CONFIG.tick);
  a.get(first); a.i32(2); a.shl(); a.get(L.stamps); a.add(); a.get(L.tick); a.store();
  return L;
}

/** `walk(i, at)`: node i's one-ring to byte address `at`; returns its length. */
function walkBody() {
  const a = assembler(2), I = 0, AT = 1;
  const L = ringLocals(a, I);
  a.get(AT); a.set(L.n);
  emitCellWalk(a, L, I, false);
  a.get(L.n); a.get(AT); a.sub(); a.i32(2); a.shrU();
  return a.finish();
}

/** `twoRing(i, one, n1, at)`: node i's two-ring from its one-ring (n1 ids at `one`) to `at`; returns its length. */
function twoRingBody() {
  const a = assembler(4), I = 0, ONE = 1, N1 = 2, AT = 3;
  const L = ringLocals(a, I), s = a.local(I32), se = a.local(I32), j = a.local(I32);
  a.get(AT); a.set(L.n);
  a.get(ONE); a.set(s); a.get(N1); a.i32(2); a.shl(); a.get(ONE); a.add(); a.set(se);
  a.each(s, se, 4, () => {
    a.get(s); a.load(); a.tee(j); a.i32(2); a.shl(); a.get(L.stamps); a.add(); a.tee(L.sq); a.load(); a.get(L.tick); a.ne();
    a.ifThen(() => { a.get(L.sq); a.get(L.tick); a.store(); a.get(L.n); a.get(j); a.store(); a.get(L.n); a.i32(4); a.add(); a.set(L.n); });
    emitCellWalk(a, L, j, true);
  });
  a.get(L.n); a.get(AT); a.sub(); a.i32(2); a.shrU();
  return a.finish();
}

/** `gather<nc>(lane, i, at, n, test)`: see the file comment. */
function gatherBody(nc) {
  const a = assembler(5), LANE = 0, I = 1, AT = 2, N = 3, TEST = 4;
  const s = a.local(I32), se = a.local(I32), o = a.local(I32), pos = a.local(I32), val = a.local(I32), q = a.local(I32), used = a.local(I32);
  const x0 = a.local(F64), y0 = a.local(F64), z0 = a.local(F64), dx = a.local(F64), dy = a.local(F64), dz = a.local(F64), r2 = a.local(F64);
  const h2 = a.local(F64), mx = a.local(F64), my = a.local(F64), mz = a.local(F64), ih = a.local(F64);
  const f = [a.local(F64), a.local(F64), a.local(F64)];
  const step = 16 * (3 + nc);
  // room for n slots, else RING.room (n left at CONFIG.need for the caller to grow the memory)
  a.config(CONFIG.slots); a.get(N); a.i32(step); a.mul(); a.add();
  // a private memory ends the slots; in a shared memory they end at this area's limit (the next area follows)
  if (SHARED) a.config(CONFIG.limit); else { a.e(0x3f, 0); a.i32(16); a.shl(); }
  a.e(0x4b); // i32.gt_u
  a.ifThen(() => { a.base(); a.get(N); a.store(CONFIG_AT + CONFIG.need); a.i32(RING.room); a.e(0x0f); });
  a.config(CONFIG.positions); a.set(pos); a.config(CONFIG.values); a.set(val);
  a.config(CONFIG.slots); a.get(LANE); a.i32(3); a.shl(); a.add(); a.set(o);
  a.get(I); a.i32(24); a.mul(); a.get(pos); a.add(); a.tee(q); a.fload(0); a.set(x0); a.get(q); a.fload(8); a.set(y0); a.get(q); a.fload(16); a.set(z0);
  a.get(I); a.i32(8 * nc); a.mul(); a.get(val); a.add(); a.set(q);
  for (let c = 0; c < nc; c++) { a.get(q); a.fload(8 * c); a.set(f[c]); }
  // x and y (and the first two value components) as f64x2 pairs: one load and one subtraction for both, each
  // lane the scalar code's value; the sums of x and y in one pair (Σ starts at +0, so adding in lanes is exact)
  const xy0 = a.local(V128), dxy = a.local(V128), mxy = a.local(V128), f01 = a.local(V128), sq = a.local(V128);
  const vload = (off) => a.e(simd(OP.load), 3, uleb(off)), vsub = () => a.e(simd(OP.sub)), vmul = () => a.e(simd(OP.mul));
  const laneStore = (off, lane) => a.e(simd(0x5b), 3, uleb(off), lane), lane = (k) => a.e(simd(0x21), k);
  a.get(I); a.i32(24); a.mul(); a.get(pos); a.add(); vload(0); a.set(xy0);
  if (nc === 3) { a.get(I); a.i32(24); a.mul(); a.get(val); a.add(); vload(0); a.set(f01); }
  a.get(AT); a.set(s); a.get(N); a.i32(2); a.shl(); a.get(AT); a.add(); a.set(se);
  a.each(s, se, 4, () => {
    a.get(s); a.load(); a.i32(24); a.mul(); a.get(pos); a.add(); a.tee(q);
    vload(0); a.get(xy0); vsub(); a.set(dxy);
    a.get(q); a.fload(16); a.get(z0); a.fsub(); a.set(dz);
    a.get(o); a.get(dxy); laneStore(0, 0); a.get(o); a.get(dxy); laneStore(16, 1); a.get(o); a.get(dz); a.fstore(32);
    a.get(s); a.load(); a.i32(8 * nc); a.mul(); a.get(val); a.add(); a.set(q);
    if (nc === 3) {
      a.get(q); vload(0); a.get(f01); vsub(); a.set(sq);
      a.get(o); a.get(sq); laneStore(48, 0); a.get(o); a.get(sq); laneStore(64, 1);
      a.get(o); a.get(q); a.fload(16); a.get(f[2]); a.fsub(); a.fstore(80);
    } else { a.get(o); a.get(q); a.fload(0); a.get(f[0]); a.fsub(); a.fstore(48); }
    // r2 = dx·dx + dy·dy + dz·dz, in the scalar code's order
    a.get(dxy); a.get(dxy); vmul(); a.tee(sq); lane(0); a.get(sq); lane(1); a.fadd(); a.get(dz); a.get(dz); a.fmul(); a.fadd(); a.tee(r2);
    a.e(0x44, f64Bytes(0)); a.fgt();
    a.ifThen(() => {
      a.get(h2); a.get(r2); a.fadd(); a.set(h2);
      a.get(used); a.i32(1); a.add(); a.set(used);
      a.get(mxy); a.get(dxy); a.e(simd(OP.add)); a.set(mxy); a.get(mz); a.get(dz); a.fadd(); a.set(mz);
    });
    a.get(o); a.i32(step); a.add(); a.set(o);
  });
  a.get(mxy); lane(0); a.set(mx); a.get(mxy); lane(1); a.set(my);
  // no neighbour apart from the site: −1
  a.get(used); a.eqz(); a.ifThen(() => { a.i32(-1); a.e(0x0f); });
  // ih = 1 / sqrt(h2 / used), as pairedFit.ts computes it
  a.e(0x44, f64Bytes(1)); a.get(h2); a.get(used); a.e(0xb7); a.fdiv(); a.fsqrt(); a.fdiv(); a.set(ih);
  a.base(); a.get(LANE); a.i32(3); a.shl(); a.add(); a.get(ih); a.fstore(SCALE_AT);
  a.base(); a.get(mx); a.fstore(STATS_AT + STATS.mx); a.base(); a.get(my); a.fstore(STATS_AT + STATS.my);
  a.base(); a.get(mz); a.fstore(STATS_AT + STATS.mz); a.base(); a.get(used); a.e(0xb7); a.fstore(STATS_AT + STATS.used);
  a.base(); a.get(ih); a.fstore(STATS_AT + STATS.ih);
  // the one-sided test, |Σd·ih|² against (ONE_SIDED·used)², decided here only outside the band
  a.get(TEST);
  a.ifThen(() => {
    a.get(mx); a.get(ih); a.fmul(); a.set(dx); a.get(my); a.get(ih); a.fmul(); a.set(dy); a.get(mz); a.get(ih); a.fmul(); a.set(dz);
    a.get(dx); a.get(dx); a.fmul(); a.get(dy); a.get(dy); a.fmul(); a.fadd(); a.get(dz); a.get(dz); a.fmul(); a.fadd(); a.set(r2);
    a.base(); a.fload(STATS_AT + STATS.oneSided); a.get(used); a.e(0xb7); a.fmul(); a.tee(h2); a.get(h2); a.fmul(); a.set(h2);
    a.get(r2); a.e(0x44, f64Bytes(1 + BAND)); a.get(h2); a.fmul(); a.fgt(); a.ifThen(() => { a.i32(RING.skewed); a.e(0x0f); });
    a.get(r2); a.e(0x44, f64Bytes(1 - BAND)); a.get(h2); a.fmul(); a.e(0x63); // f64.lt
    a.eqz(); a.ifThen(() => { a.i32(RING.ask); a.e(0x0f); });
  });
  a.get(N);
  return a.finish();
}

/** `one(lane, i)`: node i's one-ring walked to CONFIG.ring1 (its length kept at CONFIG.n1) and gathered, with the one-sided test. */
function oneBody(walkFn, gatherFn) {
  const a = assembler(2), LANE = 0, I = 1;
  a.base(); a.get(I); a.config(CONFIG.ring1); a.e(0x10, uleb(walkFn)); a.store(CONFIG_AT + CONFIG.n1);
  a.get(LANE); a.get(I); a.config(CONFIG.ring1); a.config(CONFIG.n1); a.i32(1); a.e(0x10, uleb(gatherFn));
  return a.finish();
}

/**
 * `two(lane, i, fresh)`: node i's two-ring to CONFIG.ring2, from its one-ring at CONFIG.ring1 (walked again
 * first when `fresh` is 1), gathered without the one-sided test.
 */
function twoBody(walkFn, twoRingFn, gatherFn) {
  const a = assembler(3), LANE = 0, I = 1, FRESH = 2;
  a.get(FRESH); a.ifThen(() => { a.base(); a.get(I); a.config(CONFIG.ring1); a.e(0x10, uleb(walkFn)); a.store(CONFIG_AT + CONFIG.n1); });
  a.get(LANE); a.get(I); a.config(CONFIG.ring2);
  a.get(I); a.config(CONFIG.ring1); a.config(CONFIG.n1); a.config(CONFIG.ring2); a.e(0x10, uleb(twoRingFn));
  a.i32(0); a.e(0x10, uleb(gatherFn));
  return a.finish();
}

const f64Bytes = (x) => [...new Uint8Array(new Float64Array([x]).buffer)];

/**
 * The module's bytes; `shared`: the variant over a shared memory (imported shared, up to 4 GiB), whose instances
 * each work from their own `base` (a header, stamps, ring lists and slots of their own) on one held mesh.
 */
export function momentKernelBytes(shared = false) {
  SHARED = shared;
  try {
    return moduleBytes(shared);
  } finally {
    SHARED = false;
  }
}

function moduleBytes(shared) {
  return Uint8Array.from([
    0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
    // types: 0 (i32) → (); 1 (i32 ×4) → (); 2 (i32, i32) → i32; 3 (i32, i32, i32, i32) → i32; 4 (i32 ×5) → i32; 5 (i32 ×3) → i32
    ...section(1, vec([[0x60, 1, I32, 0], [0x60, 4, I32, I32, I32, I32, 0], [0x60, 2, I32, I32, 1, I32], [0x60, 4, I32, I32, I32, I32, 1, I32],
      [0x60, 5, I32, I32, I32, I32, I32, 1, I32], [0x60, 3, I32, I32, I32, 1, I32]])),
    // the memory is the caller's (env.memory, at least one page): it is replaced by a larger one rather than grown
    // (shared: flags 3, at least one page and at most 65536; it is grown, never replaced, and growing a shared
    // memory detaches nothing)
    ...section(2, vec([[...name('env'), ...name('memory'), 0x02, ...(shared ? [0x03, 1, ...uleb(65536)] : [0x00, 1])]])),
    // functions 0 fit1, 1 fit3, 2 incidence, 3 walk, 4 twoRing, 5 gather1, 6 gather3, 7 one1, 8 one3, 9 two1, 10 two3
    ...section(3, vec([[0], [0], [1], [2], [3], [4], [4], [2], [2], [5], [5]])),
    // global 0: `base`, mutable i32, 0 until the caller sets it
    ...section(6, vec([[I32, 1, 0x41, 0, 0x0b]])),
    ...section(7, vec([[...name('memory'), 0x02, 0], [...name('base'), 0x03, 0], [...name('fit1'), 0x00, 0], [...name('fit3'), 0x00, 1], [...name('incidence'), 0x00, 2],
      [...name('one1'), 0x00, 7], [...name('one3'), 0x00, 8], [...name('two1'), 0x00, 9], [...name('two3'), 0x00, 10]])),
    ...section(10, vec([fitBody(1), fitBody(3), incidenceBody(), walkBody(), twoRingBody(), gatherBody(1), gatherBody(3),
      oneBody(3, 5), oneBody(3, 6), twoBody(3, 4, 5), twoBody(3, 4, 6)])),
  ]);
}

const base64Lines = (bytes) => Buffer.from(bytes).toString('base64').match(/.{1,100}/g).map((s) => `  '${s}'`).join(' +\n');

export function momentKernelSource() {
  const lines = base64Lines(momentKernelBytes()), sharedLines = base64Lines(momentKernelBytes(true));
  return `/**
 * The WebAssembly SIMD kernel of the quadratic gradient fit (see momentKernel.ts), as base64.
 * Written by bin/write-moment-kernel.mjs — edit the generator, not this file.
 */

/** Byte layout of the kernel's memory (one f64x2 per value): the two scales, the pivot tolerance, the results, the neighbour slots. */
export const KERNEL_LAYOUT = {
  scaleAt: ${SCALE_AT}, toleranceAt: ${TOLERANCE_AT}, resultAt: ${RESULT_AT}, configAt: ${CONFIG_AT}, statsAt: ${STATS_AT}, slotsAt: ${SLOTS_AT},
} as const;

/** Byte offsets from \`configAt\` of the i32 addresses of a mesh held in the kernel's memory, and of its stamp counter. */
export const KERNEL_CONFIG = ${JSON.stringify(CONFIG).replace(/"/g, '').replace(/:/g, ': ').replace(/,/g, ', ').replace('{', '{ ').replace('}', ' }')} as const;

/** Byte offsets from \`statsAt\` of the last gather's statistics (f64) and of the one-sided bound it tests against. */
export const KERNEL_STATS = ${JSON.stringify(STATS).replace(/"/g, '').replace(/:/g, ': ').replace(/,/g, ', ').replace('{', '{ ').replace('}', ' }')} as const;

/** What the kernel's ring calls return besides a slot count: no neighbour apart, one-sided, test left to JavaScript, no room. */
export const KERNEL_RING = ${JSON.stringify(RING).replace(/"/g, '').replace(/:/g, ': ').replace(/,/g, ', ').replace('{', '{ ').replace('}', ' }')} as const;

export const MOMENT_KERNEL_BASE64 =
${lines};

/** The same kernel over a shared memory (imported shared; each instance's header, stamps and slots from its \`base\` on). */
export const MOMENT_KERNEL_SHARED_BASE64 =
${sharedLines};
`;
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) {
  const target = join(dirname(fileURLToPath(import.meta.url)), '..', 'src', 'derive', 'momentKernelWasm.ts');
  writeFileSync(target, momentKernelSource());
  console.log(`wrote ${target} (${momentKernelBytes().length} bytes of WebAssembly)`);
}
