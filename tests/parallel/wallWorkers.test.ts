/**
 * Wall quantities on the worker pool: the velocity gradient at chosen nodes (`pool.pointGradientAt`) equals the
 * single-thread kernel's (`pointGradientAt`) bit for bit for 1, 2 and 3 workers, and `fieldtally wall --workers N`
 * prints the same numbers for 1, 2 and 3 workers, which meet Hagen–Poiseuille's wall shear τ_w = 4μV/R (Hagen
 * 1839, Poiseuille 1840; REFERENCES §1) on the 24-sided faceted wall of sample-fields/pipe-medium.vtu: the exact
 * nodal gradient gives τ_w·cos(π/24) on every face. Reference for the bit-for-bit checks: this repository's
 * single-thread kernel (Barth & Frederickson 1990 quadratic least-squares fit, second order in tests/derive).
 */
import { resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { pointGradientAt } from '../../src/derive/fieldGradient.ts';
import { datasetOf, hexGrid, pointFieldFrom, tetGrid, withFields } from '../../src/model/meshBuild.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import type { Piece } from '../../src/model/piece.ts';
import { openNodePool } from '../../src/parallel/nodePool.ts';
import type { ComputePool } from '../../src/parallel/pool.ts';
import { pipeExact } from '../../src/samples/pipe.ts';

const FILE = resolve(__dirname, '../../sample-fields/pipe-medium.vtu');
const flow = (p: Piece): Piece => withFields(p, [
  pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = Math.sin(3 * y) * z; o[1] = Math.cos(2 * x) + y * y; o[2] = x * y * z; }),
]);
const make = (): Dataset => datasetOf([flow(hexGrid(14, 11, 9, (u, v, w) => [u + 0.1 * Math.sin(v), 1.3 * v, w])), flow(tetGrid(5, 4, 4, (u, v, w) => [u + 20, v, w]))], 'two pieces');
const pools: ComputePool[] = [];
afterAll(async () => { await Promise.all(pools.map((p) => p.close())); });

describe('gradient at chosen nodes on the worker pool', () => {
  const single = make();
  // a wall layer (z = 0) in scattered order and a few interior nodes
  const chosen = single.pieces.map((p) => Int32Array.from({ length: p.points.length / 3 }, (_, i) => i)
    .filter((i) => p.points[3 * i + 2] === 0 || i % 13 === 4).reverse());
  for (const workers of [1, 2, 3]) {
    it(`${workers} worker(s): the single-thread values bit for bit on every piece`, async () => {
      const pool = await openNodePool(make(), workers);
      pools.push(pool);
      for (let k = 0; k < single.pieces.length; k++) {
        const g = await pool.pointGradientAt(k, 'velocity', chosen[k]!);
        const ref = pointGradientAt(single.pieces[k]!, single.pieces[k]!.pointData[0]!, chosen[k]!);
        expect(g.length).toBe(9 * chosen[k]!.length);
        expect(g.some((v) => v !== 0)).toBe(true);
        expect(g.every((v, i) => Object.is(v, ref[i]))).toBe(true);
      }
    });
  }
  it('an unknown field is refused with a message naming it and the piece', async () => {
    const pool = await openNodePool(make(), 1);
    pools.push(pool);
    await expect(pool.pointGradientAt(0, 'no-such-field', chosen[0]!)).rejects.toThrow(/no point field "no-such-field" on piece 0/);
  });
});

async function run(...argv: string[]): Promise<string> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  expect(code, err).toBe(0);
  return out;
}

describe('fieldtally wall --workers N', () => {
  it('the same JSON (per-face values included) for 1, 2 and 3 workers; τ_w = 4μV/R·cos(π/24) on every face', async () => {
    const e = pipeExact();
    const args = ['wall', FILE, '--groups', '1', '--rho', String(e.rho), '--mu', String(e.mu), '--speed', String(e.V), '--per-face', '--json'];
    const one = await run(...args, '--workers', '1');
    for (const n of ['2', '3']) expect(await run(...args, '--workers', n)).toBe(one);
    const g = JSON.parse(one).groups[0];
    expect(g.shearSource).toMatchObject({ method: 'velocity-gradient', gradient: 'second-order' });
    expect(g.perFace.shearMagnitude.length).toBe(g.faces);
    for (const t of g.perFace.shearMagnitude as number[]) expect(t / (e.wallShearStress * Math.cos(Math.PI / 24))).toBeCloseTo(1, 9);
  });

  it('text output with workers names the source and ends with the caution', async () => {
    const out = await run('wall', FILE, '--groups', '1', '--rho', '998.207', '--mu', '1.0016e-3', '--workers', '2');
    expect(out).toMatch(/τ_w from the velocity gradient of "velocity" \(second-order\)/);
    expect(out.trim().split('\n').pop()).toMatch(/^Caution:/);
  });
});
