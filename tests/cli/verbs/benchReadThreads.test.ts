/**
 * Loading a large raw file on read threads from the command line: `bench --read-threads N` says how it loaded and
 * loads the same arrays; the `--workers` verbs (`loadForCompute`) read files under `READ_PARTS_MIN_FILE_BYTES` on
 * one thread, the pool's shared arrays byte for byte those of a one-thread load (files above it take the parts
 * path that tests/parallel/readParts.test.ts checks). The file: a 50³ hexahedron lattice written
 * as appended raw with 64-bit ids (its 1M connectivity ids, 8 MB, are read in parts).
 */
import { mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseArgs } from '../../../src/cli/args.ts';
import { main } from '../../../src/cli/main.ts';
import { loadForCompute, READ_PARTS_MIN_FILE_BYTES, WORKER_OPTIONS } from '../../../src/cli/workerOption.ts';
import { loadDatasetFile } from '../../../src/io/nodeFiles.ts';
import { writeVtu } from '../../../src/io/writeVtu.ts';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../../../src/model/meshBuild.ts';
import { expectSameArrays } from '../../helpers/sameArrays.ts';

let dir = '', file = '';
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), 'fieldtally-readthreads-'));
  file = join(dir, 'lattice.vtu');
  const p = hexGrid(50, 50, 50);
  const d = datasetOf([withFields(p, [pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 100 * (1 - z) + x * y; })])]);
  writeFileSync(file, writeVtu(d, { encoding: 'appended-raw', idType: 'Int64' }));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function run(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(argv, { out: (t) => { out += t + '\n'; }, err: (t) => { err += t + '\n'; } });
  return { code, out, err };
}

describe('bench --read-threads', () => {
  it('reads the large arrays in parts on 2 threads, none on 1, and loads the same dataset', async () => {
    const two = await run(['bench', file, '--json', '--stages', 'load', '--read-threads', '2']);
    const one = await run(['bench', file, '--json', '--stages', 'load', '--read-threads', '1']);
    expect(two.code).toBe(0);
    expect(one.code).toBe(0);
    const a = JSON.parse(two.out) as { cells: number; points: number; load: { readThreads: number; arraysReadInParts: number; decodedBytes: number } };
    const b = JSON.parse(one.out) as typeof a;
    expect(a.load.readThreads).toBe(2);
    expect(a.load.arraysReadInParts).toBeGreaterThanOrEqual(1);
    expect(b.load.readThreads).toBe(1);
    expect(b.load.arraysReadInParts).toBe(0);
    expect([a.cells, a.points, a.load.decodedBytes]).toEqual([125000, 132651, b.load.decodedBytes]);
  });

  it('refuses a count that is not a whole number of threads, in one line', async () => {
    const r = await run(['bench', file, '--json', '--stages', 'load', '--read-threads', '0']);
    expect(r.code).not.toBe(0);
    expect(r.err.trim().split('\n')).toHaveLength(1);
    expect(r.err).toMatch(/--read-threads/);
  });
});

describe('the --workers load path', () => {
  it('loads a file under READ_PARTS_MIN_FILE_BYTES on one thread into the pool\'s shared memory, the bytes of a one-thread load', async () => {
    expect(statSync(file).size).toBeLessThan(READ_PARTS_MIN_FILE_BYTES);
    const input = await loadForCompute(file, parseArgs([file, '--workers', '2'], WORKER_OPTIONS, 'test'));
    try {
      expect(input.pool).not.toBeNull();
      const piece = input.dataset.pieces[0]!;
      expect(piece.connectivity.buffer).toBeInstanceOf(SharedArrayBuffer);
      expectSameArrays(input.dataset, await loadDatasetFile(file));
    } finally {
      await input.close();
    }
  });
});
