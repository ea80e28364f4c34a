/**
 * Loading a large file in the viewer (Debian's chromium, headless): the progress bar names the stage and
 * the bytes read; Cancel mid-load keeps the file that was open (its name, its surfaces, its dataset in the
 * worker) and says so; a file larger than the memory the page may use is announced first, and the answer
 * is obeyed (no: nothing changes; yes: it loads). No request may leave localhost. Screenshots go to
 * tests/.screenshots/ (git-ignored).
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { beforeAll, describe, expect, it } from 'vitest';
import { MEMORY_PER_FILE_BYTE } from '../../src/app/fileChoice.ts';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { REPO, longTasksSince, pageNow, waitIdle, type Browser } from './browser.ts';
import { openAppForTests, pageTools } from './appPage.ts';
import { RunQueueWatch } from './runQueue.ts';

const PIPE = join(REPO, 'sample-fields/pipe-medium.vtu');
/** About a million hexahedra, zlib-compressed (src/samples/makeFields.ts --large writes it). */
const LARGE = join(REPO, 'sample-fields/large/pipe-hex-1M.appended-zlib.vtu');
const LARGE_NAME = 'pipe-hex-1M.appended-zlib.vtu';
/** The view's background (src/view/viewScene.ts BACKGROUND, #f5f6f8). */
const BACKGROUND: [number, number, number] = [0xf5, 0xf6, 0xf8];

let browser: Browser;
let page: Page;
const { shot, openFile: chooseFile } = pageTools(() => page);
const openFile = (path: string, name: string) => chooseFile(path, name, 90_000);

const summary = () => page.locator('#file-summary').innerText();

/** Pixels of the view that are not background: the drawn surfaces (the view is a 2D canvas in software rendering). */
async function drawnPixels(): Promise<number> {
  return page.evaluate((bg) => {
    const c = document.getElementById('view-canvas') as HTMLCanvasElement;
    const ctx = c.getContext('2d');
    if (!ctx) throw new Error('the view canvas has no 2D context (not software rendering)');
    const d = ctx.getImageData(0, 0, c.width, c.height).data;
    let n = 0;
    for (let i = 0; i < d.length; i += 4) if (Math.abs(d[i]! - bg[0]) + Math.abs(d[i + 1]! - bg[1]) + Math.abs(d[i + 2]! - bg[2]) > 24) n++;
    return n;
  }, BACKGROUND);
}

/** Starts recording every text the progress bar shows (and when it hides) into `window.__progress`. */
async function recordProgress(): Promise<void> {
  await page.evaluate(() => {
    const w = window as unknown as { __progress: string[] };
    w.__progress = [];
    const bar = document.querySelector('.progress') as HTMLElement;
    new MutationObserver(() => w.__progress.push(bar.hidden ? '(hidden)' : bar.querySelector('.progress-label')!.textContent!))
      .observe(bar, { subtree: true, childList: true, characterData: true, attributes: true });
  });
}
const recorded = () => page.evaluate(() => (window as unknown as { __progress: string[] }).__progress);
/** "12.3 MB" → bytes (as src/ui/format.ts formatBytes writes them, 3 significant figures). */
const bytesOf = (t: string) => { const [v, u] = t.split(' '); return Number(v) * ({ B: 1, kB: 1e3, MB: 1e6, GB: 1e9 } as Record<string, number>)[u!]!; };

/** Waits until the progress bar shows some bytes of the large file read; returns its text. */
async function progressWithBytes(): Promise<string> {
  const h = await page.waitForFunction(() => {
    const bar = document.querySelector('.progress') as HTMLElement | null;
    const t = bar && !bar.hidden ? bar.querySelector('.progress-label')!.textContent! : '';
    return /[1-9][\d.]* [kMG]B of /.test(t) ? t : false;
  }, undefined, { timeout: 60_000, polling: 20 });
  return (await h.jsonValue()) as string;
}

beforeAll(async () => {
  if (!existsSync(LARGE)) execFileSync(process.execPath, [join(REPO, 'bin/run-ts.mjs'), 'src/samples/makeFields.ts', '--large', '--missing'], { cwd: REPO, stdio: 'ignore' });
}, 600_000);
openAppForTests((app) => { ({ browser, page } = app); }, 600_000);

describe('loading a large file', () => {
  it('the progress bar names each stage and the bytes read, which only grow; no main-thread task over 100 ms', async () => {
    await openFile(PIPE, 'pipe-medium.vtu');
    await recordProgress();
    const t0 = await pageNow(page);
    const cpuWaits = new RunQueueWatch();
    await page.setInputFiles('#file-input', LARGE);
    const text = await progressWithBytes();
    await shot('20-large-load-progress');
    // e.g. "inflating — 5.20 MB of 22.4 MB"
    expect(text).toMatch(/^[a-z][a-z ]+[a-z] — \d[\d.]* [kMG]?B of 22\.4 MB$/);
    await page.waitForFunction((n) => document.getElementById('file-summary')!.textContent!.startsWith(n), LARGE_NAME, { timeout: 90_000 });
    await waitIdle(page, 90_000);
    expect(await summary()).toMatch(/— 1,001,472 cells, 1,025,799 points/);
    expect(await page.locator('.progress').isHidden()).toBe(true);
    expect(await drawnPixels()).toBeGreaterThan(20_000);
    await shot('21-large-loaded');
    const seen = (await recorded()).filter((t, i, all) => t !== all[i - 1]);
    const stages = [...new Set(seen.map((t) => t.split(' — ')[0]!))];
    expect(stages[0]).toBe('starting');
    expect(stages.slice(-3)).toEqual(['finding boundary surfaces', 'drawing the surfaces', '(hidden)']);
    const bytes = seen.filter((t) => / of /.test(t)).map((t) => bytesOf(/— (.*) of /.exec(t)![1]!));
    expect(bytes.length).toBeGreaterThan(3);
    for (let i = 1; i < bytes.length; i++) expect(bytes[i]!, seen.join('\n')).toBeGreaterThanOrEqual(bytes[i - 1]!);
    expect(bytes.at(-1)).toBe(22.4e6);
    // the page stays responsive: reading is in the worker, the surface is uploaded part by part
    // (a task counts by the time it held the main thread: waiting for a CPU inside it is not counted, runQueue.ts)
    cpuWaits.stop();
    expect(cpuWaits.heldOver(await longTasksSince(page, t0), await page.evaluate(() => performance.timeOrigin), 100)).toEqual([]);
  });

  it('Cancel mid-load keeps the open file, its surfaces and its dataset, and says so', async () => {
    await openFile(PIPE, 'pipe-medium.vtu');
    const before = await drawnPixels();
    expect(before).toBeGreaterThan(20_000);
    await page.setInputFiles('#file-input', LARGE);
    await progressWithBytes();
    await page.locator('.progress-cancel').click();
    await page.waitForSelector('.banner[data-kind=notice]');
    expect(await page.locator('.banner-text').innerText()).toBe('Loading cancelled; the previous file stays open.');
    await waitIdle(page);
    await shot('22-large-load-cancelled');
    expect(await summary()).toMatch(/^pipe-medium\.vtu — 4,320 cells/);
    expect(await page.locator('.progress').isHidden()).toBe(true);
    expect(await drawnPixels()).toBe(before);
    await page.locator('.banner-close').click();
    // the worker still holds the pipe: colouring by another field works and gives the pipe's legend
    const colourFolder = page.locator('.lil-gui', { has: page.locator(':scope > .lil-title', { hasText: 'Colour' }) });
    await colourFolder.locator('.lil-controller', { has: page.locator('.lil-name', { hasText: /^field$/ }) }).first().locator('select').selectOption({ label: 'velocity (points)' });
    await waitIdle(page);
    expect(await page.locator('.legend-title').innerText()).toBe('velocity (magnitude) [m/s]');
    expect(await page.locator('.banner[data-kind=error]').count()).toBe(0);
  });

  it('Cancel while the boundary surfaces are being found still keeps the open file', async () => {
    await page.setInputFiles('#file-input', LARGE);
    // Cancel is pressed in the page the moment the stage shows: the stage lasts a few tenths of a second at 1M
    // cells, shorter than a click from outside takes to find the button steady
    await page.waitForFunction(() => {
      const bar = document.querySelector('.progress') as HTMLElement | null;
      if (!bar || bar.hidden || !/^finding boundary surfaces/.test(bar.querySelector('.progress-label')!.textContent!)) return false;
      (bar.querySelector('.progress-cancel') as HTMLButtonElement).click();
      return true;
    }, undefined, { timeout: 60_000, polling: 5 });
    await page.waitForSelector('.banner[data-kind=notice]', { timeout: 20_000 });
    await waitIdle(page);
    expect(await page.locator('.banner-text').innerText()).toBe('Loading cancelled; the previous file stays open.');
    expect(await summary()).toMatch(/^pipe-medium\.vtu — 4,320 cells/);
    await page.locator('.banner-close').click();
  });

  it('asks before opening a file larger than the memory the page may use; No keeps everything, Yes loads', async () => {
    // the heap limit the page reports, made small: the large file's estimate (zlib-compressed, judged at
    // its decoded size) is above it, the pipe's is far below
    const limit = 100e6;
    expect(22_350_100 * MEMORY_PER_FILE_BYTE.compressed).toBeGreaterThan(limit);
    await page.addInitScript((l) => {
      Object.defineProperty(performance, 'memory', { configurable: true, get: () => ({ jsHeapSizeLimit: l, totalJSHeapSize: l / 4, usedJSHeapSize: l / 8 }) });
    }, limit);
    await page.reload();
    await waitIdle(page, 90_000);
    await openFile(PIPE, 'pipe-medium.vtu');
    expect(await page.locator('.banner[data-kind=warning]').count()).toBe(0);
    const before = await drawnPixels();
    await page.setInputFiles('#file-input', LARGE);
    await page.waitForSelector('.banner[data-kind=warning]');
    expect(await page.locator('.banner-text').innerText()).toBe('These files (22.4 MB) need about 156 MB of memory to open; this page can use about 100 MB. The tab may run out of memory. Open anyway?');
    await shot('23-memory-warning');
    // nothing has started while the question is open
    expect(await page.locator('.progress').isHidden()).toBe(true);
    expect(await page.evaluate(() => document.body.dataset['state'])).toBe('ready');
    await page.locator('.banner-no').click();
    await waitIdle(page);
    expect(await page.locator('.banner').isHidden()).toBe(true);
    expect(await summary()).toMatch(/^pipe-medium\.vtu — 4,320 cells/);
    expect(await drawnPixels()).toBe(before);
    await page.setInputFiles('#file-input', LARGE);
    await page.waitForSelector('.banner[data-kind=warning]');
    await page.locator('.banner-yes').click();
    await page.waitForFunction((n) => document.getElementById('file-summary')!.textContent!.startsWith(n), LARGE_NAME, { timeout: 90_000 });
    await waitIdle(page, 90_000);
    expect(await summary()).toMatch(/— 1,001,472 cells/);
    await shot('24-memory-warning-accepted');
  });

  it('an XML file with inline ASCII data opens, read by ranges in the worker, with the counts of the same mesh', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'fieldtally-ascii-'));
    try {
      const path = join(dir, 'pipe-medium-ascii.vtu');
      writeFileSync(path, writeVtu(await loadDatasetFile(PIPE), { encoding: 'ascii' }));
      // larger than the 64 KB head, so the worker streams its structure rather than reading it whole
      expect(statSync(path).size).toBeGreaterThan(64 * 1024);
      await openFile(path, 'pipe-medium-ascii.vtu');
      expect(await summary()).toMatch(/^pipe-medium-ascii\.vtu — 4,320 cells, 4,825 points/);
      expect(await drawnPixels()).toBeGreaterThan(20_000);
      expect(await page.locator('.banner[data-kind=error]').count()).toBe(0);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('made no request beyond localhost and logged no error', () => {
    expect(browser.blocked).toEqual([]);
    expect(browser.errors).toEqual([]);
  });
});
