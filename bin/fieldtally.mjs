#!/usr/bin/env node
// Entry of the `fieldtally` command: registers the TypeScript loader, then runs the CLI from source,
// so `npx fieldtally …` works right after `npm ci` with no build step.
//
// On Linux it first re-runs itself once with glibc's `malloc.hugetlb=1` tunable: large typed arrays are
// then backed by transparent huge pages, so first touching a freshly loaded million-cell field costs far
// fewer page faults (loads measured 1.3–1.8× faster, see DEVELOPERS.md). FIELDTALLY_NO_RESPAWN=1 turns it off.
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const tunable = 'glibc.malloc.hugetlb=1';
const current = process.env.GLIBC_TUNABLES ?? '';
if (process.platform === 'linux' && !current.includes('glibc.malloc.hugetlb') && !process.env.FIELDTALLY_NO_RESPAWN) {
  const env = { ...process.env, GLIBC_TUNABLES: current ? `${current}:${tunable}` : tunable, FIELDTALLY_NO_RESPAWN: '1' };
  const r = spawnSync(process.execPath, [...process.execArgv, fileURLToPath(import.meta.url), ...process.argv.slice(2)], { stdio: 'inherit', env });
  if (r.error) {
    process.stderr.write(`fieldtally: could not start (${r.error.message})\n`);
    process.exit(1);
  }
  process.exit(r.status ?? (r.signal ? 128 + 2 : 1));
}

const { register } = await import('tsx/esm/api');
register();
const { main } = await import('../src/cli/main.ts');
process.exitCode = await main(process.argv.slice(2));
