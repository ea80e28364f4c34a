/**
 * The counting sort behind the cell tree's Morton order. Reference: JavaScript's comparison sort of
 * (key, original index) pairs, which defines the stable ascending order exactly.
 */
import { describe, expect, it } from 'vitest';
import { radixSort30 } from '../../src/locate/mortonOrder.ts';
import { rng } from './meshes.ts';

function check(keys: number[]): void {
  const n = keys.length;
  const k = Uint32Array.from(keys), v = Int32Array.from(keys, (_, i) => i);
  radixSort30(k, v, new Uint32Array(n), new Int32Array(n));
  const want = keys.map((key, i) => [key, i] as const).sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  expect(Array.from(k)).toEqual(want.map((w) => w[0]));
  expect(Array.from(v)).toEqual(want.map((w) => w[1]));
}

describe('radixSort30', () => {
  it('sorts random 30-bit keys ascending and stably (ties keep their input order)', () => {
    const r = rng(11);
    check(Array.from({ length: 5000 }, () => Math.floor(r() * 2 ** 30)));
    // many ties in both 15-bit halves
    check(Array.from({ length: 3000 }, () => (Math.floor(r() * 4) << 15) | Math.floor(r() * 3)));
  });

  it('handles the extremes: empty, one key, all equal, 0 and 2^30 − 1', () => {
    check([]);
    check([7]);
    check([5, 5, 5, 5]);
    check([2 ** 30 - 1, 0, 2 ** 30 - 1, 1 << 15, (1 << 15) - 1, 0]);
  });
});
