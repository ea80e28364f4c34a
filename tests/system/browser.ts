/**
 * Browser harness for the viewer's system tests and its benchmark: builds the app with Vite into a
 * temporary folder, serves it from a tiny static server on 127.0.0.1, and drives Debian's chromium
 * (never a downloaded browser) through playwright-core with every non-local request blocked and counted.
 */
import { execFileSync } from 'node:child_process';
import { createReadStream, existsSync, mkdtempSync, rmSync, statSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { extname, join, normalize } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { CHROMIUM, requireChromium } from './requirements.ts';

export const REPO = fileURLToPath(new URL('../..', import.meta.url)).replace(/\/$/, '');

/** Flags for headless chromium with software WebGL and no background traffic (DEVELOPERS.md lists them). */
export const CHROMIUM_FLAGS = [
  '--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking',
  '--disable-component-update', '--disable-sync', '--use-angle=swiftshader', '--enable-unsafe-swiftshader',
];

/** Builds the app (`vite build`) into a fresh temporary folder; returns it. */
export function buildApp(): string {
  const out = mkdtempSync(join(tmpdir(), 'fieldtally-dist-'));
  try {
    execFileSync(process.execPath, [join(REPO, 'node_modules/vite/bin/vite.js'), 'build', '--outDir', out, '--emptyOutDir', '--logLevel', 'warn'], {
      cwd: REPO, stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, NO_COLOR: '1' },
    });
  } catch (e) {
    rmSync(out, { recursive: true, force: true });
    const err = String((e as { stderr?: Buffer }).stderr ?? e).replace(/\x1b\[[0-9;]*m/g, '');
    throw new Error(`vite build failed:\n${err.split('\n').slice(0, 30).join('\n')}`);
  }
  if (!existsSync(join(out, 'index.html'))) throw new Error(`vite build wrote no index.html into ${out}`);
  return out;
}

const MIME: Record<string, string> = {
  '.html': 'text/html; charset=utf-8', '.js': 'text/javascript', '.mjs': 'text/javascript', '.css': 'text/css',
  '.json': 'application/json', '.png': 'image/png', '.svg': 'image/svg+xml', '.wasm': 'application/wasm',
};

/** Serves a folder on 127.0.0.1 at a free port. */
export async function serveFolder(root: string): Promise<{ url: string; close: () => Promise<void> }> {
  const server: Server = createServer((req, res) => {
    const path = decodeURIComponent(new URL(req.url ?? '/', 'http://x').pathname);
    const file = normalize(join(root, path === '/' ? 'index.html' : path));
    if (!file.startsWith(root) || !existsSync(file) || !statSync(file).isFile()) { res.writeHead(404); res.end('not found'); return; }
    res.writeHead(200, { 'content-type': MIME[extname(file)] ?? 'application/octet-stream', 'content-length': statSync(file).size });
    createReadStream(file).pipe(res);
  });
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  const { port } = server.address() as AddressInfo;
  return { url: `http://127.0.0.1:${port}/`, close: () => new Promise((r) => server.close(() => r())) };
}

export interface Browser {
  context: BrowserContext;
  page: Page;
  /** Requests that tried to leave localhost (blocked). */
  blocked: string[];
  /** Console errors and page errors seen so far. */
  errors: string[];
  close: () => Promise<void>;
}

/**
 * Launches Debian's chromium with a fresh profile. Every request is routed: local ones continue,
 * anything else is aborted and recorded. A `longtask` observer is installed before any page script.
 */
export async function launch(viewport = { width: 1400, height: 900 }): Promise<Browser> {
  requireChromium();
  const profile = mkdtempSync(join(tmpdir(), 'fieldtally-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM, headless: true, args: CHROMIUM_FLAGS, viewport, acceptDownloads: true,
  });
  const blocked: string[] = [], errors: string[] = [];
  await context.route('**/*', (route) => {
    const u = new URL(route.request().url());
    const local = u.protocol === 'data:' || u.protocol === 'blob:' || u.hostname === '127.0.0.1' || u.hostname === 'localhost';
    if (local) return route.continue();
    blocked.push(u.href);
    return route.abort('blockedbyclient');
  });
  await context.addInitScript(() => {
    const w = window as unknown as { __longTasks: { start: number; duration: number }[] };
    w.__longTasks = [];
    new PerformanceObserver((list) => {
      for (const e of list.getEntries()) w.__longTasks.push({ start: e.startTime, duration: e.duration });
    }).observe({ type: 'longtask', buffered: true });
  });
  const page = context.pages()[0] ?? await context.newPage();
  page.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
  page.on('pageerror', (e) => errors.push(e.message));
  return {
    context, page, blocked, errors,
    close: async () => { await context.close(); rmSync(profile, { recursive: true, force: true }); },
  };
}

/** Long tasks recorded since `since` (page time, ms). */
export async function longTasksSince(page: Page, since: number): Promise<{ start: number; duration: number }[]> {
  return page.evaluate((t) => (window as unknown as { __longTasks: { start: number; duration: number }[] }).__longTasks.filter((e) => e.start >= t), since);
}

/** The page's clock (performance.now()). */
export async function pageNow(page: Page): Promise<number> {
  return page.evaluate(() => performance.now());
}

/** Waits until the viewer is idle: a file is open, no worker call is pending and the picture is up to date. */
export async function waitIdle(page: Page, timeout = 60_000): Promise<void> {
  await page.waitForFunction(() => document.body.dataset['state'] === 'ready' && document.body.dataset['busy'] !== 'true', undefined, { timeout });
  // the picture catches up a frame or two later (pixels are fetched without blocking the page)
  await page.waitForFunction(() => document.body.dataset['drawing'] !== 'true', undefined, { timeout });
  // one more frame so pins and legend are laid out
  await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))));
}

/** The built app, served on localhost and opened in a fresh browser. */
export interface AppSession {
  browser: Browser;
  page: Page;
  /** The built app's folder (files put here are served too). */
  dist: string;
  close: () => Promise<void>;
}

/** Builds and serves the app, opens it in a fresh browser and waits until it is idle on its bundled sample field. */
export async function openApp(): Promise<AppSession> {
  const browser = await launch();
  let dist = '', server: Awaited<ReturnType<typeof serveFolder>> | undefined;
  const close = async () => {
    await browser.close();
    await server?.close();
    if (dist) rmSync(dist, { recursive: true, force: true });
  };
  try {
    dist = buildApp();
    server = await serveFolder(dist);
    await browser.page.goto(server.url);
    await waitIdle(browser.page, 90_000);
  } catch (e) {
    await close();
    throw e;
  }
  return { browser, page: browser.page, dist, close };
}
