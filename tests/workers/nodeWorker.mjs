// Runs workers/compute.worker.ts in a Node worker thread for the contract test: registers the
// TypeScript loader, then exposes the compute API through comlink's Node adapter. It also counts the
// bytes it hands over by transfer, so the test can tell transferred replies from copied ones.
import { parentPort } from 'node:worker_threads';
import { register } from 'tsx/esm/api';

register();
const Comlink = await import('comlink');
const { default: nodeEndpoint } = await import('comlink/dist/esm/node-adapter.mjs');
const { createComputeApi } = await import('../../workers/compute.worker.ts');

let transferred = 0;
const port = {
  postMessage(message, transfer) {
    for (const t of transfer ?? []) if (t instanceof ArrayBuffer) transferred += t.byteLength;
    parentPort.postMessage(message, transfer);
  },
  on: (type, listener) => parentPort.on(type, listener),
  off: (type, listener) => parentPort.off(type, listener),
};
const api = Object.assign(createComputeApi(), { transferredBytes: () => transferred });
Comlink.expose(api, nodeEndpoint(port));
