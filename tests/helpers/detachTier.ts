// Run by tests/parallel/detachOnce.test.ts in a fresh process with --allow-natives-syntax (one isolate, so the
// engine's detach assumption starts intact): compiles a typed-array loop with the optimising compiler and
// prints whether it is still optimised afterwards.
// Mode `plain`: a buffer is then transferred, as a reply with a transfer list would (the engine behaviour).
// Mode `served`: the loop is compiled in `serveShares`' warm-up, as a share worker's kernels are; the worker
// then answers a request whose result holds a fresh typed array, and the transfer list it posts is reported.
import { serveShares, type ShareMessage, type ShareReply } from '../../src/parallel/shareHost.ts';

const sum = (a: Float64Array): number => { let s = 0; for (let i = 0; i < a.length; i++) s += a[i]!; return s; };
const optimise = new Function('f', 'a', '%PrepareFunctionForOptimization(f); f(a); f(a); %OptimizeFunctionOnNextCall(f); f(a); return %ActiveTierIsTurbofan(f);') as (f: unknown, a: unknown) => boolean;
const optimised = new Function('f', 'return %ActiveTierIsTurbofan(f);') as (f: unknown) => boolean;
const values = new Float64Array(64).fill(1);

let before = false, transferred = -1, fresh = -1;
if (process.argv[2] === 'served') {
  let handler: (m: ShareMessage) => void = () => undefined;
  const replied = new Promise<ShareReply>((resolve) => {
    serveShares({ postMessage: (r, transfer) => { transferred = transfer.length; resolve(r); }, onMessage: (h) => { handler = h; } },
      // a result with a fresh (not shared) array, as a share's boundary faces or wall gradient are
      () => ({ heapUsed: 1, external: 2, arrayBuffers: 3, fresh: new Float64Array(16).fill(2) }) as never,
      async () => { before = optimise(sum, values); });
  });
  handler({ id: 1, op: 'memory' } as ShareMessage);
  const r = await replied;
  fresh = r.ok ? (r.result as { fresh: Float64Array }).fresh.byteLength : -1;
} else {
  before = optimise(sum, values);
  const b = new ArrayBuffer(16);
  structuredClone(b, { transfer: [b] });
}
process.stdout.write(JSON.stringify({ before, after: optimised(sum), transferred, fresh }));
