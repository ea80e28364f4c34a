/**
 * Every file in tests/fixtures/external loads with the counts, array names, components, ranges and
 * bounds that VTK 9.1 reads from it (reference: tests/reference/vtk_info.py → expected/info/*.json,
 * produced with Debian's python3-vtk9), or is refused with the expected clear error.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadDatasetFile } from '../../src/io/nodeFiles.ts';
import { loadReport, type ArraySummary } from '../../src/model/loadReport.ts';

const EXTERNAL = resolve(__dirname, '../fixtures/external');
const EXPECTED = resolve(__dirname, '../reference/expected/info');

interface VtkArray { name: string; components: number; range: [number, number] | null }
interface VtkInfo {
  file: string; points: number; cells: number; cellTypes: Record<string, number>;
  pointData: VtkArray[]; cellData: VtkArray[]; fieldData: VtkArray[]; bounds: number[] | null;
}

/** Files fieldtally refuses on purpose, with the words the error must carry. */
const REFUSED: Record<string, RegExp> = {
  'vtkio/hexahedron_lzma_inline_binary.vtu': /hexahedron_lzma_inline_binary\.vtu.*vtkLZMADataCompressor.*zlib/,
};

const close = (a: number, b: number) => Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));

function sameArrays(ours: ArraySummary[], vtk: VtkArray[], what: string): void {
  expect(ours.map((a) => a.name).sort(), `${what} names`).toEqual(vtk.map((a) => a.name).sort());
  for (const v of vtk) {
    const o = ours.find((a) => a.name === v.name)!;
    expect(o.components, `${what} "${v.name}" components`).toBe(v.components);
    if (v.range === null) { expect(o.range).toBeNull(); continue; }
    expect(close(o.range![0], v.range[0]) && close(o.range![1], v.range[1]), `${what} "${v.name}" range ${o.range} vs VTK ${v.range}`).toBe(true);
  }
}

const files = readdirSync(EXPECTED).filter((f) => f.endsWith('.json')).map((f) => JSON.parse(readFileSync(join(EXPECTED, f), 'utf8')) as VtkInfo);

describe('external files against VTK 9.1', () => {
  it('covers every external file (41 of them)', () => {
    expect(files.length).toBe(41);
  });
  for (const vtk of files) {
    const refused = REFUSED[vtk.file];
    it(`${vtk.file}${refused ? ' is refused clearly' : ''}`, async () => {
      const path = join(EXTERNAL, vtk.file);
      if (refused) {
        await expect(loadDatasetFile(path)).rejects.toThrow(refused);
        return;
      }
      const r = loadReport(await loadDatasetFile(path));
      expect(r.points).toBe(vtk.points);
      expect(r.cells).toBe(vtk.cells);
      expect(r.cellTypes).toEqual(vtk.cellTypes);
      sameArrays(r.pointData, vtk.pointData, 'point data');
      sameArrays(r.cellData, vtk.cellData, 'cell data');
      sameArrays(r.fieldData, vtk.fieldData, 'field data');
      if (vtk.bounds === null) expect(r.bounds).toBeNull();
      else r.bounds!.forEach((b, i) => expect(close(b, vtk.bounds![i]!), `bounds[${i}] ${b} vs ${vtk.bounds![i]}`).toBe(true));
    });
  }
});
