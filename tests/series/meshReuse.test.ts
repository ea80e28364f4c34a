/**
 * Streaming a series reuses the mesh: steps whose geometry holds the same bytes get the previous step's
 * geometry arrays, so the cell tree and the boundary faces (cached by mesh) are the very same objects
 * across those steps; a step on a changed mesh gets new ones, which the steps after it share again.
 * Field values always come from the step itself. The series is written to .vtu bytes and read back, so
 * every step starts as freshly decoded arrays.
 */
import { describe, expect, it } from 'vitest';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { getCellTree } from '../../src/locate/cellTree.ts';
import { datasetOf, field, hexGrid } from '../../src/model/meshBuild.ts';
import { meshKey } from '../../src/model/meshKey.ts';
import { evaluateSeries, streamSeries } from '../../src/series/evaluateSeries.ts';
import { reuseMesh, sameBytes, sameGeometry } from '../../src/series/meshReuse.ts';
import { openNumbered } from '../../src/series/seriesOpen.ts';
import { getBoundaryFaces, getSurfaceGroups } from '../../src/surface/surfaceCache.ts';
import type { ProbeSet } from '../../src/study/probeSet.ts';
import { memoryFiles } from './memorySeries.ts';

/** Step files: a 4×4×4 hex box with a uniform velocity (i, 0, 0) and p = i; steps 3 and 4 on a stretched box. */
function seriesBytes(): Map<string, Uint8Array> {
  const map = new Map<string, Uint8Array>();
  for (let i = 0; i < 5; i++) {
    const stretch = i >= 3 ? 2 : 1;
    const mesh = hexGrid(4, 4, 4, (u, v, w) => [u * stretch, v, w]);
    const n = mesh.points.length / 3;
    const vel = new Float64Array(3 * n);
    for (let q = 0; q < n; q++) vel[3 * q] = i + 1;
    const d = datasetOf([{ ...mesh, pointData: [field('velocity', 'point', 3, vel), field('p', 'point', 1, new Float64Array(n).fill(i))] }], `s_${i}.vtu`);
    map.set(`s_${i}.vtu`, writeVtu({ ...d, fieldData: [{ name: 'TimeValue', association: 'dataset', components: 1, values: Float64Array.of(0.5 * i * i), sourceType: 'Float64' }] }, { encoding: 'appended-raw' }));
  }
  return map;
}

describe('mesh reuse while streaming', () => {
  it('shares the cell tree and boundary faces across steps on one mesh and rebuilds them when the mesh changes', async () => {
    const files = memoryFiles(seriesBytes());
    const index = await openNumbered('s_*.vtu', ['s_4.vtu', 's_0.vtu', 's_2.vtu', 's_1.vtu', 's_3.vtu'], files);
    expect(index.timeSource).toBe('field-data');
    expect(index.steps.map((s) => s.time)).toEqual([0, 0.5, 2, 4.5, 8]);
    const seen: { reused: boolean; tree: object; faces: object; groups: object; key: object; p: number }[] = [];
    for await (const s of streamSeries(index, files)) {
      seen.push({ reused: s.meshReused, tree: getCellTree(s.dataset), faces: getBoundaryFaces(s.dataset), groups: getSurfaceGroups(s.dataset),
        key: meshKey(s.dataset), p: s.dataset.pieces[0]!.pointData.find((f) => f.name === 'p')!.values[0]! });
    }
    expect(seen.map((s) => s.reused)).toEqual([false, true, true, false, true]);
    expect(seen.map((s) => s.p)).toEqual([0, 1, 2, 3, 4]);
    for (const i of [1, 2]) {
      expect(seen[i]!.tree).toBe(seen[0]!.tree);
      expect(seen[i]!.faces).toBe(seen[0]!.faces);
      expect(seen[i]!.groups).toBe(seen[0]!.groups);
      expect(seen[i]!.key).toBe(seen[0]!.key);
    }
    expect(seen[3]!.tree).not.toBe(seen[0]!.tree);
    expect(seen[3]!.faces).not.toBe(seen[0]!.faces);
    expect(seen[4]!.tree).toBe(seen[3]!.tree);
    expect(seen[4]!.faces).toBe(seen[3]!.faces);
    // the cached tree keeps the geometry only, never a step's fields
    expect((seen[0]!.tree as { dataset: { pieces: { pointData: unknown[] }[] } }).dataset.pieces[0]!.pointData).toEqual([]);
  });

  it('evaluates every step with its own fields on the reused mesh and counts the reuse', async () => {
    const files = memoryFiles(seriesBytes());
    const index = await openNumbered('s_*.vtu', [...seriesBytes().keys()], files);
    const set: ProbeSet = { format: 'fieldtally-probe-set', version: 2, probes: [
      { id: 'mid', kind: 'cut-plane', geometry: { origin: [0.5, 0.5, 0.5], normal: [1, 0, 0] }, fields: { velocity: 'velocity', pressure: 'p', density: 2 } },
      { id: 'pt', kind: 'point', geometry: { at: [0.3, 0.6, 0.2] } },
    ] };
    const t = await evaluateSeries(index, files, set);
    expect(t.meshReuse).toEqual({ steps: 5, reused: 3 });
    const q = t.columns.find((c) => c.name === 'mid.volumeFlowRate [m³/s]')!;
    // Q = u·A on the unit cross-section: u = i + 1
    expect(Array.from(q.values)).toEqual([1, 2, 3, 4, 5].map((u) => expect.closeTo(u, 12)));
    expect(Array.from(t.columns.find((c) => c.name === 'pt.p [Pa]')!.values)).toEqual([0, 1, 2, 3, 4].map((p) => expect.closeTo(p, 12)));
  });

  it('compares geometry byte for byte', () => {
    const a = hexGrid(2, 2, 2), b = hexGrid(2, 2, 2);
    expect(a.points).not.toBe(b.points);
    expect(sameGeometry(datasetOf([a]), datasetOf([b]))).toBe(true);
    const moved = { ...b, points: b.points.slice() };
    moved.points[7] = moved.points[7]! + 1e-12;
    expect(sameGeometry(datasetOf([a]), datasetOf([moved]))).toBe(false);
    expect(sameBytes(new Float64Array([NaN]), new Float64Array([NaN]))).toBe(true);
    expect(sameBytes(new Int32Array([1, 2]), new Float32Array([1, 2]))).toBe(false);
    const r = reuseMesh(datasetOf([a]), datasetOf([b]));
    expect(r.reused).toBe(true);
    expect(r.dataset.pieces[0]!.points).toBe(a.points);
    expect(r.dataset.pieces[0]!.connectivity).toBe(a.connectivity);
  });
});
