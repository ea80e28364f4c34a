#!/usr/bin/env node
// Writes src/derive/momentKernelWasm.ts: a WebAssembly module (SIMD, f64x2) that sums the weighted moments and
// right-hand sides of the quadratic gradient fit (src/derive/quadraticGradient.ts, `fitSums`) for two sites at
// once, one per lane. The bytes are assembled here by hand — no toolchain — and written as base64. Every
// product and sum is the scalar code's, in its order (no fused multiply-add), so each lane's sums are the
// scalar ones to the bit. Run `node bin/write-moment-kernel.mjs` after changing this generator;
// tests/derive/momentKernel.test.ts checks the written file is this generator's output.
//
// Memory (exported as `memory`, grown by the caller): bytes 0–15 the two sites' scales 1/h (f64x2); from
// byte 16 the sums, one f64x2 per sum (lane 0 the first site); from byte 1024 the neighbour slots, one per
// neighbour: offsets dx, dy, dz (unscaled) and the value differences Δf of each component, one f64x2 each.
// Functions `sums1(n)` and `sums3(n)` (1 or 3 components) read n slots. Sum order: 6 second moments
// (xx yy zz xy xz yz), 10 third (xxx xxy xxz xyy yyy yyz xzz yzz zzz xyz), 15 fourth (xxxx yyyy zzzz xxxy
// xxxz xyyy yyyz xzzz yzzz xxyy xxzz yyzz xxyz xyyz xyzz), then per component the 9 right-hand sides
// (x y z xx yy zz xy xz yz), unhalved.
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const SCALE_AT = 0, SUMS_AT = 16, SLOTS_AT = 1024;

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
const OP = { load: 0x00, store: 0x0b, splat: 0x14, gt: 0x4a, and: 0x4e, sqrt: 0xef, add: 0xf0, sub: 0xf1, mul: 0xf2, div: 0xf3 };
const memarg = (offset) => [4, ...uleb(offset)];

/** The body of `sums<nc>(n)`. */
function sumsBody(nc) {
  const code = [];
  const emit = (...b) => code.push(...b.flat());
  let next = 1; // local 0 is n
  const i32s = {}, v = {};
  for (const k of ['p', 'end']) i32s[k] = next++;
  const vNames = ['ih', 'one', 'x', 'y', 'z', 'r2', 'mask', 'w', 'wx', 'wy', 'wz', 'wxx', 'wyy', 'wzz', 'wxy', 'wxz', 'wyz',
    'xx', 'yy', 'zz', 'xy', 'xz', 'yz', 'g0', 'g1', 'g2'];
  const sums = ['sxx', 'syy', 'szz', 'sxy', 'sxz', 'syz',
    'txxx', 'txxy', 'txxz', 'txyy', 'tyyy', 'tyyz', 'txzz', 'tyzz', 'tzzz', 'txyz',
    'qxxxx', 'qyyyy', 'qzzzz', 'qxxxy', 'qxxxz', 'qxyyy', 'qyyyz', 'qxzzz', 'qyzzz', 'qxxyy', 'qxxzz', 'qyyzz', 'qxxyz', 'qxyyz', 'qxyzz'];
  for (let c = 0; c < nc; c++) for (let a = 0; a < 9; a++) sums.push(`b${a}_${c}`);
  for (const k of [...vNames, ...sums]) v[k] = next++;
  const get = (l) => emit(0x20, uleb(l)), set = (l) => emit(0x21, uleb(l));
  const op2 = (o, a, b, dst) => { get(v[a]); get(v[b]); emit(simd(OP[o])); set(v[dst]); };
  const acc = (s, a, b) => { get(v[s]); get(v[a]); get(v[b]); emit(simd(OP.mul)); emit(simd(OP.add)); set(v[s]); };
  const stride = 16 * (3 + nc);
  // ih = the two scales; one = 1.0 in both lanes; p = first slot; end = p + n·stride
  emit(0x41, sleb(0)); emit(simd(OP.load), memarg(SCALE_AT)); set(v.ih);
  emit(0x44, [0, 0, 0, 0, 0, 0, 0xf0, 0x3f]); emit(simd(OP.splat)); set(v.one);
  emit(0x41, sleb(SLOTS_AT)); set(i32s.p);
  get(i32s.p); get(0); emit(0x41, sleb(stride), 0x6c, 0x6a); set(i32s.end);
  emit(0x02, 0x40, 0x03, 0x40); // block, loop
  get(i32s.p); get(i32s.end); emit(0x4f, 0x0d, 1); // i32.ge_u; br_if 1
  const load = (slot, dst, scaled) => {
    get(i32s.p); emit(simd(OP.load), memarg(16 * slot));
    if (scaled) { get(v.ih); emit(simd(OP.mul)); }
    set(v[dst]);
  };
  load(0, 'x', true); load(1, 'y', true); load(2, 'z', true);
  // r2 = x·x + y·y + z·z; w = 1/r2 where r2 > 0, else 0 (a coincident or padding slot adds nothing)
  get(v.x); get(v.x); emit(simd(OP.mul)); get(v.y); get(v.y); emit(simd(OP.mul)); emit(simd(OP.add)); get(v.z); get(v.z);
  emit(simd(OP.mul)); emit(simd(OP.add)); set(v.r2);
  get(v.r2); emit(0xfd, 0x0c, new Array(16).fill(0)); emit(simd(OP.gt)); set(v.mask);
  get(v.one); get(v.r2); emit(simd(OP.div)); get(v.mask); emit(simd(OP.and)); set(v.w);
  op2('mul', 'w', 'x', 'wx'); op2('mul', 'w', 'y', 'wy'); op2('mul', 'w', 'z', 'wz');
  op2('mul', 'wx', 'x', 'wxx'); op2('mul', 'wy', 'y', 'wyy'); op2('mul', 'wz', 'z', 'wzz');
  op2('mul', 'wx', 'y', 'wxy'); op2('mul', 'wx', 'z', 'wxz'); op2('mul', 'wy', 'z', 'wyz');
  op2('mul', 'x', 'x', 'xx'); op2('mul', 'y', 'y', 'yy'); op2('mul', 'z', 'z', 'zz');
  op2('mul', 'x', 'y', 'xy'); op2('mul', 'x', 'z', 'xz'); op2('mul', 'y', 'z', 'yz');
  const addTo = (s, a) => { get(v[s]); get(v[a]); emit(simd(OP.add)); set(v[s]); };
  addTo('sxx', 'wxx'); addTo('syy', 'wyy'); addTo('szz', 'wzz'); addTo('sxy', 'wxy'); addTo('sxz', 'wxz'); addTo('syz', 'wyz');
  acc('txxx', 'wxx', 'x'); acc('txxy', 'wxx', 'y'); acc('txxz', 'wxx', 'z'); acc('txyy', 'wyy', 'x'); acc('tyyy', 'wyy', 'y');
  acc('tyyz', 'wyy', 'z'); acc('txzz', 'wzz', 'x'); acc('tyzz', 'wzz', 'y'); acc('tzzz', 'wzz', 'z'); acc('txyz', 'wxy', 'z');
  acc('qxxxx', 'wxx', 'xx'); acc('qyyyy', 'wyy', 'yy'); acc('qzzzz', 'wzz', 'zz'); acc('qxxxy', 'wxx', 'xy'); acc('qxxxz', 'wxx', 'xz');
  acc('qxyyy', 'wyy', 'xy'); acc('qyyyz', 'wyy', 'yz'); acc('qxzzz', 'wzz', 'xz'); acc('qyzzz', 'wzz', 'yz'); acc('qxxyy', 'wxx', 'yy');
  acc('qxxzz', 'wxx', 'zz'); acc('qyyzz', 'wyy', 'zz'); acc('qxxyz', 'wxx', 'yz'); acc('qxyyz', 'wyy', 'xz'); acc('qxyzz', 'wzz', 'xy');
  const m = ['wx', 'wy', 'wz', 'wxx', 'wyy', 'wzz', 'wxy', 'wxz', 'wyz'];
  for (let c = 0; c < nc; c++) {
    // Δf masked like w, so a non-finite value at a coincident neighbour adds nothing (the scalar code skips it)
    get(i32s.p); emit(simd(OP.load), memarg(16 * (3 + c))); get(v.mask); emit(simd(OP.and)); set(v[`g${c}`]);
    for (let a = 0; a < 9; a++) acc(`b${a}_${c}`, m[a], `g${c}`);
  }
  get(i32s.p); emit(0x41, sleb(stride), 0x6a); set(i32s.p);
  emit(0x0c, 0, 0x0b, 0x0b); // br 0; end loop; end block
  sums.forEach((s, k) => { emit(0x41, sleb(0)); get(v[s]); emit(simd(OP.store), memarg(SUMS_AT + 16 * k)); });
  emit(0x0b);
  const locals = vec([[...uleb(2), I32], [...uleb(vNames.length + sums.length), V128]]);
  const body = [...locals, ...code];
  return [...uleb(body.length), ...body];
}

export function momentKernelBytes() {
  return Uint8Array.from([
    0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
    ...section(1, vec([[0x60, 1, I32, 0]])),
    ...section(3, vec([[0], [0]])),
    ...section(5, vec([[0x00, 1]])),
    ...section(7, vec([[...name('memory'), 0x02, 0], [...name('sums1'), 0x00, 0], [...name('sums3'), 0x00, 1]])),
    ...section(10, vec([sumsBody(1), sumsBody(3)])),
  ]);
}

export function momentKernelSource() {
  const b64 = Buffer.from(momentKernelBytes()).toString('base64');
  const lines = b64.match(/.{1,100}/g).map((s) => `  '${s}'`).join(' +\n');
  return `/**
 * The WebAssembly SIMD moment kernel of the quadratic gradient fit (see momentKernel.ts), as base64.
 * Written by bin/write-moment-kernel.mjs — edit the generator, not this file.
 */

/** Byte layout of the kernel's memory: the two scales, the sums (one f64x2 each), the neighbour slots. */
export const KERNEL_LAYOUT = { scaleAt: ${SCALE_AT}, sumsAt: ${SUMS_AT}, slotsAt: ${SLOTS_AT} } as const;

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
