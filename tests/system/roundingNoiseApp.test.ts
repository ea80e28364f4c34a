/**
 * Rounding noise on the app's pins (Debian chromium, software WebGL): the first line probe on the bundled
 * slow-flow sphere runs along x through the bead's centre, where Stokes' pressure p = −(3/2)μa(U·x)/r³ is odd
 * in x (Batchelor 1967, An Introduction to Fluid Dynamics, §4.9), so its mean over the samples cancels to
 * ~10⁻¹⁶ Pa while p on the line reaches the wall's ±3μU/(2a) = ±4.5 Pa. The pin and the results table mark
 * the mean "≈ 0 relative to max |p| on the line" (src/ui/roundingNoise.ts); the CSV keeps its value. A vector
 * component's mean (velocity_y, zero on the axis by symmetry) is judged against the vector's magnitude. A
 * force total whose every part cancels — the pressure force on the straight pipe's wall, whose outward normals
 * have no axial part and whose radial parts cancel around the circumference (symmetry) — is marked against
 * Σ|dF| (src/surface/forces.ts `grossForce`). Screenshots n01, n02 go to tests/.screenshots/ (git-ignored) and
 * were looked at.
 */
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { REPO, waitIdle } from './browser.ts';
import { openAppForTests, pageTools } from './appPage.ts';

const SPHERE = join(REPO, 'sample-fields/sphere-stokes.vtu');
const PIPE = join(REPO, 'sample-fields/pipe-medium.vtu');

let page: Page;
const { shot, openFile, downloadText, pinText, control } = pageTools(() => page);

openAppForTests((app) => { ({ page } = app); });

describe('rounding noise on a line probe\'s pin', () => {
  it('the Stokes sphere\'s line through the bead: p mean ≈ 0 against max |p| = 4.5 Pa on the line; the CSV keeps the value', async () => {
    await openFile(SPHERE, 'sphere-stokes.vtu');
    await page.getByText('+ new line probe').click();
    await page.waitForSelector('[data-pin="line-1"] [data-quantity="p.mean"]');
    await waitIdle(page);
    const text = await pinText('line-1', 'p.mean');
    expect(text).toMatch(/^-?\d\.\d{3}×10⁻¹[0-9⁰¹²³⁴⁵⁶⁷⁸⁹]* Pa \(≈ 0 relative to max \|p\| on the line\)$/);
    // the same mark in the results table, after the value
    const row = page.locator('table.results tr[data-probe="line-1"][data-quantity="p.mean"]');
    expect(await row.locator('.noise-mark').innerText()).toBe('(≈ 0 relative to max |p| on the line)');
    // p's extremes on the line are the wall's ±4.5 Pa and carry no mark
    expect(await row.locator('xpath=following-sibling::tr[@data-quantity="p.max"]').innerText()).toMatch(/4\.500 Pa$/);
    // the cross-flow component velocity_y is zero on the axis by symmetry: its mean is judged against the
    // velocity's magnitude on the line, not against its own noise-level extremes
    const vy = page.locator('table.results tr[data-probe="line-1"][data-quantity="velocity_y.mean"]');
    expect(await vy.locator('.noise-mark').innerText()).toBe('(≈ 0 relative to max |velocity| on the line)');
    const vx = page.locator('table.results tr[data-probe="line-1"][data-quantity="velocity_x.mean"]');
    expect(await vx.locator('.noise-mark').count()).toBe(0);
    await shot('n01-sphere-line-p-mean-noise');
    const csv = await downloadText(() => page.getByText('save results (CSV)').click());
    const cells = csv.split('\n').find((l) => l.includes(',p.mean,'))!.split(',');
    const value = Number(cells.at(-2));
    expect(value).not.toBe(0);
    expect(Math.abs(value)).toBeLessThan(4.5e-9);
  });

  it('a force whose parts all cancel (pressure on the straight pipe\'s wall): every coefficient and force is ≈ 0 relative to Σ|dF|', async () => {
    await openFile(PIPE, 'pipe-medium.vtu');
    const opacity = control('surface opacity').locator('input').last();
    await opacity.fill('1');
    await opacity.press('Enter');
    await waitIdle(page);
    // the view's middle is the pipe's wall (group 1)
    const box = (await page.locator('#view-canvas').boundingBox())!;
    await page.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
    await page.waitForSelector('[data-pin="force-1"] [data-quantity="CD"]');
    await control('viscous part', 'Force total').locator('select').selectOption({ label: 'none (pressure force only)' });
    await waitIdle(page);
    await page.waitForFunction(() => /none/.test(document.querySelector('[data-pin="force-1"] [data-quantity="tag"]')?.textContent ?? ''));
    expect(await pinText('force-1', 'CD')).toMatch(/^-?\d\.\d{3}×10⁻[¹²][0-9⁰¹²³⁴⁵⁶⁷⁸⁹]* \(≈ 0 relative to Σ\|dF\|\/\(q·A\)\)$/);
    // every other force number is noise or exactly 0 (the wall's normals have no axial part); none is a bare small number
    const rows = page.locator('table.results tr[data-probe="force-1"]');
    const texts = await rows.evaluateAll((rs) => rs.filter((r) => /^(C[DLS]|force\.)/.test((r as HTMLElement).dataset['quantity'] ?? '')).map((r) => (r as HTMLElement).innerText.replace(/\s+/g, ' ')));
    expect(texts.length).toBeGreaterThan(5);
    for (const t of texts) expect(t).toMatch(/\(≈ 0 relative to Σ\|dF\|(\/\(q·A\))?\)$| 0( N)?$/);
    await shot('n02-pipe-wall-force-noise');
  });
});
