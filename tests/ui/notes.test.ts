/** Result notes: explanations of ordinary results are neutral; failures, missing inputs and anything unrecognised are warnings. */
import { describe, expect, it } from 'vitest';
import { classifyNotes, noteLevel, notesText } from '../../src/ui/notes.ts';

describe('noteLevel', () => {
  it('reads explanations as info (texts as the compute layers write them)', () => {
    for (const t of [
      'centre of pressure undefined: the pressure force is zero or parallel to the axis',
      'lift direction was not orthogonal to the drag direction; its drag-direction part was removed',
      'viscous force not computed (viscous: none)',
      'pressure "p" is cell data: one value per face (wall 2D cell where present, else the owning cell\'s centre value)',
      'velocity "U" is cell data: wall traction μ·u_t/d from the owning cell\'s value (stationary no-slip wall assumed, first order)',
      'p is cell data: the value of the cell holding the point',
      'density is a field: the mass-flow mean of total pressure (degree 5) is not integrated exactly',
      'no density on every surface: the balance is of volume flow',
      'region: part connected to (0, 0, 0.03)',
      'boundary layer: 99 % of the edge velocity',
    ]) expect(noteLevel(t), t).toBe('info');
  });
  it('keeps real problems as warnings', () => {
    for (const t of [
      'FAILED: cut-plane: the plane misses the mesh',
      'FAILED: centre of pressure undefined',
      'coefficients not computed: give the reference density, speed and area',
      'viscous force not computed: no wall-shear array and no viscosity',
      'surface not closed (128 open edges): the total covers the chosen faces only',
      'mass-flow rates differ by more than 1 % between the planes (0.01 vs 0.02): check that both cut the same stream',
      'the line lies wholly outside the mesh: no samples',
      '180 of 201 samples inside the mesh; 1 stretch(es) outside the mesh left out',
      'a note nobody has classed yet',
    ]) expect(noteLevel(t), t).toBe('warning');
  });
  it('classifies a list and joins it for exports', () => {
    const n = classifyNotes(['region: part connected to (0, 0, 0)', 'no velocity field: flow rates are not computed']);
    expect(n.map((x) => x.level)).toEqual(['info', 'warning']);
    expect(notesText(n)).toBe('region: part connected to (0, 0, 0); no velocity field: flow rates are not computed');
    expect(notesText(undefined)).toBe('');
  });
});
