/**
 * Choosing what to open from the files a user picked: the only file, else the set file, else a clear
 * refusal. The memory a load needs, judged from the files' size and how they store their arrays.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { MEMORY_PER_FILE_BYTE, loadRequestFor, memoryNeeded, memoryWarning, requestBytes, storageKind } from '../../src/app/fileChoice.ts';

const file = (name: string, size = 3, relative = '') => {
  const f = new File([new Uint8Array(size)], name);
  if (relative) Object.defineProperty(f, 'webkitRelativePath', { value: relative });
  return f;
};

describe('loadRequestFor', () => {
  it('opens a single file whatever its name', () => {
    const r = loadRequestFor([file('result.bin')]);
    expect(r.kind === 'files' && r.main.path).toBe('result.bin');
  });
  it('opens the set file and passes its pieces by path', () => {
    const r = loadRequestFor([file('a_0.vtu', 5), file('a.pvtu', 7), file('a_1.vtu', 11)]);
    if (r.kind !== 'files') throw new Error('expected files');
    expect(r.main.path).toBe('a.pvtu');
    expect(r.others.map((f) => f.path)).toEqual(['a_0.vtu', 'a_1.vtu']);
    expect(requestBytes(r)).toBe(23);
  });
  it('picks the shallowest set file of a folder', () => {
    const r = loadRequestFor([file('b.vtm', 1, 'case/sub/b.vtm'), file('a.vtm', 1, 'case/a.vtm'), file('p.vtu', 1, 'case/sub/p.vtu')]);
    expect(r.kind === 'files' && r.main.path).toBe('case/a.vtm');
  });
  it('refuses several result files without a set file', () => {
    expect(() => loadRequestFor([file('a.vtu'), file('b.vtu')])).toThrow(/2 files chosen and none is a set file/);
  });
});

/** The first bytes of a file, as the memory estimate reads them. */
const head = (path: string) => new TextDecoder('latin1').decode(readFileSync(path).subarray(0, 4096));
const REPO = join(__dirname, '../..');
const EXTERNAL = join(REPO, 'tests/fixtures/external');

describe('storageKind', () => {
  it('tells compressed, text read whole, text streamed by arrays and raw storage from the first bytes', () => {
    // the headers of these files are described in tests/fixtures/external/SOURCES.md and sample-fields/README.md
    expect(storageKind(head(join(REPO, 'sample-fields/pipe-medium.vtu')))).toBe('compressed');
    expect(storageKind(head(join(REPO, 'sample-fields/pipe-coarse.vtk')))).toBe('raw');
    expect(storageKind(head(join(EXTERNAL, 'vtk-data/Wedge.vtu')))).toBe('raw');
    expect(storageKind(head(join(EXTERNAL, 'vtk-data/AngularSector.vtk')))).toBe('streamedText');
    expect(storageKind(head(join(EXTERNAL, 'vtkio/hexahedron_ascii.vtu')))).toBe('streamedText');
    expect(storageKind(head(join(EXTERNAL, 'vtkio/hexahedron_inline_binary.vtu')))).toBe('streamedText');
    expect(storageKind(head(join(EXTERNAL, 'vtk-data/cow.vtp')))).toBe('compressed');
    // a compressor on a file whose arrays are all ASCII compresses nothing
    expect(storageKind(head(join(EXTERNAL, 'vtk-data/polyhedron2pieces.vtu')))).toBe('streamedText');
    // inline and appended data together are read whole; base64 appended data are streamed array by array
    const xml = (arrays: string, appended = '') => `<?xml version="1.0"?>\n<VTKFile type="UnstructuredGrid" version="1.0">\n<UnstructuredGrid><Piece>${arrays}</Piece></UnstructuredGrid>${appended}`;
    expect(storageKind(xml('<DataArray format="ascii">1 2</DataArray><DataArray format="appended" offset="0"/>', '<AppendedData encoding="raw">_'))).toBe('text');
    expect(storageKind(xml('<DataArray format="appended" offset="0"/>', '<AppendedData encoding="base64">_'))).toBe('streamedText');
    expect(storageKind(xml('<DataArray format="appended" offset="0"/>', '<AppendedData encoding="raw">_'))).toBe('raw');
    expect(storageKind('PK\u0003\u0004 not a VTK file')).toBe('unknown');
  });
});

describe('memory check', () => {
  it('estimates a compressed file at its decoded size, not its file size', async () => {
    const bytes = readFileSync(join(REPO, 'sample-fields/pipe-medium.vtu'));
    const r = loadRequestFor([new File([bytes], 'pipe-medium.vtu')]);
    expect(await memoryNeeded(r)).toBe(bytes.length * MEMORY_PER_FILE_BYTE.compressed);
    // a set is judged by its largest data file, not by the set file that only names the pieces
    const set = loadRequestFor([new File(['<VTKFile type="PUnstructuredGrid">'], 'a.pvtu'), new File([bytes], 'a_0.vtu')]);
    expect(await memoryNeeded(set)).toBe((bytes.length + 34) * MEMORY_PER_FILE_BYTE.compressed);
    expect(await memoryNeeded({ kind: 'url', url: 'x', name: 'x' })).toBe(0);
  });
  it('warns only above the heap limit the page reports', () => {
    const before = Object.getOwnPropertyDescriptor(performance, 'memory');
    Object.defineProperty(performance, 'memory', { configurable: true, get: () => ({ jsHeapSizeLimit: 100e6 }) });
    try {
      expect(memoryWarning(10e6, 90e6)).toBeUndefined();
      expect(memoryWarning(22_350_100, 156.45e6)).toBe('These files (22.4 MB) need about 156 MB of memory to open; this page can use about 100 MB. The tab may run out of memory. Open anyway?');
    } finally {
      if (before) Object.defineProperty(performance, 'memory', before); else delete (performance as { memory?: unknown }).memory;
    }
  });
});
