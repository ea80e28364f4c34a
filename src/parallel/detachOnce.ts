/**
 * Spends, once per thread, the engine's "no array buffer was ever detached" assumption before any kernel is
 * compiled. V8 compiles typed-array loops on that assumption while it holds; the first detach in a thread
 * (a buffer transferred by postMessage, as a share worker's replies are) throws away every optimised function
 * that touched a typed array, in that thread, at once. A pool worker's first reply did that right after its
 * first cut, so its next cut ran its scan, cut and placement unoptimised (about 24 MB of boxed doubles, 3–5×
 * the CPU) while they were compiled again. Detached here, before the warm-up, the kernels are compiled once
 * with the detach checks and stay — at the price of those checks on every typed-array access (~15 % on the
 * wall fit). So share workers no longer transfer anything (shareHost.ts posts copies) and do not call this;
 * the app's compute worker, whose replies must transfer drawing arrays, does.
 */
let done = false;

/** Detaches one empty buffer (by a transferring structured clone) the first time it is called in a thread. */
export function detachOnce(): void {
  if (done) return;
  done = true;
  const b = new ArrayBuffer(8);
  structuredClone(b, { transfer: [b] });
}
