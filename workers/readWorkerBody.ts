// A read worker of the parallel loader under Node (src/parallel/readPool.ts): reads one part of an uncompressed
// array from the file descriptor its process opened (positional reads) into the shared final array, converting,
// swapping and checking as the one-thread read does (readPartSync in src/io/partReads.ts). Started through
// workers/readWorker.node.mjs from source, or bundled as dist-cli/readWorker.mjs (bin/build-cli.mjs).
import { readSync } from 'node:fs';
import { parentPort } from 'node:worker_threads';
import { pastEnd } from '../src/io/byteSource.ts';
import { targetView, type ArrayPlan } from '../src/io/elementConvert.ts';
import { ELEMENT_SIZE } from '../src/io/elementTypes.ts';
import { readPartSync } from '../src/io/partReads.ts';

interface PartMessage {
  id: number; descriptor: number; name: string; size: number; offset: number; plan: ArrayPlan;
  buffer: SharedArrayBuffer; byteOffset: number; length: number; from: number; to: number; step: number;
}

/** This thread's chunk buffer (grown when a larger chunk is asked for). */
let scratch = new Uint8Array(0);

const port = parentPort!;
port.on('message', (m: PartMessage) => {
  try {
    const bytes = m.step * ELEMENT_SIZE[m.plan.type];
    if (scratch.length < bytes) scratch = new Uint8Array(bytes);
    const fill = (at: number, target: Uint8Array): void => {
      for (let done = 0; done < target.length;) {
        const got = readSync(m.descriptor, target, done, target.length - done, at + done);
        if (got === 0) throw pastEnd(m.name, at, target.length, m.size);
        done += got;
      }
    };
    const scan = readPartSync(m.plan, targetView(m.plan, m.buffer, m.byteOffset, m.length), m.offset, m.from, m.to, m.step, fill, scratch);
    port.postMessage({ id: m.id, error: null, scan });
  } catch (e) {
    port.postMessage({ id: m.id, error: e instanceof Error ? e.message : String(e), scan: {} });
  }
});
// Started: from now on the loading thread leaves the parts to this thread (src/parallel/readPool.ts).
port.postMessage({ ready: true });
