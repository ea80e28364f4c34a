/**
 * Start-up of the installed command: packs the repository (`npm pack`, whose prepack bundles the CLI),
 * installs the tarball offline into a temporary prefix, then times whole processes run from outside the
 * repository: `fieldtally --version` (goal ≤ 250 ms), and `fieldtally info` on the small pipe sample, installed
 * (bundle) against the clone's `bin/fieldtally.mjs` (its bundle cached under a stamp of the sources), with a bare `node -e 0` for scale.
 * Wall-clock and CPU (user + system, from GNU time when present) ms; min and median of interleaved repeated
 * runs, since this machine is shared; `load` is the load average at the end.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const REPO = join(dirname(fileURLToPath(import.meta.url)), '..');
const RUNS = 11;
/** GNU time gives each child's CPU time (user + system), which the machine's load changes far less than wall time. */
const GNU_TIME = '/usr/bin/time';

interface Target { name: string; cmd: string; args: string[] }
interface Figures { wallMinMs: number; wallMedianMs: number; cpuMinMs: number | null; cpuMedianMs: number | null; runs: number }

/** Runs the targets in turn, round after round, so a change in the machine's load touches all of them alike. */
function timeInterleaved(targets: Target[], cwd: string, runs: number): Record<string, Figures> {
  const wall = new Map<string, number[]>(), cpu = new Map<string, number[]>();
  const stats = join(cwd, 'time.txt');
  for (let i = 0; i < runs; i++) {
    for (const t of targets) {
      const viaTime = existsSync(GNU_TIME);
      const [cmd, args] = viaTime ? [GNU_TIME, ['-f', '%U %S', '-o', stats, t.cmd, ...t.args]] : [t.cmd, t.args];
      const t0 = performance.now();
      const r = spawnSync(cmd, args, { cwd, stdio: ['ignore', 'ignore', 'pipe'] });
      const ms = performance.now() - t0;
      if (r.status !== 0) throw new Error(`startup bench: ${t.cmd} ${t.args.join(' ')} exited ${r.status}: ${String(r.stderr).split('\n')[0]}`);
      (wall.get(t.name) ?? wall.set(t.name, []).get(t.name)!).push(ms);
      if (viaTime) {
        const [u, s] = readFileSync(stats, 'utf8').trim().split(/\s+/).map(Number);
        (cpu.get(t.name) ?? cpu.set(t.name, []).get(t.name)!).push((u! + s!) * 1000);
      }
    }
  }
  const out: Record<string, Figures> = {};
  for (const t of targets) {
    const w = wall.get(t.name)!.sort((a, b) => a - b), c = cpu.get(t.name)?.sort((a, b) => a - b);
    out[t.name] = {
      wallMinMs: round(w[0]!), wallMedianMs: round(w[w.length >> 1]!),
      cpuMinMs: c ? round(c[0]!) : null, cpuMedianMs: c ? round(c[c.length >> 1]!) : null, runs,
    };
  }
  return out;
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
    const node = process.execPath;
    return {
      goalMs: { installedVersion: 250 },
      ...timeInterleaved([
        { name: 'nodeBaseline', cmd: node, args: ['-e', '0'] },
        { name: 'installedVersion', cmd: bin, args: ['--version'] },
        { name: 'installedInfo', cmd: bin, args: ['info', sample] },
        { name: 'sourceInfo', cmd: node, args: [join(REPO, 'bin/fieldtally.mjs'), 'info', sample] },
      ], work, RUNS),
      load: readFileSync('/proc/loadavg', 'utf8').split(' ').slice(0, 3).map(Number),
    };
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}
