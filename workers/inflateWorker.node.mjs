// An inflate worker of the parallel loader under Node (src/parallel/inflatePool.ts): inflates the zlib
// blocks it is given from one shared buffer into another with node:zlib. Plain JavaScript (no TypeScript
// loader), so it starts in a few milliseconds.
//
// One zlib engine, reset per block, inflates straight into the output (the engine's `_handle.writeSync` and
// `_writeState`, as src/io/nodeFiles.ts `engineInflate` on the loading thread): `inflateSync` per 32 KiB block
// made a fresh stream and output buffers each time and cost 2–3× as much CPU. Where the engine's parts are
// missing, `inflateSync` as before.
import { parentPort } from 'node:worker_threads';
import { constants, createInflate, inflateSync } from 'node:zlib';

let engine;
const spill = new Uint8Array(4096);

/** Inflates `block` into `out`; returns the inflated length (more than `out.length` when the stream is longer). */
function engineInflate(block, out) {
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

/** `inflateSync` into `out`: what was used before, and what runs where the engine's parts are missing. */
function publicInflate(block, out) {
  const r = inflateSync(block, { maxOutputLength: Math.max(64, 2 * out.length + 64) });
  out.set(r.subarray(0, out.length));
  return r.length;
}

const probe = createInflate();
probe.on('error', () => undefined);
const inflate = typeof probe._handle?.writeSync === 'function' && probe._writeState instanceof Uint32Array ? engineInflate : publicInflate;
probe.close();

parentPort.on('message', ({ id, input, output, jobs }) => {
  // jobs: [inStart, inLength, outStart, outLength] per block
  const got = [];
  for (let j = 0; j < jobs.length; j += 4) {
    const inStart = jobs[j], inLength = jobs[j + 1], outStart = jobs[j + 2], outLength = jobs[j + 3];
    try {
      got.push(inflate(new Uint8Array(input, inStart, inLength), new Uint8Array(output, outStart, outLength)));
    } catch (e) {
      got.push(e instanceof Error ? e.message : String(e));
    }
  }
  parentPort.postMessage({ id, got });
});
