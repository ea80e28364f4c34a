/**
 * The cluster recipe on a real batch scheduler: a one-node slurm cluster (Debian's slurm-wlm and munge, as
 * root, `slurmCluster.ts`) runs the documented job script `examples/slurm/partial.sbatch` as a job array
 * (`sbatch --array=0-2 --wait`), one `fieldtally partial` per task; then `fieldtally reduce` combines the parts,
 * and its report folder must equal `fieldtally report` on the whole set (numbers to rounding, same picture).
 * The set is the committed pipe case (sample-fields/README.md) in five axial pieces. The daemons are stopped
 * by the pids of their pid files, also when a step fails.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pipeCase } from '../../src/samples/pipe.ts';
import { COMMITTED_CASES } from '../../src/samples/sampleSet.ts';
import { bands, splitDataset, writePvtu } from '../pieces/pieceSets.ts';
import { expectSameReport } from '../pieces/reportCompare.ts';
import { startSlurm, type SlurmCluster } from './slurmCluster.ts';

const REPO = resolve(__dirname, '../..');
const CLI = join(REPO, 'bin/fieldtally.mjs');
const JOB = join(REPO, 'examples/slurm/partial.sbatch');
const PROBES = join(REPO, 'examples/pipe-stations.probes.json');

let work = '';
let cluster: SlurmCluster | undefined;

beforeAll(async () => {
  work = mkdtempSync(join(tmpdir(), 'fieldtally-slurm-'));
  cluster = await startSlurm(work);
});

afterAll(async () => {
  await cluster?.stop();
  if (work) rmSync(work, { recursive: true, force: true });
});

/** Runs the command line in its own process; returns the exit code and output. */
function cli(...args: string[]): { code: number; out: string } {
  try {
    return { code: 0, out: execFileSync(process.execPath, [CLI, ...args], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] }) };
  } catch (e) {
    const x = e as { status: number; stdout: string; stderr: string };
    return { code: x.status, out: `${x.stdout}${x.stderr}` };
  }
}

describe('partial as a slurm job array, then reduce', () => {
  it('sbatch --array=0-2 --wait of the documented job script, reduced, equals the whole-set report', () => {
    const pipe = pipeCase(COMMITTED_CASES.pipeMedium);
    const set = writePvtu(join(work, 'run'), 'flow', pipe, splitDataset(pipe, 5, bands(2, 0, 0.1, 5)), 'zlib');
    const parts = join(work, 'parts');
    let submitted = '';
    try {
      submitted = execFileSync('sbatch', ['--array=0-2', '--wait', `--output=${join(work, 'job-%A_%a.out')}`, `--chdir=${REPO}`, JOB, set, PROBES, parts], {
        env: { ...cluster!.env, FIELDTALLY: `${process.execPath} ${CLI}` }, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'], timeout: 170_000,
      });
    } catch (e) {
      const outs = readdirSync(work).filter((f) => f.startsWith('job-')).map((f) => `--- ${f}\n${readFileSync(join(work, f), 'utf8')}`).join('\n');
      throw new Error(`sbatch failed: ${(e as { stderr?: string }).stderr ?? (e as Error).message}\n${outs}\n${cluster!.logs()}`);
    }
    expect(submitted).toMatch(/^Submitted batch job \d+/);
    const outs = readdirSync(work).filter((f) => f.startsWith('job-')).sort().map((f) => readFileSync(join(work, f), 'utf8'));
    expect(outs.map((o) => /^task (\d) of 3: /.exec(o)?.[1])).toEqual(['0', '1', '2']);
    expect(readdirSync(parts).sort()).toEqual(['part-0.json', 'part-1.json', 'part-2.json']);
    const reduced = cli('reduce', join(parts, 'part-*.json'), '--out', join(work, 'reduced'), '--width', '400', '--height', '300');
    const whole = cli('report', set, '--probes', PROBES, '--out', join(work, 'whole'), '--width', '400', '--height', '300');
    expect(reduced.code).toBe(whole.code);
    expect(reduced.out).toContain('3 partial result(s) of flow.pvtu combined');
    const r = expectSameReport(join(work, 'whole'), join(work, 'reduced'));
    // Hagen–Poiseuille (White, Fluid Mechanics, 7th ed., 2011, §6.4): Q = πR²V, within 2 % on this mesh
    const mid = r.files[0]!.probes.find((p) => p.id === 'mid')!.quantities.find((q) => q.key === 'volumeFlowRate')!.value;
    expect(Math.abs(mid / (Math.PI * 0.01 ** 2 * 0.05) - 1)).toBeLessThan(0.02);
  });

  it('stops the daemons it started, by their pid files', async () => {
    const pids = Object.values(cluster!.pids);
    expect(pids.length).toBe(3);
    await cluster!.stop();
    for (const pid of pids) expect(() => process.kill(pid, 0)).toThrow();
  });
});
