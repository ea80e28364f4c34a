#!/usr/bin/env node
// Writes src/io/chunkKernelWasm.ts: a small WebAssembly SIMD module (i32x4) for the loading thread's hottest
// per-chunk loop, narrowing 64-bit ids (low word first, as little-endian files hold them on a little-endian
// host) to Int32 while it sums up the run: the OR of every high word XOR its low word's sign (0: every value
// fits in 32 bits) and the least and greatest low word. Same answer as `narrowLowFirst` in
// src/io/elementConvert.ts, four ids per step instead of one. Also the non-finite test of a chunk of floats
// (`nonFinite32`, `nonFinite64`: 1 when some value has every exponent bit set), the question `ChunkScan` of
// src/io/partReads.ts asks; compiled at once, so unlike a JavaScript loop run once per load it is not slow
// while the engine has not optimised it yet. The bytes are assembled here by hand — no
// toolchain — and written as base64. Run `node bin/write-chunk-kernel.mjs` after changing this generator;
// tests/io/chunkKernel.test.ts checks the written file is its output.
//
// Memory (imported as `env.memory`, made once at its full size by the caller and never grown: growing detaches
// the old buffer, which makes V8 check every typed-array access of the thread from then on): the 64-bit ids of
// one chunk from byte IN_AT (IN_BYTES at most), their low words written from OUT_AT, the run's least and
// greatest low word left at RANGE_AT (two i32). `narrow(n)` returns the sign OR. Floats are read from IN_AT too.
// `bytes(n)`: the histogram of n bytes from IN_AT (cell types), 256 i32 counts at HIST_AT, counted by runs of one
// value, sixteen bytes a step while they all continue the current run (a mesh of one cell type: every step).

import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { name, section, sleb, uleb, vec } from './write-moment-kernel.mjs';

/** Byte layout; PAGES of 64 KiB in all. */
export const IN_AT = 0, IN_BYTES = 1 << 20, OUT_AT = IN_BYTES, RANGE_AT = OUT_AT + (IN_BYTES >> 1), HIST_AT = RANGE_AT + 64, PAGES = (RANGE_AT + 65536) >> 16;

const I32 = 0x7f, V128 = 0x7b;
const simd = (op, ...imm) => [0xfd, ...uleb(op), ...imm];
/** SIMD opcodes used (WebAssembly SIMD proposal, final numbering). */
const S = {
  load: 0x00, store: 0x0b, shuffle: 0x0d, splat: 0x11, lane: 0x1b, eq32: 0x37, and: 0x4e, or: 0x50, xor: 0x51, anyTrue: 0x53, shrS: 0xac,
  minS: 0xb6, maxS: 0xb8, eq64: 0xd6,
};

/**
 * The body of `nonFinite32(n)` / `nonFinite64(n)`: 1 when some of the n floats (4 or 8 bytes, host order) from
 * IN_AT is not finite (all exponent bits set: ±∞ or NaN), else 0. Whole vectors first, the last values one by one.
 */
function nonFiniteBody(size) {
  const code = [];
  const e = (...b) => code.push(...b.flat());
  // locals: 0 n (param); i32: 1 at, 2 end, 3 tail; v128: 4 hit, 5 mask
  const N = 0, AT = 1, END = 2, TAIL = 3, HIT = 4, MASK = 5;
  const get = (l) => e(0x20, uleb(l)), set = (l) => e(0x21, uleb(l));
  const i32 = (v) => e(0x41, sleb(v));
  const mem = (offset, align) => [align, ...uleb(offset)];
  // the exponent mask in every lane: 0x7f800000 (f32) or 0x7ff0000000000000 (f64)
  const maskBytes = size === 4 ? [0x00, 0x00, 0x80, 0x7f] : [0, 0, 0, 0, 0, 0, 0xf0, 0x7f];
  e(simd(0x0c, ...Array.from({ length: 16 }, (_, i) => maskBytes[i % size]))); set(MASK);
  i32(0); e(simd(S.splat)); set(HIT);
  // end = the bytes of the whole vectors; tail = n's bytes
  get(N); i32(size === 4 ? -4 : -2); e(0x71); i32(size === 4 ? 2 : 3); e(0x74); set(END);
  get(N); i32(size === 4 ? 2 : 3); e(0x74); set(TAIL);
  i32(IN_AT); set(AT);
  e(0x02, 0x40, 0x03, 0x40);
  get(AT); get(END); e(0x4f); e(0x0d, 1);
  get(HIT); get(AT); e(simd(S.load, ...mem(IN_AT, 4))); get(MASK); e(simd(S.and)); get(MASK); e(simd(size === 4 ? S.eq32 : S.eq64)); e(simd(S.or)); set(HIT);
  get(AT); i32(16); e(0x6a); set(AT);
  e(0x0c, 0);
  e(0x0b, 0x0b);
  get(HIT); e(simd(S.anyTrue)); e(0x04, 0x40); // if any lane hit: return 1
  i32(1); e(0x0f); e(0x0b);
  // the last values: the high word's exponent bits (f32: the value itself)
  e(0x02, 0x40, 0x03, 0x40);
  get(AT); get(TAIL); e(0x4f); e(0x0d, 1);
  get(AT); e(0x28, mem(IN_AT + size - 4, 2)); i32(size === 4 ? 0x7f800000 : 0x7ff00000); e(0x71); i32(size === 4 ? 0x7f800000 : 0x7ff00000); e(0x46);
  e(0x04, 0x40); i32(1); e(0x0f); e(0x0b);
  get(AT); i32(size); e(0x6a); set(AT);
  e(0x0c, 0);
  e(0x0b, 0x0b);
  i32(0);
  e(0x0b);
  const body = [...vec([[3, I32], [2, V128]]), ...code];
  return [...uleb(body.length), ...body];
}

/** The body of `narrow(n)`. */
function narrowBody() {
  const code = [];
  const e = (...b) => code.push(...b.flat());
  // locals: 0 n (param); i32: 1 at, 2 to, 3 end, 4 sign, 5 lo, 6 hi, 7 v, 8 j; v128: 9 vs, 10 vmin, 11 vmax, 12 low
  const N = 0, AT = 1, TO = 2, END = 3, SIGN = 4, LO = 5, HI = 6, V = 7, J = 8, VS = 9, VMIN = 10, VMAX = 11, LOW = 12;
  const get = (l) => e(0x20, uleb(l)), set = (l) => e(0x21, uleb(l)), tee = (l) => e(0x22, uleb(l));
  const i32 = (v) => e(0x41, sleb(v));
  const mem = (offset, align) => [align, ...uleb(offset)];
  // vmin, vmax, vs = splat(INT32_MAX), splat(INT32_MIN), 0
  i32(0x7fffffff); e(simd(S.splat)); set(VMIN);
  i32(-0x80000000); e(simd(S.splat)); set(VMAX);
  i32(0); e(simd(S.splat)); set(VS);
  // end = (n & ~3) * 8: the bytes of the whole groups of four; at = IN_AT, to = OUT_AT
  get(N); i32(-4); e(0x71); i32(3); e(0x74); i32(IN_AT); e(0x6a); set(END);
  i32(IN_AT); set(AT); i32(OUT_AT); set(TO);
  e(0x02, 0x40, 0x03, 0x40); // block, loop
  get(AT); get(END); e(0x4f); e(0x0d, 1); // at >= end: out
  // low words of the four ids (bytes 0–3, 8–11, 16–19, 24–27 of the two vectors), high words likewise
  get(AT); e(simd(S.load, ...mem(0, 4))); get(AT); e(simd(S.load, ...mem(16, 4)));
  e(simd(S.shuffle, 0, 1, 2, 3, 8, 9, 10, 11, 16, 17, 18, 19, 24, 25, 26, 27)); set(LOW);
  get(VS);
  get(AT); e(simd(S.load, ...mem(0, 4))); get(AT); e(simd(S.load, ...mem(16, 4)));
  e(simd(S.shuffle, 4, 5, 6, 7, 12, 13, 14, 15, 20, 21, 22, 23, 28, 29, 30, 31));
  get(LOW); i32(31); e(simd(S.shrS)); e(simd(S.xor)); e(simd(S.or)); set(VS);
  get(VMIN); get(LOW); e(simd(S.minS)); set(VMIN);
  get(VMAX); get(LOW); e(simd(S.maxS)); set(VMAX);
  get(TO); get(LOW); e(simd(S.store, ...mem(0, 4)));
  get(AT); i32(32); e(0x6a); set(AT);
  get(TO); i32(16); e(0x6a); set(TO);
  e(0x0c, 0); // br loop
  e(0x0b, 0x0b); // end loop, end block
  // lanes folded: sign = OR, lo = least, hi = greatest
  for (let k = 0; k < 4; k++) {
    if (k === 0) { get(VS); e(simd(S.lane, 0)); set(SIGN); get(VMIN); e(simd(S.lane, 0)); set(LO); get(VMAX); e(simd(S.lane, 0)); set(HI); continue; }
    get(SIGN); get(VS); e(simd(S.lane, k)); e(0x72); set(SIGN);
    get(VMIN); e(simd(S.lane, k)); tee(V); get(LO); get(V); get(LO); e(0x48); e(0x1b); set(LO);
    get(VMAX); e(simd(S.lane, k)); tee(V); get(HI); get(V); get(HI); e(0x4a); e(0x1b); set(HI);
  }
  // the last n mod 4 ids one by one
  get(N); i32(-4); e(0x71); set(J);
  e(0x02, 0x40, 0x03, 0x40);
  get(J); get(N); e(0x4f); e(0x0d, 1);
  get(J); i32(3); e(0x74); e(0x28, mem(IN_AT, 2)); set(V);
  get(SIGN); get(J); i32(3); e(0x74); e(0x28, mem(IN_AT + 4, 2)); get(V); i32(31); e(0x75); e(0x73); e(0x72); set(SIGN);
  get(V); get(LO); get(V); get(LO); e(0x48); e(0x1b); set(LO);
  get(V); get(HI); get(V); get(HI); e(0x4a); e(0x1b); set(HI);
  get(J); i32(2); e(0x74); get(V); e(0x36, mem(OUT_AT, 2));
  get(J); i32(1); e(0x6a); set(J);
  e(0x0c, 0);
  e(0x0b, 0x0b);
  i32(0); get(LO); e(0x36, mem(RANGE_AT, 2));
  i32(0); get(HI); e(0x36, mem(RANGE_AT + 4, 2));
  get(SIGN);
  e(0x0b);
  const body = [...vec([[8, I32], [4, V128]]), ...code];
  return [...uleb(body.length), ...body];
}

/** The body of `bytes(n)`: counts of each byte value among the n bytes from IN_AT into HIST_AT (256 i32); returns 0. */
function bytesBody() {
  const code = [];
  const e = (...b) => code.push(...b.flat());
  // locals: 0 n (param); i32: 1 at, 2 end, 3 cur, 4 run, 5 b; v128: 6 cur in every lane
  const N = 0, AT = 1, END = 2, CUR = 3, RUN = 4, B = 5, CURV = 6;
  const get = (l) => e(0x20, uleb(l)), set = (l) => e(0x21, uleb(l));
  const i32 = (v) => e(0x41, sleb(v));
  const mem = (offset, align) => [align, ...uleb(offset)];
  // every count 0
  i32(0); set(AT);
  e(0x02, 0x40, 0x03, 0x40);
  get(AT); i32(1024); e(0x4f); e(0x0d, 1);
  get(AT); i32(0); e(0x36, mem(HIST_AT, 2));
  get(AT); i32(4); e(0x6a); set(AT);
  e(0x0c, 0);
  e(0x0b, 0x0b);
  get(N); e(0x45); e(0x04, 0x40); i32(0); e(0x0f); e(0x0b); // no bytes: nothing to count
  // cur = the first byte, run = 0; at = IN_AT, end = IN_AT + n
  i32(0); e(0x2d, mem(IN_AT, 0)); set(CUR);
  i32(0); set(RUN);
  i32(IN_AT); set(AT); get(N); i32(IN_AT); e(0x6a); set(END);
  get(CUR); e(simd(0x0f)); set(CURV);
  e(0x02, 0x40, 0x03, 0x40);
  get(AT); get(END); e(0x4f); e(0x0d, 1);
  // sixteen bytes of the current run at once (a mesh of one type: every step)
  get(AT); i32(16); e(0x6a); get(END); e(0x4d);
  e(0x04, 0x40);
  get(AT); e(simd(S.load, ...mem(0, 0))); get(CURV); e(simd(0x23)); e(simd(0x63));
  e(0x04, 0x40);
  get(RUN); i32(16); e(0x6a); set(RUN); get(AT); i32(16); e(0x6a); set(AT); e(0x0c, 2);
  e(0x0b, 0x0b);
  get(AT); e(0x2d, mem(0, 0)); set(B);
  get(B); get(CUR); e(0x46);
  e(0x04, 0x40);
  get(RUN); i32(1); e(0x6a); set(RUN);
  e(0x05); // a new run: the last one's length into its count
  get(CUR); i32(2); e(0x74); get(CUR); i32(2); e(0x74); e(0x28, mem(HIST_AT, 2)); get(RUN); e(0x6a); e(0x36, mem(HIST_AT, 2));
  get(B); set(CUR); i32(1); set(RUN); get(B); e(simd(0x0f)); set(CURV);
  e(0x0b);
  get(AT); i32(1); e(0x6a); set(AT);
  e(0x0c, 0);
  e(0x0b, 0x0b);
  get(CUR); i32(2); e(0x74); get(CUR); i32(2); e(0x74); e(0x28, mem(HIST_AT, 2)); get(RUN); e(0x6a); e(0x36, mem(HIST_AT, 2));
  i32(0);
  e(0x0b);
  const body = [...vec([[5, I32], [1, V128]]), ...code];
  return [...uleb(body.length), ...body];
}

export function chunkKernelBytes() {
  return Uint8Array.from([
    0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00,
    // type 0: (i32) → i32
    ...section(1, vec([[0x60, 1, I32, 1, I32]])),
    // the memory is the caller's (env.memory), PAGES pages, made at its full size
    ...section(2, vec([[...name('env'), ...name('memory'), 0x02, 0x00, ...uleb(PAGES)]])),
    ...section(3, vec([[0], [0], [0], [0]])),
    ...section(7, vec([[...name('narrow'), 0x00, 0], [...name('nonFinite32'), 0x00, 1], [...name('nonFinite64'), 0x00, 2], [...name('bytes'), 0x00, 3]])),
    ...section(10, vec([narrowBody(), nonFiniteBody(4), nonFiniteBody(8), bytesBody()])),
  ]);
}

export function chunkKernelSource() {
  const b64 = Buffer.from(chunkKernelBytes()).toString('base64');
  const lines = b64.match(/.{1,100}/g).map((s) => `  '${s}'`).join(' +\n');
  return `/**
 * The WebAssembly SIMD chunk kernel of the readers (see chunkKernel.ts), as base64.
 * Written by bin/write-chunk-kernel.mjs — edit the generator, not this file.
 */

/** Byte layout of the kernel's memory: a chunk of 64-bit ids in, their low words out, the run's least and greatest low word, a byte histogram; \`pages\` of 64 KiB. */
export const CHUNK_LAYOUT = { inAt: ${IN_AT}, inBytes: ${IN_BYTES}, outAt: ${OUT_AT}, rangeAt: ${RANGE_AT}, histAt: ${HIST_AT}, pages: ${PAGES} } as const;

export const CHUNK_KERNEL_BASE64 =
${lines};
`;
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) {
  const target = join(dirname(fileURLToPath(import.meta.url)), '..', 'src', 'io', 'chunkKernelWasm.ts');
  writeFileSync(target, chunkKernelSource());
  console.log(`wrote ${target} (${chunkKernelBytes().length} bytes of WebAssembly)`);
}
