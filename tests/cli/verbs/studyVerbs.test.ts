/**
 * The `compare`, `gci` and `check-probes` verbs on the committed pipe samples (exact Hagen–Poiseuille field at the
 * nodes, docs/references.md §1).
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../../src/cli/main.ts';

const REPO = resolve(__dirname, '../../..');
const S = (n: string) => join(REPO, 'sample-fields', n);
const V1 = join(REPO, 'tests/study/fixtures/pipe-stations.v1.json');

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

let dir = '', flow = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-study-'));
  flow = join(dir, 'flow.json');
  writeFileSync(flow, JSON.stringify({
    format: 'fieldtally-probe-set', version: 2, reference: { preset: 'water-20c' },
    probes: [
      { id: 'mid', kind: 'cut-plane', geometry: { origin: [0, 0, 0.05], normal: [0, 0, 1] } },
      { id: 'centre', kind: 'point', geometry: { at: [0, 0, 0.03] } },
    ],
  }));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('fieldtally compare', () => {
  it('--json: both values, difference = variant − baseline, relative = difference/|baseline|', async () => {
    const r = await run('compare', S('pipe-medium.vtu'), S('pipe-fine.vtu'), '--probes', flow, '--json');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out) as { rows: { probe: string; key: string; baseline: number; variant: number; difference: number; relative: number }[]; caution: string };
    const q = j.rows.find((x) => x.probe === 'mid' && x.key === 'volumeFlowRate')!;
    const base = JSON.parse((await run('cut', S('pipe-medium.vtu'), '--origin', '0,0,0.05', '--normal', '0,0,1', '--json')).out).volumeFlowRate;
    const vari = JSON.parse((await run('cut', S('pipe-fine.vtu'), '--origin', '0,0,0.05', '--normal', '0,0,1', '--json')).out).volumeFlowRate;
    expect(Number(q.baseline.toPrecision(12))).toBe(base);
    expect(Number(q.variant.toPrecision(12))).toBe(vari);
    expect(q.difference).toBe(q.variant - q.baseline);
    expect(q.relative).toBe(q.difference / Math.abs(q.baseline));
    // Reference: Hagen–Poiseuille, docs/references.md §1 (C): p = G(L − z) is linear, which the cells' interpolation reproduces exactly on any mesh
    expect(j.rows.find((x) => x.probe === 'centre' && x.key === 'p')!.difference).toBeCloseTo(0, 14);
    expect(j.caution).toMatch(/licensed professional/);
  });

  it('text and CSV; a probe failing on one side gives exit code 3 and a note', async () => {
    const t = await run('compare', S('pipe-medium.vtu'), S('pipe-fine.vtu'), '--probes', flow);
    expect(t.out).toMatch(/^baseline: .*pipe-medium\.vtu\nvariant: {2}.*pipe-fine\.vtu/);
    expect(t.out).toMatch(/ {2}Q \[m³\/s\] +1\.54550e-5 +1\.55951e-5 +1\.40046e-7 +\+0\.91 %/);
    const probes = join(dir, 'far.json');
    writeFileSync(probes, JSON.stringify({ format: 'fieldtally-probe-set', version: 2, probes: [{ id: 'tip', kind: 'point', geometry: { at: [0, 0, 0.1] } }] }));
    const c = await run('compare', S('pipe-medium.vtu'), S('pipe-wedge-core.vtu'), '--probes', probes, '--csv');
    expect(c.out.split('\n')[2]).toBe('probe,label,quantity,symbol,unit,baseline,variant,difference,relative,note');
    expect(c.code).toBe(0);
    const w = await run('compare', S('pipe-medium.vtu'), S('sphere-stokes-celldata.vtu'), '--probes', flow);
    expect(w.code).toBe(3);
    expect(w.err).toMatch(/variant .*sphere-stokes-celldata\.vtu: mid \[mid\] — cut-plane: the plane misses every 3D cell of the mesh/);
    expect(w.out).toMatch(/variant failed: cut-plane: the plane misses/);
  });

  it('needs exactly two files', async () => {
    expect((await run('compare', S('pipe-medium.vtu'), '--probes', flow)).err).toMatch(/expected two result files, baseline then variant; got 1/);
  });
});

describe('fieldtally gci', () => {
  it('--json: per quantity the apparent order, extrapolated value, errors and GCI; h from cell volumes', async () => {
    const r = await run('gci', S('pipe-coarse.vtu'), S('pipe-medium.vtu'), S('pipe-fine.vtu'), '--probes', flow, '--json', '--only', 'mid.volumeFlowRate,centre');
    expect(r.code).toBe(0);
    const j = JSON.parse(r.out) as { meshes: { level: string; file: string; cells: number; h: number }[]; quantities: Record<string, unknown>[]; reference: string };
    expect(j.meshes.map((m) => [m.level, m.cells])).toEqual([['fine', 14580], ['medium', 4320], ['coarse', 1280]]);
    // sample-fields/README.md lists h = (volume/cells)^(1/3) of each level
    expect(j.meshes[0]!.h).toBeCloseTo(0.001289421984, 12);
    expect(j.reference).toMatch(/Celik et al\. \(2008\)/);
    const q = j.quantities.find((x) => x['quantity'] === 'volumeFlowRate')!;
    expect(q['behaviour']).toBe('monotonic');
    // Reference: Hagen–Poiseuille, docs/references.md §1 (C): Q = πR²V; the extrapolation recovers it to better than 0.01 %
    expect(Math.abs((q['extrapolated'] as number) / (Math.PI * 1e-4 * 0.05) - 1)).toBeLessThan(1e-4);
    expect(q['gciFine'] as number).toBeGreaterThan(q['extrapolatedRelativeError'] as number);
    // a linear field every mesh reproduces exactly (p = G(L − z), Hagen–Poiseuille, docs/references.md §1): converged, no order forced
    expect(j.quantities.find((x) => x['probe'] === 'centre' && x['quantity'] === 'p')!['behaviour']).toBe('converged');
  });

  it('text output names the behaviour; needs three files', async () => {
    const r = await run('gci', S('pipe-fine.vtu'), S('pipe-coarse.vtu'), S('pipe-medium.vtu'), '--probes', flow, '--only', 'mid.area');
    expect(r.out).toMatch(/A \[m²\]: fine 3\.12567e-4, medium 3\.10583e-4, coarse 3\.06147e-4 — monotonic\n {6}apparent order p = 2\.0\d+/);
    expect(r.out).toMatch(/Reference: Celik et al\. \(2008\)/);
    expect((await run('gci', S('pipe-fine.vtu'), '--probes', flow)).err).toMatch(/expected three result files \(coarse, medium, fine\); got 1/);
  });
});

describe('fieldtally check-probes', () => {
  it('lists a set, upgrades a version-1 file to version 2', async () => {
    const out = join(dir, 'up.json');
    const r = await run('check-probes', V1, '--upgrade', out);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^pipe-stations\.v1\.json: probe set version 1 \(upgraded to 2 on reading\)/);
    expect(r.out).toMatch(/ {2}inlet-face {7}force {10}Inlet face/);
    const up = JSON.parse(readFileSync(out, 'utf8'));
    expect(up.version).toBe(2);
    expect((await run('check-probes', out)).out).toMatch(/probe set version 2 — "Coolant pipe stations/);
  });

  it('the old verb name "probes" still works for one version, with a notice, and is not listed', async () => {
    const now = await run('check-probes', V1);
    const old = await run('probes', V1);
    expect(old.code).toBe(0);
    expect(old.out).toBe(now.out);
    expect(old.err).toBe('fieldtally: the verb "probes" is now "check-probes"; the old name will be removed in the next version\n');
    const list = (await run('--help')).out;
    expect(list).toMatch(/^ {2}check-probes +check a probe-set file/m);
    expect(list).not.toMatch(/^ {2}probes /m);
  });

  it('lists every problem of a malformed file, exit code 1', async () => {
    const bad = join(dir, 'bad.json');
    writeFileSync(bad, JSON.stringify({ format: 'fieldtally-probe-set', version: 2, units: { length: 'yd' }, probes: [{ id: 'a', kind: 'line', geometry: { from: [0, 0, 0] } }] }));
    const r = await run('check-probes', bad);
    expect(r.code).toBe(1);
    expect(r.err.split('\n').filter(Boolean)).toEqual([
      'fieldtally check-probes: bad.json is not a valid probe set (2 problems):',
      '  units.length: expected a length unit (m, mm, cm, km, in, ft), found "yd"',
      '  probes[0].geometry.to: expected a value (required), found nothing',
    ]);
  });
});
