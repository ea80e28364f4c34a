/**
 * The pool's velocity gradient (src/parallel/deriveShares.ts) equals the single-thread kernel's bit for bit
 * for 1, 2, 3 and 4 workers, and the derived fields built on it (vorticity, Q-criterion) equal the single-thread
 * ones. Reference: this repository's single-thread core (fieldGradient.ts, Barth & Frederickson 1990
 * quadratic least-squares gradient, checked for second-order convergence in tests/derive).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { withDerivedFields } from '../../src/derive/derivedFields.ts';
import { fieldGradient } from '../../src/derive/fieldGradient.ts';
import { datasetOf, hexGrid, pointFieldFrom, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import type { Piece } from '../../src/model/piece.ts';
import { openNodePool } from '../../src/parallel/nodePool.ts';
import type { ComputePool } from '../../src/parallel/pool.ts';
import { primeDerivedGradients } from '../../src/parallel/deriveShares.ts';
import { loadValues, makeSharedKernelMesh } from '../../src/derive/sharedKernelMesh.ts';

const bent = (u: number, v: number, w: number): [number, number, number] => [u + 0.1 * Math.sin(v), 1.3 * v, w + 0.05 * u * v];
const flow = (p: Piece): Piece => withFields(p, [
  pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = Math.sin(3 * y) * z; o[1] = Math.cos(2 * x) + y * y; o[2] = x * y * z; }),
]);
const make = (): Dataset => datasetOf([flow(hexGrid(14, 11, 9, bent)), flow(tetGrid(5, 4, 4, (u, v, w) => [u + 20, v, w]))], 'two pieces');

const pools: ComputePool[] = [];
afterAll(async () => { await Promise.all(pools.map((p) => p.close())); });

function differingBits(a: ArrayLike<number>, b: ArrayLike<number>): number {
  expect(a.length).toBe(b.length);
  let n = 0;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) n++;
  return n;
}

describe('velocity gradient on the worker pool', () => {
  const single = make();
  const names = ['vorticity', 'q-criterion'];
  const reference = withDerivedFields(single, names);
  for (const workers of [1, 2, 3, 4]) {
    it(`${workers} worker(s): every piece's gradient, vorticity and Q equal the single-thread values bit for bit`, async () => {
      const pool = await openNodePool(make(), workers);
      pools.push(pool);
      expect(pool.size).toBe(workers);
      for (let k = 0; k < single.pieces.length; k++) {
        const g = await pool.pointGradient(k, 'velocity');
        expect(differingBits(g, fieldGradient(single.pieces[k]!, single.pieces[k]!.pointData[0]!))).toBe(0);
      }
      expect(await primeDerivedGradients(pool, names)).toBe(2);
      const derived = withDerivedFields(pool.dataset, names);
      for (let k = 0; k < single.pieces.length; k++) {
        for (const n of names) {
          const a = derived.pieces[k]!.pointData.find((f) => f.name === n)!.values;
          const b = reference.pieces[k]!.pointData.find((f) => f.name === n)!.values;
          expect(differingBits(a, b)).toBe(0);
        }
      }
    });
  }

  const quantities = ['vorticity', 'vorticity-magnitude', 'q-criterion', 'lambda2', 'helicity'];
  const single2 = make(), reference2 = withDerivedFields(single2, quantities);
  for (const workers of [1, 2, 3]) {
    it(`${workers} worker(s): vorticity, its magnitude, Q, λ₂ and helicity made in the workers (no gradient sent back) equal the single-thread values bit for bit`, async () => {
      const pool = await openNodePool(make(), workers);
      pools.push(pool);
      expect(await primeDerivedGradients(pool, quantities)).toBe(2);
      // made once: asked again, nothing is left to compute
      expect(await primeDerivedGradients(pool, ['vorticity'])).toBe(0);
      const derived = withDerivedFields(pool.dataset, quantities);
      for (let k = 0; k < single2.pieces.length; k++) {
        for (const n of quantities) {
          const a = derived.pieces[k]!.pointData.find((f) => f.name === n)!;
          const b = reference2.pieces[k]!.pointData.find((f) => f.name === n)!;
          expect(a.components).toBe(b.components);
          expect(b.values.some((v) => v !== 0 && Number.isFinite(v))).toBe(true);
          expect(differingBits(a.values, b.values)).toBe(0);
        }
      }
      // with the gradient itself asked for, the gradient comes back (and the quantities are made from it here)
      expect(await primeDerivedGradients(pool, ['velocity-gradient', 'q-criterion'])).toBe(2);
    });
  }

  it('one worker, a range of more than one block of nodes (20,181 nodes): vorticity and Q equal the single-thread values bit for bit', async () => {
    const big = (): Dataset => datasetOf([flow(hexGrid(30, 30, 20, bent))], 'one piece');
    const ref = withDerivedFields(big(), names), pool = await openNodePool(big(), 1);
    pools.push(pool);
    expect(await primeDerivedGradients(pool, names)).toBe(1);
    const derived = withDerivedFields(pool.dataset, names);
    for (const n of names) {
      expect(differingBits(derived.pieces[0]!.pointData.find((f) => f.name === n)!.values, ref.pieces[0]!.pointData.find((f) => f.name === n)!.values)).toBe(0);
    }
  });

  it('2 workers on one shared kernel mesh (sharedKernelMesh.ts): every worker attaches; the gradient, then ω and Q of a new velocity array on the same geometry, bit for bit', async () => {
    const big = (): Dataset => datasetOf([flow(hexGrid(30, 30, 20, bent))], 'one piece');
    const pool = await openNodePool(big(), 2), single3 = big();
    pools.push(pool);
    const p = pool.dataset.pieces[0]!, u = p.pointData[0]!, m = makeSharedKernelMesh(p, 2)!;
    expect(await pool.attachKernelMesh(m.ref)).toBe(true);
    loadValues(m, u.values, 3);
    const g = await pool.pointGradient(0, 'velocity', m.ref.id);
    expect(differingBits(g, fieldGradient(single3.pieces[0]!, single3.pieces[0]!.pointData[0]!))).toBe(0);
    // a later step: only the values are loaded again (the workers' own dataset still holds the first step's)
    const u2 = Float64Array.from(u.values, (x, i) => x * (1 + (i % 7) / 10));
    loadValues(m, u2, 3);
    const [w, q] = await pool.pointDerived(0, 'velocity', [{ name: 'vorticity', components: 3 }, { name: 'q-criterion', components: 1 }], m.ref.id);
    const step = { ...single3, pieces: [{ ...single3.pieces[0]!, pointData: [{ ...single3.pieces[0]!.pointData[0]!, values: u2 }] }] };
    const ref = withDerivedFields(step, names);
    expect(differingBits(w!, ref.pieces[0]!.pointData.find((f) => f.name === 'vorticity')!.values)).toBe(0);
    expect(differingBits(q!, ref.pieces[0]!.pointData.find((f) => f.name === 'q-criterion')!.values)).toBe(0);
  });

  it('names the missing field', async () => {
    const pool = await openNodePool(make(), 2);
    pools.push(pool);
    await expect(pool.pointGradient(0, 'speed')).rejects.toThrow('gradient: no point field "speed" on piece 0 of two pieces');
    expect(await primeDerivedGradients(pool, ['velocity-magnitude'])).toBe(0);
  });
});
