/**
 * Start-up of the installed command: packs the repository (`npm pack`, whose prepack bundles the CLI),
 * installs the tarball offline into a temporary prefix, then times whole processes run from outside the
 * repository: `fieldtally --version` (goal ≤ 250 ms), and `fieldtally info` on the small pipe sample, installed
 * (bundle) against the clone's `bin/fieldtally.mjs` (sources through tsx). Wall-clock ms; min and median of
 * repeated runs, since this machine is shared.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const REPO = join(dirname(fileURLToPath(import.meta.url)), '..');
const RUNS = 15;

function timeRuns(cmd: string, args: string[], cwd: string, runs = RUNS): { minMs: number; medianMs: number; runs: number } {
  const ms: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    const r = spawnSync(cmd, args, { cwd, stdio: ['ignore', 'ignore', 'pipe'] });
    ms.push(performance.now() - t0);
    if (r.status !== 0) throw new Error(`startup bench: ${cmd} ${args.join(' ')} exited ${r.status}: ${String(r.stderr).split('\n')[0]}`);
  }
  ms.sort((a, b) => a - b);
  return { minMs: round(ms[0]!), medianMs: round(ms[Math.floor(ms.length / 2)]!), runs };
}
const round = (v: number): number => Math.round(v * 10) / 10;

export async function run(): Promise<Record<string, unknown>> {
  const work = mkdtempSync(join(tmpdir(), 'fieldtally-startup-'));
  try {
    execFileSync('npm', ['pack', '--pack-destination', work, '--no-update-notifier'], { cwd: REPO, stdio: 'ignore' });
    const tarball = join(work, readdirSync(work).find((f) => f.endsWith('.tgz'))!);
    const prefix = join(work, 'prefix');
    execFileSync('npm', ['install', '-g', '--offline', '--no-audit', '--no-fund', '--prefix', prefix, tarball], { cwd: work, stdio: 'ignore' });
    const bin = join(prefix, 'bin', 'fieldtally');
    const sample = join(REPO, 'sample-fields/pipe-coarse.vtu');
    return {
      installedVersion: { ...timeRuns(bin, ['--version'], work), goalMs: 250 },
      installedInfo: timeRuns(bin, ['info', sample], work, 7),
      sourceInfo: timeRuns(process.execPath, [join(REPO, 'bin/fieldtally.mjs'), 'info', sample], work, 7),
      nodeBaseline: timeRuns(process.execPath, ['-e', '0'], work),
    };
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}
