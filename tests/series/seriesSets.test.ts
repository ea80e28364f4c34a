/**
 * Series whose steps are several files: a folder of per-step `.pvtu` sets (pieces in sub-folders, times
 * in the pieces' TimeValue field data) and a `.pvd` listing two parts per timestep. Every step is read
 * whole (both halves of the box), so a plane across both halves carries the full flow: Q = u·A with the
 * step's uniform u on the unit cross-section (exact for a uniform field on any mesh).
 */
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nodeSeriesFiles, openSeriesInput } from '../../src/cli/seriesInputs.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { datasetOf, field, hexGrid } from '../../src/model/meshBuild.ts';
import { evaluateSeries } from '../../src/series/evaluateSeries.ts';
import type { ProbeSet } from '../../src/study/probeSet.ts';

let dir = '';
beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'fieldtally-series-sets-')); });
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const TIMES = [0.5, 0.75, 1.5];
/** Half k (0: y ≤ 0.5, 1: y ≥ 0.5) of the unit box at step s, with u = s + 1 and TimeValue. */
function half(k: number, s: number, withTime: boolean): Uint8Array {
  const mesh = hexGrid(3, 2, 2, (u, v, w) => [u, 0.5 * (v + k), w]);
  const n = mesh.points.length / 3;
  const vel = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) vel[3 * i] = s + 1;
  const d = datasetOf([{ ...mesh, pointData: [field('velocity', 'point', 3, vel), field('p', 'point', 1, new Float64Array(n))] }]);
  return writeVtu(withTime ? { ...d, fieldData: [{ name: 'TimeValue', association: 'dataset', components: 1, values: Float64Array.of(TIMES[s]!), sourceType: 'Float64' }] } : d, { encoding: 'appended-raw' });
}

const SET: ProbeSet = { format: 'fieldtally-probe-set', version: 2, probes: [
  { id: 'x', kind: 'cut-plane', geometry: { origin: [0.5, 0.5, 0.5], normal: [1, 0, 0] }, fields: { velocity: 'velocity', pressure: 'p', density: 1 } },
] };

describe('series of multi-file steps', () => {
  it('reads a folder of per-step .pvtu sets, times from the pieces\' TimeValue', async () => {
    const root = join(dir, 'sets');
    for (let s = 0; s < 3; s++) {
      mkdirSync(join(root, `box_${s + 1}`), { recursive: true });
      for (const k of [0, 1]) writeFileSync(join(root, `box_${s + 1}`, `part_${k}.vtu`), half(k, s, true));
      writeFileSync(join(root, `box_${s + 1}.pvtu`), [
        '<?xml version="1.0"?>', '<VTKFile type="PUnstructuredGrid" version="0.1" byte_order="LittleEndian">', '<PUnstructuredGrid GhostLevel="0">',
        '<PPointData><PDataArray type="Float64" Name="velocity" NumberOfComponents="3"/><PDataArray type="Float64" Name="p"/></PPointData>',
        '<PPoints><PDataArray type="Float64" NumberOfComponents="3"/></PPoints>',
        `<Piece Source="box_${s + 1}/part_0.vtu"/>`, `<Piece Source="box_${s + 1}/part_1.vtu"/>`, '</PUnstructuredGrid>', '</VTKFile>', ''].join('\n'));
    }
    const index = await openSeriesInput([root]);
    expect(index.timeSource).toBe('field-data');
    expect(index.steps.map((s) => s.time)).toEqual(TIMES);
    expect(index.steps.map((s) => s.files[0]!.split('/').pop())).toEqual(['box_1.pvtu', 'box_2.pvtu', 'box_3.pvtu']);
    const t = await evaluateSeries(index, nodeSeriesFiles, SET);
    expect(Array.from(t.columns.find((c) => c.name === 'x.volumeFlowRate [m³/s]')!.values)).toEqual([1, 2, 3].map((q) => expect.closeTo(q, 12)));
    expect(t.meshReuse).toEqual({ steps: 3, reused: 2 });
  });

  it('joins the parts of a .pvd timestep into one step', async () => {
    const root = join(dir, 'parts');
    mkdirSync(join(root, 'data'), { recursive: true });
    const lines = ['<VTKFile type="Collection" version="0.1">', '<Collection>'];
    for (let s = 0; s < 3; s++) for (const k of [0, 1]) {
      writeFileSync(join(root, 'data', `h${k}_${s}.vtu`), half(k, s, false));
      lines.push(`<DataSet timestep="${TIMES[s]}" part="${k}" file="data/h${k}_${s}.vtu"/>`);
    }
    writeFileSync(join(root, 'run.pvd'), [...lines, '</Collection>', '</VTKFile>'].join('\n'));
    const index = await openSeriesInput([join(root, 'run.pvd')]);
    expect(index.timeSource).toBe('collection');
    expect(index.steps[1]!.files.map((f) => f.split('/').pop())).toEqual(['h0_1.vtu', 'h1_1.vtu']);
    const t = await evaluateSeries(index, nodeSeriesFiles, SET);
    expect(t.stepNames[0]).toBe('run.pvd line 3 (2 parts)');
    expect(Array.from(t.columns.find((c) => c.name === 'x.volumeFlowRate [m³/s]')!.values)).toEqual([1, 2, 3].map((q) => expect.closeTo(q, 12)));
    expect(t.columns.find((c) => c.name === 'x.area [m²]')!.values[2]).toBeCloseTo(1, 12);
  });
});
