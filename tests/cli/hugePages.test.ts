/**
 * bin/hugePages.mjs: the command re-starts itself with huge pages only for inputs that may decode to
 * HUGE_PAGES_MIN_BYTES or more (or when it cannot tell: folders, patterns, files naming other files), and
 * either way it prints the same numbers and exit codes.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { HUGE_PAGES_MIN_BYTES, inputEstimate, wantsHugePages } from '../../bin/hugePages.mjs';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { datasetOf, hexGrid } from '../../src/model/meshBuild.ts';

const REPO = resolve(__dirname, '../..');
const work = mkdtempSync(join(tmpdir(), 'fieldtally-hugepages-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

describe('hugePages', () => {
  const grid = datasetOf([hexGrid(4, 4, 4)]);
  const raw = join(work, 'raw.vtu'), zlib = join(work, 'zlib.vtu');
  const rawBytes = writeVtu(grid, { encoding: 'appended-raw' }), zlibBytes = writeVtu(grid, { encoding: 'zlib' });
  writeFileSync(raw, rawBytes);
  writeFileSync(zlib, zlibBytes);

  it('counts the sizes of existing files, a compressed XML file eight times, and nothing for options or values', () => {
    expect(inputEstimate(['cut', raw, '--origin', '0,0,0', '--normal', '0,0,1'])).toBe(rawBytes.length);
    expect(inputEstimate([zlib])).toBe(8 * zlibBytes.length);
    expect(inputEstimate([raw, zlib, '--json'])).toBe(rawBytes.length + 8 * zlibBytes.length);
    expect(inputEstimate(['--version'])).toBe(0);
    expect(inputEstimate([join(work, 'missing.vtu')])).toBe(0);
    // counting stops once the estimate is enough
    expect(inputEstimate([raw, zlib], rawBytes.length)).toBe(rawBytes.length);
  });

  it('cannot tell for a folder, a glob or numbered pattern, or a file naming other files', () => {
    const set = join(work, 'set.pvtu');
    writeFileSync(set, '<VTKFile type="PUnstructuredGrid"/>');
    mkdirSync(join(work, 'steps'), { recursive: true });
    for (const a of [join(work, 'steps'), join(work, 'run_*.vtu'), join(work, 'run_%04d.vtu'), set]) {
      expect(inputEstimate(['history', a]), a).toBe(Infinity);
      expect(wantsHugePages(['history', a]), a).toBe(true);
    }
  });

  it('re-starts only from the threshold on', () => {
    expect(HUGE_PAGES_MIN_BYTES).toBe(256 * 1024 * 1024);
    expect(wantsHugePages([raw])).toBe(false);
    expect(wantsHugePages([raw], rawBytes.length)).toBe(true);
    expect(wantsHugePages([raw], rawBytes.length + 1)).toBe(false);
  });

  it('prints the same numbers and exit codes with and without the re-start', () => {
    const bin = (args: string[], minBytes: string) => spawnSync(process.execPath, [join(REPO, 'bin', 'fieldtally.mjs'), ...args], {
      cwd: work, encoding: 'utf8', env: { ...process.env, FIELDTALLY_NO_RESPAWN: '', FIELDTALLY_RESPAWN_MIN_BYTES: minBytes },
    });
    const cut = ['cut', raw, '--origin', '0.5,0.5,0.5', '--normal', '0,0,1', '--velocity', 'none', '--json'];
    const area = (text: string) => (JSON.parse(text) as { area: number }).area;
    const [once, twice] = [bin(cut, '0'), bin(cut, '1e18')];
    expect([once.status, twice.status]).toEqual([0, 0]);
    expect(area(once.stdout)).toBeCloseTo(1, 12); // the unit cube's mid-plane
    expect(area(twice.stdout)).toBe(area(once.stdout));
    for (const minBytes of ['0', '1e18']) {
      const bad = bin(['cut', raw, '--origin', '0,0,0', '--normal', '0,0,0'], minBytes);
      expect([bad.status, bad.stdout, bad.stderr.trim()]).toEqual([1, '', 'fieldtally cut: --normal: the direction "0,0,0" has zero length; expected a vector such as 0,0,1']);
      expect(bin([], minBytes).status).toBe(2);
    }
    expect(execFileSync(process.execPath, [join(REPO, 'bin', 'fieldtally.mjs'), '--version'], { encoding: 'utf8' })).toMatch(/^fieldtally \d/);
  }, 120_000);
});
