/**
 * bin/runBundle.mjs: the command's bundle runs with a V8 code cache per verb, written by the first run and used
 * by the next; a spoilt cache is rejected and written again, a folder others may write is never used, and the
 * printed numbers, messages and exit codes are the same in every case. Reference for the cut's number:
 * Hagen–Poiseuille flow (White, Viscous Fluid Flow, 3rd ed., 2006, §3-3; docs/references.md §1): p = G(L − z)
 * is linear, so the area-mean pressure over the cut at z = L/2 is G·L/2 = 0.20032 Pa on any mesh of the pipe.
 */
import { spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir, userInfo } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { BUNDLE_ENTRY, writeBundle } from '../../bin/cliBundle.mjs';
import { main } from '../../src/cli/main.ts';

const REPO = resolve(__dirname, '../..');
const PIPE = join(REPO, 'sample-fields/pipe-medium.vtu');
const work = mkdtempSync(join(tmpdir(), 'fieldtally-codecache-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const CUT = ['cut', PIPE, '--origin', '0,0,0.05', '--normal', '0,0,1', '--json'];

describe('code cache of the bundled command', () => {
  const temp = mkdtempSync(join(work, 'tmp-'));
  const run = (args: string[], extra: Record<string, string> = {}) => {
    const r = spawnSync(process.execPath, [join(REPO, 'bin', 'fieldtally.mjs'), ...args], {
      cwd: work, encoding: 'utf8', env: { ...process.env, TMPDIR: temp, FIELDTALLY_DEBUG: '1', FIELDTALLY_CODE_CACHE: '', ...extra },
    });
    const said = r.stderr.split('\n').filter((l) => l.startsWith('fieldtally: code cache: ')).map((l) => l.slice(24).split(' ')[0]);
    // the first other line: the message (FIELDTALLY_DEBUG adds its stack after it)
    const rest = r.stderr.split('\n').find((l) => l !== '' && !l.startsWith('fieldtally: code cache: ')) ?? '';
    return { status: r.status, stdout: r.stdout, said, rest };
  };
  const base = join(temp, `fieldtally-code-${userInfo().uid}`);
  /** The cache folder of the command's bundle (the one holding cut.bin). */
  const folder = () => join(base, readdirSync(base).find((f) => existsSync(join(base, f, 'cut.bin')))!);
  const withoutTime = (text: string) => { const j = JSON.parse(text) as { cut: { ms?: number } }; delete j.cut.ms; return j; };

  it('is written by the first run of a verb and used by the next, which prints the same numbers', async () => {
    const first = run(CUT);
    expect([first.status, first.said, first.rest]).toEqual([0, ['none', 'written'], '']);
    expect(readdirSync(folder())).toEqual(['cut.bin']);
    const second = run(CUT);
    expect([second.status, second.said]).toEqual([0, ['used']]);
    let text = '';
    expect(await main(CUT.slice(), { out: (t) => { text += t; }, err: () => {} })).toBe(0);
    expect(withoutTime(second.stdout)).toEqual(withoutTime(text));
    expect(withoutTime(first.stdout)).toEqual(withoutTime(text));
    expect((JSON.parse(text) as { areaMean: { p: number } }).areaMean.p).toBeCloseTo(0.20032, 12);
    // another verb has a cache of its own
    expect(run(['info', PIPE]).said).toEqual(['none', 'written']);
    expect(readdirSync(folder()).sort()).toEqual(['cut.bin', 'info.bin']);
  }, 60_000);

  it('prints the messages and exit codes of bad input with the cache in use', () => {
    const plane = run(['cut', PIPE, '--origin', '0,0,0.05', '--normal', '0,0,0']);
    expect([plane.status, plane.said, plane.stdout, plane.rest]).toEqual([1, ['used'], '', 'fieldtally cut: --normal: the direction "0,0,0" has zero length; expected a vector such as 0,0,1']);
    const missing = run(['cut', join(work, 'missing.vtu'), '--origin', '0,0,0', '--normal', '0,0,1']);
    expect([missing.status, missing.said]).toEqual([1, ['used']]);
    expect(missing.rest).toMatch(/^fieldtally cut: .*missing\.vtu: cannot read file \(no such file or folder\)$/);
    expect(run(['nonsense']).status).toBe(2);
  }, 60_000);

  it('rejects a spoilt cache, computes the same numbers and writes it again', () => {
    const good = run(CUT);
    writeFileSync(join(folder(), 'cut.bin'), Buffer.alloc(4096, 7));
    const spoilt = run(CUT);
    expect([spoilt.status, spoilt.said]).toEqual([0, ['rejected', 'written']]);
    expect(withoutTime(spoilt.stdout)).toEqual(withoutTime(good.stdout));
    expect(run(CUT).said).toEqual(['used']);
  }, 60_000);

  it('runs import() of a Node built-in from the bundle with the cache in use (bundled as a require)', async () => {
    const root = join(work, 'fake');
    for (const d of ['src/cli/verbs', 'src/cli/benchStages', 'workers', 'bin']) mkdirSync(join(root, d), { recursive: true });
    writeFileSync(join(root, 'package.json'), '{ "name": "fake", "version": "1.0.0", "type": "module" }\n');
    writeFileSync(join(root, 'src/cli/run.ts'), "export async function runCommand(argv: string[]): Promise<void> {\n  const { posix } = await import('node:path');\n  process.stdout.write(posix.join(...argv) + '\\n');\n  process.exit(3);\n}\n");
    const dir = join(work, 'fake-bundle');
    await writeBundle(root, dir, { logLevel: 'silent' });
    const script = `import(${JSON.stringify(pathToFileURL(join(REPO, 'bin/runBundle.mjs')).href)}).then((m) => m.runBundle(${JSON.stringify(join(dir, BUNDLE_ENTRY))}, ['join', 'a', 'b']))`;
    const own = mkdtempSync(join(work, 'tmp-'));
    const runs = [0, 1, 2].map(() => spawnSync(process.execPath, ['-e', script], { encoding: 'utf8', env: { ...process.env, TMPDIR: own, FIELDTALLY_DEBUG: '1', FIELDTALLY_CODE_CACHE: '' } }));
    expect(runs.map((r) => [r.status, r.stdout, r.stderr.split('\n').filter((l) => l.startsWith('fieldtally: code cache: ')).map((l) => l.slice(24).split(' ')[0])]))
      .toEqual([[3, 'join/a/b\n', ['none', 'written']], [3, 'join/a/b\n', ['used']], [3, 'join/a/b\n', ['used']]]);
  }, 60_000);

  it('uses no folder that others may write, and nothing when turned off', () => {
    chmodSync(folder(), 0o777);
    try {
      const open = run(CUT);
      expect([open.status, open.said]).toEqual([0, ['none']]);
    } finally {
      chmodSync(folder(), 0o700);
    }
    const off = run(['line', PIPE, '--from', '0,0,0', '--to', '0,0,0.1', '--samples', '3'], { FIELDTALLY_CODE_CACHE: '0' });
    expect([off.status, off.said]).toEqual([0, ['none']]);
    expect(existsSync(join(folder(), 'line.bin'))).toBe(false);
  }, 60_000);
});
