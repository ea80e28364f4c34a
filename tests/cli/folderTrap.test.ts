/**
 * Folder traps for the writers (issue 16): `report --out` owns a folder only by its manifest, never
 * follows a link out of it, never replaces an input or a foreign file, removes the stale pictures its
 * previous manifest listed, refuses system file systems and folders that cannot be made, and leaves the
 * previous report byte for byte when a write fails part-way; `probes --upgrade` never writes over its
 * input (by identity, whatever the name), through a link or over an unrelated file.
 */
import { linkSync, mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync, symlinkSync, writeFileSync, lstatSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { REPORT_MANIFEST, writeReportFolder } from '../../src/cli/reportWriter.ts';

const REPO = resolve(__dirname, '../..');
const PIPE = join(REPO, 'sample-fields/pipe-coarse.vtu');
const V1_SET = join(REPO, 'tests/study/fixtures');
const enc = new TextEncoder();
const files = (n: number, tag: string) => {
  const f: Record<string, Uint8Array> = { 'report.html': enc.encode(`<p>${tag}</p>`), 'results.csv': enc.encode(`a,b\n${tag}\n`) };
  for (let i = 1; i <= n; i++) f[`view-${i}.png`] = enc.encode(`png ${tag} ${i}`);
  return f;
};
const snapshot = (dir: string) => Object.fromEntries(readdirSync(dir).sort().map((n) => [n, readFileSync(join(dir, n), 'utf8')]));

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

let dir = '';
beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'fieldtally-trap-')); });
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('report folder', () => {
  it('a new folder gets the files and a manifest listing them', () => {
    const out = join(dir, 'new', 'deeper');
    const written = writeReportFolder(out, files(2, 'one'));
    expect(written.map((p) => p.slice(out.length + 1))).toEqual(['report.html', 'results.csv', 'view-1.png', 'view-2.png']);
    expect(readdirSync(out).sort()).toEqual([REPORT_MANIFEST, 'report.html', 'results.csv', 'view-1.png', 'view-2.png']);
    expect(JSON.parse(readFileSync(join(out, REPORT_MANIFEST), 'utf8'))).toEqual({ format: 'fieldtally-report-manifest', version: 1, files: ['report.html', 'results.csv', 'view-1.png', 'view-2.png'] });
  });

  it('a second run replaces its own report and removes the stale pictures it listed', () => {
    const out = join(dir, 'again');
    writeReportFolder(out, files(3, 'first'));
    writeReportFolder(out, files(1, 'second'));
    expect(snapshot(out)).toMatchObject({ 'report.html': '<p>second</p>', 'view-1.png': 'png second 1' });
    expect(readdirSync(out).sort()).toEqual([REPORT_MANIFEST, 'report.html', 'results.csv', 'view-1.png']);
    expect(readdirSync(dir).filter((n) => n.includes('.partial'))).toEqual([]);
  });

  it('a folder with a report.html but no manifest, or with a foreign file, is refused and left alone', () => {
    const lookalike = join(dir, 'lookalike');
    mkdirSync(lookalike);
    writeFileSync(join(lookalike, 'report.html'), 'mine');
    expect(() => writeReportFolder(lookalike, files(1, 'x'))).toThrow(/--out .*lookalike: the folder is not empty and is not a report folder of fieldtally \(it holds a report\.html, but no manifest written by fieldtally\); choose a new or empty folder$/);
    expect(snapshot(lookalike)).toEqual({ 'report.html': 'mine' });

    const owned = join(dir, 'owned');
    writeReportFolder(owned, files(1, 'first'));
    writeFileSync(join(owned, 'notes.txt'), 'my notes');
    const before = snapshot(owned);
    expect(() => writeReportFolder(owned, files(1, 'second'))).toThrow(/--out .*owned: holds "notes\.txt", which an earlier report did not write; move it or choose another folder$/);
    expect(snapshot(owned)).toEqual(before);
  });

  it('a listed file turned into a link out of the folder: the link is replaced, its target untouched', () => {
    const out = join(dir, 'linked');
    writeReportFolder(out, files(1, 'first'));
    const outside = join(dir, 'precious.csv');
    writeFileSync(outside, 'precious');
    rmSync(join(out, 'results.csv'));
    symlinkSync(outside, join(out, 'results.csv'));
    writeReportFolder(out, files(1, 'second'));
    expect(readFileSync(outside, 'utf8')).toBe('precious');
    expect(lstatSync(join(out, 'results.csv')).isSymbolicLink()).toBe(false);
    expect(readFileSync(join(out, 'results.csv'), 'utf8')).toBe('a,b\nsecond\n');
  });

  it('--out that is a link, a file, on /proc or /sys, or under a file is refused', () => {
    const real = join(dir, 'real');
    mkdirSync(real);
    symlinkSync(real, join(dir, 'alias'));
    expect(() => writeReportFolder(join(dir, 'alias'), files(1, 'x'))).toThrow(/alias: is a symbolic link; give the folder it points to, or a new folder$/);
    writeFileSync(join(dir, 'plain'), 'x');
    expect(() => writeReportFolder(join(dir, 'plain'), files(1, 'x'))).toThrow(/plain: exists and is not a folder$/);
    expect(() => writeReportFolder('/proc/fieldtally-report', files(1, 'x'))).toThrow('--out /proc/fieldtally-report: lies on a system file system (/proc), not a place for output; choose a folder of your own');
    expect(() => writeReportFolder('/sys/kernel/fieldtally', files(1, 'x'))).toThrow(/^--out \/sys\/kernel\/fieldtally: lies on a system file system \(\/sys\)/);
    expect(() => writeReportFolder(join(dir, 'plain', 'sub'), files(1, 'x'))).toThrow(/plain\/sub: cannot be created there \(.*plain is not a folder\)$/);
    expect(readdirSync(real)).toEqual([]);
  });

  it('a failure part-way leaves the previous report byte for byte, and no temporary folder', () => {
    const out = join(dir, 'failing');
    writeReportFolder(out, files(2, 'good'));
    const before = snapshot(out);
    let n = 0;
    expect(() => writeReportFolder(out, files(2, 'bad'), { onWritten: () => { if (++n === 2) throw new Error('disk full (simulated)'); } }))
      .toThrow(/--out .*failing: cannot write the report \(disk full \(simulated\)\); any earlier report there is unchanged$/);
    expect(snapshot(out)).toEqual(before);
    expect(readdirSync(dir).filter((f) => f.startsWith('.failing'))).toEqual([]);
  });

  it('report refuses a folder holding its own probe set, before computing anything', async () => {
    const out = join(dir, 'with-input');
    writeReportFolder(out, files(1, 'x'));
    // the probe set sits in the report folder as a listed file of the earlier report
    const set = join(out, 'results.csv');
    writeFileSync(set, JSON.stringify({ format: 'fieldtally-probe-set', version: 2, probes: [] }));
    const before = snapshot(out);
    const r = await run('report', PIPE, '--probes', set, '--out', out);
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/^fieldtally report: --out .*with-input: holds an input of this report \(results\.csv\); writing the report there would replace it — choose another folder\n$/);
    expect(snapshot(out)).toEqual(before);
  });
});

describe('probes --upgrade', () => {
  const v1 = () => readdirSync(V1_SET).find((f) => /v1.*\.json$/.test(f));

  it('writes a new file, and over an earlier probe set, by a rename', async () => {
    const src = join(V1_SET, v1()!);
    const out = join(dir, 'up', 'set.json');
    mkdirSync(join(dir, 'up'));
    expect((await run('check-probes', src, '--upgrade', out)).code).toBe(0);
    expect(JSON.parse(readFileSync(out, 'utf8')).version).toBe(2);
    const ino = statSync(out).ino;
    expect((await run('check-probes', src, '--upgrade', out)).code).toBe(0);
    expect(statSync(out).ino).not.toBe(ino);
  });

  it('never over its input (same file by another name or a hard link), through a link, or over an unrelated file', async () => {
    const src = join(dir, 'input.json');
    writeFileSync(src, readFileSync(join(V1_SET, v1()!)));
    const original = readFileSync(src, 'utf8');
    linkSync(src, join(dir, 'hard.json'));
    symlinkSync(join(dir, 'elsewhere.json'), join(dir, 'dangling.json'));
    writeFileSync(join(dir, 'notes.json'), '{"mine": true}');
    const cases: [string, RegExp][] = [
      [join(dir, '.', 'input.json'), /is the input probe set itself; choose another name$/],
      [join(dir, 'hard.json'), /is the input probe set itself; choose another name$/],
      [join(dir, 'dangling.json'), /dangling\.json: is a symbolic link; not written through — choose another name$/],
      [join(dir, 'notes.json'), /notes\.json: exists and is not a probe set; not overwritten — choose another name$/],
      ['/proc/self/upgraded.json', /^fieldtally check-probes: --upgrade \/proc\/self\/upgraded\.json: lies on a system file system/],
    ];
    for (const [out, msg] of cases) {
      const r = await run('check-probes', src, '--upgrade', out);
      expect(r.code, out).toBe(1);
      expect(r.err.trimEnd()).toMatch(msg);
    }
    expect(readFileSync(src, 'utf8')).toBe(original);
    expect(readFileSync(join(dir, 'notes.json'), 'utf8')).toBe('{"mine": true}');
    expect(() => lstatSync(join(dir, 'elsewhere.json'))).toThrow();
  });
});
