/**
 * Bad legacy .vtk input is refused with a message that names the file, the section and (in ASCII) the
 * line, and says what was expected versus found; oversized declarations are refused before anything
 * is allocated, and no input hangs the reader. Reference: the project's rule "validate at the edge"
 * (STYLE.md §8) and the layouts of the VTK file-format document (legacy section); no external numbers.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readLegacyVtk } from '../../src/io/vtkLegacy.ts';
import { be, fileOf, text } from './legacyBytes.ts';

const H = (format = 'ASCII', version = '3.0') => `# vtk DataFile Version ${version}\nbad input\n${format}\nDATASET UNSTRUCTURED_GRID\n`;
const PTS = 'POINTS 4 float\n0 0 0 1 0 0 0 1 0 0 0 1\n';
const TET = `${PTS}CELLS 1 5\n4 0 1 2 3\nCELL_TYPES 1\n10\n`;

async function refusal(src: string | Uint8Array, name = 'bad.vtk'): Promise<string> {
  try {
    await readLegacyVtk(name, typeof src === 'string' ? text(src) : src);
  } catch (e) {
    expect(e).toBeInstanceOf(Error);
    return (e as Error).message;
  }
  throw new Error('expected the reader to refuse the input');
}

describe('legacy .vtk: refused input with clear messages', () => {
  it('a file that is not legacy VTK, or whose header is cut short', async () => {
    expect(await refusal('hello\n')).toBe('bad.vtk: line 1 is "hello", expected "# vtk DataFile Version x.y"');
    expect(await refusal('# vtk DataFile Version 3.0\n')).toBe('bad.vtk: the file ends after line 1, expected a title line');
    expect(await refusal('# vtk DataFile Version 3.0\nt\nTEXT\nDATASET POLYDATA\n')).toBe('bad.vtk: line 3 is "TEXT", expected ASCII or BINARY');
  });

  it('STRUCTURED_POINTS, STRUCTURED_GRID, RECTILINEAR_GRID and field-only files are refused, naming what is supported', async () => {
    for (const kind of ['STRUCTURED_POINTS', 'STRUCTURED_GRID', 'RECTILINEAR_GRID']) {
      expect(await refusal(`# vtk DataFile Version 3.0\nt\nASCII\nDATASET ${kind}\nDIMENSIONS 2 2 2\n`, 'image.vtk'))
        .toBe(`image.vtk: DATASET ${kind} at line 4 is not supported; fieldtally reads DATASET UNSTRUCTURED_GRID and DATASET POLYDATA (convert structured or image data to an unstructured grid first)`);
    }
    expect(await refusal('# vtk DataFile Version 3.0\nt\nASCII\nFIELD FieldData 1\na 1 1 float\n1\n'))
      .toBe('bad.vtk: found FIELD at line 4 (a field-only file, no mesh); fieldtally reads DATASET UNSTRUCTURED_GRID and DATASET POLYDATA');
  });

  it('truncated ASCII data: too few bytes for the declared count, or the values run out', async () => {
    expect(await refusal(`${H()}POINTS 4 float\n0 0 0 1 0\n`))
      .toBe('bad.vtk: POINTS (line 5): declares 12 values, which need at least 23 bytes as text, but only 11 bytes are left (file truncated, or a wrong count)');
    expect(await refusal(`${H()}POINTS 4 float\n0 0 0 1 0 0 0 1 0 0 0             \n`))
      .toBe('bad.vtk: POINTS (line 5): expected 12 values, but the file ends after 11');
    expect(await refusal(`${H()}POINTS 4 float\n0 0 0 1 0 0 0 1 0\nCELLS 1 5\n4 0 1 2 3\nCELL_TYPES 1\n10\n`))
      .toBe('bad.vtk: POINTS (line 5): value 9 (line 7) is "CELLS", expected a number (the section declares 12 values)');
  });

  it('truncated BINARY data and truncated binary cells', async () => {
    const pts = fileOf(H('BINARY'), 'POINTS 4 float\n', be('f32', [0, 0, 0, 1, 0]));
    expect(await refusal(pts)).toBe('bad.vtk: POINTS (byte 70): declares 12 values, which need at least 48 bytes, but only 20 bytes are left (file truncated, or a wrong count)');
    const cells = fileOf(H('BINARY'), 'POINTS 1 float\n', be('f32', [0, 0, 0]), '\nCELLS 1 2\n', be('i32', [1]));
    expect(await refusal(cells)).toMatch(/^bad\.vtk: CELLS \(byte 98\): declares 2 values, which need at least 8 bytes, but only 4 bytes are left/);
  });

  it('a CELLS count far beyond the file is refused at once, before allocating', async () => {
    const before = process.memoryUsage().arrayBuffers;
    const t0 = performance.now();
    expect(await refusal(`${H()}${PTS}CELLS 2000000000 2000000000\n4 0 1 2 3\n`))
      .toBe('bad.vtk: CELLS (line 7): declares 2000000000 values, which need at least 3999999999 bytes as text, but only 11 bytes are left (file truncated, or a wrong count)');
    const bin = fileOf(H('BINARY', '5.1'), 'POINTS 1 float\n', be('f32', [0, 0, 0]), '\nCELLS 900000000 900000000\nOFFSETS vtktypeint64\n', be('i64', [0, 1]));
    expect(await refusal(bin)).toMatch(/^bad\.vtk: CELLS OFFSETS \(byte \d+\): declares 900000000 values, which need at least 7200000000 bytes, but only 16 bytes are left/);
    expect(await refusal(`${H()}${PTS}CELLS 5 3\n4 0 1\n`))
      .toBe('bad.vtk: CELLS (line 7): declares 5 cells in a list of 3 integers; expected a size of at least 5 (each cell starts with its node count)');
    expect(performance.now() - t0).toBeLessThan(1000);
    expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(1 << 20);
  });

  it('huge declarations elsewhere (lookup table, field block) are refused without allocating or looping long', async () => {
    expect(await refusal(`${H()}${TET}POINT_DATA 4\nLOOKUP_TABLE t 99999999999\n`))
      .toBe('bad.vtk: POINT_DATA LOOKUP_TABLE "t" (line 12): declares 399999999996 values, which need at least 799999999991 bytes as text, but only 1 bytes are left (file truncated, or a wrong count)');
    expect(await refusal(`${H()}${TET}POINT_DATA 4\nFIELD f 99999999999\n`))
      .toBe('bad.vtk: POINT_DATA FIELD (line 12): the file ends where array 1 of 99999999999 was expected');
  });

  it('an unknown cell type (99) names the cell and the CELL_TYPES line', async () => {
    expect(await refusal(`${H()}${PTS}CELLS 2 8\n3 0 1 2\n3 1 2 3\nCELL_TYPES 2\n5\n99\n`))
      .toBe('bad.vtk: CELL_TYPES (line 10): cell 1 has cell type 99, which fieldtally does not read (expected a linear, quadratic or higher-order Lagrange/Bezier type, or 42 polyhedron)');
  });

  it('connectivity out of range names the cell, the point and the valid range', async () => {
    expect(await refusal(`${H()}${PTS}CELLS 1 5\n4 0 1 7 3\nCELL_TYPES 1\n10\n`))
      .toBe('bad.vtk: CELLS (line 7): cell 0 refers to point 7, but the file has 4 points (expected ids 0..3)');
    const poly = '# vtk DataFile Version 3.0\nt\nASCII\nDATASET POLYDATA\nPOINTS 3 float\n0 0 0 1 0 0 0 1 0\nPOLYGONS 1 4\n3 0 1 3\n';
    expect(await refusal(poly)).toBe('bad.vtk: POLYGONS (line 7): cell 0 refers to point 3, but the file has 3 points (expected ids 0..2)');
  });

  it('inconsistent packed lists and 5.1 offsets', async () => {
    expect(await refusal(`${H()}${PTS}CELLS 2 8\n3 0 1 2\n9 1 2 3\nCELL_TYPES 2\n5 5\n`))
      .toBe('bad.vtk: CELLS (line 7): cell 1 declares 9 nodes at list position 4, but the list of 8 integers ends first');
    expect(await refusal(`${H()}${PTS}CELLS 1 8\n3 0 1 2\n9 1 2 3\nCELL_TYPES 1\n5\n`))
      .toBe('bad.vtk: CELLS (line 7): declares a list of 8 integers, but its 1 cells use 4');
    const v51 = (cells: string) => `${H('ASCII', '5.1')}POINTS 3 float\n0 0 0 1 0 0 0 1 0\n${cells}`;
    expect(await refusal(v51('CELLS 2 3\nOFFSETS vtktypeint64\n0 4\nCONNECTIVITY vtktypeint64\n0 1 2\nCELL_TYPES 1\n5\n')))
      .toBe('bad.vtk: CELLS OFFSETS (line 8): the last offset is 4, expected 3 (the CONNECTIVITY size)');
    expect(await refusal(v51('CELLS 3 3\nOFFSETS vtktypeint64\n0 2 1\nCONNECTIVITY vtktypeint64\n0 1 2\nCELL_TYPES 2\n5 5\n')))
      .toBe('bad.vtk: CELLS OFFSETS (line 8): offset 2 (1) is smaller than offset 1 (2); expected non-decreasing offsets');
    expect(await refusal(v51('CELLS 2 3\nOFFSETS vtktypeint64\n0 3\nCELL_TYPES 1\n5\n')))
      .toBe('bad.vtk: CELLS (line 10): expected CONNECTIVITY after OFFSETS, found "CELL_TYPES"');
  });

  it('NaN in POINTS and in a field are refused by the piece validation, naming the point or tuple', async () => {
    expect(await refusal(`${H()}POINTS 4 float\n0 0 0 nan 0 0 0 1 0 0 0 1\nCELLS 1 5\n4 0 1 2 3\nCELL_TYPES 1\n10\n`))
      .toBe('bad.vtk: point 1 has a non-finite coordinate (NaN); expected finite numbers');
    expect(await refusal(`${H()}${TET}POINT_DATA 4\nSCALARS p double\nLOOKUP_TABLE default\n1 2 inf 4\n`))
      .toBe('bad.vtk: point array "p" has a non-finite value (Infinity) at tuple 2; expected finite numbers');
  });

  it('a text token where a number should be: in data (with its line) and in a count', async () => {
    expect(await refusal(`${H()}POINTS 4 float\n0 0 0 1 0 0\n0 abc 0 0 0 1\n`))
      .toBe('bad.vtk: POINTS (line 5): value 7 (line 7) is "abc", expected a number (the section declares 12 values)');
    expect(await refusal(`${H()}POINTS many float\n`)).toBe('bad.vtk: POINTS (line 5): the point count is "many", expected a non-negative integer');
    expect(await refusal(`${H()}${TET}CELL_DATA 1\nFIELD f 1\nq 1 1 unsigned_char\n300\n`))
      .toBe('bad.vtk: CELL_DATA FIELD array "q" (line 13): value 0 (line 14) is "300", expected an integer (UInt8) in 0..255');
    expect(await refusal(`${H()}${TET}CELL_DATA 1\nFIELD f 1\nq 1 1 int\n1.5\n`))
      .toBe('bad.vtk: CELL_DATA FIELD array "q" (line 13): value 0 (line 14) is "1.5", expected an integer (Int32) in -2147483648..2147483647');
  });

  it('unsupported types, unknown keywords, missing LOOKUP_TABLE', async () => {
    expect(await refusal(`${H()}POINTS 4 bit\n`)).toMatch(/^bad\.vtk: POINTS \(line 5\): data type "bit" \(packed bits\) is not supported; expected unsigned_char, char, .* float or double$/);
    expect(await refusal(`${H()}POINTS 4 quad_float\n`)).toMatch(/^bad\.vtk: POINTS \(line 5\): data type "quad_float" is not supported; expected unsigned_char/);
    expect(await refusal(`${H()}${TET}POINT_DATA 4\nSCALAR p float\n`))
      .toMatch(/^bad\.vtk: unexpected "SCALAR" at line 12 in POINT_DATA; expected one of SCALARS, COLOR_SCALARS, LOOKUP_TABLE, VECTORS/);
    expect(await refusal(`${H()}${TET}POINT_DATA 4\nSCALARS p float 1\n1 2 3 4\n`))
      .toBe('bad.vtk: POINT_DATA SCALARS "p" (line 12): expected LOOKUP_TABLE <name> after the data type and component count, found "1" (VTK requires "LOOKUP_TABLE default")');
    expect(await refusal(`${H()}${TET}VERTICES 1 2\n1 0\n`))
      .toMatch(/^bad\.vtk: unexpected "VERTICES" at line 11 in a DATASET UNSTRUCTURED_GRID; expected one of FIELD, POINTS, CELLS, CELL_TYPES/);
  });

  it('counts that disagree between sections', async () => {
    expect(await refusal(`${H()}${PTS}CELLS 1 5\n4 0 1 2 3\nCELL_TYPES 2\n10 10\n`))
      .toBe('bad.vtk: CELL_TYPES (line 9): declares 2 cell types, but CELLS holds 1 cells; expected equal counts');
    expect(await refusal(`${H()}${PTS}CELLS 1 5\n4 0 1 2 3\n`))
      .toBe('bad.vtk: CELLS (line 7): CELLS without CELL_TYPES; expected a CELL_TYPES section with 1 types');
    expect(await refusal(`${H()}${TET}POINT_DATA 5\n`)).toBe('bad.vtk: POINT_DATA (line 11): declares 5 tuples, but POINTS declares 4 points; expected equal counts');
    expect(await refusal(`${H()}${TET}CELL_DATA 2\n`)).toBe('bad.vtk: CELL_DATA (line 11): declares 2 tuples, but the file has 1 cells; expected equal counts');
    expect(await refusal(`${H()}${TET}POINT_DATA 4\nFIELD f 1\na 1 3 float\n1 2 3\n`))
      .toBe('bad.vtk: POINT_DATA FIELD array "a" (line 13): declares 3 tuples, expected 4 (the POINT_DATA count)');
    expect(await refusal(`${H()}CELLS 0 0\n`)).toBe('bad.vtk: no POINTS section; expected POINTS <count> <type> after DATASET');
  });

  it('binary ids beyond 32 bits and 64-bit values beyond 2^53 are refused', async () => {
    const ids = fileOf(H('BINARY', '5.1'), 'POINTS 1 float\n', be('f32', [0, 0, 0]), '\nCELLS 2 1\nOFFSETS vtktypeint64\n', be('i64', [0, 2 ** 40]));
    expect(await refusal(ids)).toMatch(/^bad\.vtk: CELLS OFFSETS \(byte \d+\): value 1099511627776 at index 1 is not an id in 0\.\.2147483647$/);
    const big = new Uint8Array(8); new DataView(big.buffer).setBigInt64(0, 2n ** 60n, false);
    const field = fileOf(H('BINARY'), 'POINTS 1 float\n', be('f32', [0, 0, 0]), '\nPOINT_DATA 1\nFIELD f 1\nbig 1 1 vtktypeint64\n', big);
    expect(await refusal(field)).toMatch(/^bad\.vtk: POINT_DATA FIELD array "big" \(byte \d+\): 64-bit value 1152921504606846976 at index 0 is beyond ±2\^53/);
  });

  it('every truncation of the VTK-written fixtures loads or is refused naming the file, quickly', async () => {
    // Reference files: tests/reference/expected/legacy/fixtures (written by VTK 9.1's legacy writers).
    const dir = resolve(__dirname, '../reference/expected/legacy/fixtures');
    for (const f of readdirSync(dir)) {
      const full = new Uint8Array(readFileSync(join(dir, f)));
      const t0 = performance.now();
      for (let cut = 0; cut < full.length; cut += 11) {
        try {
          await readLegacyVtk(f, full.subarray(0, cut));
        } catch (e) {
          expect(e).toBeInstanceOf(Error);
          expect((e as Error).message.startsWith(`${f}: `), (e as Error).message).toBe(true);
        }
      }
      expect(performance.now() - t0, f).toBeLessThan(10_000);
    }
  });
});
