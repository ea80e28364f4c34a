// An inflate worker of the parallel loader under Node (src/parallel/inflatePool.ts): inflates the zlib
// blocks it is given from one shared buffer into another with node:zlib. Plain JavaScript (no TypeScript
// loader), so it starts in a few milliseconds.
//
// One zlib engine, reset per block, inflates straight into the output (src/io/zlibEngine.mjs, as on the loading
// thread): `inflateSync` per 32 KiB block made a fresh stream and output buffers each time and cost 2–3× as
// much CPU. Where the engine's parts are missing, `inflateSync` as before.
import { parentPort } from 'node:worker_threads';
import { inflateSync } from 'node:zlib';
import { engineInflate, engineWorks } from '../src/io/zlibEngine.mjs';

/** `inflateSync` into `out`: what was used before, and what runs where the engine's parts are missing. */
function publicInflate(block, out) {
  const r = inflateSync(block, { maxOutputLength: Math.max(64, 2 * out.length + 64) });
  out.set(r.subarray(0, out.length));
  return r.length;
}

const inflate = engineWorks() ? engineInflate : publicInflate;

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
