/**
 * Bad input never crashes, hangs or allocates far beyond the file: every external file, truncated at
 * many points and mutated at random (a bounded, seeded fuzz loop), either loads as a valid dataset or
 * is refused with an Error whose message starts with the file's name. Reference: the project's rule
 * "validate at the edge" (STYLE.md §8); no external numbers are involved.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { basename, dirname, join, relative, resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readDataset } from '../../src/io/readDataset.ts';
import { validatePiece } from '../../src/model/validate.ts';
import { seededRandom as rng } from '../../src/model/seededRandom.ts';
import { loadReport } from '../../src/model/loadReport.ts';
import { MUTATION_KINDS, mutants } from '../helpers/fuzzMutants.ts';

const EXTERNAL = resolve(__dirname, '../fixtures/external');

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    return statSync(p).isDirectory() ? walk(p) : /\.(vtk|vtu|vtp|pvtu|vtm)$/.test(f) ? [p] : [];
  });
}


/** Loads mutated bytes; set pieces come unmutated from disk. Returns 'ok' or the error. */
async function attempt(path: string, bytes: Uint8Array): Promise<'ok' | Error> {
  const name = basename(path), folder = dirname(path);
  try {
    const d = await readDataset(name, bytes, { resolve: async (rel) => new Uint8Array(readFileSync(join(folder, rel))) });
    d.pieces.forEach((p, i) => validatePiece(p, `${name} piece ${i}`));
    return 'ok';
  } catch (e) {
    return e as Error;
  }
}

function checkOutcome(path: string, outcome: 'ok' | Error, ms: number, label: string): void {
  expect(ms, `${label} took ${ms.toFixed(0)} ms`).toBeLessThan(5000);
  if (outcome === 'ok') return;
  expect(outcome, `${label}: threw a non-Error`).toBeInstanceOf(Error);
  const msg = outcome.message;
  expect(msg.startsWith(basename(path)) || msg.includes(basename(path)), `${label}: message does not name the file: ${msg}`).toBe(true);
  expect(msg.length, `${label}: message too short to say what was expected: ${msg}`).toBeGreaterThan(basename(path).length + 15);
}

const files = walk(EXTERNAL);
const MUTATIONS_PER_FILE = 40;

describe('bad input', () => {
  for (const path of files) {
    const rel = relative(EXTERNAL, path);
    it(`${rel}: truncated at 12 points`, async () => {
      const full = new Uint8Array(readFileSync(path));
      for (let k = 1; k <= 12; k++) {
        const cut = Math.floor((full.length * k) / 13);
        const before = process.memoryUsage().arrayBuffers;
        const t0 = performance.now();
        const outcome = await attempt(path, full.slice(0, cut));
        checkOutcome(path, outcome, performance.now() - t0, `${rel} cut at ${cut}/${full.length}`);
        expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(64 * 1024 * 1024 + 50 * full.length);
      }
    });

    it(`${rel}: ${MUTATIONS_PER_FILE} seeded mutations`, async () => {
      const full = new Uint8Array(readFileSync(path));
      const rand = rng(full.length);
      for (let k = 0; k < MUTATIONS_PER_FILE; k++) {
        const b = full.slice();
        const kind = k % 4;
        const at = Math.floor(rand() * b.length);
        if (kind === 0) b[at] = Math.floor(rand() * 256); // random byte
        else if (kind === 1) { // a digit becomes a large one (sizes and ids grow)
          let i = at; while (i < b.length && !(b[i]! >= 48 && b[i]! <= 57)) i++;
          if (i < b.length) b[i] = 57;
        } else if (kind === 2) { // a run of bytes flipped
          for (let i = at; i < Math.min(b.length, at + 16); i++) b[i] = b[i]! ^ 0xff;
        } else { // a number replaced by a huge one
          const text = new TextDecoder('latin1').decode(b);
          const m = /\b\d{1,6}\b/g; m.lastIndex = at; const hit = m.exec(text);
          if (hit) {
            const huge = new TextEncoder().encode('99999999999');
            const out = new Uint8Array(b.length - hit[0].length + huge.length);
            out.set(b.subarray(0, hit.index)); out.set(huge, hit.index); out.set(b.subarray(hit.index + hit[0].length), hit.index + huge.length);
            const t0 = performance.now();
            checkOutcome(path, await attempt(path, out), performance.now() - t0, `${rel} mutation ${k} (huge number at ${hit.index})`);
            continue;
          }
        }
        const before = process.memoryUsage().arrayBuffers;
        const t0 = performance.now();
        checkOutcome(path, await attempt(path, b), performance.now() - t0, `${rel} mutation ${k} (kind ${kind} at ${at})`);
        expect(process.memoryUsage().arrayBuffers - before).toBeLessThan(64 * 1024 * 1024 + 50 * full.length);
      }
    });
  }
});

/** Points, cells, pieces and arrays of a load, for the dropped-data check. */
async function countsOf(path: string, bytes: Uint8Array): Promise<string | Error> {
  const name = basename(path), folder = dirname(path);
  try {
    const r = loadReport(await readDataset(name, bytes, { resolve: async (rel) => new Uint8Array(readFileSync(join(folder, rel))) }));
    return JSON.stringify([r.points, r.cells, r.pieces, r.pointData.length, r.cellData.length, r.fieldData.length]);
  } catch (e) {
    return e as Error;
  }
}

// A fast sample of the system suite's campaign (tests/system/fuzz.test.ts): every mutation kind on a few
// files, in process. Mutations that cannot change the counts must fail or keep them.
const SAMPLE_FILES = ['vtk-data/ex-blow_5.vtm', 'vtu11/pyramids_3D/raw_compressed.vtu', 'vtu11/pyramids_3D/ascii.vtu', 'vtkio/pygmsh/ascii.vtk', 'vtk-data/cow.vtp']
  .map((f) => join(EXTERNAL, f));

describe('fuzz sample: one printable line naming the file, nothing silently dropped', () => {
  for (const path of SAMPLE_FILES) {
    it(`${relative(EXTERNAL, path)}: ${MUTATION_KINDS.length} mutants, one of each kind`, async () => {
      const full = new Uint8Array(readFileSync(path));
      const original = await countsOf(path, full);
      expect(typeof original).toBe('string');
      for (const m of mutants(full, 1600 + full.length, MUTATION_KINDS.length)) {
        const t0 = performance.now();
        const got = await countsOf(path, m.bytes);
        checkOutcome(path, got === original || typeof got === 'string' ? 'ok' : got, performance.now() - t0, m.label);
        if (got instanceof Error) expect(got.message, m.label).toMatch(/^[^\x00-\x1f\x7f]+$/);
        else if (m.keepsCounts) expect(got, `${m.label}: silently changed the counts`).toBe(original);
      }
    });
  }
});
