/**
 * The seeded fuzz campaign (issue 16): over 2,000 mutants of the external files and the sample fields
 * (tests/helpers/fuzzMutants.ts), plus sets whose piece is missing, the set itself, a folder, /dev/zero,
 * /dev/null or a named pipe, each run as `fieldtally info --json` in a child process under a 4 GiB
 * address-space cap (prlimit). Goal: 0 crashes, 0 runs over 5 s, 0 out-of-memory, 0 silently dropped
 * blocks, arrays or cells (a mutation that cannot change the counts either fails or loads the original's
 * counts), and every error one printable line naming the file. Many mutants run in one child (the
 * bundled CLI starts in ~0.1 s); a child that dies or goes quiet is restarted after the file it was on.
 * Reference: the project's rule "validate at the edge" (STYLE.md §8); no external numbers are involved.
 */
import { spawn } from 'node:child_process';
import { cpSync, mkdtempSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync, unlinkSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import { basename, dirname, join, resolve } from 'node:path';
import { build } from 'esbuild';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mutants, type Mutant } from '../helpers/fuzzMutants.ts';

const REPO = resolve(__dirname, '../..');
const EXTERNAL = join(REPO, 'tests/fixtures/external');
const SAMPLES = join(REPO, 'sample-fields');
/** Mutants in all (at least), the seed of the campaign, the cap and the time allowed per file. */
const TOTAL = 2100, SEED = 16, ADDRESS_SPACE = 4 * 1024 ** 3, PER_FILE_MS = 5000;
const BATCH = 150;

interface Counts { points: number; cells: number; pieces: number; arrays: number }
interface Outcome { file: string; label: string; keepsCounts: boolean; kind: 'ok' | 'error' | 'slow' | 'hang' | 'crash' | 'oom'; ms: number; err: string; counts?: Counts }

let work = '', child = '';

/** Originals larger than this are left out: every mutant of a file is held in memory while it is written. */
const MAX_ORIGINAL_BYTES = 8 * 1024 * 1024;

/** Result files under `dir`, leaving out the benchmark files (`large/`, git-ignored) and anything above the size cap. */
function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((f) => {
    const p = join(dir, f);
    const st = statSync(p);
    if (st.isDirectory()) return f === 'large' ? [] : walk(p);
    return /\.(vtk|vtu|vtp|pvtu|vtm)$/.test(f) && st.size <= MAX_ORIGINAL_BYTES ? [p] : [];
  });
}

/** Runs the child on `files` from `from`, restarting after a file it died or hung on; one outcome per file. */
async function runAll(files: string[]): Promise<Omit<Outcome, 'label' | 'keepsCounts'>[]> {
  const list = join(work, 'jobs.json');
  writeFileSync(list, JSON.stringify(files));
  const results: Omit<Outcome, 'label' | 'keepsCounts'>[] = [];
  let from = 0;
  while (from < files.length) {
    const outcome = await new Promise<{ next: number }>((done) => {
      const p = spawn('prlimit', [`--as=${ADDRESS_SPACE}`, '--', process.execPath, child, list, String(from)], { stdio: ['ignore', 'pipe', 'pipe'] });
      let current = -1, buf = '', stderr = '', timer: NodeJS.Timeout | undefined, finished = false;
      const arm = () => {
        clearTimeout(timer);
        timer = setTimeout(() => {
          finished = true;
          p.kill('SIGKILL');
          results.push({ file: files[current]!, kind: 'hang', ms: PER_FILE_MS, err: '' });
          done({ next: current + 1 });
        }, PER_FILE_MS + 2000);
      };
      arm();
      p.stderr.on('data', (d: Buffer) => { stderr += d.toString(); });
      p.stdout.on('data', (d: Buffer) => {
        buf += d.toString();
        let nl: number;
        while ((nl = buf.indexOf('\n')) >= 0) {
          const line = JSON.parse(buf.slice(0, nl)) as { start?: number; done?: number; ms: number; code: number; err: string; counts?: Counts };
          buf = buf.slice(nl + 1);
          if (line.start !== undefined) { current = line.start; arm(); continue; }
          const kind = line.ms > PER_FILE_MS ? 'slow' : line.code === 0 ? 'ok' : 'error';
          results.push({ file: files[line.done!]!, kind, ms: line.ms, err: line.err, ...(line.counts ? { counts: line.counts } : {}) });
        }
      });
      p.on('exit', () => {
        clearTimeout(timer);
        if (finished) return;
        const last = results.length - 1;
        if (current >= 0 && (last < 0 || results[last]!.file !== files[current])) {
          results.push({ file: files[current]!, kind: /out of memory|Allocation failed|heap/i.test(stderr) ? 'oom' : 'crash', ms: 0, err: stderr.slice(0, 300) });
          done({ next: current + 1 });
        } else done({ next: files.length });
      });
    });
    from = outcome.next;
  }
  return results;
}

beforeAll(async () => {
  work = mkdtempSync(join(tmpdir(), 'fieldtally-fuzz-'));
  cpSync(EXTERNAL, join(work, 'external'), { recursive: true });
  cpSync(SAMPLES, join(work, 'samples'), { recursive: true, filter: (src) => basename(src) !== 'large' });
  child = join(work, 'fuzzChild.mjs');
  await build({ entryPoints: [join(__dirname, 'fuzzChild.ts')], bundle: true, platform: 'node', format: 'esm', outfile: child, logLevel: 'error' });
}, 120_000);
afterAll(() => { if (work) rmSync(work, { recursive: true, force: true }); });

describe('fuzz campaign', () => {
  it(`${TOTAL}+ seeded mutants: no crash, hang, out-of-memory or dropped data; every error one line naming the file`, async () => {
    const originals = [...walk(join(work, 'external')), ...walk(join(work, 'samples'))].filter((f) => !basename(f).startsWith('m-'));
    const base = await runAll(originals);
    const expected = new Map(base.map((o) => [o.file, o.counts]));
    const perFile = Math.ceil(TOTAL / originals.length);
    const planned: { path: string; original: string; m: Mutant }[] = [];
    for (const [k, path] of originals.entries()) {
      for (const [j, m] of mutants(new Uint8Array(readFileSync(path)), SEED * 1000 + k, perFile).entries()) {
        planned.push({ path: join(dirname(path), `m-${k}-${j}-${basename(path)}`), original: path, m });
      }
      // sets pointing at a missing piece, at themselves, a folder, devices and a named pipe
      if (/\.(pvtu|vtm)$/.test(path)) {
        const text = readFileSync(path, 'latin1');
        const fifo = join(work, `fifo-${k}`);
        execFileSync('mkfifo', [fifo]);
        for (const [j, target] of ['missing-piece.vtu', `m-${k}-self-${basename(path)}`, '.', '/dev/zero', '/dev/null', fifo].entries()) {
          const bad = text.replace(/(Source|file)="[^"]*"/, `$1="${target}"`);
          const name = j === 1 ? `m-${k}-self-${basename(path)}` : `m-${k}-piece${j}-${basename(path)}`;
          planned.push({ path: join(dirname(path), name), original: path, m: { label: `piece → ${target}`, bytes: Uint8Array.from(bad, (c) => c.charCodeAt(0)), keepsCounts: false } });
        }
      }
    }
    expect(planned.length).toBeGreaterThanOrEqual(TOTAL);
    const outcomes: Outcome[] = [];
    for (let b = 0; b < planned.length; b += BATCH) {
      const batch = planned.slice(b, b + BATCH);
      for (const p of batch) writeFileSync(p.path, p.m.bytes);
      const res = await runAll(batch.map((p) => p.path));
      for (const [i, r] of res.entries()) outcomes.push({ ...r, label: batch[i]!.m.label, keepsCounts: batch[i]!.m.keepsCounts });
      for (const p of batch) unlinkSync(p.path);
    }
    const byPath = new Map(planned.map((p) => [p.path, p.original]));
    const bad = (kind: Outcome['kind']) => outcomes.filter((o) => o.kind === kind).map((o) => `${basename(o.file)} (${o.label}) ${o.err}`);
    expect(outcomes.length).toBe(planned.length);
    expect(bad('crash'), 'crashes').toEqual([]);
    expect(bad('oom'), 'out of memory').toEqual([]);
    expect(bad('hang'), `over ${PER_FILE_MS} ms, killed`).toEqual([]);
    expect(bad('slow'), `over ${PER_FILE_MS} ms`).toEqual([]);
    const badMessages = outcomes.filter((o) => o.kind === 'error' && !(
      /^fieldtally info: [^\x00-\x1f\x7f]+\n?$/.test(o.err) && o.err.trimEnd().split('\n').length === 1 && o.err.includes(basename(o.file))
    ));
    expect(badMessages.map((o) => `${basename(o.file)} (${o.label}): ${JSON.stringify(o.err)}`), 'errors that are not one printable line naming the file').toEqual([]);
    const dropped = outcomes.filter((o) => o.kind === 'ok' && o.keepsCounts && JSON.stringify(o.counts) !== JSON.stringify(expected.get(byPath.get(o.file)!)));
    expect(dropped.map((o) => `${basename(o.file)} (${o.label}): ${JSON.stringify(o.counts)} vs ${JSON.stringify(expected.get(byPath.get(o.file)!))}`), 'silently dropped data').toEqual([]);
    const slowest = outcomes.reduce((a, o) => (o.ms > a.ms ? o : a));
    console.log(JSON.stringify({ fuzz: { mutants: outcomes.length, refused: outcomes.filter((o) => o.kind === 'error').length, loaded: outcomes.filter((o) => o.kind === 'ok').length, slowestMs: Math.round(slowest.ms), slowest: `${basename(slowest.file)} (${slowest.label})` } }));
    // The campaign exercises both outcomes: most mutants are refused, some still load.
    expect(outcomes.filter((o) => o.kind === 'error').length).toBeGreaterThan(planned.length / 4);
    expect(outcomes.filter((o) => o.kind === 'ok').length).toBeGreaterThan(50);
  }, 1_200_000);
});
