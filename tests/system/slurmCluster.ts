/**
 * A one-node batch cluster for the system suite, from Debian's slurm-wlm and munge, run as root with every
 * file in one temporary folder: a munge key made by `mungekey`, `munged --force` on its own socket, key, log,
 * seed and pid file; a slurm.conf naming this host as controller and only node (proctrack/linuxproc,
 * task/none, no accounting, free ports); `slurmctld -f` and `slurmd -f`. `stop()` ends exactly the daemons
 * it started, by the pids their pid files gave, and waits for them to go.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { hostname, availableParallelism } from 'node:os';
import { join } from 'node:path';

const DAEMONS = { mungekey: '/usr/sbin/mungekey', munged: '/usr/sbin/munged', slurmctld: '/usr/sbin/slurmctld', slurmd: '/usr/sbin/slurmd' };
const CLIENTS = ['sbatch', 'sinfo'];

/** Throws, saying what to install, unless slurm-wlm and munge are installed and we are root. */
export function requireSlurm(): void {
  const missing = [...Object.values(DAEMONS).filter((p) => !existsSync(p)), ...CLIENTS.filter((c) => { try { execFileSync('which', [c], { stdio: 'pipe' }); return false; } catch { return true; } })];
  if (missing.length) throw new Error(`the batch-cluster suite needs Debian's slurm-wlm and munge (missing: ${missing.join(', ')}): install with: apt-get install -y slurm-wlm munge`);
  if (process.getuid?.() !== 0) throw new Error('the batch-cluster suite starts slurmctld, slurmd and munged as root: run npm run test:system as root');
}

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => { const a = s.address(); s.close(() => resolve(typeof a === 'object' && a ? a.port : 0)); });
  });
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function alive(pid: number): boolean {
  try { process.kill(pid, 0); return true; } catch { return false; }
}

/** A running one-node cluster. */
export interface SlurmCluster {
  dir: string;
  /** Environment for the client commands (SLURM_CONF). */
  env: NodeJS.ProcessEnv;
  /** Pids of the daemons started, from their pid files. */
  pids: Record<string, number>;
  /** The daemons' logs, for a failure message. */
  logs(): string;
  /** Stops the daemons started (by pid), waits for them to exit, removes the folder. Safe to call twice. */
  stop(): Promise<void>;
}

async function waitFor<T>(what: string, poll: () => T | undefined, ms: number, logs: () => string): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = poll();
    if (v !== undefined) return v;
    if (Date.now() > end) throw new Error(`${what} within ${ms / 1000} s\n${logs()}`);
    await sleep(200);
  }
}

/** Starts munged, slurmctld and slurmd in a fresh folder under `root`; on failure stops what did start. */
export async function startSlurm(root: string): Promise<SlurmCluster> {
  requireSlurm();
  const dir = join(root, `slurm-${process.pid}`);
  for (const sub of ['state', 'spool', 'log']) mkdirSync(join(dir, sub), { recursive: true });
  const host = hostname().split('.')[0]!;
  const [ctlPort, nodePort] = [await freePort(), await freePort()];
  const pids: Record<string, number> = {};
  const logs = () => ['munged', 'slurmctld', 'slurmd'].map((n) => {
    const f = join(dir, 'log', `${n}.log`);
    return existsSync(f) ? `--- ${n}.log\n${readFileSync(f, 'utf8').split('\n').slice(-15).join('\n')}` : `--- ${n}.log: none`;
  }).join('\n');
  let stopped = false;
  const stop = async () => {
    if (stopped) return;
    stopped = true;
    for (const name of ['slurmd', 'slurmctld', 'munged']) {
      const pid = pids[name];
      if (pid === undefined || !alive(pid)) continue;
      process.kill(pid, 'SIGTERM');
      const end = Date.now() + 15_000;
      while (alive(pid) && Date.now() < end) await sleep(100);
      if (alive(pid)) process.kill(pid, 'SIGKILL');
    }
    rmSync(dir, { recursive: true, force: true });
  };
  const pidOf = (name: string, file: string) => waitFor(`${name} did not write its pid file`, () => {
    if (!existsSync(file)) return undefined;
    const pid = Number(readFileSync(file, 'utf8').trim());
    return Number.isInteger(pid) && pid > 0 ? pid : undefined;
  }, 20_000, logs).then((pid) => { pids[name] = pid; });
  try {
    const key = join(dir, 'munge.key'), socket = join(dir, 'munge.socket');
    execFileSync(DAEMONS.mungekey, ['--create', `--keyfile=${key}`], { stdio: 'pipe' });
    execFileSync(DAEMONS.munged, ['--force', `--socket=${socket}`, `--key-file=${key}`, `--log-file=${join(dir, 'log', 'munged.log')}`,
      `--pid-file=${join(dir, 'munged.pid')}`, `--seed-file=${join(dir, 'munged.seed')}`], { stdio: 'pipe' });
    await pidOf('munged', join(dir, 'munged.pid'));
    const conf = join(dir, 'slurm.conf');
    writeFileSync(conf, [
      'ClusterName=fieldtally-test', `SlurmctldHost=${host}(127.0.0.1)`,
      'AuthType=auth/munge', 'CredType=cred/munge', `AuthInfo=socket=${socket}`,
      'SlurmUser=root', 'SlurmdUser=root', `SlurmctldPort=${ctlPort}`, `SlurmdPort=${nodePort}`,
      'ProctrackType=proctrack/linuxproc', 'TaskPlugin=task/none', 'SelectType=select/cons_tres', 'SelectTypeParameters=CR_Core',
      'SchedulerType=sched/backfill', 'MpiDefault=none', 'ReturnToService=2', 'JobCompType=jobcomp/none',
      'AccountingStorageType=accounting_storage/none', 'JobAcctGatherType=jobacct_gather/none',
      `StateSaveLocation=${join(dir, 'state')}`, `SlurmdSpoolDir=${join(dir, 'spool')}`,
      `SlurmctldPidFile=${join(dir, 'slurmctld.pid')}`, `SlurmdPidFile=${join(dir, 'slurmd.pid')}`,
      `SlurmctldLogFile=${join(dir, 'log', 'slurmctld.log')}`, `SlurmdLogFile=${join(dir, 'log', 'slurmd.log')}`,
      `NodeName=${host} NodeAddr=127.0.0.1 CPUs=${availableParallelism()} State=UNKNOWN`,
      `PartitionName=local Nodes=${host} Default=YES MaxTime=INFINITE State=UP`, '',
    ].join('\n'));
    execFileSync(DAEMONS.slurmctld, ['-f', conf], { stdio: 'pipe' });
    await pidOf('slurmctld', join(dir, 'slurmctld.pid'));
    execFileSync(DAEMONS.slurmd, ['-f', conf], { stdio: 'pipe' });
    await pidOf('slurmd', join(dir, 'slurmd.pid'));
    const env = { ...process.env, SLURM_CONF: conf };
    await waitFor('the node did not become idle', () => {
      try {
        const state = execFileSync('sinfo', ['-h', '-o', '%T'], { env, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] }).trim();
        return state === 'idle' ? state : undefined;
      } catch { return undefined; }
    }, 60_000, logs);
    return { dir, env, pids, logs, stop };
  } catch (e) {
    const msg = `${(e as Error).message}\n${logs()}`;
    await stop();
    throw new Error(msg);
  }
}
