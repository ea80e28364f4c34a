// A compute worker of the pool under Node (worker_threads): serves the pool's requests on the parent port
// (src/parallel/shareHost.ts). Started through workers/shareWorker.node.mjs from source, or bundled as
// dist-cli/shareWorker.mjs in the installed command (bin/build-cli.mjs).
import { readFileSync } from 'node:fs';
import { parentPort } from 'node:worker_threads';
import { serveShares, type ShareMessage } from '../src/parallel/shareHost.ts';

const port = parentPort!;
serveShares({
  postMessage: (message, transfer) => port.postMessage(message, transfer),
  onMessage: (handler) => port.on('message', (m: ShareMessage) => handler(m)),
}, () => { const m = process.memoryUsage(); return { heapUsed: m.heapUsed, external: m.external, arrayBuffers: m.arrayBuffers, cpuMs: threadCpuMs() }; });

/** This thread's CPU time (ms) where Linux tells it (/proc/thread-self/schedstat: nanoseconds on a CPU first), else null. */
function threadCpuMs(): number | null {
  try {
    return Number(readFileSync('/proc/thread-self/schedstat', 'utf8').split(' ')[0]) / 1e6;
  } catch {
    return null;
  }
}
port.postMessage({ id: 0, ok: true, result: 'ready' });
