/**
 * The command line's report folder opened in Debian's chromium straight from disk (file://), with every
 * request that is not for a local file blocked and counted: there must be none, the pictures must show,
 * and the numbers on the page must equal the command line's `cut` and `force` JSON on the same files.
 * Screenshots go to tests/.screenshots/ (git-ignored).
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sphereExact } from '../../src/samples/sphere.ts';
import { REPO, launch, type Browser } from './browser.ts';

const SHOTS = join(REPO, 'tests/.screenshots');
const PIPE = join(REPO, 'sample-fields/pipe-medium.vtu');
const SPHERE = join(REPO, 'sample-fields/sphere-stokes-celldata.vtu');
const stokes = sphereExact({ flow: 'stokes' });

const cli = (...args: string[]): { code: number; out: string } => {
  try {
    return { code: 0, out: execFileSync(process.execPath, [join(REPO, 'bin/fieldtally.mjs'), ...args], { cwd: REPO, encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] }) };
  } catch (e) {
    const x = e as { status: number; stdout: string };
    return { code: x.status, out: x.stdout };
  }
};
/** 6 significant figures as the report prints them (src/study/resultTables.ts sig6). */
const sig6 = (v: number) => (v === 0 ? '0' : Math.abs(v) >= 1e-3 && Math.abs(v) < 1e6 ? String(Number(v.toPrecision(6))) : v.toExponential(5));

let dir = '', browser: Browser;
/** Requests that were not for a file on disk (blocked). */
const offFile: string[] = [];
const seen: string[] = [];

beforeAll(async () => {
  mkdirSync(SHOTS, { recursive: true });
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-report-page-'));
  writeFileSync(join(dir, 'set.json'), JSON.stringify({
    format: 'fieldtally-probe-set', version: 2, title: 'Pipe and bead',
    reference: { density: stokes.rho, speed: stokes.U, area: stokes.frontalArea },
    probes: [
      { id: 'mid', kind: 'cut-plane', label: 'Mid station', geometry: { origin: [0, 0, 0.05], normal: [0, 0, 1] }, fields: { density: 998.207 } },
      { id: 'centre', kind: 'point', label: 'Centre', geometry: { at: [0, 0, 0.03] } },
      { id: 'bead', kind: 'force', label: 'Bead drag', geometry: { surfaces: ['group 1'] } },
    ],
  }));
  const r = cli('report', PIPE, SPHERE, '--probes', join(dir, 'set.json'), '--out', join(dir, 'report'), '--width', '900', '--height', '560');
  // the pipe has no "group 1" and the plane misses the sphere's mesh: flagged, exit code 3
  expect(r.code).toBe(3);
  browser = await launch({ width: 1280, height: 900 });
  await browser.page.route('**/*', (route) => {
    const u = route.request().url();
    if (u.startsWith('file:') || u.startsWith('data:')) return route.continue();
    offFile.push(u);
    return route.abort('blockedbyclient');
  });
  browser.page.on('request', (q) => seen.push(q.url()));
}, 240_000);

afterAll(async () => {
  await browser?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('report.html from the command line', () => {
  it('opens offline from disk: no request leaves the folder, every picture shows', async () => {
    const page = browser.page;
    await page.goto(pathToFileURL(join(dir, 'report/report.html')).href);
    await page.waitForLoadState('load');
    const images = await page.evaluate(() => [...document.images].map((i) => ({ w: i.naturalWidth, complete: i.complete, src: i.src.slice(0, 22) })));
    expect(images).toHaveLength(2);
    for (const i of images) { expect(i.complete).toBe(true); expect(i.w).toBe(900); expect(i.src).toBe('data:image/png;base64,'); }
    // pins and legend are SVG over each picture
    expect(await page.locator('.picture svg g.pin').count()).toBeGreaterThanOrEqual(3);
    expect(await page.locator('.picture svg g.legend').count()).toBe(2);
    await page.screenshot({ path: join(SHOTS, 'report-01-page-top.png') });
    await page.locator('h2', { hasText: 'Summary' }).scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(SHOTS, 'report-02-summary.png') });
    await page.locator('h2', { hasText: 'Inputs' }).scrollIntoViewIfNeeded();
    await page.screenshot({ path: join(SHOTS, 'report-03-inputs.png') });
    expect(offFile).toEqual([]);
    expect(seen.every((u) => u.startsWith('file:') || u.startsWith('data:'))).toBe(true);
    expect(browser.errors).toEqual([]);
  });

  it('its numbers equal the command line\'s cut and force JSON', async () => {
    const page = browser.page;
    const cells = await page.locator('section.probe td[data-quantity]').evaluateAll((tds) => tds.map((td) => ({
      file: td.getAttribute('data-file')!, probe: td.getAttribute('data-probe')!, key: td.getAttribute('data-quantity')!,
      value: Number(td.getAttribute('data-value')), text: td.textContent!,
    })));
    const cell = (file: string, probe: string, key: string) => cells.find((c) => c.file.endsWith(file) && c.probe === probe && c.key === key)!;
    const cut = JSON.parse(cli('cut', PIPE, '--origin', '0,0,0.05', '--normal', '0,0,1', '--rho', '998.207', '--json').out);
    for (const [key, v] of [['area', cut.area], ['volumeFlowRate', cut.volumeFlowRate], ['massFlowRate', cut.massFlowRate], ['totalPressure.massFlowMean', cut.totalPressure.massFlowMean]] as const) {
      const c = cell('pipe-medium.vtu', 'mid', key);
      expect(Number(c.value.toPrecision(12)), key).toBe(v);
      expect(c.text, key).toBe(sig6(v));
    }
    const force = JSON.parse(cli('force', SPHERE, '--groups', 'group 1', '--rho', String(stokes.rho), '--speed', String(stokes.U), '--area', String(stokes.frontalArea), '--json').out);
    expect(cell('sphere-stokes-celldata.vtu', 'bead', 'CD').value).toBe(force.coefficients.drag);
    expect(cell('sphere-stokes-celldata.vtu', 'bead', 'CD').text).toBe(sig6(force.coefficients.drag));
    expect(cell('sphere-stokes-celldata.vtu', 'bead', 'force.drag').value).toBe(force.components.total.drag);
    const point = JSON.parse(cli('point', PIPE, '--at', '0,0,0.03', '--json').out);
    expect(cell('pipe-medium.vtu', 'centre', 'p').value).toBe(point.points[0].values.p);
    // failures are flagged on the page, not shown as numbers
    expect(await page.locator('[data-failed="bead"]').innerText()).toMatch(/^FAILED on pipe-medium\.vtu: no surface group "group 1"/);
    expect(await page.locator('[data-failed="mid"]').innerText()).toMatch(/^FAILED on sphere-stokes-celldata\.vtu: cut-plane: the plane misses/);
    expect(cells.some((c) => c.file.endsWith('sphere-stokes-celldata.vtu') && c.probe === 'mid')).toBe(false);
    // the summary has one row per file; the caution opens and closes the page
    expect(await page.locator('table.summary tr[data-row-file]').count()).toBe(2);
    expect(await page.locator('p.caution').count()).toBe(2);
    expect(await page.locator('#caution').innerText()).toMatch(/licensed professional/);
  });
});
