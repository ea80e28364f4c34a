/**
 * Derived fields, wall quantities and user formulas in the app (Debian chromium, software WebGL): the colour
 * chooser offers the derived fields the file allows and makes them in the worker; cp follows the reference
 * conditions; a surface group coloured by y⁺ and its pinned statistics equal the `wall` verb's; a formula
 * becomes a field, shows parse errors with their column, is saved in the probe set, undone, redone, kept over
 * a reload and removed. The wall tool also takes surfaces by what they are (name, box, area), and the saved
 * set keeps that choice. Screenshots go to tests/.screenshots/ (git-ignored) and were looked at.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { pipeExact } from '../../src/samples/pipe.ts';
import { REPO, waitIdle } from './browser.ts';
import { openAppForTests, pageTools } from './appPage.ts';

const PIPE = join(REPO, 'sample-fields/pipe-medium.vtu');

let page: Page;
const { shot, control, openFile: chooseFile, downloadText: downloadOf, pinNumber } = pageTools(() => page);

const sig4 = (x: number) => Number(x.toPrecision(4));
const sig6 = (x: number) => Number(x.toPrecision(6));

async function setText(label: string, value: string | number, folder?: string): Promise<void> {
  const input = control(label, folder).locator('input').last();
  await input.fill(String(value));
  await input.press('Enter');
  await settle();
}
async function choose(label: string, option: string, folder?: string): Promise<void> {
  await control(label, folder).locator('select').selectOption({ label: option });
  await settle();
}
/** Idle, after the probe set's quiet moment and any follow-up call. */
async function settle(): Promise<void> {
  await waitIdle(page);
  await page.waitForTimeout(350);
  await waitIdle(page);
}
/** The colour range the panel shows (6 significant digits). */
async function colourRange(): Promise<[number, number]> {
  const lo = Number(await control('range low', 'Colour').locator('input').inputValue());
  const hi = Number(await control('range high', 'Colour').locator('input').inputValue());
  return [lo, hi];
}

function cli(...args: string[]): Record<string, unknown> {
  return JSON.parse(execFileSync(process.execPath, [join(REPO, 'bin/fieldtally.mjs'), ...args, '--json'], { cwd: REPO, encoding: 'utf8' })) as Record<string, unknown>;
}

async function openFile(path: string, name: string): Promise<void> {
  await chooseFile(path, name);
  await settle();
}

openAppForTests((app) => { ({ page } = app); });

describe('derived fields, wall quantities and formulas in the app', () => {
  // Reference: the Hagen–Poiseuille solution (Hagen 1839, Poiseuille 1840; White, Fluid Mechanics, 7th ed., §6.9):
  // u_z = 2V(1 − r²/R²), so |ω| = |∂u_z/∂r| = 4Vr/R², 4V/R at the wall; τ_w = 4μV/R; p = G(L − z), G = 8μV/R²
  const e = pipeExact();

  it('offers only the derived fields the file allows, makes one when chosen, and colours cuts and the surface by it', async () => {
    await openFile(PIPE, 'pipe-medium.vtu');
    const options = await control('field', 'Colour').locator('select option').allInnerTexts();
    // velocity and pressure are there: every velocity-based field, total pressure and cp are offered; the 9-component gradient is not
    for (const n of ['vorticity [1/s]', 'vorticity-magnitude [1/s]', 'q-criterion [1/s²]', 'lambda2 [1/s²]', 'helicity [m/s²]', 'velocity-magnitude [m/s]', 'total-pressure [Pa]', 'cp']) {
      expect(options).toContain(`${n} (derived, made when chosen)`);
    }
    expect(options.some((o) => o.startsWith('velocity-gradient'))).toBe(false);
    await choose('field', 'vorticity-magnitude [1/s] (derived, made when chosen)', 'Colour');
    // once made it is a field of the file like the others (and no longer offered as "made when chosen")
    expect(await control('field', 'Colour').locator('select option:checked').innerText()).toBe('vorticity-magnitude (points)');
    const after = await control('field', 'Colour').locator('select option').allInnerTexts();
    expect(after).toContain('vorticity-magnitude (points)');
    expect(after).not.toContain('vorticity-magnitude [1/s] (derived, made when chosen)');
    // the quadratic fit is exact on the quadratic profile: 0 on the axis, 4V/R on the wall nodes
    const [lo, hi] = await colourRange();
    expect(Math.abs(lo)).toBeLessThan(1e-6);
    expect(hi).toBe(sig6(4 * e.V / e.R));
    // a cut-plane made now is coloured by it (no error), and its field choices list it
    await page.locator('.lil-name', { hasText: /^\+ new cut-plane$/ }).click();
    await page.waitForSelector('[data-pin="plane-1"] [data-quantity="massFlowRate"]');
    await settle();
    expect(await page.locator('.banner[data-kind="error"]:visible').count()).toBe(0);
    await shot('d01-vorticity-magnitude');
  });

  it('cp follows the reference conditions: made again when the reference speed changes', async () => {
    await choose('field', 'cp (derived, made when chosen)', 'Colour');
    const rho = Number(await control('ref. density ρ [kg/m³]').locator('input').inputValue());
    const U = Number(await control('ref. speed U [m/s]').locator('input').inputValue());
    // cp = (p − p_ref)/(½ρU²); the largest p is the inlet's G·L (exact at the nodes), the outlet's is 0
    expect((await colourRange())[1]).toBe(sig6(e.G * e.L / (0.5 * rho * U * U)));
    await setText('ref. speed U [m/s]', 2 * U);
    await expect.poll(async () => (await colourRange())[1]).toBe(sig6(e.G * e.L / (0.5 * rho * 4 * U * U)));
    expect(Math.abs((await colourRange())[0])).toBeLessThan(1e-9);
    await setText('ref. speed U [m/s]', U);
    await shot('d02-cp');
    // the next file (here the same one again) is coloured by cp too: made again on it
    await openFile(PIPE, 'pipe-medium.vtu');
    await page.waitForFunction(() => document.querySelector('.legend')?.textContent?.startsWith('cp'));
    await settle();
    expect(await control('field', 'Colour').locator('select option:checked').innerText()).toBe('cp (points)');
    expect((await colourRange())[1]).toBe(sig6(e.G * e.L / (0.5 * rho * U * U)));
  });

  it('colours the pipe wall by y+ and pins its statistics, equal to the `wall` verb; thresholds are editable and undoable', async () => {
    const rho = 998.207, mu = 0.0010016;
    // the panel picks the largest group (the wall, "part 1")
    expect(await control('surface group', 'Wall quantities').locator('select option:checked').innerText()).toBe('part 1');
    await control('colour the group by it', 'Wall quantities').locator('button').click();
    await settle();
    const cliWall = (t: string) => (cli('wall', PIPE, '--groups', '1', '--rho', String(rho), '--mu', String(mu), '--speed', '1', '--thresholds', t) as {
      groups: { stats: { shearMagnitude: { mean: number }; yPlus: { mean: number; min: number; max: number }; cf: { mean: number } }; yPlusAbove: { threshold: number; areaShare: number }[]; yPlusHistogram: { areaShare: number[] } }[];
    }).groups[0]!;
    const w = cliWall('1,5');
    // the colour range is the group's y+ range, face by face the verb's
    const [lo, hi] = await colourRange();
    expect(lo).toBe(sig6(w.stats.yPlus.min));
    expect(hi).toBe(sig6(w.stats.yPlus.max));
    expect(await page.locator('.legend').innerText()).toMatch(/y\+ on part 1/);
    // where τ_w comes from is said: no wall-shear array in the pipe, so the velocity gradient with μ
    expect(await page.locator('.wall-source').innerText()).toMatch(/^τ_w from the second-order velocity gradient of "velocity" with μ = 0\.0010016 Pa·s/);
    expect(await page.locator('.wall-histogram rect').count()).toBe(10);
    await control('pin statistics of the group', 'Wall quantities').locator('button').click();
    await page.waitForSelector('[data-pin="wall-1"] [data-quantity="yPlus.mean"]');
    await settle();
    expect(await pinNumber('wall-1', 'yPlus.mean')).toBe(sig4(w.stats.yPlus.mean));
    expect(await pinNumber('wall-1', 'yPlus.max')).toBe(sig4(w.stats.yPlus.max));
    expect(await pinNumber('wall-1', 'yPlusAbove.1')).toBe(sig4(w.yPlusAbove[0]!.areaShare));
    expect(await pinNumber('wall-1', 'wallShear.mean')).toBe(sig4(w.stats.shearMagnitude.mean));
    // Hagen–Poiseuille τ_w = 4μV/R = 0.020032 Pa; the faceted wall (24 facets) puts the mean 0.9 % low
    expect(Math.abs(w.stats.shearMagnitude.mean / (4 * mu * e.V / e.R) - 1)).toBeLessThan(0.01);
    await shot('d03-wall-yplus');
    // c_f = |τ_w|/(½ρU²) with U = 1: the colour range is the verb's, face by face
    await choose('quantity', 'c_f skin friction', 'Wall quantities');
    await control('colour the group by it', 'Wall quantities').locator('button').click();
    await settle();
    const cf = (cli('wall', PIPE, '--groups', '1', '--rho', String(rho), '--mu', String(mu), '--speed', '1') as { groups: { stats: { cf: { min: number; max: number } } }[] }).groups[0]!.stats.cf;
    expect(await colourRange()).toEqual([sig6(cf.min), sig6(cf.max)]);
    expect(await page.locator('.legend').innerText()).toMatch(/c_f on part 1/);
    await choose('quantity', 'y+', 'Wall quantities');
    // thresholds 1.8 and 5: the pin takes them (one undo step), numbers the verb's
    const steps = () => page.evaluate(() => Number(document.body.dataset['undoSteps'] ?? 0));
    const before = await steps();
    await setText('y+ thresholds', '1.8, 5', 'Wall quantities');
    await page.waitForSelector('[data-pin="wall-1"] [data-quantity="yPlusAbove.1.8"]');
    await settle();
    const w2 = cliWall('1.8,5');
    const share = w2.yPlusAbove[0]!.areaShare;
    expect(share).toBeGreaterThan(0.05);
    expect(share).toBeLessThan(0.95);
    expect(await pinNumber('wall-1', 'yPlusAbove.1.8')).toBe(sig4(share));
    expect(await steps()).toBeGreaterThan(before);
    await shot('d04-wall-thresholds');
    await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
    await page.keyboard.press('Control+z');
    await page.waitForSelector('[data-pin="wall-1"] [data-quantity="yPlusAbove.1"]');
    await settle();
    expect(await pinNumber('wall-1', 'yPlusAbove.1')).toBe(sig4(w.yPlusAbove[0]!.areaShare));
    // the saved probe set holds it as a `wall` probe
    const saved = JSON.parse(await downloadOf(() => page.getByText('save probe set (JSON)').click())) as { probes: { id: string; kind: string; geometry: unknown; options: unknown }[] };
    expect(saved.probes.find((p) => p.id === 'wall-1')).toMatchObject({ kind: 'wall', geometry: { surfaces: ['part 1'] }, options: { thresholds: [1, 5] } });
  });

  it('the wall tool takes surfaces by what they are: a name matching nothing names the known groups; the wall by its area is pinned, equal to the verb, and the set keeps the selector', async () => {
    const rho = 998.207, mu = 0.0010016;
    const wall = page.locator('.lil-gui', { has: page.locator(':scope > .lil-title', { hasText: 'Wall quantities' }) });
    const field = (label: string) => wall.locator('.lil-controller', { has: page.locator('.lil-name', { hasText: new RegExp(`^${label.replace(/[[\]]/g, '\\$&')}$`) }) }).locator('input');
    const take = async () => { await wall.locator('.lil-name', { hasText: /^take matching surfaces$/ }).click(); await settle(); };
    await wall.locator('.lil-title', { hasText: /^choose surfaces by what they are$/ }).click();
    // a name no group has: refused on the banner, naming the known groups; the panel keeps its group
    await field('name is').fill('outlet');
    await take();
    await page.waitForSelector('.banner[data-kind=error]');
    expect(await page.locator('.banner-text').innerText()).toMatch(/^Wall quantities: no surface group named "outlet" \(known: 0 "part 0" \(area [\d.e-]+\), 1 "part 1" \(area [\d.e-]+\), 2 "part 2" \(area [\d.e-]+\)\)/);
    await page.locator('.banner-close').click();
    expect(await control('surfaces', 'Wall quantities').locator('input').inputValue()).toBe('part 1');
    // the wall by its area (6.3e-3 m², each end 3.1e-4 m²): only the wall is that large
    await field('name is').fill('');
    await field('area from [m²]').fill('0.005');
    await take();
    expect(await control('surfaces', 'Wall quantities').locator('input').inputValue()).toBe('part 1 (area 0.005 … ∞)');
    await control('colour the group by it', 'Wall quantities').locator('button').click();
    await settle();
    expect(await page.locator('.legend').innerText()).toMatch(/on part 1 \(area 0\.005 … ∞\)/);
    await control('pin statistics of the group', 'Wall quantities').locator('button').click();
    await page.waitForSelector('[data-pin="wall-2"] [data-quantity="wallShear.mean"]');
    await settle();
    expect(await page.locator('[data-pin="wall-2"] .pin-title').innerText()).toBe('Wall part 1 (area 0.005 … ∞)');
    // the verb chooses the same wall by the same selector; its numbers are the pin's
    const w = (cli('wall', PIPE, '--groups-area-from', '0.005', '--rho', String(rho), '--mu', String(mu), '--speed', '1') as {
      groups: { id: number; stats: { shearMagnitude: { mean: number }; yPlus: { mean: number } } }[];
    }).groups;
    expect(w.map((g) => g.id)).toEqual([1]);
    expect(await pinNumber('wall-2', 'wallShear.mean')).toBe(sig4(w[0]!.stats.shearMagnitude.mean));
    expect(await pinNumber('wall-2', 'yPlus.mean')).toBe(sig4(w[0]!.stats.yPlus.mean));
    // Hagen–Poiseuille τ_w = 4μV/R (White, Fluid Mechanics, §6.9); the 24-faceted wall puts the mean 0.9 % low
    expect(Math.abs(await pinNumber('wall-2', 'wallShear.mean') / (4 * mu * e.V / e.R) - 1)).toBeLessThan(0.01);
    await shot('d04b-wall-by-area');
    // the saved set keeps the selector, not the group's name or number
    const saved = JSON.parse(await downloadOf(() => page.getByText('save probe set (JSON)').click())) as { probes: { id: string; kind: string; geometry: unknown }[] };
    expect(saved.probes.find((p) => p.id === 'wall-2')).toMatchObject({ kind: 'wall', geometry: { surfaces: [{ areaFrom: 0.005 }] } });
    // a group from the list replaces the selector
    await choose('surface group', 'part 0', 'Wall quantities');
    expect(await control('surfaces', 'Wall quantities').locator('input').inputValue()).toBe('part 0');
    await choose('surface group', 'part 1', 'Wall quantities');
  });

  it('formulas: errors name the column, a defined formula is a field everywhere, saved, undone, kept over a reload and removed', async () => {
    const folder = page.locator('.formula-editor');
    const define = async (name: string, expression: string, unit = '') => {
      await page.fill('#formula-name', name);
      await page.fill('#formula-expression', expression);
      await page.fill('#formula-unit', unit);
      await page.click('#formula-add');
      await settle();
    };
    // a parse error: the core parser's column and expected token, with a caret under the column
    await define('dynp', '0.5 * ref.density * * dot(velocity, velocity)', 'Pa');
    expect(await page.locator('#formula-error .formula-message').innerText()).toMatch(/column 21: .*expected/);
    expect(await page.locator('#formula-error .formula-caret').innerText()).toBe('0.5 * ref.density * * dot(velocity, velocity)\n                    ^');
    await shot('d05-formula-error');
    // a unit that does not match the expression's is refused by the worker's check
    await define('dynp', '0.5 * ref.density * dot(velocity, velocity)', 'm/s');
    expect(await page.locator('#formula-error .formula-message').innerText()).toMatch(/the expression gives Pa, but the declared unit is m\/s/);
    expect(await folder.locator('.formula-row').count()).toBe(0);
    // a field the file lacks
    await define('bad', 'temperature * 2');
    expect(await page.locator('#formula-error .formula-message').innerText()).toMatch(/temperature/);
    const before = await page.evaluate(() => Number(document.body.dataset['undoSteps'] ?? 0));
    await define('dynp', '0.5 * ref.density * dot(velocity, velocity)', 'Pa');
    expect(await page.locator('#formula-error').isHidden()).toBe(true);
    expect(await folder.locator('.formula-row[data-formula="dynp"]').innerText()).toMatch(/dynp = 0\.5 \* ref\.density \* dot\(velocity, velocity\)\s*\[Pa\]/);
    // a field in every chooser: colour, and the cut-plane's pressure choice
    await choose('field', 'dynp (points)', 'Colour');
    const rho = Number(await control('ref. density ρ [kg/m³]').locator('input').inputValue());
    // ½ρ|u|² peaks on the axis, u = 2V
    expect((await colourRange())[1]).toBe(sig6(0.5 * rho * 4 * e.V * e.V));
    expect(await control('pressure field', 'Cut-plane').locator('select option').allInnerTexts()).toContain('dynp (point)');
    // a line probe samples it (and the derived fields made so far), column by column in its CSV
    await page.getByText('+ new line probe').click();
    await page.waitForSelector('[data-pin="line-1"]');
    await settle();
    const [d] = await Promise.all([page.waitForEvent('download'), page.locator('.chart-csv').click()]);
    const header = readFileSync((await d.path())!, 'utf8').trim().split('\n')[2]!.split(',');
    expect(header.some((h) => h.startsWith('dynp'))).toBe(true);
    expect(header.some((h) => h.startsWith('cp'))).toBe(true);
    await shot('d06-formula-colour');
    await page.waitForFunction((n) => Number(document.body.dataset['undoSteps'] ?? 0) > n, before);
    const saved = JSON.parse(await downloadOf(() => page.getByText('save probe set (JSON)').click())) as { formulas?: unknown[] };
    expect(saved.formulas).toEqual([{ name: 'dynp', expression: '0.5 * ref.density * dot(velocity, velocity)', unit: 'Pa' }]);
    // undo (after undoing the line probe) removes it, redo brings it back
    await page.evaluate(() => (document.activeElement as HTMLElement | null)?.blur());
    await page.keyboard.press('Control+z');
    await page.waitForFunction(() => !document.querySelector('[data-pin="line-1"]'));
    await settle();
    expect(await folder.locator('.formula-row').count()).toBe(1);
    await page.keyboard.press('Control+z');
    await settle();
    expect(await folder.locator('.formula-row').count()).toBe(0);
    expect(await control('field', 'Colour').locator('select option').allInnerTexts()).not.toContain('dynp (points)');
    await page.keyboard.press('Control+y');
    await settle();
    expect(await folder.locator('.formula-row[data-formula="dynp"]').count()).toBe(1);
    // kept over a reload (the stored probe set), on the same file
    await page.waitForTimeout(400);
    await page.reload();
    await waitIdle(page, 90_000);
    await openFile(PIPE, 'pipe-medium.vtu');
    expect(await folder.locator('.formula-row[data-formula="dynp"]').count()).toBe(1);
    expect(await control('field', 'Colour').locator('select option').allInnerTexts()).toContain('dynp (points)');
    expect(await page.locator('[data-pin="wall-1"]').count()).toBe(1);
    // the pin of the wall chosen by its area is back, found by the selector
    await page.waitForSelector('[data-pin="wall-2"] [data-quantity="wallShear.mean"]');
    // removed
    await folder.locator('button[data-remove-formula="dynp"]').click();
    await settle();
    expect(await folder.locator('.formula-row').count()).toBe(0);
    expect(await control('field', 'Colour').locator('select option').allInnerTexts()).not.toContain('dynp (points)');
  });
});
