#!/usr/bin/env node
// Writes src/derive/momentKernelWasm.ts: a WebAssembly module (SIMD, f64x2) that fits the quadratic gradient
// (src/derive/quadraticGradient.ts: `fitSums`, then the 9×9 Cholesky solve of solveNine.ts) for two sites at
// once, one per lane. The bytes are assembled here by hand — no toolchain — and written as base64. Every
// product, sum and pivot test is the scalar code's, in its order (no fused multiply-add; a dropped pivot is a
// lane mask), so each lane's gradient is the scalar one to the bit. Run `node bin/write-moment-kernel.mjs`
// after changing this generator; tests/derive/momentKernel.test.ts checks the written file is its output.
//
// Memory (exported as `memory`, grown by the caller), one f64x2 (lane 0 the first site) per value: bytes 0–15
// the two sites' scales 1/h; 16–31 the pivot tolerance; from byte 32 the results: the smallest relative
// pivot (as factorNine returns it), then ∂f_c/∂x_d (component c, direction d: at 32 + 16·(1 + 3c + d), in the
// field's unit per length unit); from byte 1024 the neighbour slots, one per neighbour: offsets dx, dy, dz
// (unscaled) and the value differences Δf of each component. Functions `fit1(n)` and `fit3(n)` (1 or 3
// components) read n slots.
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const SCALE_AT = 0, TOLERANCE_AT = 16, RESULT_AT = 32, SLOTS_AT = 1024;

const uleb = (n) => { const b = []; do { let x = n & 0x7f; n >>>= 7; if (n) x |= 0x80; b.push(x); } while (n); return b; };
const sleb = (n) => {
  const b = [];
  for (;;) { const x = n & 0x7f; n >>= 7; if ((n === 0 && !(x & 0x40)) || (n === -1 && x & 0x40)) { b.push(x); return b; } b.push(x | 0x80); }
};
const name = (s) => [...uleb(s.length), ...Buffer.from(s, 'utf8')];
const section = (id, body) => [id, ...uleb(body.length), ...body];
const vec = (items) => [...uleb(items.length), ...items.flat()];

const I32 = 0x7f, V128 = 0x7b;
const simd = (op) => [0xfd, ...uleb(op)];
const OP = { load: 0x00, store: 0x0b, splat: 0x14, lt: 0x49, gt: 0x4a, and: 0x4e, bitselect: 0x52, sqrt: 0xef, add: 0xf0, sub: 0xf1, mul: 0xf2, div: 0xf3 };
const memarg = (offset) => [4, ...uleb(offset)];

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
  emit(0x41, sleb(0)); emit(simd(OP.load), memarg(SCALE_AT)); set(V('ih'));
  emit(0x41, sleb(0)); emit(simd(OP.load), memarg(TOLERANCE_AT)); set(V('tol'));
  const f64 = (x) => [...new Uint8Array(new Float64Array([x]).buffer)];
  splat('one', f64(1)); splat('half', f64(0.5)); splat('quarter', f64(0.25));
  emit(0x41, sleb(SLOTS_AT)); set(P_LOCAL);
  get(P_LOCAL); get(0); emit(0x41, sleb(stride), 0x6c, 0x6a); set(END_LOCAL);
  emit(0x02, 0x40, 0x03, 0x40); // block, loop
  get(P_LOCAL); get(END_LOCAL); emit(0x4f, 0x0d, 1); // i32.ge_u; br_if 1
  const load = (slot, dst, scaled) => {
    get(P_LOCAL); emit(simd(OP.load), memarg(16 * slot));
    if (scaled) { get(V('ih')); emit(simd(OP.mul)); }
    set(V(dst));
  };
  load(0, 'x', true); load(1, 'y', true); load(2, 'z', true);
  // r2 = x·x + y·y + z·z; w = 1/r2 where r2 > 0, else 0 (a coincident or padding slot adds nothing)
  let_('r2', add(add(mul('x', 'x'), mul('y', 'y')), mul('z', 'z')));
  get(V('r2')); emit(0xfd, 0x0c, new Array(16).fill(0)); emit(simd(OP.gt)); set(V('mask'));
  let_('w', ['and', ['div', 'one', 'r2'], 'mask']);
  for (const [n, a, b] of [['wx', 'w', 'x'], ['wy', 'w', 'y'], ['wz', 'w', 'z'], ['wxx', 'wx', 'x'], ['wyy', 'wy', 'y'], ['wzz', 'wz', 'z'],
    ['wxy', 'wx', 'y'], ['wxz', 'wx', 'z'], ['wyz', 'wy', 'z'], ['xx', 'x', 'x'], ['yy', 'y', 'y'], ['zz', 'z', 'z'],
    ['xy', 'x', 'y'], ['xz', 'x', 'z'], ['yz', 'y', 'z']]) let_(n, mul(a, b));
  const addTo = (s, a) => let_(s, add(s, a));
  const acc = (s, a, b) => let_(s, add(s, mul(a, b)));
  addTo('sxx', 'wxx'); addTo('syy', 'wyy'); addTo('szz', 'wzz'); addTo('sxy', 'wxy'); addTo('sxz', 'wxz'); addTo('syz', 'wyz');
  acc('txxx', 'wxx', 'x'); acc('txxy', 'wxx', 'y'); acc('txxz', 'wxx', 'z'); acc('txyy', 'wyy', 'x'); acc('tyyy', 'wyy', 'y');
  acc('tyyz', 'wyy', 'z'); acc('txzz', 'wzz', 'x'); acc('tyzz', 'wzz', 'y'); acc('tzzz', 'wzz', 'z'); acc('txyz', 'wxy', 'z');
  acc('qxxxx', 'wxx', 'xx'); acc('qyyyy', 'wyy', 'yy'); acc('qzzzz', 'wzz', 'zz'); acc('qxxxy', 'wxx', 'xy'); acc('qxxxz', 'wxx', 'xz');
  acc('qxyyy', 'wyy', 'xy'); acc('qyyyz', 'wyy', 'yz'); acc('qxzzz', 'wzz', 'xz'); acc('qyzzz', 'wzz', 'yz'); acc('qxxyy', 'wxx', 'yy');
  acc('qxxzz', 'wxx', 'zz'); acc('qyyzz', 'wyy', 'zz'); acc('qxxyz', 'wxx', 'yz'); acc('qxyyz', 'wyy', 'xz'); acc('qxyzz', 'wzz', 'xy');
  const m = ['wx', 'wy', 'wz', 'wxx', 'wyy', 'wzz', 'wxy', 'wxz', 'wyz'];
  for (let c = 0; c < nc; c++) {
    // Δf masked like w, so a non-finite value at a coincident neighbour adds nothing (the scalar code skips it)
    get(P_LOCAL); emit(simd(OP.load), memarg(16 * (3 + c))); get(V('mask')); emit(simd(OP.and)); set(V(`g${c}`));
    for (let a = 0; a < 9; a++) acc(`b${a}_${c}`, m[a], `g${c}`);
  }
  get(P_LOCAL); emit(0x41, sleb(stride), 0x6a); set(P_LOCAL);
  emit(0x0c, 0, 0x0b, 0x0b); // br 0; end loop; end block

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
  const store = (k, name) => { emit(0x41, sleb(0)); get(V(name)); emit(simd(OP.store), memarg(RESULT_AT + 16 * k)); };
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
export function momentKernelBytes() {
  return Uint8Array.from([
    0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
    ...section(1, vec([[0x60, 1, I32, 0]])),
    ...section(3, vec([[0], [0]])),
    ...section(5, vec([[0x00, 1]])),
    ...section(7, vec([[...name('memory'), 0x02, 0], [...name('fit1'), 0x00, 0], [...name('fit3'), 0x00, 1]])),
    ...section(10, vec([fitBody(1), fitBody(3)])),
  ]);
}

export function momentKernelSource() {
  const b64 = Buffer.from(momentKernelBytes()).toString('base64');
  const lines = b64.match(/.{1,100}/g).map((s) => `  '${s}'`).join(' +\n');
  return `/**
 * The WebAssembly SIMD kernel of the quadratic gradient fit (see momentKernel.ts), as base64.
 * Written by bin/write-moment-kernel.mjs — edit the generator, not this file.
 */

/** Byte layout of the kernel's memory (one f64x2 per value): the two scales, the pivot tolerance, the results, the neighbour slots. */
export const KERNEL_LAYOUT = { scaleAt: ${SCALE_AT}, toleranceAt: ${TOLERANCE_AT}, resultAt: ${RESULT_AT}, slotsAt: ${SLOTS_AT} } as const;

export const MOMENT_KERNEL_BASE64 =
${lines};
`;
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) {
  const target = join(dirname(fileURLToPath(import.meta.url)), '..', 'src', 'derive', 'momentKernelWasm.ts');
  writeFileSync(target, momentKernelSource());
  console.log(`wrote ${target} (${momentKernelBytes().length} bytes of WebAssembly)`);
}
