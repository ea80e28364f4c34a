/**
 * Scale benchmark: the command line on 1M and on 10M hexahedra (100 × 100 × 100 and 100 × 100 × 1000 unit-cube
 * lattices with a velocity vector and a pressure scalar at the points), each written as appended raw .vtu to
 * bench/out/ (the 10M file is about 1.2 GB; it is deleted at the end, also after a failure).
 *
 * Per file, in fresh processes (`fieldtally bench <file> --json`):
 *  - `--stages load`: load time and the peak resident memory of loading alone, over the decoded arrays;
 *  - `--stages cut,locate,surface`: first cut with integrals (scan), cell-tree build, later cuts (median),
 *    first line (tree build included), later lines (median), boundary extraction, force total, and the peak
 *    of the whole run.
 * Loads run as the bench verb's default (1M: one thread; 10M: large raw arrays read in parts on one thread per
 * core, `readThreads`), repeated twice (`loadRepeats`), then twice with `--read-threads 1` (`loadOnOneThread`) and
 * twice with `--read-threads 2` (`loadInPartsOnTwoThreads`); `freshMemoryTouch` times one thread first touching as many fresh bytes as the
 * decoded arrays, which on a virtual machine is most of a load's cost (see DEVELOPERS.md, "Loading at scale").
 * Then the same stages with `--workers 2` (`stagesOnPoolOfTwoMs`: cut, lines and boundary on a pool of 2 workers, the
 * pool's set-up — starting the workers, handing them the shared dataset — as its own figure, `poolSetup`).
 * Goals (issue 12) at 10M: load ≤ 1.5 s, first cut ≤ 0.3 s (judged on the pool, its set-up shown beside), peak of loading ≤ 1.3× the decoded arrays, and
 * every stage ≤ 12× its 1M cost (linear growth). Times are wall ms of one run each (`loadCpu`, `firstCutCpu`, `treeBuildCpu`:
 * process CPU ms, steadier on a busy machine), and `loadAverage` records how busy the machine was. Alone: `node bin/run-ts.mjs bench/scale.bench.ts` (needs about 4 GB of memory).
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { loadavg } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { writeVtu } from '../src/io/writeVtu.ts';
import { datasetOf, hexGrid, pointFieldFrom, withFields } from '../src/model/meshBuild.ts';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..');
export const OUT = join(ROOT, 'bench', 'out');
const GOALS = { loadMs: 1500, firstCutMs: 300, loadPeakOverDecoded: 1.3, growth: 12 };

/** Writes the lattice with `nz` layers (nz/10 million cells) as appended raw .vtu; returns its path. */
export function writeLattice(nz: number): string {
  const p = hexGrid(100, 100, nz);
  const d = datasetOf([withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 0.1 * y; o[1] = -0.1 * x; o[2] = 4 * x * (1 - x) * y * (1 - y) + 0.01 * z; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 100 * (1 - z) + x * y; }),
  ])], `${nz / 100}M hexahedra`);
  const file = join(OUT, `scale-hex-${nz / 100}M.appended-raw.vtu`);
  writeFileSync(file, writeVtu(d, { encoding: 'appended-raw' }));
  return file;
}

type Json = Record<string, Record<string, unknown> | undefined>;

const loadNow = () => Math.round(loadavg()[0]! * 100) / 100;

/**
 * What first touching `bytes` of fresh memory costs a fresh process on one thread (wall and CPU ms): the floor
 * under a one-thread load of arrays that size. On a virtual machine whose host takes back freed memory, this
 * swings by an order of magnitude with the state of the machine, so it is measured beside each load.
 */
function freshTouch(bytes: number): Record<string, number> {
  const code = `const n=${bytes};const c0=process.cpuUsage(),t0=performance.now();const a=new Uint8Array(n);for(let i=0;i<n;i+=4096)a[i]=1;`
    + 'const c=process.cpuUsage(c0);process.stdout.write(JSON.stringify({ms:performance.now()-t0,cpuMs:(c.user+c.system)/1000}))';
  const out = JSON.parse(execFileSync(process.execPath, ['-e', code], { encoding: 'utf8', env: { ...process.env, GLIBC_TUNABLES: 'glibc.malloc.hugetlb=1' } })) as Record<string, number>;
  return { ms: Math.round(out.ms!), cpuMs: Math.round(out.cpuMs!) };
}

function bench(file: string, stages: string, more: string[] = []): Json {
  const out = execFileSync(process.execPath, ['--max-old-space-size=8000', join(ROOT, 'bin', 'fieldtally.mjs'), 'bench', file, '--json', '--stages', stages, ...more], {
    cwd: ROOT, encoding: 'utf8', maxBuffer: 16 << 20,
  });
  return JSON.parse(out) as Json;
}

const num = (o: unknown, ...path: string[]): number => {
  let v: unknown = o;
  for (const k of path) v = (v as Record<string, unknown> | undefined)?.[k];
  return typeof v === 'number' ? v : NaN;
};

/** The stage figures of one file (wall ms) and its memory. */
function measure(file: string): Record<string, unknown> {
  const loadAverageAtLoad = loadNow();
  const load = bench(file, 'load');
  const decoded = num(load, 'load', 'decodedBytes');
  // Two more loads: the first runs on memory the host may have taken back, these mostly on memory just freed.
  const figures = (r: Json) => ({ ms: num(r, 'load', 'ms'), cpuMs: num(r, 'load', 'cpuMs'), peakOverDecoded: num(r, 'memory', 'peakOverDecoded') });
  const repeats = [bench(file, 'load'), bench(file, 'load')].map(figures);
  // One thread, then large raw arrays read in parts on two threads (as the --workers verbs load), twice each.
  const oneThread = [bench(file, 'load', ['--read-threads', '1']), bench(file, 'load', ['--read-threads', '1'])].map(figures);
  const inParts = [bench(file, 'load', ['--read-threads', '2']), bench(file, 'load', ['--read-threads', '2'])].map(figures);
  const all = bench(file, 'cut,locate,surface');
  // The same stages on a pool of 2 workers (cut, lines and boundary on the pool; its set-up a stage of its own).
  const pooled = bench(file, 'cut,locate,surface', ['--workers', '2']);
  const tree = num(all, 'cut', 'treeBytes'), boundary = num(all, 'surface', 'boundaryBytes');
  // Right after the all-stages process freed its memory, then after a few idle seconds (when this machine's host may have taken it back).
  const justFreed = freshTouch(decoded);
  execFileSync('sleep', ['4']);
  const touch = { bytes: decoded, justFreed, afterFourIdleSeconds: freshTouch(decoded) };
  return {
    fileBytes: statSync(file).size, cells: all.cells, decodedBytes: decoded,
    readThreads: num(load, 'load', 'readThreads'), loadAverageAtLoad, freshMemoryTouch: touch, loadRepeats: repeats, loadOnOneThread: oneThread, loadInPartsOnTwoThreads: inParts,
    stagesMs: {
      load: num(load, 'load', 'ms'),
      loadCpu: num(load, 'load', 'cpuMs'),
      firstCut: num(all, 'cut', 'firstCut', 'ms'),
      firstCutCpu: num(all, 'cut', 'firstCut', 'cpuMs'),
      treeBuild: num(all, 'cut', 'treeBuildMs'),
      treeBuildCpu: num(all, 'cut', 'treeBuildCpuMs'),
      laterCut: num(all, 'cut', 'laterCuts', 'cutAndIntegralsMs', 'median'),
      firstLine: num(all, 'locate', 'firstLine', 'ms'),
      laterLine: num(all, 'locate', 'laterLines', 'ms', 'median'),
      boundary: num(all, 'surface', 'extraction', 'firstMs'),
      force: num(all, 'surface', 'force', 'firstMs'),
    },
    stagesOnPoolOfTwoMs: {
      load: num(pooled, 'load', 'ms'),
      loadCpu: num(pooled, 'load', 'cpuMs'),
      poolSetup: num(pooled, 'poolSetup', 'ms'),
      poolSetupCpu: num(pooled, 'poolSetup', 'cpuMs'),
      firstCut: num(pooled, 'cut', 'firstCut', 'ms'),
      firstCutCpu: num(pooled, 'cut', 'firstCut', 'cpuMs'),
      treeBuildAndCut: num(pooled, 'cut', 'treeBuildAndCutMs'),
      laterCut: num(pooled, 'cut', 'laterCuts', 'cutAndIntegralsMs', 'median'),
      firstLine: num(pooled, 'locate', 'firstLine', 'ms'),
      laterLine: num(pooled, 'locate', 'laterLines', 'ms', 'median'),
      boundary: num(pooled, 'surface', 'extraction', 'firstMs'),
      force: num(pooled, 'surface', 'force', 'firstMs'),
      peakOverDecoded: num(pooled, 'memory', 'peakOverDecoded'),
    },
    memory: {
      loadPeakOverDecoded: num(load, 'memory', 'peakOverDecoded'), loadPeakRssBytes: num(load, 'memory', 'peakRssBytes'),
      allStagesPeakOverDecoded: num(all, 'memory', 'peakOverDecoded'), allStagesPeakRssBytes: num(all, 'memory', 'peakRssBytes'),
      allStagesHeld: {
        cellTreeBytes: tree, boundaryBytes: boundary,
        overDecoded: Math.round(((decoded + tree + boundary) / decoded) * 100) / 100,
        note: 'besides the decoded arrays the all-stages run holds the cell tree (built by the cut and line stages) and the boundary faces with their point merge; overDecoded = (decoded + tree + boundary) / decoded, the rest of its peak is the stages\' temporaries',
      },
    },
  };
}

export async function run(): Promise<Record<string, unknown>> {
  mkdirSync(OUT, { recursive: true });
  const loadBefore = loadavg().map((v) => Math.round(v * 10) / 10);
  const files: string[] = [];
  try {
    files.push(writeLattice(100));
    const small = measure(files[0]!);
    files.push(writeLattice(1000));
    const large = measure(files[1]!);
    const s = small.stagesMs as Record<string, number>, l = large.stagesMs as Record<string, number>;
    const ratios = (a: Record<string, number>, b: Record<string, number>) => {
      const g: Record<string, { ratio: number; met: boolean }> = {};
      for (const k of Object.keys(a)) {
        if (k === 'peakOverDecoded') continue;
        const r = Math.round((b[k]! / a[k]!) * 100) / 100;
        g[k] = { ratio: r, met: r <= GOALS.growth };
      }
      return g;
    };
    const growth = ratios(s, l);
    const ps = small.stagesOnPoolOfTwoMs as Record<string, number>, pl = large.stagesOnPoolOfTwoMs as Record<string, number>;
    const growthOnPool = ratios(ps, pl);
    const lm = large.memory as Record<string, number>;
    return {
      benchmark: 'scale',
      note: 'wall ms of one fresh `fieldtally bench` process per figure; growth = 10M / 1M per stage; the loading peak is (peak RSS − RSS before load) / decoded array bytes; '
        + 'firstLine runs after the cut stage built the cell tree (its build is treeBuild); load: the bench verb\'s default (in parts on readThreads threads for files of 256 MiB or more, as the --workers verbs load); loadOnOneThread: --read-threads 1; loadInPartsOnTwoThreads: --read-threads 2; '
        + 'freshMemoryTouch: one thread first touching as many fresh bytes as the decoded arrays, in a fresh process, right after a process freed memory and after 4 idle seconds (on a virtual machine whose host takes back freed memory it is most of a load\'s cost and swings widely)',
      goals: GOALS,
      met: {
        load: l.load! <= GOALS.loadMs, firstCutOnPool: pl.firstCut! <= GOALS.firstCutMs, firstCutOnOneThread: l.firstCut! <= GOALS.firstCutMs,
        poolSetupBesideFirstCut: { poolSetupMs: pl.poolSetup, firstCutMs: pl.firstCut, firstCutCpuMs: pl.firstCutCpu },
        loadPeak: lm.loadPeakOverDecoded! <= GOALS.loadPeakOverDecoded, growthOnPool: Object.values(growthOnPool).every((g) => g.met),
        growthOnOneThread: Object.values(growth).every((g) => g.met),
      },
      growth, growthOnPool, '1M': small, '10M': large,
      loadAverageBefore: loadBefore, loadAverageAfter: loadavg().map((v) => Math.round(v * 10) / 10),
    };
  } finally {
    for (const f of files) rmSync(f, { force: true });
  }
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) process.stdout.write(JSON.stringify(await run(), null, 2) + '\n');
