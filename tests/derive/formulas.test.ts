/**
 * User formulas: the parser's precedence and errors (column and what was expected), evaluation over
 * arrays against values computed by hand from the same definitions, vector operations, unit propagation,
 * and formulas naming derived fields. Check value: Hagen–Poiseuille flow in sample-fields/pipe-medium.vtu
 * (REFERENCES §1): the dynamic pressure ½ρ|u|² at the axis is ½ρ(2V)².
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { withFormulaFields } from '../../src/derive/formulaFields.ts';
import { parseFormula } from '../../src/derive/formulaParse.ts';
import { readDataset } from '../../src/io/readDataset.ts';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { findField } from '../../src/model/piece.ts';
import { pipeExact } from '../../src/samples/pipe.ts';

const p = hexGrid(2, 2, 2);
const box = datasetOf([withFields(p, [
  pointFieldFrom(p, 'U', 3, (x, y, z, o) => { o[0] = 1 + x; o[1] = 2 * y; o[2] = -z; }),
  pointFieldFrom(p, 'p', 1, (x, _y, _z, o) => { o[0] = 10 * x; }),
])], 'box.vtu');
const unitOf = (n: string) => ({ U: 'm/s', p: 'Pa' } as Record<string, string>)[n];
const run = (expression: string, reference: Record<string, number> = {}) => {
  const r = withFormulaFields(box, [{ name: 'f', expression }], { reference, unitOf });
  return { values: findField(r.dataset.pieces[0]!, 'f', 'point')!, unit: r.units.f };
};

describe('parser', () => {
  it('precedence: ^ before unary minus before * / before + −; ^ right-associative', () => {
    expect(run('2 + 3 * 4 ^ 2').values.values[0]).toBe(50);
    expect(run('-2 ^ 2').values.values[0]).toBe(-4);
    expect(run('2 ^ 3 ^ 2').values.values[0]).toBe(512);
    expect(run('(2 + 3) * 4 - 6 / 3').values.values[0]).toBe(18);
  });

  it('errors name the column and what was expected', () => {
    expect(() => parseFormula('2 * (p + 1')).toThrow('column 11: expected ")" to close the "(" at column 5, found the end of the formula');
    expect(() => parseFormula('p + * 2')).toThrow('column 5: expected a number, a field name, a function or "(", found "*"');
    expect(() => parseFormula('U.w')).toThrow('column 3: expected a component x, y or z after ".", found "w"');
    expect(() => parseFormula('sqr(p)')).toThrow(/column 1: unknown function "sqr"/);
    expect(() => parseFormula('max(p)')).toThrow('column 1: max() takes 2 arguments, found 1');
    expect(() => parseFormula('p $ 2')).toThrow(/column 3: unexpected character "\$"/);
    expect(() => parseFormula('ref.mass')).toThrow(/column 5: expected a reference value \(density, viscosity, speed, pressure, area, length\)/);
    expect(() => parseFormula('(' .repeat(500) + '1' + ')'.repeat(500))).toThrow(/nested more than 200 levels/);
  });
});

describe('evaluation over arrays', () => {
  it('scalars, components, magnitude, dot, cross, vec, functions, reference values', () => {
    const pts = p.points, n = pts.length / 3;
    const U = (i: number) => [1 + pts[3 * i]!, 2 * pts[3 * i + 1]!, -pts[3 * i + 2]!];
    const q = run('0.5 * ref.density * dot(U, U)', { density: 2 });
    const m = run('mag(U)'), cr = run('cross(U, vec(0, 0, 1))'), f = run('max(U.x, U.y) * sqrt(abs(p)) * cos(0)');
    for (let i = 0; i < n; i++) {
      const u = U(i);
      expect(q.values.values[i]).toBeCloseTo(u[0]! ** 2 + u[1]! ** 2 + u[2]! ** 2, 12);
      expect(m.values.values[i]).toBeCloseTo(Math.hypot(...u), 12);
      expect([...cr.values.values.slice(3 * i, 3 * i + 3)].map((x) => x + 0)).toEqual([u[1]!, -u[0]!, 0].map((x) => x + 0));
      expect(f.values.values[i]).toBeCloseTo(Math.max(u[0]!, u[1]!) * Math.sqrt(Math.abs(10 * pts[3 * i]!)), 12);
    }
    expect(cr.values.components).toBe(3);
  });

  it('units propagate: ½ρ|u|² in Pa, p/ρ in m²/s², a dimensional exponent or unlike sum refused', () => {
    expect(run('0.5 * ref.density * dot(U, U)', { density: 1 }).unit).toBe('Pa');
    expect(run('p / ref.density', { density: 1 }).unit).toBe('m²/s²');
    expect(run('sqrt(2 * p / ref.density)', { density: 1 }).unit).toBe('m/s');
    expect(() => run('p + U.x')).toThrow('formula "f": column 3: "+" between unlike units');
    expect(() => run('exp(p)')).toThrow('formula "f": column 1: exp() needs a dimensionless argument');
    expect(() => run('U * U')).toThrow(/"\*" between two vectors: use dot\(\) or cross\(\)/);
    expect(() => run('ref.speed')).toThrow('formula "f": column 1: ref.speed is not set: give the reference speed');
    expect(() => run('nope + 1')).toThrow('formula "f": column 1: no field "nope"');
  });

  it('a formula may use derived fields and earlier formulas; names must be new', async () => {
    const e = pipeExact();
    const d = await readDataset('pipe-medium.vtu', new Uint8Array(readFileSync(resolve(__dirname, '../../sample-fields/pipe-medium.vtu'))));
    const r = withFormulaFields(d, [
      { name: 'dyn', expression: '0.5 * ref.density * [velocity-magnitude]^2' },
      { name: 'ratio', expression: 'dyn / (0.5 * ref.density * ref.speed^2)' },
    ], { reference: { density: e.rho, speed: e.V }, unitOf: (n) => (n === 'velocity' ? 'm/s' : undefined) });
    const piece = r.dataset.pieces[0]!, pts = piece.points;
    const axis = [...Array(pts.length / 3).keys()].reduce((b, i) => (Math.hypot(pts[3 * i]!, pts[3 * i + 1]!) < Math.hypot(pts[3 * b]!, pts[3 * b + 1]!) ? i : b), 0);
    expect(Math.hypot(pts[3 * axis]!, pts[3 * axis + 1]!)).toBeLessThan(1e-12);
    expect(findField(piece, 'dyn', 'point')!.values[axis]).toBeCloseTo(0.5 * e.rho * (2 * e.V) ** 2, 9);
    expect(findField(piece, 'ratio', 'point')!.values[axis]).toBeCloseTo(4, 9);
    expect(r.units).toEqual({ dyn: 'Pa', ratio: '1' });
    expect(() => withFormulaFields(d, [{ name: 'p', expression: '1' }], { reference: {}, unitOf: () => undefined })).toThrow(/a field of that name exists already/);
    expect(() => withFormulaFields(d, [{ name: '9x', expression: '1' }], { reference: {}, unitOf: () => undefined })).toThrow(/starting with a letter/);
  });
});

describe('formulas in probe sets and on the command line', () => {
  const PIPE = resolve(__dirname, '../../sample-fields/pipe-medium.vtu');
  it('a set\'s formulas become fields its probes sample, with their units; a failing formula fails only its probes', async () => {
    const { checkProbeSet } = await import('../../src/study/probeSetCheck.ts');
    const { evaluateProbeSet } = await import('../../src/study/evaluate.ts');
    const e = pipeExact();
    const d = await readDataset('pipe-medium.vtu', new Uint8Array(readFileSync(PIPE)));
    const set = checkProbeSet({
      format: 'fieldtally-probe-set', version: 2, reference: { density: e.rho },
      formulas: [{ name: 'dyn', expression: '0.5 * ref.density * dot(velocity, velocity)' }, { name: 'bad', expression: 'nothing * 2' }],
      probes: [
        { id: 'a', kind: 'point', geometry: { at: [0, 0, 0.05] }, fields: { sample: ['dyn'] } },
        { id: 'b', kind: 'point', geometry: { at: [0, 0, 0.05] }, fields: { sample: ['bad'] } },
      ],
    }, 'set.json');
    const ev = evaluateProbeSet(d, set);
    const q = ev.probes[0]!.quantities.find((x) => x.key === 'dyn')!;
    expect(q.value).toBeCloseTo(0.5 * e.rho * (2 * e.V) ** 2, 9);
    expect(q.unit).toBe('Pa');
    expect(ev.probes[1]!.ok).toBe(false);
    expect(ev.probes[1]!.error).toBe('formula "bad": column 1: no field "nothing"');
    expect(() => checkProbeSet({ format: 'fieldtally-probe-set', version: 2, formulas: [{ name: 'x', expression: 'p +' }], probes: [] }, 'set.json'))
      .toThrow(/formulas\[0\]\.expression: expected a formula that parses.*column 4: expected a number, a field name, a function or "\(", found the end of the formula/);
  });

  it('--formula on the point verb', async () => {
    const { main } = await import('../../src/cli/main.ts');
    let out = '', err = '';
    const code = await main(['point', PIPE, '--at', '0,0,0.05', '--formula', 'dyn = 0.5*ref.density*dot(velocity,velocity); pt = p + dyn', '--fields', 'p,dyn,pt', '--reference-density', '998.207', '--json'],
      { out: (t) => { out += t; }, err: (t) => { err += t; } });
    expect(code, err).toBe(0);
    const v = JSON.parse(out).points[0].values;
    expect(v.pt).toBeCloseTo(v.p + v.dyn, 12);
    const bad = await main(['point', PIPE, '--at', '0,0,0.05', '--formula', 'x = 2 *'], { out: () => {}, err: (t) => { err = t; } });
    expect(bad).toBe(1);
    expect(err).toMatch(/^fieldtally point: formula "x": column 4: expected a number/);
  });
});
