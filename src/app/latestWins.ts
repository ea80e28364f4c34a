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
