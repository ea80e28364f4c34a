import { describe, expect, it } from 'vitest';
import { REFERENCE_NODES } from '../../src/model/cellTypes.ts';
import { cellVolume, volumeSummary } from '../../src/model/cellMeasure.ts';
import { datasetOf, hexGrid, pieceFromCells, tetGrid } from '../../src/model/meshBuild.ts';

describe('cell volumes', () => {
  it('reference cells have their textbook volumes', () => {
    // Reference: elementary geometry — unit tetra 1/6, unit cube 1, unit right prism 1/2, pyramid base·h/3 = 1/3.
    const expected: Record<number, number> = { 10: 1 / 6, 11: 1, 12: 1, 13: 1 / 2, 14: 1 / 3 };
    for (const [t, v] of Object.entries(expected)) {
      const nodes = REFERENCE_NODES[Number(t)]!;
      const p = pieceFromCells(nodes, { types: [Number(t)], nodes: [Array.from({ length: nodes.length / 3 }, (_, i) => i)] });
      expect(cellVolume(p, 0)).toBeCloseTo(v, 14);
    }
  });

  it('a polyhedron (unit cube from its face stream) has volume 1, and meshes sum to their domain', () => {
    const cube = REFERENCE_NODES[12]!;
    const faces = [[0, 4, 7, 3], [1, 2, 6, 5], [0, 1, 5, 4], [3, 7, 6, 2], [0, 3, 2, 1], [4, 5, 6, 7]];
    const p = pieceFromCells(cube, { types: [42], nodes: [[0, 1, 2, 3, 4, 5, 6, 7]], polyFaces: [faces] });
    expect(cellVolume(p, 0)).toBeCloseTo(1, 14);
    const twist = (u: number, v: number, w: number): [number, number, number] => [2 * u + 0.3 * v * w, v + 0.2 * u * u, 3 * w];
    expect(volumeSummary(datasetOf([hexGrid(4, 3, 5)])).volume).toBeCloseTo(1, 13);
    expect(volumeSummary(datasetOf([tetGrid(3, 3, 3, twist)])).volume).toBeCloseTo(volumeSummary(datasetOf([hexGrid(3, 3, 3, twist)])).volume, 12);
  });
});
