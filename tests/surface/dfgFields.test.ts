/**
 * The 2D-1 fields of tests/fixtures/dfg/ (written by our own Python writer, tests/reference/dfg/write_vtu.py)
 * read the same by fieldtally and by VTK 9.1 (tests/reference/dfg/dfg_vtk.py, Debian python3-vtk9; numbers in
 * tests/reference/expected/dfg/dfg_vtk.json): counts, every wedge positively oriented with the volumes adding
 * up to VTK's, boundary faces as vtkDataSetSurfaceFilter finds them, and the point probes of the benchmark's
 * Δp (Schäfer & Turek 1996, docs/references.md §8) as vtkProbeFilter gives them.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { probePoints } from '../../src/locate/pointProbe.ts';
import { cellVolume } from '../../src/model/cellMeasure.ts';
import { totalCells, totalPoints } from '../../src/model/dataset.ts';
import { getBoundaryFaces } from '../../src/surface/surfaceCache.ts';

const ROOT = join(__dirname, '..', '..');
interface VtkCase {
  file: string; points: number; cells: number; cellTypes: number[]; volume: number; boundaryFaces: number;
  probes: { at: [number, number, number]; valid: number; pressure: number }[];
}
const doc = JSON.parse(readFileSync(join(ROOT, 'tests/reference/expected/dfg/dfg_vtk.json'), 'utf8')) as { cases: VtkCase[] };

describe('DFG 2D-1 fields: fieldtally reads what VTK 9.1 reads', () => {
  for (const c of doc.cases) {
    it(c.file, async () => {
      const d = await loadDatasetFile(join(ROOT, c.file));
      expect(totalPoints(d)).toBe(c.points);
      expect(totalCells(d)).toBe(c.cells);
      expect(c.cellTypes).toEqual([13]);
      let volume = 0, negative = 0, others = 0;
      for (const p of d.pieces) {
        for (let k = 0; k < p.cellTypes.length; k++) {
          if (p.cellTypes[k] !== 13) others++;
          const v = cellVolume(p, k);
          if (!(v > 0)) negative++;
          volume += v;
        }
      }
      expect(others, 'cells that are not wedges').toBe(0);
      expect(negative, 'wedges with non-positive volume').toBe(0);
      expect(volume / c.volume - 1).toBeCloseTo(0, 12);
      // the channel less the cylinder, 0.1 deep: 0.41·2.2 − π·0.05², the faceted circle adding a sliver
      const curved = (0.41 * 2.2 - Math.PI * 0.05 ** 2) * 0.1;
      expect(volume).toBeGreaterThan(curved);
      expect(volume / curved - 1).toBeLessThan(5e-6);
      expect(getBoundaryFaces(d).count).toBe(c.boundaryFaces);
      const r = probePoints(d, c.probes.flatMap((q) => q.at), { fields: ['pressure'] });
      const p = r.fields[0]!.columns[0]!;
      c.probes.forEach((q, i) => {
        expect(r.valid[i]).toBe(q.valid);
        // both points are wedge vertices (on the cylinder, mid-depth); VTK inverts the wedge map iteratively, so
        // its value carries ~1e-8 of that iteration (measured 7e-8 relative)
        expect(Math.abs(p[i]! / q.pressure - 1)).toBeLessThan(1e-6);
      });
    });
  }
});
