/**
 * The worker contract (workers/api.ts) end to end in a Node worker thread: load with progress, describe,
 * surface, a cut round trip whose arrays arrive by transfer, a line probe, a force total, a failed load
 * that keeps the previous dataset, and a cancelled load.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import * as Comlink from 'comlink';
// @ts-expect-error the adapter ships its types beside the .min.mjs only; typed below
import nodeEndpointUntyped from 'comlink/dist/esm/node-adapter.mjs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import { readDataset } from '../../src/io/readDataset.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { sphereExact } from '../../src/samples/sphere.ts';
import { evaluateProbeSet } from '../../src/study/evaluate.ts';
import type { ProbeSet } from '../../src/study/probeSet.ts';
import type { ComputeApi } from '../../workers/api.ts';

const nodeEndpoint = nodeEndpointUntyped as (w: Worker) => Comlink.Endpoint;

const REPO = join(__dirname, '../..');
const PIPE = join(REPO, 'sample-fields/pipe-medium.vtu');
const SPHERE = join(REPO, 'sample-fields/sphere-stokes-celldata.vtu');

type Api = ComputeApi & { transferredBytes(): number };
let worker: Worker;
let api: Comlink.Remote<Api>;

const file = (path: string) => ({ kind: 'files' as const, main: { path: path.split('/').pop()!, data: new Uint8Array(readFileSync(path)) }, others: [] });

beforeAll(() => {
  worker = new Worker(new URL('./nodeWorker.mjs', import.meta.url));
  api = Comlink.wrap<Api>(nodeEndpoint(worker));
});
afterAll(async () => { api[Comlink.releaseProxy](); await worker.terminate(); });

describe('compute worker contract', () => {
  it('loads a file with progress and describes it', async () => {
    const stages: string[] = [];
    const d = await api.load(file(PIPE), Comlink.proxy((p: { stage: string }) => { stages.push(p.stage); }));
    expect(d.report.source).toBe('pipe-medium.vtu');
    expect(d.report.cells).toBe(4320);
    expect(d.report.points).toBe(4825);
    expect(d.fileBytes).toBe(readFileSync(PIPE).length);
    expect(stages.length).toBeGreaterThan(0);
    // the pipe's boundary splits at its sharp rims into wall, inlet and outlet
    expect(d.groups.length).toBe(3);
    const total = d.groups.reduce((s, g) => s + g.area, 0);
    expect((await api.describe()).groups.map((g) => g.area)).toEqual(d.groups.map((g) => g.area));
    const wall = Math.max(...d.groups.map((g) => g.area));
    // Reference: geometry — the faceted wall area is close to 2πRL = 6.283e-3 m² (R = 0.01 m, L = 0.1 m)
    expect(wall).toBeCloseTo(2 * Math.PI * 0.01 * 0.1, 4);
    expect(total).toBeGreaterThan(wall);
  });

  it('returns the surface as transferred typed arrays', async () => {
    const before = await api.transferredBytes();
    const s = await api.surface();
    expect(s.positions).toBeInstanceOf(Float32Array);
    expect(s.positions.length % 9).toBe(0);
    expect(s.normals.length).toBe(s.positions.length);
    expect(s.groups.length).toBe(s.positions.length / 3);
    const bytes = s.positions.byteLength + s.normals.byteLength + s.groups.byteLength + s.edges.byteLength + s.edgeGroups.byteLength + s.edgeShares.byteLength
      + s.outline.positions.byteLength + s.outline.groups.byteLength;
    expect((await api.transferredBytes()) - before).toBe(bytes);
    // the groups' outlines are the pipe's two rims (R = 10 mm at z = 0 and 0.1 m, sample-fields/README.md): the
    // inlet and outlet caps end at one rim each, the wall at both
    const o = s.outline, count = [0, 0, 0];
    expect(o.positions.length).toBe(6 * o.groups.length);
    for (const g of o.groups) count[g]!++;
    expect(count[0]).toBeGreaterThan(8);
    expect(count).toEqual([count[0], 2 * count[0]!, count[0]]);
    for (let i = 0; i < o.positions.length; i += 3) {
      expect(Math.hypot(o.positions[i]!, o.positions[i + 1]!)).toBeCloseTo(0.01, 6);
      expect([0, 0.1].some((z) => Math.abs(o.positions[i + 2]! - z) < 1e-7)).toBe(true);
    }
    const v = await api.surfaceValues({ name: 'p', association: 'point', component: 0 });
    expect(v.values.length).toBe(s.groups.length);
    // Reference: sample-fields/README.md — p = G(L − z), 0.40064 Pa at the inlet, 0 at the outlet
    expect(v.range[0]).toBeCloseTo(0, 12);
    expect(v.range[1]).toBeCloseTo(0.40064, 10);
  });

  it('draws the surface without the groups\' outline when asked, and gives the same outline after it', async () => {
    const whole = await api.surface();
    const first = await api.surface({ groupOutline: false });
    expect(first.outline.positions.length).toBe(0);
    expect(first.outline.groups.length).toBe(0);
    expect([...first.positions]).toEqual([...whole.positions]);
    expect([...first.edges]).toEqual([...whole.edges]);
    const later = await api.groupOutline();
    expect([...later.positions]).toEqual([...whole.outline.positions]);
    expect([...later.groups]).toEqual([...whole.outline.groups]);
    expect(later.groups.length).toBeGreaterThan(0);
  });

  it('cuts a plane: integrals equal integratePlane on the same file, drawing arrives by transfer, twice', async () => {
    const ds = await readDataset('pipe-medium.vtu', new Uint8Array(readFileSync(PIPE)));
    const want = integratePlane(ds, { origin: [0, 0, 0.03], normal: [0, 0, 1], integral: { density: 998.207 } }).integrals;
    for (let round = 0; round < 2; round++) {
      const before = await api.transferredBytes();
      const r = await api.cut({ origin: [0, 0, 0.03], normal: [0, 0, 1], rho: 998.207, color: { name: 'velocity', association: 'point', component: 2 } });
      // same code path; summation order may differ in the last bit
      expect(Math.abs(r.integrals.massFlowRate! - want.massFlowRate!) / want.massFlowRate!).toBeLessThan(1e-13);
      expect(Math.abs(r.integrals.area! - want.area!) / want.area!).toBeLessThan(1e-13);
      const d = r.drawing!;
      expect(d.positions.length).toBe(9 * want.triangles);
      expect(d.values.length).toBe(3 * want.triangles);
      // Reference: sample-fields/README.md — u_z = 2V(1 − r²/R²) peaks at 0.1 m/s on the axis
      expect(d.range[1]).toBeCloseTo(0.1, 10);
      const bytes = d.positions.byteLength + d.normals.byteLength + d.groups.byteLength + d.values.byteLength;
      expect((await api.transferredBytes()) - before).toBe(bytes);
    }
  });

  it('draws a drag step without the integrals: the same triangles and colours as the full cut, by transfer, with worker stamps', async () => {
    for (const seed of [undefined, [0.002, 0.001, 0.05] as [number, number, number]]) {
      const q = { origin: [0, 0, 0.047] as [number, number, number], normal: [0, 0.2, 1] as [number, number, number], rho: 998.207,
        color: { name: 'p', association: 'point' as const, component: 0 }, ...(seed ? { seed } : {}) };
      const full = await api.cut(q);
      const before = await api.transferredBytes();
      const step = await api.cutDrawing(q);
      const d = step.drawing!, w = full.drawing!;
      expect(d.positions.length).toBeGreaterThan(0);
      for (const k of ['positions', 'normals', 'groups', 'values'] as const) expect(d[k]).toEqual(w[k]);
      expect(d.range).toEqual(w.range);
      expect(step.normal).toEqual(full.normal);
      expect(step.cellsCut).toBe(full.cellsCut);
      expect((await api.transferredBytes()) - before).toBe(d.positions.byteLength + d.normals.byteLength + d.groups.byteLength + d.values.byteLength);
      expect(step.timing!.finishedAt).toBeGreaterThanOrEqual(step.timing!.startedAt);
      expect(full.timing!.finishedAt).toBeGreaterThanOrEqual(full.timing!.startedAt);
    }
    expect((await api.cutDrawing({ origin: [0, 0, 5], normal: [0, 0, 1], rho: 1 })).drawing).toBeNull();
    await expect(api.cutDrawing({ origin: [0, 0, 0], normal: [0, 0, 0], rho: 1 })).rejects.toThrow(/cut-plane normal: \(0, 0, 0\) has no direction/);
  });

  it('flags a plane that misses the mesh instead of reporting zeros', async () => {
    const r = await api.cut({ origin: [0, 0, 5], normal: [0, 0, 1], rho: 1 });
    expect(r.integrals.empty).toBe(true);
    expect(r.integrals.massFlowRate).toBeNull();
    expect(r.drawing).toBeNull();
  });

  it('restricts a cut to the part around a seed, and flags a seed off the cut', async () => {
    const whole = await api.cut({ origin: [0, 0, 0.03], normal: [0, 0, 1], rho: 998.207 });
    const seeded = await api.cut({ origin: [0, 0, 0.03], normal: [0, 0, 1], rho: 998.207, seed: [0.002, 0.001, 0.05] });
    // one passage: the seeded part is the whole cut
    expect(seeded.integrals.area).toBeCloseTo(whole.integrals.area!, 15);
    expect(seeded.region.length).toBe(1);
    const off = await api.cut({ origin: [0, 0, 0.03], normal: [0, 0, 1], rho: 998.207, seed: [0.5, 0, 0.03] });
    expect(off.integrals.empty).toBe(true);
    expect(off.integrals.reason).toMatch(/off the cut/);
    expect(off.drawing).toBeNull();
  });

  it('samples a line across the pipe', async () => {
    const r = await api.sample({ from: [-0.01, 0, 0.05], to: [0.01, 0, 0.05], samples: 21 });
    expect(r.count).toBe(21);
    expect(r.s[20]).toBeCloseTo(0.02, 12);
    const uz = r.fields.find((f) => f.name === 'velocity')!.columns[2]!;
    // Reference: Hagen–Poiseuille, docs/references.md §1 (C) — u = 2V(1 − r²/R²): 0.1 m/s on the axis (a mesh node)
    expect(uz[10]).toBeCloseTo(0.1, 12);
  });

  it('totals the force on the sphere wall near Stokes drag', async () => {
    const d = await api.load(file(SPHERE));
    const wall = d.groups.find((g) => g.fileId === 1)!;
    const e = sphereExact({ flow: 'stokes' });
    const f = await api.forces({
      groups: [wall.id], rho: e.rho, speed: e.U, area: e.frontalArea, length: 0, mu: 0, referencePressure: 0,
      dragDirection: [1, 0, 0], liftDirection: [0, 0, 1], momentPoint: [0, 0, 0],
    });
    // Reference: Stokes sphere, docs/references.md §3 (C) — C_D = 24/Re; this coarse cell-data file is first order, so within 10 %
    expect(Math.abs(f.result.coefficients!.drag - 24 / e.Re) / (24 / e.Re)).toBeLessThan(0.1);
    // the sphere's wall is a closed, consistently oriented surface (src/samples/geodesicSphere.ts)
    expect(f.surface).toEqual({ closed: true, openEdges: 0, nonManifoldEdges: 0, inconsistentEdges: 0 });
  });

  it('evaluates a probe set as the command line does, and refuses a malformed set', async () => {
    // the sphere file is held now (previous test); Reference: Stokes sphere, docs/references.md §3 (C) — C_D = 24/Re
    const e = sphereExact({ flow: 'stokes' });
    const set: ProbeSet = {
      format: 'fieldtally-probe-set', version: 2, reference: { density: e.rho, speed: e.U, area: e.frontalArea },
      probes: [
        { id: 'bead', kind: 'force', geometry: { surfaces: ['group 1'] } },
        { id: 'front', kind: 'point', geometry: { at: [-0.001, 0, 0] } },
        { id: 'miss', kind: 'cut-plane', geometry: { origin: [0, 0, 1], normal: [0, 0, 1] } },
      ],
    };
    const got = await api.evaluateProbeSet(set);
    const want = evaluateProbeSet(await readDataset('sphere-stokes-celldata.vtu', new Uint8Array(readFileSync(SPHERE))), set);
    expect(got).toEqual(want);
    expect(got.failed).toBe(1);
    expect(got.probes[2]!.error).toBe('cut-plane: the plane misses every 3D cell of the mesh');
    const cd = got.probes[0]!.quantities.find((q) => q.key === 'CD')!;
    expect(Math.abs(cd.value - 24 / e.Re) / (24 / e.Re)).toBeLessThan(0.1);
    const bad = { ...set, probes: [{ id: 'x', kind: 'point', geometry: { at: [0, 0] } }] } as unknown as ProbeSet;
    await expect(api.evaluateProbeSet(bad)).rejects.toThrow('probe set: probes[0].geometry.at: expected an array of 3 finite numbers [x, y, z], found [0,0]');
  });

  it('keeps the previous dataset when a load fails, with the reader\'s error', async () => {
    const bad = { kind: 'files' as const, main: { path: 'bad.vtu', data: new TextEncoder().encode('<VTKFile type="UnstructuredGrid"><Piece') }, others: [] };
    await expect(api.load(bad)).rejects.toThrow(/bad\.vtu/);
    expect((await api.describe()).report.source).toBe('sphere-stokes-celldata.vtu');
  });

  it('cancels a long load at a reader checkpoint', async () => {
    const p = hexGrid(60, 60, 60);
    const big = writeVtu(datasetOf([withFields(p, [pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = x + y + z; })])], 'big.vtu'), { encoding: 'ascii' });
    let cancelled = false;
    const load = api.load({ kind: 'files', main: { path: 'big.vtu', data: big }, others: [] }, Comlink.proxy(() => {
      if (!cancelled) { cancelled = true; void api.cancelLoad(); }
    }));
    await expect(load).rejects.toThrow(/cancelled/);
    expect(cancelled).toBe(true);
    expect((await api.describe()).report.source).toBe('sphere-stokes-celldata.vtu');
  });
});
