/**
 * zlib-compressed files in the app (Debian's chromium, headless, cross-origin isolated): the compute worker
 * inflates each batch of blocks with a helper worker (workers/inflateHelpers.ts). A cut's integrals equal,
 * to the last bit, those of the same cut on the file as the Node loader reads it (node:zlib, an independent
 * zlib implementation of RFC 1950/1951); a block with a bad Adler-32 (RFC 1950 §2.2) and a garbled block give
 * the very message the one-thread reader gives, whichever thread inflated them. Screenshots go to
 * tests/.screenshots/ (git-ignored).
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import { bytesSource } from '../../src/io/byteSource.ts';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { readDatasetFrom } from '../../src/io/readDataset.ts';
import { REPO, waitIdle } from './browser.ts';
import { openAppForTests, pageTools } from './appPage.ts';

/** zlib, UInt64 headers, 32 kB blocks; Int64 connectivity (narrowed on reading) and Float64 points (read in place). */
const SPHERE = join(REPO, 'sample-fields/sphere-stokes.vtu');

let page: Page;
let dir = '';
const { shot, control, openFile, downloadText } = pageTools(() => page);

beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'fieldtally-zlibapp-')); });
openAppForTests((app) => { ({ page } = app); });
afterAll(() => { if (dir) rmSync(dir, { recursive: true, force: true }); });

/** Byte position in `bytes` of zlib block `k` of the appended array named `name` (UInt64 header words), and its length. */
function blockOf(bytes: Uint8Array, name: string, k: number): { at: number; length: number; blocks: number } {
  const head = Buffer.from(bytes.subarray(0, 8000)).toString('latin1');
  const offset = Number(new RegExp(`Name="${name}"[^>]*offset="(\\d+)"`).exec(head)![1]);
  const start = head.indexOf('_', head.indexOf('<AppendedData')) + 1 + offset;
  const v = new DataView(bytes.buffer, bytes.byteOffset);
  const word = (i: number) => Number(v.getBigUint64(start + 8 * i, true));
  const nb = word(0);
  let at = start + 8 * (3 + nb);
  for (let j = 0; j < k; j++) at += word(3 + j);
  return { at, length: word(3 + k), blocks: nb };
}

/** Opens a broken file in the app; the banner's text. */
async function openBad(path: string): Promise<string> {
  await page.setInputFiles('#file-input', path);
  await page.waitForSelector('.banner[data-kind=error]', { timeout: 60_000 });
  await waitIdle(page, 60_000);
  const text = await page.locator('.banner-text').innerText();
  await page.locator('.banner-close').click();
  return text;
}

/** The message of the one-thread reader (fflate, no batches) on these bytes. */
async function oneThreadMessage(name: string, bytes: Uint8Array): Promise<string> {
  return readDatasetFrom(bytesSource(name, bytes), {}).then(() => 'no error', (e: Error) => e.message);
}

async function setNumber(label: string, value: number): Promise<void> {
  const input = control(label).locator('input').last();
  await input.fill(String(value));
  await input.press('Enter');
  await waitIdle(page);
}

describe('zlib files in the app', () => {
  it('load through a helper worker, and a cut gives the Node loader\'s integrals to the bit', async () => {
    expect(await page.evaluate(() => crossOriginIsolated)).toBe(true);
    await openFile(SPHERE, 'sphere-stokes.vtu');
    // the helper worker was started for the load's batches
    expect(page.workers().map((w) => w.url()).some((u) => /inflate/.test(u))).toBe(true);
    await page.locator('.lil-name', { hasText: /^\+ new cut-plane$/ }).click();
    await page.waitForSelector('[data-pin="plane-1"] [data-quantity="volumeFlowRate"]');
    for (const [k, v] of [['origin x [m]', 0.0005], ['origin y [m]', 0], ['origin z [m]', 0], ['normal x', 1], ['normal y', 0], ['normal z', 0]] as const) await setNumber(k, v);
    await shot('zlib-load-sphere-cut');
    const csv = await downloadText(() => page.getByText('save results (CSV)').click());
    // rows end with quantity,label,value,unit (the definition before them is quoted and holds commas)
    const value = (key: string) => {
      const f = csv.split('\n').map((l) => l.split(',')).find((r) => r[0] === 'Plane 1' && r.at(-4) === key);
      if (!f) throw new Error(`no ${key} row in the results CSV:\n${csv}`);
      return Number(f.at(-2));
    };
    const node = integratePlane(await loadDatasetFile(SPHERE), { origin: [0.0005, 0, 0], normal: [1, 0, 0] }).integrals;
    expect(node.area).toBeGreaterThan(0);
    expect(value('area')).toBe(node.area);
    expect(value('volumeFlowRate')).toBe(node.volumeFlowRate);
  });

  it('a block with a bad Adler-32 and a garbled block: the one-thread reader\'s message, in one line', async () => {
    const bytes = new Uint8Array(readFileSync(SPHERE));
    // the Adler-32 of a connectivity block near the end of the array (the helper's run of the batch)
    const c = blockOf(bytes, 'connectivity', 0);
    const late = blockOf(bytes, 'connectivity', c.blocks - 2);
    const badSum = bytes.slice();
    badSum[late.at + late.length - 1] ^= 0x01;
    const sumPath = join(dir, 'bad-checksum.vtu');
    writeFileSync(sumPath, badSum);
    const sumWant = await oneThreadMessage('bad-checksum.vtu', badSum);
    expect(sumWant).toMatch(new RegExp(`DataArray "connectivity": zlib block ${c.blocks - 2} of ${c.blocks} is corrupt \\(the Adler-32 checksum does not match the inflated data\\)$`));
    expect(await openBad(sumPath)).toBe(`Could not open the file: ${sumWant}`);

    // a garbled second block of the points (this thread's run, inflated in place)
    const p = blockOf(bytes, 'Points', 1);
    const garbled = bytes.slice();
    for (let i = 20; i < 84; i++) garbled[p.at + i] ^= 0x5a;
    const garbledPath = join(dir, 'garbled.vtu');
    writeFileSync(garbledPath, garbled);
    const garbledWant = await oneThreadMessage('garbled.vtu', garbled);
    expect(garbledWant).toMatch(/^garbled\.vtu: .*DataArray "Points": zlib block 1 of \d+ (is corrupt|inflates to \d+ bytes)/);
    const text = await openBad(garbledPath);
    await shot('zlib-load-garbled-block');
    expect(text).toBe(`Could not open the file: ${garbledWant}`);
    expect(text.split('\n').length).toBe(1);
  });
});
