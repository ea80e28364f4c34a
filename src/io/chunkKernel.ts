/**
 * The readers' WebAssembly SIMD chunk kernel (bytes written by bin/write-chunk-kernel.mjs into
 * chunkKernelWasm.ts): narrows a chunk of 64-bit ids (little-endian words on a little-endian host) to Int32
 * while it sums up the run's sign test and least and greatest low word, four ids per step — the work of
 * `narrowLowFirst` (elementConvert.ts), which measured 40–48 ms per 8M ids against 7–10 ms here
 * (DEVELOPERS.md "Loading at scale"); and tests a chunk of floats for a non-finite value (`ChunkScan`'s question,
 * partReads.ts), which as a JavaScript loop run once per load mostly ran before the engine had optimised it.
 * A reader may read a chunk straight into the kernel's input (`kernelInput`), so the file's bytes are not copied
 * in; other callers' chunks are copied in.
 *
 * One memory per thread, made at its full size once and never grown (growing detaches the buffer, after which
 * V8 checks every typed-array access of the thread). `FIELDTALLY_CHUNK_KERNEL=0` in the environment, or
 * `useChunkKernel(false)`, keeps every chunk in JavaScript (for comparison); so does a platform without
 * WebAssembly SIMD.
 */
import { CHUNK_KERNEL_BASE64, CHUNK_LAYOUT } from './chunkKernelWasm.ts';

interface Kernel {
  narrow(n: number): number;
  nonFinite32(n: number): number;
  nonFinite64(n: number): number;
  bytes(n: number): number;
  /** The input region (the whole of it) and the low words written by `narrow`. */
  input: Uint8Array;
  output: Int32Array;
  range: Int32Array;
  /** The 256 counts written by `bytes`. */
  hist: Int32Array;
}

/** 64-bit ids the kernel takes at once. */
export const KERNEL_IDS = CHUNK_LAYOUT.inBytes / 8;

let kernel: Kernel | null | undefined;
let wanted = !offAsked();

function offAsked(): boolean {
  const env = (globalThis as { process?: { env?: Record<string, string | undefined> } }).process?.env;
  return env?.FIELDTALLY_CHUNK_KERNEL === '0';
}

function instantiate(): Kernel | null {
  try {
    const s = atob(CHUNK_KERNEL_BASE64), bytes = new Uint8Array(s.length);
    for (let i = 0; i < s.length; i++) bytes[i] = s.charCodeAt(i);
    if (!WebAssembly.validate(bytes)) return null;
    const memory = new WebAssembly.Memory({ initial: CHUNK_LAYOUT.pages, maximum: CHUNK_LAYOUT.pages });
    const e = new WebAssembly.Instance(new WebAssembly.Module(bytes), { env: { memory } }).exports as unknown as Pick<Kernel, 'narrow' | 'nonFinite32' | 'nonFinite64' | 'bytes'>;
    const b = memory.buffer;
    return {
      narrow: e.narrow, nonFinite32: e.nonFinite32, nonFinite64: e.nonFinite64, bytes: e.bytes, input: new Uint8Array(b, CHUNK_LAYOUT.inAt, CHUNK_LAYOUT.inBytes),
      output: new Int32Array(b, CHUNK_LAYOUT.outAt, KERNEL_IDS), range: new Int32Array(b, CHUNK_LAYOUT.rangeAt, 2),
      hist: new Int32Array(b, CHUNK_LAYOUT.histAt, 256),
    };
  } catch {
    return null;
  }
}

function live(): Kernel | null {
  if (!wanted) return null;
  if (kernel === undefined) kernel = instantiate();
  return kernel;
}

/** Switches the kernel on (when the platform has it) or off (every chunk in JavaScript); returns whether it is now used. */
export function useChunkKernel(on: boolean): boolean {
  wanted = on;
  return live() !== null;
}

/**
 * The kernel's input region as `n` bytes (n ≤ 8 · KERNEL_IDS), for a reader to fill with a chunk of 64-bit ids
 * before `narrowIdsInKernel`; undefined when the kernel is off or `n` is too large. Valid until the next call
 * on this thread that uses the kernel.
 */
export function kernelInput(n: number): Uint8Array | undefined {
  const k = live();
  return k && n <= k.input.length ? k.input.subarray(0, n) : undefined;
}

/**
 * Narrows `count` (≥ 1) 64-bit ids held in `bytes` (host-order words, low word first, 4-byte aligned) into
 * `out[o…]`: returns the OR over the ids of high word XOR the low word's sign (0: every id fits in 32 bits)
 * and leaves the least and greatest low word in `range`; `bytes` is left as it was. Undefined when the kernel
 * is off (the caller narrows in JavaScript). Chunks larger than the kernel's input are taken in turns.
 */
export function narrowIdsInKernel(bytes: Uint8Array, count: number, out: Int32Array, o: number, range: Int32Array): number | undefined {
  const k = live();
  if (!k) return undefined;
  let sign = 0, lo = 0x7fffffff, hi = -0x80000000;
  for (let i = 0; i < count; i += KERNEL_IDS) {
    const n = Math.min(KERNEL_IDS, count - i), from = bytes.subarray(8 * i, 8 * (i + n));
    // A chunk read straight into the input region is there already.
    if (!(from.buffer === k.input.buffer && from.byteOffset === k.input.byteOffset)) k.input.set(from);
    sign |= k.narrow(n);
    out.set(k.output.subarray(0, n), o + i);
    if (k.range[0]! < lo) lo = k.range[0]!;
    if (k.range[1]! > hi) hi = k.range[1]!;
  }
  range[0] = lo; range[1] = hi;
  return sign;
}

/**
 * Whether some of the `count` floats of `size` bytes (4 or 8, host order) in `bytes` — the kernel's input region
 * as `kernelInput` gave it — is not finite (±∞, NaN). Undefined when the kernel is off or `bytes` is not its input.
 */
export function nonFiniteInKernel(bytes: Uint8Array, count: number, size: 4 | 8): boolean | undefined {
  const k = live();
  if (!k || bytes.buffer !== k.input.buffer || bytes.byteOffset !== k.input.byteOffset || count * size > k.input.length) return undefined;
  return (size === 4 ? k.nonFinite32(count) : k.nonFinite64(count)) !== 0;
}

/**
 * Adds the count of each byte value among `bytes` (cell types) into `counts` (256 slots); false, with `counts`
 * untouched, when the kernel is off. A loop compiled before its first call: counted in JavaScript, 1M cell
 * types took 10–20 ms on the one call a load makes, before the engine had optimised it.
 */
export function countBytesInKernel(bytes: Uint8Array, counts: Float64Array): boolean {
  const k = live();
  if (!k) return false;
  for (let i = 0; i < bytes.length; i += k.input.length) {
    const part = bytes.subarray(i, i + k.input.length);
    k.input.set(part);
    k.bytes(part.length);
    for (let t = 0; t < 256; t++) counts[t]! += k.hist[t]!;
  }
  return true;
}
