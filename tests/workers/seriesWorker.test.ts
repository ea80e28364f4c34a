/**
 * The worker's series calls end to end in a Node worker thread: open the vortex-cell sample series from
 * chosen files (.pvd with its .vtu files, and numbered files with TimeValue), show a step (the load
 * description, its time, the mesh reused from the step shown before), evaluate a probe set over every
 * step with progress — the same table as the command line's path, columns arriving by transfer — and a
 * cancelled evaluation. Exact values of the series: tests/series/taylorGreen.test.ts (Taylor & Green 1937).
 */
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import * as Comlink from 'comlink';
// @ts-expect-error the adapter ships its types beside the .min.mjs only; typed below
import nodeEndpointUntyped from 'comlink/dist/esm/node-adapter.mjs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nodeSeriesFiles, openSeriesInput } from '../../src/cli/seriesInputs.ts';
import { evaluateSeries } from '../../src/series/evaluateSeries.ts';
import { readProbeSet } from '../../src/study/probeSetFile.ts';
import type { ComputeApi, SeriesProgress } from '../../workers/api.ts';

const nodeEndpoint = nodeEndpointUntyped as (w: Worker) => Comlink.Endpoint;
const REPO = join(__dirname, '../..');
const PVD_DIR = join(REPO, 'sample-fields/vortex-cell');
const NUM_DIR = join(REPO, 'sample-fields/vortex-cell-numbered');
const SET = readProbeSet(readFileSync(join(REPO, 'examples/vortex-cell.probes.json'), 'utf8'), 'vortex-cell.probes.json').set;

type Api = ComputeApi & { transferredBytes(): number };
let worker: Worker;
let api: Comlink.Remote<Api>;
const chosen = (dir: string, folder: string) => readdirSync(dir).filter((n) => !n.endsWith('.md')).map((n) => ({ path: `${folder}/${n}`, data: new Uint8Array(readFileSync(join(dir, n))) }));

beforeAll(() => {
  worker = new Worker(new URL('./nodeWorker.mjs', import.meta.url));
  api = Comlink.wrap<Api>(nodeEndpoint(worker));
});
afterAll(async () => { api[Comlink.releaseProxy](); await worker.terminate(); });

describe('series calls of the compute worker', () => {
  it('opens a .pvd series, shows steps reusing the mesh, and evaluates the probe set over every step', async () => {
    const d = await api.openSeries(chosen(PVD_DIR, 'vortex-cell'));
    expect(d.timeSource).toBe('collection');
    expect(d.times).toEqual([0, 0.05, 0.15, 0.3, 0.5, 0.8, 1.2, 1.7]);
    expect(d.stepFiles[2]).toEqual(['vortex-cell/cells-2.vtu']);
    const s2 = await api.showStep(2);
    expect(s2.step).toBe(2);
    expect(s2.time).toBe(0.15);
    expect(s2.meshReused).toBe(false);
    expect(s2.report.cells).toBe(256);
    // the step summary's bytes read are the step file's size (not 0)
    expect(s2.fileBytes).toBe(readFileSync(join(PVD_DIR, 'cells-2.vtu')).length);
    const s3 = await api.showStep(3);
    expect(s3.meshReused).toBe(true);
    expect(s3.fileBytes).toBe(readFileSync(join(PVD_DIR, 'cells-3.vtu')).length);
    expect(s3.groups.map((g) => g.name)).toEqual(s2.groups.map((g) => g.name));
    await expect(api.showStep(8)).rejects.toThrow('step 8: expected a whole number from 0 to 7');

    const progress: SeriesProgress[] = [];
    const before = await api.transferredBytes();
    const t = await api.evaluateSeries(SET, undefined, Comlink.proxy((p: SeriesProgress) => { progress.push(p); }));
    expect((await api.transferredBytes()) - before).toBeGreaterThanOrEqual(8 * 8 * (t.columns.length + 1));
    expect(progress.at(-1)).toEqual({ done: 8, total: 8, time: 1.7 });
    const direct = await evaluateSeries(await openSeriesInput([join(PVD_DIR, 'cells.pvd')]), nodeSeriesFiles, SET);
    expect(t.columns.map((c) => c.name)).toEqual(direct.columns.map((c) => c.name));
    t.columns.forEach((c, i) => expect(Array.from(c.values)).toEqual(Array.from(direct.columns[i]!.values)));
    const w = await api.evaluateSeries(SET, { from: 0.1, to: 1 });
    expect(Array.from(w.time)).toEqual([0.15, 0.3, 0.5, 0.8]);
  });

  it('delivers the last progress before the table, however long the caller takes over it', async () => {
    // the progress callback's port is not ordered with the reply's: the worker waits for the last call
    await api.openSeries(chosen(PVD_DIR, 'vortex-cell'));
    const seen: number[] = [];
    const table = api.evaluateSeries(SET, undefined, Comlink.proxy(async (p: SeriesProgress) => {
      await new Promise((r) => setTimeout(r, 50));
      seen.push(p.done);
    }));
    await table;
    expect(seen.at(-1)).toBe(8);
  });

  it('opens numbered files with their TimeValue, and cancels an evaluation', async () => {
    const d = await api.openSeries(chosen(NUM_DIR, 'run'));
    expect(d.timeSource).toBe('field-data');
    expect(d.times[7]).toBe(1.7);
    // Cancel sent right behind the request: the worker takes it at the evaluation's first wait, whatever the machine's speed.
    const running = api.evaluateSeries(SET, undefined, Comlink.proxy((p: SeriesProgress) => { if (p.done >= 1) void api.cancelSeries(); }));
    void api.cancelSeries();
    await expect(running).rejects.toThrow(/cancelled/);
    await expect(api.openSeries([{ path: 'a/x.vtu', data: new Uint8Array(3) }, { path: 'a/y.vtu', data: new Uint8Array(3) }])).rejects.toThrow('"x.vtu" carries no step number');
  });
});
