/**
 * Choosing surface groups by what they are (src/surface/groupSelect.ts), in the core, in probe sets and on
 * the command line. References: geometry of a 2 × 1 × 0.5 box (side areas 2, 1 and 0.5 in pairs); Stokes
 * drag on a sphere, docs/references.md §3 (the force is the same whichever way the wall is chosen).
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { datasetOf, hexGrid } from '../../src/model/meshBuild.ts';
import { sphereCase, sphereExact } from '../../src/samples/sphere.ts';
import { evaluateProbeSet } from '../../src/study/evaluate.ts';
import type { Probe, ProbeSet } from '../../src/study/probeSet.ts';
import { boundaryFaces } from '../../src/surface/boundaryFaces.ts';
import { describeSelector, selectGroups } from '../../src/surface/groupSelect.ts';
import { resolveGroups, surfaceGroups } from '../../src/surface/surfaceGroups.ts';

const box = datasetOf([hexGrid(4, 3, 2, (x, y, z) => [2 * x, y, 0.5 * z])], 'box.vtu');
const faces = boundaryFaces(box), groups = surfaceGroups(box, faces);
const ids = (idx: number[]) => idx.map((i) => groups.groups[i]!.id);

describe('selectors on a 2 × 1 × 0.5 box', () => {
  it('by area range, by a box holding them, by the point they are nearest to, by name; criteria combine', () => {
    // ranked ids: 0 x=0 (area 0.5), 1 y=0 (1), 2 z=0 (2), 3 z=0.5 (2), 4 y=1 (1), 5 x=2 (0.5)
    expect(ids(selectGroups(groups, faces, { areaFrom: 0.9, areaTo: 1.1 }))).toEqual([1, 4]);
    expect(ids(selectGroups(groups, faces, { areaTo: 0.5 }))).toEqual([0, 5]);
    expect(ids(selectGroups(groups, faces, { within: [1.5, 2, 0, 1, 0, 0.5] }))).toEqual([5]);
    expect(ids(selectGroups(groups, faces, { within: [0, 2, 0, 1, 0, 0] }))).toEqual([2]);
    expect(ids(selectGroups(groups, faces, { nearest: [1.9, 0.5, 0.25] }))).toEqual([5]);
    expect(ids(selectGroups(groups, faces, { nearest: [1, 0.5, 10] }))).toEqual([3]);
    // nearest among those of area 1 only
    expect(ids(selectGroups(groups, faces, { nearest: [1.9, 0.9, 0.25], areaFrom: 1, areaTo: 1 }))).toEqual([4]);
    expect(ids(selectGroups(groups, faces, { name: 'part 4' }))).toEqual([4]);
    expect(ids(resolveGroups(groups, [0, 'part 1', { areaFrom: 2 }], faces))).toEqual([0, 1, 2, 3]);
  });

  it('a selector that matches nothing names itself and the known groups; nearest needs the faces', () => {
    expect(() => selectGroups(groups, faces, { within: [5, 6, 0, 1, 0, 1] })).toThrow(/^no surface group within x 5 … 6, y 0 … 1, z 0 … 1 \(known: 0 "part 0" \(area 0.5\), 1 "part 1"/);
    expect(() => resolveGroups(groups, [{ nearest: [0, 0, 0] }])).toThrow(/nearest to \(0, 0, 0\): choosing the nearest group needs the boundary faces/);
    expect(describeSelector({ name: 'hull', areaFrom: 1 })).toBe('named "hull", area 1 … ∞');
  });
});

describe('selectors in probe sets and on the command line (Stokes sphere)', () => {
  const o = { flow: 'stokes' as const, refinement: 0 }, x = sphereExact(o), d = sphereCase(o);
  const set = (probes: Probe[]): ProbeSet => ({ format: 'fieldtally-probe-set', version: 2, reference: { density: x.rho, speed: x.U, area: x.frontalArea }, probes });
  const drag = (p: Probe) => evaluateProbeSet(d, set([p])).probes[0]!.quantities.find((q) => q.key === 'CD')!.value;
  let dir = '', file = '';
  beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'fieldtally-select-')); file = join(dir, 'bead.vtu'); writeFileSync(file, writeVtu(d)); });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const run = async (...argv: string[]) => {
    let out = '', err = '';
    const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
    return { code, out, err };
  };

  it('the wall chosen by the centre point, by a box around it or by its area gives the same force as by id', () => {
    const byId = drag({ id: 'bead', kind: 'force', geometry: { surfaces: [1] } });
    const r = 1.01 * x.a, sphereArea = 4 * Math.PI * x.a ** 2;
    for (const sel of [{ nearest: [0, 0, 0] as [number, number, number] }, { within: [-r, r, -r, r, -r, r] as [number, number, number, number, number, number] }, { areaTo: 1.1 * sphereArea }]) {
      expect(drag({ id: 'bead', kind: 'force', geometry: { surfaces: [sel] } })).toBe(byId);
    }
    // Reference: Stokes drag C_D = 24/Re (docs/references.md §3), within the coarse mesh's error
    expect(Math.abs(byId / (24 / x.Re) - 1)).toBeLessThan(0.1);
    const bad = evaluateProbeSet(d, set([{ id: 'none', kind: 'force', geometry: { surfaces: [{ areaFrom: 1e9 }] } }])).probes[0]!;
    expect(bad.ok).toBe(false);
  });

  it('force and wall accept --group-nearest-to, --groups-within and --groups-area-from/-to', async () => {
    const byId = JSON.parse((await run('force', file, '--groups', '1', '--json')).out);
    const near = await run('force', file, '--group-nearest-to', '0,0,0', '--json');
    expect(near.code).toBe(0);
    const j = JSON.parse(near.out);
    expect(j.groups).toEqual(byId.groups);
    expect(j.force).toEqual(byId.force);
    const r = String(1.01 * x.a);
    const within = JSON.parse((await run('wall', file, '--groups-within', [`-${r}`, r, `-${r}`, r, `-${r}`, r].join(','), '--mu', '1', '--json')).out);
    expect(within.groups.map((g: { id: number }) => g.id)).toEqual([1]);
    const outer = JSON.parse((await run('force', file, '--groups-area-from', String(8 * Math.PI * x.a ** 2), '--json')).out);
    expect(outer.groups.map((g: { id: number }) => g.id)).toEqual([2]);
    expect((await run('force', file, '--groups-within', '0,1,0,1,0')).err).toMatch(/--groups-within: expected six numbers xmin,xmax,ymin,ymax,zmin,zmax, got/);
    expect((await run('force', file, '--groups-area-from', '2', '--groups-area-to', '1')).err).toMatch(/--groups-area-to: 1 is below --groups-area-from 2/);
  });
});
