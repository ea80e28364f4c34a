/**
 * `fieldtally report`: the report folder's numbers equal the command line's `cut` and `force` JSON on the
 * same files (one compute path); a glob gives one table row per file; failed probes give exit code 3 with
 * the failures listed; the page is self-contained and lists the inputs with their SHA-256 checksums.
 * Files: the committed samples (sample-fields/, exact solutions, Hagen–Poiseuille, docs/references.md §1 and §3).
 */
import { createHash } from 'node:crypto';
import { mkdirSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../../src/cli/main.ts';
import { sphereExact } from '../../../src/samples/sphere.ts';

const REPO = resolve(__dirname, '../../..');
const PIPE = join(REPO, 'sample-fields/pipe-medium.vtu');
const SPHERE = join(REPO, 'sample-fields/sphere-stokes-celldata.vtu');
const stokes = sphereExact({ flow: 'stokes' });

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

let dir = '';
const setFile = (name: string, set: unknown) => { const p = join(dir, name); writeFileSync(p, JSON.stringify(set)); return p; };
type Results = { version: string; caution: string; failed: number; inputs: { name: string; sha256: string; bytes: number }[];
  files: { file: string; probes: { id: string; ok: boolean; error: string | null; quantities: { key: string; value: number; unit: string }[] }[] }[] };
const value = (r: Results, file: number, probe: string, key: string) => r.files[file]!.probes.find((p) => p.id === probe)!.quantities.find((q) => q.key === key)!.value;

beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'fieldtally-report-')); });
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('fieldtally report', () => {
  it('results.json equals `cut --json` and `force --json` on the same files; the page carries everything', async () => {
    const probes = setFile('set.json', {
      format: 'fieldtally-probe-set', version: 2, title: 'Report check',
      reference: { density: stokes.rho, speed: stokes.U, area: stokes.frontalArea },
      probes: [
        { id: 'mid', kind: 'cut-plane', label: 'Mid station', geometry: { origin: [0, 0, 0.05], normal: [0, 0, 1] }, fields: { density: 998.207 } },
        { id: 'bead', kind: 'force', label: 'Bead', geometry: { surfaces: ['group 1'] } },
      ],
    });
    const out = join(dir, 'one');
    const r = await run('report', PIPE, SPHERE, '--probes', probes, '--out', out, '--width', '480', '--height', '320');
    // the plane misses the sphere's mesh and the pipe has no "group 1": two flagged failures, exit code 3
    expect(r.code).toBe(3);
    expect(r.err).toMatch(/2 probe evaluations failed:\n {2}.*pipe-medium\.vtu: Bead \[bead\] — no surface group "group 1"/);
    expect(r.err).toMatch(/sphere-stokes-celldata\.vtu: Mid station \[mid\] — cut-plane: the plane misses every 3D cell of the mesh/);
    expect(readdirSync(out).sort()).toEqual(['.fieldtally-report.json', 'probe-set.json', 'report.html', 'results-long.csv', 'results.csv', 'results.json', 'view-1.png', 'view-2.png']);
    const res = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')) as Results;
    expect(res.failed).toBe(2);

    const cut = JSON.parse((await run('cut', PIPE, '--origin', '0,0,0.05', '--normal', '0,0,1', '--rho', '998.207', '--json')).out);
    // the cut verb prints 12 significant digits
    for (const [key, cliValue] of [['area', cut.area], ['volumeFlowRate', cut.volumeFlowRate], ['massFlowRate', cut.massFlowRate],
      ['totalPressure.massFlowMean', cut.totalPressure.massFlowMean], ['uniformityIndex', cut.uniformityIndex]] as const) {
      expect(Number(value(res, 0, 'mid', key).toPrecision(12)), key).toBe(cliValue);
    }
    const force = JSON.parse((await run('force', SPHERE, '--groups', 'group 1', '--rho', String(stokes.rho), '--speed', String(stokes.U), '--area', String(stokes.frontalArea), '--json')).out);
    expect(value(res, 1, 'bead', 'force.drag')).toBe(force.components.total.drag);
    expect(value(res, 1, 'bead', 'pressureForce.drag')).toBe(force.components.pressure.drag);
    expect(value(res, 1, 'bead', 'viscousForce.drag')).toBe(force.components.viscous.drag);
    expect(value(res, 1, 'bead', 'CD')).toBe(force.coefficients.drag);
    expect(value(res, 1, 'bead', 'force.x')).toBe(force.force[0]);
    expect(value(res, 1, 'bead', 'moment.z')).toBe(force.moment[2]);
    // Reference: docs/references.md §3, Stokes drag (C): C_D = 24/Re (coarse cell-data sample: within 10 %)
    expect(Math.abs(value(res, 1, 'bead', 'CD') / (24 / stokes.Re) - 1)).toBeLessThan(0.1);

    const html = readFileSync(join(out, 'report.html'), 'utf8');
    const pkg = JSON.parse(readFileSync(join(REPO, 'package.json'), 'utf8')) as { version: string };
    expect(res.version).toBe(pkg.version);
    expect(html).toContain(`fieldtally ${pkg.version}`);
    expect(html).toMatch(/Caution:<\/strong> These numbers are only as good as the simulation/);
    expect(html).toMatch(/<meta http-equiv="Content-Security-Policy" content="default-src 'none'; img-src data:/);
    // nothing to fetch: no src/href other than data URIs and in-page anchors, no script
    expect([...html.matchAll(/\b(?:src|href)="([^"]*)"/g)].map((m) => m[1]!.slice(0, 5)).every((u) => u === 'data:' || u.startsWith('#'))).toBe(true);
    expect(html).not.toMatch(/<script|<link|@import|url\((?!#)/);
    // the inputs with their sizes and SHA-256 checksums
    for (const f of [PIPE, SPHERE]) {
      const bytes = readFileSync(f), name = f.split('/').pop()!;
      const input = res.inputs.find((i) => i.name === name)!;
      expect(input.bytes).toBe(bytes.length);
      expect(input.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
      expect(html).toContain(input.sha256);
    }
    expect(res.inputs.find((i) => i.name === 'set.json')!.sha256).toBe(createHash('sha256').update(readFileSync(probes)).digest('hex'));
    // every number on the page carries its full-precision value
    const cells = [...html.matchAll(/data-file="([^"]+)" data-probe="([^"]+)" data-quantity="([^"]+)" data-value="([^"]+)"/g)];
    expect(cells.length).toBeGreaterThan(20);
    for (const [, file, probe, key, v] of cells) {
      const i = res.files.findIndex((f) => f.file === file);
      expect(Number(v), `${probe}.${key}`).toBe(value(res, i, probe!, key!));
    }
    expect(readFileSync(join(out, 'view-1.png')).subarray(1, 4).toString()).toBe('PNG');
  });

  it('a glob makes one row per file; no failure: exit code 0; the text table has a column per file', async () => {
    const probes = setFile('flow.json', {
      format: 'fieldtally-probe-set', version: 2, reference: { preset: 'water-20c' },
      probes: [{ id: 'q', kind: 'cut-plane', geometry: { origin: [0, 0, 0.05], normal: [0, 0, 1] } }],
    });
    const out = join(dir, 'sweep');
    const r = await run('report', join(REPO, 'sample-fields/pipe-{coarse,medium,fine}.vtu'), '--probes', probes, '--out', out, '--no-pictures');
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    const csv = readFileSync(join(out, 'results.csv'), 'utf8').split('\n').filter((l) => l && !l.startsWith('#'));
    expect(csv[0]).toMatch(/^file,q\.area \[m²\],q\.volumeFlowRate \[m³\/s\],q\.massFlowRate \[kg\/s\],/);
    expect(csv[0]).toMatch(/,failed probes$/);
    expect(csv.slice(1).map((l) => l.split(',')[0]!.split('/').pop())).toEqual(['pipe-coarse.vtu', 'pipe-fine.vtu', 'pipe-medium.vtu']);
    // Reference: Hagen–Poiseuille, docs/references.md §1 (C): Q → πR²V as the mesh is refined (coarse < medium < fine < exact)
    const q = csv.slice(1).map((l) => Number(l.split(',')[2]));
    expect(q[0]!).toBeLessThan(q[2]!);
    expect(q[2]!).toBeLessThan(q[1]!);
    expect(q[1]!).toBeLessThan(Math.PI * 1e-4 * 0.05);
    expect(r.out).toMatch(/pipe-coarse\.vtu +pipe-fine\.vtu +pipe-medium\.vtu/);
    const long = readFileSync(join(out, 'results-long.csv'), 'utf8');
    expect(long).toMatch(/^file,probe,kind,label,status,quantity,symbol,value,unit,message$/m);
    expect(long).toMatch(/# Caution: These numbers are only as good/);
  });

  it('reads a version-1 probe set and says it upgraded it', async () => {
    const out = join(dir, 'v1');
    const r = await run('report', PIPE, '--probes', join(REPO, 'tests/study/fixtures/pipe-stations.v1.json'), '--out', out, '--no-pictures');
    expect(r.err).toMatch(/note: pipe-stations\.v1\.json is a version 1 probe set; it was upgraded on reading/);
    expect(r.code).toBe(0);
    expect(JSON.parse(readFileSync(join(out, 'probe-set.json'), 'utf8')).version).toBe(2);
  });

  it('refuses a malformed probe set, an unmatched pattern and an --out folder holding other files', async () => {
    const bad = setFile('bad.json', { format: 'fieldtally-probe-set', version: 2, probes: [{ id: 'x', kind: 'cut-plane', geometry: { origin: [0, 0], normal: [0, 0, 1] } }] });
    const r = await run('report', PIPE, '--probes', bad, '--out', join(dir, 'never'));
    expect(r.code).toBe(1);
    expect(r.err).toBe('fieldtally report: bad.json: probes[0].geometry.origin: expected an array of 3 finite numbers [x, y, z], found [0,0]\n');
    const none = await run('report', join(dir, 'nothing-*.vtu'), '--probes', bad, '--out', join(dir, 'never'));
    expect(none.err).toMatch(/no file matches ".*nothing-\*\.vtu"/);
    const busy = join(dir, 'busy');
    mkdirSync(busy);
    writeFileSync(join(busy, 'notes.txt'), 'mine');
    const good = setFile('good.json', { format: 'fieldtally-probe-set', version: 2, probes: [] });
    const b = await run('report', PIPE, '--probes', good, '--out', busy);
    expect(b.err).toMatch(/--out .*busy: the folder is not empty and is not a report folder of fieldtally; choose a new or empty folder/);
    expect(readdirSync(busy)).toEqual(['notes.txt']);
  });
});
