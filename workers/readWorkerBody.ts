// A read worker of the parallel loader under Node (src/parallel/readPool.ts): reads one part of an uncompressed
// array from the file descriptor its process opened (positional reads) into the shared final array, converting,
// swapping and checking as the one-thread read does (readPartSync in src/io/partReads.ts). Started through
// workers/readWorker.node.mjs from source, or bundled as dist-cli/readWorker.mjs (bin/build-cli.mjs).
import { parentPort } from 'node:worker_threads';
import { targetView, type ArrayPlan } from '../src/io/elementConvert.ts';
import { readPartFromFile } from '../src/parallel/partFromFile.ts';

interface PartMessage {
  id: number; descriptor: number; name: string; size: number; offset: number; plan: ArrayPlan;
  buffer: SharedArrayBuffer; byteOffset: number; length: number; from: number; to: number; step: number;
}

const port = parentPort!;
port.on('message', (m: PartMessage) => {
  try {
    const scan = readPartFromFile(m, targetView(m.plan, m.buffer, m.byteOffset, m.length), m.from, m.to);
    port.postMessage({ id: m.id, error: null, scan });
  } catch (e) {
    port.postMessage({ id: m.id, error: e instanceof Error ? e.message : String(e), scan: {} });
  }
});
// Started: from now on the loading thread leaves the parts to this thread (src/parallel/readPool.ts).
port.postMessage({ ready: true });
