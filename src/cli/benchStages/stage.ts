/**
 * A timed stage of `fieldtally bench`. Each compute feature adds a file in this folder that
 * default-exports a `BenchStage`; the bench verb runs them in `order` on the loaded dataset.
 */
import type { Dataset } from '../../model/dataset.ts';
import type { ComputePool } from '../../parallel/pool.ts';

export interface BenchStage {
  /** Key of the stage's object in the JSON output. */
  name: string;
  /** Stages run in ascending order (load is 0). */
  order: number;
  /** Runs and times the stage; returns figures (milliseconds as `…Ms`, bytes as `…Bytes`). */
  run(dataset: Dataset): Promise<Record<string, unknown>>;
  /**
   * The stage with its work on the worker pool (`bench --workers N`, N > 1), `pool.dataset` being the loaded
   * file; stages without it run `run` on this thread (over the pool's shared copy) and say so.
   */
  runOnPool?(pool: ComputePool): Promise<Record<string, unknown>>;
}

/** Milliseconds taken by `fn`, with its result. */
export async function timed<T>(fn: () => T | Promise<T>): Promise<[T, number]> {
  const t0 = performance.now();
  const r = await fn();
  return [r, performance.now() - t0];
}
