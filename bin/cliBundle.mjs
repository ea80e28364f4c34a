// How the command line is bundled with esbuild (a devDependency), shared by the two places that do it:
// `bin/build-cli.mjs` (dist-cli/, for `npm pack`) and `bin/fieldtally.mjs` in a clone, which runs a bundle
// cached in the temporary folder instead of compiling TypeScript on every start.
//
// `writeBundle(root, dir)` writes dir/fieldtally.cjs (from src/cli/run.ts, fflate included) and each Node
// worker beside it (dir/<kind>Worker.mjs, found there by src/parallel/workerEntry.ts), with the verb and
// bench-stage names written in as constants (a bundle has no folder to list). The command is CommonJS so
// that bin/runBundle.mjs can compile it with a V8 code cache (Node 20 keeps none for ES modules); the workers
// stay ES modules.
//
// `cachedBundle(root)` returns the entry of a bundle in $TMPDIR/fieldtally-cli-<uid>/<stamp>/, building it
// when missing. The stamp is a hash of the size and time of every file in src/, workers/ and bin/ and of
// package.json and package-lock.json, so an edited source gives a new bundle and a clone never runs a stale
// one. A new bundle is written into a folder of its own and renamed into place whole, so processes starting
// at once never see half of one. Folders of stamps unused for a week are removed.
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, utimesSync } from 'node:fs';
import { tmpdir, userInfo } from 'node:os';
import { join } from 'node:path';
import { hash64 } from './runBundle.mjs';

/**
 * The Node workers bundled beside the command, by kind (src/parallel/workerEntry.ts names the kinds): each
 * `workers/<kind>WorkerBody.ts`, else the plain `workers/<kind>Worker.node.mjs` (the inflate worker), so a new
 * kind of worker is picked up without touching a list.
 */
export function workerEntries(root) {
  const files = readdirSync(join(root, 'workers'));
  const out = {};
  for (const f of files.sort()) {
    const body = /^([a-z]+)WorkerBody\.ts$/.exec(f), plain = /^([a-z]+)Worker\.node\.mjs$/.exec(f);
    if (body) out[body[1]] = `workers/${f}`;
    else if (plain && !files.includes(`${plain[1]}WorkerBody.ts`)) out[plain[1]] = `workers/${f}`;
  }
  return out;
}

/** File name of the command's bundle (CommonJS, run by bin/runBundle.mjs). */
export const BUNDLE_ENTRY = 'fieldtally.cjs';

/** Folders of cached bundles not used for this long are removed (ms). */
const KEEP_UNUSED_MS = 7 * 24 * 3600 * 1000;

const tsNames = (root, dir) => readdirSync(join(root, dir)).filter((f) => f.endsWith('.ts')).map((f) => f.slice(0, -3)).sort();

/**
 * fflate's build for browsers: the same synchronous and streaming code as its Node build, whose module starts
 * by loading node:worker_threads for the asynchronous functions (which we do not use), 2–9 ms of every start.
 */
const fflateWithoutThreads = (root) => ({
  name: 'fflate-without-threads',
  setup(b) { b.onResolve({ filter: /^fflate$/ }, () => ({ path: join(root, 'node_modules', 'fflate', 'esm', 'browser.js') })); },
});

/** esbuild options shared by the command and its workers. */
function commonOptions(root) {
  const { version } = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8'));
  const verbs = tsNames(root, 'src/cli/verbs');
  const stages = tsNames(root, 'src/cli/benchStages').filter((n) => n !== 'stage');
  return {
    version, verbs,
    options: {
      bundle: true,
      platform: 'node',
      format: 'esm',
      target: 'node20',
      legalComments: 'eof',
      logLevel: 'warning',
      define: {
        FIELDTALLY_VERSION: JSON.stringify(version),
        FIELDTALLY_VERBS: JSON.stringify(verbs),
        FIELDTALLY_BENCH_STAGES: JSON.stringify(stages),
        FIELDTALLY_BUNDLED: 'true',
      },
      // some bundled CommonJS code may call require() for Node built-ins
      banner: { js: "import { createRequire as fieldtallyRequire } from 'node:module'; const require = fieldtallyRequire(import.meta.url);" },
      metafile: true,
      plugins: [fflateWithoutThreads(root)],
    },
  };
}

/**
 * Bundles the command and its workers into `dir` (created if missing). Returns the version, the verb names,
 * the size of the command's bundle (bytes) and every input file bundled (for the licence notices).
 */
export async function writeBundle(root, dir, overrides = {}) {
  const { build } = await import('esbuild');
  const { version, verbs, options } = commonOptions(root);
  const common = { ...options, ...overrides };
  mkdirSync(dir, { recursive: true });
  // CommonJS has no import.meta: the bundle's own file URL stands in for it (the workers are found beside it).
  // Every import() becomes a require(): a script compiled with a code cache has no dynamic-import callback
  // (Node keeps it with the script's host options, which a cached script loses), so an import() of a module
  // left outside the bundle (a Node built-in) would fail on the runs that use the cache.
  const main = await build({
    ...common, format: 'cjs', entryPoints: [join(root, 'src/cli/run.ts')], outfile: join(dir, BUNDLE_ENTRY),
    supported: { 'dynamic-import': false },
    define: { ...common.define, 'import.meta.url': 'fieldtallyModuleUrl', 'import.meta.filename': '__filename', 'import.meta.dirname': '__dirname' },
    banner: { js: "var fieldtallyModuleUrl = require('node:url').pathToFileURL(__filename).href;" },
  });
  const inputs = Object.keys(main.metafile?.inputs ?? {});
  for (const [kind, entry] of Object.entries(workerEntries(root))) {
    const w = await build({ ...common, entryPoints: [join(root, entry)], outfile: join(dir, `${kind}Worker.mjs`) });
    inputs.push(...Object.keys(w.metafile?.inputs ?? {}));
  }
  return { version, verbs, bytes: statSync(join(dir, BUNDLE_ENTRY)).size, inputs };
}

/** Size and time of every file under `dir`, one line each (sorted, so the order of listing does not matter). */
function stamp(dir, lines) {
  if (!existsSync(dir)) return;
  const names = readdirSync(dir, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : 1));
  for (const e of names) {
    const full = join(dir, e.name);
    if (e.isDirectory()) stamp(full, lines);
    else if (e.isFile()) { const s = statSync(full); lines.push(`${full}\0${s.size}\0${s.mtimeMs}`); }
  }
}

/** The stamp of the sources a bundle is made from: file count and a hash of every file's path, size and time. */
export function sourceStamp(root) {
  const lines = [];
  for (const d of ['src', 'workers', 'bin']) stamp(join(root, d), lines);
  for (const f of ['package.json', 'package-lock.json']) {
    const p = join(root, f);
    if (existsSync(p)) { const s = statSync(p); lines.push(`${p}\0${s.size}\0${s.mtimeMs}`); }
  }
  return `${lines.length.toString(36)}-${hash64(lines)}`;
}

/** Removes folders of other stamps under `base` last used over a week ago (best effort). */
function prune(base, keep) {
  const now = Date.now();
  for (const name of readdirSync(base)) {
    if (name === keep) continue;
    const full = join(base, name);
    try {
      if (now - statSync(full).mtimeMs > KEEP_UNUSED_MS) rmSync(full, { recursive: true, force: true });
    } catch { /* another process removed it first */ }
  }
}

/**
 * Path of the cached bundle's entry (dir/fieldtally.cjs) for the sources under `root`, built now when missing
 * (about a second). Throws when it cannot be built (no esbuild, a read-only temporary folder).
 */
export async function cachedBundle(root) {
  const base = join(tmpdir(), `fieldtally-cli-${userInfo().uid}`);
  const name = sourceStamp(root);
  const dir = join(base, name);
  const entry = join(dir, BUNDLE_ENTRY);
  if (existsSync(entry)) {
    const now = new Date();
    try { utimesSync(dir, now, now); } catch { /* marks it used; not needed to run it */ }
    return entry;
  }
  const part = join(base, `${name}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`);
  try {
    await writeBundle(root, part, { logLevel: 'silent', legalComments: 'none', metafile: false });
    try {
      renameSync(part, dir); // whole or not at all
    } catch (e) {
      if (!existsSync(entry)) throw e; // another process put the same bundle in place first
    }
  } finally {
    rmSync(part, { recursive: true, force: true });
  }
  prune(base, name);
  return entry;
}
