/**
 * Request throttling for live updates (dragging a plane or a line end): at most one request in flight;
 * while one runs, newer requests replace each other and only the latest is sent when it finishes.
 */

/**
 * Wraps an async function so that calls never overlap. Each call's result goes to `onResult`; results
 * of calls that were superseded before they started are never computed. Errors go to `onError`.
 */
export function latestWins<A, R>(run: (arg: A) => Promise<R>, onResult: (r: R, arg: A) => void, onError: (e: unknown) => void): {
  request: (arg: A) => void;
  /** Resolves when nothing is running or waiting. */
  idle: () => Promise<void>;
} {
  let busy = false;
  let pending: { arg: A } | undefined;
  let waiters: (() => void)[] = [];
  const pump = async (): Promise<void> => {
    while (pending) {
      const { arg } = pending;
      pending = undefined;
      busy = true;
      try { onResult(await run(arg), arg); } catch (e) { onError(e); }
      busy = false;
    }
    const w = waiters; waiters = [];
    for (const f of w) f();
  };
  return {
    request(arg) {
      pending = { arg };
      if (!busy) void pump();
    },
    idle() {
      return !busy && !pending ? Promise.resolve() : new Promise<void>((r) => waiters.push(r));
    },
  };
}

/**
 * `latestWins` per key (e.g. per probe): requests for one key replace each other, requests for different
 * keys never do, so a set of several planes loaded at once computes every one of them.
 */
export function latestWinsPerKey<A, R>(key: (arg: A) => unknown, run: (arg: A) => Promise<R>, onResult: (r: R, arg: A) => void,
  onError: (e: unknown) => void): { request: (arg: A) => void } {
  const lanes = new Map<unknown, ReturnType<typeof latestWins<A, R>>>();
  return {
    request(arg) {
      const k = key(arg);
      let lane = lanes.get(k);
      if (!lane) { lane = latestWins(run, onResult, onError); lanes.set(k, lane); }
      lane.request(arg);
    },
  };
}
