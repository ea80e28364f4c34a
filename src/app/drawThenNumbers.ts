/**
 * Request scheduling for a probe that is dragged: each live step first asks for the picture only (cheap),
 * and the numbers follow once no newer picture is waiting. Per key (probe) at most one call is in flight;
 * while it runs, newer requests replace the waiting ones (the latest wins), and a waiting picture goes
 * before waiting numbers. A request that is not live asks for the numbers (which bring the picture too)
 * and drops a waiting picture-only step.
 */

export interface DrawThenNumbers<A> {
  /** `live`: a drag step (picture first, numbers after); otherwise the numbers (and picture) at once. */
  request(arg: A, live: boolean): void;
  /** Resolves when nothing runs or waits for this key. */
  idle(key: unknown): Promise<void>;
}

interface Lane<A> {
  busy: boolean;
  picture: A | undefined;
  numbers: A | undefined;
  waiters: (() => void)[];
}

/**
 * `picture(arg)` computes the drawing only and `numbers(arg)` everything; their results go to `onPicture`
 * and `onNumbers` in the order the calls finish; errors go to `onError`.
 */
export function drawThenNumbers<A, P, N>(key: (arg: A) => unknown, picture: (arg: A) => Promise<P>, numbers: (arg: A) => Promise<N>,
  onPicture: (r: P, arg: A) => void, onNumbers: (r: N, arg: A) => void, onError: (e: unknown) => void): DrawThenNumbers<A> {
  const lanes = new Map<unknown, Lane<A>>();
  const pump = async (lane: Lane<A>): Promise<void> => {
    lane.busy = true;
    while (lane.picture !== undefined || lane.numbers !== undefined) {
      if (lane.picture !== undefined) {
        const arg = lane.picture;
        lane.picture = undefined;
        try { onPicture(await picture(arg), arg); } catch (e) { onError(e); }
      } else {
        const arg = lane.numbers!;
        lane.numbers = undefined;
        try { onNumbers(await numbers(arg), arg); } catch (e) { onError(e); }
      }
    }
    lane.busy = false;
    const w = lane.waiters;
    lane.waiters = [];
    for (const f of w) f();
  };
  return {
    request(arg, live) {
      const k = key(arg);
      let lane = lanes.get(k);
      if (!lane) { lane = { busy: false, picture: undefined, numbers: undefined, waiters: [] }; lanes.set(k, lane); }
      lane.picture = live ? arg : undefined;
      lane.numbers = arg;
      if (!lane.busy) void pump(lane);
    },
    idle(k) {
      const lane = lanes.get(k);
      return !lane || (!lane.busy && lane.picture === undefined && lane.numbers === undefined) ? Promise.resolve() : new Promise<void>((r) => lane.waiters.push(r));
    },
  };
}
