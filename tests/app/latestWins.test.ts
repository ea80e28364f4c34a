/** Live-update throttling: one request in flight, the latest waiting one wins, no result is lost or reordered. */
import { describe, expect, it } from 'vitest';
import { latestWins, latestWinsPerKey } from '../../src/app/latestWins.ts';

describe('latestWins', () => {
  it('runs the first and the last of a burst, in order', async () => {
    const ran: number[] = [], got: number[] = [];
    const q = latestWins(async (x: number) => { ran.push(x); await new Promise((r) => setTimeout(r, 5)); return x * 10; }, (r) => got.push(r), (e) => { throw e; });
    for (let i = 1; i <= 5; i++) q.request(i);
    await q.idle();
    expect(ran).toEqual([1, 5]);
    expect(got).toEqual([10, 50]);
  });
  it('reports errors and keeps going', async () => {
    const errors: string[] = [], got: number[] = [];
    const q = latestWins(async (x: number) => { if (x === 1) throw new Error('bad'); return x; }, (r) => got.push(r), (e) => errors.push((e as Error).message));
    q.request(1);
    await q.idle();
    q.request(2);
    await q.idle();
    expect(errors).toEqual(['bad']);
    expect(got).toEqual([2]);
  });
  it('per key: bursts on one key keep first and last, other keys are never dropped', async () => {
    const got: string[] = [];
    const q = latestWinsPerKey((x: { id: string; v: number }) => x.id,
      async (x) => { await new Promise((r) => setTimeout(r, 5)); return `${x.id}${x.v}`; }, (r) => got.push(r), (e) => { throw e; });
    for (let i = 1; i <= 3; i++) for (const id of ['a', 'b', 'c']) q.request({ id, v: i });
    await new Promise((r) => setTimeout(r, 50));
    expect(got.sort()).toEqual(['a1', 'a3', 'b1', 'b3', 'c1', 'c3']);
  });
});
