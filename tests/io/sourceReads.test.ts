/**
 * What a load reads from its source, and that reading by ranges refuses bad input exactly as reading the
 * whole bytes does. A source that logs its reads shows: a raw appended XML file is never read whole, each
 * byte of its data is read once, and no read is larger than the readers' scratch; zlib data and binary
 * legacy files likewise; files with inline data are read whole, once. Truncated and mutated files give
 * the same message (or the same dataset) by both paths. Reference: the bytes path (checked against VTK
 * 9.1 elsewhere) and the project's rule "validate at the edge" (STYLE.md §8); no external numbers.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { basename, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { SCRATCH_BYTES } from '../../src/io/elementConvert.ts';
import { WINDOW_BYTES } from '../../src/io/legacyCursor.ts';
import { readDataset, readDatasetFrom } from '../../src/io/readDataset.ts';
import { writeLegacyVtk } from '../../src/io/writeLegacy.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { datasetOf, hexGrid } from '../../src/model/meshBuild.ts';
import { copyingSource, expectSameContent, expectSameOutcome, outcome, type ReadRecord } from '../helpers/sources.ts';
import { toBase64Appended, writtenDataset, writtenFiles } from '../helpers/writtenFiles.ts';
import { seededRandom as rng } from '../../src/model/seededRandom.ts';

/** How often each byte of the file was read. */
function coverage(size: number, log: ReadRecord[]): Uint8Array {
  const times = new Uint8Array(size);
  for (const r of log) for (let i = r.offset; i < r.offset + r.length; i++) times[i]!++;
  return times;
}

const text = (b: Uint8Array) => Buffer.from(b).toString('latin1');

/** Reads beyond the data: the format sniff (4 KB), the header search (64 KB), the tail search (4 KB) and block headers. */
const OVERHEAD = 4096 + 64 * 1024 + 4096 + 1024;

async function logged(name: string, bytes: Uint8Array) {
  const log: ReadRecord[] = [];
  const d = await readDatasetFrom(copyingSource(name, bytes, { log }));
  expectSameContent(d, await readDataset(name, bytes), name);
  return { log, total: log.reduce((s, r) => s + r.length, 0), largest: Math.max(...log.map((r) => r.length)) };
}

describe('reads of a load', () => {
  const big = datasetOf([hexGrid(40, 40, 40)], 'big');

  it('raw appended XML: the header, the tail and each array once; never the whole file', async () => {
    const bytes = writeVtu(big, { encoding: 'appended-raw', idType: 'Int64', headerType: 'UInt64' });
    expect(bytes.length).toBeGreaterThan(6 * SCRATCH_BYTES);
    const { log, total, largest } = await logged('raw.vtu', bytes);
    const dataStart = text(bytes).indexOf('_', text(bytes).indexOf('<AppendedData')) + 1;
    const times = coverage(bytes.length, log);
    // Every byte of the appended data read exactly once, but for the first chunk of the file (the header
    // search reads 64 KB) and its last few kilobytes (the search for </AppendedData>).
    expect(dataStart).toBeLessThan(4096);
    for (let i = 64 * 1024; i < bytes.length - 4096; i++) if (times[i] !== 1) throw new Error(`byte ${i} of the data read ${times[i]} times`);
    expect(total).toBeLessThan(bytes.length + OVERHEAD);
    expect(largest).toBeLessThanOrEqual(SCRATCH_BYTES);
  });

  it('zlib XML: the compressed blocks once, in batches no larger than the scratch', async () => {
    const bytes = writeVtu(big, { encoding: 'zlib', idType: 'Int64', blockSize: 32768 });
    const { log, total, largest } = await logged('zlib.vtu', bytes);
    const times = coverage(bytes.length, log);
    for (let i = 64 * 1024; i < bytes.length - 4096; i++) if (times[i] !== 1) throw new Error(`byte ${i} of the data read ${times[i]} times`);
    expect(total).toBeLessThan(bytes.length + OVERHEAD);
    expect(largest).toBeLessThanOrEqual(Math.max(SCRATCH_BYTES, 64 * 1024));
  });

  it('base64 appended XML (VTK’s default layout, zlib or not): each array’s text once, never the whole file', async () => {
    for (const [name, bytes] of [
      ['b64.vtu', writeVtu(big, { encoding: 'appended-base64' })],
      ['b64z.vtu', toBase64Appended(writeVtu(big, { encoding: 'zlib', blockSize: 32768 }))],
    ] as const) {
      const { log, total, largest } = await logged(name, bytes);
      const times = coverage(bytes.length, log);
      for (let i = 64 * 1024; i < bytes.length - 4096; i++) if (times[i] !== 1) throw new Error(`${name}: byte ${i} read ${times[i]} times`);
      expect(total, name).toBeLessThan(bytes.length + OVERHEAD);
      expect(largest, name).toBeLessThanOrEqual(SCRATCH_BYTES);
    }
  });

  it('binary legacy: text windows and each array once, never the whole file', async () => {
    const bytes = writeLegacyVtk(big, { binary: true, version: '5.1' });
    const { log, total, largest } = await logged('big.vtk', bytes);
    const arrays = log.filter((r) => r.into).reduce((s, r) => s + r.length, 0);
    expect(arrays).toBeLessThanOrEqual(bytes.length);
    expect(arrays).toBeGreaterThan(bytes.length - 1000);
    // Windows of text: the first, and one after each of POINTS, OFFSETS, CONNECTIVITY and CELL_TYPES.
    expect(total - arrays).toBeLessThanOrEqual(5 * WINDOW_BYTES);
    expect(largest).toBeLessThanOrEqual(SCRATCH_BYTES);
  });

  it('binary legacy with text longer than the window between arrays: read whole instead, same dataset', async () => {
    const bytes = writeLegacyVtk(big, { binary: true, version: '5.1' });
    const s = text(bytes), at = s.indexOf('CELL_TYPES');
    const meta = `METADATA\nINFORMATION 1\nNAME note LOCATION fieldtally\nDATA ${'x'.repeat(WINDOW_BYTES + 100)}\n\n`;
    const longer = new Uint8Array(Buffer.from(s.slice(0, at) + meta + s.slice(at), 'latin1'));
    const { total } = await logged('meta.vtk', longer);
    expect(total).toBeGreaterThan(longer.length);
  });

  it('inline data (ascii, base64) and text legacy files: read whole, once', async () => {
    for (const [name, bytes] of [
      ['a.vtu', writeVtu(big, { encoding: 'ascii' })], ['b.vtu', writeVtu(big, { encoding: 'base64' })],
      ['t.vtk', writeLegacyVtk(big, { binary: false })],
    ] as const) {
      const { log, total } = await logged(name, bytes);
      const times = coverage(bytes.length, log);
      for (let i = 64 * 1024; i < bytes.length; i++) if (times[i] !== 1) throw new Error(`${name}: byte ${i} read ${times[i]} times`);
      expect(total, name).toBeLessThan(bytes.length + OVERHEAD);
    }
  });
});

const EXTERNAL = resolve(__dirname, '../../../shared/fields/external');

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? walk(p) : /\.(vtk|vtu|vtp)$/.test(f) ? [p] : [];
  });
}


async function sameBothWays(name: string, bytes: Uint8Array, where: string): Promise<void> {
  const want = await outcome(() => readDataset(name, bytes));
  expectSameOutcome(await outcome(() => readDatasetFrom(copyingSource(name, bytes))), want, where);
  expectSameOutcome(await outcome(() => readDatasetFrom(copyingSource(name, bytes, { readInto: false }))), want, `${where} (fresh ranges)`);
}

describe('bad input: the same refusal by ranges as by bytes', () => {
  const files: [string, Uint8Array][] = [
    ...walk(EXTERNAL).map((p) => [relative(EXTERNAL, p), new Uint8Array(readFileSync(p))] as [string, Uint8Array]),
    ...writtenFiles(writtenDataset(6)),
    // Larger than the readers' first chunk and text window, so the by-range paths read in several steps.
    ['big-w-base64-appended-zlib.vtu', toBase64Appended(writeVtu(writtenDataset(16), { encoding: 'zlib', blockSize: 5000 }))],
    ['big-w-base64-appended.vtu', toBase64Appended(writeVtu(writtenDataset(16), { encoding: 'appended-raw', headerType: 'UInt32' }))],
    ...writtenFiles(writtenDataset(16)).filter(([n]) => /appended-raw-UInt32-Int64|zlib-UInt64-Int64|binary-(4\.2|5\.1)/.test(n)).map(([n, b]) => [`big-${n}`, b] as [string, Uint8Array]),
  ];
  for (const [rel, full] of files) {
    it(`${rel}: truncated at 16 points and mutated 24 times`, async () => {
      const name = basename(rel);
      for (let k = 1; k <= 16; k++) await sameBothWays(name, full.slice(0, Math.floor((full.length * k) / 17)), `${rel} cut ${k}/17`);
      const rand = rng(full.length + 1);
      for (let k = 0; k < 24; k++) {
        const b = full.slice();
        const at = Math.floor(rand() * b.length);
        if (k % 3 === 0) b[at] = Math.floor(rand() * 256);
        else if (k % 3 === 1) for (let i = at; i < Math.min(b.length, at + 16); i++) b[i] = b[i]! ^ 0xff;
        else { let i = at; while (i < b.length && !(b[i]! >= 48 && b[i]! <= 57)) i++; if (i < b.length) b[i] = 57; }
        await sameBothWays(name, b, `${rel} mutation ${k} at ${at}`);
      }
    });
  }
});
