/** Per-face values of selected faces spread on the drawn triangles; other faces marked as having none. */
import { describe, expect, it } from 'vitest';
import { NO_VALUE, selectionVertexValues } from '../../src/surface/wallDrawing.ts';

// three faces: a triangle, a quad (2 triangles), a pentagon (3 triangles)
const faces = {
  count: 3, offsets: new Int32Array([0, 3, 7, 12]), nodes: new Int32Array(12), piece: new Int32Array(3), cell: new Int32Array(3), areaVector: new Float64Array(9),
};

describe('selectionVertexValues', () => {
  it('gives each selected face its value on all its triangle vertices, NO_VALUE elsewhere; range over the selection', () => {
    const v = selectionVertexValues(faces, new Int32Array([2, 0]), new Float64Array([7.5, -1]));
    const X = Math.fround(NO_VALUE);
    expect([...v.values]).toEqual([-1, -1, -1, X, X, X, X, X, X, 7.5, 7.5, 7.5, 7.5, 7.5, 7.5, 7.5, 7.5, 7.5]);
    expect(v.range).toEqual([-1, 7.5]);
  });

  it('a face whose value is NaN is drawn as having none; an empty selection has a NaN range', () => {
    const v = selectionVertexValues(faces, new Int32Array([1]), new Float64Array([Number.NaN]));
    expect(v.values.every((x) => x === Math.fround(NO_VALUE))).toBe(true);
    expect(v.range.every(Number.isNaN)).toBe(true);
  });
});
