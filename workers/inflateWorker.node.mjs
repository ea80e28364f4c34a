// An inflate worker of the parallel loader under Node (src/parallel/inflatePool.ts): inflates the zlib
// blocks it is given from one shared buffer into another with node:zlib. Plain JavaScript (no TypeScript
// loader), so it starts in a few milliseconds.
import { parentPort } from 'node:worker_threads';
import { inflateSync } from 'node:zlib';

parentPort.on('message', ({ id, input, output, jobs }) => {
  // jobs: [inStart, inLength, outStart, outLength] per block
  const got = [];
  for (let j = 0; j < jobs.length; j += 4) {
    const inStart = jobs[j], inLength = jobs[j + 1], outStart = jobs[j + 2], outLength = jobs[j + 3];
    try {
      const r = inflateSync(Buffer.from(input, inStart, inLength), { maxOutputLength: Math.max(64, 2 * outLength + 64) });
      new Uint8Array(output, outStart, Math.min(outLength, r.length)).set(r.subarray(0, outLength));
      got.push(r.length);
    } catch (e) {
      got.push(e instanceof Error ? e.message : String(e));
    }
  }
  parentPort.postMessage({ id, got });
});
