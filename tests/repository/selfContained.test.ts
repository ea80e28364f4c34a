/**
 * The repository stands on its own: no source, test, script or document points at a folder beside it, and
 * every section of docs/references.md that a comment cites exists there.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';

const REPO = resolve(__dirname, '../..');
const SKIP = new Set(['node_modules', '.git', 'dist', 'dist-cli', '.vite', '.screenshots']);
const TEXT = /\.(ts|mjs|js|py|json|md|html|css|txt)$/;

/** Text files of the repository, the external VTK data and generated folders left out. */
function textFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (SKIP.has(name)) return [];
    if (statSync(path).isDirectory()) return relative(REPO, path) === join('tests', 'fixtures', 'external') ? [join(path, 'SOURCES.md')] : textFiles(path);
    return TEXT.test(name) && name !== 'package-lock.json' ? [path] : [];
  });
}

const files = textFiles(REPO);

describe('self-contained repository', () => {
  it('reads the sources, tests, scripts and documents', () => {
    const names = files.map((f) => relative(REPO, f));
    for (const f of ['README.md', 'DEVELOPERS.md', 'docs/references.md', 'src/cli/main.ts', 'tests/helpers/external.ts', 'tests/reference/vtk_info.py']) expect(names).toContain(f);
  });

  it('no file refers to a folder beside the repository', () => {
    const outside = /\.\.\/shared\b|['"]shared['"], ['"]fields['"]|REFERENCES\.md/;
    const me = relative(REPO, __filename);
    const hits = files.filter((f) => relative(REPO, f) !== me && outside.test(readFileSync(f, 'utf8'))).map((f) => relative(REPO, f));
    expect(hits).toEqual([]);
  });

  it('every section of docs/references.md cited in a comment exists', () => {
    const doc = readFileSync(join(REPO, 'docs/references.md'), 'utf8');
    const sections = new Set([...doc.matchAll(/^## §(\d+) /gm)].map((m) => m[1]!));
    expect(sections.size).toBeGreaterThanOrEqual(8);
    const cited = new Set<string>();
    for (const f of files) for (const m of readFileSync(f, 'utf8').matchAll(/docs\/references\.md §(\d+)/g)) cited.add(m[1]!);
    expect([...cited].filter((s) => !sections.has(s))).toEqual([]);
    expect(cited.size).toBeGreaterThanOrEqual(8);
  });
});
