/**
 * Agreement with VTK's cutter followed by its attribute integration, on the sample fields (pipe with hex
 * and wedge cores, point and cell data; square duct; tetrahedral sphere shell; a skewed five-piece box of
 * hexahedra, wedges, pyramids, polyhedra and tetrahedra), oblique planes included.
 * Reference: VTK 9.1 (Debian python3-vtk9), vtkCutter + vtkIntegrateAttributes, values written by
 * tests/reference/cut_reference.py into tests/reference/expected/cut/cut_reference.json.
 * Tolerances: see vtkCompare.ts.
 */
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import { cutCases } from '../reference/cutInputs.ts';
import { compareWithVtk, readReference } from './vtkCompare.ts';

const REF = readReference(resolve(process.cwd(), 'tests/reference/expected/cut/cut_reference.json'));

describe(`cut + integrals against VTK ${REF.vtk} (vtkCutter + vtkIntegrateAttributes)`, () => {
  for (const c of cutCases()) {
    it(`${c.name}: area and every array's integral on ${c.planes.length} planes`, () => {
      const ref = REF.cases.find((x) => x.name === c.name)!;
      expect(ref.planes).toHaveLength(c.planes.length);
      c.planes.forEach((p, i) => {
        expect(ref.planes[i]!.normal).toEqual(p.normal);
        const r = integratePlane(c.dataset, { origin: p.origin, normal: p.normal }).integrals;
        compareWithVtk(`${c.name}#${i}`, r, ref.planes[i]!);
      });
    });
  }
});
