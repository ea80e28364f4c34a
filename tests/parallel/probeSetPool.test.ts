/**
 * A probe set evaluated by the worker pool gives exactly what `evaluateProbeSet` gives in one thread, for
 * 1, 2 and 3 workers: every outcome (quantities, notes, anchors, shapes, failures) equal, in the set's order.
 * Reference: the single-thread core of this repository on the committed sample fields (the laminar pipe
 * and the Stokes flow past a sphere, whose numbers tests/study/evaluate.test.ts checks against
 * Hagen–Poiseuille and Stokes' drag), with the example probe sets of examples/.
 * Also: the dealing of probes to workers (boundary readers together, the rest balanced, set order kept).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { main } from '../../src/cli/main.ts';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import type { Dataset } from '../../src/model/dataset.ts';
import { openNodePool } from '../../src/parallel/nodePool.ts';
import type { ComputePool } from '../../src/parallel/pool.ts';
import { dealProbes, joinEvaluations, readsBoundary, subSet } from '../../src/parallel/probeSetShares.ts';
import { evaluateProbeSet } from '../../src/study/evaluate.ts';
import type { Probe, ProbeSet } from '../../src/study/probeSet.ts';
import { readProbeSet } from '../../src/study/probeSetFile.ts';

const ROOT = resolve(__dirname, '../..');

/**
 * The evaluation without what says how, not what: timings (`ms`) and which candidate source a cut used
 * (a worker's first cut scans, a later one uses its tree; the same cells are cut either way).
 */
function numbersOf(x: unknown): unknown {
  if (x === null || typeof x !== 'object' || ArrayBuffer.isView(x)) return x;
  if (Array.isArray(x)) return x.map(numbersOf);
  return Object.fromEntries(Object.entries(x).filter(([k]) => k !== 'ms' && k !== 'candidateSource' && k !== 'candidateCells').map(([k, v]) => [k, numbersOf(v)]));
}
const setOf = (name: string): ProbeSet => readProbeSet(readFileSync(resolve(ROOT, 'examples', name), 'utf8'), name).set;

/** The pipe stations plus a plane that misses the mesh (a failure must come back in its place too). */
function pipeSet(): ProbeSet {
  const s = setOf('pipe-stations.probes.json');
  const miss: Probe = { id: 'outside', kind: 'cut-plane', geometry: { origin: [0, 0, 5], normal: [0, 0, 1] } };
  const more: Probe = { id: 'oblique', kind: 'cut-plane', geometry: { origin: [0, 0, 0.06], normal: [0.1, 0.2, 1] } };
  return { ...s, probes: [...s.probes.slice(0, 3), miss, ...s.probes.slice(3), more] };
}

const cases: [string, string, () => ProbeSet][] = [
  ['laminar pipe, every probe kind', 'pipe-medium.vtu', pipeSet],
  ['Stokes sphere, force totals and a line', 'sphere-stokes.vtu', () => setOf('bead-drag.probes.json')],
];

describe('probe-set evaluation on the pool equals one thread', () => {
  for (const [title, file, makeSet] of cases) {
    describe(title, () => {
      let d: Dataset, set: ProbeSet, single: ReturnType<typeof evaluateProbeSet>;
      beforeAll(async () => {
        d = await loadDatasetFile(resolve(ROOT, 'sample-fields', file));
        set = makeSet();
        single = evaluateProbeSet(d, set, { keepShapes: true });
      });
      for (const workers of [1, 2, 3]) {
        describe(`${workers} worker${workers > 1 ? 's' : ''}`, () => {
          let pool: ComputePool | undefined;
          beforeAll(async () => { pool = await openNodePool(d, workers); }, 60_000);
          afterAll(async () => { await pool?.close(); });
          it('every outcome is the single-thread outcome, in order', async () => {
            const ev = await pool!.evaluateProbeSet(set, { keepShapes: true });
            expect(ev.probes.map((p) => p.id)).toEqual(set.probes.map((p) => p.id));
            expect(ev.failed).toBe(single.failed);
            expect(numbersOf(ev)).toEqual(numbersOf(single));
          });
        });
      }
    });
  }

  it('the pipe set really has a failing probe and working ones (so the comparison covers both)', async () => {
    const d = await loadDatasetFile(resolve(ROOT, 'sample-fields', 'pipe-medium.vtu'));
    const ev = evaluateProbeSet(d, pipeSet());
    expect(ev.failed).toBe(1);
    expect(ev.probes.find((p) => p.id === 'outside')!.ok).toBe(false);
    expect(ev.probes.filter((p) => p.ok).length).toBe(pipeSet().probes.length - 1);
  });
});

describe('report --workers on a single file', () => {
  it('writes the same results.json and results.csv as one thread (creation time aside)', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'fieldtally-poolreport-'));
    try {
      const io = { out: () => {}, err: () => {} };
      const args = [resolve(ROOT, 'sample-fields', 'pipe-medium.vtu'), '--probes', resolve(ROOT, 'examples', 'pipe-stations.probes.json'), '--no-pictures'];
      expect(await main(['report', ...args, '--out', join(dir, 'one')], io)).toBe(0);
      expect(await main(['report', ...args, '--out', join(dir, 'two'), '--workers', '2'], io)).toBe(0);
      const read = (d: string, f: string) => readFileSync(join(dir, d, f), 'utf8').replace(/\d{4}-\d\d-\d\dT[\d:.]+Z/g, 'T');
      for (const f of ['results.json', 'results.csv', 'results-long.csv']) expect(read('two', f), f).toBe(read('one', f));
      expect(JSON.parse(read('one', 'results.json')).files[0].probes.length).toBe(8);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 120_000);
});

describe('dealing probes to workers', () => {
  const plane = (id: string): Probe => ({ id, kind: 'cut-plane', geometry: { origin: [0, 0, 0], normal: [0, 0, 1] } });
  const line = (id: string): Probe => ({ id, kind: 'line', geometry: { from: [0, 0, 0], to: [1, 0, 0] } });
  const force = (id: string): Probe => ({ id, kind: 'force', geometry: { surfaces: [0] } });

  it('boundary readers share worker 0; the others go to the least-loaded worker in set order', () => {
    const probes = [plane('a'), force('f1'), line('b'), plane('c'), force('f2'), plane('d'), line('e')];
    // worker 0: the boundary (4) and two forces (1 each) = 6; the planes and lines alternate between workers 1 and 2
    expect([...dealProbes(probes, 3)]).toEqual([1, 0, 2, 1, 0, 2, 1]);
    expect([...dealProbes(probes, 1)]).toEqual([0, 0, 0, 0, 0, 0, 0]);
    expect(readsBoundary({ id: 'm', kind: 'mass-balance', geometry: { planes: [], surfaces: [{ group: 1 }] } } as unknown as Probe)).toBe(true);
    expect(readsBoundary(plane('x'))).toBe(false);
  });

  it('sub-sets keep the set\'s units and reference; joining restores the order and counts failures', () => {
    const set: ProbeSet = { format: 'fieldtally-probe-set', version: 2, units: { length: 'mm' }, reference: { speed: 2 }, probes: [plane('a'), line('b'), plane('c')] };
    const lane = Int32Array.of(1, 0, 1);
    expect(subSet(set, lane, 1)).toEqual({ ...set, probes: [plane('a'), plane('c')] });
    expect(subSet(set, lane, 2)).toBeNull();
    const outcome = (id: string, ok: boolean) => ({ id, kind: 'cut-plane' as const, label: id, ok, error: ok ? null : 'x', quantities: [], notes: [], anchor: null, definition: '' });
    const base = { source: 's', failed: 0, lengthUnit: 'mm', reference: {} as never };
    const joined = joinEvaluations(set, lane, [{ ...base, probes: [outcome('b', true)] }, { ...base, probes: [outcome('a', false), outcome('c', true)] }]);
    expect(joined.probes.map((p) => p.id)).toEqual(['a', 'b', 'c']);
    expect(joined.failed).toBe(1);
    expect(() => joinEvaluations(set, lane, [{ ...base, probes: [] }, null])).toThrow(/worker 1 returned no outcome for probe "a"/);
  });
});
