/**
 * Timing of the worker calls behind what the user waits for (a load, a cut, a line probe), split into the
 * parts the viewer benchmark reports: waiting to be taken up and arguments crossing (`sentAt → startedAt`),
 * worker compute (`startedAt → finishedAt`), the reply crossing back (`finishedAt → receivedAt`) and
 * drawing it (`receivedAt → drawnAt`, the next frame on screen). Each finished call leaves a user-timing
 * mark named `fieldtally:call` whose `detail` is a `CallTiming`; nothing else reads them.
 */
import type { WorkerStamps } from '../../workers/api.ts';

/** One call's stamps, ms since the epoch (`performance.timeOrigin + performance.now()`, the worker's clock too). */
export interface CallTiming {
  /** Which call: `load`, `surface`, `surfaceValues`, `cut`, `sample`. */
  what: string;
  /** The probe it was for, when it was for one. */
  id?: string;
  sentAt: number;
  /** From the worker's reply; absent when the worker did not say. */
  startedAt?: number;
  finishedAt?: number;
  /** The worker's split of its part (`WorkerStamps.phases`), when it gave one. */
  phases?: Record<string, number>;
  receivedAt: number;
  /** The first frame showing the reply; absent for a call that draws nothing by itself. */
  drawnAt?: number;
}

/** Name of the user-timing marks. */
export const CALL_MARK = 'fieldtally:call';

/** The stamps' clock, in the page. */
export const epochNow = (): number => performance.timeOrigin + performance.now();

const waiting = new WeakMap<object, CallTiming>();

/**
 * Runs a worker call and remembers when it was sent and its reply received. With `drawn` false the mark is
 * left at once; otherwise `markDrawn(reply, …)` leaves it after the frame that shows the reply.
 */
export async function timedCall<R extends { timing?: WorkerStamps }>(what: string, call: () => Promise<R>, drawn: boolean, id?: string): Promise<R> {
  const sentAt = epochNow();
  const reply = await call();
  const t: CallTiming = {
    what, ...(id !== undefined ? { id } : {}), sentAt, receivedAt: epochNow(),
    ...(reply.timing ? { startedAt: reply.timing.startedAt, finishedAt: reply.timing.finishedAt } : {}),
    ...(reply.timing?.phases ? { phases: reply.timing.phases } : {}),
  };
  if (drawn) waiting.set(reply, t); else leaveMark(t);
  return reply;
}

/** Leaves the mark of a reply timed by `timedCall` once `frame` (the next frame on screen) resolves. */
export function markDrawn(reply: object, frame: Promise<void>): void {
  const t = waiting.get(reply);
  if (!t) return;
  waiting.delete(reply);
  void frame.then(() => leaveMark({ ...t, drawnAt: epochNow() }));
}

/** Marks kept at most (a long drag leaves one per step): older ones are cleared. */
const MARKS_KEPT = 1000;
let marksLeft = 0;

function leaveMark(t: CallTiming): void {
  if (++marksLeft > MARKS_KEPT) { performance.clearMarks(CALL_MARK); marksLeft = 1; }
  performance.mark(CALL_MARK, { detail: t });
}
