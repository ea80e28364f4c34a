/**
 * A formula's optional declared unit (an SI label): checked against the unit the expression gives, taken
 * when the inputs' units are unknown, kept by the probe-set checker, and refused when it is no SI label.
 */
import { describe, expect, it } from 'vitest';
import { withFormulaFields } from '../../src/derive/formulaFields.ts';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../src/model/meshBuild.ts';
import { checkProbeSet } from '../../src/study/probeSetCheck.ts';

const grid = hexGrid(2, 2, 2);
const d = datasetOf([withFields(grid, [
  pointFieldFrom(grid, 'velocity', 3, (x, y, _z, o) => { o[0] = x; o[1] = y; o[2] = 0; }),
  pointFieldFrom(grid, 'mystery', 1, (x, _y, _z, o) => { o[0] = x; }),
])], 'unit test');
const ctx = { reference: { density: 2 }, unitOf: (n: string) => (n === 'velocity' ? 'm/s' : undefined) };

describe('declared formula units', () => {
  it('a matching declared unit is kept; a mismatch is refused naming both', () => {
    expect(withFormulaFields(d, [{ name: 'q', expression: '0.5 * ref.density * dot(velocity, velocity)', unit: 'Pa' }], ctx).units).toEqual({ q: 'Pa' });
    expect(() => withFormulaFields(d, [{ name: 'q', expression: 'mag(velocity)', unit: 'Pa' }], ctx)).toThrow('formula "q": the expression gives m/s, but the declared unit is Pa');
  });

  it('inputs of unknown unit: the declared unit is taken (else "undeclared")', () => {
    expect(withFormulaFields(d, [{ name: 't', expression: 'mystery * 2', unit: 'K' }], ctx).units).toEqual({ t: 'K' });
    expect(withFormulaFields(d, [{ name: 't', expression: 'mystery * 2' }], ctx).units).toEqual({ t: 'undeclared' });
  });

  it('a unit that is no SI label is refused, listing the labels', () => {
    expect(() => withFormulaFields(d, [{ name: 't', expression: 'mystery', unit: 'psi' }], ctx)).toThrow(/^formula "t": unit "psi" is not an SI unit label; expected one of 1, m, m², /);
  });

  it('the probe-set checker keeps a unit and refuses one that is no SI label', () => {
    const doc = (unit: unknown) => ({ format: 'fieldtally-probe-set', version: 2, formulas: [{ name: 'q', expression: 'p', unit }], probes: [] });
    expect(checkProbeSet(doc('Pa'), 'set.json').formulas).toEqual([{ name: 'q', expression: 'p', unit: 'Pa' }]);
    expect(() => checkProbeSet(doc('psi'), 'set.json')).toThrow(/formulas\[0\]\.unit: expected an SI unit label \(1, m, .*found "psi"/);
  });
});
