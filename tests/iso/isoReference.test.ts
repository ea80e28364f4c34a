/**
 * fieldtally's iso-surfaces against VTK 9.1 (vtkContourFilter + vtkIntegrateAttributes, recorded by
 * tests/reference/iso_reference.py on the 3D cells of the sample fields): the same area and the same surface
 * integral of the velocity to rounding. On the sphere files (tetrahedra) both cut each cell where its linear
 * interpolant takes the value (VTK to a few parts in 10^9, the script's own double-precision construction to
 * 1e-12); on the duct (hexahedra) the pressure is linear along the duct, so every
 * triangulation of the section gives the same exact plane.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readDataset } from '../../src/io/readDataset.ts';
import { isoSurfaces } from '../../src/iso/isoSurface.ts';

interface RefSurface { value: number; triangles: number; area: number; velocityIntegral: number[]; tetraArea?: number }
interface RefDoc { vtk: string; cases: { name: string; file: string; array: string; surfaces: RefSurface[] }[] }

const ROOT = resolve(__dirname, '../..');
const ISO_REFERENCE = resolve(ROOT, 'tests/reference/expected/iso/iso_reference.json');

/** Compares fieldtally with one recorded reference document (the committed one, or a fresh run). */
async function compareIsoWithVtk(path: string): Promise<void> {
  const ref = JSON.parse(readFileSync(path, 'utf8')) as RefDoc;
  for (const c of ref.cases) {
    const d = await readDataset(c.file.split('/').pop()!, new Uint8Array(readFileSync(resolve(ROOT, c.file))));
    const mine = isoSurfaces(d, { field: c.array, values: c.surfaces.map((s) => s.value), colourBy: 'velocity' });
    c.surfaces.forEach((r, i) => {
      const s = mine[i]!, where = `${c.name} ${c.array} = ${r.value}`;
      expect(r.area, `${where}: VTK found a surface`).toBeGreaterThan(0);
      // VTK's vertices sit a few parts in 10^9 off the double-precision edge interpolation (see the script).
      expect(Math.abs(s.area / r.area - 1), `${where}: area ${s.area} vs VTK ${r.area}`).toBeLessThan(1e-7);
      if (r.tetraArea !== undefined) expect(Math.abs(s.area / r.tetraArea - 1), `${where}: area vs the script's double-precision construction`).toBeLessThan(1e-12);
      const u = s.fields[0]!.values, ix = s.indices, p = s.positions, integral = [0, 0, 0];
      for (let t = 0; t < ix.length / 3; t++) {
        const a = ix[3 * t]!, b = ix[3 * t + 1]!, cc = ix[3 * t + 2]!;
        const ux = p[3 * b]! - p[3 * a]!, uy = p[3 * b + 1]! - p[3 * a + 1]!, uz = p[3 * b + 2]! - p[3 * a + 2]!;
        const vx = p[3 * cc]! - p[3 * a]!, vy = p[3 * cc + 1]! - p[3 * a + 1]!, vz = p[3 * cc + 2]! - p[3 * a + 2]!;
        const area = 0.5 * Math.hypot(uy * vz - uz * vy, uz * vx - ux * vz, ux * vy - uy * vx);
        for (let k = 0; k < 3; k++) integral[k]! += (area * (u[3 * a + k]! + u[3 * b + k]! + u[3 * cc + k]!)) / 3;
      }
      const scale = Math.max(...r.velocityIntegral.map(Math.abs));
      for (let k = 0; k < 3; k++) expect(Math.abs(integral[k]! - r.velocityIntegral[k]!) / scale, `${where}: ∫u dA[${k}]`).toBeLessThan(1e-7);
    });
  }
}

describe('iso-surfaces against VTK 9.1 vtkContourFilter (committed reference)', () => {
  it('same area and ∫u dA on tetrahedral and hexahedral sample fields', async () => {
    await compareIsoWithVtk(ISO_REFERENCE);
  });
});
