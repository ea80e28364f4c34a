/**
 * What a load reads from its source, and that reading by ranges refuses bad input exactly as reading the
 * whole bytes does. A source that logs its reads shows: a raw appended XML file is never read whole, each
 * byte of its data is read once, and no read is larger than the readers' scratch; zlib data and binary
 * legacy files likewise; XML files with inline data are streamed once for their structure and then read
 * array by array; text legacy files once through a window that moves forward. Truncated and mutated files give
 * the same message (or the same dataset) by both paths. Reference: the bytes path (checked against VTK
 * 9.1 elsewhere) and the project's rule "validate at the edge" (STYLE.md §8); no external numbers.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { basename, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { SCRATCH_BYTES } from '../../src/io/elementConvert.ts';
import { DATA_WINDOW_BYTES, WINDOW_BYTES } from '../../src/io/legacyCursor.ts';
import { readDataset, readDatasetFrom } from '../../src/io/readDataset.ts';
import { writeLegacyVtk } from '../../src/io/writeLegacy.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { STRUCTURE_STAGE } from '../../src/io/xmlSkeleton.ts';
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

  it('inline XML data (ascii, base64): the structure streamed once, then each array\'s text once; never read whole', async () => {
    for (const [name, bytes] of [['a.vtu', writeVtu(big, { encoding: 'ascii' })], ['b.vtu', writeVtu(big, { encoding: 'base64' })]] as const) {
      expect(bytes.length, name).toBeGreaterThan(4 * SCRATCH_BYTES);
      const { log, total, largest } = await logged(name, bytes);
      const times = coverage(bytes.length, log);
      // twice: the structure pass and the array's text; a third time only for the token cut at a window's end
      let thrice = 0;
      for (let i = 64 * 1024; i < bytes.length; i++) { if (times[i]! > 3) throw new Error(`${name}: byte ${i} read ${times[i]} times`); if (times[i] === 3) thrice++; }
      expect(thrice, name).toBeLessThan(64 * Math.ceil(bytes.length / SCRATCH_BYTES));
      expect(total, name).toBeLessThan(2 * bytes.length + OVERHEAD);
      expect(largest, name).toBeLessThanOrEqual(SCRATCH_BYTES);
    }
  });

  it('text legacy files: read once through a window that moves forward, never whole', async () => {
    const bytes = writeLegacyVtk(big, { binary: false });
    expect(bytes.length).toBeGreaterThan(4 * DATA_WINDOW_BYTES);
    const { log, total, largest } = await logged('t.vtk', bytes);
    const times = coverage(bytes.length, log);
    // once, but for the text a window re-reads when it moves on (at most a sixteenth of a data window each time)
    let again = 0;
    for (let i = 0; i < bytes.length; i++) { if (times[i] === 0) throw new Error(`t.vtk: byte ${i} never read`); if (times[i]! > 1) again++; }
    expect(again).toBeLessThan(bytes.length / 8);
    expect(total).toBeLessThan(1.125 * bytes.length + OVERHEAD);
    expect(largest).toBeLessThanOrEqual(DATA_WINDOW_BYTES);
  });

  it('text legacy read by windows: an error late in the file names its line, counted only when the message is made', async () => {
    const s = text(writeLegacyVtk(big, { binary: false }));
    // spoil a value about three quarters into the file (past several windows)
    let at = Math.floor(s.length * 0.75);
    while (s[at] !== ' ' && s[at] !== '\n') at++;
    at++;
    const bad = s.slice(0, at) + 'x' + s.slice(at + 1);
    const line = bad.slice(0, at).split('\n').length;
    const bytes = new Uint8Array(Buffer.from(bad, 'latin1'));
    const err = await readDatasetFrom(copyingSource('t.vtk', bytes)).then(() => undefined, (e: Error) => e.message);
    expect(err).toMatch(new RegExp(`^t\\.vtk: .*\\(line ${line}\\) is "x[^"]*", expected`));
    await expect(readDataset('t.vtk', bytes)).rejects.toThrow(err!);
  });

  it('inline XML data read in windows of a few bytes (chunk edges inside tags, quotes, comments and numbers): the same dataset', async () => {
    // larger than the 64 KB head, so the structure is streamed (a smaller file is read whole)
    const mesh = datasetOf([hexGrid(12, 12, 12)], 'medium');
    const ascii = text(writeVtu(mesh, { encoding: 'ascii' }));
    // a comment holding ">" and "<", an instruction and an attribute value holding ">" around the data
    const decorated = ascii
      .replace('<UnstructuredGrid>', '<!-- made by hand: a > b, <not a tag> --><?note keep?>\n<UnstructuredGrid>')
      .replace('<PointData', '<!----><PointData')
      .replace(/<DataArray type="Float64" Name="Points"/, '<DataArray type="Float64" Name="Points" note="x > 0 &amp; y"')
      // information keys before an array's data, as VTK 9 writes them
      .replace(/(<DataArray type="Int64" Name="connectivity"[^>]*>)/, '$1\n<InformationKey name="L2_NORM_RANGE" location="vtkDataArray" length="2"><Value index="0">0</Value><Value index="1">1.7</Value></InformationKey>\n');
    expect(decorated).not.toBe(ascii);
    expect(decorated).toContain('<InformationKey');
    expect(decorated).toContain('note="x > 0');
    expect(decorated).toContain('<!-- made by hand');
    for (const [name, s] of [['plain.vtu', ascii], ['decorated.vtu', decorated]] as const) {
      const bytes = new Uint8Array(Buffer.from(s, 'latin1'));
      const want = await readDataset(name, bytes);
      for (const chunkBytes of [64, 97, 1000]) {
        expectSameContent(await readDatasetFrom(copyingSource(name, bytes, { chunkBytes })), want, `${name} in ${chunkBytes}-byte windows`);
      }
    }
    const b64 = writeVtu(mesh, { encoding: 'base64' });
    expect(Math.min(ascii.length, b64.length)).toBeGreaterThan(64 * 1024);
    expectSameContent(await readDatasetFrom(copyingSource('b.vtu', b64, { chunkBytes: 61 })), await readDataset('b.vtu', b64), 'base64 in 61-byte windows');
  });

  it('inline XML by ranges: the structure pass reports progress and a cancel stops it', async () => {
    const bytes = writeVtu(big, { encoding: 'ascii' });
    // a slow source (2 ms a read, like a network disk), so the 50 ms checkpoints fire during the structure pass
    const slow = () => {
      const s = copyingSource('a.vtu', bytes, { chunkBytes: 65536 });
      const read = s.readInto!;
      s.readInto = async (o, t) => { await new Promise((r) => setTimeout(r, 2)); return read(o, t); };
      return s;
    };
    const stages = new Set<string>();
    let last = -1, forward = true;
    await readDatasetFrom(slow(), {
      onProgress: (p) => {
        if (p.stage === STRUCTURE_STAGE) { forward &&= p.bytesDone >= last; last = p.bytesDone; }
        stages.add(p.stage);
      },
    });
    expect(stages.has(STRUCTURE_STAGE)).toBe(true);
    expect(forward).toBe(true);
    const ctrl = new AbortController();
    await expect(readDatasetFrom(slow(), {
      signal: ctrl.signal, onProgress: (p) => { if (p.stage === STRUCTURE_STAGE) ctrl.abort(); },
    })).rejects.toMatchObject({ name: 'AbortError', message: 'a.vtu: loading cancelled' });
  });

  it('a number longer than the text window is refused with its position, not split', async () => {
    const s = text(writeVtu(datasetOf([hexGrid(12, 12, 12)], 'medium'), { encoding: 'ascii' }));
    const long = s.replace(/(<DataArray type="Float64" Name="Points"[^>]*>\s*)(\S+)/, (_, head: string, v: string) => head + v + '0'.repeat(200));
    const bytes = new Uint8Array(Buffer.from(long, 'latin1'));
    await expect(readDatasetFrom(copyingSource('long.vtu', bytes, { chunkBytes: 128 }))).rejects.toThrow(/^long\.vtu: piece 0: DataArray "Points": a value at byte \d+ runs on for more than 128 characters/);
  });
});

const EXTERNAL = resolve(__dirname, '../fixtures/external');

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
    ...writtenFiles(writtenDataset(16)).filter(([n]) => /appended-raw-UInt32-Int64|zlib-UInt64-Int64|binary-(4\.2|5\.1)|ascii-(4\.2|5\.1)\.vtk|w-ascii-UInt32-Int64|w-base64-UInt64-Int32|w-zlib-base64-UInt32-Int64/.test(n)).map(([n, b]) => [`big-${n}`, b] as [string, Uint8Array]),
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
