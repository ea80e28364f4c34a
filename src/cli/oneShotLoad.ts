/**
 * Loading for a verb that computes one thing on one file and exits (`cut`): by default the file is read and
 * the plane cut in this process, on one thread, with no worker started.
 *
 * Why: the compute pool (src/parallel/nodePool.ts) starts a worker per core, copies the dataset into shared
 * memory and warms each worker up; that is paid back over many probes (the app, `report --workers`), never
 * by a single cut. Measured on the 1M-cell benchmark files (sample-fields/large/, 2 cores, machine loaded;
 * CPU time of the whole installed command, one thread / pool of 2): hexahedra raw 0.83 / 1.63 s, zlib
 * 0.99 / 2.18 s, tetrahedra raw 0.85 / 1.51 s, zlib 1.02 / 1.04 s. Nor do inflate threads alone pay here:
 * loading with 2 of them took 1.0–1.2 s of CPU against 0.36–0.54 s on one thread (hexahedra, zlib), and
 * 0.65–0.71 s against 0.22–0.24 s (tetrahedra, zlib), with no wall-time gain measurable on 2 cores
 * (only arrays decoded straight into place are inflated by the threads; 64-bit connectivity is narrowed
 * on the main thread either way).
 *
 * `--workers N` with N ≥ 2 given on the command line still opens the compute pool (`loadForCompute`): the
 * numbers are the same either way (tests/cli/verbs/oneShotCut.test.ts).
 */
import { loadDatasetFile } from '../io/nodeFiles.ts';
import { str, type OptionKind, type ParsedArgs } from './args.ts';
import type { ComputeInput } from './workerOption.ts';

/** The one-shot verbs' `--workers` option (the same option as `WORKER_OPTIONS`, declared here so the pool's modules load only when it is given). */
export const ONE_SHOT_WORKER_OPTIONS: Record<string, OptionKind> = { workers: 'string' };

export const ONE_SHOT_WORKER_HELP = '  --workers N           compute workers sharing the cells (default 1: the one plane is cut in this process, which is faster than starting workers); N ≥ 2 opens the pool and inflates zlib blocks on N threads';

/**
 * Loads `file` for a one-shot computation (units and layout: the file's). Returns the dataset with no pool,
 * unless `--workers N` (N ≥ 2) was given, which opens the compute pool as the other verbs do.
 */
export async function loadForOneShot(file: string, args: ParsedArgs): Promise<ComputeInput> {
  const asked = str(args, 'workers');
  // The pool's modules (and node:worker_threads) are loaded only when asked for: a one-shot start-up does not pay for them.
  if (asked !== undefined) {
    const [{ poolSize }, { loadForCompute }] = await Promise.all([import('../parallel/nodePool.ts'), import('./workerOption.ts')]);
    if (poolSize(asked) > 1) return loadForCompute(file, args);
  }
  return { dataset: await loadDatasetFile(file), pool: null, close: async () => {} };
}
