// A share worker's first reply transfers (detaches) an array buffer; in V8 the first detach in a thread drops
// every optimised function that touched a typed array. `serveShares` spends that first detach before its
// warm-up (src/parallel/detachOnce.ts), so kernels compiled in the warm-up stay optimised after replies.
// Checked with the engine's own tier query (%ActiveTierIsTurbofan) in fresh processes.
import { spawnSync } from 'node:child_process';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = join(import.meta.dirname, '..', '..');

function tiers(mode: 'plain' | 'served'): { before: boolean; after: boolean } {
  const r = spawnSync(process.execPath, ['--allow-natives-syntax', join(ROOT, 'bin', 'run-ts.mjs'), join(ROOT, 'tests', 'helpers', 'detachTier.ts'), mode],
    { encoding: 'utf8', cwd: ROOT });
  if (r.status !== 0) throw new Error(`detachTier ${mode} failed: ${r.stderr}`);
  return JSON.parse(r.stdout) as { before: boolean; after: boolean };
}

describe('detachOnce', () => {
  it('a first transfer throws away optimised typed-array code (the engine behaviour behind it)', () => {
    expect(tiers('plain')).toEqual({ before: true, after: false });
  });

  it('kernels compiled in a share worker\'s warm-up stay optimised after its replies transfer buffers', () => {
    expect(tiers('served')).toEqual({ before: true, after: true });
  });
});
