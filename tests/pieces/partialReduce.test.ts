/**
 * `fieldtally partial` + `fieldtally reduce` against `fieldtally report` on the whole set: the same report
 * folder (results.json, results.csv, results-long.csv to rounding; same picture), for several sets and
 * task counts, with every probe kind (cut-plane with seed, disk and a plane lying on a face between pieces,
 * pressure loss, mass balance over planes and surfaces, point and line probes — samples on faces between
 * pieces, with point and with cell data — and force totals).
 * Sets: the committed sample cases (sample-fields/README.md) split into pieces here — a pipe in axial bands
 * (duplicated points on the faces between pieces), the pipe with cell data in four sectors through its wall
 * (a .vtm naming a nested .pvtu, global point ids), the Stokes bead in quadrants cut through the bead wall.
 * Published values: Hagen–Poiseuille Q = πR²V (e.g. White, Fluid Mechanics, 7th ed., 2011, §6.4) and the
 * Stokes drag 3πμUD (Stokes 1851; Bird, Stewart & Lightfoot, Transport Phenomena, 2nd ed., §2.6), each
 * within the sample mesh's own discretisation error.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { pipeCase } from '../../src/samples/pipe.ts';
import { COMMITTED_CASES } from '../../src/samples/sampleSet.ts';
import { sphereCase, sphereExact } from '../../src/samples/sphere.ts';
import { bands, splitDataset, writePvtu, writeVtm } from './pieceSets.ts';
import { expectSameReport, readJson, type Results } from './reportCompare.ts';

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

let dir = '';
beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'fieldtally-pieces-')); });
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const value = (r: Results, probe: string, key: string) => r.files[0]!.probes.find((p) => p.id === probe)!.quantities.find((q) => q.key === key)!.value;

/** Runs `report` on the set, then `partial` for every task and `reduce`; returns both folders. */
async function reportBothWays(set: string, probes: string, tasks: number, tag: string): Promise<{ whole: string; reduced: string; partOut: string[] }> {
  const whole = join(dir, `${tag}-whole`), reduced = join(dir, `${tag}-reduced-${tasks}`);
  const w = await run('report', set, '--probes', probes, '--out', whole, '--width', '320', '--height', '240');
  expect(w.code === 0 || w.code === 3).toBe(true);
  const partOut: string[] = [];
  for (let i = 0; i < tasks; i++) {
    const part = join(dir, `${tag}-${tasks}-part-${i}.json`);
    const r = await run('partial', set, '--probes', probes, '--task', String(i), '--tasks', String(tasks), '--out', part);
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    partOut.push(r.out);
  }
  const r = await run('reduce', join(dir, `${tag}-${tasks}-part-*.json`), '--out', reduced, '--width', '320', '--height', '240');
  // the same failures, named by the set's path, and the same exit code
  expect(r.err).toBe(w.err);
  expect(r.code).toBe(w.code);
  return { whole, reduced, partOut };
}

const pipeProbes = (withCellData: boolean) => ({
  format: 'fieldtally-probe-set', version: 2, title: 'Pipe in pieces',
  units: { length: 'm', fields: { p: 'Pa', velocity: 'm/s' } },
  reference: { preset: 'water-20c', speed: 0.05, area: 3.14159265e-4, length: 0.02, pressure: 0, dragDirection: [0, 0, 1], liftDirection: [1, 0, 0] },
  probes: [
    { id: 'mid', kind: 'cut-plane', label: 'Mid', geometry: { origin: [0, 0, 0.05], normal: [0, 0, 1] }, fields: { velocity: 'velocity', pressure: 'p', density: 998.207 } },
    { id: 'interface', kind: 'cut-plane', label: 'On a face between pieces', geometry: { origin: [0, 0, 0.04], normal: [0, 0, 1] }, fields: { density: 998.207 } },
    { id: 'seeded', kind: 'cut-plane', label: 'Axial plane, seeded', geometry: { origin: [0, 0, 0.05], normal: [1, 0, 0], region: { seed: [0, 0.004, 0.05] } } },
    { id: 'core', kind: 'cut-plane', label: 'Core disk', geometry: { origin: [0, 0, 0.03], normal: [0, 0, 1], region: { disk: { centre: [0, 0, 0.03], radius: 0.005 } } } },
    { id: 'loss', kind: 'pressure-loss', label: 'Loss', geometry: { upstream: { origin: [0, 0, 0.02], normal: [0, 0, 1] }, downstream: { origin: [0, 0, 0.08], normal: [0, 0, 1] } } },
    { id: 'balance', kind: 'mass-balance', label: 'Balance', geometry: { planes: [{ origin: [0, 0, 0.06], normal: [0, 0, 1] }], surfaces: [0] } },
    { id: 'axis', kind: 'line', label: 'Axis', geometry: { from: [0, 0, 0], to: [0, 0, 0.1] }, options: { samples: 51 } },
    { id: 'radius', kind: 'line', label: 'Radius on a face', geometry: { from: [0, 0, 0.04], to: [0.0099, 0, 0.04] }, options: { spacing: 'cell-crossings' } },
    { id: 'wall-normal', kind: 'line', label: 'Wall normal', geometry: { from: [0.00995, 0, 0.05], to: [0, 0, 0.05] }, fields: { sample: ['velocity'] }, options: { spacing: 'cell-crossings', boundaryLayer: { velocity: 'velocity', edge: 'max', direction: [0, 0, 1] } } },
    { id: 'on-face', kind: 'point', label: 'Point on a face between pieces', geometry: { at: [0.003, 0.002, 0.06] } },
    { id: 'outside', kind: 'point', label: 'Outside', geometry: { at: [0.5, 0, 0.05] } },
    { id: 'wall', kind: 'force', label: 'Wall', geometry: { surfaces: [1] }, options: { viscous: withCellData ? 'none' : 'gradient' } },
    { id: 'inlet', kind: 'force', label: 'Inlet face', geometry: { surfaces: [0] }, options: { viscous: 'none' } },
  ],
});

describe('partial + reduce give the report of the whole set', () => {
  it('pipe in five axial bands (.pvtu, duplicated points between pieces), 1, 2, 3 and 7 tasks', async () => {
    const pipe = pipeCase(COMMITTED_CASES.pipeMedium);
    const set = writePvtu(join(dir, 'pipe'), 'pipe', pipe, splitDataset(pipe, 5, bands(2, 0, 0.1, 5)));
    const probes = join(dir, 'pipe.probes.json');
    writeFileSync(probes, JSON.stringify(pipeProbes(false)));
    for (const tasks of [1, 2, 3, 7]) {
      const { whole, reduced, partOut } = await reportBothWays(set, probes, tasks, 'pipe');
      const r = expectSameReport(whole, reduced);
      if (tasks === 7) expect(partOut[0]).toMatch(/^task 0 of 7: no leaf file \(the set has 5 for 7 tasks\)/);
      if (tasks !== 3) continue;
      expect(partOut[1]).toMatch(/^task 1 of 3: leaf files 2–3 of 5 \(pipe_1\.vtu, pipe_2\.vtu\); 2 piece\(s\), \d+ of 1620 cells/);
      // Hagen–Poiseuille: Q = πR²V = π (0.01 m)² × 0.05 m/s, within 2 % on this mesh (its 24-gon section alone
      // is −1.14 %, sample-fields/README.md; the linear interpolation of the parabola the rest)
      const q = Math.PI * 0.01 ** 2 * 0.05;
      expect(Math.abs(value(r, 'mid', 'volumeFlowRate') / q - 1)).toBeLessThan(0.02);
      // a plane on the faces between two pieces counts them once: the same flow rate as one station further on
      expect(value(r, 'interface', 'volumeFlowRate')).toBeCloseTo(value(r, 'mid', 'volumeFlowRate'), 15);
      expect(value(r, 'interface', 'area')).toBeCloseTo(value(r, 'mid', 'area'), 15);
      // the wall is one surface, not cut into bands by the faces between pieces: 2π R L area of the 24-gon prism
      expect(value(r, 'wall', 'wettedArea')).toBeCloseTo(24 * 2 * 0.01 * Math.sin(Math.PI / 24) * 0.1, 12);
      expect(r.files[0]!.probes.find((p) => p.id === 'outside')!.error).toBe('the point lies outside the mesh: no values');
    }
  }, 120_000);

  it('pipe with cell data in four sectors through the wall (.vtm naming a nested .pvtu, global point ids), 2 and 4 tasks', async () => {
    const pipe = pipeCase(COMMITTED_CASES.pipeMediumCells);
    const sector = (x: number, y: number) => (x < 0 ? 0 : 2) + (y < 0 ? 0 : 1);
    const set = writeVtm(join(dir, 'sectors'), 'sectors', pipe, splitDataset(pipe, 4, sector, true), 2);
    const probes = join(dir, 'sectors.probes.json');
    const doc = pipeProbes(true);
    // samples on the faces between the sectors (x = 0 and y = 0): cell data takes the lowest-numbered holding cell
    doc.probes.push({ id: 'sector-face', kind: 'point', label: 'On x = 0', geometry: { at: [0, 0.004, 0.05] } });
    doc.probes.push({ id: 'diameter', kind: 'line', label: 'Diameter along y = 0', geometry: { from: [-0.0099, 0, 0.07], to: [0.0099, 0, 0.07] }, options: { samples: 41 } });
    writeFileSync(probes, JSON.stringify(doc));
    for (const tasks of [2, 4]) {
      const { whole, reduced } = await reportBothWays(set, probes, tasks, 'sectors');
      const r = expectSameReport(whole, reduced);
      expect(value(r, 'inlet', 'wettedArea')).toBeCloseTo(3.10583e-4, 9);
      expect(r.inputs.map((x) => x.name)).toEqual(['sectors.vtm', 'blocks/sectors_0.vtu', 'blocks/sectors_1.vtu', 'inner/sectors-inner.pvtu', 'inner/sectors-inner_0.vtu', 'inner/sectors-inner_1.vtu', 'sectors.probes.json']);
    }
  }, 120_000);

  it('Stokes bead cut into quadrants through its wall: the same drag, 3πμUD within the mesh error', async () => {
    const bead = sphereCase(COMMITTED_CASES.sphereStokesCells);
    const set = writePvtu(join(dir, 'bead'), 'bead', bead, splitDataset(bead, 4, (x, y) => (x < 0 ? 0 : 2) + (y < 0 ? 0 : 1)), 'zlib');
    const e = sphereExact({ flow: 'stokes' });
    const probes = join(dir, 'bead.probes.json');
    writeFileSync(probes, JSON.stringify({
      format: 'fieldtally-probe-set', version: 2,
      reference: { density: e.rho, viscosity: e.mu, speed: e.U, area: e.frontalArea },
      probes: [
        { id: 'bead', kind: 'force', label: 'Bead', geometry: { surfaces: [1] }, options: { viscous: 'wall-shear' } },
        { id: 'outer', kind: 'force', label: 'Outer sphere', geometry: { surfaces: [2] }, options: { viscous: 'none' } },
        { id: 'wake', kind: 'line', label: 'Wake', geometry: { from: [0.0005, 0, 0], to: [0.005, 0, 0] }, options: { samples: 46 } },
      ],
    }));
    const { whole, reduced } = await reportBothWays(set, probes, 3, 'bead');
    const r = expectSameReport(whole, reduced);
    const single = join(dir, 'bead-single');
    const s = await run('report', join(__dirname, '../../sample-fields/sphere-stokes-celldata.vtu'), '--probes', probes, '--out', single, '--no-pictures');
    expect(s.err).toBe('');
    const one = readJson(join(single, 'results.json'));
    // faces between pieces are not boundary: the wall and the outer sphere have the single file's areas and forces
    for (const [probe, key] of [['bead', 'wettedArea'], ['outer', 'wettedArea'], ['bead', 'force.drag'], ['bead', 'CD']] as const) {
      expect(value(r, probe, key)).toBeCloseTo(value(one, probe, key), 12 - Math.round(Math.log10(Math.abs(value(one, probe, key)))));
    }
    const drag = 3 * Math.PI * e.mu * e.U * 2 * e.a;
    expect(Math.abs(value(r, 'bead', 'force.drag') / drag - 1)).toBeLessThan(0.02);
  }, 120_000);
});
