/**
 * Bad XML input is refused with a clear message — file, piece, array, expected vs found — before any
 * large allocation. Reference: the project's rule "validate at the edge" (STYLE.md §8) and the VTK
 * file-format description for what each damaged field means; no external numbers are involved.
 */
import { describe, expect, it } from 'vitest';
import { readVtkSet } from '../../src/io/vtkSets.ts';
import { readVtkXml } from '../../src/io/vtkXml.ts';
import { externalBytes, externalResolver } from '../helpers/external.ts';
import { buildXml, tetPyramidPiece, type PieceSpec } from '../helpers/vtkXmlFixtures.ts';

const FILES = [
  'vtk-data/Wedge.vtu', 'vtk-data/polyhedron2pieces.vtu', 'vtk-data/cow.vtp', 'vtk-data/ex-blow_5.vtm',
  'vtk-data/ex-blow_5/ex-blow_5_0_3.vtu', 'vtk-data/ex-blow_5/ex-blow_5_1_5.vtu',
  'vtkio/box.vtu', 'vtkio/hexahedron_ascii.vtu', 'vtkio/hexahedron_inline_binary.vtu',
  'vtu11/pyramids_3D/ascii.vtu', 'vtu11/pyramids_3D/base64.vtu', 'vtu11/pyramids_3D/base64appended.vtu',
  'vtu11/pyramids_3D/raw.vtu', 'vtu11/pyramids_3D/raw_compressed.vtu',
  'vtu11/parallel_write/pyramids_3D/tester/pyramids3D_parallel_test.pvtu',
  'vtu11/parallel_write/pyramids_3D/tester/pyramids3D_parallel_test/pyramids3D_parallel_test_0.vtu',
];

const enc = (s: string) => new TextEncoder().encode(s);
const latin1 = (b: Uint8Array) => Buffer.from(b).toString('latin1');
const fromLatin1 = (s: string) => new Uint8Array(Buffer.from(s, 'latin1'));
const nameOf = (rel: string) => rel.split('/').pop()!;

function read(rel: string, bytes: Uint8Array) {
  const name = nameOf(rel);
  return /\.(pvtu|vtm)$/.test(rel) ? readVtkSet(name, bytes, { resolve: externalResolver(rel) }) : readVtkXml(name, bytes);
}

/** Runs `load`, expects it to reject with `pattern`, and checks it allocated no large buffers on the way. */
async function expectRefused(load: () => Promise<unknown>, pattern: RegExp | string): Promise<void> {
  const before = process.memoryUsage().arrayBuffers;
  await expect(load()).rejects.toThrow(pattern);
  const grown = process.memoryUsage().arrayBuffers - before;
  expect(grown, `array buffers grew by ${grown} bytes`).toBeLessThan(64 * 2 ** 20);
}

describe('truncated external files', () => {
  for (const rel of FILES) {
    it(`${rel}: every cut before </VTKFile> is a clear error`, async () => {
      const bytes = externalBytes(rel);
      const end = latin1(bytes).lastIndexOf('</VTKFile>') + '</VTKFile>'.length;
      const cuts = new Set<number>([0, 1, 10, end - 1, end - 5]);
      for (let k = 1; k < 24; k++) cuts.add(Math.floor((end * k) / 24));
      const app = latin1(bytes).indexOf('<AppendedData');
      if (app > 0) for (const d of [20, 40, 60, 100]) cuts.add(Math.min(end - 1, app + d));
      for (const cut of cuts) {
        await expectRefused(() => read(rel, bytes.slice(0, cut)), new RegExp(`^${nameOf(rel).replace(/\./g, '\\.')}: `));
      }
    });
  }
});

/** Replaces the first occurrence of `from` in a file's latin1 text. */
function patched(rel: string, from: string | RegExp, to: string): Uint8Array {
  const s = latin1(externalBytes(rel));
  const t = s.replace(from, to);
  expect(t, `patch ${String(from)} applies to ${rel}`).not.toBe(s);
  return fromLatin1(t);
}

/** Overwrites bytes at the start of the appended data plus `at`. */
function patchAppended(rel: string, at: number, bytes: number[]): Uint8Array {
  const b = externalBytes(rel).slice();
  const start = latin1(b).indexOf('_', latin1(b).indexOf('<AppendedData')) + 1;
  b.set(bytes, start + at);
  return b;
}

describe('damaged headers and sizes', () => {
  it('a block header that disagrees with the declared count', async () => {
    // raw.vtu: UInt64 headers; the first array ("Flash Strength Points", 10 Float64) starts at offset 0.
    const b = patchAppended('vtu11/pyramids_3D/raw.vtu', 0, [0, 0, 0, 0, 0, 1, 0, 0]);
    await expectRefused(() => readVtkXml('raw.vtu', b), 'raw.vtu: piece 0: point DataArray "Flash Strength Points": declares 10 values, block holds 137438953472');
  });

  it('a header value beyond 2^53', async () => {
    const b = patchAppended('vtk-data/Wedge.vtu', 0, [255, 255, 255, 255, 255, 255, 255, 255]);
    await expectRefused(() => readVtkXml('Wedge.vtu', b), /^Wedge\.vtu: piece 0: point DataArray "DistanceToCenter": the block header holds a header value beyond 2\^53/);
  });

  it('counts far beyond the file', async () => {
    await expectRefused(() => readVtkXml('raw.vtu', patched('vtu11/pyramids_3D/raw.vtu', 'NumberOfPoints="10"', 'NumberOfPoints="2000000000"')),
      'raw.vtu: piece 0: DataArray (Points): declares 6000000000 values, block holds 30');
    await expectRefused(() => readVtkXml('ascii.vtu', patched('vtu11/pyramids_3D/ascii.vtu', 'NumberOfPoints="10"', 'NumberOfPoints="2000000000"')),
      'ascii.vtu: piece 0: DataArray (Points): declares 6000000000 values, the text holds 30');
    await expectRefused(() => readVtkXml('ascii.vtu', patched('vtu11/pyramids_3D/ascii.vtu', 'NumberOfCells="5"', 'NumberOfCells="1099511627776"')),
      'ascii.vtu: piece 0: NumberOfCells="1099511627776" exceeds the 2147483647 items a piece can hold');
    await expectRefused(() => readVtkXml('raw_compressed.vtu', patched('vtu11/pyramids_3D/raw_compressed.vtu', 'NumberOfPoints="10"', 'NumberOfPoints="400000000"')),
      'raw_compressed.vtu: piece 0: DataArray (Points): declares 1200000000 values, zlib blocks hold 30');
  });

  it('a zlib header that claims a huge block, consistently with the declared count', async () => {
    // raw_compressed.vtu, Points at appended offset 108: [nBlocks=1, blockSize, last, compressedSize] as UInt64.
    const n = 100_000_000;
    const words = new Uint8Array(new BigUint64Array([1n, BigInt(n * 24), 0n]).buffer);
    const b = patched('vtu11/pyramids_3D/raw_compressed.vtu', 'NumberOfPoints="10"', `NumberOfPoints="${n}"`);
    const start = latin1(b).indexOf('_', latin1(b).indexOf('<AppendedData')) + 1;
    b.set(words, start + 108);
    await expectRefused(() => readVtkXml('raw_compressed.vtu', b), /^raw_compressed\.vtu: piece 0: DataArray \(Points\): zlib block 0 of 1 claims 2400000000 bytes from \d+ compressed bytes, more than zlib can expand; the header is corrupt$/);
  });

  it('an appended offset beyond the data', async () => {
    await expectRefused(() => readVtkXml('raw.vtu', patched('vtu11/pyramids_3D/raw.vtu', 'offset="0"', 'offset="900000"')),
      /raw\.vtu: piece 0: point DataArray "Flash Strength Points": offset 900000 lies beyond the appended data \(\d+ bytes\)/);
  });
});

describe('damaged data', () => {
  it('bad base64', async () => {
    const b = patched('vtu11/pyramids_3D/base64.vtu', 'KAAAAAAAAAA=AAAAAAAA8D8', 'KAAAAAAAAAA=AAAA*AAA8D8');
    await expectRefused(() => readVtkXml('base64.vtu', b), /^base64\.vtu: piece 0: cell DataArray "cell Colour": invalid base64 character "\*" at byte \d+$/);
  });

  it('corrupt zlib streams', async () => {
    // First array of raw_compressed.vtu: 32 header bytes, then its zlib stream.
    await expectRefused(() => readVtkXml('raw_compressed.vtu', patchAppended('vtu11/pyramids_3D/raw_compressed.vtu', 32, [0x12, 0x34])),
      'raw_compressed.vtu: piece 0: point DataArray "Flash Strength Points": zlib block 0 of 1 is corrupt (invalid zlib data)');
    await expectRefused(() => readVtkXml('raw_compressed.vtu', patchAppended('vtu11/pyramids_3D/raw_compressed.vtu', 34, [0xff, 0xff, 0xff, 0xff, 0xff, 0xff])),
      /raw_compressed\.vtu: piece 0: point DataArray "Flash Strength Points": zlib block 0 of 1 (is corrupt|inflates to \d+ bytes, the header says 80)/);
  });

  it('NaN values in points and fields', async () => {
    await expectRefused(() => readVtkXml('ascii.vtu', patched('vtu11/pyramids_3D/ascii.vtu', '1 2 3 4 0', '1 2 nan 4 0')),
      'ascii.vtu: piece 0: cell array "cell Colour" has a non-finite value (NaN) at tuple 2; expected finite numbers');
    await expectRefused(() => readVtkXml('ascii.vtu', patched('vtu11/pyramids_3D/ascii.vtu', '0 0 0 0 3 0', '0 0 0 0 NaN 0')),
      'ascii.vtu: piece 0: point 1 has a non-finite coordinate (NaN); expected finite numbers');
    await expectRefused(() => readVtkXml('ascii.vtu', patched('vtu11/pyramids_3D/ascii.vtu', '1 2 3 4 0', '1 2 three 4 0')),
      'ascii.vtu: piece 0: cell DataArray "cell Colour": value 2 is "three", expected a number');
  });

  it('a bad token deep in a long ASCII array is reported at its index in the array', async () => {
    const values: (number | string)[] = Array.from({ length: 70_000 }, (_, i) => i * 0.5);
    const bytes = buildXml('UnstructuredGrid', [], { encoding: 'ascii', fieldData: [{ name: 'history', type: 'Float64', values: values as number[], extra: 'NumberOfTuples="70000"' }] });
    const text = latin1(bytes).replace(' 34500 ', ' 3x4500 ');
    await expectRefused(() => readVtkXml('long.vtu', fromLatin1(text)), 'long.vtu: FieldData DataArray "history": value 69000 is "3x4500", expected a number');
  });

  it('connectivity out of range, unknown cell types, decreasing offsets, bad ids', async () => {
    const file = (piece: PieceSpec) => buildXml('UnstructuredGrid', [piece], { encoding: 'ascii' });
    const with_ = (name: string, values: (number | bigint)[], type?: string) => {
      const p = tetPyramidPiece();
      const a = p.sections[3]!.arrays.find((x) => x.name === name)!;
      a.values = values;
      if (type) a.type = type;
      return file(p);
    };
    await expectRefused(() => readVtkXml('c.vtu', with_('connectivity', [0, 1, 2, 3, 4, 0, 1, 3, 6])), 'c.vtu: piece 0: connectivity entry 8 is point 6, but the piece has 6 points (expected 0..5)');
    await expectRefused(() => readVtkXml('c.vtu', with_('connectivity', [0, 1, 2, 3, 4, 0, 1, -3, 5])), 'c.vtu: piece 0: DataArray "connectivity": value -3 at index 7 is not an id in 0..2147483647');
    await expectRefused(() => readVtkXml('t.vtu', with_('types', [14, 99])), /^t\.vtu: piece 0: cell 1 has cell type 99, which fieldtally does not read/);
    await expectRefused(() => readVtkXml('t.vtu', with_('types', [14, 300])), 't.vtu: piece 0: DataArray "types": value 300 at index 1 is not a valid UInt8');
    await expectRefused(() => readVtkXml('o.vtu', with_('offsets', [5, 4])), 'o.vtu: piece 0: DataArray "offsets": offsets entry 1 is 4, less than the previous end 5');
    await expectRefused(() => readVtkXml('o.vtu', with_('offsets', [5, 12])), 'o.vtu: piece 0: DataArray "connectivity": declares 12 values, the text holds 9');
    await expectRefused(() => readVtkXml('n.vtu', with_('types', [14, 12])), 'n.vtu: piece 0: cell 1 is a hexahedron with 4 nodes, expected 8');
    const big = tetPyramidPiece('Int64');
    big.sections[3]!.arrays[0]!.values = [0n, 1n, 3_000_000_000n, 3n, 4n, 0n, 1n, 3n, 5n];
    for (const encoding of ['ascii', 'appended-raw', 'binary'] as const) {
      await expectRefused(() => readVtkXml('big.vtu', buildXml('UnstructuredGrid', [big], { encoding, headerType: 'UInt64' })),
        'big.vtu: piece 0: DataArray "connectivity": value 3000000000 at index 2 is not an id in 0..2147483647');
    }
  });

  it('broken structure: missing sections, wrong component counts, unknown format, polyhedron without faces', async () => {
    const p = tetPyramidPiece();
    p.sections = p.sections.filter((s) => s.tag !== 'Points');
    await expectRefused(() => readVtkXml('p.vtu', buildXml('UnstructuredGrid', [p], { encoding: 'ascii' })), 'p.vtu: piece 0: NumberOfPoints="6" but the piece has no <Points> DataArray');
    const q = tetPyramidPiece();
    q.sections[2]!.arrays[0]!.components = 2;
    await expectRefused(() => readVtkXml('q.vtu', buildXml('UnstructuredGrid', [q], { encoding: 'ascii' })), 'q.vtu: piece 0: DataArray (Points): points have 2 components, expected 3');
    const r = tetPyramidPiece();
    r.sections[3]!.arrays[2]!.values = [14, 42];
    await expectRefused(() => readVtkXml('r.vtu', buildXml('UnstructuredGrid', [r], { encoding: 'ascii' })), 'r.vtu: piece 0: the piece has polyhedron cells (type 42) but <Cells> holds no "faces"/"faceoffsets" or "polyhedron_offsets" arrays');
    r.sections[3]!.arrays.push({ name: 'faces', type: 'Int32', values: [] }, { name: 'faceoffsets', type: 'Int32', values: [-1, -1] });
    await expectRefused(() => readVtkXml('r.vtu', buildXml('UnstructuredGrid', [r], { encoding: 'ascii' })), 'r.vtu: piece 0: cell 1 is a polyhedron but its faceoffsets entry is -1; expected the end of its faces');
    await expectRefused(() => readVtkXml('f.vtu', enc(latin1(buildXml('UnstructuredGrid', [tetPyramidPiece()], { encoding: 'ascii' })).replace(/format="ascii"/, 'format="hex"'))),
      'f.vtu: piece 0: point DataArray "static pressure": format="hex" is not supported (expected ascii, binary or appended)');
    await expectRefused(() => readVtkXml('b.vtu', enc(latin1(buildXml('UnstructuredGrid', [tetPyramidPiece()], { encoding: 'ascii' })).replace('LittleEndian', 'MiddleEndian'))),
      'b.vtu: byte_order="MiddleEndian" is not LittleEndian or BigEndian');
    await expectRefused(() => readVtkXml('h.vtu', enc(latin1(buildXml('UnstructuredGrid', [tetPyramidPiece()], { encoding: 'ascii' })).replace('header_type="UInt32"', 'header_type="UInt16"'))),
      'h.vtu: header_type="UInt16" is not UInt32 or UInt64');
    await expectRefused(() => readVtkXml('x.vtu', enc('<Other/>')), 'x.vtu: the root element is <Other>, expected <VTKFile> (not a VTK XML file)');
  });
});
