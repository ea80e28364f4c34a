/**
 * `--workers N` on the command line: cut, line, surfaces and force print the same numbers with 1, 2 and 3
 * workers, and those numbers still meet the published checks:
 *  - Hagen–Poiseuille pipe: Q = πR²V (Hagen 1839, Poiseuille 1840; Bird, Stewart & Lightfoot, Transport
 *    Phenomena, 2nd ed., §2.3, eq. 2.3-21), within 1 % on the fine sample mesh;
 *  - Stokes sphere: drag 3πμUD, 1/3 from pressure and 2/3 from shear (Stokes 1851; Bird, Stewart & Lightfoot §2.6).
 * A bad worker count is refused in one line naming the option.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { PIPE_LEVELS, pipeCase, pipeExact } from '../../src/samples/pipe.ts';
import { sphereCase, sphereExact } from '../../src/samples/sphere.ts';

let dir = '', pipe = '', bead = '';
const pe = pipeExact(PIPE_LEVELS.fine), se = sphereExact({ refinement: 1 });

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-workers-'));
  pipe = join(dir, 'pipe.vtu'); bead = join(dir, 'bead.vtu');
  writeFileSync(pipe, writeVtu(pipeCase(PIPE_LEVELS.fine)));
  writeFileSync(bead, writeVtu(sphereCase({ refinement: 1 })));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

/** The JSON a verb prints, without the timing field that differs between runs. */
async function json(...argv: string[]): Promise<Record<string, unknown>> {
  const r = await run(...argv);
  expect(r.code, r.err).toBe(0);
  const j = JSON.parse(r.out);
  if (j.cut) delete j.cut.ms;
  return j;
}

describe('fieldtally --workers N', () => {
  it('cut: the same integrals for 1, 2 and 3 workers; Q = πR²V within 1 %', async () => {
    const args = ['cut', pipe, '--origin', '0,0,0.0437', '--normal', '0,0,1', '--rho', String(pe.rho), '--json'];
    const one = await json(...args, '--workers', '1');
    for (const n of ['2', '3']) expect(await json(...args, '--workers', n)).toEqual(one);
    expect(Math.abs((one.volumeFlowRate as number) / pe.Q - 1)).toBeLessThan(0.01);
  });

  it('line: the same samples for 1 and 2 workers; the centre-line speed is u_max = 2V within 1 %', async () => {
    const args = ['line', pipe, '--from', '0,0,0', '--to', '0,0.004,0.1', '--samples', '51', '--json'];
    const one = await json(...args, '--workers', '1');
    expect(await json(...args, '--workers', '2')).toEqual(one);
    const centre = await run('line', pipe, '--from', '0,0,0.05', '--to', '0,0.0099,0.05', '--samples', '2', '--csv', '--workers', '2');
    const table = centre.out.trim().split('\n').filter((l) => !l.startsWith('#'));
    const row = table[1]!.split(',');
    const header = table[0]!.split(',');
    expect(Math.abs(Number(row[header.indexOf('velocity_z')]) / (2 * pe.V) - 1)).toBeLessThan(0.01);
  });

  it('surfaces and force: the same groups and forces for 1 and 2 workers; drag 3πμUD split 1/3 : 2/3', async () => {
    const s1 = await json('surfaces', bead, '--json', '--workers', '1');
    expect(await json('surfaces', bead, '--json', '--workers', '2')).toEqual(s1);
    const f = ['force', bead, '--groups', '1', '--rho', String(se.rho), '--speed', String(se.U), '--area', String(se.frontalArea), '--json'];
    const f1 = await json(...f, '--workers', '1');
    const f2 = await json(...f, '--workers', '2');
    expect(f2).toEqual(f1);
    const force = f2.force as number[], pressure = f2.pressureForce as number[];
    expect(force[0]! / se.dragTotal).toBeCloseTo(1, 1);
    expect(pressure[0]! / force[0]!).toBeCloseTo(1 / 3, 2);
  });

  it('refuses a worker count that is not a whole number from 1 to 256', async () => {
    for (const bad of ['0', '-2', '1.5', 'many', '1000']) {
      const r = await run('cut', pipe, '--origin', '0,0,0.05', '--normal', '0,0,1', '--workers', bad);
      expect(r.code).not.toBe(0);
      expect(r.err.trim().split('\n')).toHaveLength(1);
      expect(r.err).toMatch(/--workers: expected a whole number of workers from 1 to 256/);
    }
  });
});
