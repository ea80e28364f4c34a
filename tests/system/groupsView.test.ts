/**
 * Surface-group labels from the file, surfaces chosen by what they are (name, box, area), the axis triad,
 * per-file view state and pins clear of the banner, in the app (Debian chromium, software WebGL).
 * Screenshots g01–g09 go to tests/.screenshots/ (git-ignored) and were looked at. The named-group fixture was written by VTK 9.1 (tests/reference/group_names.py).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { REPO, waitIdle } from './browser.ts';
import { SCREENSHOTS, openAppForTests, pageTools } from './appPage.ts';
import { readPng } from './png.ts';

const PIPE = join(REPO, 'sample-fields/pipe-medium.vtu');
const SPHERE = join(REPO, 'sample-fields/sphere-stokes.vtu');
const TANK = join(REPO, 'tests/fixtures/group-names/tank-names-binary.vtu');
const TANK_LEGACY = join(REPO, 'tests/fixtures/group-names/tank-ids-binary.vtk');

let page: Page;
const { shot, control, openFile: chooseFile, downloadText } = pageTools(() => page);

const openFile = (path: string, name: string) => chooseFile(path, name, 90_000);
const opacity = async () => Number(await control('surface opacity').locator('input').last().inputValue());
/** The triad's arms on screen: end minus start of each line, and whether it points away. */
const arms = () => page.locator('svg.axis-triad-view g[data-axis]').evaluateAll((gs) => Object.fromEntries(gs.map((g) => {
  const l = g.querySelector('line')!, n = (a: string) => Number(l.getAttribute(a));
  return [g.getAttribute('data-axis'), { dx: n('x2') - n('x1'), dy: n('y2') - n('y1'), away: l.hasAttribute('stroke-dasharray') }];
}))) as Promise<Record<'x' | 'y' | 'z', { dx: number; dy: number; away: boolean }>>;
const overlaps = (a: { x: number; y: number; width: number; height: number }, b: { x: number; y: number; width: number; height: number }) =>
  a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;

openAppForTests((app) => { ({ page } = app); });

describe('groups and view hygiene in the app', () => {
  it('group labels come from the file\'s name table', async () => {
    await openFile(TANK, 'tank-names-binary.vtu');
    const names = await page.locator('.lil-gui', { has: page.locator(':scope > .lil-title', { hasText: 'Surfaces' }) }).locator('.lil-name').allInnerTexts();
    // VTK wrote the name table "zone names" = filler neck, drain for values 1, 2; each unit side has area 1 m²
    expect(names.filter((n) => /m²\)$/.test(n))).toEqual(['filler neck (1.000 m²)', 'drain (1.000 m²)', 'part 3 (1.000 m²)', 'part 4 (1.000 m²)', 'part 5 (1.000 m²)', 'part 6 (1.000 m²)']);
    await shot('g01-group-names');
  });

  it('the axis triad turns with the camera: looking from +x, y points right, z up and x at the viewer', async () => {
    await page.locator('#view-tools button', { hasText: /^\+X$/ }).click();
    await waitIdle(page);
    const a = await arms();
    expect(a.y.dx).toBeGreaterThan(20);
    expect(Math.abs(a.y.dy)).toBeLessThan(1);
    expect(a.z.dy).toBeLessThan(-20);
    expect(Math.abs(a.z.dx)).toBeLessThan(1);
    expect(Math.hypot(a.x.dx, a.x.dy)).toBeLessThan(1);
    expect(a.x.away).toBe(false);
    await page.locator('#view-tools button', { hasText: /^−Z$/ }).click();
    await waitIdle(page);
    // looking from −z (up the z axis), z points into the picture
    expect((await arms()).z.away).toBe(true);
    await page.locator('#view-tools button', { hasText: /^Iso$/ }).click();
    await waitIdle(page);
    const box = (await page.locator('svg.axis-triad-view').boundingBox())!, view = (await page.locator('#view').boundingBox())!;
    expect(box.x + box.width).toBeGreaterThan(view.x + view.width - 100);
    expect(box.y + box.height).toBeGreaterThan(view.y + view.height - 100);
    await shot('g02-triad-iso');
  });

  it('opening another file resets the view (no 0.35 opacity carried over) unless "keep this view" is ticked', async () => {
    await openFile(PIPE, 'pipe-medium.vtu');
    await page.locator('.lil-name', { hasText: /^\+ new cut-plane$/ }).click();
    await page.waitForSelector('[data-pin="plane-1"]');
    await waitIdle(page);
    // a new cut-plane makes the walls see-through
    expect(await opacity()).toBe(0.35);
    await control('colour map').locator('select').selectOption({ index: 1 });
    await waitIdle(page);
    await shot('g03-pipe-plane');
    await openFile(SPHERE, 'sphere-stokes.vtu');
    expect(await opacity()).toBe(1);
    expect(await control('colour map').locator('select').evaluate((s: HTMLSelectElement) => s.selectedIndex)).toBe(0);
    await shot('g04-next-file-reset');
    // kept on request: opacity, camera
    await control('keep this view for the next file').locator('input').check();
    const input = control('surface opacity').locator('input').last();
    await input.fill('0.5');
    await input.press('Enter');
    await page.locator('#view-tools button', { hasText: /^\+Y$/ }).click();
    await waitIdle(page);
    const before = await arms();
    await openFile(PIPE, 'pipe-medium.vtu');
    expect(await opacity()).toBe(0.5);
    expect(await arms()).toEqual(before);
    await control('keep this view for the next file').locator('input').uncheck();
    await shot('g05-view-kept');
  });

  it('pins keep clear of the banner and of the triad; the exported picture carries the triad', async () => {
    await page.locator('#view-tools button', { hasText: /^Iso$/ }).click();
    for (const z of [0.095, 0.05]) {
      await page.locator('.lil-name', { hasText: /^\+ new cut-plane$/ }).click();
      await waitIdle(page);
      const origin = control('origin z [m]').locator('input').last();
      await origin.fill(String(z));
      await origin.press('Enter');
      await waitIdle(page);
    }
    // a file that cannot be read shows an error banner over the top of the view; the open file stays
    const bad = join(tmpdir(), 'fieldtally-broken.vtu');
    writeFileSync(bad, '<VTKFile type="UnstructuredGrid"><UnstructuredGrid><Piece NumberOfPoints="x"');
    await page.setInputFiles('#file-input', bad);
    await page.waitForSelector('.banner:not([hidden])');
    await waitIdle(page);
    const banner = (await page.locator('.banner').boundingBox())!, triad = (await page.locator('svg.axis-triad-view').boundingBox())!;
    const pins = await page.locator('#overlay .pin').evaluateAll((ps) => ps.map((p) => { const r = p.getBoundingClientRect(); return { x: r.x, y: r.y, width: r.width, height: r.height }; }));
    expect(pins.length).toBeGreaterThanOrEqual(2);
    for (const p of pins) { expect(overlaps(p, banner)).toBe(false); expect(overlaps(p, triad)).toBe(false); }
    await shot('g06-banner-pins-clear');

    const [dl] = await Promise.all([page.waitForEvent('download'), page.getByText('save picture (PNG)').click()]);
    const bytes = new Uint8Array(readFileSync((await dl.path())!));
    writeFileSync(join(SCREENSHOTS, 'g07-export-triad.png'), bytes);
    const pic = readPng(bytes);
    // the triad's filled tags (amber x, teal y, violet z; an arm pointing away has a white tag) in the lower
    // right of the picture, above the footer
    const count = (rgb: [number, number, number]) => {
      let n = 0;
      for (let y = Math.round(pic.height * 0.6); y < pic.height; y++) for (let x = Math.round(pic.width * 0.8); x < pic.width; x++) {
        const i = 4 * (y * pic.width + x);
        if (Math.abs(pic.rgba[i]! - rgb[0]) < 6 && Math.abs(pic.rgba[i + 1]! - rgb[1]) < 6 && Math.abs(pic.rgba[i + 2]! - rgb[2]) < 6) n++;
      }
      return n;
    };
    const toward = Object.entries(await arms()).filter(([, a]) => !a.away).map(([k]) => k);
    expect(toward.length).toBeGreaterThanOrEqual(1);
    const rgbOf: Record<string, [number, number, number]> = { x: [0xb4, 0x53, 0x09], y: [0x0f, 0x76, 0x6e], z: [0x6d, 0x28, 0xd9] };
    for (const k of toward) expect(count(rgbOf[k]!)).toBeGreaterThan(20);
  });

  it('a legacy .vtk file\'s FIELD name table labels its groups too', async () => {
    await openFile(TANK_LEGACY, 'tank-ids-binary.vtk');
    const names = await page.locator('.lil-gui', { has: page.locator(':scope > .lil-title', { hasText: 'Surfaces' }) }).locator('.lil-name').allInnerTexts();
    // VTK's legacy writer wrote "zone names" = drain, Überlauf 50% with "zone ids" = 3, 7
    // (tests/reference/legacy_group_names.py); feature parts are numbered after the largest value, 7
    expect(names.filter((n) => /m²\)$/.test(n))).toEqual(['drain (1.000 m²)', 'Überlauf 50% (1.000 m²)', 'part 8 (1.000 m²)', 'part 9 (1.000 m²)', 'part 10 (1.000 m²)', 'part 11 (1.000 m²)']);
    await shot('g08-legacy-group-names');
  });

  it('surfaces chosen by what they are: the force total takes them, the set keeps the selector, another mesh finds the same wall', async () => {
    // the pipe sample's parts (`fieldtally surfaces`): 0 the inlet end (z = 0), 1 the wall (6.27×10⁻³ m²), 2 the outlet end (z = 0.1 m)
    await openFile(PIPE, 'pipe-medium.vtu');
    // the force total's folder (the wall tool has one of the same title)
    const force = page.locator('.lil-gui', { has: page.locator(':scope > .lil-title', { hasText: 'Force total' }) });
    await force.locator('.lil-title', { hasText: /^choose surfaces by what they are$/ }).click();
    const field = (label: string) => force.locator('.lil-controller', { has: page.locator('.lil-name', { hasText: label }) }).locator('input');
    const choose = async () => { await page.locator('.lil-name', { hasText: /^choose matching surfaces$/ }).click(); await waitIdle(page); };
    const chosen = () => control('surfaces', 'Force total').locator('input').inputValue();
    await field('area from [m²]').fill('0.005');
    await choose();
    await page.waitForSelector('[data-pin="force-1"] [data-quantity="CD"]');
    expect(await chosen()).toBe('part 1 (area 0.005 … ∞)');
    await page.waitForTimeout(400);
    const set = JSON.parse(await downloadText(() => page.getByText('save probe set (JSON)').click())) as { probes: { id: string; geometry: { surfaces: unknown[] } }[] };
    expect(set.probes.find((p) => p.id === 'force-1')!.geometry.surfaces).toEqual([{ areaFrom: 0.005 }]);
    await page.locator('.lil-name', { hasText: /^choose matching surfaces$/ }).scrollIntoViewIfNeeded();
    await shot('g09-surfaces-by-area');
    // the outlet end by a box around it, replacing the wall
    await field('area from [m²]').fill('');
    await field('inside box [m]').fill('-1, 1, -1, 1, 0.09, 0.11');
    await choose();
    expect(await chosen()).toBe('part 2 (within x -1 … 1, y -1 … 1, z 0.09 … 0.11)');
    // what cannot be read, or matches nothing, is said and changes nothing
    await field('inside box [m]').fill('0, 1, 0, 1');
    await choose();
    expect(await page.locator('.banner .banner-text').innerText()).toBe('Force total: box: expected six numbers xmin, xmax, ymin, ymax, zmin, zmax, got "0, 1, 0, 1"');
    await field('inside box [m]').fill('');
    await field('name is').fill('outlet');
    await choose();
    expect(await page.locator('.banner .banner-text').innerText()).toMatch(/^Force total: no surface group named "outlet" \(known: 0 "part 0" \(area 0\.000310582854123\), 1 "part 1"/);
    expect(await chosen()).toBe('part 2 (within x -1 … 1, y -1 … 1, z 0.09 … 0.11)');
    await page.locator('.banner .banner-close').click();
    // the finer mesh of the same pipe: the kept set's selector finds its outlet end again
    await openFile(join(REPO, 'sample-fields/pipe-fine.vtu'), 'pipe-fine.vtu');
    await page.waitForSelector('[data-pin="force-1"] [data-quantity="CD"]');
    expect(await chosen()).toBe('part 2 (within x -1 … 1, y -1 … 1, z 0.09 … 0.11)');
  });

  it('face outlines start off for a boundary of over 200 000 faces, and on again for a small one', async () => {
    // a 320 × 320 × 1 slab of hexahedra: 2·320² + 4·320 = 206 080 boundary faces (a pipe of a thousand faces keeps them on)
    const slab = hexGrid(320, 320, 1, (u, v, w) => [u, v, 0.002 * w]);
    const path = join(tmpdir(), `fieldtally-slab-${process.pid}.vtu`);
    writeFileSync(path, writeVtu(datasetOf([withFields(slab, [pointFieldFrom(slab, 'p', 1, (x, y, _z, o) => { o[0] = x * y; })])])));
    await openFile(path, `fieldtally-slab-${process.pid}.vtu`);
    const outlines = () => control('face outlines').locator('input').isChecked();
    expect(await page.locator('#file-summary').innerText()).toMatch(/102,400 cells/);
    expect(await outlines()).toBe(false);
    await shot('g10-outlines-off-large');
    await openFile(PIPE, 'pipe-medium.vtu');
    expect(await outlines()).toBe(true);
  });
});
