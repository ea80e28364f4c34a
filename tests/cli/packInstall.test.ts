/**
 * The installable command: `npm pack` (its `prepack` bundles the CLI), a global install of the tarball into
 * an empty prefix with npm offline (the package has no dependencies to fetch), then the installed
 * `fieldtally` run from a folder outside the repository: `--version` and one real verb.
 *
 * Reference for the verb's numbers: Hagen–Poiseuille flow (White, Viscous Fluid Flow, 3rd ed., 2006, §3-3;
 * docs/references.md §1): p = G(L − z) with G = 8μV/R², linear, so the cut's area-mean pressure at z = L/2 is
 * G·L/2 exactly on any mesh: 8 · 1.0016e-3 · 0.05 / 0.01² · 0.05 = 0.20032 Pa for the bundled pipe.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { datasetOf, hexGrid } from '../../src/model/meshBuild.ts';

const REPO = resolve(__dirname, '../..');
const work = mkdtempSync(join(tmpdir(), 'fieldtally-pack-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const npm = (args: string[], cwd: string): string =>
  execFileSync('npm', [...args, '--no-audit', '--no-fund', '--no-update-notifier'], { cwd, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] });

/** A JSON value with its wall-clock times (`ms` members) taken out. */
function withoutTimes(v: unknown): unknown {
  if (Array.isArray(v)) return v.map(withoutTimes);
  if (v && typeof v === 'object') return Object.fromEntries(Object.entries(v).filter(([k]) => k !== 'ms').map(([k, x]) => [k, withoutTimes(x)]));
  return v;
}

describe('npm pack → npm install -g → fieldtally', () => {
  it('packs the bundle and no tests, installs offline into an empty prefix, and runs outside the repository', async () => {
    npm(['pack', '--pack-destination', work], REPO);
    const tarballs = readdirSync(work).filter((f) => f.endsWith('.tgz'));
    expect(tarballs).toHaveLength(1);
    const tarball = join(work, tarballs[0]!);

    const listed = execFileSync('tar', ['-tzf', tarball], { encoding: 'utf8' }).trim().split('\n').sort();
    expect(listed).toEqual([
      'package/README.md', 'package/bin/fieldtally.mjs', 'package/bin/hugePages.mjs', 'package/bin/runBundle.mjs', 'package/dist-cli/THIRD-PARTY-NOTICES.txt',
      'package/dist-cli/fieldtally.cjs', 'package/dist-cli/inflateWorker.mjs', 'package/dist-cli/readWorker.mjs', 'package/dist-cli/seriesWorker.mjs',
      'package/dist-cli/shareWorker.mjs', 'package/dist-cli/textWorker.mjs', 'package/package.json', 'package/src/study/probeSet.schema.json',
    ]);
    const shipped = JSON.parse(execFileSync('tar', ['-xzOf', tarball, 'package/package.json'], { encoding: 'utf8' })) as Record<string, unknown>;
    expect(shipped['dependencies']).toBeUndefined();

    const prefix = join(work, 'prefix');
    npm(['install', '-g', '--offline', '--prefix', prefix, tarball], work);
    const bin = join(prefix, 'bin', 'fieldtally');
    const outside = mkdtempSync(join(work, 'elsewhere-'));

    const version = JSON.parse(readFileSync(join(REPO, 'package.json'), 'utf8')).version as string;
    expect(execFileSync(bin, ['--version'], { cwd: outside, encoding: 'utf8' })).toBe(`fieldtally ${version}\n`);

    const args = ['cut', join(REPO, 'sample-fields/pipe-medium.vtu'), '--origin', '0,0,0.05', '--normal', '0,0,1', '--json'];
    const installed = JSON.parse(execFileSync(bin, args, { cwd: outside, encoding: 'utf8' }));
    expect(installed.areaMean.p).toBeCloseTo(0.20032, 12);
    // the bundle computes what the sources compute, to the last digit (timings aside)
    let text = '';
    expect(await main(args, { out: (t) => { text += t; }, err: () => {} })).toBe(0);
    expect(withoutTimes(installed)).toEqual(withoutTimes(JSON.parse(text)));

    // the installed workers (bundled beside the command) start and give the same numbers as one thread
    const pooled = JSON.parse(execFileSync(bin, [...args, '--workers', '2'], { cwd: outside, encoding: 'utf8' }));
    expect(withoutTimes(pooled)).toEqual(withoutTimes(installed));
    const history = (w: string) => execFileSync(bin, ['history', join(REPO, 'sample-fields/vortex-cell'), '--probes', join(REPO, 'examples/vortex-cell.probes.json'), '--workers', w],
      { cwd: outside, encoding: 'utf8' }).split('\n').filter((l) => !/created \d|built \d time/.test(l)).join('\n');
    // the same history with the steps run by two threads (apart from the creation time and the mesh-build count)
    expect(history('2')).toBe(history('1'));
    // the installed read workers read a raw file's large arrays (8 MB of 64-bit connectivity) in parts
    const lattice = join(work, 'lattice.vtu');
    writeFileSync(lattice, writeVtu(datasetOf([hexGrid(50, 50, 50)]), { encoding: 'appended-raw', idType: 'Int64' }));
    const bench = (t: string) => JSON.parse(execFileSync(bin, ['bench', lattice, '--json', '--stages', 'load', '--read-threads', t], { cwd: outside, encoding: 'utf8' })) as { cells: number; load: { arraysReadInParts: number } };
    const [two, one] = [bench('2'), bench('1')];
    expect([two.cells, two.load.arraysReadInParts > 0, one.load.arraysReadInParts]).toEqual([125000, true, 0]);

    const help = execFileSync(bin, ['--help'], { cwd: outside, encoding: 'utf8' });
    expect(help).toMatch(/check-probes +check a probe-set file/);
  }, 180_000);
});
