/**
 * The one-shot `cut`: one thread unless `--workers N` (N ≥ 2) asks for the pool, and the command from the clone
 * running its cached bundle — every path prints the same numbers, and those numbers meet the published checks
 * on the Hagen–Poiseuille pipe (White, Viscous Fluid Flow, 3rd ed., 2006, §3-3; Bird, Stewart & Lightfoot,
 * Transport Phenomena, 2nd ed., §2.3, eq. 2.3-21; docs/references.md §1):
 *  - p = G(L − z) with G = 8μV/R² is linear, so the area-mean pressure over the cut at z is G(L − z) exactly
 *    on any mesh (to rounding);
 *  - Q = πR²V, within 1 % on the fine sample mesh (the parabolic profile is interpolated linearly).
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { workerEntries } from '../../../bin/cliBundle.mjs';
import { main } from '../../../src/cli/main.ts';
import { parseArgs } from '../../../src/cli/args.ts';
import { loadForOneShot, ONE_SHOT_WORKER_OPTIONS } from '../../../src/cli/oneShotLoad.ts';
import { WORKER_OPTIONS } from '../../../src/cli/workerOption.ts';
import { writeVtu } from '../../../src/io/writeVtu.ts';
import { PIPE_LEVELS, pipeCase, pipeExact } from '../../../src/samples/pipe.ts';

const REPO = resolve(__dirname, '../../..');
const pe = pipeExact(PIPE_LEVELS.fine);
const Z = 0.0437;
let dir = '', raw = '', zlib = '';

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-oneshot-'));
  raw = join(dir, 'pipe-raw.vtu'); zlib = join(dir, 'pipe-zlib.vtu');
  writeFileSync(raw, writeVtu(pipeCase(PIPE_LEVELS.fine), { encoding: 'appended-raw' }));
  writeFileSync(zlib, writeVtu(pipeCase(PIPE_LEVELS.fine), { encoding: 'zlib' }));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const cutArgs = (file: string) => ['cut', file, '--origin', `0,0,${Z}`, '--normal', '0,0,1', '--rho', String(pe.rho), '--json'];

/** The JSON without the wall-clock time of the cut (the one member that differs between runs). */
function withoutTime(text: string): Record<string, unknown> {
  const j = JSON.parse(text) as Record<string, unknown> & { cut: { ms?: number } };
  delete j.cut.ms;
  return j;
}

async function inProcess(argv: string[]): Promise<Record<string, unknown>> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  expect(code, err).toBe(0);
  return withoutTime(out);
}

function checkPipe(j: Record<string, unknown>): void {
  const p = (j.areaMean as Record<string, number>).p!;
  expect(p / (pe.G * (pe.L - Z))).toBeCloseTo(1, 10);
  expect(Math.abs((j.volumeFlowRate as number) / pe.Q - 1)).toBeLessThan(0.01);
}

describe('one-shot cut', () => {
  it('computes in this process by default, the same JSON as --workers 1 and the pool of 2, raw and zlib alike', async () => {
    const byDefault = await inProcess(cutArgs(raw));
    checkPipe(byDefault);
    expect(await inProcess([...cutArgs(raw), '--workers', '1'])).toEqual(byDefault);
    expect(await inProcess([...cutArgs(raw), '--workers', '2'])).toEqual(byDefault);
    const compressed = await inProcess(cutArgs(zlib));
    expect({ ...compressed, file: raw }).toEqual(byDefault);
    expect(await inProcess([...cutArgs(zlib), '--workers', '2'])).toEqual(compressed);
  });

  it('opens no pool unless --workers N ≥ 2 is given (FIELDTALLY_WORKERS does not start one)', async () => {
    expect(ONE_SHOT_WORKER_OPTIONS).toEqual(WORKER_OPTIONS);
    const options = { workers: 'string' } as const;
    const saved = process.env.FIELDTALLY_WORKERS;
    process.env.FIELDTALLY_WORKERS = '2';
    try {
      const plain = await loadForOneShot(raw, parseArgs([raw], options, 'cut'));
      expect(plain.pool).toBeNull();
      expect(plain.dataset.pieces[0]!.cellTypes.length).toBeGreaterThan(0);
      await plain.close();
      const one = await loadForOneShot(raw, parseArgs([raw, '--workers', '1'], options, 'cut'));
      expect(one.pool).toBeNull();
    } finally {
      if (saved === undefined) delete process.env.FIELDTALLY_WORKERS; else process.env.FIELDTALLY_WORKERS = saved;
    }
    const pooled = await loadForOneShot(raw, parseArgs([raw, '--workers', '2'], options, 'cut'));
    try {
      expect(pooled.pool).not.toBeNull();
      expect(pooled.dataset.pieces[0]!.cellTypes.length).toBe((await loadForOneShot(raw, parseArgs([raw], options, 'cut'))).dataset.pieces[0]!.cellTypes.length);
    } finally {
      await pooled.close();
    }
  });

  it('bin/fieldtally.mjs in the clone builds its bundle once per stamp and prints what the sources print', async () => {
    const cache = mkdtempSync(join(dir, 'tmp-'));
    const env = { ...process.env, TMPDIR: cache };
    const bin = (argv: string[], extra: Record<string, string> = {}) =>
      execFileSync(process.execPath, [join(REPO, 'bin', 'fieldtally.mjs'), ...argv], { cwd: dir, encoding: 'utf8', env: { ...env, ...extra } });
    const expected = await inProcess(cutArgs(raw));
    expect(withoutTime(bin(cutArgs(raw)))).toEqual(expected);
    // zlib blocks inflated by the bundle's fflate (its build without threads) give the sources' numbers
    expect(withoutTime(bin(cutArgs(zlib)))).toEqual(await inProcess(cutArgs(zlib)));
    // one folder of bundles, with the command and every worker beside it
    const base = readdirSync(cache).filter((f) => f.startsWith('fieldtally-cli-'));
    expect(base).toHaveLength(1);
    const stamps = readdirSync(join(cache, base[0]!));
    expect(stamps).toHaveLength(1);
    const built = join(cache, base[0]!, stamps[0]!);
    expect(readdirSync(built).sort()).toEqual(['fieldtally.cjs', ...Object.keys(workerEntries(REPO)).map((k) => `${k}Worker.mjs`)].sort());
    expect(readdirSync(built)).toEqual(expect.arrayContaining(['inflateWorker.mjs', 'seriesWorker.mjs', 'shareWorker.mjs']));
    const time = statSync(join(built, 'fieldtally.cjs')).mtimeMs;
    // a second run reuses it; the pool's workers start from the bundles beside it
    expect(withoutTime(bin([...cutArgs(raw), '--workers', '2']))).toEqual(expected);
    expect(statSync(join(built, 'fieldtally.cjs')).mtimeMs).toBe(time);
    expect(readdirSync(join(cache, base[0]!))).toEqual(stamps);
    // the TypeScript sources through tsx, on request: the same numbers
    expect(withoutTime(bin(cutArgs(raw), { FIELDTALLY_CLI_FROM_SOURCE: '1' }))).toEqual(expected);
    expect(existsSync(join(built, 'fieldtally.cjs'))).toBe(true);
  }, 180_000);
});
