// Inflating a zlib block straight into a caller's buffer with one reused node:zlib engine (Node only): no
// stream and no output buffers per block, which `inflateSync` makes (2–3× the CPU on 32 KiB blocks). Relies on
// the engine's `_handle.writeSync` and `_writeState`, as Node's own `inflateSync` does; `engineWorks` says
// whether this Node has them. Plain JavaScript, so the plain-JavaScript inflate workers
// (workers/inflateWorker.node.mjs) share it with the loading thread (src/io/nodeFiles.ts). Types: zlibEngine.d.mts.
import { constants, createInflate } from 'node:zlib';

let engine;
const spill = new Uint8Array(4096);

/**
 * Inflates `block` into `out`; returns the inflated length, more than `out.length` when the stream holds
 * more than that. A corrupt stream throws zlib's message.
 */
export function engineInflate(block, out) {
  if (!engine || engine.destroyed) {
    engine = createInflate();
    engine.on('error', () => undefined);
  }
  const z = engine;
  z.reset();
  z._handle.writeSync(constants.Z_FINISH, block, 0, block.length, out, 0, out.length);
  if (z.destroyed) throw z.errored ?? new Error('invalid zlib data');
  const [availOut, availIn] = z._writeState;
  if (availOut > 0) return out.length - availOut;
  // Output full: the stream may hold more than declared.
  z._handle.writeSync(constants.Z_FINISH, block, block.length - availIn, availIn, spill, 0, spill.length);
  if (z.destroyed) throw z.errored ?? new Error('invalid zlib data');
  return out.length + (spill.length - z._writeState[0]);
}

/** Whether this Node's zlib engine has the parts `engineInflate` uses. */
export function engineWorks() {
  try {
    const probe = createInflate();
    probe.on('error', () => undefined);
    const ok = typeof probe._handle?.writeSync === 'function' && probe._writeState instanceof Uint32Array;
    probe.close();
    return ok;
  } catch {
    return false;
  }
}
