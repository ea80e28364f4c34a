/**
 * How many workers the app uses (src/parallel/poolPlan.ts): one per core but one when the page is
 * cross-origin isolated (a core left to the page: common practice), `?workers=N` when asked, one otherwise;
 * and the sentence the about box shows. Also the cell shares the pool splits a dataset into.
 */
import { describe, expect, it } from 'vitest';
import { computeWorkerName, planPool, requestedWorkers, workersFromName } from '../../src/parallel/poolPlan.ts';
import { checkWorkerCount } from '../../src/parallel/pool.ts';
import { splitCells } from '../../src/parallel/shares.ts';

describe('pool plan', () => {
  it('isolated: cores − 1 workers sharing memory, at least one', () => {
    expect(planPool({ isolated: true, cores: 8 })).toMatchObject({ workers: 7, shared: true });
    expect(planPool({ isolated: true, cores: 8 }).note).toMatch(/^Computing with 7 workers that share the file's arrays in memory \(one per processor core, one core left to the page\)/);
    expect(planPool({ isolated: true, cores: 2 })).toMatchObject({ workers: 1 });
    expect(planPool({ isolated: true, cores: 2 }).note).toMatch(/reports 2 cores and one is left to the page/);
    expect(planPool({ isolated: true, cores: 0 })).toMatchObject({ workers: 1 });
    expect(planPool({ isolated: true, cores: 2, requested: 3 })).toMatchObject({ workers: 3 });
  });

  it('not isolated: one worker, and the about box says why', () => {
    const p = planPool({ isolated: false, cores: 16, requested: 4 });
    expect(p).toMatchObject({ workers: 1, shared: false });
    expect(p.note).toMatch(/^Computing with one worker: this page is not cross-origin isolated/);
  });

  it('?workers=N: a whole number 1 … 256, else ignored; carried by the compute worker\'s name', () => {
    expect(requestedWorkers('?workers=3')).toBe(3);
    expect(requestedWorkers('?x=1&workers=12')).toBe(12);
    for (const bad of ['?workers=0', '?workers=1.5', '?workers=abc', '?workers=257', '', '?workers=']) expect(requestedWorkers(bad)).toBeUndefined();
    expect(workersFromName(computeWorkerName(5))).toBe(5);
    expect(workersFromName(computeWorkerName(undefined))).toBeUndefined();
    expect(computeWorkerName(undefined)).toBe('fieldtally-compute');
  });

  it('worker counts from options are checked with a one-line message', () => {
    expect(checkWorkerCount('4', '--workers')).toBe(4);
    expect(() => checkWorkerCount('0', '--workers')).toThrow('--workers: expected a whole number of workers from 1 to 256, got "0"');
    expect(() => checkWorkerCount(2.5, 'FIELDTALLY_WORKERS')).toThrow(/^FIELDTALLY_WORKERS: expected a whole number/);
  });
});

describe('cell shares', () => {
  it('contiguous, covering every cell once, sizes differing by at most one', () => {
    expect(splitCells(10, 3)).toEqual([{ start: 0, end: 4 }, { start: 4, end: 7 }, { start: 7, end: 10 }]);
    expect(splitCells(2, 5)).toEqual([{ start: 0, end: 1 }, { start: 1, end: 2 }]);
    expect(splitCells(0, 4)).toEqual([{ start: 0, end: 0 }]);
    expect(() => splitCells(5, 0)).toThrow(/share count must be a whole number ≥ 1/);
  });
});
