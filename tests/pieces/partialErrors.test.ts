/**
 * `partial` reads only its task's share of the leaf files (the others may be unreadable, and are never
 * opened), and `partial`/`reduce` refuse bad input with one line naming the file and what was expected:
 * missing, repeated or foreign parts, a different probe set, damaged documents, bad task numbers.
 */
import { copyFileSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';
import { readVtkSet } from '../../src/io/vtkSets.ts';
import { writeVtu } from '../../src/io/writeVtu.ts';
import { encodeArray, type PartialDoc } from '../../src/pieces/partialDoc.ts';
import { pipeCase } from '../../src/samples/pipe.ts';
import { COMMITTED_CASES } from '../../src/samples/sampleSet.ts';
import { bands, splitDataset, writePvtu } from './pieceSets.ts';

async function run(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

let dir = '', set = '', probes = '', other = '';
const part = (name: string) => join(dir, name);

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-partial-'));
  const pipe = pipeCase(COMMITTED_CASES.pipeCoarse);
  set = writePvtu(join(dir, 'set'), 'pipe', pipe, splitDataset(pipe, 4, bands(2, 0, 0.1, 4)));
  probes = join(dir, 'p.json');
  other = join(dir, 'q.json');
  const doc = { format: 'fieldtally-probe-set', version: 2, probes: [{ id: 'mid', kind: 'cut-plane', label: 'Mid', geometry: { origin: [0, 0, 0.05], normal: [0, 0, 1] }, fields: { density: 998.207 } }] };
  writeFileSync(probes, JSON.stringify(doc));
  writeFileSync(other, JSON.stringify({ ...doc, title: 'another' }));
  for (let i = 0; i < 3; i++) expect((await run('partial', set, '--probes', probes, '--task', String(i), '--tasks', '3', '--out', part(`part-${i}.json`))).code).toBe(0);
}, 60_000);
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('partial reads only its share', () => {
  it('leaves outside the share are never opened: unreadable ones do not matter to the task, but do to the whole set', async () => {
    const broken = join(dir, 'broken');
    const pipe = pipeCase(COMMITTED_CASES.pipeCoarse);
    const path = writePvtu(broken, 'pipe', pipe, splitDataset(pipe, 4, bands(2, 0, 0.1, 4)));
    writeFileSync(join(broken, 'pipe_0.vtu'), 'not a result file');
    rmSync(join(broken, 'pipe_3.vtu'));
    const r = await run('partial', path, '--probes', probes, '--task', '1', '--tasks', '4', '--out', part('only-1.json'));
    expect(r.err).toBe('');
    expect(r.out).toMatch(/^task 1 of 4: leaf files 2–2 of 4 \(pipe_1\.vtu\)/);
    const doc = JSON.parse(readFileSync(part('only-1.json'), 'utf8')) as PartialDoc;
    expect(doc.inputs.map((x) => [x.name, x.order])).toEqual([['pipe.pvtu', -1], ['pipe_1.vtu', 3]]);
    expect((await run('partial', path, '--probes', probes, '--task', '0', '--tasks', '4', '--out', part('x.json'))).err)
      .toMatch(/^fieldtally partial: pipe\.pvtu: pipe_0\.vtu: no XML element found/);
    expect((await run('partial', path, '--probes', probes, '--task', '3', '--tasks', '4', '--out', part('x.json'))).err)
      .toMatch(/^fieldtally partial: pipe\.pvtu: piece file "pipe_3\.vtu" is missing or unreadable \(no such file \/.*\/broken\/pipe_3\.vtu\)\n$/);
    expect((await run('report', path, '--probes', probes, '--out', join(dir, 'broken-report'))).code).toBe(1);
  });

  it('the reader asks only for nested set files and the chosen leaves', async () => {
    const piece = writeVtu(pipeCase(COMMITTED_CASES.pipeCoarse), { encoding: 'ascii' });
    const enc = (s: string) => new TextEncoder().encode(s);
    const files: Record<string, Uint8Array> = {
      'a.vtu': piece, 'b.vtu': piece, 'sub/inner.pvtu': enc('<VTKFile type="PUnstructuredGrid" version="0.1"><PUnstructuredGrid><Piece Source="c.vtu"/><Piece Source="d.vtu"/></PUnstructuredGrid></VTKFile>'),
      'sub/c.vtu': piece, 'sub/d.vtu': piece,
    };
    const vtm = enc('<VTKFile type="vtkMultiBlockDataSet" version="1.0"><vtkMultiBlockDataSet><DataSet file="a.vtu"/><Block><DataSet file="b.vtu"/><DataSet file="sub/inner.pvtu"/></Block></vtkMultiBlockDataSet></VTKFile>');
    const asked: string[] = [], offered: string[] = [];
    const d = await readVtkSet('top.vtm', vtm, {
      resolve: async (p) => { asked.push(p); return files[p]!; },
      pieceShare: (leaf, path) => { offered.push(`${leaf}:${path}`); return leaf === 1 || leaf === 3; },
    });
    expect(offered).toEqual(['0:a.vtu', '1:b.vtu', '2:c.vtu', '3:d.vtu']);
    expect(asked).toEqual(['b.vtu', 'sub/inner.pvtu', 'sub/d.vtu']);
    expect(d.pieces.length).toBe(2);
  });
});

describe('partial and reduce refuse bad input with one line naming the file', () => {
  it('missing, repeated and foreign parts', async () => {
    expect((await run('reduce', part('part-0.json'), part('part-2.json'), '--out', join(dir, 'r1'))).err)
      .toBe(`fieldtally reduce: reduce: task 1 of 3 missing (given: ${part('part-0.json')}, ${part('part-2.json')})\n`);
    copyFileSync(part('part-0.json'), part('again.json'));
    expect((await run('reduce', part('part-0.json'), part('part-1.json'), part('part-2.json'), part('again.json'), '--out', join(dir, 'r2'))).err)
      .toBe(`fieldtally reduce: ${part('again.json')}: task 0 of 3 is given twice (also ${part('part-0.json')})\n`);
    await run('partial', set, '--probes', other, '--task', '1', '--tasks', '3', '--out', part('other-1.json'));
    expect((await run('reduce', part('part-0.json'), part('other-1.json'), part('part-2.json'), '--out', join(dir, 'r3'))).err)
      .toMatch(/^fieldtally reduce: .*other-1\.json: made with the probe set q\.json \(SHA-256 [0-9a-f]{12}…\), but .*part-0\.json with p\.json/);
    await run('partial', set, '--probes', probes, '--task', '1', '--tasks', '2', '--out', part('two-1.json'));
    expect((await run('reduce', part('part-0.json'), part('two-1.json'), '--out', join(dir, 'r4'))).err)
      .toMatch(/two-1\.json: task 1 of 2 tasks, but .*part-0\.json is of 3 tasks/);
    const doc = JSON.parse(readFileSync(part('part-1.json'), 'utf8')) as PartialDoc;
    writeFileSync(part('foreign.json'), JSON.stringify({ ...doc, set: { ...doc.set, sha256: 'f'.repeat(64), source: 'wing.pvtu' } }));
    expect((await run('reduce', part('part-0.json'), part('foreign.json'), part('part-2.json'), '--out', join(dir, 'r5'))).err)
      .toMatch(/foreign\.json: made for the set wing\.pvtu \(SHA-256 ffffffffffff…, 4 leaf files\), but .*part-0\.json for pipe\.pvtu/);
  });

  it('damaged documents', async () => {
    const bad = async (name: string, text: string) => {
      writeFileSync(part(name), text);
      return (await run('reduce', part(name), '--out', join(dir, 'r6'))).err;
    };
    expect(await bad('trunc.json', readFileSync(part('part-0.json'), 'utf8').slice(0, 500))).toMatch(/^fieldtally reduce: .*trunc\.json: not a JSON document \(/);
    expect(await bad('set.json', readFileSync(probes, 'utf8'))).toMatch(/set\.json: not a partial-results document \(expected "format": "fieldtally-partial-results"/);
    const doc = JSON.parse(readFileSync(part('part-0.json'), 'utf8')) as PartialDoc;
    expect(await bad('v9.json', JSON.stringify({ ...doc, version: 9 }))).toMatch(/v9\.json: partial-results version 9 is not one this tool reads \(1 to 1\)/);
    const p0 = doc.pieces[0]!;
    const conn = Int32Array.from({ length: 8 * p0.cellsKept }, () => 1e6);
    expect(await bad('conn.json', JSON.stringify({ ...doc, pieces: [{ ...p0, connectivity: encodeArray(conn) }] })))
      .toMatch(/conn\.json: pieces\[0\]\.connectivity: node 1000000 of cell 0 is not below the piece's \d+ points/);
    expect(await bad('type.json', JSON.stringify({ ...doc, pieces: [{ ...p0, points: encodeArray(new Float32Array(3)) }] })))
      .toMatch(/type\.json: pieces\[0\]\.points: expected a Float64Array, found a Float32Array/);
    expect(await bad('field.json', JSON.stringify({ ...doc, pieces: [{ ...p0, pointData: [{ ...p0.pointData[0]!, values: encodeArray(new Float64Array(5)) }] }] })))
      .toMatch(/field\.json: pieces\[0\]\.pointData\[0\] "velocity": holds 5 values, expected \d+ tuples × 3 components/);
  });

  it('bad arguments', async () => {
    expect((await run('partial', set, '--probes', probes, '--task', '3', '--tasks', '3', '--out', part('x.json'))).err).toBe('fieldtally partial: --task: expected a whole number from 0 to 2, got "3"\n');
    expect((await run('partial', set, '--probes', probes, '--task', '0', '--out', part('x.json'))).err).toBe('fieldtally partial: --tasks is required\n');
    expect((await run('partial', join(dir, 'set', 'pipe_0.vtu'), '--probes', probes, '--task', '0', '--tasks', '1', '--out', part('x.json'))).err)
      .toMatch(/^fieldtally partial: pipe_0\.vtu: not a piece set \(expected a \.pvtu, \.pvtp, \.vtm, \.vtpd or \.vtpc file, found a "UnstructuredGrid" file\)/);
    expect((await run('reduce', '--out', join(dir, 'r7'))).err).toMatch(/give the partial-results files of every task/);
  });
});
