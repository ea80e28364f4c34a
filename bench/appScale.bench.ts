/**
 * The app with a 10M-cell file: Debian's headless chromium with software WebGL opens the scale benchmark's
 * 10M-hexahedron lattice (appended raw, about 1.3 GB; written to bench/out/ and deleted at the end, also after
 * a failure), then adds a cut-plane and a line probe. It answers the memory question of issue 12 with
 * figures: whether the app asked before opening, how long file chosen → first coloured picture took, and the
 * browser's resident memory (the page's process, whose workers are threads of it, and all of chromium's
 * processes together), sampled every 100 ms from /proc. Wall seconds; memory in MiB (2^20 bytes). The machine's
 * load average is recorded beside: the times move with whatever else runs.
 */
import { readdirSync, readFileSync, rmSync, mkdirSync, statSync } from 'node:fs';
import { loadavg } from 'node:os';
import type { Page } from 'playwright-core';
import { buildApp, launch, serveFolder, waitIdle } from '../tests/system/browser.ts';
import { OUT, writeLattice } from './scale.bench.ts';

/** Resident memory (MiB) of chromium's processes: the largest one (the page's) and all of them together. */
function chromiumResident(): { pageMiB: number; allMiB: number } {
  let all = 0, page = 0;
  for (const name of readdirSync('/proc')) {
    if (!/^\d+$/.test(name)) continue;
    try {
      if (!readFileSync(`/proc/${name}/comm`, 'utf8').includes('chrom')) continue;
      const kb = Number(/VmRSS:\s+(\d+)/.exec(readFileSync(`/proc/${name}/status`, 'utf8'))?.[1] ?? 0);
      all += kb; page = Math.max(page, kb);
    } catch { /* the process ended meanwhile */ }
  }
  return { pageMiB: Math.round(page / 1024), allMiB: Math.round(all / 1024) };
}

/** Peak of `chromiumResident` between `start()` and `stop()`. */
function residentPeak(): { stop: () => { pageMiB: number; allMiB: number } } {
  const peak = { pageMiB: 0, allMiB: 0 };
  const sample = () => { const r = chromiumResident(); peak.pageMiB = Math.max(peak.pageMiB, r.pageMiB); peak.allMiB = Math.max(peak.allMiB, r.allMiB); };
  sample();
  const timer = setInterval(sample, 100);
  return { stop: () => { clearInterval(timer); sample(); return { ...peak }; } };
}

/** Clicks a panel button and waits for the named worker call's result to be drawn; wall seconds. */
async function timeProbe(page: Page, button: string, what: string): Promise<number> {
  const t0 = performance.now();
  await page.getByText(button).click();
  await page.waitForFunction((w) => performance.getEntriesByName('fieldtally:call').some((e) => ((e as PerformanceMark).detail as { what: string }).what === w), what, { timeout: 300_000 });
  await waitIdle(page, 300_000);
  return Number(((performance.now() - t0) / 1000).toFixed(2));
}

export async function run(): Promise<Record<string, unknown>> {
  const loadBefore = loadavg().map((v) => Math.round(v * 10) / 10);
  mkdirSync(OUT, { recursive: true });
  let file = '';
  const dist = buildApp();
  const server = await serveFolder(dist);
  const browser = await launch();
  const page = browser.page;
  try {
    file = writeLattice(1000);
    await page.goto(server.url);
    await waitIdle(page, 120_000);
    const facts = await page.evaluate(() => ({
      crossOriginIsolated: globalThis.crossOriginIsolated === true,
      heapLimitBytes: (performance as unknown as { memory?: { jsHeapSizeLimit: number } }).memory?.jsHeapSizeLimit ?? null,
      workers: navigator.hardwareConcurrency,
    }));
    const idle = chromiumResident();
    await page.evaluate(() => performance.clearMarks());
    const loading = residentPeak();
    const t0 = performance.now();
    await page.setInputFiles('#file-input', file);
    // the app may ask before opening a file bigger than the page's memory: record that, and open anyway
    const asked = await Promise.race([
      page.getByText('Open anyway').waitFor({ timeout: 300_000 }).then(() => true),
      page.waitForFunction(() => performance.getEntriesByName('fieldtally:coloured').length > 0, undefined, { timeout: 300_000 }).then(() => false),
    ]);
    if (asked) await page.getByText('Open anyway').click();
    await page.waitForFunction(() => performance.getEntriesByName('fieldtally:coloured').length > 0, undefined, { timeout: 300_000 });
    await waitIdle(page, 300_000);
    const loadSeconds = Number(((performance.now() - t0) / 1000).toFixed(2));
    const loadPeak = loading.stop();
    const summary = await page.evaluate(() => document.getElementById('file-summary')?.textContent ?? '');
    const probing = residentPeak();
    const newCutPlaneSeconds = await timeProbe(page, '+ new cut-plane', 'cut');
    const newLineProbeSeconds = await timeProbe(page, '+ new line probe', 'sample');
    const probePeak = probing.stop();
    const pin = await page.evaluate(() => [...document.querySelectorAll('.pin')].map((p) => p.textContent ?? ''));
    return {
      benchmark: 'appScale', file: { cells: 10_000_000, bytes: statSync(file).size }, ...facts,
      askedBeforeOpening: asked, loadSeconds, summary, newCutPlaneSeconds, newLineProbeSeconds,
      residentMiB: { idleWithSample: idle, peakWhileLoading: loadPeak, peakWithProbes: probePeak },
      pins: pin, pageErrors: browser.errors,
      loadAverage: { before: loadBefore, after: loadavg().map((v) => Math.round(v * 10) / 10) },
      note: 'wall seconds, one run; resident memory sampled every 100 ms (page = the largest chromium process, the one whose threads run the workers; all = every chromium process, shared pages counted in each)',
    };
  } finally {
    await browser.close();
    await server.close();
    if (file) rmSync(file, { force: true });
  }
}
