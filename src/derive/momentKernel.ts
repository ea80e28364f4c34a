/**
 * The WebAssembly SIMD kernel of the quadratic gradient fit (bytes in momentKernelWasm.ts, written by
 * bin/write-moment-kernel.mjs): for two sites at once, one per f64x2 lane, it sums the 31 weighted moments and
 * the right-hand sides, factorises the 9×9 normal matrix (pivots dropped per lane) and solves for the gradient,
 * each lane's arithmetic the scalar code's to the bit (same products, same order, no fused multiply-add).
 * pairedFit.ts feeds it.
 *
 * Where WebAssembly SIMD is missing the kernel is absent and the fit runs in JavaScript, with the same
 * results. `FIELDTALLY_SCALAR_FIT=1` in the environment, or `useMomentKernel(false)`, forces the JavaScript path.
 */
import { KERNEL_LAYOUT, MOMENT_KERNEL_BASE64 } from './momentKernelWasm.ts';

/** The instantiated kernel and views of its memory (renewed when the memory grows). */
export interface MomentKernel {
  fit1(n: number): void;
  fit3(n: number): void;
  /** The memory as doubles, lane-interleaved, laid out as `KERNEL_LAYOUT` says (byte offsets). */
  f64: Float64Array;
  memory: WebAssembly.Memory;
  /** The memory's size in bytes (reading `memory.buffer` costs a call into the engine). */
  bytes: number;
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

function instantiate(): MomentKernel | null {
  try {
    const bytes = decode(MOMENT_KERNEL_BASE64);
    if (!WebAssembly.validate(bytes)) return null;
    const e = new WebAssembly.Instance(new WebAssembly.Module(bytes)).exports as unknown as
      { memory: WebAssembly.Memory; fit1(n: number): void; fit3(n: number): void };
    return { fit1: e.fit1, fit3: e.fit3, memory: e.memory, f64: new Float64Array(e.memory.buffer), bytes: e.memory.buffer.byteLength };
  } catch {
    return null;
  }
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

/** Makes room for `n` neighbour slots of `nc` components; returns the double index of slot 0. */
export function kernelSlots(k: MomentKernel, n: number, nc: number): number {
  const need = KERNEL_LAYOUT.slotsAt + n * 16 * (3 + nc);
  if (k.bytes < need) {
    k.memory.grow(Math.ceil((need - k.bytes) / 65536));
    k.f64 = new Float64Array(k.memory.buffer);
    k.bytes = k.memory.buffer.byteLength;
  }
  return KERNEL_LAYOUT.slotsAt / 8;
}

export { KERNEL_LAYOUT };
