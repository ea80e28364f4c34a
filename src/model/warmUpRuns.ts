/**
 * Bookkeeping shared by the kernel warm-ups (src/locate/warmUp.ts, src/surface/warmUp.ts): each runs once per
 * thread and dataset shape, and gives way to other tasks between its steps.
 */
import type { Dataset } from './dataset.ts';

/** Gives the datasets of a warm-up the object shape a thread's real datasets have (undefined: a reader's). */
export type Reshape = (d: Dataset) => Dataset;

/** Resolves after the tasks already queued have run (a warm-up step of a few ms at a time holds nothing up). */
export const yieldNow = (): Promise<void> => new Promise<void>((resolve) => setTimeout(resolve, 0));

/**
 * A warm-up that runs once per `reshape`: the first call with a given `reshape` starts `warm(reshape)`, later
 * calls with the same one (by identity) return its promise.
 */
export function oncePerShape(warm: (reshape?: Reshape) => Promise<void>): (reshape?: Reshape) => Promise<void> {
  const runs = new Map<Reshape | undefined, Promise<void>>();
  return (reshape) => {
    let run = runs.get(reshape);
    if (!run) { run = warm(reshape); runs.set(reshape, run); }
    return run;
  };
}
