/**
 * Regressions of the hostile-input findings (issue 16), one case each: special files refused by type
 * before they are opened (as a file and as a set's piece), bounded XML nesting and tag sizes, misspelled
 * elements refused instead of dropped, legacy files ending inside METADATA or right after a section
 * header refused, zlib blocks that inflate past their declared size stopped, memory claimed before each
 * array, and valid edge files (a long comment before the root, long runs of blanks in legacy text) read
 * with the same counts as the plain file. Reference: the project's rule "validate at the edge"
 * (STYLE.md §8) and the VTK file-format specification (VTK User's Guide, 11th ed., Kitware 2010,
 * ch. 19 "VTK File Formats"); no external numbers are involved.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { deflateSync } from 'node:zlib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { withMemoryBudget } from '../../src/io/memoryBudget.ts';
import { loadDatasetFile, nodeInflate } from '../../src/io/nodeFiles.ts';
import { readDataset } from '../../src/io/readDataset.ts';
import { fflateInflate } from '../../src/io/xmlBlocks.ts';
import { XML_LIMITS } from '../../src/io/xmlScan.ts';
import { loadReport } from '../../src/model/loadReport.ts';

const REPO = resolve(__dirname, '../..');
const PIPE_VTU = join(REPO, 'sample-fields/pipe-coarse.vtu');
const EXTERNAL = join(REPO, 'tests/fixtures/external');
const VTM = join(EXTERNAL, 'vtk-data/ex-blow_5.vtm');
const enc = new TextEncoder();

let dir = '';
beforeAll(() => { dir = mkdtempSync(join(tmpdir(), 'fieldtally-hostile-')); });
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const counts = async (name: string, bytes: Uint8Array) => {
  const r = loadReport(await readDataset(name, bytes));
  return { points: r.points, cells: r.cells, pointData: r.pointData.map((a) => a.name), cellData: r.cellData.map((a) => a.name) };
};
const failure = async (p: Promise<unknown>): Promise<string> => {
  try { await p; } catch (e) { return (e as Error).message; }
  throw new Error('expected a failure');
};
/** One printable line: no control characters, no line break. */
const printableLine = (m: string) => expect(m, m).toMatch(/^[^\x00-\x1f\x7f]+$/);

const CUBE = `# vtk DataFile Version 3.0
unit cube
ASCII
DATASET UNSTRUCTURED_GRID
POINTS 8 double
0 0 0 1 0 0 0 1 0 1 1 0 0 0 1 1 0 1 0 1 1 1 1 1
CELLS 1 9
8 0 1 3 2 4 5 7 6
CELL_TYPES 1
11
POINT_DATA 8
SCALARS p double 1
LOOKUP_TABLE default
0 1 2 3 4 5 6 7
METADATA
INFORMATION 0

`;

describe('special files are refused by type, before opening', () => {
  it('a named pipe, a folder and a device as the file', async () => {
    const fifo = join(dir, 'pipe.vtu');
    execFileSync('mkfifo', [fifo]);
    expect(await failure(loadDatasetFile(fifo))).toBe(`${fifo}: is a named pipe, expected a regular file`);
    expect(await failure(loadDatasetFile(dir))).toBe(`${dir}: is a folder, expected a regular file`);
    expect(await failure(loadDatasetFile('/dev/zero'))).toBe('/dev/zero: is a character device, expected a regular file');
  });

  it('a named pipe and /dev/zero as a piece of a set', async () => {
    const fifo = join(dir, 'piece-pipe.vtu');
    execFileSync('mkfifo', [fifo]);
    for (const piece of [fifo, '/dev/zero']) {
      const set = join(dir, 'set.pvtu');
      writeFileSync(set, `<VTKFile type="PUnstructuredGrid"><PUnstructuredGrid><Piece Source="${piece}"/></PUnstructuredGrid></VTKFile>`);
      const m = await failure(loadDatasetFile(set));
      expect(m).toMatch(/^set\.pvtu: piece file ".*" is missing or unreadable \(.*: is a (named pipe|character device), expected a regular file\)$/);
    }
  });
});

describe('XML scanner limits', () => {
  it('a million nested elements: refused at the depth limit, not a stack or heap overflow', async () => {
    const bytes = enc.encode('<VTKFile type="UnstructuredGrid">' + '<a>'.repeat(1_000_000));
    const m = await failure(readDataset('deep.vtu', bytes));
    expect(m).toMatch(new RegExp(`^deep\\.vtu: elements nested more than ${XML_LIMITS.depth} deep at byte \\d+ \\(<a>\\)`));
  });

  it('an over-long tag name and attribute value are refused, quoting a short escaped part', async () => {
    const longName = enc.encode(`<VTKFile type="UnstructuredGrid"><${'\u0001'.repeat(5000)}>`);
    const m1 = await failure(readDataset('name.vtu', longName));
    expect(m1).toMatch(/^name\.vtu: tag name at byte 33 is longer than 256 bytes \(starts "<\\x01\\x01/);
    printableLine(m1);
    const longValue = enc.encode(`<VTKFile type="UnstructuredGrid" x="${'v'.repeat(XML_LIMITS.value + 10)}">`);
    expect(await failure(readDataset('value.vtu', longValue))).toMatch(/^value\.vtu: the value of attribute "x" of <VTKFile> at byte 35 is longer than 1048576 bytes$/);
  });
});

describe('misspelled elements are errors, never dropped data', () => {
  it('<DataArry> in <PointData> of a .vtu', async () => {
    const text = new TextDecoder('latin1').decode(readFileSync(PIPE_VTU));
    const bad = text.replace('<DataArray type="Float64" Name="p"', '<DataArry type="Float64" Name="p"');
    const m = await failure(readDataset('pipe.vtu', Uint8Array.from(bad, (c) => c.charCodeAt(0))));
    expect(m).toMatch(/^pipe\.vtu: unknown element <DataArry> at byte \d+ inside <PointData> \(did you mean <DataArray>\?\); expected <DataArray>, <Array>$/);
  });

  it('<Dataset> in a .vtm block', async () => {
    const text = readFileSync(VTM, 'utf8');
    const m = await failure(readDataset('ex-blow_5.vtm', enc.encode(text.replace('<DataSet', '<Dataset').replace('</DataSet>', '</Dataset>')), {
      resolve: async (rel) => new Uint8Array(readFileSync(join(EXTERNAL, 'vtk-data', rel))),
    }));
    expect(m).toMatch(/^ex-blow_5\.vtm: unknown element <Dataset> at byte \d+ inside <Piece> \(did you mean <DataSet>\?\)/);
  });
});

describe('legacy files that end before their sections are complete', () => {
  it('the whole cube loads: 8 points, 1 cell, one point array', async () => {
    expect(await counts('cube.vtk', enc.encode(CUBE))).toEqual({ points: 8, cells: 1, pointData: ['p'], cellData: [] });
  });

  it('cut inside METADATA is an error naming the block', async () => {
    const cut = CUBE.slice(0, CUBE.indexOf('INFORMATION 0') + 'INFORMATION 0'.length);
    expect(await failure(readDataset('cube.vtk', enc.encode(cut)))).toMatch(/^cube\.vtk: METADATA \(line 15\): the file ends inside the METADATA block; expected a blank line closing it/);
  });

  it('cut right after POINT_DATA 8 is an error; after the points, a warning that cells may be missing', async () => {
    const atSection = CUBE.slice(0, CUBE.indexOf('SCALARS'));
    expect(await failure(readDataset('cube.vtk', enc.encode(atSection)))).toBe('cube.vtk: the file ends right after POINT_DATA 8; expected its arrays (is the file truncated?)');
    const d = await readDataset('cube.vtk', enc.encode(CUBE.slice(0, CUBE.indexOf('CELLS'))));
    expect(d.warnings).toEqual(['cube.vtk: the file has 8 points and no cell list (CELLS and CELL_TYPES); if the file was cut short, its cells are missing']);
  });
});

describe('valid edge files load with the same counts', () => {
  it('a 100 kB comment before the root element', async () => {
    const plain = new Uint8Array(readFileSync(PIPE_VTU));
    const at = new TextDecoder('latin1').decode(plain.subarray(0, 200)).indexOf('<VTKFile');
    const withComment = new Uint8Array([...enc.encode(`<?xml version="1.0"?>\n<!-- ${'x'.repeat(100_000)} -->\n`), ...plain.subarray(at)]);
    const expected = await counts('pipe.vtu', plain);
    expect(expected.cells).toBe(1280);
    expect(await counts('pipe.vtu', withComment)).toEqual(expected);
    const path = join(dir, 'comment.vtu');
    writeFileSync(path, withComment);
    expect(loadReport(await loadDatasetFile(path)).cells).toBe(1280);
  });

  it('20 MB runs of blanks and line breaks inside legacy data and between sections (read by windows)', async () => {
    const spaced = CUBE.replace('1 1 1\n', `${' '.repeat(20 << 20)}1 1 1\n`).replace('4 5 6 7', `4${'\n'.repeat(3 << 20)} 5 6 7`).replace('CELLS 1 9', `CELLS${' '.repeat(3 << 20)}1 9`);
    const path = join(dir, 'spaced.vtk');
    writeFileSync(path, spaced);
    const d = await loadDatasetFile(path);
    expect(loadReport(d)).toMatchObject({ points: 8, cells: 1 });
    expect(Array.from(d.pieces[0]!.pointData[0]!.values)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
  });
});

describe('zlib blocks that inflate past their declared size stop at once', () => {
  // 256 MiB of zeros in about 250 kB: far more than any declared size below.
  const bomb = deflateSync(new Uint8Array(256 << 20), { level: 9 });
  it('fflate and node:zlib report more than declared without inflating it all (at most one 64 kB piece of input, ~64 MiB)', () => {
    for (const inflate of [fflateInflate, nodeInflate]) {
      const out = new Uint8Array(1000);
      const got = inflate(bomb, out);
      expect(got).toBeGreaterThan(1000);
      expect(got).toBeLessThan(80 << 20);
    }
  });

  it('a .vtu whose block inflates past its header says so', async () => {
    // One Float64 point array of 3 values (24 bytes) whose single zlib block holds 64 MiB.
    const header = new Uint32Array([1, 24, 24, bomb.length]);
    const b64 = Buffer.concat([Buffer.from(header.buffer), Buffer.from(bomb)]).toString('base64');
    const xml = `<VTKFile type="UnstructuredGrid" compressor="vtkZLibDataCompressor"><UnstructuredGrid><Piece NumberOfPoints="1" NumberOfCells="0">
<Points><DataArray type="Float64" NumberOfComponents="3" format="binary">${b64}</DataArray></Points>
<Cells><DataArray type="Int32" Name="connectivity" format="ascii"></DataArray><DataArray type="Int32" Name="offsets" format="ascii"></DataArray><DataArray type="UInt8" Name="types" format="ascii"></DataArray></Cells>
</Piece></UnstructuredGrid></VTKFile>`;
    const path = join(dir, 'bomb.vtu');
    writeFileSync(path, xml);
    expect(await failure(loadDatasetFile(path))).toMatch(/^bomb\.vtu: .*zlib block 0 of 1 inflates past the 24 bytes its header declares \(stopped there\)$/);
  });
});

describe('memory is claimed before each array', () => {
  it('a small file declaring 2 GiB is refused under a 64 MiB budget, naming the array', async () => {
    const xml = `<VTKFile type="UnstructuredGrid"><UnstructuredGrid><Piece NumberOfPoints="89478485" NumberOfCells="0">
<Points><DataArray type="Float64" NumberOfComponents="3" format="ascii">${'0 '.repeat(200_000_000 / 1000)}</DataArray></Points>
</Piece></UnstructuredGrid></VTKFile>`;
    const m = await failure(readDataset('big.vtu', enc.encode(xml), { memoryLimit: 64 << 20, memoryHint: 'test hint' }));
    expect(m).toMatch(/^big\.vtu: piece 0: .*(declares 268435455 values, the text holds|needs 2\.0 GiB for this array)/);
  });

  it('claims add up over a load and the budget ends with it', async () => {
    const bytes = enc.encode(CUBE);
    await expect(withMemoryBudget(64 + 8, 'hint', () => readDataset('cube.vtk', bytes))).rejects.toThrow(/above the memory limit of 72 bytes \(hint\)$/);
    expect(loadReport(await readDataset('cube.vtk', bytes, { memoryLimit: 1 << 20 })).points).toBe(8);
  });
});

describe('messages are one printable line naming the file', () => {
  it('binary garbage is quoted escaped and cut', async () => {
    const junk = new Uint8Array(200).map((_, i) => (i * 37) % 256);
    const m = await failure(readDataset('junk.vtu', junk));
    printableLine(m);
    expect(m).toMatch(/^junk\.vtu: not a VTK file \(expected "# vtk DataFile" or "<VTKFile" at the start, found "\\x00%J/);
    expect(m.length).toBeLessThan(300);
  });

  it('an empty file, and a long path cut in the middle', async () => {
    const deepDir = join(dir, 'a'.repeat(60), 'b'.repeat(60));
    mkdirSync(deepDir, { recursive: true });
    const empty = join(deepDir, 'empty.vtu');
    writeFileSync(empty, '');
    expect(await failure(loadDatasetFile(empty))).toBe('empty.vtu: the file is empty; expected "# vtk DataFile" or "<VTKFile" at the start');
    const m = await failure(loadDatasetFile(join(deepDir, 'missing.vtu')));
    expect(m).toMatch(/^.{30,}….*b\/missing\.vtu: cannot read file \(no such file or folder\)$/);
    expect(m.length).toBeLessThan(140);
  });
});
