/**
 * `npm run make-fields` — writes the sample files (Node only: it writes to disk; the data come from
 * the pure modules next to it).
 *
 *   npm run make-fields                      committed set → sample-fields/ (with README.md)
 *   npm run make-fields -- --large           benchmark set → sample-fields/large/ (also: --size 1M)
 *   options: --out <folder>   write there instead;  --missing   skip files that already exist
 *
 * Prints every file written with its size.
 */
import { mkdirSync, statSync, writeFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { Dataset } from '../model/dataset.ts';
import { sampleReadme } from './sampleReadme.ts';
import { committedSamples, largeSamples, type SampleEntry } from './sampleSet.ts';
import { vortexSeriesFiles } from './vortexSeries.ts';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');

/** Default output folders. */
export const SAMPLE_DIR = join(ROOT, 'sample-fields');
export const LARGE_DIR = join(SAMPLE_DIR, 'large');

/** One written file. */
export interface WrittenFile { path: string; bytes: number; skipped?: boolean }

const exists = (p: string): boolean => { try { statSync(p); return true; } catch { return false; } };

/**
 * Makes the entries' bytes and writes them to `dir`; a dataset shared by consecutive entries is built
 * once. With `onlyMissing`, existing files are left alone (and their datasets not built).
 */
function writeEntries(entries: SampleEntry[], dir: string, onlyMissing: boolean, log: (line: string) => void): { entry: SampleEntry; dataset?: Dataset; path: string; bytes: number }[] {
  mkdirSync(dir, { recursive: true });
  const out: { entry: SampleEntry; dataset?: Dataset; path: string; bytes: number }[] = [];
  let lastMaker: (() => Dataset) | undefined, last: Dataset | undefined;
  for (const entry of entries) {
    const path = join(dir, entry.name);
    if (onlyMissing && exists(path)) {
      out.push({ entry, path, bytes: statSync(path).size });
      log(`kept    ${relative(process.cwd(), path)} (${statSync(path).size} bytes)`);
      continue;
    }
    if (entry.dataset !== lastMaker) { last = undefined; last = entry.dataset(); lastMaker = entry.dataset; }
    const bytes = entry.encode(last!);
    writeFileSync(path, bytes);
    out.push({ entry, dataset: last!, path, bytes: bytes.length });
    log(`wrote   ${relative(process.cwd(), path)} (${bytes.length} bytes)`);
  }
  return out;
}

/** Writes the committed set and its README into `dir` (default `sample-fields/`). */
export function writeCommittedFields(dir = SAMPLE_DIR, log: (line: string) => void = () => {}): WrittenFile[] {
  const written = writeEntries(committedSamples(), dir, false, log);
  const readme = sampleReadme(written.map((w) => ({ entry: w.entry, dataset: w.dataset!, bytes: w.bytes })));
  const readmePath = join(dir, 'README.md');
  writeFileSync(readmePath, readme);
  log(`wrote   ${relative(process.cwd(), readmePath)} (${Buffer.byteLength(readme)} bytes)`);
  const series: WrittenFile[] = [];
  for (const [name, bytes] of Object.entries(vortexSeriesFiles())) {
    const p = join(dir, name);
    mkdirSync(dirname(p), { recursive: true });
    writeFileSync(p, bytes);
    series.push({ path: p, bytes: bytes.length });
    log(`wrote   ${relative(process.cwd(), p)} (${bytes.length} bytes)`);
  }
  return [...written.map((w) => ({ path: w.path, bytes: w.bytes })), { path: readmePath, bytes: Buffer.byteLength(readme) }, ...series];
}

/** Writes the load-benchmark set into `dir` (default `sample-fields/large/`); with `onlyMissing`, keeps existing files. */
export function writeLargeFields(dir = LARGE_DIR, onlyMissing = false, log: (line: string) => void = () => {}): WrittenFile[] {
  return writeEntries(largeSamples(), dir, onlyMissing, log).map((w) => ({ path: w.path, bytes: w.bytes, ...(w.dataset ? {} : { skipped: true }) }));
}

/** Command-line entry; returns the exit code. */
export function main(argv: string[]): number {
  let large = false, onlyMissing = false, out: string | undefined;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if (a === '--large') large = true;
    else if (a === '--missing') onlyMissing = true;
    else if (a === '--size') {
      const v = argv[++i];
      if (v !== '1M') throw new Error(`make-fields: --size accepts 1M, got ${v ?? 'nothing'}`);
      large = true;
    } else if (a === '--out') {
      out = argv[++i];
      if (!out) throw new Error('make-fields: --out needs a folder');
    } else throw new Error(`make-fields: unknown argument ${a} (known: --large, --size 1M, --out <folder>, --missing)`);
  }
  const log = (line: string) => process.stdout.write(line + '\n');
  const files = large ? writeLargeFields(out ? resolve(out) : LARGE_DIR, onlyMissing, log) : writeCommittedFields(out ? resolve(out) : SAMPLE_DIR, log);
  const total = files.reduce((s, f) => s + f.bytes, 0);
  log(`${files.length} files, ${(total / 1e6).toFixed(2)} MB in total`);
  return 0;
}

if (process.argv[1] && pathToFileURL(resolve(process.argv[1])).href === import.meta.url) {
  try {
    process.exitCode = main(process.argv.slice(2));
  } catch (e) {
    process.stderr.write(`${(e as Error).message}\n`);
    process.exitCode = 1;
  }
}
