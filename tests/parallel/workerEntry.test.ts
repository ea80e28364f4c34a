/**
 * Worker entry files from source: the TypeScript workers run a bundle built once into the temporary folder
 * (no loader to register in each worker), named by the size and time of every source file, so it is rebuilt
 * when a source changes; `FIELDTALLY_WORKERS_FROM_SOURCE=1` and the plain-JavaScript inflate worker use the
 * entries in workers/. Reference: the files themselves (what is started is what was asked for).
 */
import { existsSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { workerEntry } from '../../src/parallel/workerEntry.ts';

describe('workerEntry from source', () => {
  afterEach(() => { delete process.env.FIELDTALLY_WORKERS_FROM_SOURCE; });

  it('share and series workers start from a cached plain-JavaScript bundle of their body', () => {
    for (const kind of ['share', 'series'] as const) {
      const url = workerEntry(kind);
      const file = fileURLToPath(url);
      expect(file).toMatch(new RegExp(`fieldtally-workers-\\d+/[0-9a-f]{24}/${kind}Worker\\.mjs$`));
      expect(existsSync(file)).toBe(true);
      const text = readFileSync(file, 'utf8');
      expect(text).not.toMatch(/tsx\/esm\/api/);
      expect(text).toMatch(kind === 'share' ? /worker pool: no dataset is held by this worker/ : /evaluateSeries|onStep/);
      expect(workerEntry(kind).href).toBe(url.href); // built once per process
    }
  });

  it('the inflate worker and FIELDTALLY_WORKERS_FROM_SOURCE=1 use the entries in workers/', () => {
    expect(fileURLToPath(workerEntry('inflate'))).toMatch(/workers\/inflateWorker\.node\.mjs$/);
    process.env.FIELDTALLY_WORKERS_FROM_SOURCE = '1';
    expect(fileURLToPath(workerEntry('share'))).toMatch(/workers\/shareWorker\.node\.mjs$/);
  });
});
