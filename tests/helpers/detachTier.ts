// Run by tests/parallel/detachOnce.test.ts in a fresh process with --allow-natives-syntax (one isolate, so the
// engine's detach assumption starts intact): compiles a typed-array loop with the optimising compiler, transfers
// a buffer as a worker's reply does, and prints whether the loop is still optimised.
// Mode `plain`: nothing before; `served`: `serveShares` first (it detaches before its warm-up), the loop
// compiled in that warm-up, as a share worker's kernels are.
import { serveShares } from '../../src/parallel/shareHost.ts';

const sum = (a: Float64Array): number => { let s = 0; for (let i = 0; i < a.length; i++) s += a[i]!; return s; };
const optimise = new Function('f', 'a', '%PrepareFunctionForOptimization(f); f(a); f(a); %OptimizeFunctionOnNextCall(f); f(a); return %ActiveTierIsTurbofan(f);') as (f: unknown, a: unknown) => boolean;
const optimised = new Function('f', 'return %ActiveTierIsTurbofan(f);') as (f: unknown) => boolean;
const values = new Float64Array(64).fill(1);

function reply(): void {
  const b = new ArrayBuffer(16);
  structuredClone(b, { transfer: [b] });
}

let before = false;
if (process.argv[2] === 'served') {
  await new Promise<void>((resolve) => {
    serveShares({ postMessage: () => undefined, onMessage: () => undefined }, () => null,
      async () => { before = optimise(sum, values); resolve(); });
  });
} else {
  before = optimise(sum, values);
}
reply();
process.stdout.write(JSON.stringify({ before, after: optimised(sum) }));
