/** Starts the compute worker and wraps it in the typed comlink proxy. */
import * as Comlink from 'comlink';
import type { ComputeApi } from '../../workers/api.ts';

export type Compute = Comlink.Remote<ComputeApi>;

/** One worker per page; the dataset lives there. */
export function startCompute(): Compute {
  const worker = new Worker(new URL('../../workers/compute.worker.ts', import.meta.url), { type: 'module', name: 'fieldtally-compute' });
  return Comlink.wrap<ComputeApi>(worker);
}
