/**
 * Which derived fields the colour chooser offers: those whose inputs the file has (by the core's role
 * rule), colourable (1 or 3 components), and not already arrays of the dataset.
 */
import { describe, expect, it } from 'vitest';
import { derivedLabel, offeredDerived } from '../../src/app/derivedChoice.ts';

const f = (name: string, components: number, association: 'point' | 'cell' = 'point') => ({ name, components, association });

describe('offeredDerived', () => {
  it('velocity and pressure: every colourable derived field; the 9-component gradient is left out', () => {
    expect(offeredDerived([f('velocity', 3), f('p', 1)])).toEqual([
      'vorticity', 'vorticity-magnitude', 'q-criterion', 'lambda2', 'helicity', 'velocity-magnitude', 'total-pressure', 'cp',
    ]);
  });

  it('velocity only: no cp and no total pressure; pressure only: cp alone', () => {
    expect(offeredDerived([f('U', 3)])).toEqual(['vorticity', 'vorticity-magnitude', 'q-criterion', 'lambda2', 'helicity', 'velocity-magnitude']);
    expect(offeredDerived([f('pressure', 1, 'cell')])).toEqual(['cp']);
  });

  it('no velocity-like vector (or two candidates): nothing needing the velocity', () => {
    expect(offeredDerived([f('displacement', 3), f('p', 1)])).toEqual(['cp']);
    expect(offeredDerived([f('velocity', 3), f('U', 3)])).toEqual([]);
  });

  it('a field the dataset holds already (file array or attached) is not offered again', () => {
    expect(offeredDerived([f('velocity', 3), f('p', 1), f('vorticity', 3), f('cp', 1)])).not.toContain('vorticity');
    expect(offeredDerived([f('velocity', 3), f('p', 1), f('cp', 1)])).not.toContain('cp');
  });

  it('labels carry the SI unit (none for cp)', () => {
    expect(derivedLabel('q-criterion')).toBe('q-criterion [1/s²] (derived, made when chosen)');
    expect(derivedLabel('cp')).toBe('cp (derived, made when chosen)');
  });
});
