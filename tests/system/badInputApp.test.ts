/**
 * Bad input in the app (Debian's chromium, headless), through the same readers as the command line: a
 * file that declares far more points than it holds, a file nested a million elements deep, and a probe
 * set in local storage that nests too deeply. Each shows one clear line in the banner and leaves the
 * open field as it was (its name and its surfaces). Screenshots go to tests/.screenshots/ (git-ignored).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { STORE_KEY } from '../../src/app/probeSetStore.ts';
import { waitIdle, type Browser } from './browser.ts';
import { openAppForTests, pageTools } from './appPage.ts';

let browser: Browser;
let page: Page;
const { shot } = pageTools(() => page);
let dir = '';

const summary = () => page.locator('#file-summary').innerText();

/** Chooses `path` in the file input and waits for the error banner; returns its text. */
async function openBad(path: string): Promise<string> {
  await page.setInputFiles('#file-input', path);
  await page.waitForSelector('.banner[data-kind=error]', { timeout: 60_000 });
  await waitIdle(page, 60_000);
  return page.locator('.banner-text').innerText();
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-badapp-'));
}, 600_000);
openAppForTests((app) => { ({ browser, page } = app); }, 600_000);
afterAll(async () => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('bad input in the app', () => {
  it('a file declaring 99,999,999,999 points: one clear line, the open field untouched', async () => {
    const before = await summary();
    const path = join(dir, 'huge-declared.vtu');
    writeFileSync(path, `<?xml version="1.0"?>
<VTKFile type="UnstructuredGrid" byte_order="LittleEndian" header_type="UInt64">
  <UnstructuredGrid><Piece NumberOfPoints="99999999999" NumberOfCells="0">
    <Points><DataArray type="Float64" NumberOfComponents="3" format="ascii">0 0 0 1 1 1</DataArray></Points>
  </Piece></UnstructuredGrid>
</VTKFile>
`);
    const text = await openBad(path);
    await shot('bad-input-huge-declared');
    expect(text).toMatch(/^Could not open the file: huge-declared\.vtu: piece 0: .*99999999999/);
    expect(text.split('\n').length).toBe(1);
    expect(await summary()).toBe(before);
    await page.locator('.banner-close').click();
  });

  it('a file nested a million elements deep: refused at the depth limit, the open field untouched', async () => {
    const before = await summary();
    const path = join(dir, 'deep.vtu');
    writeFileSync(path, '<VTKFile type="UnstructuredGrid">' + '<a>'.repeat(1_000_000));
    const text = await openBad(path);
    await shot('bad-input-deep');
    expect(text).toMatch(/^Could not open the file: deep\.vtu: elements nested more than 256 deep at byte \d+ \(<a>\); a VTK file nests far less$/);
    expect(await summary()).toBe(before);
    await page.locator('.banner-close').click();
  });

  it('a probe set in local storage nested too deeply: said so after a reload, kept aside, the field opens', async () => {
    const before = await summary();
    await page.evaluate(([key, text]) => localStorage.setItem(key!, text!), [STORE_KEY, `{"savedAt":"2026-01-01","file":null,"set":${'['.repeat(200_000)}${']'.repeat(200_000)}}`]);
    await page.reload();
    await waitIdle(page, 90_000);
    await page.waitForSelector('.banner[data-kind=error]', { timeout: 30_000 });
    await shot('bad-input-stored-probe-set');
    const text = await page.locator('.banner-text').innerText();
    expect(text).toMatch(/^The probe set kept from your last visit could not be read \(the stored text nests deeper than 64 levels, more than any probe set\)\. Its text was kept aside in this browser's storage under "fieldtally\.probe-set\.unreadable\.[^"]+"; the probes start empty\.$/);
    // the reload opens the bundled field again: the same field, read anew (the time differs)
    expect((await summary()).replace(/ read in .*$/, '')).toBe(before.replace(/ read in .*$/, ''));
    const keys = await page.evaluate(() => Object.keys(localStorage));
    expect(keys.some((k) => k.startsWith('fieldtally.probe-set.unreadable.'))).toBe(true);
  });

  it('made no request beyond localhost and logged no page error', () => {
    expect(browser.blocked).toEqual([]);
    expect(browser.errors.filter((e) => !/Failed to load resource/.test(e))).toEqual([]);
  });
});
