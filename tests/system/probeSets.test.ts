/**
 * Probe sets in the viewer (Debian's chromium, headless): a set file opened through the panel places its
 * probes (editable ones in the view's tools, the others evaluated as a set) with the command line's
 * numbers; the set saved again holds the same probes; it is kept in local storage and restored after a
 * reload; a corrupt stored set is reported and kept aside; a malformed file is refused and changes
 * nothing; opening another result file re-evaluates every probe; a kept baseline is compared with the
 * next file; the report .zip holds the command line's numbers. No request may leave localhost.
 * Screenshots of each state go to tests/.screenshots/ (git-ignored).
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { unzipSync } from 'fflate';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseFormatted } from '../../src/ui/format.ts';
import { REPO, waitIdle, type Browser } from './browser.ts';
import { SCREENSHOTS, openAppForTests, pageTools } from './appPage.ts';
import { countColor, readPng } from './png.ts';

const MEDIUM = join(REPO, 'sample-fields/pipe-medium.vtu');
const FINE = join(REPO, 'sample-fields/pipe-fine.vtu');
const FIXTURE = join(REPO, 'tests/study/fixtures/pipe-stations.v2.json');
const STORE_KEY = 'fieldtally.probe-set';
const PIN_RGB: [number, number, number] = [0x1d, 0x4e, 0xd8];

let tmp = '';
let browser: Browser;
let page: Page;
const { shot, openFile, downloadBytes: downloadOf } = pageTools(() => page);

const cli = (...args: string[]) => execFileSync(process.execPath, [join(REPO, 'bin/fieldtally.mjs'), ...args], { cwd: REPO, encoding: 'utf8' });
const sig4 = (x: number) => Number(x.toPrecision(4));

async function pin(id: string, quantity: string): Promise<number> {
  return parseFormatted((await page.locator(`[data-pin="${id}"] [data-quantity="${quantity}"]`).innerText()).split('=')[1]!);
}
async function tableValue(id: string, quantity: string): Promise<number> {
  return parseFormatted((await page.locator(`table.results:not(.comparison) tr[data-probe="${id}"][data-quantity="${quantity}"] td.num`).innerText()));
}
const probeIds = () => page.locator('table.results:not(.comparison) tr.probe-head').evaluateAll((rows) => rows.map((r) => (r as HTMLElement).dataset['probe']!));
async function settle(): Promise<void> {
  await waitIdle(page);
  // the set is stored a moment after the last change
  await page.waitForTimeout(400);
  await waitIdle(page);
}
const button = (label: string) => page.locator('.lil-controller button', { hasText: label });

/** The command line's evaluation of the fixture on a file (results.json of a report without pictures). */
function cliResults(file: string): { id: string; ok: boolean; quantities: { key: string; value: number }[] }[] {
  const out = join(tmp, `cli-${file.split('/').pop()}`);
  try { cli('report', file, '--probes', FIXTURE, '--out', out, '--no-pictures'); } catch { /* exit code 3 is fine here */ }
  return (JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as { files: { probes: never[] }[] }).files[0]!.probes;
}
const cliValue = (r: ReturnType<typeof cliResults>, id: string, key: string) => r.find((p) => p.id === id)!.quantities.find((q) => q.key === key)!.value;

beforeAll(async () => {
  tmp = mkdtempSync(join(tmpdir(), 'fieldtally-sets-'));
}, 240_000);
openAppForTests((app) => { ({ browser, page } = app); });
afterAll(async () => {
  if (tmp) rmSync(tmp, { recursive: true, force: true });
});

describe('probe sets in the viewer', () => {
  it('opens a probe-set file: every probe appears with the command line\'s numbers', async () => {
    await openFile(MEDIUM, 'pipe-medium.vtu');
    await page.setInputFiles('#probe-set-input', FIXTURE);
    await page.waitForSelector('.banner[data-kind=notice]');
    await settle();
    expect(await page.locator('.banner-text').innerText()).toMatch(/^Opened the probe set "Coolant pipe stations" from pipe-stations\.v2\.json: 8 probes; \d+ evaluated as a set/);
    expect((await probeIds()).sort()).toEqual(['balance', 'centre', 'core', 'diameter', 'inlet-face', 'loss', 'mid', 'wall-normal']);
    const cliMedium = cliResults(MEDIUM);
    // an editable plane (computed by the view's tool) and probes evaluated as a set agree with the command line
    expect(await pin('mid', 'massFlowRate')).toBe(sig4(cliValue(cliMedium, 'mid', 'massFlowRate')));
    expect(await tableValue('mid', 'volumeFlowRate')).toBe(sig4(cliValue(cliMedium, 'mid', 'volumeFlowRate')));
    expect(await tableValue('core', 'volumeFlowRate')).toBe(sig4(cliValue(cliMedium, 'core', 'volumeFlowRate')));
    expect(await tableValue('centre', 'p')).toBe(sig4(cliValue(cliMedium, 'centre', 'p')));
    expect(await tableValue('loss', 'lossCoefficient')).toBe(sig4(cliValue(cliMedium, 'loss', 'lossCoefficient')));
    // Reference: Hagen–Poiseuille, docs/references.md §1 (C): ṁ = ρπR²V; the faceted medium mesh under-fills the circle by 1.14 %
    const exact = 998.207 * Math.PI * 0.01 ** 2 * 0.05;
    expect(Math.abs(await pin('mid', 'massFlowRate') - exact) / exact).toBeLessThan(0.02);
    await shot('10-probe-set-opened');
  });

  it('saves the set: the file holds the same probes and opens again to the same numbers', async () => {
    const saved = JSON.parse(new TextDecoder().decode(await downloadOf(() => button('save probe set (JSON)').click()))) as { version: number; title: string; probes: unknown[]; reference: Record<string, unknown> };
    const original = JSON.parse(readFileSync(FIXTURE, 'utf8')) as { probes: unknown[]; reference: Record<string, unknown> };
    expect(saved.version).toBe(2);
    expect(saved.title).toBe('Coolant pipe stations');
    // a plane's density equal to the reference density is no override of it: the app writes it as the reference's
    const asReference = (original.probes as { kind: string; fields?: { density?: number } }[]).map((p) => {
      if (p.kind !== 'cut-plane' || p.fields?.density !== 998.207) return p;
      const { density: _d, ...fields } = p.fields;
      void _d;
      return { ...p, fields };
    });
    expect(saved.probes).toEqual(asReference);
    expect(saved.reference).toMatchObject(original.reference);
    const before = await pin('mid', 'massFlowRate');
    const again = join(tmp, 'saved.json');
    writeFileSync(again, JSON.stringify(saved));
    await page.setInputFiles('#probe-set-input', again);
    await settle();
    expect(await pin('mid', 'massFlowRate')).toBe(before);
    expect((await probeIds()).length).toBe(8);
  });

  it('refuses a malformed probe-set file with its error and changes nothing', async () => {
    const before = await probeIds();
    const bad = join(tmp, 'broken-set.json');
    writeFileSync(bad, JSON.stringify({ format: 'fieldtally-probe-set', version: 2, probes: [{ id: 'x', kind: 'cut-plane', geometry: { origin: [0, 0, 0.05], normal: [0, 0, 0] } }] }));
    await page.setInputFiles('#probe-set-input', bad);
    await page.waitForSelector('.banner[data-kind=error]');
    expect(await page.locator('.banner-text').innerText()).toBe('Could not open the probe set: broken-set.json: probes[0].geometry.normal: expected a non-zero vector, found [0,0,0]');
    await shot('11-probe-set-refused');
    await page.locator('.banner-close').click();
    const newer = join(tmp, 'newer.json');
    writeFileSync(newer, JSON.stringify({ format: 'fieldtally-probe-set', version: 7, probes: [] }));
    await page.setInputFiles('#probe-set-input', newer);
    await page.waitForSelector('.banner[data-kind=error]');
    expect(await page.locator('.banner-text').innerText()).toMatch(/version 7 is newer — update fieldtally/);
    await page.locator('.banner-close').click();
    await settle();
    expect(await probeIds()).toEqual(before);
  });

  it('opening another result file re-evaluates every probe on it', async () => {
    await openFile(FINE, 'pipe-fine.vtu');
    await settle();
    expect((await probeIds()).length).toBe(8);
    const cliFine = cliResults(FINE);
    expect(await pin('mid', 'massFlowRate')).toBe(sig4(cliValue(cliFine, 'mid', 'massFlowRate')));
    expect(await tableValue('core', 'volumeFlowRate')).toBe(sig4(cliValue(cliFine, 'core', 'volumeFlowRate')));
    expect(await tableValue('diameter', 'coveredLength')).toBe(sig4(cliValue(cliFine, 'diameter', 'coveredLength')));
    await shot('12-probe-set-on-fine-mesh');
  });

  it('keeps a baseline and compares the next file with it, side by side', async () => {
    await button('keep results as baseline').click();
    await page.waitForFunction(() => document.body.dataset['baseline'] === 'pipe-fine.vtu');
    await openFile(MEDIUM, 'pipe-medium.vtu');
    await page.waitForFunction(() => document.body.dataset['compared'] === 'pipe-medium.vtu');
    await waitIdle(page);
    const cmp = JSON.parse(cli('compare', FINE, MEDIUM, '--probes', FIXTURE, '--json').split('\n').filter((l) => !l.startsWith('fieldtally')).join('\n')) as { rows: { probe: string; key: string; baseline: number; variant: number; difference: number }[] };
    const want = cmp.rows.find((r) => r.probe === 'mid' && r.key === 'massFlowRate')!;
    const row = page.locator('table.comparison tr[data-probe="mid"][data-quantity="massFlowRate"]');
    const got = await row.locator('td[data-value]').evaluateAll((tds) => Object.fromEntries(tds.map((t) => [(t as HTMLElement).dataset['column'], Number((t as HTMLElement).dataset['value'])])));
    expect(got).toEqual({ baseline: want.baseline, variant: want.variant, difference: want.difference });
    expect(await row.locator('td[data-column=relative]').innerText()).toMatch(/^-0\.90 %$/);
    expect(await page.locator('#compare-pane .pane-head span').innerText()).toBe('Comparison: pipe-medium.vtu vs baseline pipe-fine.vtu');
    // the table fits its pane: no sideways scrolling
    const fit = await page.locator('#compare-pane .results-body').evaluate((el) => ({ scroll: el.scrollWidth, client: el.clientWidth }));
    expect(fit.scroll).toBeLessThanOrEqual(fit.client);
    // equal pressures on both meshes differ by rounding only: the difference is kept and marked
    const same = page.locator('table.comparison tr[data-probe="mid"][data-quantity="staticPressure.areaMean"]');
    expect(await same.locator('td[data-column=difference]').innerText()).toMatch(/^-?\d\.\d\d×10⁻[¹²³⁴⁵⁶⁷⁸⁹⁰]+ ≈ 0$/);
    await shot('13-baseline-comparison');
    await page.locator('.clear-baseline').click();
    expect(await page.locator('#compare-pane').isHidden()).toBe(true);
  });

  it('saves the report as a .zip holding the command line\'s numbers, the view with its pins and the inputs', async () => {
    await settle();
    const zip = unzipSync(await downloadOf(() => button('save report (.zip)').click()));
    const names = Object.keys(zip).sort();
    // the line probe the view holds brings its samples and a profile picture per field
    expect(names).toEqual(['pipe-medium-report/diameter-p.svg', 'pipe-medium-report/diameter-samples.csv', 'pipe-medium-report/diameter-velocity.svg',
      'pipe-medium-report/probe-set.json', 'pipe-medium-report/report.html', 'pipe-medium-report/results-long.csv',
      'pipe-medium-report/results.csv', 'pipe-medium-report/results.json', 'pipe-medium-report/view-1.png']);
    const res = JSON.parse(new TextDecoder().decode(zip['pipe-medium-report/results.json'])) as { version: string; inputs: { name: string; sha256: string }[]; files: { probes: ReturnType<typeof cliResults> }[] };
    const cliMedium = cliResults(MEDIUM);
    for (const [id, key] of [['mid', 'massFlowRate'], ['core', 'volumeFlowRate'], ['centre', 'p'], ['loss', 'totalPressureLoss'], ['diameter', 'p.mean']] as const) {
      expect(res.files[0]!.probes.find((p) => p.id === id)!.quantities.find((q) => q.key === key)!.value, `${id}.${key}`).toBe(cliValue(cliMedium, id, key));
    }
    expect(res.version).toBe((JSON.parse(readFileSync(join(REPO, 'package.json'), 'utf8')) as { version: string }).version);
    expect(res.inputs[0]!.name).toBe('pipe-medium.vtu');
    expect(res.inputs[0]!.sha256).toBe(execFileSync('sha256sum', [MEDIUM], { encoding: 'utf8' }).split(' ')[0]);
    const html = new TextDecoder().decode(zip['pipe-medium-report/report.html']);
    expect(html).toMatch(/Caution:<\/strong> These numbers are only as good as the simulation/);
    const png = readPng(zip['pipe-medium-report/view-1.png']!);
    expect(countColor(png, PIN_RGB, 10)).toBeGreaterThan(400);
    writeFileSync(join(SCREENSHOTS, '14-report-picture-from-app.png'), zip['pipe-medium-report/view-1.png']!);
  });

  it('keeps the set in local storage and restores it after a reload; nothing is lost', async () => {
    const kept = await page.evaluate((k) => localStorage.getItem(k), STORE_KEY);
    const stored = JSON.parse(kept!) as { file: string; set: { probes: { id: string }[] } };
    expect(stored.set.probes.map((p) => p.id)).toEqual(['mid', 'core', 'diameter', 'wall-normal', 'centre', 'inlet-face', 'loss', 'balance']);
    expect(stored.file).toBe('pipe-medium.vtu');
    await page.reload();
    await waitIdle(page, 90_000);
    await page.waitForSelector('.banner[data-kind=notice]');
    expect(await page.locator('.banner-text').innerText()).toBe('Restored the probe set kept from your last visit: 8 probes (last used on pipe-medium.vtu).');
    // the bundled sphere opened; the pipe's probes are kept (and flagged where they miss this file)
    expect((await probeIds()).length).toBe(8);
    await shot('15-restored-after-reload');
    await openFile(MEDIUM, 'pipe-medium.vtu');
    await settle();
    expect(await pin('mid', 'massFlowRate')).toBe(sig4(cliValue(cliResults(MEDIUM), 'mid', 'massFlowRate')));
  });

  it('a probe made just before the page goes away is kept (stored on leaving, not only after the quiet moment)', async () => {
    await page.locator('.lil-name', { hasText: /^\+ new cut-plane$/ }).click();
    await page.waitForFunction(() => document.querySelectorAll('table.results:not(.comparison) tr.probe-head').length === 9);
    // at once: no waiting for the quiet moment after the change
    await page.reload();
    await waitIdle(page, 90_000);
    await page.waitForSelector('.banner[data-kind=notice]');
    expect(await page.locator('.banner-text').innerText()).toMatch(/^Restored the probe set kept from your last visit: 9 probes/);
    expect((await probeIds()).length).toBe(9);
  });

  it('a stored set that cannot be read is reported and kept aside, not dropped', async () => {
    // the restored set is stored again after its quiet moment (or on leaving): let that happen before spoiling it
    await settle();
    await page.evaluate((k) => localStorage.setItem(k, '{"savedAt": "x", "set": {"format": "fieldtally-probe-set", "version": 2, "probes": [{"id": 5}]}}'), STORE_KEY);
    await page.reload();
    await waitIdle(page, 90_000);
    await page.waitForSelector('.banner[data-kind=error]');
    const text = await page.locator('.banner-text').innerText();
    expect(text).toMatch(/^The probe set kept from your last visit could not be read \(stored probe set: probes\[0\]\.kind: expected one of "cut-plane", .*\)\. Its text was kept aside/);
    const aside = /kept aside in this browser's storage under "([^"]+)"/.exec(text)![1]!;
    expect(await page.evaluate((k) => localStorage.getItem(k), aside)).toBe('{"savedAt": "x", "set": {"format": "fieldtally-probe-set", "version": 2, "probes": [{"id": 5}]}}');
    expect(await probeIds()).toEqual([]);
    await shot('16-corrupt-stored-set');
  });

  it('made no request beyond localhost and logged no error', () => {
    expect(browser.blocked).toEqual([]);
    expect(browser.errors).toEqual([]);
  });
});
