/**
 * How many compute workers the app uses, and the sentence the about box shows about it. Pure: the page and
 * the compute worker pass in what their platform says (cross-origin isolation, `navigator.hardwareConcurrency`,
 * a `?workers=N` setting in the page address).
 */
import { MAX_WORKERS } from './pool.ts';

/** Datasets with fewer cells than this run on the compute worker alone (starting helpers would cost more). */
export const POOL_MIN_CELLS = 50_000;

/** What the platform offers. */
export interface PoolPlatform {
  /** `crossOriginIsolated` of the page (shared memory is only allowed then). */
  isolated: boolean;
  /** Logical processors (`navigator.hardwareConcurrency`); 0 or absent when unknown. */
  cores: number;
  /** A worker count asked for in the page address (`?workers=N`), if any. */
  requested?: number;
}

export interface PoolPlan {
  /** Workers sharing the cells (1: the compute worker alone). */
  workers: number;
  /** Whether the workers share memory. */
  shared: boolean;
  /** One sentence for the about box. */
  note: string;
}

/** Reads `?workers=N` from a page address: a whole number 1 … 256, else undefined. */
export function requestedWorkers(search: string): number | undefined {
  const v = new URLSearchParams(search).get('workers');
  if (v === null || !/^\d+$/.test(v)) return undefined;
  const n = Number(v);
  return n >= 1 && n <= MAX_WORKERS ? n : undefined;
}

/** The compute worker's name, carrying a requested worker count (a dedicated worker cannot see the page's address). */
export function computeWorkerName(requested: number | undefined): string {
  return `fieldtally-compute${requested ? ` workers=${requested}` : ''}`;
}

/** The requested worker count carried by `computeWorkerName`, else undefined. */
export function workersFromName(name: string): number | undefined {
  return requestedWorkers(`?${name.split(' ').slice(1).join('&')}`);
}

/**
 * The plan for a platform: when isolated, one worker per core but one (that core is left to the page, so
 * drawing stays smooth while a probe computes — common practice), or as requested; else one.
 */
export function planPool(p: PoolPlatform): PoolPlan {
  if (!p.isolated) {
    return {
      workers: 1, shared: false,
      note: 'Computing with one worker: this page is not cross-origin isolated (its server sends no COOP/COEP headers and no service worker could add them, e.g. when opened from a file), so workers cannot share memory. Results are the same, only slower on large files.',
    };
  }
  const cores = Math.max(1, Math.floor(p.cores || 1));
  const n = Math.min(MAX_WORKERS, p.requested ?? Math.max(1, cores - 1));
  return {
    workers: n, shared: true,
    note: n > 1
      ? `Computing with ${n} workers that share the file's arrays in memory (${p.requested ? 'as asked in the address' : 'one per processor core, one core left to the page'}), for files of ${POOL_MIN_CELLS.toLocaleString('en')} cells or more; results are the same as with one.`
      : `Computing with one worker: the page is cross-origin isolated, but ${p.requested ? 'one worker was asked for in the address' : `this computer reports ${cores} core${cores > 1 ? 's' : ''} and one is left to the page`} (?workers=N in the address asks for more).`,
  };
}
