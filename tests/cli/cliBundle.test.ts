/**
 * bin/cliBundle.mjs, the bundling shared by `bin/build-cli.mjs` and the clone's cached bundle: the stamp that
 * names a cached bundle changes with any edit of the sources (size, time, a new or removed file) and only
 * then; every Node worker of workers/ is bundled beside the command; a source that cannot be bundled leaves
 * no half-written folder behind.
 */
import { existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { cachedBundle, sourceStamp, workerEntries } from '../../bin/cliBundle.mjs';

const REPO = resolve(__dirname, '../..');
const work = mkdtempSync(join(tmpdir(), 'fieldtally-clibundle-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** A small source tree shaped like the repository's (what the stamp and the bundler look at). */
function fakeRoot(name: string, run = "console.log('ok');\n"): string {
  const root = join(work, name);
  for (const d of ['src/cli/verbs', 'src/cli/benchStages', 'workers', 'bin']) mkdirSync(join(root, d), { recursive: true });
  writeFileSync(join(root, 'package.json'), '{ "name": "fake", "version": "1.2.3", "type": "module" }\n');
  writeFileSync(join(root, 'src/cli/run.ts'), run);
  writeFileSync(join(root, 'src/cli/verbs/one.ts'), 'export default 1;\n');
  writeFileSync(join(root, 'workers/plainWorker.node.mjs'), 'export {};\n');
  return root;
}

describe('cliBundle', () => {
  it('the stamp changes when a source is edited, touched, added or removed, and only then', () => {
    const root = fakeRoot('stamp');
    const first = sourceStamp(root);
    expect(sourceStamp(root)).toBe(first);
    writeFileSync(join(root, 'src/cli/verbs/one.ts'), 'export default 2;\n'); // same size, new time
    const t = new Date(Date.now() + 5000);
    utimesSync(join(root, 'src/cli/verbs/one.ts'), t, t);
    const edited = sourceStamp(root);
    expect(edited).not.toBe(first);
    writeFileSync(join(root, 'workers/extra.ts'), 'export {};\n');
    const added = sourceStamp(root);
    expect(added).not.toBe(edited);
    rmSync(join(root, 'workers/extra.ts'));
    expect(sourceStamp(root)).toBe(edited);
    writeFileSync(join(root, 'package.json'), '{ "name": "fake", "version": "1.2.4", "type": "module" }\n');
    expect(sourceStamp(root)).not.toBe(edited);
  });

  it('bundles every worker of workers/: its body when there is one, else the plain entry', () => {
    expect(workerEntries(REPO)).toEqual({
      inflate: 'workers/inflateWorker.node.mjs', series: 'workers/seriesWorkerBody.ts', share: 'workers/shareWorkerBody.ts',
      ...Object.fromEntries(readdirSync(join(REPO, 'workers')).filter((f) => /^[a-z]+WorkerBody\.ts$/.test(f) && !/^(series|share)W/.test(f))
        .map((f) => [f.replace(/WorkerBody\.ts$/, ''), `workers/${f}`])),
    });
    for (const f of Object.values(workerEntries(REPO))) expect(existsSync(join(REPO, f))).toBe(true);
  });

  it('builds a bundle into the temporary folder once, and leaves nothing behind when the source cannot be bundled', async () => {
    const saved = process.env.TMPDIR;
    const cache = mkdtempSync(join(work, 'tmp-'));
    process.env.TMPDIR = cache;
    try {
      const good = fakeRoot('good');
      const entry = await cachedBundle(good);
      expect(entry.startsWith(cache)).toBe(true);
      expect(readdirSync(join(entry, '..')).sort()).toEqual(['fieldtally.cjs', 'plainWorker.mjs']);
      expect(await cachedBundle(good)).toBe(entry);
      const bad = fakeRoot('bad', 'const = ;\n');
      await expect(cachedBundle(bad)).rejects.toThrow();
      const base = join(entry, '..', '..');
      expect(readdirSync(base)).toEqual([sourceStamp(good)]);
    } finally {
      if (saved === undefined) delete process.env.TMPDIR; else process.env.TMPDIR = saved;
    }
  }, 60_000);
});
