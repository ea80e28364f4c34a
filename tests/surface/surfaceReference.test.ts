/**
 * Boundary faces of the external VTK files (tests/fixtures/external, SOURCES.md) against VTK 9.1's surface
 * extraction, from tests/reference/surface_reference.py (JSON in tests/reference/expected/surface/).
 * Reference: VTK vtkDataSetSurfaceFilter on the 3D cells only (the filter passes 2D cells through, so the
 * script removes them first to compare like with like), areas from vtkCellSizeFilter.
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { boundaryFaces, totalArea } from '../../src/surface/boundaryFaces.ts';
import { surfaceQuality } from '../../src/surface/surfaceQuality.ts';

const EXTERNAL = resolve(__dirname, '../fixtures/external');

interface Entry { faces: number; area: number; facesBySize: Record<string, number>; cells3d: number }
interface Reference { vtkVersion: string; files: Record<string, Entry & { merged: Entry }> }

const reference = JSON.parse(readFileSync(resolve(process.cwd(), 'tests/reference/expected/surface/boundary_faces.json'), 'utf8')) as Reference;

function bySize(offsets: Int32Array): Record<string, number> {
  const out: Record<string, number> = {};
  for (let f = 0; f + 1 < offsets.length; f++) { const k = String(offsets[f + 1]! - offsets[f]!); out[k] = (out[k] ?? 0) + 1; }
  return out;
}

describe(`boundary faces match VTK ${reference.vtkVersion} surface extraction (count, face sizes, area)`, () => {
  for (const [path, want] of Object.entries(reference.files)) {
    it(path, async () => {
      const d = await loadDatasetFile(resolve(EXTERNAL, path));
      const b = boundaryFaces(d);
      // Pieces are matched across their interface, as VTK's appended pieces are with MergePoints on.
      expect(b.cells3d).toBe(want.merged.cells3d);
      expect(b.count).toBe(want.merged.faces);
      expect(bySize(b.offsets)).toEqual(want.merged.facesBySize);
      // Relative 1e-7: VTK reads the quadratic cylinder's corner faces with a 7e-9 difference; all others agree to 1e-15.
      if (want.merged.area > 0) expect(Math.abs(totalArea(b) - want.merged.area) / want.merged.area).toBeLessThan(1e-7);
      else expect(totalArea(b)).toBe(0);
      // The boundary of a volume is closed (∮ n dA = 0) and consistently oriented; VTKCellTypes.vtk glues its
      // tetrahedron onto half of the hexahedron's top face, so two edges there have three faces: reported, not hidden.
      if (b.count > 0) {
        const q = surfaceQuality(b);
        expect(q.closure).toBeLessThan(1e-12);
        expect(q.inconsistentEdges).toBe(0);
        expect(q.openEdges).toBe(0);
        expect(q.nonManifoldEdges).toBe(path === 'vtk-data/VTKCellTypes.vtk' ? 2 : 0);
        expect(q.closed).toBe(path !== 'vtk-data/VTKCellTypes.vtk');
      }
    });
  }

  it('the faces between the pieces of pyramids3D_parallel_test.pvtu are not boundary', async () => {
    const path = 'vtu11/parallel_write/pyramids_3D/tester/pyramids3D_parallel_test.pvtu';
    const b = boundaryFaces(await loadDatasetFile(resolve(EXTERNAL, path)));
    const want = reference.files[path]!;
    // VTK without merging counts 4 interface faces twice (17); merged, and as the one-file twin ascii.vtu: 13.
    expect(want.faces).toBe(17);
    expect(b.merge.method).toBe('coordinates');
    expect(b.merge.shared).toBeGreaterThan(0);
    expect(b.count).toBe(13);
    expect(b.count).toBe(reference.files['vtu11/pyramids_3D/ascii.vtu']!.faces);
    expect(totalArea(b)).toBeCloseTo(reference.files['vtu11/pyramids_3D/ascii.vtu']!.area, 12);
  });
});
