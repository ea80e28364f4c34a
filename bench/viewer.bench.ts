/**
 * Viewer benchmark, in Debian's headless chromium with software WebGL, on the 1M-cell files of
 * `sample-fields/large/` (written by the sample generator when missing). For each file: file chosen → first
 * coloured picture (twice: the first load also warms the engine's compiled code), then a new cut-plane until
 * its pin is drawn, a drag of the plane's knob (each step from its request to the frame showing it), and a
 * new line probe until its pin and chart are drawn. A drag step is the cut's picture (`cutDrawing`); its
 * numbers follow (`cut`) when no newer step waits, and are reported apart. Each figure is split into worker compute, transfer
 * (request and reply crossing, waiting in the worker's queue included) and drawing, from the app's
 * `fieldtally:call` marks (src/app/callTiming.ts). Goals (seconds): load ≤ 2.0 raw / 2.5 zlib, cut-plane ≤ 0.6,
 * drag step ≤ 0.2, line probe ≤ 0.6. Reports JSON, with the machine's load average before and after: the
 * figures are wall-clock times and move with whatever else runs; each stage also gives the CPU seconds the
 * browser's processes used for it (includes waiting-for-idle frames), which the load moves far less.
 */
import { existsSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { loadavg } from 'node:os';
import { join } from 'node:path';
import type { Page } from 'playwright-core';
import type { CallTiming } from '../src/app/callTiming.ts';
import { writeLargeFields, LARGE_DIR } from '../src/samples/makeFields.ts';
import { buildApp, launch, serveFolder, waitIdle } from '../tests/system/browser.ts';

/** The 1M-cell files timed: hexahedra and tetrahedra, raw and zlib-compressed appended data. */
const ALL_FILES = ['pipe-hex-1M.appended-raw.vtu', 'pipe-hex-1M.appended-zlib.vtu', 'sphere-tet-1M.appended-raw.vtu', 'sphere-tet-1M.appended-zlib.vtu'];

/** `FIELDTALLY_VIEWER_FILES=a,b` times only those of the files (names as above), e.g. while working on one of them. */
const FILES = (() => {
  const only = process.env['FIELDTALLY_VIEWER_FILES']?.split(',').map((s) => s.trim()).filter(Boolean);
  if (!only?.length) return ALL_FILES;
  const unknown = only.filter((f) => !ALL_FILES.includes(f));
  if (unknown.length) throw new Error(`FIELDTALLY_VIEWER_FILES: unknown file(s) ${unknown.join(', ')} (known: ${ALL_FILES.join(', ')})`);
  return only;
})();

/** Goals in seconds (issue 13, item 9). */
const GOALS = { loadRaw: 2.0, loadZlib: 2.5, newCutPlane: 0.6, dragStep: 0.2, firstLineProbe: 0.6 };

/** Knob moves in one drag, pixels per move, and the pause between moves (ms: about a pointer's event rate while dragging slowly). */
const DRAG_MOVES = 12, DRAG_PIXELS = 6, DRAG_PAUSE_MS = 40;

/** A call's time split into parts (seconds, 3 decimals). */
interface Split { seconds: number; workerCompute?: number; transfer?: number; drawing?: number }

const s3 = (ms: number) => Number((ms / 1000).toFixed(3));

function split(t: CallTiming, from = t.sentAt): Split {
  const end = t.drawnAt ?? t.receivedAt;
  const out: Split = { seconds: s3(end - from) };
  if (t.startedAt !== undefined && t.finishedAt !== undefined) {
    out.workerCompute = s3(t.finishedAt - t.startedAt);
    out.transfer = s3(t.startedAt - t.sentAt + t.receivedAt - t.finishedAt);
  }
  if (t.drawnAt !== undefined) out.drawing = s3(t.drawnAt - t.receivedAt);
  return out;
}

async function calls(page: Page): Promise<CallTiming[]> {
  return page.evaluate(() => performance.getEntriesByName('fieldtally:call').map((e) => (e as PerformanceMark).detail as CallTiming));
}

async function clearMarks(page: Page): Promise<void> {
  await page.evaluate(() => { performance.clearMarks(); (window as unknown as { __longTasks: unknown[] }).__longTasks.length = 0; });
}

async function longestTask(page: Page): Promise<number> {
  return page.evaluate(() => Math.max(0, ...(window as unknown as { __longTasks: { duration: number }[] }).__longTasks.map((t) => t.duration)));
}

/** File chosen → first coloured picture, with the worker calls on the way. */
async function timeLoad(page: Page, path: string): Promise<Record<string, unknown>> {
  await clearMarks(page);
  await page.setInputFiles('#file-input', path);
  await page.waitForFunction(() => performance.getEntriesByName('fieldtally:coloured').length > 0, undefined, { timeout: 180_000 });
  await waitIdle(page);
  // (no named functions inside page.evaluate: the bundler's name helper does not exist in the page)
  const r = await page.evaluate(() => ({
    marks: ['fieldtally:files-chosen', 'fieldtally:coloured', 'fieldtally:surface-uploaded'].map((n) => performance.getEntriesByName(n)[0]?.startTime),
    summary: document.getElementById('file-summary')!.textContent, origin: performance.timeOrigin,
  }));
  const [chosenMs, colouredMs, uploadedMs] = r.marks as [number, number, number | undefined];
  const all = await calls(page);
  const byName = (w: string) => all.find((c) => c.what === w);
  const parts: Record<string, Split> = {};
  for (const w of ['load', 'surface', 'surfaceValues']) { const c = byName(w); if (c) parts[w] = split(c); }
  return {
    seconds: s3(colouredMs - chosenMs), calls: parts,
    phases: loadPhases(byName('load'), byName('surface'), byName('surfaceValues'), { chosen: r.origin + chosenMs, coloured: r.origin + colouredMs, ...(uploadedMs !== undefined ? { uploaded: r.origin + uploadedMs } : {}) }),
    ...(uploadedMs !== undefined ? { surfaceUploadedAfterSeconds: s3(uploadedMs - chosenMs) } : {}),
    longestMainThreadTaskMs: await longestTask(page), summary: r.summary,
  };
}

/**
 * The load's phases in seconds, from the worker's own split (`WorkerStamps.phases`) and the page's marks (ms
 * since the epoch): until the load call starts; in the worker: reading and decoding the file (with when its
 * last byte arrived and how long the reader waited for bytes), load report, boundary faces, surface groups;
 * the surface's triangles and outline; the values to colour them; uploading the surface to the GPU after
 * its reply; and the first frame after both.
 */
function loadPhases(load: CallTiming | undefined, surface: CallTiming | undefined, values: CallTiming | undefined,
  page: { chosen: number; coloured: number; uploaded?: number }): Record<string, number> {
  const out: Record<string, number> = {};
  const ms = (k: string, v: number | undefined) => { if (v !== undefined && Number.isFinite(v)) out[k] = s3(v); };
  if (load) {
    ms('beforeLoadCall', (load.startedAt ?? load.sentAt) - page.chosen);
    for (const [k, v] of Object.entries(load.phases ?? {})) ms(`load.${k}`, v);
  }
  if (surface) for (const [k, v] of Object.entries(surface.phases ?? {})) ms(`surface.${k}`, v);
  if (values?.startedAt !== undefined && values.finishedAt !== undefined) ms('surfaceValues', values.finishedAt - values.startedAt);
  if (surface && page.uploaded !== undefined) ms('upload', page.uploaded - surface.receivedAt);
  const ready = Math.max(page.uploaded ?? -Infinity, values?.receivedAt ?? -Infinity);
  if (Number.isFinite(ready)) ms('firstFrame', page.coloured - ready);
  return out;
}

/** Clicks a panel button and times the probe's first computation until the frame showing it. */
async function timeNewProbe(page: Page, button: string, what: string, id: string): Promise<Split & { longestMainThreadTaskMs: number }> {
  await clearMarks(page);
  await page.getByText(button).click();
  await page.waitForFunction(([w, i]) => performance.getEntriesByName('fieldtally:call').some((e) => {
    const d = (e as PerformanceMark).detail as { what: string; id?: string };
    return d.what === w && d.id === i;
  }), [what, id] as const, { timeout: 60_000 });
  await waitIdle(page);
  const c = (await calls(page)).find((x) => x.what === what && x.id === id)!;
  return { ...split(c), longestMainThreadTaskMs: await longestTask(page) };
}

/** Drags the current plane's knob; every computed step is timed from its request to the frame that shows it. */
async function timeDrag(page: Page): Promise<Record<string, unknown>> {
  await clearMarks(page);
  const knob = await page.evaluate(() => (window as unknown as { __fieldtally: { knobScreen(): [number, number] } }).__fieldtally.knobScreen());
  await page.mouse.move(knob[0], knob[1]);
  await page.mouse.down();
  for (let i = 1; i <= DRAG_MOVES; i++) {
    await page.mouse.move(knob[0], knob[1] - DRAG_PIXELS * i);
    await page.waitForTimeout(DRAG_PAUSE_MS);
  }
  await page.mouse.up();
  await waitIdle(page);
  const all = (await calls(page)).filter((c) => c.drawnAt !== undefined).sort((a, b) => a.sentAt - b.sentAt);
  // a drag step draws the cut (`cutDrawing`); its numbers (`cut`) follow when no newer step waits
  const steps = all.filter((c) => c.what === 'cutDrawing').map((c) => split(c));
  const numbers = all.filter((c) => c.what === 'cut');
  const lastStep = all.filter((c) => c.what === 'cutDrawing').at(-1);
  const median = (xs: number[]) => { const v = [...xs].sort((a, b) => a - b); return v.length ? v[Math.floor((v.length - 1) / 2)]! : NaN; };
  const pick = (k: keyof Split) => median(steps.map((x) => x[k] ?? NaN));
  return {
    moves: DRAG_MOVES, stepsComputed: steps.length,
    medianStep: { seconds: pick('seconds'), workerCompute: pick('workerCompute'), transfer: pick('transfer'), drawing: pick('drawing') },
    slowestStepSeconds: Math.max(...steps.map((x) => x.seconds)), steps: steps.map((x) => x.seconds),
    numbersComputed: numbers.length,
    ...(numbers.length && lastStep ? { lastNumbers: split(numbers.at(-1)!), numbersShownAfterLastStepSeconds: s3(numbers.at(-1)!.drawnAt! - lastStep.sentAt) } : {}),
    longestMainThreadTaskMs: await longestTask(page),
    frames: await frameCosts(page),
  };
}

/** Median cost (ms) of the last software frames: issuing the draw calls, rasterising and reading back, showing. */
async function frameCosts(page: Page): Promise<Record<string, number>> {
  const f = await page.evaluate(() => (window as unknown as { __fieldtally: { frameTimes(): { draw: number; raster: number; show: number }[] } }).__fieldtally.frameTimes());
  const med = (xs: number[]) => { const v = [...xs].sort((a, b) => a - b); return v.length ? Math.round(v[Math.floor((v.length - 1) / 2)]!) : NaN; };
  return { count: f.length, drawMs: med(f.map((x) => x.draw)), rasterMs: med(f.map((x) => x.raster)), showMs: med(f.map((x) => x.show)) };
}

/**
 * CPU time (s) used so far by this process's descendants (the browser's processes: page, workers' host,
 * GPU process with the software rasteriser), from /proc; 0 where /proc is not there. Less moved by the
 * machine's load than wall-clock time.
 */
function browserCpuSeconds(): number {
  if (!existsSync('/proc/self/stat')) return 0;
  const parent = new Map<number, number>(), ticks = new Map<number, number>();
  for (const name of readdirSync('/proc')) {
    if (!/^\d+$/.test(name)) continue;
    try {
      const stat = readFileSync(`/proc/${name}/stat`, 'utf8');
      // fields after the command (which may hold spaces) start after the last ')'
      const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
      parent.set(Number(name), Number(f[1]));
      ticks.set(Number(name), Number(f[11]) + Number(f[12]) + Number(f[13]) + Number(f[14]));
    } catch { /* the process ended meanwhile */ }
  }
  let total = 0;
  for (const [pid, t] of ticks) {
    for (let p = parent.get(pid); p !== undefined && p > 1; p = parent.get(p)) if (p === process.pid) { total += t; break; }
  }
  return total / CLOCK_TICKS;
}

/** Linux's clock ticks per second of /proc/<pid>/stat times (USER_HZ, 100 on every mainstream build). */
const CLOCK_TICKS = 100;

/** Runs one step, saying on stderr which (the bench takes minutes) and naming it in an error; adds the browser's CPU seconds for it. */
async function stage<T extends object>(what: string, f: () => Promise<T>): Promise<T & { browserCpuSeconds: number }> {
  process.stderr.write(`viewer bench: ${what}\n`);
  const cpu0 = browserCpuSeconds();
  try {
    const r = await f();
    return { ...r, browserCpuSeconds: Number((browserCpuSeconds() - cpu0).toFixed(2)) };
  } catch (e) { throw new Error(`${what}: ${(e as Error).message.split('\n')[0]}`); }
}

export async function run(): Promise<Record<string, unknown>> {
  if (ALL_FILES.some((f) => !existsSync(join(LARGE_DIR, f)))) writeLargeFields(LARGE_DIR, true);
  const loadBefore = loadavg();
  const dist = buildApp();
  const server = await serveFolder(dist);
  const browser = await launch();
  const page = browser.page;
  const results: Record<string, unknown>[] = [];
  try {
    await page.goto(server.url);
    await waitIdle(page, 120_000);
    const isolated = await page.evaluate(() => globalThis.crossOriginIsolated === true);
    for (const name of FILES) {
      const path = join(LARGE_DIR, name);
      const loadGoal = name.includes('zlib') ? GOALS.loadZlib : GOALS.loadRaw;
      const first = await stage(`${name}: first load`, () => timeLoad(page, path));
      const repeat = await stage(`${name}: repeated load`, () => timeLoad(page, path));
      const cut = await stage(`${name}: new cut-plane`, () => timeNewProbe(page, '+ new cut-plane', 'cut', 'plane-1'));
      const drag = await stage(`${name}: drag`, () => timeDrag(page));
      const line = await stage(`${name}: new line probe`, () => timeNewProbe(page, '+ new line probe', 'sample', 'line-1'));
      // the next file starts with no probes (the probe-set tool would carry these over and re-evaluate them)
      await page.getByText('remove all probes').click();
      await waitIdle(page);
      const dragStep = (drag['medianStep'] as Split).seconds;
      results.push({
        file: name, bytes: statSync(path).size, crossOriginIsolated: isolated,
        load: { first, repeat, goalSeconds: loadGoal },
        newCutPlane: { ...cut, goalSeconds: GOALS.newCutPlane },
        drag: { ...drag, goalSeconds: GOALS.dragStep },
        firstLineProbe: { ...line, goalSeconds: GOALS.firstLineProbe },
        meetsGoals: {
          load: (repeat['seconds'] as number) <= loadGoal, newCutPlane: cut.seconds <= GOALS.newCutPlane,
          dragStep: dragStep <= GOALS.dragStep, firstLineProbe: line.seconds <= GOALS.firstLineProbe,
        },
      });
    }
  } finally {
    await browser.close();
    await server.close();
    rmSync(dist, { recursive: true, force: true });
  }
  return {
    benchmark: 'viewer at 1M cells (headless chromium, software WebGL): load, new cut-plane, drag step, first line probe; seconds split into worker compute, transfer and drawing',
    loadAverageBefore: loadBefore.map((x) => Number(x.toFixed(2))), loadAverageAfter: loadavg().map((x) => Number(x.toFixed(2))),
    results,
  };
}
