/**
 * Comparison of fieldtally's cut integrals with VTK's (vtkCutter + vtkIntegrateAttributes), shared by the
 * committed-reference test (tests/cut/cutReference.test.ts) and the system test that re-runs VTK.
 *
 * Tolerances, and why:
 *  - area, cell fields and fields linear in space: both tools integrate the same piecewise-linear data
 *    exactly, so they agree to rounding on unit-size meshes; on the millimetre-size meshes (pipe, sphere
 *    shell) VTK's numbers differ from ours by up to about 5e-8 relative (observed, not explained here), so
 *    the bound is 1e-7;
 *  - fields that are not linear (velocity profiles, a swirl): each tool splits quadrilateral cut polygons
 *    along its own diagonal, giving different (both second-order) piecewise-linear interpolants; the bound
 *    is 2e-3 of the array's largest integral component.
 */
import { readFileSync } from 'node:fs';
import { expect } from 'vitest';

export interface RefPlane { origin: number[]; normal: number[]; area: number; triangles: number; point: Record<string, number[]>; cell: Record<string, number[]> }
export interface RefDoc { vtk: string; cases: { name: string; planes: RefPlane[] }[] }

/** Reads a JSON written by tests/reference/cut_reference.py. */
export function readReference(path: string): RefDoc {
  return JSON.parse(readFileSync(path, 'utf8')) as RefDoc;
}

/** Arrays each tool integrates exactly (linear in space, or constant per cell), per case. */
export const EXACT: Record<string, string[]> = {
  pipe_hex_point: ['p'], pipe_wedge_cell: ['p', 'velocity'], duct_point: ['p'], sphere_stokes_tets: [], mixed_box: ['linear', 'cellValue'],
};

/** Asserts that one fieldtally result agrees with one VTK plane (`name` is `case#plane`). */
export function compareWithVtk(name: string, mine: { area: number | null; integral: Record<string, number | number[]> }, ref: RefPlane): void {
  expect(Math.abs(mine.area! / ref.area - 1), `${name}: area`).toBeLessThan(1e-7);
  for (const kind of ['point', 'cell'] as const) {
    for (const [array, vals] of Object.entries(ref[kind])) {
      const got = mine.integral[array];
      expect(got, `${name}: ${kind} array ${array} integrated`).toBeDefined();
      const m = Array.isArray(got) ? got : [got!];
      const scale = Math.max(...vals.map(Math.abs));
      const tol = EXACT[name.split('#')[0]!]!.includes(array) ? 1e-7 : 2e-3;
      vals.forEach((v, c) => expect(Math.abs(m[c]! - v) / scale, `${name}: ∫${array}[${c}]`).toBeLessThan(tol));
    }
  }
}
