/**
 * Reading by ranges (`readDatasetFrom` on a `ByteSource`) gives exactly what reading the whole file's bytes
 * gives (`readDataset`): the same arrays (kinds and bytes), warnings and counts, or the same error message.
 * Checked on every external file, through a file on disk (`loadDatasetFile`: node:zlib inflater), a source
 * that copies ranges, and a Blob, and on files written by our writers in every encoding. Reference: the
 * bytes path, itself checked against VTK 9.1 (externalFiles.test.ts, vtkReference.test.ts); no external
 * numbers are involved here.
 */
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { basename, dirname, join, relative, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { blobSource } from '../../src/io/blobSource.ts';
import { bytesSource, inMemoryBytes, readInto } from '../../src/io/byteSource.ts';
import { readWhole } from '../../src/io/sourceArrays.ts';
import { loadDatasetFile, nodeInflate, openFileSource } from '../../src/io/nodeFiles.ts';
import { readDataset, readDatasetFrom } from '../../src/io/readDataset.ts';
import { copyingSource, expectSameOutcome, outcome } from '../helpers/sources.ts';
import { toBase64Appended, writtenDataset, writtenFiles } from '../helpers/writtenFiles.ts';

const EXTERNAL = resolve(__dirname, '../fixtures/external');

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? walk(p) : /\.(vtk|vtu|vtp|pvtu|vtm)$/.test(f) ? [p] : [];
  });
}

const bytesOf = (path: string) => new Uint8Array(readFileSync(path));

describe('byte sources', () => {
  it('bytesSource hands out views; readInto and readWhole fill and check', async () => {
    const b = Uint8Array.from({ length: 100 }, (_, i) => i);
    const s = bytesSource('b.bin', b);
    const v = await s.read(10, 5);
    expect(v.buffer).toBe(b.buffer);
    expect(Array.from(v)).toEqual([10, 11, 12, 13, 14]);
    expect((await s.read(98, 10)).length).toBe(2);
    expect(inMemoryBytes(s)).toBe(b);
    expect(await readWhole(s)).toBe(b);
    const t = new Uint8Array(3);
    await readInto(s, 50, t);
    expect(Array.from(t)).toEqual([50, 51, 52]);
    await expect(readInto(s, 99, t)).rejects.toThrow('b.bin: cannot read bytes 99..102: the file holds 100 bytes');
  });

  it('blobSource reads ranges of a Blob into fresh aligned buffers', async () => {
    const b = Uint8Array.from({ length: 100 }, (_, i) => i);
    const s = blobSource(new Blob([b as Uint8Array<ArrayBuffer>]), 'b.bin');
    expect(s.size).toBe(100);
    const v = await s.read(7, 4);
    expect(v.byteOffset).toBe(0);
    expect(Array.from(v)).toEqual([7, 8, 9, 10]);
    expect((await s.read(120, 4)).length).toBe(0);
    expect(inMemoryBytes(s)).toBeUndefined();
    await expect(readInto(s, 98, new Uint8Array(4))).rejects.toThrow('b.bin: cannot read bytes 98..102: the file holds 100 bytes');
  });

  it('a file source reads straight into the caller’s buffer and says when the file is shorter', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'fieldtally-src-'));
    try {
      const path = join(dir, 'f.bin');
      writeFileSync(path, Uint8Array.from({ length: 1000 }, (_, i) => i & 255));
      const s = await openFileSource(path);
      try {
        expect(s.name).toBe('f.bin');
        expect(s.size).toBe(1000);
        const t = new Uint8Array(4);
        await s.readInto!(998 - 2, t);
        expect(Array.from(t)).toEqual([996 & 255, 997 & 255, 998 & 255, 999 & 255]);
        await expect(s.readInto!(999, t)).rejects.toThrow('f.bin: cannot read bytes 999..1003: the file holds 1000 bytes');
        expect(Array.from(await s.read(990, 100))).toEqual([222, 223, 224, 225, 226, 227, 228, 229, 230, 231]);
      } finally {
        await s.close();
      }
      await expect(openFileSource(join(dir, 'nope.vtu'))).rejects.toThrow(/nope\.vtu: cannot read file \(no such file or folder\)/);
    } finally {
      rmSync(dir, { recursive: true });
    }
  });
});

describe('every external file: by ranges as by bytes', () => {
  for (const path of walk(EXTERNAL)) {
    const rel = relative(EXTERNAL, path);
    it(rel, async () => {
      const name = basename(path), folder = dirname(path);
      const bytes = bytesOf(path);
      const want = await outcome(() => readDataset(name, bytes, { resolve: async (p) => bytesOf(join(folder, p)) }));
      expectSameOutcome(await outcome(() => loadDatasetFile(path)), want, `${rel} from disk`);
      expectSameOutcome(await outcome(() => readDatasetFrom(copyingSource(name, bytes), {
        resolveSource: async (p) => copyingSource(basename(p), bytesOf(join(folder, p))),
      })), want, `${rel} by copied ranges`);
      expectSameOutcome(await outcome(() => readDatasetFrom(blobSource(new Blob([bytes as Uint8Array<ArrayBuffer>]), name), {
        resolveSource: async (p) => blobSource(new Blob([bytesOf(join(folder, p)) as Uint8Array<ArrayBuffer>]), basename(p)),
      })), want, `${rel} from a Blob`);
    });
  }
});

describe('files written in every encoding: by ranges as by bytes', () => {
  const written = writtenFiles(writtenDataset());
  const files = [...written, ...written.filter(([n]) => /-(zlib|appended-raw)-UInt/.test(n)).map(([n, b]) => [n.replace('.vtu', '-as-base64-appended.vtu'), toBase64Appended(b)] as [string, Uint8Array])];
  const dir = mkdtempSync(join(tmpdir(), 'fieldtally-written-'));
  afterAll(() => rmSync(dir, { recursive: true }));
  for (const [name, bytes] of files) {
    it(name, async () => {
      const want = await outcome(() => readDataset(name, bytes));
      expect('ok' in want, `${name}: ${'error' in want ? want.error : ''}`).toBe(true);
      const path = join(dir, name);
      writeFileSync(path, bytes);
      expectSameOutcome(await outcome(() => loadDatasetFile(path)), want, `${name} from disk`);
      expectSameOutcome(await outcome(() => readDatasetFrom(copyingSource(name, bytes))), want, `${name} by copied ranges`);
      expectSameOutcome(await outcome(() => readDatasetFrom(copyingSource(name, bytes, { readInto: false }))), want, `${name} by fresh ranges`);
      expectSameOutcome(await outcome(() => readDatasetFrom(blobSource(new Blob([bytes as Uint8Array<ArrayBuffer>]), name))), want, `${name} from a Blob`);
      expectSameOutcome(await outcome(() => readDataset(name, bytes, { inflate: nodeInflate })), want, `${name} with node:zlib`);
    });
  }

  it('several loads at once share the scratch safely', async () => {
    const picked = written.filter(([n]) => /appended-raw-UInt64-Int64|zlib-UInt32-Int64|binary-5\.1/.test(n));
    expect(picked.length).toBe(3);
    const wants = await Promise.all(picked.map(([n, b]) => outcome(() => readDataset(n, b))));
    const gots = await Promise.all([...picked, ...picked].map(([n, b]) => outcome(() => readDatasetFrom(copyingSource(n, b)))));
    gots.forEach((g, i) => expectSameOutcome(g, wants[i % picked.length]!, `${picked[i % picked.length]![0]} concurrent ${i}`));
  });
});
