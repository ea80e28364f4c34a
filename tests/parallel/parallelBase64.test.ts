/**
 * Parallel decoding of uncompressed base64 arrays: files loaded with 1, 2 and 3 text workers hold exactly the
 * bytes of the one-thread load (base64 is a fixed mapping, RFC 4648 §4), read by ranges from disk and whole
 * from memory, with windows small enough that every array spans many of them. Inputs: the committed sample
 * fields rewritten as inline base64 and as appended base64 .vtu, the same with line breaks inside the text
 * (decoded on one thread after the first batch fails, still the same arrays),
 * and external base64 files written by other programs (the vtu11 and vtkio libraries' test files). Bad text
 * is reported with the one-thread reader's message.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { decodeBase64Here } from '../../src/io/base64Windows.ts';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { readDataset } from '../../src/io/readDataset.ts';
import { writeVtu, type VtuEncoding } from '../../src/io/writeVtu.ts';
import { startTextPool, type TextPool } from '../../src/parallel/textPool.ts';
import { externalPath } from '../helpers/external.ts';
import { expectSameArrays } from '../helpers/sameArrays.ts';

const SAMPLES = resolve(__dirname, '../../sample-fields');
const dir = mkdtempSync(join(tmpdir(), 'fieldtally-b64-'));
const copies = new Map<string, Promise<string>>();

/** The text of one tag and what follows it, with a line break every 77 characters in an inline base64 array. */
function wrapInline(part: string): string {
  const close = part.indexOf('>');
  if (!part.startsWith('DataArray') || !part.slice(0, close).includes('format="binary"')) return part;
  const body = part.slice(close + 1), lines: string[] = [];
  for (let i = 0; i < body.length; i += 77) lines.push(body.slice(i, i + 77));
  return `${part.slice(0, close + 1)}${lines.join('\n')}`;
}

/** The sample field rewritten with `encoding` (line breaks in inline base64 text when `wrapped`), once. */
function copyOf(name: string, encoding: VtuEncoding, wrapped = false): Promise<string> {
  const key = `${name}.${encoding}.${wrapped}`;
  if (!copies.has(key)) {
    copies.set(key, loadDatasetFile(`${SAMPLES}/${name}`).then((d) => {
      const file = join(dir, `${key}.vtu`);
      let text = Buffer.from(writeVtu(d, { encoding })).toString('latin1');
      if (wrapped) text = text.split('<').map(wrapInline).join('<');
      writeFileSync(file, text, 'latin1');
      return file;
    }));
  }
  return copies.get(key)!;
}

const FILES: [string, () => Promise<string>][] = [
  ['sphere-stokes inline base64', () => copyOf('sphere-stokes.vtu', 'base64')],
  ['sphere-stokes appended base64', () => copyOf('sphere-stokes.vtu', 'appended-base64')],
  ['sphere-stokes inline base64 with line breaks', () => copyOf('sphere-stokes.vtu', 'base64', true)],
  ['pipe-wedge-core appended base64', () => copyOf('pipe-wedge-core.vtu', 'appended-base64')],
  ['pipe-wedge-core inline base64 with line breaks', () => copyOf('pipe-wedge-core.vtu', 'base64', true)],
  ['sphere-stokes-celldata inline base64', () => copyOf('sphere-stokes-celldata.vtu', 'base64')],
  ['vtu11 base64', async () => externalPath('vtu11/pyramids_3D/base64.vtu')],
  ['vtu11 appended base64', async () => externalPath('vtu11/pyramids_3D/base64appended.vtu')],
  ['vtkio inline binary', async () => externalPath('vtkio/hexahedron_inline_binary.vtu')],
  ['vtkio box', async () => externalPath('vtkio/box.vtu')],
];

const pools: TextPool[] = [];
afterAll(async () => {
  for (const p of pools) await p.close();
  rmSync(dir, { recursive: true, force: true });
});

describe.each([1, 2, 3])('loading with %i text worker(s)', (n) => {
  // 4 kB windows: every large array spans many windows and batches
  const pool = startTextPool(n, 4096);
  pools.push(pool);
  let failed = 0;
  const decodeBase64 = Object.assign(async (...a: Parameters<TextPool['decodeBase64']>) => {
    const got = await pool.decodeBase64(...a);
    failed += got.filter((g, j) => g !== a[1][j]![3]).length;
    return got;
  }, { workers: n, windowBytes: 4096 });

  it.each(FILES)('%s: every array byte for byte as the one-thread load, from disk and from memory', async (_name, make) => {
    const file = await make();
    const one = await loadDatasetFile(file);
    failed = 0;
    expectSameArrays(await loadDatasetFile(file, { decodeBase64 }), one);
    const bytes = new Uint8Array(readFileSync(file));
    expectSameArrays(await readDataset(file, bytes, { decodeBase64 }), one);
    // line breaks or padding inside an array's text send it back to one thread; other windows never fail
    if (_name.startsWith('sphere') && !_name.includes('line breaks')) expect(failed).toBe(0);
  });

  it.each(['base64', 'appended-base64'] as const)('the sample field in %s went through the workers', async (encoding) => {
    const before = pool.done.windows;
    await loadDatasetFile(await copyOf('sphere-stokes.vtu', encoding), { decodeBase64: pool.decodeBase64 });
    expect(pool.done.windows).toBeGreaterThan(before + 10);
  });
});

describe('bad base64 text', () => {
  const pool = startTextPool(2, 4096);
  pools.push(pool);

  it.each([
    ['an invalid character', (t: string) => t.replace(/(<DataArray[^>]*Name="p"[^>]*>\s*[A-Za-z0-9+/=]{5000})[A-Za-z0-9+/]/, '$1#')],
    ['text cut short', (t: string) => t.replace(/(<DataArray[^>]*Name="p"[^>]*>\s*[A-Za-z0-9+/=]{5000})[A-Za-z0-9+/=]+/, '$1')],
  ])('%s: the one-thread message', async (_what, spoil) => {
    const good = readFileSync(await copyOf('sphere-stokes.vtu', 'base64'), 'latin1');
    const bad = spoil(good);
    expect(bad).not.toBe(good);
    const file = join(dir, 'spoilt.vtu');
    writeFileSync(file, bad, 'latin1');
    const oneThread = await loadDatasetFile(file).then(() => 'loaded', (e: Error) => e.message);
    expect(oneThread).not.toBe('loaded');
    const threads = await loadDatasetFile(file, { decodeBase64: pool.decodeBase64 }).then(() => 'loaded', (e: Error) => e.message);
    expect(threads).toBe(oneThread);
  });
});

describe('decodeWindow', () => {
  it('decodes the RFC 4648 §10 test vectors and flags a window that holds fewer bytes', async () => {
    const text = new TextEncoder().encode('Zm9vYmFy Zm9vYg==');
    const out = new Uint8Array(16);
    expect(await decodeBase64Here(text, [[0, 8, 2, 6], [9, 17, 8, 4]], out)).toEqual([6, 4]);
    expect(Buffer.from(out.subarray(2, 12)).toString('latin1')).toBe('foobarfoob');
    expect(typeof (await decodeBase64Here(text, [[9, 17, 0, 6]], out))[0]).toBe('string');
  });
});
