/**
 * A series evaluated on 1, 2 and 3 worker threads gives the history table one thread gives, number for
 * number (exact equality: each window runs the single-thread path), on the committed decaying vortex cell
 * series (exact solution of Taylor & Green 1937, Proc. R. Soc. Lond. A 158, 499–521; the values themselves
 * are checked against it in tests/series/taylorGreen.test.ts), on a generated series of the same flow
 * whose mesh changes mid-series (16×16 cells, then 12×12), and a broken step file is reported by name.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { nodeSeriesFiles, openSeriesInput } from '../../src/cli/seriesInputs.ts';
import { readProbeSetFile } from '../../src/cli/studyInputs.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { evaluateSeriesOnWorkers } from '../../src/parallel/seriesPool.ts';
import { joinHistoryTables, stepWindows } from '../../src/parallel/seriesWindows.ts';
import { VORTEX_DEFAULTS, vortexMesh, vortexStep } from '../../src/samples/taylorGreen.ts';
import { evaluateSeries } from '../../src/series/evaluateSeries.ts';
import type { HistoryTable } from '../../src/series/historyTable.ts';
import type { ProbeSet } from '../../src/study/probeSet.ts';

const REPO = resolve(__dirname, '../..');
const PVD = join(REPO, 'sample-fields/vortex-cell/cells.pvd');
const PROBES = join(REPO, 'examples/vortex-cell.probes.json');
const TIMES = [0, 0.05, 0.15, 0.3, 0.5, 0.8, 1.2, 1.7, 2.3];

/** Everything but `meshReuse` (each window reads its first mesh afresh), compared exactly. */
function expectSameTable(a: HistoryTable, b: HistoryTable): void {
  expect(Array.from(a.time)).toEqual(Array.from(b.time));
  expect(a.stepNames).toEqual(b.stepNames);
  expect(a.failures).toEqual(b.failures);
  expect([a.series, a.timeSource, a.timeUnit]).toEqual([b.series, b.timeSource, b.timeUnit]);
  expect(a.columns.map((c) => c.name)).toEqual(b.columns.map((c) => c.name));
  a.columns.forEach((c, i) => {
    expect([c.probe, c.key, c.unit, c.label]).toEqual([b.columns[i]!.probe, b.columns[i]!.key, b.columns[i]!.unit, b.columns[i]!.label]);
    // Object.is: NaN equals NaN, and every finite value is bit for bit the same
    Array.from(c.values).forEach((v, j) => expect(Object.is(v, b.columns[i]!.values[j]), `${c.name} step ${j}: ${v} vs ${b.columns[i]!.values[j]}`).toBe(true));
  });
  expect(a.meshReuse.steps).toBe(b.meshReuse.steps);
}

let set: ProbeSet;
let dir: string;
beforeAll(async () => {
  set = (await readProbeSetFile(PROBES)).set;
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-series-workers-'));
  const fine = vortexMesh(VORTEX_DEFAULTS), coarse = { ...VORTEX_DEFAULTS, cells: 12 };
  TIMES.forEach((t, s) => {
    const d = s < 4 ? vortexStep(t, VORTEX_DEFAULTS, fine) : vortexStep(t, coarse);
    writeFileSync(join(dir, `tray_${String(s + 1).padStart(3, '0')}.vtu`), writeVtu(d, { encoding: 'appended-raw' }));
  });
});
afterAll(() => { rmSync(dir, { recursive: true, force: true }); });

describe('windows of steps', () => {
  it('are contiguous, cover every step once and differ in length by at most one', () => {
    expect(stepWindows([0, 1, 2, 3, 4, 5, 6], 3)).toEqual([[0, 1, 2], [3, 4], [5, 6]]);
    expect(stepWindows([4, 5], 3)).toEqual([[4], [5]]);
    expect(stepWindows([2, 3, 4], 1)).toEqual([[2, 3, 4]]);
  });
  it('join back into one table with a column a window lacked filled with NaN', () => {
    const part = (t: number[], cols: [string, number[]][]): HistoryTable => ({
      series: 's', timeSource: 'collection', timeUnit: 's', time: Float64Array.from(t), stepNames: t.map((x) => `f${x}`),
      columns: cols.map(([k, v]) => ({ probe: 'p', key: k, unit: '1', label: k, name: `p.${k} [1]`, values: Float64Array.from(v) })),
      failures: [], meshReuse: { steps: t.length, reused: t.length - 1 },
    });
    const j = joinHistoryTables([part([0, 1], [['a', [1, 2]]]), part([2], [['b', [7]], ['a', [3]]])]);
    expect(Array.from(j.time)).toEqual([0, 1, 2]);
    expect(j.columns.map((c) => [c.key, Array.from(c.values)])).toEqual([['a', [1, 2, 3]], ['b', [NaN, NaN, 7]]]);
    expect(j.meshReuse).toEqual({ steps: 3, reused: 1 });
  });
});

describe('a series on worker threads', () => {
  it('gives the one-thread history of the vortex cell sample on 1, 2 and 3 workers', async () => {
    const index = await openSeriesInput([PVD]);
    const one = await evaluateSeries(index, nodeSeriesFiles, set);
    for (const workers of [1, 2, 3]) {
      const seen: number[] = [];
      const t = await evaluateSeriesOnWorkers(index, nodeSeriesFiles, set, { workers, onStep: (done) => seen.push(done) });
      expectSameTable(t, one);
      expect(seen).toEqual(Array.from({ length: index.steps.length }, (_, i) => i + 1));
      // one mesh throughout: each window builds it once
      expect(t.meshReuse.reused).toBe(index.steps.length - workers);
    }
  }, 60_000);

  it('keeps the window (--from/--to) and a mesh change mid-series', async () => {
    const index = await openSeriesInput([dir]);
    const one = await evaluateSeries(index, nodeSeriesFiles, set);
    expect(one.meshReuse).toEqual({ steps: TIMES.length, reused: TIMES.length - 2 });
    for (const workers of [2, 3]) expectSameTable(await evaluateSeriesOnWorkers(index, nodeSeriesFiles, set, { workers }), one);
    const w1 = await evaluateSeries(index, nodeSeriesFiles, set, { from: 0.1, to: 1.5 });
    expectSameTable(await evaluateSeriesOnWorkers(index, nodeSeriesFiles, set, { workers: 2, from: 0.1, to: 1.5 }), w1);
  }, 60_000);

  it('reports a broken step file by name, as one thread does, and can be cancelled', async () => {
    const bad = mkdtempSync(join(tmpdir(), 'fieldtally-series-bad-'));
    try {
      TIMES.slice(0, 6).forEach((t, s) => writeFileSync(join(bad, `tray_${s + 1}.vtu`), writeVtu(vortexStep(t), { encoding: 'appended-raw' })));
      const index = await openSeriesInput([bad]);
      writeFileSync(join(bad, 'tray_5.vtu'), '<VTKFile type="UnstructuredGrid"><broken');
      const one = await evaluateSeries(index, nodeSeriesFiles, set).then(() => '', (e: Error) => e.message);
      expect(one).toContain('tray_5.vtu');
      for (const workers of [2, 3]) {
        expect(await evaluateSeriesOnWorkers(index, nodeSeriesFiles, set, { workers }).then(() => '', (e: Error) => e.message)).toBe(one);
      }
      const ac = new AbortController();
      const run = evaluateSeriesOnWorkers(index, nodeSeriesFiles, set, { workers: 2, signal: ac.signal });
      ac.abort();
      await expect(run).rejects.toMatchObject({ name: 'AbortError' });
    } finally { rmSync(bad, { recursive: true, force: true }); }
  }, 60_000);
});

async function cli(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

describe('--workers on the series verbs', () => {
  it('history --csv gives the same rows on 1 and 2 threads and says how often the mesh was built', async () => {
    const one = await cli('history', PVD, '--probes', PROBES, '--csv', '--workers', '1');
    const two = await cli('history', PVD, '--probes', PROBES, '--csv', '--workers', '2');
    expect([one.code, two.code]).toEqual([0, 0]);
    const rows = (t: string) => t.split('\n').filter((l) => l && !l.startsWith('#'));
    expect(rows(two.out)).toEqual(rows(one.out));
    expect(rows(one.out).length).toBe(9);
    expect(one.out).toContain('built 1 time(s); reused for 7 of 8 steps');
    expect(two.out).toContain('built 2 time(s); reused for 6 of 8 steps');
    const bad = await cli('history', PVD, '--probes', PROBES, '--workers', 'many');
    expect(bad.code).not.toBe(0);
    expect(bad.err.trim()).toBe('fieldtally history: --workers: expected a whole number of workers from 1 to 256, got "many"');
  }, 60_000);

  it('compare of two series gives the same JSON rows on 1 and 2 threads', async () => {
    const a = await cli('compare', PVD, dir, '--probes', PROBES, '--json', '--workers', '1');
    const b = await cli('compare', PVD, dir, '--probes', PROBES, '--json', '--workers', '2');
    expect(a.err).toBe(b.err);
    expect(JSON.parse(b.out).rows).toEqual(JSON.parse(a.out).rows);
    expect(JSON.parse(a.out).rows.length).toBeGreaterThan(5);
  }, 60_000);
});
