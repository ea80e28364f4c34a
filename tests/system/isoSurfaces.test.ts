/**
 * Iso-surfaces in the app (Debian chromium, software WebGL), on the bundled sample (creeping flow past a
 * sphere): an iso-surface of p coloured by the velocity is drawn, its area pinned equal to the command
 * line's `iso-surface` (the same evaluator; that area is checked against VTK's contour filter in
 * tests/iso/isoReference.test.ts), its open state said; it is a probe of the set, so undo removes it and redo
 * brings it back, and the exported picture shows it. Screenshots go to tests/.screenshots/ (git-ignored) and
 * were looked at.
 */
import { execFileSync } from 'node:child_process';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { expect, it } from 'vitest';
import { REPO, waitIdle } from './browser.ts';
import { SCREENSHOTS, openAppForTests, pageTools } from './appPage.ts';

const SPHERE = join(REPO, 'sample-fields/sphere-stokes.vtu');
let page: Page;
const { pinNumber } = pageTools(() => page);

const sig4 = (x: number) => Number(x.toPrecision(4));
function control(label: string, folder: string) {
  const scope = page.locator('.lil-gui', { has: page.locator(':scope > .lil-title', { hasText: folder }) });
  return scope.locator('.lil-controller', { has: page.locator('.lil-name', { hasText: new RegExp(`^${label}$`) }) }).first();
}

openAppForTests((app) => { ({ page } = app); });

it('an iso-surface of p coloured by |velocity|: drawn, area pinned as the CLI says, open; undo and redo', async () => {
  const cli = JSON.parse(execFileSync(process.execPath, [join(REPO, 'bin/fieldtally.mjs'), 'iso-surface', SPHERE, '--field', 'p', '--values', '0.5', '--colour-by', 'velocity', '--json'],
    { cwd: REPO, encoding: 'utf8' })) as { surfaces: { area: number; boundaryEdges: number; colour: { mean: number } }[] };
  await page.locator('.lil-title', { hasText: 'Iso-surfaces' }).scrollIntoViewIfNeeded();
  await control('field', 'Iso-surfaces').locator('select').selectOption({ label: 'p' });
  const value = control('value', 'Iso-surfaces').locator('input').last();
  await value.fill('0.5');
  await value.press('Enter');
  await control('colour by', 'Iso-surfaces').locator('select').selectOption({ label: 'velocity' });
  await waitIdle(page);
  await page.locator('.lil-name', { hasText: /^add iso-surface$/ }).click();
  await page.waitForSelector('[data-pin="iso-1"] [data-quantity="area"]', { timeout: 60_000 });
  await waitIdle(page);
  expect(await pinNumber('iso-1', 'area')).toBe(sig4(cli.surfaces[0]!.area));
  expect(await page.locator('[data-pin="iso-1"] [data-quantity="tag"]').innerText()).toMatch(new RegExp(`^open: ${cli.surfaces[0]!.boundaryEdges} boundary edges; colours velocity: 0 m/s … `));
  expect(await pinNumber('iso-1', 'colour.mean')).toBe(sig4(cli.surfaces[0]!.colour.mean));
  expect(await page.locator('table.results').innerText()).toMatch(/open: \d+ boundary edges/);
  await page.screenshot({ path: join(SCREENSHOTS, 'iso-01-pressure-surface.png') });

  // a probe of the set: undo removes it, redo brings it back
  await page.waitForTimeout(400);
  await waitIdle(page);
  await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
  await page.keyboard.press('Control+z');
  await page.waitForFunction(() => !document.querySelector('[data-pin="iso-1"]'));
  await waitIdle(page);
  await page.keyboard.press('Control+y');
  await page.waitForSelector('[data-pin="iso-1"] [data-quantity="area"]');
  await waitIdle(page);
  expect(await pinNumber('iso-1', 'area')).toBe(sig4(cli.surfaces[0]!.area));
  await page.screenshot({ path: join(SCREENSHOTS, 'iso-02-after-redo.png') });
}, 180_000);
