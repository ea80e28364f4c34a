/**
 * `--workers N` with derived fields on the command line: `line` and `cut` with `--fields vorticity-magnitude`
 * print the same numbers with 1, 2 and 3 workers (the velocity gradient computed by the pool,
 * src/parallel/deriveShares.ts), and the vorticity meets the analytical value in a Hagen–Poiseuille pipe:
 * u_z = u_max(1 − r²/R²), so |ω| = |du_z/dr| = 2·u_max·r/R² (Hagen 1839, Poiseuille 1840; Bird, Stewart &
 * Lightfoot, Transport Phenomena, 2nd ed., §2.3), within 1 % on the fine sample mesh.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { PIPE_LEVELS, pipeCase, pipeExact } from '../../src/samples/pipe.ts';

let dir = '', pipe = '';
const pe = pipeExact(PIPE_LEVELS.fine), R = Math.sqrt(pe.area / Math.PI);

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-derive-workers-'));
  pipe = join(dir, 'pipe.vtu');
  writeFileSync(pipe, writeVtu(pipeCase(PIPE_LEVELS.fine)));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(...argv: string[]): Promise<string> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  expect(code, err).toBe(0);
  return out;
}

describe('fieldtally --workers N with derived fields', () => {
  it('line: the same vorticity for 1, 2 and 3 workers; |ω| = 2·u_max·r/R² within 1 %', async () => {
    const args = ['line', pipe, '--from', `0,0,0.05`, '--to', `0,${0.99 * R},0.05`, '--samples', '3', '--fields', 'vorticity-magnitude', '--csv'];
    const one = await run(...args, '--workers', '1');
    for (const n of ['2', '3']) expect(await run(...args, '--workers', n)).toBe(one);
    const rows = one.trim().split('\n').filter((l) => !l.startsWith('#'));
    const header = rows[0]!.split(','), col = header.indexOf('vorticity-magnitude'), yCol = header.indexOf('y');
    for (const row of rows.slice(2).map((l) => l.split(','))) {
      const r = Number(row[yCol]), exact = 2 * pe.uMax * r / (R * R);
      expect(Math.abs(Number(row[col]) / exact - 1)).toBeLessThan(0.01);
    }
  });

  it('cut: the same integrals of a derived field for 1 and 2 workers', async () => {
    const args = ['cut', pipe, '--origin', '0,0,0.0437', '--normal', '0,0,1', '--fields', 'vorticity-magnitude', '--json'];
    const strip = (t: string) => { const j = JSON.parse(t); delete j.cut.ms; return j; };
    const one = strip(await run(...args, '--workers', '1'));
    expect(JSON.stringify(one)).toContain('vorticity-magnitude');
    expect(strip(await run(...args, '--workers', '2'))).toEqual(one);
  });
});
