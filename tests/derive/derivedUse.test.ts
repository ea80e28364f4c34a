/**
 * Derived fields used by name: in the `line`, `point` and `cut` verbs (`--fields`), in probe sets (a probe
 * that names one; cp on the set's reference values), and their exact values where the inputs make them
 * exact. Check values: Hagen–Poiseuille flow in sample-fields/pipe-medium.vtu (REFERENCES §1; Hagen 1839,
 * Poiseuille 1840): u_z = 2V(1 − r²/R²), so |ω| = 4Vr/R² (quadratic: reproduced exactly by the quadratic
 * fit), p linear along the pipe; cp = (p − p_ref)/(½ρU²) and p₀ = p + ½ρ|u|² by their definitions.
 */
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { derivedNamesIn, isDerivedName, withDerivedFields } from '../../src/derive/derivedFields.ts';
import { readDataset } from '../../src/io/readDataset.ts';
import { datasetOf, field, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { findField } from '../../src/model/piece.ts';
import { pipeExact } from '../../src/samples/pipe.ts';
import { evaluateProbeSet } from '../../src/study/evaluate.ts';
import { checkProbeSet } from '../../src/study/probeSetCheck.ts';
import { readFileSync } from 'node:fs';

const PIPE = resolve(__dirname, '../../sample-fields/pipe-medium.vtu');
const e = pipeExact();

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

describe('derived fields on the command line', () => {
  it('line --fields vorticity-magnitude: |ω| = 4Vr/R² across the pipe', async () => {
    const r = await run('line', PIPE, '--from', '-0.009,0,0.05', '--to', '0.009,0,0.05', '--samples', '7', '--fields', 'vorticity-magnitude', '--json');
    expect(r.code, r.err).toBe(0);
    const j = JSON.parse(r.out) as { samples: Record<string, number[]> };
    const x = j.samples.x!, w = j.samples['vorticity-magnitude']!;
    // between nodes the line probe interpolates linearly: within the interpolation error of 4Vr/R² (linear in r along a diameter except at the axis)
    x.forEach((xi, i) => expect(Math.abs(w[i]! - (4 * e.V * Math.abs(xi)) / (e.R * e.R))).toBeLessThan(0.02 * (4 * e.V) / e.R));
  });

  it('point --fields cp,total-pressure with reference values: the definitions at a node', async () => {
    const r = await run('point', PIPE, '--at', '0,0,0', '--fields', 'p,cp,velocity,total-pressure', '--reference-density', '998.207', '--reference-speed', '0.05', '--reference-pressure', '0.1', '--json');
    expect(r.code, r.err).toBe(0);
    const v = (JSON.parse(r.out) as { points: { values: Record<string, number> }[] }).points[0]!.values;
    expect(v.cp).toBeCloseTo((v.p! - 0.1) / (0.5 * 998.207 * 0.05 ** 2), 9);
    const u2 = v.velocity_x! ** 2 + v.velocity_y! ** 2 + v.velocity_z! ** 2;
    expect(v['total-pressure']).toBeCloseTo(v.p! + 0.5 * 998.207 * u2, 9);
  });

  it('cp without reference values: one-line error naming what is missing', async () => {
    const r = await run('point', PIPE, '--at', '0,0,0', '--fields', 'cp');
    expect(r.code).toBe(1);
    expect(r.err.trim()).toMatch(/^fieldtally point: derived field "cp" needs a positive reference density and speed/);
  });

  it('cut --fields vorticity-magnitude: its area mean over the cross-section is 8V/(3R)', async () => {
    const r = await run('cut', PIPE, '--origin', '0,0,0.05', '--normal', '0,0,1', '--fields', 'vorticity-magnitude', '--rho', '998.207', '--json');
    expect(r.code, r.err).toBe(0);
    const j = JSON.parse(r.out) as { areaMean: Record<string, number> };
    // area mean of 4Vr/R² over the disk: (1/πR²)∫₀ᴿ 4Vr/R²·2πr dr = 8V/(3R), to the faceted disk's interpolation error
    expect(j.areaMean['vorticity-magnitude']! / ((8 * e.V) / (3 * e.R))).toBeCloseTo(1, 2);
  });

  it('an unknown name in cut --fields is refused with the name', async () => {
    const r = await run('cut', PIPE, '--origin', '0,0,0.05', '--normal', '0,0,1', '--fields', 'vortex');
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/--fields: no field "vortex"/);
  });
});

describe('derived fields in probe sets', () => {
  it('a line probe samples q-criterion; a point probe asking cp without a reference speed fails alone', async () => {
    const d = await readDataset('pipe-medium.vtu', new Uint8Array(readFileSync(PIPE)));
    const set = checkProbeSet({
      format: 'fieldtally-probe-set', version: 2, reference: { density: 998.207 },
      probes: [
        { id: 'q', kind: 'line', geometry: { from: [-0.009, 0, 0.05], to: [0.009, 0, 0.05] }, fields: { sample: ['q-criterion'] }, options: { samples: 5 } },
        { id: 'c', kind: 'point', geometry: { at: [0, 0, 0.05] }, fields: { sample: ['cp'] } },
      ],
    }, 'test');
    const ev = evaluateProbeSet(d, set);
    expect(ev.probes[0]!.ok, ev.probes[0]!.error ?? '').toBe(true);
    expect(ev.probes[1]!.ok).toBe(false);
    expect(ev.probes[1]!.error).toMatch(/cp" needs a positive reference density and speed/);
  });
});

describe('the registry', () => {
  it('knows its names, with or without an association prefix, and a file array of the same name wins', () => {
    expect(isDerivedName('point:vorticity')).toBe(true);
    expect(isDerivedName('vortex')).toBe(false);
    const p = hexGrid(2, 2, 2);
    const d = datasetOf([withFields(p, [pointFieldFrom(p, 'U', 3, (_x, y, _z, o) => { o[0] = y; o[1] = 0; o[2] = 0; }), field('vorticity', 'point', 1, new Float64Array(27))])]);
    expect(derivedNamesIn(d, ['vorticity', 'q-criterion', 'U'])).toEqual(['q-criterion']);
    // simple shear u = (y, 0, 0): ω = (0, 0, −1), Q = 0, λ₂ = 0 (S² + Ω² = diag(0, 0, 0) here), helicity 0
    const dd = withDerivedFields(d, ['q-criterion', 'vorticity-magnitude', 'lambda2', 'helicity']), q = dd.pieces[0]!;
    for (const [n, want] of [['q-criterion', 0], ['vorticity-magnitude', 1], ['lambda2', 0], ['helicity', 0]] as const) {
      for (const v of findField(q, n, 'point')!.values) expect(v).toBeCloseTo(want, 10);
    }
    expect(findField(q, 'vorticity', 'point')!.components).toBe(1); // the file's own
  });

  it('refuses total pressure without a density and names the missing velocity', () => {
    const p = hexGrid(1, 1, 1);
    const d = datasetOf([withFields(p, [pointFieldFrom(p, 'p', 1, () => 0), pointFieldFrom(p, 'U', 3, () => 0)])], 'box.vtu');
    expect(() => withDerivedFields(d, ['total-pressure'])).toThrow(/total-pressure" needs a density/);
    const e2 = datasetOf([withFields(p, [pointFieldFrom(p, 'p', 1, () => 0)])], 'box.vtu');
    expect(() => withDerivedFields(e2, ['vorticity'])).toThrow(/derived field "vorticity" needs the velocity: no field named like a velocity in box.vtu/);
    expect(() => withDerivedFields(d, ['vorticity'], { velocity: 'p' })).toThrow(/field "p" has 1 components, expected 3/);
  });
});
