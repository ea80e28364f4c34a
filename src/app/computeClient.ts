/** Starts the compute worker and wraps it in the typed comlink proxy. */
import * as Comlink from 'comlink';
import type { ComputeApi } from '../../workers/api.ts';
import { computeWorkerName, requestedWorkers } from '../parallel/poolPlan.ts';

export type Compute = Comlink.Remote<ComputeApi>;

/**
 * One compute worker per page; the dataset lives there (shared with its share workers when the page is
 * cross-origin isolated). A `?workers=N` in the page address reaches it through the worker's name.
 */
export function startCompute(): Compute {
  const asked = requestedWorkers(location.search);
  const worker = new Worker(new URL('../../workers/compute.worker.ts', import.meta.url), { type: 'module', name: computeWorkerName(asked) });
  return Comlink.wrap<ComputeApi>(worker);
}
