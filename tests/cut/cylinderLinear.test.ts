/**
 * A real file: the VTK test-data pipe `vtk-data/Quadratic/CylinderLinear.vtk` (1522 linear tetrahedra,
 * point velocity as a FIELD array, flow along −z), cut at z = 0.02, 0.05, 0.08.
 * Reference: tests/fixtures/external/SOURCES.md, "Reference numbers (computed with VTK 9.1)": cut area and
 * ∫velocity_z dA from vtkCutter followed by vtkIntegrateAttributes, given to 7 significant digits.
 */
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { integratePlane } from '../../src/cut/planeIntegrals.ts';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';

const FILE = resolve(__dirname, '../fixtures/external/vtk-data/Quadratic/CylinderLinear.vtk');

const VTK = [
  { z: 0.02, area: 3.061921e-4, vz: -1.302056e-4 },
  { z: 0.05, area: 3.061793e-4, vz: -1.284334e-4 },
  { z: 0.08, area: 3.061985e-4, vz: -1.306773e-4 },
];

describe('CylinderLinear.vtk against the VTK reference numbers (SOURCES.md)', () => {
  it('cut area and ∫velocity_z dA at z = 0.02, 0.05, 0.08 agree to the 7 digits given', async () => {
    const d = await loadDatasetFile(FILE);
    for (const ref of VTK) {
      const r = integratePlane(d, { origin: [0, 0, ref.z], normal: [0, 0, 1] }).integrals;
      expect(r.empty).toBe(false);
      expect(Math.abs(r.area! / ref.area - 1), `area at z = ${ref.z}`).toBeLessThan(2e-7);
      expect(Math.abs((r.integral.velocity as number[])[2]! / ref.vz - 1), `∫v_z at z = ${ref.z}`).toBeLessThan(5e-7);
      // The flow runs along −z: the volume-flow rate through +z is negative and equals ∫velocity_z dA.
      expect(r.volumeFlowRate).toBeCloseTo((r.integral.velocity as number[])[2]!, 18);
      expect(r.roles.velocity).toBe('velocity (point)');
    }
  });
});
