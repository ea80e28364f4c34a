/**
 * A series evaluated through every per-mesh cache (geometry taken from the previous step by the reader, the
 * reused cell tree and boundary faces, the wall-gradient plan, the cut geometry) gives the numbers of a
 * fresh evaluation of each step on its own (freshly read, nothing shared) — to rounding — and the caches
 * are rebuilt when the mesh changes mid-series: the steps after the change match their own fresh
 * evaluation, and their geometry arrays and boundary faces (the keys of every per-mesh cache) are new.
 *
 * The flow is made up (a sheared, pulsing channel flow on a jittered hexahedral box); the check is the
 * agreement of the two paths, each of which is checked against exact flows in its own tests.
 */
import { describe, expect, it } from 'vitest';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { datasetOf, field, hexGrid } from '../../src/model/meshBuild.ts';
import { evaluateSeries, streamSeries } from '../../src/series/evaluateSeries.ts';
import { HistoryBuilder } from '../../src/series/historyTable.ts';
import { loadStep, openNumbered } from '../../src/series/seriesOpen.ts';
import { evaluateProbeSet } from '../../src/study/evaluate.ts';
import type { ProbeSet } from '../../src/study/probeSet.ts';
import { getBoundaryFaces } from '../../src/surface/surfaceCache.ts';
import { memoryFiles } from './memorySeries.ts';

const STEPS = 7, CHANGE = 4;

/** Steps 0–3 on one mesh, 4–6 on a refined one; velocity and pressure change every step. */
function seriesBytes(): Map<string, Uint8Array> {
  const map = new Map<string, Uint8Array>();
  for (let s = 0; s < STEPS; s++) {
    const n = s < CHANGE ? 6 : 7;
    const mesh = hexGrid(n, 5, 4, (u, v, w) => [u + 0.03 * Math.sin(7 * v + 3 * w), v + 0.02 * Math.sin(5 * u) * u * (1 - u), w]);
    const np = mesh.points.length / 3, vel = new Float32Array(3 * np), p = new Float32Array(np);
    const a = 1 + 0.3 * Math.sin(s);
    for (let i = 0; i < np; i++) {
      const x = mesh.points[3 * i]!, y = mesh.points[3 * i + 1]!, z = mesh.points[3 * i + 2]!;
      vel[3 * i] = a * 4 * y * (1 - y) * (1 + 0.2 * z); vel[3 * i + 1] = 0.1 * a * Math.sin(3 * x) * y * (1 - y); vel[3 * i + 2] = 0.05 * z * x;
      p[i] = 50 * a * (1 - x) + 3 * y * z;
    }
    const d = datasetOf([{ ...mesh, pointData: [field('velocity', 'point', 3, vel), field('p', 'point', 1, p)], cellData: [] }]);
    map.set(`ch_${s}.vtu`, writeVtu({ ...d, fieldData: [{ name: 'TimeValue', association: 'dataset', components: 1, values: Float64Array.of(0.1 * s + 0.01 * s * s), sourceType: 'Float64' }] },
      { encoding: 'appended-raw', idType: 'Int32', headerType: 'UInt32' }));
  }
  return map;
}

const SET: ProbeSet = {
  format: 'fieldtally-probe-set', version: 2,
  reference: { density: 998, viscosity: 1e-3, speed: 1, area: 1, length: 1, dragDirection: [1, 0, 0], liftDirection: [0, 1, 0] },
  probes: [
    { id: 'up', kind: 'cut-plane', geometry: { origin: [0.2, 0.5, 0.5], normal: [1, 0, 0] }, fields: { velocity: 'velocity', pressure: 'p' } },
    { id: 'slant', kind: 'cut-plane', geometry: { origin: [0.55, 0.5, 0.5], normal: [1, 0.3, 0.1] }, fields: { velocity: 'velocity', pressure: 'p' } },
    { id: 'walls', kind: 'force', geometry: { surfaces: [0, 1, 2] }, options: { viscous: 'gradient' } },
    { id: 'shear', kind: 'wall', geometry: { surfaces: [2] } },
    { id: 'pt', kind: 'point', geometry: { at: [0.4, 0.45, 0.3] } },
  ],
};

describe('series caching equals fresh evaluation', () => {
  it('every column of every step, to rounding, across a mesh change', async () => {
    const bytes = seriesBytes(), files = memoryFiles(bytes);
    const index = await openNumbered('ch_*.vtu', [...bytes.keys()], files);
    const table = await evaluateSeries(index, files, SET);
    expect(table.meshReuse).toEqual({ steps: STEPS, reused: STEPS - 2 });
    expect(table.failures).toEqual([]);
    const fresh = new HistoryBuilder(index.name, index.timeSource);
    for (let s = 0; s < STEPS; s++) fresh.add(index.steps[s]!.time, evaluateProbeSet(await loadStep(index, s, memoryFiles(bytes)), SET), false);
    const want = fresh.table();
    expect(table.columns.map((c) => c.name)).toEqual(want.columns.map((c) => c.name));
    expect(table.columns.some((c) => c.name.startsWith('walls.CD.viscous'))).toBe(true);
    expect(table.columns.some((c) => c.name.startsWith('shear.'))).toBe(true);
    for (const [k, c] of table.columns.entries()) {
      const w = want.columns[k]!.values;
      const scale = Math.max(...Array.from(w, Math.abs));
      c.values.forEach((v, s) => expect(Math.abs(v - w[s]!), `${c.name} at step ${s}: ${v} vs ${w[s]}`).toBeLessThanOrEqual(1e-12 * scale));
    }
    // the viscous drag changes with the pulsing flow: the cached plan follows the step's velocity
    const cdv = table.columns.find((c) => c.name.startsWith('walls.force.drag'))!.values;
    expect(new Set(Array.from(cdv)).size).toBe(STEPS);
  });

  it('rebuilds the mesh structures on the new mesh and shares them within each mesh', async () => {
    const bytes = seriesBytes(), files = memoryFiles(bytes);
    const index = await openNumbered('ch_*.vtu', [...bytes.keys()], files);
    const faces: object[] = [], points: object[] = [];
    for await (const s of streamSeries(index, files)) {
      evaluateProbeSet(s.dataset, SET);
      const f = getBoundaryFaces(s.dataset);
      faces.push(f);
      points.push(s.dataset.pieces[0]!.points);
    }
    for (let s = 1; s < STEPS; s++) {
      const same = s !== CHANGE;
      expect(faces[s] === faces[s - 1], `faces at step ${s}`).toBe(same);
      expect(points[s] === points[s - 1], `points at step ${s}`).toBe(same);
    }
  });
});
