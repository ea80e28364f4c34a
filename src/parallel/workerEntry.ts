/**
 * Where the Node worker threads' entry files are (Node only). The installed command (bin/build-cli.mjs)
 * ships each worker as its own bundle beside dist-cli/fieldtally.mjs, plain JavaScript that starts with no
 * loader. From source (a clone), registering the TypeScript loader in every worker costs 0.3–0.5 s a worker,
 * so the worker body is bundled once with esbuild (a devDependency) into the temporary folder, under a name
 * made from the size and time of every source file (`src/`, `workers/`, package-lock.json): an edited source
 * gives a new bundle, never a stale one. Where that cannot be done (no esbuild, a read-only temporary folder,
 * `FIELDTALLY_WORKERS_FROM_SOURCE=1`), the entries in workers/ register the loader and import the sources.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, renameSync, statSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir, userInfo } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

/** Set to true by the bundler (bin/build-cli.mjs); absent when running from source. */
declare const FIELDTALLY_BUNDLED: boolean | undefined;

/**
 * The worker kinds: compute shares (`nodePool.ts`), series runs (`seriesPool.ts`), zlib blocks (`inflatePool.ts`),
 * ASCII text (`textPool.ts`), parts of raw arrays (`readPool.ts`).
 */
export type WorkerKind = 'share' | 'series' | 'inflate' | 'text' | 'read';

/** The body each TypeScript worker runs (inflate workers are plain JavaScript already). */
const BODIES: Partial<Record<WorkerKind, string>> = { share: 'workers/shareWorkerBody.ts', series: 'workers/seriesWorkerBody.ts', text: 'workers/textWorkerBody.ts', read: 'workers/readWorkerBody.ts' };

const built = new Map<WorkerKind, URL | null>();

/** URL of the entry file of a `kind` worker, for `new Worker(url)`. */
export function workerEntry(kind: WorkerKind): URL {
  if (typeof FIELDTALLY_BUNDLED !== 'undefined' && FIELDTALLY_BUNDLED) return new URL(`./${kind}Worker.mjs`, import.meta.url);
  const source = new URL(`../../workers/${kind}Worker.node.mjs`, import.meta.url);
  if (!BODIES[kind] || process.env.FIELDTALLY_WORKERS_FROM_SOURCE === '1') return source;
  if (!built.has(kind)) built.set(kind, bundleFromSource(kind));
  return built.get(kind) ?? source;
}

/** Size and time of every file under `dir`, into `hash` (sorted, so the order of listing does not matter). */
function stamp(dir: string, hash: ReturnType<typeof createHash>): void {
  const names = readdirSync(dir, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : 1));
  for (const e of names) {
    const full = join(dir, e.name);
    if (e.isDirectory()) stamp(full, hash);
    else if (e.isFile()) { const s = statSync(full); hash.update(`${full}\0${s.size}\0${s.mtimeMs}\n`); }
  }
}

/** The cached bundle of a worker body, built now if missing; null when it cannot be built. */
function bundleFromSource(kind: WorkerKind): URL | null {
  try {
    const root = fileURLToPath(new URL('../../', import.meta.url));
    const hash = createHash('sha256');
    stamp(join(root, 'src'), hash);
    stamp(join(root, 'workers'), hash);
    const lock = join(root, 'package-lock.json');
    if (existsSync(lock)) { const s = statSync(lock); hash.update(`lock\0${s.size}\0${s.mtimeMs}`); }
    const dir = join(tmpdir(), `fieldtally-workers-${userInfo().uid}`, hash.digest('hex').slice(0, 24));
    const file = join(dir, `${kind}Worker.mjs`);
    if (!existsSync(file)) {
      mkdirSync(dir, { recursive: true });
      // required at run time (never bundled): the installed command does not come here
      const esbuild = createRequire(import.meta.url)('esbuild') as typeof import('esbuild');
      const part = `${file}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`;
      esbuild.buildSync({
        entryPoints: [join(root, BODIES[kind]!)], outfile: part, bundle: true, platform: 'node', format: 'esm', target: 'node20',
        logLevel: 'silent', define: { FIELDTALLY_BUNDLED: 'true' },
        banner: { js: "import { createRequire as fieldtallyRequire } from 'node:module'; const require = fieldtallyRequire(import.meta.url);" },
      });
      renameSync(part, file); // whole or not at all, also with several processes building at once
    }
    return pathToFileURL(file);
  } catch {
    return null;
  }
}
