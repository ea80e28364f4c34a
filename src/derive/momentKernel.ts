/**
 * The WebAssembly SIMD kernel of the quadratic gradient fit (bytes in momentKernelWasm.ts, written by
 * bin/write-moment-kernel.mjs): for two sites at once, one per f64x2 lane, it sums the 31 weighted moments and
 * the right-hand sides, factorises the 9×9 normal matrix (pivots dropped per lane) and solves for the gradient,
 * each lane's arithmetic the scalar code's to the bit (same products, same order, no fused multiply-add).
 * pairedFit.ts feeds it: from neighbour rows built in JavaScript, or — for every node of a piece or a node range —
 * from a copy of the mesh held in the kernel's memory (kernelMesh.ts), whose rings the kernel walks and gathers
 * itself (`incidence`, `one1`/`one3`, `two1`/`two3`; see bin/write-moment-kernel.mjs).
 *
 * Where WebAssembly SIMD is missing the kernel is absent and the fit runs in JavaScript, with the same
 * results. `FIELDTALLY_SCALAR_FIT=1` in the environment, or `useMomentKernel(false)`, forces the JavaScript path.
 */
import { KERNEL_CONFIG, KERNEL_LAYOUT, KERNEL_RING, KERNEL_STATS, MOMENT_KERNEL_BASE64, MOMENT_KERNEL_SHARED_BASE64 } from './momentKernelWasm.ts';

/** The instantiated kernel and views of its memory (renewed when the memory grows). */
export interface MomentKernel {
  fit1(n: number): void;
  fit3(n: number): void;
  /**
   * Node → cells rows of the held mesh's `np` nodes (kernelMesh.ts), by phase: 0 counts cells c0 .. c1-1, 1 sums
   * the counts, 2 fills cells c1-1 down to c0.
   */
  incidence(np: number, c0: number, c1: number, phase: number): void;
  /**
   * Node i's one-ring walked and gathered into lane `lane` (1 or 3 components), the one-sided test made: its
   * slot count, or a `KERNEL_RING` code.
   */
  one1(lane: number, i: number): number;
  one3(lane: number, i: number): number;
  /** Node i's two-ring from its one-ring (walked again first when `fresh` is 1), gathered: its slot count or a `KERNEL_RING` code. */
  two1(lane: number, i: number, fresh: number): number;
  two3(lane: number, i: number, fresh: number): number;
  /** The memory as doubles, lane-interleaved, laid out as `KERNEL_LAYOUT` says (byte offsets). */
  f64: Float64Array;
  /** The memory as 32-bit integers (the held mesh's ids and the addresses at `KERNEL_LAYOUT.configAt`). */
  i32: Int32Array;
  memory: WebAssembly.Memory;
  /** The memory's size in bytes (reading `memory.buffer` costs a call into the engine). Replaced, never grown: `kernelBytes`. */
  bytes: number;
  /**
   * On a shared memory (sharedKernelMesh.ts): the byte where this instance's area starts (its `base`: `f64` and
   * `i32` view the memory from there, and every address in its CONFIG is relative to it). Absent: a private memory.
   */
  base?: number;
}

let kernel: MomentKernel | null | undefined;
let wanted = !scalarFitAsked();

function scalarFitAsked(): boolean {
  const env = (globalThis as { process?: { env?: Record<string, string | undefined> } }).process?.env;
  return env?.FIELDTALLY_SCALAR_FIT === '1';
}

function decode(b64: string): Uint8Array<ArrayBuffer> {
  const s = atob(b64), out = new Uint8Array(s.length);
  for (let i = 0; i < s.length; i++) out[i] = s.charCodeAt(i);
  return out;
}

/** The compiled module (its optimised code is shared by every instance made from it). */
let compiled: WebAssembly.Module | undefined;

type KernelExports = Pick<MomentKernel, 'fit1' | 'fit3' | 'incidence' | 'one1' | 'one3' | 'two1' | 'two3'>;

/** The kernel's functions over `memory` (a new instance of the compiled module). */
function exportsOver(memory: WebAssembly.Memory): KernelExports {
  const e = new WebAssembly.Instance(compiled!, { env: { memory } }).exports as unknown as KernelExports;
  return { fit1: e.fit1, fit3: e.fit3, incidence: e.incidence, one1: e.one1, one3: e.one3, two1: e.two1, two3: e.two3 };
}

function instantiate(): MomentKernel | null {
  try {
    const bytes = decode(MOMENT_KERNEL_BASE64);
    if (!WebAssembly.validate(bytes)) return null;
    compiled = new WebAssembly.Module(bytes);
    const memory = new WebAssembly.Memory({ initial: 1 }), b = memory.buffer;
    return { ...exportsOver(memory), memory, f64: new Float64Array(b), i32: new Int32Array(b), bytes: b.byteLength };
  } catch {
    return null;
  }
}

let compiledShared: WebAssembly.Module | null | undefined;

/**
 * An instance of the shared-memory kernel over `memory` (a shared WebAssembly.Memory, as sharedKernelMesh.ts
 * makes it) working from byte `base` on (a multiple of 16): its views start there. Null when the kernel is
 * switched off or the platform lacks WebAssembly SIMD or shared memories.
 */
export function sharedMomentKernel(memory: WebAssembly.Memory, base: number): MomentKernel | null {
  if (!momentKernel()) return null;
  try {
    compiledShared ??= new WebAssembly.Module(decode(MOMENT_KERNEL_SHARED_BASE64));
  } catch {
    compiledShared = null;
  }
  if (!compiledShared) return null;
  let e: KernelExports & { base: WebAssembly.Global };
  try {
    e = new WebAssembly.Instance(compiledShared, { env: { memory } }).exports as unknown as KernelExports & { base: WebAssembly.Global };
  } catch {
    return null;
  }
  e.base.value = base;
  const k: MomentKernel = {
    fit1: e.fit1, fit3: e.fit3, incidence: e.incidence, one1: e.one1, one3: e.one3, two1: e.two1, two3: e.two3,
    memory, f64: new Float64Array(0), i32: new Int32Array(0), bytes: 0, base,
  };
  sharedViews(k);
  return k;
}

/** Renews a shared kernel's views after its memory grew (growing a shared memory detaches nothing). */
export function sharedViews(k: MomentKernel): void {
  const b = k.memory.buffer, base = k.base ?? 0;
  k.f64 = new Float64Array(b, base, (b.byteLength - base) >> 3);
  k.i32 = new Int32Array(b, base, (b.byteLength - base) >> 2);
  k.bytes = b.byteLength - base;
}

/** The kernel, or null when it is switched off or this platform has no WebAssembly SIMD. */
export function momentKernel(): MomentKernel | null {
  if (!wanted) return null;
  if (kernel === undefined) kernel = instantiate();
  return kernel;
}

/** Switches the kernel on (when the platform has it) or off (every fit in JavaScript); returns whether it is now used. */
export function useMomentKernel(on: boolean): boolean {
  wanted = on;
  return momentKernel() !== null;
}

/**
 * Makes room for `n` neighbour slots of `nc` components from byte `at` (default: `KERNEL_LAYOUT.slotsAt`, the
 * slots fed from JavaScript); returns the double index of slot 0.
 */
export function kernelSlots(k: MomentKernel, n: number, nc: number, at: number = KERNEL_LAYOUT.slotsAt): number {
  kernelBytes(k, at + n * 16 * (3 + nc));
  return at / 8;
}

/**
 * Gives the kernel at least `need` bytes of memory, keeping its first `keep` bytes (default: all): a new, larger
 * memory and a new instance over it (the functions and views in `k` renewed), never `memory.grow` — growing
 * detaches the old buffer, and after the first detached buffer V8 checks every typed-array access of the thread
 * (measured: a wall fit ~15 % slower). Throws RangeError when the memory cannot be had.
 */
export function kernelBytes(k: MomentKernel, need: number, keep: number = k.bytes): void {
  if (k.bytes >= need) return;
  // a quarter more than asked, so that slots growing a little at a time do not copy the memory each time
  const pages = Math.min(65536, Math.ceil((need + (need >> 2)) / 65536));
  const memory = new WebAssembly.Memory({ initial: pages }), b = memory.buffer;
  new Uint8Array(b).set(new Uint8Array(k.memory.buffer, 0, Math.min(keep, k.bytes)));
  Object.assign(k, exportsOver(memory), { memory, f64: new Float64Array(b), i32: new Int32Array(b), bytes: b.byteLength });
}

/** Points the kernel's fits at slots from byte `at` (a multiple of 16). */
export function useSlotsAt(k: MomentKernel, at: number): void {
  k.i32[(KERNEL_LAYOUT.configAt + KERNEL_CONFIG.slots) / 4] = at;
}

export { KERNEL_CONFIG, KERNEL_LAYOUT, KERNEL_RING, KERNEL_STATS };
