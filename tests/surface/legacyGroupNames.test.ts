/**
 * Group labels from the name tables of legacy .vtk files: the dataset-level FIELD string arrays of files
 * written by VTK 9.1's own legacy writer (vtkUnstructuredGridWriter, ASCII and BINARY; written and read
 * back by tests/reference/legacy_group_names.py with Debian python3-vtk9) are read as VTK reads them and
 * name the surface groups by the same rules as XML files (src/surface/groupNames.ts). Bad string arrays
 * are refused with messages naming the file, the array and the line or byte.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { blobSource } from '../../src/io/blobSource.ts';
import { readLegacyVtk, readLegacyVtkFrom } from '../../src/io/vtkLegacy.ts';
import { boundaryFaces } from '../../src/surface/boundaryFaces.ts';
import { resolveGroups, surfaceGroups } from '../../src/surface/surfaceGroups.ts';
import { be, fileOf, text } from '../io/legacyBytes.ts';

const FIXTURES = 'tests/fixtures/group-names';
// What VTK 9.1 reads back from the fixtures it wrote.
const VTK = JSON.parse(readFileSync('tests/reference/expected/legacy_group_names.json', 'utf8')) as Record<string, { cells: number; 'zone names': string[]; 'zone ids'?: number[]; zone: number[] }>;

const centre = (c: readonly number[]) => c.map((v) => Math.round(v * 1e9) / 1e9).join(',');

describe('group names from legacy .vtk files written by VTK', () => {
  for (const enc of ['ascii', 'binary']) {
    it(`a 1-based name table (${enc}) names the groups of array "zone"`, async () => {
      const file = `tank-names-${enc}.vtk`, vtk = VTK[file]!;
      const d = await readLegacyVtk(file, new Uint8Array(readFileSync(`${FIXTURES}/${file}`)));
      expect(d.fieldStrings).toEqual([{ name: 'zone names', values: vtk['zone names'] }]);
      expect(d.warnings).toEqual([]);
      const g = surfaceGroups(d, boundaryFaces(d));
      expect(g.groupArray).toBe('zone');
      expect(g.groups.slice(0, 2).map((x) => [x.id, x.name, x.nameFrom ?? null, x.faces, centre(x.centroid)])).toEqual([
        [1, 'filler neck', 'name-table', 4, '0,0.5,0.5'], [2, 'drain', 'name-table', 4, '1,0.5,0.5'],
      ]);
      expect(g.groups.slice(2).every((x) => x.source === 'feature-angle' && x.name === `part ${x.id}`)).toBe(true);
      expect(resolveGroups(g, ['drain'])).toEqual([1]);
    });

    it(`a name table with an id array (${enc}, %-escaped and UTF-8 names), also read through a moving window`, async () => {
      const file = `tank-ids-${enc}.vtk`, vtk = VTK[file]!;
      const bytes = new Uint8Array(readFileSync(`${FIXTURES}/${file}`));
      for (const d of [await readLegacyVtk(file, bytes), await readLegacyVtkFrom(blobSource(new Blob([bytes]), file))]) {
        expect(d.fieldStrings).toEqual([{ name: 'zone names', values: vtk['zone names'] }]);
        expect(d.fieldData.map((f) => [f.name, Array.from(f.values)])).toEqual([['zone ids', vtk['zone ids']]]);
        const g = surfaceGroups(d, boundaryFaces(d));
        // "zone ids" = [3, 7]: value 3 (the x = 1 side) is "drain", value 7 (x = 0) "Überlauf 50%"
        expect(g.groups.slice(0, 2).map((x) => [x.id, x.name, centre(x.centroid)])).toEqual([
          [3, 'drain', '1,0.5,0.5'], [7, 'Überlauf 50%', '0,0.5,0.5'],
        ]);
      }
    });
  }
});

const H = (format: string) => `# vtk DataFile Version 5.1\nnames\n${format}\nDATASET UNSTRUCTURED_GRID\n`;
const PTS = 'POINTS 3 float\n0 0 0 1 0 0 0 1 0\nCELLS 2 3\nOFFSETS vtktypeint64\n0 3\nCONNECTIVITY vtktypeint64\n0 1 2\nCELL_TYPES 1\n5\n';

async function refusal(src: Uint8Array): Promise<string> {
  try {
    await readLegacyVtk('bad.vtk', src);
  } catch (e) {
    return (e as Error).message;
  }
  throw new Error('expected the reader to refuse the input');
}

describe('legacy string arrays: bad input', () => {
  it('ASCII: strings cut short, a count that runs into the next section, an unknown type', async () => {
    expect(await refusal(text(`${H('ASCII')}${PTS}FIELD FieldData 1\nzone%20names 1 3 string\ninlet\noutlet\n`)))
      .toBe('bad.vtk: FIELD array "zone names" (line 15): expected 3 strings, but the file ends after 2');
    // a count too small leaves a name where a keyword is expected
    expect(await refusal(text(`${H('ASCII')}FIELD FieldData 1\nzone%20names 1 1 string\ninlet\noutlet\n${PTS}`)))
      .toBe('bad.vtk: unexpected "outlet" at line 8 in a DATASET UNSTRUCTURED_GRID; expected one of FIELD, POINTS, CELLS, CELL_TYPES, POINT_DATA, CELL_DATA, METADATA');
    expect(await refusal(text(`${H('ASCII')}FIELD FieldData 1\nzone%20names 1 2 strings\ninlet\noutlet\n${PTS}`)))
      .toMatch(/^bad\.vtk: FIELD array "zone names" \(line 6\): .*"strings"/);
  });

  it('BINARY: a string longer than the bytes left, a file that ends between strings', async () => {
    const head = `${H('BINARY')}FIELD FieldData 1\nzone%20names 1 2 string\n`;
    // 0xc5: a 1-byte length of 5, then "inlet"; 0xc6: 6 bytes announced, 3 present
    expect(await refusal(fileOf(head, new Uint8Array([0xc5]), 'inlet', new Uint8Array([0xc6]), 'out')))
      .toBe('bad.vtk: FIELD array "zone names" (byte 84): string 1 declares 6 bytes, but only 3 are left (file truncated, or a wrong count)');
    expect(await refusal(fileOf(head, new Uint8Array([0xc5]), 'inlet')))
      .toBe('bad.vtk: FIELD array "zone names" (byte 84): expected 2 strings, but the file ends after 1');
    // 0x80 0x05: a 2-byte length of 5
    const d = await readLegacyVtk('ok.vtk', fileOf(head, new Uint8Array([0x80, 0x05]), 'inlet', new Uint8Array([0xc0]), '\n', `POINTS 3 float\n`, be('f32', [0, 0, 0, 1, 0, 0, 0, 1, 0]), '\n'));
    expect(d.fieldStrings).toEqual([{ name: 'zone names', values: ['inlet', ''] }]);
  });

  it('a string array of two components, and string arrays in CELL_DATA, are skipped with a warning (a CELL_DATA section of only string arrays is not taken for a truncated file)', async () => {
    const d = await readLegacyVtk('two.vtk', text(`${H('ASCII')}FIELD FieldData 1\npairs 2 1 string\na\nb\n${PTS}CELL_DATA 1\nFIELD FieldData 1\nlabel 1 1 string\nwall\n`));
    expect(d.fieldStrings).toBeUndefined();
    expect(d.warnings).toEqual([
      'two.vtk: FIELD array "pairs" (line 6): string array skipped (a name table has 1 component, this one 2)',
      'two.vtk: CELL_DATA FIELD array "label" (line 20): string array skipped (fieldtally reads numeric arrays only)',
    ]);
  });
});
