/**
 * Cross-origin isolation and the worker pool in Debian's chromium:
 *  - the built dist/ on a plain static server (no headers) becomes isolated through the service worker
 *    after one reload, and its about box states the worker count;
 *  - Vite's preview and dev servers send the headers themselves (isolated at once);
 *  - a cut on the bundled sample (161,280 cells: large enough for the pool) gives the same numbers with
 *    `?workers=2` as with `?workers=1` (saved results JSON compared value by value; the single-thread
 *    core is the reference, as in tests/parallel/poolExactness.test.ts).
 * Screenshot of the about box: tests/.screenshots/isolation-about.png.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { mkdirSync, readFileSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { REPO, buildApp, launch, serveFolder, waitIdle, type Browser } from './browser.ts';

const SHOTS = join(REPO, 'tests/.screenshots');
let dist = '';
let server: Awaited<ReturnType<typeof serveFolder>> | undefined;
let browser: Browser;

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = createServer();
    s.listen(0, '127.0.0.1', () => { const p = (s.address() as { port: number }).port; s.close(() => resolve(p)); });
  });
}

/** Starts `vite <args>` on a free port and waits until it answers; returns its URL and the process. */
async function startVite(args: string[]): Promise<{ url: string; proc: ChildProcess }> {
  const port = await freePort();
  const proc = spawn(process.execPath, [join(REPO, 'node_modules/vite/bin/vite.js'), ...args, '--port', String(port), '--strictPort', '--host', '127.0.0.1'], {
    cwd: REPO, stdio: 'ignore', env: { ...process.env, NO_COLOR: '1' },
  });
  const url = `http://127.0.0.1:${port}/`;
  for (let i = 0; i < 600; i++) {
    try { if ((await fetch(url)).ok) return { url, proc }; } catch { /* not up yet */ }
    await new Promise((r) => setTimeout(r, 100));
  }
  proc.kill();
  throw new Error(`vite ${args.join(' ')} did not answer on ${url}`);
}

const isolated = (page: Page) => page.evaluate(() => globalThis.crossOriginIsolated);

async function aboutText(page: Page): Promise<string> {
  await page.locator('#about-button').click();
  const text = await page.locator('dialog.about .workers').innerText();
  return text;
}

/**
 * Places a cut-plane on the open file (or, with `create` false, waits for the one the page kept from its
 * last visit) and returns the saved results JSON's probes.
 */
async function cutResults(page: Page, create: boolean): Promise<unknown> {
  if (create) await page.getByText('+ new cut-plane').click();
  await page.waitForSelector('[data-pin="plane-1"] [data-quantity="massFlowRate"]');
  await waitIdle(page);
  const [d] = await Promise.all([page.waitForEvent('download'), page.getByText('save results (JSON)').click()]);
  const json = JSON.parse(readFileSync((await d.path())!, 'utf8')) as { probes: unknown[] };
  expect(json.probes.length).toBeGreaterThan(0);
  return json.probes;
}

beforeAll(async () => {
  mkdirSync(SHOTS, { recursive: true });
  dist = buildApp();
  server = await serveFolder(dist);
  browser = await launch();
}, 240_000);

afterAll(async () => {
  await browser?.close();
  await server?.close();
  if (dist) rmSync(dist, { recursive: true, force: true });
});

describe('cross-origin isolation and the worker pool in the browser', () => {
  it('dist/ on a plain static server: isolated after one reload by the service worker; the about box names the workers', async () => {
    const page = browser.page;
    await page.goto(server!.url);
    await page.waitForFunction(() => globalThis.crossOriginIsolated === true, undefined, { timeout: 60_000 });
    await waitIdle(page, 120_000);
    expect(await isolated(page)).toBe(true);
    const cores = await page.evaluate(() => navigator.hardwareConcurrency);
    const text = await aboutText(page);
    // one worker per core, one core left to the page
    expect(text).toMatch(cores > 2 ? new RegExp(`Computing with ${cores - 1} workers that share the file's arrays`) : /Computing with one worker: the page is cross-origin isolated/);
    await page.screenshot({ path: join(SHOTS, 'isolation-about.png') });
    await page.keyboard.press('Escape');
  });

  it('a cut gives the same numbers with ?workers=2 as with ?workers=1', async () => {
    const page = browser.page;
    await page.goto(`${server!.url}?workers=2`);
    await page.waitForFunction(() => globalThis.crossOriginIsolated === true, undefined, { timeout: 60_000 });
    await waitIdle(page, 120_000);
    expect(await aboutText(page)).toMatch(/Computing with 2 workers that share the file's arrays in memory \(as asked in the address\)/);
    await page.keyboard.press('Escape');
    const many = await cutResults(page, true);
    await page.goto(`${server!.url}?workers=1`);
    await waitIdle(page, 120_000);
    expect(await aboutText(page)).toMatch(/Computing with one worker: the page is cross-origin isolated, but one worker was asked for/);
    await page.keyboard.press('Escape');
    // the page keeps the user's probes across visits: the same plane, now computed by one worker
    const one = await cutResults(page, false);
    expect(one).toEqual(many);
  });

  it('Vite preview and dev servers send the isolation headers', async () => {
    for (const args of [['preview', '--outDir', dist], []]) {
      const vite = await startVite(args);
      try {
        const res = await fetch(vite.url);
        expect(res.headers.get('cross-origin-opener-policy')).toBe('same-origin');
        expect(res.headers.get('cross-origin-embedder-policy')).toBe('require-corp');
        const page = await browser.context.newPage();
        await page.goto(vite.url);
        await waitIdle(page, 170_000);
        expect(await isolated(page)).toBe(true);
        await page.close();
      } finally {
        vite.proc.kill();
      }
    }
  });
});
