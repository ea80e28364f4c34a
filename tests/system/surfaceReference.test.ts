/**
 * Re-runs tests/reference/surface_reference.py (vtkDataSetSurfaceFilter on the 3D cells, Debian python3-vtk9)
 * into a temporary file and checks that VTK's boundary extraction today equals the committed JSON in
 * tests/reference/expected/surface/, which tests/surface/surfaceReference.test.ts compares fieldtally against
 * with Node only. Fails with "install with: apt-get install -y python3-vtk9" when VTK's Python is missing.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { expect, it } from 'vitest';
import { runVtkScript } from './requirements.ts';

interface Entry { faces: number; area: number; facesBySize: Record<string, number>; cells3d: number; merged: Omit<Entry, 'merged'> }

it('VTK 9.1 boundary faces of the external files equal tests/reference/expected/surface', () => {
  const dir = mkdtempSync(join(tmpdir(), 'fieldtally-surface-ref-'));
  try {
    const out = join(dir, 'boundary_faces.json');
    runVtkScript(resolve(__dirname, '../reference/surface_reference.py'), [out]);
    const fresh = JSON.parse(readFileSync(out, 'utf8')) as { files: Record<string, Entry> };
    const committed = JSON.parse(readFileSync(resolve(__dirname, '../reference/expected/surface/boundary_faces.json'), 'utf8')) as { files: Record<string, Entry> };
    expect(Object.keys(fresh.files).sort()).toEqual(Object.keys(committed.files).sort());
    for (const [path, want] of Object.entries(committed.files)) {
      const got = fresh.files[path]!;
      for (const [a, b] of [[got, want], [got.merged, want.merged]] as const) {
        expect(a.faces, path).toBe(b.faces);
        expect(a.cells3d, path).toBe(b.cells3d);
        expect(a.facesBySize, path).toEqual(b.facesBySize);
        expect(a.area, path).toBeCloseTo(b.area, 12);
      }
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
