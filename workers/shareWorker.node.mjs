// A compute worker of the pool under Node (worker_threads): registers the TypeScript loader, then serves
// the pool's requests on the parent port (src/parallel/shareHost.ts).
import { parentPort } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register();
const { serveShares } = await import('../src/parallel/shareHost.ts');
serveShares({
  postMessage: (message, transfer) => parentPort.postMessage(message, transfer),
  onMessage: (handler) => parentPort.on('message', handler),
}, () => { const m = process.memoryUsage(); return { heapUsed: m.heapUsed, external: m.external, arrayBuffers: m.arrayBuffers }; });
parentPort.postMessage({ id: 0, ok: true, result: 'ready' });
