/**
 * `fieldtally history`: the CSV's columns are named exactly as `report`'s results.csv names them and a
 * step's row equals `report` on that step's file (one compute path); --json adds the window statistics
 * with the named uncertainty method and the detected transient, a user window overriding it, and the
 * dominant frequency with its Strouhal number (checked on a synthetic oscillating series whose exact
 * frequency is known); --out writes the report folder; bad series give one-line errors naming the file.
 * Sample series: sample-fields/vortex-cell (Taylor & Green 1937 exact solution).
 */
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../../src/cli/main.ts';
import { writeVtu } from '../../../src/io/writeVtu.ts';
import { datasetOf, field, hexGrid } from '../../../src/model/meshBuild.ts';
import { CAUTION } from '../../../src/study/caution.ts';

const REPO = resolve(__dirname, '../../..');
const PVD = join(REPO, 'sample-fields/vortex-cell/cells.pvd');
const PROBES = join(REPO, 'examples/vortex-cell.probes.json');

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}
const csvRows = (text: string) => text.split('\n').filter((l) => l && !l.startsWith('#'));
/** Splits a CSV line whose quoted cells hold no quotes. */
function cells(line: string): string[] {
  const out: string[] = [];
  let cur = '', quoted = false;
  for (const ch of line) {
    if (ch === '"') quoted = !quoted;
    else if (ch === ',' && !quoted) { out.push(cur); cur = ''; } else cur += ch;
  }
  out.push(cur);
  return out;
}

let dir = '';
beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'fieldtally-history-')); });
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** A numbered series of a box with a uniform velocity u(t) = 1 + 0.2 sin(2π f t) at uneven times, TimeValue in field data. */
function oscillatingSeries(folder: string, f: number, offset = 1): void {
  mkdirSync(folder, { recursive: true });
  const mesh = hexGrid(2, 2, 2);
  const n = mesh.points.length / 3;
  let t = 0;
  for (let i = 0; i < 120; i++) {
    t += 0.01 * (1 + 0.3 * Math.sin(1.7 * i));
    const u = offset + 0.2 * Math.sin(2 * Math.PI * f * t);
    const vel = new Float64Array(3 * n);
    for (let q = 0; q < n; q++) vel[3 * q] = u;
    const d = datasetOf([{ ...mesh, pointData: [field('velocity', 'point', 3, vel), field('p', 'point', 1, new Float64Array(n))] }]);
    writeFileSync(join(folder, `osc.${String(i + 1).padStart(4, '0')}.vtu`), writeVtu({ ...d, fieldData: [{ name: 'TimeValue', association: 'dataset', components: 1, values: Float64Array.of(t), sourceType: 'Float64' }] }, { encoding: 'appended-raw' }));
  }
}

describe('fieldtally history', () => {
  it('--csv: columns and values as report\'s results.csv on each step; time source and caution in the comments', async () => {
    const h = await run('history', PVD, '--probes', PROBES, '--csv');
    expect(h.code).toBe(0);
    expect(h.out).toContain('# Time source: collection — times from the collection file (its timestep attributes); 8 steps from 0 to 1.7 s');
    expect(h.out).toContain(`# Caution: ${CAUTION}`);
    const rows = csvRows(h.out);
    expect(rows).toHaveLength(9);
    const head = cells(rows[0]!);
    expect(head.slice(0, 2)).toEqual(['time [s]', 'step file']);
    const out = join(dir, 'step3');
    const r = await run('report', join(REPO, 'sample-fields/vortex-cell/cells-3.vtu'), '--probes', PROBES, '--out', out, '--no-pictures');
    expect(r.code).toBe(0);
    const rep = csvRows(readFileSync(join(out, 'results.csv'), 'utf8'));
    const repHead = cells(rep[0]!);
    expect(head.slice(2)).toEqual(repHead.slice(1, -1));
    const step3 = cells(rows[4]!), repRow = cells(rep[1]!);
    expect(step3[0]).toBe('0.3');
    expect(step3[1]).toBe('cells-3.vtu');
    expect(step3.slice(2)).toEqual(repRow.slice(1, -1));
  });

  it('--json: statistics with named methods and a user window; dominant frequency and Strouhal number of an oscillation', async () => {
    const folder = join(dir, 'osc');
    oscillatingSeries(folder, 3.5);
    const probes = join(dir, 'osc.probes.json');
    writeFileSync(probes, JSON.stringify({ format: 'fieldtally-probe-set', version: 2, reference: { length: 0.2, speed: 2 },
      probes: [{ id: 'mid', kind: 'cut-plane', geometry: { origin: [0.5, 0.5, 0.5], normal: [1, 0, 0] }, fields: { velocity: 'velocity', pressure: 'p', density: 1 } }] }));
    // one thread: every step after the first reuses the mesh (on N threads each run of steps builds it once; tests/parallel/seriesWorkers.test.ts)
    const j = await run('history', join(folder, 'osc.*.vtu'), '--probes', probes, '--json', '--workers', '1');
    expect(j.code).toBe(0);
    const doc = JSON.parse(j.out);
    expect(doc.timeSource).toBe('field-data');
    expect(doc.caution).toBe(CAUTION);
    expect(doc.steps).toBe(120);
    expect(doc.meshReuse).toEqual({ steps: 120, reused: 119 });
    const q = doc.columns.find((c: { name: string }) => c.name === 'mid.volumeFlowRate [m³/s]');
    // Q = u·1 m²: an exact sine of frequency 3.5 Hz and amplitude 0.2 about 1
    expect(q.summary.spectrum.frequency).toBeCloseTo(3.5, 3);
    expect(q.summary.spectrum.amplitude).toBeCloseTo(0.2, 3);
    expect(q.summary.strouhal).toBeCloseTo(3.5 * 0.2 / 2, 4);
    expect(q.summary.meanUncertainty.method).toMatch(/batch means|integral time/);
    expect(q.summary.transient.method).toMatch(/MSER/);
    expect(q.summary.window.source).toBe('transient-detection');
    const w = JSON.parse((await run('history', folder, '--probes', probes, '--json', '--from', '0.2', '--to', '1')).out);
    const qw = w.columns.find((c: { name: string }) => c.name === 'mid.volumeFlowRate [m³/s]');
    expect(qw.summary.window.source).toBe('user');
    expect(w.time[0]).toBeGreaterThanOrEqual(0.2);
    expect(w.time[w.time.length - 1]).toBeLessThanOrEqual(1);
  });

  it('compare and report take series: time means side by side with their uncertainty', async () => {
    const a = join(dir, 'cmpA'), b = join(dir, 'cmpB'), near = join(dir, 'cmpC');
    oscillatingSeries(a, 3.5, 1);
    oscillatingSeries(b, 3.5, 1.5);
    oscillatingSeries(near, 3.5, 1.1);
    const probes = join(dir, 'cmp.probes.json');
    writeFileSync(probes, JSON.stringify({ format: 'fieldtally-probe-set', version: 2,
      probes: [{ id: 'mid', kind: 'cut-plane', geometry: { origin: [0.5, 0.5, 0.5], normal: [1, 0, 0] }, fields: { velocity: 'velocity', pressure: 'p', density: 1 } }] }));
    const c = await run('compare', a, b, '--probes', probes, '--json');
    expect(c.code).toBe(0);
    const doc = JSON.parse(c.out);
    expect(doc.series).toBe(true);
    expect(doc.caution).toBe(CAUTION);
    const q = doc.rows.find((r: { key: string }) => r.key === 'volumeFlowRate');
    // the variant's velocity is 0.5 m/s higher at every instant on the same 1 m² plane: Δ of the time means = 0.5 m³/s
    // (the same steps and window on both sides, so the sine's residue cancels)
    expect(q.difference).toBeCloseTo(0.5, 12);
    expect(q.baselineHalfWidth95).toBeGreaterThan(0);
    expect(q.exceedsUncertainty).toBe(true);
    // 0.1 m³/s apart: within the combined half-widths of ~4 cycles of a ±0.2 sine, so not told apart
    const qn = JSON.parse((await run('compare', a, near, '--probes', probes, '--json')).out).rows.find((r: { key: string }) => r.key === 'volumeFlowRate');
    expect(qn.difference).toBeCloseTo(0.1, 12);
    expect(Math.hypot(qn.baselineHalfWidth95, qn.variantHalfWidth95)).toBeGreaterThan(0.1);
    expect(qn.exceedsUncertainty).toBe(false);
    expect((await run('compare', a, join(REPO, 'sample-fields/pipe-medium.vtu'), '--probes', probes)).err).toContain('compare a series with a series: ');

    const out = join(dir, 'series-report');
    const r = await run('report', a, join(a, 'osc.0001.vtu'), '--probes', probes, '--out', out, '--no-pictures');
    expect(r.code).toBe(0);
    const names = readdirSync(out);
    expect(names).toContain('series-1-history.csv');
    expect(names).toContain('series-1-statistics.csv');
    const res = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8'));
    expect(res.files[0].file).toBe(`${a} (time means)`);
    const mean = res.files[0].probes[0].quantities.find((x: { key: string }) => x.key === 'volumeFlowRate').value;
    expect(Math.abs(mean - 1)).toBeLessThan(0.02);
    expect(res.inputs.filter((i: { role: string }) => i.role.startsWith('step at t = '))).toHaveLength(120);
  });

  it('--out: a report folder with plots, statistics and spectra tables', async () => {
    const out = join(dir, 'rep');
    const r = await run('history', PVD, '--probes', PROBES, '--out', out);
    expect(r.code).toBe(0);
    const names = readdirSync(out);
    for (const f of ['report.html', 'history.csv', 'history.json', 'statistics.csv', 'spectra.csv', 'probe-set.json', 'history-1.svg']) expect(names).toContain(f);
    const html = readFileSync(join(out, 'report.html'), 'utf8');
    expect(html).toContain(CAUTION);
    expect(html).toContain('<svg');
    expect(readFileSync(join(out, 'statistics.csv'), 'utf8')).toContain('side.force.x [N]');
    // written again into the same folder: replaced, not refused
    expect((await run('history', PVD, '--probes', PROBES, '--out', out)).code).toBe(0);
  });

  it('gives one-line errors naming the file and what was expected', async () => {
    const bad = join(dir, 'bad');
    mkdirSync(bad, { recursive: true });
    writeFileSync(join(bad, 'run.pvd'), '<VTKFile type="Collection"><Collection>\n<DataSet timestep="0" file="a.vtu"/>\n<DataSet timestep="1" file="missing.vtu"/>\n</Collection></VTKFile>');
    writeFileSync(join(bad, 'a.vtu'), readFileSync(join(REPO, 'sample-fields/vortex-cell/cells-0.vtu')));
    const m = await run('history', join(bad, 'run.pvd'), '--probes', PROBES, '--csv');
    expect(m.code).toBe(1);
    expect(m.err.trim().split('\n')).toHaveLength(1);
    expect(m.err).toContain('run.pvd line 3:');
    expect(m.err).toContain('missing.vtu: cannot read file (no such file or folder)');

    const rep = join(dir, 'repeat');
    mkdirSync(rep, { recursive: true });
    writeFileSync(join(rep, 'c_1.vtu'), readFileSync(join(REPO, 'sample-fields/vortex-cell-numbered/cells_0002.vtu')));
    writeFileSync(join(rep, 'c_2.vtu'), readFileSync(join(REPO, 'sample-fields/vortex-cell-numbered/cells_0002.vtu')));
    const d = await run('history', rep, '--probes', PROBES, '--csv');
    expect(d.code).toBe(1);
    expect(d.err).toContain('c_2.vtu has time 0.05, the same as c_1.vtu (0.05); step times must increase strictly');

    expect((await run('history', PVD, '--probes', PROBES, '--csv', '--json')).err).toContain('choose one of --csv, --json and --out');
    expect((await run('history', PVD, '--probes', PROBES, '--from', 'soon')).err).toContain('--from: expected a number written as a decimal number, got "soon"');
  });
});
