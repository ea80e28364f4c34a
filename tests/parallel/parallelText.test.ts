/**
 * Parallel parsing of ASCII arrays: files loaded with 1, 2 and 3 text workers hold exactly the bits of the
 * one-thread load (same parser on the same tokens), read by ranges from disk and whole from memory, with
 * windows small enough that every array spans many of them and many batches. Inputs: the committed sample
 * fields rewritten as ASCII .vtu (Float64 points and fields, Int64 ids, UInt8 types) and external ASCII files
 * written by other programs (VTK's example data, the vtu11 and vtkio libraries' test files). Bad text is
 * reported with the one-thread reader's message, and the windows' parser agrees with `Number()`.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { parseTextHere, parseWindow } from '../../src/io/asciiWindows.ts';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { readDataset } from '../../src/io/readDataset.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { startTextPool, type TextPool } from '../../src/parallel/textPool.ts';
import { externalPath } from '../helpers/external.ts';
import { expectSameArrays } from '../helpers/sameArrays.ts';

const SAMPLES = resolve(__dirname, '../../sample-fields');
const dir = mkdtempSync(join(tmpdir(), 'fieldtally-text-'));

const copies = new Map<string, Promise<string>>();

/** The sample field rewritten with ASCII arrays, in the temporary folder (once). */
function asciiCopy(name: string): Promise<string> {
  if (!copies.has(name)) {
    copies.set(name, loadDatasetFile(`${SAMPLES}/${name}`).then((d) => {
      const file = join(dir, name.replace('.vtu', '.ascii.vtu'));
      writeFileSync(file, writeVtu(d, { encoding: 'ascii' }));
      return file;
    }));
  }
  return copies.get(name)!;
}

const FILES = [
  () => asciiCopy('sphere-stokes.vtu'), () => asciiCopy('pipe-wedge-core.vtu'), () => asciiCopy('sphere-stokes-celldata.vtu'),
  async () => externalPath('vtk-data/polyhedron2pieces.vtu'), async () => externalPath('vtu11/pyramids_3D/ascii.vtu'),
  async () => externalPath('vtkio/hexahedron_ascii.vtu'),
];

const pools: TextPool[] = [];
afterAll(async () => {
  for (const p of pools) await p.close();
  rmSync(dir, { recursive: true, force: true });
});

describe.each([1, 2, 3])('loading with %i text worker(s)', (n) => {
  // 4 kB windows: every array of the samples spans many windows and batches
  const pool = startTextPool(n, 4096);
  pools.push(pool);
  // every window parsed cleanly on the workers: no array went back to the one-thread path
  let failed = 0;
  const parseText = Object.assign(async (...a: Parameters<TextPool['parseText']>) => {
    const got = await pool.parseText(...a);
    failed += got.filter((g) => typeof g !== 'number').length;
    return got;
  }, { workers: n, windowBytes: 4096 });

  it.each(FILES.map((f, i) => [i, f] as const))('file %i: every array bit for bit as the one-thread load, from disk and from memory', async (_i, make) => {
    const file = await make();
    const one = await loadDatasetFile(file);
    const before = pool.done.windows;
    expectSameArrays(await loadDatasetFile(file, { parseText }), one);
    expect(pool.done.windows).toBeGreaterThan(before);
    const bytes = new Uint8Array(readFileSync(file));
    expectSameArrays(await readDataset(file, bytes, { parseText }), one);
    expect(failed).toBe(0);
  });
});

describe('bad text', () => {
  const pool = startTextPool(2, 4096);
  pools.push(pool);

  it.each([
    ['a letter inside a number', (t: string) => t.replace(/(<DataArray[^>]*Name="p"[^>]*>\s*\S+\s+\S+\s+)\S+/, '$11.2x5')],
    ['a value too many', (t: string) => t.replace(/(<DataArray[^>]*Name="p"[^>]*>)/, '$1 7 ')],
    ['a value too few', (t: string) => t.replace(/(<DataArray[^>]*Name="p"[^>]*>\s*)\S+/, '$1')],
    ['an id out of range', (t: string) => t.replace(/(<DataArray[^>]*Name="connectivity"[^>]*>\s*\S+\s+)\S+/, '$1-4')],
  ])('%s: the one-thread message', async (_what, spoil) => {
    const good = readFileSync(await asciiCopy('sphere-stokes.vtu'), 'latin1');
    const bad = spoil(good);
    expect(bad).not.toBe(good);
    const file = join(dir, 'spoilt.vtu');
    writeFileSync(file, bad, 'latin1');
    const oneThread = await loadDatasetFile(file).then(() => 'loaded', (e: Error) => e.message);
    expect(oneThread).toMatch(/sphere|spoilt/);
    expect(oneThread).not.toBe('loaded');
    const threads = await loadDatasetFile(file, { parseText: pool.parseText }).then(() => 'loaded', (e: Error) => e.message);
    expect(threads).toBe(oneThread);
  });
});

describe('parseWindow', () => {
  it('reads each number as Number() does (ECMA-262 Number, correctly rounded), and flags text that is not numbers', async () => {
    const words = ['0', '-0', '1e-310', '3.141592653589793238', '12345678901234567890', '-2.5E+3', '0.1', '1.7976931348623157e308', 'nan'];
    const text = new TextEncoder().encode(` ${words.join('\n\t')} `);
    const out = new Float64Array(20);
    expect(parseWindow(text, 0, text.length, out, 3)).toBe(words.length);
    expect([...out.subarray(3, 3 + words.length)]).toEqual(words.map((w) => Number(w === 'nan' ? NaN : w)));
    expect(Object.is(out[4], -0)).toBe(true);
    const bad = new TextEncoder().encode('1 2 x3 4');
    expect(typeof parseWindow(bad, 0, bad.length, out, 0)).toBe('string');
    const [got] = await parseTextHere(text, [[0, text.length, 0]], out);
    expect(got).toBe(words.length);
  });
});
