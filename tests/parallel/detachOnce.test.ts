// In V8 the first detach of an array buffer in a thread (a transfer by postMessage) drops every optimised
// function that touched a typed array, and from then on typed-array code carries detach checks. A share worker
// therefore never detaches anything: `serveShares` posts its replies with an empty transfer list (results are
// copied; large ones go through shared memory), so kernels compiled in its warm-up stay optimised and unchecked.
// The app's compute worker, whose replies must transfer drawing arrays, spends the first detach up front
// instead (src/parallel/detachOnce.ts). Checked with the engine's own tier query (%ActiveTierIsTurbofan) in
// fresh processes.
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '..', '..');

function tiers(mode: 'plain' | 'served'): { before: boolean; after: boolean; transferred: number; fresh: number } {
  const r = spawnSync(process.execPath, ['--allow-natives-syntax', join(ROOT, 'bin', 'run-ts.mjs'), join(ROOT, 'tests', 'helpers', 'detachTier.ts'), mode],
    { encoding: 'utf8', cwd: ROOT });
  if (r.status !== 0) throw new Error(`detachTier ${mode} failed: ${r.stderr}`);
  return JSON.parse(r.stdout) as { before: boolean; after: boolean; transferred: number; fresh: number };
}

describe('detaching in worker threads', () => {
  it('a first transfer throws away optimised typed-array code (the engine behaviour behind it)', () => {
    expect(tiers('plain')).toMatchObject({ before: true, after: false });
  });

  it('a share worker posts a result holding a fresh array with an empty transfer list, and its warmed kernels stay optimised', () => {
    expect(tiers('served')).toEqual({ before: true, after: true, transferred: 0, fresh: 128 });
  });

});
