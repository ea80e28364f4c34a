/**
 * What the app's browser tests share beyond the harness (tests/system/browser.ts): opening the built app
 * once per test file (`openAppForTests`), and the page helpers every test file used to repeat
 * (`pageTools`): screenshots into tests/.screenshots/, panel controls by label, choosing a file, downloads
 * and the numbers of a pin. Each test file states only what it checks.
 */
import { mkdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Locator, Page } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';
import { parseFormatted } from '../../src/ui/format.ts';
import { REPO, openApp, waitIdle, type AppSession } from './browser.ts';

/** Where the browser tests put their screenshots (git-ignored); look at them after a change. */
export const SCREENSHOTS = join(REPO, 'tests/.screenshots');

/**
 * Builds and opens the app before the test file's tests (within `timeout` ms) and closes it after them;
 * `onOpen` gets the session (tests keep its page). Other set-up of the file goes in its own hooks.
 */
export function openAppForTests(onOpen: (app: AppSession) => void, timeout = 240_000): void {
  let app: AppSession | undefined;
  beforeAll(async () => {
    mkdirSync(SCREENSHOTS, { recursive: true });
    app = await openApp();
    onOpen(app);
  }, timeout);
  afterAll(async () => { await app?.close(); });
}

const escaped = (s: string) => s.replace(/[[\]()|.*+?^$]/g, '\\$&');

/** Helpers on the page that `page()` returns when they are called (the page is opened in `beforeAll`). */
export function pageTools(page: () => Page) {
  return {
    /** Saves a screenshot of the page as tests/.screenshots/<name>.png. */
    shot: (name: string) => page().screenshot({ path: join(SCREENSHOTS, `${name}.png`) }),
    /** The panel control whose label is `label` (whole label, or a pattern), inside folder `folder` when given. */
    control(label: string | RegExp, folder?: string): Locator {
      const p = page(), re = typeof label === 'string' ? new RegExp(`^${escaped(label)}$`) : label;
      const scope = folder ? p.locator('.lil-gui', { has: p.locator(':scope > .lil-title', { hasText: folder }) }) : p;
      return scope.locator('.lil-controller', { has: p.locator('.lil-name', { hasText: re }) }).first();
    },
    /** Chooses `path` in the file input and waits until the file summary starts with `name` and the app is idle. */
    async openFile(path: string, name: string, timeout = 60_000): Promise<void> {
      const p = page();
      await p.setInputFiles('#file-input', path);
      await p.waitForFunction((n) => document.getElementById('file-summary')!.textContent!.startsWith(n), name, { timeout });
      await waitIdle(p, timeout);
    },
    /** The bytes of the download that `click` starts. */
    async downloadBytes(click: () => Promise<void>): Promise<Uint8Array> {
      const [d] = await Promise.all([page().waitForEvent('download'), click()]);
      return new Uint8Array(readFileSync((await d.path())!));
    },
    /** The text (UTF-8) of the download that `click` starts. */
    async downloadText(click: () => Promise<void>): Promise<string> {
      const [d] = await Promise.all([page().waitForEvent('download'), click()]);
      return readFileSync((await d.path())!, 'utf8');
    },
    /** What pin `id` shows for `quantity`, after its "=". */
    async pinText(id: string, quantity: string): Promise<string> {
      return (await page().locator(`[data-pin="${id}"] [data-quantity="${quantity}"]`).innerText()).split('=').slice(1).join('=').trim();
    },
    /** The number pin `id` shows for `quantity`, without its unit and "≈ 0" note. */
    async pinNumber(id: string, quantity: string): Promise<number> {
      const text = (await page().locator(`[data-pin="${id}"] [data-quantity="${quantity}"]`).innerText()).split('=').slice(1).join('=').trim();
      return parseFormatted(text.replace(/ \(≈ 0.*$/, '').replace(/ [^ ]*$/, ''));
    },
  };
}
