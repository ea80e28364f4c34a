/** Test helper: two cuts that must be the same bit for bit (array for array, counts, fields). */
import { expect } from 'vitest';
import type { PlaneCut } from '../../src/cut/cutPlane.ts';

export function expectSameCut(a: PlaneCut, b: PlaneCut, where: string): void {
  expect(a.positions, where).toEqual(b.positions);
  expect(a.indices, where).toEqual(b.indices);
  expect(a.sourceCell, where).toEqual(b.sourceCell);
  expect(a.vertexEdges, where).toEqual(b.vertexEdges);
  expect(a.vertexT, where).toEqual(b.vertexT);
  expect(a.stats.cutCells, where).toBe(b.stats.cutCells);
  expect(a.stats.openChains, where).toBe(b.stats.openChains);
  expect(a.fields.map((f) => f.values), where).toEqual(b.fields.map((f) => f.values));
}
