#!/usr/bin/env node
// Entry of the `fieldtally` command. In a clone of the repository (src/ is there) it runs a bundle of the
// sources cached in the temporary folder under a stamp of every source file (bin/cliBundle.mjs; built on
// the first run after an edit, about a second), so `npx fieldtally …` works right after `npm ci` with no
// build step, never runs a stale build, and does not compile TypeScript on every start; if the bundle
// cannot be built, or with FIELDTALLY_CLI_FROM_SOURCE=1, it runs the sources through tsx. In the installed
// package (`npm pack`, no src/) it runs the bundle dist-cli/fieldtally.cjs that `bin/build-cli.mjs` wrote
// at pack time. Either bundle is compiled with a V8 code cache of its verb (bin/runBundle.mjs).
//
// On Linux, when its input files may decode to 256 MiB or more (bin/hugePages.mjs), it first re-runs itself
// once with glibc's `malloc.hugetlb=1` tunable: large typed arrays are then backed by transparent huge pages,
// so first touching a freshly loaded field costs far fewer page faults. Below that the second Node start-up
// costs more than it saves. FIELDTALLY_NO_RESPAWN=1 turns it off.
// `--version` is answered before that, from package.json, so it costs a single short start.
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { wantsHugePages } from './hugePages.mjs';

const root = new URL('../', import.meta.url);
const args = process.argv.slice(2);
if (args.length === 1 && (args[0] === '--version' || args[0] === '-V')) {
  const { version } = JSON.parse(readFileSync(new URL('package.json', root), 'utf8'));
  process.stdout.write(`fieldtally ${version}\n`);
  process.exit(0);
}

const tunable = 'glibc.malloc.hugetlb=1';
const current = process.env.GLIBC_TUNABLES ?? '';
if (process.platform === 'linux' && !current.includes('glibc.malloc.hugetlb') && !process.env.FIELDTALLY_NO_RESPAWN && wantsHugePages(args)) {
  const env = { ...process.env, GLIBC_TUNABLES: current ? `${current}:${tunable}` : tunable, FIELDTALLY_NO_RESPAWN: '1' };
  const r = spawnSync(process.execPath, [...process.execArgv, fileURLToPath(import.meta.url), ...args], { stdio: 'inherit', env });
  if (r.error) {
    process.stderr.write(`fieldtally: could not start (${r.error.message})\n`);
    process.exit(1);
  }
  process.exit(r.status ?? (r.signal ? 128 + 2 : 1));
}

if (existsSync(new URL('src/cli/main.ts', root))) {
  let bundle = null;
  if (process.env.FIELDTALLY_CLI_FROM_SOURCE !== '1') {
    try {
      const { cachedBundle } = await import('./cliBundle.mjs');
      bundle = await cachedBundle(fileURLToPath(root));
    } catch (e) {
      // a source esbuild cannot bundle is reported by tsx below, with its place in the source
      if (process.env.FIELDTALLY_DEBUG) process.stderr.write(`fieldtally: no cached bundle (${e instanceof Error ? e.message : e}); running the sources\n`);
    }
  }
  if (bundle) {
    const { runBundle } = await import('./runBundle.mjs');
    await runBundle(bundle, args);
  } else {
    const { register } = await import('tsx/esm/api');
    register();
    const { runCommand } = await import('../src/cli/run.ts');
    await runCommand(args);
  }
} else {
  const { runBundle } = await import('./runBundle.mjs');
  await runBundle(fileURLToPath(new URL('dist-cli/fieldtally.cjs', root)), args);
}
