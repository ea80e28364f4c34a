/**
 * The `--workers N` option shared by the verbs that compute on one file (cut, line, force and surfaces):
 * how many compute workers share the file's cells (src/parallel/), and decode its zlib blocks. Default: `FIELDTALLY_WORKERS`,
 * else one per core, for files of at least `POOL_MIN_FILE_BYTES`; smaller files (where starting workers
 * costs more than it saves) and `--workers 1` run in this process on the single-thread core.
 */
import { stat } from 'node:fs/promises';
import { loadDatasetFile } from '../io/nodeFiles.ts';
import type { Dataset } from '../model/dataset.ts';
import { openNodePool, poolSize, startNodeWorkers } from '../parallel/nodePool.ts';
import type { ComputePool } from '../parallel/pool.ts';
import { startInflatePool } from '../parallel/inflatePool.ts';
import { startReadPool } from '../parallel/readPool.ts';
import { startTextPool } from '../parallel/textPool.ts';
import { str, type ParsedArgs } from './args.ts';
import type { OptionKind } from './args.ts';

/** Files smaller than this (bytes) use no pool unless `--workers` asks for one. */
export const POOL_MIN_FILE_BYTES = 8 * 1024 * 1024;

/**
 * Files of at least this many bytes have their large raw arrays read in parts on threads (src/parallel/readPool.ts),
 * straight into the pool's shared memory. Measured on 2 cores (machine loaded): on the 10M-hexahedron file (1.3 GB)
 * it saves the copy into shared memory — 3.7–4.7 s of CPU and a 1.07 GB peak against 6.9 s and 1.93 GB; on the 1M
 * files (55–114 MB) the read threads, starting beside the compute workers, made the load 0.2–0.6 s slower, so
 * those read on one thread — like every file here, straight into shared memory (`sharedArrays`), so the pool
 * copies nothing.
 */
export const READ_PARTS_MIN_FILE_BYTES = 256 * 1024 * 1024;

export const WORKER_OPTIONS: Record<string, OptionKind> = { workers: 'string' };

export const WORKER_HELP = '  --workers N           compute workers sharing the cells (default: FIELDTALLY_WORKERS, else one per core, for files of 8 MiB or more); 1: none';

/** A loaded file and, when workers are used, the pool holding it (then `dataset` is the pool's shared copy). */
export interface ComputeInput {
  dataset: Dataset;
  pool: ComputePool | null;
  /** Ends the workers (call when done; the process cannot exit while they run). */
  close(): Promise<void>;
}

/** Loads `file` and, as `--workers` and the defaults say, opens a pool over it; workers start while the file loads. */
export async function loadForCompute(file: string, args: ParsedArgs): Promise<ComputeInput> {
  const asked = str(args, 'workers');
  const n = poolSize(asked);
  let wanted = n > 1;
  const size = await stat(file).then((s) => s.size, () => 0);
  if (wanted && asked === undefined) wanted = size >= POOL_MIN_FILE_BYTES;
  if (!wanted) {
    const dataset = await loadDatasetFile(file);
    return { dataset, pool: null, close: async () => {} };
  }
  const ports = startNodeWorkers(n);
  // zlib blocks are inflated by as many threads while the compute workers start.
  const inflaters = startInflatePool(n);
  // ASCII and base64 arrays are decoded by as many threads (started at the first such array only).
  const parsers = startTextPool(n);
  // Large raw arrays of a large file are read in parts by as many threads, straight into the shared memory the pool then uses.
  const readers = size >= READ_PARTS_MIN_FILE_BYTES ? startReadPool(n) : undefined;
  let dataset: Dataset;
  try {
    // Every array is decoded straight into shared memory, so the pool takes the dataset without a copy.
    dataset = await loadDatasetFile(file, {
      inflate: inflaters.inflate, parseText: parsers.parseText, decodeBase64: parsers.decodeBase64, sharedArrays: true,
      ...(readers ? { readParts: readers.readParts } : {}),
    });
  } catch (e) {
    await Promise.all(ports.map((p) => p.terminate()));
    throw e;
  } finally {
    await Promise.all([inflaters.close(), parsers.close(), readers?.close()]);
  }
  const pool = await openNodePool(dataset, n, ports);
  return { dataset: pool.dataset, pool, close: () => pool.close() };
}

/** A series of fewer steps than this (in its window) runs in this process unless `--workers` asks for threads. */
export const SERIES_POOL_MIN_STEPS = 16;

export const SERIES_WORKER_HELP = '  --workers N           threads evaluating runs of steps at once (default: FIELDTALLY_WORKERS, else one per core, for 16 steps or more); 1: none';

/**
 * How many threads evaluate the steps of a series (src/parallel/seriesPool.ts): `--workers` if given, else
 * `FIELDTALLY_WORKERS` or one per core when the window holds at least `SERIES_POOL_MIN_STEPS` steps (starting a
 * thread costs a few hundred ms), else 1.
 */
export function seriesWorkerCount(asked: string | undefined, steps: number): number {
  const n = poolSize(asked);
  return asked === undefined && steps < SERIES_POOL_MIN_STEPS ? 1 : n;
}
