/**
 * Surface groups renamed in the app (Debian chromium, software WebGL): the label shows in the Surfaces
 * list, the force and wall tools, pins, the results table, the CSV and the saved probe set (`groupLabels`,
 * keyed by the group's name in the file); a rename is an undo step; the label comes back after a reload
 * and when the same file is opened again. Screenshots l01–l03 go to tests/.screenshots/ (git-ignored)
 * and were looked at. The file is the bundled slow-flow sphere (sample-fields/README.md): its boundary
 * groups are `group 1` (the sphere) and `group 2` (the outer boundary, hidden at opening).
 */
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { REPO, waitIdle, type Browser } from './browser.ts';
import { openAppForTests, pageTools } from './appPage.ts';

const SPHERE = join(REPO, 'sample-fields/sphere-stokes.vtu');

let browser: Browser;
let page: Page;
const { shot, downloadText: downloadOf } = pageTools(() => page);

const surfaces = () => page.locator('.lil-gui', { has: page.locator(':scope > .lil-title', { hasText: 'Surfaces' }) });
/** The names in the Surfaces list, without their areas. */
const groupNames = async () => (await surfaces().locator('.lil-controller[data-group] .lil-name').allInnerTexts()).map((n) => n.replace(/ \([^)]*m²\)$/, ''));
const undoSteps = () => page.evaluate(() => Number(document.body.dataset['undoSteps'] ?? 0));
/** Waits until the set's last change was kept (a quiet 250 ms, then stored and an undo step taken). */
const settle = async () => { await page.waitForTimeout(400); await waitIdle(page); };

async function rename(fileName: string, label: string): Promise<void> {
  await surfaces().locator(`.lil-controller[data-group="${fileName}"] button.group-rename`).click();
  const input = surfaces().locator('input.group-rename-input');
  await input.fill(label);
  await input.press('Enter');
  await waitIdle(page);
}
const definition = (id: string) => page.locator(`table.results tr.probe-head[data-probe="${id}"] .probe-def`).innerText();

openAppForTests((app) => { ({ browser, page } = app); });

describe('surface-group labels of the user\'s', () => {
  it('a group renamed in the Surfaces list; the rename is one undo step and comes back on redo', async () => {
    expect(await groupNames()).toEqual(['group 1', 'group 2']);
    await settle();
    const n = await undoSteps();
    await rename('group 1', 'sphere');
    expect(await groupNames()).toEqual(['sphere', 'group 2']);
    await page.waitForFunction((k) => Number(document.body.dataset['undoSteps'] ?? 0) === k + 1, n);
    await page.keyboard.press('Control+z');
    await page.waitForFunction(() => document.querySelector('.lil-controller[data-group="group 1"] .lil-name')?.textContent?.startsWith('group 1 ('));
    await page.keyboard.press('Control+y');
    await page.waitForFunction(() => document.querySelector('.lil-controller[data-group="group 1"] .lil-name')?.textContent?.startsWith('sphere ('));
    // Escape leaves the label as it was
    await surfaces().locator('.lil-controller[data-group="group 2"] button.group-rename').click();
    await surfaces().locator('input.group-rename-input').fill('never kept');
    await surfaces().locator('input.group-rename-input').press('Escape');
    expect(await groupNames()).toEqual(['sphere', 'group 2']);
    await shot('l01-group-renamed');
  });

  it('the label is used by the force and wall tools, their pins, the table, the CSV and the saved set', async () => {
    const force = page.locator('.lil-gui', { has: page.locator(':scope > .lil-title', { hasText: 'Force total' }) });
    expect(await force.locator('.lil-name', { hasText: /^include sphere$/ }).count()).toBe(1);
    const box = (await page.locator('#view-canvas').boundingBox())!;
    await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
    await page.waitForSelector('[data-pin="force-1"] [data-quantity="CD"]');
    await waitIdle(page);
    expect(await force.locator('.lil-controller', { has: page.locator('.lil-name', { hasText: /^surfaces$/ }) }).locator('input').inputValue()).toBe('sphere');
    expect(await definition('force-1')).toMatch(/^force on 1 "sphere"/);

    const wall = page.locator('.lil-gui', { has: page.locator(':scope > .lil-title', { hasText: 'Wall quantities' }) });
    const choice = wall.locator('.lil-controller', { has: page.locator('.lil-name', { hasText: /^surface group$/ }) }).locator('select');
    expect(await choice.locator('option').allInnerTexts()).toEqual(['sphere', 'group 2']);
    await choice.selectOption({ label: 'sphere' });
    await waitIdle(page);
    await wall.locator('.lil-name', { hasText: /^pin statistics of the group$/ }).click();
    await page.waitForSelector('[data-pin="wall-1"]');
    await waitIdle(page);
    expect(await page.locator('[data-pin="wall-1"] .pin-title').innerText()).toBe('Wall sphere');
    expect(await definition('wall-1')).toMatch(/^wall quantities on 1 "sphere"/);
    await shot('l02-labels-in-pins-and-table');

    const csv = await downloadOf(() => page.getByText('save results (CSV)').click());
    expect(csv).toContain('force on 1 ""sphere""');
    expect(csv).toContain('wall quantities on 1 ""sphere""');
    expect(csv).not.toContain('group 1');
    const set = JSON.parse(await downloadOf(() => page.getByText('save probe set (JSON)').click())) as {
      groupLabels?: Record<string, string>; probes: { id: string; geometry: { surfaces?: unknown[] } }[];
    };
    expect(set.groupLabels).toEqual({ 'group 1': 'sphere' });
    // probes still name the group as the file does: the label is only what is shown
    expect(set.probes.find((p) => p.id === 'force-1')!.geometry.surfaces).toEqual(['group 1']);
    expect(set.probes.find((p) => p.id === 'wall-1')!.geometry.surfaces).toEqual(['group 1']);
  });

  it('the label comes back after a reload and when the same file is opened again', async () => {
    await settle();
    await page.reload();
    await waitIdle(page, 90_000);
    await page.waitForSelector('[data-pin="force-1"] [data-quantity="CD"]', { timeout: 60_000 });
    await waitIdle(page);
    expect(await groupNames()).toEqual(['sphere', 'group 2']);
    expect(await definition('force-1')).toMatch(/^force on 1 "sphere"/);

    await page.setInputFiles('#file-input', SPHERE);
    await page.waitForFunction(() => document.body.dataset['state'] === 'loading');
    await page.waitForFunction(() => document.body.dataset['state'] === 'ready', undefined, { timeout: 90_000 });
    await page.waitForSelector('[data-pin="force-1"] [data-quantity="CD"]', { timeout: 60_000 });
    await waitIdle(page);
    expect(await groupNames()).toEqual(['sphere', 'group 2']);
    expect(await page.locator('[data-pin="wall-1"] .pin-title').innerText()).toBe('Wall sphere');
    expect(await definition('wall-1')).toMatch(/^wall quantities on 1 "sphere"/);
    // an empty label gives the group its file name back, everywhere
    await rename('group 1', '');
    expect(await groupNames()).toEqual(['group 1', 'group 2']);
    expect(await definition('force-1')).toMatch(/^force on 1 "group 1"/);
    await shot('l03-after-reopen-and-reset');
  });

  it('made no request beyond localhost and logged no error', () => {
    expect(browser.blocked).toEqual([]);
    expect(browser.errors).toEqual([]);
  });
});
