/**
 * Piece sets with ghost cells (VTK's convention: a UInt8 cell array `vtkGhostType`, bit 1 = a duplicate of
 * another piece's cell, bit 32 = hidden; a point array of the same name for repeated points). The readers
 * leave flagged cells out, so a set with a ghost layer gives exactly the numbers of the same set without it:
 * a cut-plane through the overlap counts its flow once (Hagen–Poiseuille Q = πR²V, e.g. White, Fluid
 * Mechanics, 7th ed., 2011, §6.4, within the sample mesh's discretisation error), the faces between pieces
 * are not boundary (the wall's area is the 24-gon prism's), and `partial` + `reduce` match `report`.
 */
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { writeLegacyVtk } from '../../src/io/writeLegacy.ts';
import { totalCells } from '../../src/model/dataset.ts';
import { pipeCase } from '../../src/samples/pipe.ts';
import { COMMITTED_CASES } from '../../src/samples/sampleSet.ts';
import { bands, splitDataset, splitWithGhosts, writePvtu, writeVtm } from './pieceSets.ts';
import { readJson, type Results } from './reportCompare.ts';

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

let dir = '';
beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'fieldtally-ghosts-')); });
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const pipe = () => pipeCase(COMMITTED_CASES.pipeMedium);
const rule = bands(2, 0, 0.1, 4);

const probeSet = {
  format: 'fieldtally-probe-set', version: 2, title: 'Pipe with ghost layers',
  units: { length: 'm', fields: { p: 'Pa', velocity: 'm/s' } },
  reference: { preset: 'water-20c', speed: 0.05, area: 3.14159265e-4, length: 0.02, pressure: 0, dragDirection: [0, 0, 1], liftDirection: [1, 0, 0] },
  probes: [
    // z = 0.025 is the face between the first two pieces; z = 0.026 lies in the second piece's ghost layer of the first
    { id: 'interface', kind: 'cut-plane', label: 'On a face between pieces', geometry: { origin: [0, 0, 0.025], normal: [0, 0, 1] }, fields: { density: 998.207 } },
    { id: 'overlap', kind: 'cut-plane', label: 'Through the overlap', geometry: { origin: [0, 0, 0.0262], normal: [0, 0, 1] }, fields: { velocity: 'velocity', pressure: 'p', density: 998.207 } },
    { id: 'axial', kind: 'cut-plane', label: 'Axial plane', geometry: { origin: [0, 0, 0.05], normal: [1, 0, 0] } },
    { id: 'loss', kind: 'pressure-loss', label: 'Loss', geometry: { upstream: { origin: [0, 0, 0.0262], normal: [0, 0, 1] }, downstream: { origin: [0, 0, 0.0738], normal: [0, 0, 1] } } },
    { id: 'balance', kind: 'mass-balance', label: 'Balance', geometry: { planes: [{ origin: [0, 0, 0.05], normal: [0, 0, 1] }], surfaces: [0] } },
    { id: 'axis', kind: 'line', label: 'Axis', geometry: { from: [0, 0, 0], to: [0, 0, 0.1] }, options: { samples: 41 } },
    { id: 'wall', kind: 'force', label: 'Wall', geometry: { surfaces: [1] }, options: { viscous: 'gradient' } },
    { id: 'inlet', kind: 'force', label: 'Inlet face', geometry: { surfaces: [0] }, options: { viscous: 'none' } },
  ],
};

const value = (r: Results, probe: string, key: string) => r.files[0]!.probes.find((p) => p.id === probe)!.quantities.find((q) => q.key === key)!.value;

/** `report` of a set into `out`; its results. */
async function report(set: string, probes: string, out: string): Promise<Results> {
  const r = await run('report', set, '--probes', probes, '--out', out, '--no-pictures');
  expect(r.err).toBe('');
  expect(r.code).toBe(0);
  return readJson(join(out, 'results.json'));
}

/** Every probe's quantities of `b` equal those of `a`, bit for bit. */
function expectSameNumbers(a: Results, b: Results): void {
  const pa = a.files[0]!.probes, pb = b.files[0]!.probes;
  expect(pb.map((p) => [p.id, p.ok, p.error, p.notes])).toEqual(pa.map((p) => [p.id, p.ok, p.error, p.notes]));
  pa.forEach((p, i) => expect(pb[i]!.quantities).toEqual(p.quantities));
}

describe('ghost cells in piece sets are left out', () => {
  it('a .pvtu whose pieces each repeat a layer of their neighbours\' cells reads as the set without them', async () => {
    const d = pipe();
    const plain = splitDataset(d, 4, rule), ghosted = splitWithGhosts(d, 4, rule, 0, true);
    expect(ghosted.reduce((s, p) => s + p.cellTypes.length, 0)).toBeGreaterThan(totalCells(d));
    const set = writePvtu(join(dir, 'ghosted'), 'ghosted', d, ghosted);
    const read = await loadDatasetFile(set);
    expect(totalCells(read)).toBe(totalCells(d));
    // the load report's counts by type are of the cells read
    expect(read.fileCellTypes).toEqual({ 12: totalCells(d) });
    read.pieces.forEach((p, k) => {
      expect(p.cellTypes).toEqual(plain[k]!.cellTypes);
      expect(p.connectivity).toEqual(plain[k]!.connectivity);
      expect(p.points).toEqual(plain[k]!.points);
      // bookkeeping, not a field: both ghost arrays are dropped
      expect(p.cellData.map((f) => f.name)).toEqual(plain[k]!.cellData.map((f) => f.name));
      expect(p.pointData.map((f) => f.name)).toEqual(plain[k]!.pointData.map((f) => f.name));
      expect(p.pointData.map((f) => Array.from(f.values))).toEqual(plain[k]!.pointData.map((f) => Array.from(f.values)));
    });
    expect(read.warnings.filter((w) => !w.includes('ghost cells'))).toEqual([]);
    const left = ghosted.map((p, k) => p.cellTypes.length - plain[k]!.cellTypes.length);
    for (let k = 0; k < 4; k++) expect(read.warnings).toContain(`ghosted_${k}.vtu: ${left[k]} ghost cells (flagged in "vtkGhostType" as another piece's or hidden) left out`);
  });

  it('report on the set with ghost layers gives the numbers of the set without them; partial + reduce agree', async () => {
    const d = pipe();
    const probes = join(dir, 'ghost.probes.json');
    writeFileSync(probes, JSON.stringify(probeSet));
    const plainSet = writePvtu(join(dir, 'plain'), 'plain', d, splitDataset(d, 4, rule));
    // own cells flagged 16 (exterior, a bit that keeps the cell), ghosts 1; pieces zlib-compressed
    const ghostSet = writePvtu(join(dir, 'ghost'), 'ghost', d, splitWithGhosts(d, 4, rule, 16), 'zlib');
    const a = await report(plainSet, probes, join(dir, 'plain-report'));
    const b = await report(ghostSet, probes, join(dir, 'ghost-report'));
    expectSameNumbers(a, b);
    // Hagen–Poiseuille through the overlap, counted once: within 2 % on this mesh (its 24-gon section alone is −1.14 %)
    const q = Math.PI * 0.01 ** 2 * 0.05;
    expect(Math.abs(value(b, 'overlap', 'volumeFlowRate') / q - 1)).toBeLessThan(0.02);
    expect(value(b, 'interface', 'area')).toBeCloseTo(value(b, 'overlap', 'area'), 15);
    // faces between pieces are not wall: 2πRL of the 24-gon prism
    expect(value(b, 'wall', 'wettedArea')).toBeCloseTo(24 * 2 * 0.01 * Math.sin(Math.PI / 24) * 0.1, 12);
    for (const tasks of [2, 3]) {
      for (let i = 0; i < tasks; i++) {
        const r = await run('partial', ghostSet, '--probes', probes, '--task', String(i), '--tasks', String(tasks), '--out', join(dir, `ghost-${tasks}-part-${i}.json`));
        expect(r.err).toBe('');
        expect(r.code).toBe(0);
      }
      const reduced = join(dir, `ghost-reduced-${tasks}`);
      const r = await run('reduce', join(dir, `ghost-${tasks}-part-*.json`), '--out', reduced, '--no-pictures');
      expect(r.code).toBe(0);
      expectSameNumbers(b, readJson(join(reduced, 'results.json')));
    }
  }, 120_000);

  it('hidden cells (bit 32) are left out too; a .vtm of legacy pieces is read the same way', async () => {
    const d = pipe();
    const pieces = splitWithGhosts(d, 2, bands(2, 0, 0.1, 2));
    // the ghosts of piece 1 marked hidden (32) instead of duplicate (1)
    const flags = pieces[1]!.cellData.find((f) => f.name === 'vtkGhostType')!.values;
    for (let c = 0; c < flags.length; c++) if (flags[c]) flags[c] = 32;
    const set = writeVtm(join(dir, 'hidden'), 'hidden', d, pieces);
    const read = await loadDatasetFile(set);
    expect(totalCells(read)).toBe(totalCells(d));
    const legacy = join(dir, 'piece1.vtk');
    writeFileSync(legacy, writeLegacyVtk({ ...d, pieces: [pieces[1]!], assembled: undefined }, { binary: true }));
    const one = await loadDatasetFile(legacy);
    expect(one.pieces[0]!.cellTypes.length).toBe(splitDataset(d, 2, bands(2, 0, 0.1, 2))[1]!.cellTypes.length);
    expect(one.fileCellTypes).toEqual({ 12: one.pieces[0]!.cellTypes.length });
    expect(one.pieces[0]!.cellData.some((f) => f.name === 'vtkGhostType')).toBe(false);
    expect(one.warnings.some((w) => /^piece1\.vtk: \d+ ghost cells \(flagged in "vtkGhostType" as another piece's or hidden\) left out$/.test(w))).toBe(true);
  });

  it('a ghost array that is not one 8-bit flag per cell is refused, naming the file, the array and the cell', async () => {
    const d = pipe();
    const [p] = splitWithGhosts(d, 1, () => 0);
    const bad = { ...p!, cellData: p!.cellData.map((f) => (f.name === 'vtkGhostType' ? { ...f, values: Float32Array.from(f.values, (_, c) => (c === 7 ? 0.5 : 0)), sourceType: 'Float32' } : f)) };
    const file = join(dir, 'bad-ghost.vtk');
    writeFileSync(file, writeLegacyVtk({ ...d, pieces: [bad], assembled: undefined }, { binary: false }));
    await expect(loadDatasetFile(file)).rejects.toThrow('bad-ghost.vtk: cell array "vtkGhostType", cell 7: 0.5 is not a ghost flag; expected an integer 0..255 (VTK\'s ghost-cell bits)');
  });
});
