/**
 * Series in the app (Debian chromium, headless): a `.pvd` collection opens with a time bar; stepping, jumping
 * to a time and playing show the steps with the probes re-evaluated; the history of a probe quantity is
 * computed in the worker with progress, charted, and its window statistics pinned beside the probe; dragging
 * on the chart sets the window; a long evaluation can be cancelled. The app's statistics are checked against
 * the same core run in Node (src/series + src/stats), whose own checks against the exact Taylor–Green
 * solution and closed forms live in tests/series and tests/stats. Screenshots go to tests/.screenshots/.
 */
import { mkdtempSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { nodeSeriesFiles, openSeriesInput } from '../../src/cli/seriesInputs.ts';
import { evaluateSeries } from '../../src/series/evaluateSeries.ts';
import { readFileSync, statSync } from 'node:fs';
import { readProbeSet } from '../../src/study/probeSetFile.ts';
import { vortexMesh, vortexStep, VORTEX_DEFAULTS } from '../../src/samples/taylorGreen.ts';
import { windowStatistics } from '../../src/stats/windowStats.ts';
import { dominantFrequency } from '../../src/stats/spectrum.ts';
import { parseFormatted } from '../../src/ui/format.ts';
import { REPO, waitIdle, type Browser } from './browser.ts';
import { openAppForTests, pageTools } from './appPage.ts';

const SERIES = join(REPO, 'sample-fields/vortex-cell');
const PROBES = join(REPO, 'examples/vortex-cell.probes.json');

let browser: Browser;
let page: Page;
const { shot } = pageTools(() => page);

async function waitStep(i: number): Promise<void> {
  await page.waitForFunction((s) => document.body.dataset['step'] === s && document.querySelector('.time-bar')?.getAttribute('data-busy') !== 'true', String(i), { timeout: 60_000 });
  await waitIdle(page);
}

/** The history of `column` (probe.key) over the series, computed by the core in Node. */
async function coreHistory(column: string): Promise<{ time: Float64Array; values: Float64Array }> {
  const index = await openSeriesInput([join(SERIES, 'cells.pvd')]);
  const set = readProbeSet(readFileSync(PROBES, 'utf8'), PROBES).set;
  const table = await evaluateSeries(index, nodeSeriesFiles, set);
  const col = table.columns.find((c) => `${c.probe}.${c.key}` === column)!;
  return { time: table.time, values: col.values };
}

async function pinValue(id: string, key: string): Promise<number> {
  const text = await page.locator(`[data-pin="${id}"] [data-quantity="${key}"]`).innerText();
  return parseFormatted(text.split('=')[1]!.trim());
}

openAppForTests((app) => { ({ browser, page } = app); });

describe('series in the app', () => {
  it('opens a .pvd collection with its time bar on the first step', async () => {
    await page.setInputFiles('#file-input', readdirSync(SERIES).filter((f) => /\.(pvd|vtu)$/.test(f)).map((f) => join(SERIES, f)));
    await page.waitForFunction(() => document.body.dataset['series'] === '8', undefined, { timeout: 60_000 });
    await waitStep(0);
    expect(await page.locator('.time-bar .step-readout').innerText()).toBe('step 1 of 8 · t = 0 s (times from the collection)');
    expect(await page.locator('#file-summary').innerText()).toMatch(/^cells-0\.vtu/);
    await page.setInputFiles('#probe-set-input', PROBES);
    await page.waitForSelector('[data-pin="quarter"]', { timeout: 60_000 });
    await waitIdle(page);
    await shot('series-01-opened');
  });

  it('steps, jumps to a time and plays; the probes follow the step', async () => {
    const q0 = await pinValue('quarter', 'volumeFlowRate');
    await page.locator('.time-bar .step-forward').click();
    await waitStep(1);
    expect(await page.locator('#file-summary').innerText()).toMatch(/^cells-1\.vtu/);
    // the step's own file size, not "0 B read"
    const kB = (statSync(join(SERIES, 'cells-1.vtu')).size / 1000).toPrecision(3);
    expect(await page.locator('#file-summary').innerText()).toContain(` — ${kB} kB read in `);
    await page.locator('.time-bar .jump-time').fill('0.52');
    await page.locator('.time-bar .jump-time').press('Enter');
    await waitStep(4);
    expect(await page.locator('.time-bar .step-readout').innerText()).toBe('step 5 of 8 · t = 0.5 s (times from the collection)');
    await page.waitForSelector('[data-pin="quarter"]');
    await waitIdle(page);
    // the flow through the quarter plane decays as e^{−2νk²t} (Taylor & Green 1937): at t = 0.5 s by e^{−0.394784}
    const q4 = await pinValue('quarter', 'volumeFlowRate');
    expect(q4 / q0).toBeCloseTo(Math.exp(-0.789568 * 0.5), 3);
    await page.locator('.time-bar .play-rate').selectOption('25');
    await page.locator('.time-bar .play').click();
    await page.waitForFunction(() => document.body.dataset['step'] === '7' && document.querySelector('.time-bar .play')?.textContent === 'Play', undefined, { timeout: 60_000 });
    await waitIdle(page);
    expect(await page.locator('#file-summary').innerText()).toMatch(/^cells-7\.vtu/);
    await shot('series-02-last-step');
  });

  it('computes a history in the background, charts it and pins mean ± uncertainty beside the probe', async () => {
    await page.locator('.history-quantity').selectOption('quarter.volumeFlowRate');
    await page.locator('.history-compute').click();
    await page.waitForFunction(() => document.querySelector('.history-pane')?.getAttribute('data-busy') === 'false' && !!document.querySelector('.history-plot svg'), undefined, { timeout: 60_000 });
    await page.waitForSelector('[data-pin="quarter~time-mean"]');
    await waitIdle(page);
    const core = await coreHistory('quarter.volumeFlowRate');
    const from = Number(await page.locator('.history-pane').getAttribute('data-from'));
    const to = Number(await page.locator('.history-pane').getAttribute('data-to'));
    expect(to).toBe(1.7);
    const w = windowStatistics(core.time, core.values, from, to);
    expect(await pinValue('quarter~time-mean', 'volumeFlowRate.mean')).toBeCloseTo(Number(w.mean.toPrecision(4)), 15);
    expect(await pinValue('quarter~time-mean', 'volumeFlowRate.halfWidth95')).toBeCloseTo(Number(w.meanUncertainty.halfWidth95.toPrecision(4)), 15);
    expect(await page.locator('.history-stats .method').innerText()).toMatch(/Bayley & Hammersley 1946|Schmeiser 1982/);
    await shot('series-03-history');
  });

  it('a drag across the chart sets the statistics window', async () => {
    const box = (await page.locator('.history-plot svg').boundingBox())!;
    await page.mouse.move(box.x + box.width * 0.35, box.y + box.height * 0.5);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.6, box.y + box.height * 0.5, { steps: 5 });
    await page.mouse.move(box.x + box.width * 0.9, box.y + box.height * 0.5, { steps: 5 });
    await page.mouse.up();
    await page.waitForFunction(() => /set by hand/.test(document.querySelector('.history-stats .window')?.textContent ?? ''));
    await waitIdle(page);
    const from = Number(await page.locator('.history-pane').getAttribute('data-from'));
    const to = Number(await page.locator('.history-pane').getAttribute('data-to'));
    // plot frame: 74 px left margin, 18 px right margin (src/study/historyPlot.ts), time 0…1.7 s
    const tAt = (f: number) => ((f * box.width - 74) / (box.width - 92)) * 1.7;
    expect(from).toBeCloseTo(tAt(0.35), 1);
    expect(to).toBeCloseTo(tAt(0.9), 1);
    const core = await coreHistory('quarter.volumeFlowRate');
    const w = windowStatistics(core.time, core.values, from, to);
    expect(await pinValue('quarter~time-mean', 'volumeFlowRate.mean')).toBeCloseTo(Number(w.mean.toPrecision(4)), 15);
    await shot('series-04-window-dragged');
    await page.locator('.history-auto').click();
    await page.waitForFunction(() => /start by MSER/.test(document.querySelector('.history-stats .window')?.textContent ?? ''));
    // stepping keeps the chosen quantity and the pinned statistics
    await page.locator('.time-bar .step-back').click();
    await waitStep(6);
    await page.waitForSelector('[data-pin="quarter~time-mean"]');
    expect(await page.locator('.history-quantity').inputValue()).toBe('quarter.volumeFlowRate');
  });

  it('a long history can be cancelled, keeping the view usable', async () => {
    // 40 uneven steps of a 150×150 vortex cell, written for this test (invented demo series, Taylor–Green fields)
    const dir = mkdtempSync(join(tmpdir(), 'fieldtally-series-'));
    try {
      const o = { ...VORTEX_DEFAULTS, cells: 150 }, mesh = vortexMesh(o);
      const paths: string[] = [];
      for (let i = 0; i < 40; i++) {
        const name = `tray_${String(i).padStart(3, '0')}.vtu`;
        // vortexStep writes the time as TimeValue field data: the app takes the times from it
        const d = vortexStep(0.04 * i + 0.01 * (i % 3), o, mesh, name);
        writeFileSync(join(dir, name), writeVtu(d, { encoding: 'zlib' }));
        paths.push(join(dir, name));
      }
      await page.setInputFiles('#file-input', paths);
      await page.waitForFunction(() => document.body.dataset['series'] === '40', undefined, { timeout: 60_000 });
      await waitStep(0);
      await page.locator('.history-quantity').selectOption('quarter.volumeFlowRate');
      await page.locator('.history-compute').click();
      await page.waitForFunction(() => /step [1-9]\d* of 40/.test(document.querySelector('.history-progress')?.textContent ?? ''), undefined, { timeout: 60_000 });
      await shot('series-05-history-progress');
      await page.locator('.history-cancel').click();
      await page.waitForFunction(() => /History cancelled/.test(document.querySelector('.history-stats')?.textContent ?? ''), undefined, { timeout: 60_000 });
      // the view still steps after the cancel
      await page.locator('.time-bar .step-forward').click();
      await waitStep(1);
      expect(await page.locator('#file-summary').innerText()).toMatch(/^tray_001\.vtu/);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('an oscillating series: the spectrum view and the dominant frequency match the imposed tone', async () => {
    // invented demo series: the vortex cell's t = 0 field scaled by 1 + 0.3·sin(2π·2.5·t) at 60 uneven times, so
    // the flow through the quarter plane is Q0(1 + 0.3 sin 2π·2.5t) exactly (the plane integral is linear in the field)
    const dir = mkdtempSync(join(tmpdir(), 'fieldtally-tone-'));
    try {
      const paths: string[] = [];
      const mesh = vortexMesh(VORTEX_DEFAULTS);
      for (let i = 0; i < 60; i++) {
        const t = 0.07 * i + 0.02 * Math.sin(1.7 * i);
        const name = `tone_${String(i).padStart(2, '0')}.vtu`;
        const d = vortexStep(0, VORTEX_DEFAULTS, mesh, name);
        const g = 1 + 0.3 * Math.sin(2 * Math.PI * 2.5 * t);
        for (const f of d.pieces[0]!.pointData) for (let k = 0; k < f.values.length; k++) f.values[k] = f.values[k]! * g;
        writeFileSync(join(dir, name), writeVtu({ ...d, fieldData: [{ ...d.fieldData[0]!, values: Float64Array.of(t) }] }, { encoding: 'zlib' }));
        paths.push(join(dir, name));
      }
      await page.setInputFiles('#file-input', paths);
      await page.waitForFunction(() => document.body.dataset['series'] === '60', undefined, { timeout: 60_000 });
      await waitStep(0);
      await page.locator('.history-quantity').selectOption('quarter.volumeFlowRate');
      await page.locator('.history-compute').click();
      await page.waitForFunction(() => /dominant frequency/.test(document.querySelector('.history-stats')?.textContent ?? ''), undefined, { timeout: 120_000 });
      await page.locator('.history-view').click();
      await page.waitForSelector('.history-plot svg path.spectrum');
      await waitIdle(page);
      await shot('series-06-spectrum');
      const text = await page.locator('.history-stats .frequency').innerText();
      const f = parseFormatted(/dominant frequency (\S+) Hz/.exec(text)![1]!);
      expect(f).toBeCloseTo(2.5, 3);
      // the same core in Node, on the same files and window: frequency and amplitude agree to the digits shown
      const index = await openSeriesInput(paths);
      const table = await evaluateSeries(index, nodeSeriesFiles, readProbeSet(readFileSync(PROBES, 'utf8'), PROBES).set);
      const col = table.columns.find((c) => c.probe === 'quarter' && c.key === 'volumeFlowRate')!;
      const from = Number(await page.locator('.history-pane').getAttribute('data-from'));
      const s = dominantFrequency(table.time, col.values, from)!;
      expect(Math.abs(s.frequency - 2.5)).toBeLessThan(1e-6 * 2.5);
      expect(s.amplitude / (0.3 * col.values[0]! / (1 + 0.3 * Math.sin(2 * Math.PI * 2.5 * table.time[0]!)))).toBeCloseTo(1, 6);
      const amp = parseFormatted(/amplitude (\S+)/.exec(text)![1]!);
      expect(amp).toBeCloseTo(Number(s.amplitude.toPrecision(4)), 15);
      await page.locator('.history-view').click();
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('asked nothing of the network and logged no error', () => {
    expect(browser.blocked).toEqual([]);
    expect(browser.errors).toEqual([]);
  });
});
