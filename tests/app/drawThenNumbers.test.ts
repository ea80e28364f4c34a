/** Drag scheduling: one call in flight per probe, a waiting picture before waiting numbers, the latest request wins, numbers always follow. */
import { describe, expect, it } from 'vitest';
import { drawThenNumbers } from '../../src/app/drawThenNumbers.ts';

const tick = () => new Promise((r) => setTimeout(r, 5));

function recorder() {
  const calls: string[] = [], shown: string[] = [];
  const q = drawThenNumbers((x: { id: string; v: number }) => x.id,
    async (x) => { calls.push(`picture ${x.id}${x.v}`); await tick(); return `${x.id}${x.v}`; },
    async (x) => { calls.push(`numbers ${x.id}${x.v}`); await tick(); return `${x.id}${x.v}`; },
    (r) => shown.push(`picture ${r}`), (r) => shown.push(`numbers ${r}`), (e) => { throw e; });
  return { q, calls, shown };
}

describe('drawThenNumbers', () => {
  it('a drag burst draws the first and the latest step, then the numbers of the latest only', async () => {
    const { q, calls, shown } = recorder();
    for (let v = 1; v <= 5; v++) q.request({ id: 'a', v }, true);
    await q.idle('a');
    expect(calls).toEqual(['picture a1', 'picture a5', 'numbers a5']);
    expect(shown).toEqual(calls);
  });

  it('a step arriving while numbers run is drawn next, and its numbers follow', async () => {
    const { q, calls } = recorder();
    q.request({ id: 'a', v: 1 }, true);
    await tick(); await tick();
    // picture a1 is done; numbers a1 are running now
    q.request({ id: 'a', v: 2 }, true);
    await q.idle('a');
    expect(calls).toEqual(['picture a1', 'numbers a1', 'picture a2', 'numbers a2']);
  });

  it('a request that is not live asks for the numbers only and drops a waiting picture', async () => {
    const { q, calls } = recorder();
    q.request({ id: 'a', v: 1 }, true);
    q.request({ id: 'a', v: 2 }, true);
    q.request({ id: 'a', v: 3 }, false);
    await q.idle('a');
    expect(calls).toEqual(['picture a1', 'numbers a3']);
  });

  it('keys are independent, and errors are reported without stopping the lane', async () => {
    const errors: string[] = [], got: string[] = [];
    const q = drawThenNumbers((x: { id: string; v: number }) => x.id,
      async (x) => { if (x.v === 1) throw new Error(`bad ${x.id}`); return x.id; },
      async (x) => `${x.id}${x.v}`,
      () => undefined, (r) => got.push(r), (e) => errors.push((e as Error).message));
    q.request({ id: 'a', v: 1 }, true);
    q.request({ id: 'b', v: 2 }, true);
    await Promise.all([q.idle('a'), q.idle('b')]);
    expect(errors).toEqual(['bad a']);
    expect(got.sort()).toEqual(['a1', 'b2']);
  });
});
