/**
 * A compute worker of the pool in the browser: serves the pool's requests (src/parallel/shareHost.ts) on
 * this worker's message port. Started by the app's compute worker, one per share of the cells.
 */
import { serveShares, type ShareMessage } from '../src/parallel/shareHost.ts';

const scope = self as unknown as {
  postMessage(m: unknown, transfer: Transferable[]): void;
  addEventListener(type: 'message', h: (e: MessageEvent<ShareMessage>) => void): void;
};
serveShares({
  postMessage: (message, transfer) => scope.postMessage(message, transfer),
  onMessage: (handler) => scope.addEventListener('message', (e) => handler(e.data)),
});
scope.postMessage({ id: 0, ok: true, result: 'ready' }, []);
