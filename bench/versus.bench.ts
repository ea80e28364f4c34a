/**
 * Side-by-side benchmark against VTK 9.1 (Debian's python3-vtk9, `/usr/bin/python3`, which threads its
 * filters over every core) on the 1M-cell benchmark files of sample-fields/large/: hexahedra and tetrahedra,
 * appended raw and appended zlib. Per file, in fresh processes run one after the other on the same machine:
 *
 * - fieldtally's stages (this file with `--child`): load, first cut with integrals, later cut, first
 *   1000-sample line, later line, boundary extraction, pressure force total over the whole boundary — once on
 *   the single-thread core in one process (`core`) and once with a pool of 2 compute workers (`pool2`:
 *   workers started while the file loads, zlib blocks inflated by 2 threads, uncompressed arrays read in parts by 2
 *   read threads (`readParts`; `FIELDTALLY_BENCH_READ_THREADS=0`: on the loading thread), arrays decoded straight
 *   into shared memory (`sharedArrays`), as the CLI's `--workers 2`; the workers are started and warmed before the load's
 *   clock and that time is reported apart as `warmUp`, like the core's kernel warm-up);
 *   and 1 worker (`pool1`), for the speed-up from 1 to 2 workers and the memory per worker; the pool children
 *   report how each cut was split between the workers (`cutSplit`: candidate cells, triangles and cut ms per worker);
 * - the same stages with VTK (`bench/vtk_stages.py stages`);
 * - whole processes: `fieldtally cut <file> --origin … --normal …` against `vtk_stages.py cut` (read, cut,
 *   integrate, print), each the best of `ONE_SHOT_RUNS` after one untimed run, the three commands taking turns
 *   so a change in the machine's load touches them alike; wall and CPU time (user + system of every thread,
 *   from GNU time when present). The command both from the clone (`bin/fieldtally.mjs`, which runs the
 *   bundle it caches under a stamp of the sources) and as installed (the files `npm pack` ships —
 *   package.json, bin/*.mjs, dist-cli/ built first by `bin/build-cli.mjs` — copied into a temporary
 *   folder and run through its bin/fieldtally.mjs, as `npm install` would).
 *   `--one-shot-only` (`npm run bench -- versus --one-shot-only`) runs only these, with `ONE_SHOT_ONLY_RUNS`.
 *
 * The table `ratios` gives fieldtally / VTK in wall time per stage (best of core and pool2; both are listed),
 * with the goal (issue 12: first cut ≤ 0.5, every other stage ≤ 1.0, the one-shot cut < 1.0) and whether it is
 * met. Check values (cut area, valid samples, boundary faces, pressure force) come back from both tools so
 * the work done is the same work. The machine's load average is recorded before and after: on a shared
 * machine the figures are what they were at that moment. Alone: `node bin/run-ts.mjs bench/versus.bench.ts`.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { cpSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { wantsHugePages } from '../bin/hugePages.mjs';
import { integratePlane } from '../src/cut/planeIntegrals.ts';
import { warmUpCutKernels } from '../src/cut/warmUp.ts';
import { loadDatasetFile } from '../src/io/nodeFiles.ts';
import { probeLine } from '../src/locate/lineProbe.ts';
import { datasetBounds } from '../src/model/bounds.ts';
import type { Dataset } from '../src/model/dataset.ts';
import { openNodePool, startNodeWorkers, workersWarm } from '../src/parallel/nodePool.ts';
import { toSharedDataset } from '../src/parallel/sharedDataset.ts';
import { startInflatePool } from '../src/parallel/inflatePool.ts';
import { startReadPool } from '../src/parallel/readPool.ts';
import type { ComputePool } from '../src/parallel/pool.ts';
import { forceTotals } from '../src/surface/forces.ts';
import { getBoundaryFaces } from '../src/surface/surfaceCache.ts';
import { surfaceLoads } from '../src/surface/surfaceLoads.ts';
import { warmUpSurfaceKernels } from '../src/surface/warmUp.ts';
import { warmUpLocateKernels } from '../src/locate/warmUp.ts';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const PYTHON = '/usr/bin/python3';
const FILES = ['pipe-hex-1M.appended-raw.vtu', 'pipe-hex-1M.appended-zlib.vtu', 'sphere-tet-1M.appended-raw.vtu', 'sphere-tet-1M.appended-zlib.vtu'];
const ONE_SHOT_RUNS = 2;
const ONE_SHOT_ONLY_RUNS = 5;
/** The installed command's bundle (built by the run when missing or older than this run). */
const BUNDLE = join(ROOT, 'dist-cli', 'fieldtally.cjs');
/** GNU time gives a child's CPU time (user + system, every thread), which the machine's load changes far less than wall time. */
const GNU_TIME = '/usr/bin/time';
const STAGES = ['load', 'firstCut', 'laterCut', 'firstLine', 'laterLine', 'boundary', 'force'] as const;
type StageName = typeof STAGES[number];
const GOALS: Record<StageName | 'oneShotCut' | 'oneShotCutInstalled', number> = {
  load: 1, firstCut: 0.5, laterCut: 1, firstLine: 1, laterLine: 1, boundary: 1, force: 1, oneShotCut: 1, oneShotCutInstalled: 1,
};

type V3 = [number, number, number];
/** Planes and lines of one file, as fractions of its bounds (the same job goes to both tools). */
interface Job { planes: { origin: V3; normal: V3 }[]; lines: { a: V3; b: V3 }[]; samples: number }
interface Timed { wallMs: number; cpuMs: number }

const r1 = (v: number) => Math.round(v * 10) / 10;

async function timed<T>(f: () => T | Promise<T>): Promise<[T, Timed]> {
  const c0 = process.cpuUsage(), t0 = performance.now();
  const v = await f();
  const c = process.cpuUsage(c0);
  return [v, { wallMs: r1(performance.now() - t0), cpuMs: r1((c.user + c.system) / 1000) }];
}

/** The job for a dataset with bounds `b`: a near cross-section and an oblique plane; two lines across the box. */
export function jobFor(b: ArrayLike<number>): Job {
  const at = (fx: number, fy: number, fz: number): V3 => [b[0]! + fx * (b[1]! - b[0]!), b[2]! + fy * (b[3]! - b[2]!), b[4]! + fz * (b[5]! - b[4]!)];
  return {
    planes: [{ origin: at(0.5, 0.5, 0.5003), normal: [0.05, 0.1, 1] }, { origin: at(0.3, 0.5, 0.5), normal: [1, 0.02, 0.1] }],
    lines: [{ a: at(0.001, 0.2, 0.3), b: at(0.999, 0.8, 0.7) }, { a: at(0.5, 0.001, 0.1), b: at(0.4, 0.999, 0.9) }],
    samples: 1000,
  };
}

/** Pressure force (fluid on wall) over every boundary face, on the (cached) boundary; no grouping (VTK does none). */
function forceAll(d: Dataset): V3 {
  const faces = getBoundaryFaces(d);
  const all = new Int32Array(faces.count);
  for (let i = 0; i < all.length; i++) all[i] = i;
  return forceTotals(d, faces, surfaceLoads(d, faces, all, { pressure: 'p', viscous: 'none' })).force as V3;
}

/** Child process: fieldtally's stages on one file, `workers` 0 = the single-thread core in this process. */
async function childStages(file: string, workers: number): Promise<Record<string, unknown>> {
  const out: Record<string, unknown> = { workers };
  let pool: ComputePool | null = null;
  let d: Dataset;
  if (workers === 0) {
    // The kernels warm up first, as the app's compute worker does when it starts (before a file is chosen);
    // its cost is reported apart (warmUp). Beside a one-thread load it only moved time from the first cut into the load.
    [, out.warmUp] = await timed(() => Promise.all([warmUpCutKernels(), warmUpSurfaceKernels(), warmUpLocateKernels()]));
    [d, out.load] = await timed(() => loadDatasetFile(file));
  } else {
    let c0 = process.cpuUsage(), t0 = performance.now();
    const ports = startNodeWorkers(workers);
    const inflaters = startInflatePool(workers);
    // Uncompressed arrays are read in parts by as many read threads (FIELDTALLY_BENCH_READ_THREADS=1; default: on this thread, see DEVELOPERS.md).
    const readers = process.env.FIELDTALLY_BENCH_READ_THREADS === '1' ? startReadPool(workers) : undefined;
    // As for the one-thread core above (and the app, whose compute worker starts with the page): the workers load
    // their code and warm their kernels, and this thread warms the kernels it runs for a pool, before the load's
    // clock; reported apart (warmUp). FIELDTALLY_BENCH_COLD_POOL=1 keeps all of it in the load's clock instead.
    if (process.env.FIELDTALLY_BENCH_COLD_POOL !== '1') {
      [, out.warmUp] = await timed(() => Promise.all([workersWarm(ports), inflaters.ready(), readers?.ready(), warmUpCutKernels(), warmUpSurfaceKernels(toSharedDataset)]));
      c0 = process.cpuUsage(); t0 = performance.now();
    }
    let loaded: Dataset;
    try {
      loaded = await loadDatasetFile(file, { inflate: inflaters.inflate, sharedArrays: true, ...(readers ? { readParts: readers.readParts } : {}) });
    } finally {
      await Promise.all([inflaters.close(), readers?.close()]);
    }
    if (readers) out.partsRead = { ...readers.done };
    const loadDone = performance.now();
    pool = await openNodePool(loaded, workers, ports);
    const c = process.cpuUsage(c0);
    out.load = { wallMs: r1(performance.now() - t0), cpuMs: r1((c.user + c.system) / 1000), readMs: r1(loadDone - t0) };
    d = pool.dataset;
  }
  const job = jobFor(datasetBounds(d));
  const rss0 = process.memoryUsage().rss;
  try {
    const cut = (i: number) => pool ? pool.integratePlane(job.planes[i]!) : integratePlane(d, job.planes[i]!);
    const line = (i: number) => pool ? pool.probeLine(job.lines[i]!.a, job.lines[i]!.b, { samples: job.samples })
      : probeLine(d, job.lines[i]!.a, job.lines[i]!.b, { samples: job.samples });
    const [c1, firstCut] = await timed(() => cut(0));
    const [c2, laterCut] = await timed(() => cut(1));
    const [l1, firstLine] = await timed(() => line(0));
    const [l2, laterLine] = await timed(() => line(1));
    const [b, boundary] = await timed(() => pool ? pool.boundary() : getBoundaryFaces(d));
    const [f, force] = await timed(() => forceAll(d));
    Object.assign(out, { firstCut, laterCut, firstLine, laterLine, boundary, force });
    // the pool's split of each cut between its workers (candidate cells, triangles, ms of each worker's cut)
    if (pool) out.cutSplit = { firstCut: c1.cut.stats.shares ?? null, laterCut: c2.cut.stats.shares ?? null };
    out.check = {
      firstCutArea: c1.integrals.area, firstCutPIntegral: (c1.integrals.integral as Record<string, number>).p ?? null, laterCutArea: c2.integrals.area,
      firstLineValid: l1.validCount, laterLineValid: l2.validCount, boundaryFaces: b.count, forceFromPressure: f,
    };
    out.memory = {
      peakRssBytes: process.resourceUsage().maxRSS * 1024, rssGrowthAfterLoadBytes: process.memoryUsage().rss - rss0,
      perWorker: pool ? (await pool.memory()).map((m) => (m ? { heapUsedBytes: m.heapUsed, ownArrayBuffersBytes: m.arrayBuffers } : null)) : [],
    };
  } finally {
    await pool?.close();
  }
  return out;
}

function runChild(file: string, workers: number): Record<string, unknown> {
  // Huge pages as the command's launcher decides them (bin/hugePages.mjs: files that may decode to 256 MiB or more),
  // so the child's memory behaves as the command's would: on the 1M files transparent huge pages made the
  // load slower (1M hexahedra raw, core child, load average 1–3: 148–213 ms with them, 98–111 ms without).
  const huge = wantsHugePages([file]) ? { GLIBC_TUNABLES: 'glibc.malloc.hugetlb=1' } : {};
  const r = spawnSync(process.execPath, [join(ROOT, 'bin', 'run-ts.mjs'), fileURLToPath(import.meta.url), '--child', file, String(workers)], {
    encoding: 'utf8', maxBuffer: 16 << 20, env: { ...process.env, ...huge },
  });
  if (r.status !== 0) return { error: `fieldtally child failed: ${(r.stderr || '').trim().split('\n').pop()}` };
  return JSON.parse(r.stdout) as Record<string, unknown>;
}

function runVtk(mode: 'stages' | 'cut', file: string, job: Job): Record<string, unknown> {
  const out = execFileSync(PYTHON, [join(ROOT, 'bench', 'vtk_stages.py'), mode, file, JSON.stringify(job)], { encoding: 'utf8', maxBuffer: 16 << 20 });
  return JSON.parse(out) as Record<string, unknown>;
}

/** Best wall and CPU time of whole processes. */
interface Whole { wallMs: number; cpuMs: number | null }

/**
 * Best wall and CPU time of `runs` runs of each command, after one untimed run of each (a cached bundle is
 * built, files are in the page cache); the commands take turns, round after round.
 */
function wholeProcesses(commands: Record<string, [string, string[]]>, runs: number): Record<string, Whole> {
  const best: Record<string, Whole> = {};
  const stats = join(mkdtempSync(join(tmpdir(), 'fieldtally-versus-')), 'time.txt');
  try {
    for (let i = 0; i <= runs; i++) {
      for (const [name, [cmd, args]] of Object.entries(commands)) {
        const viaTime = existsSync(GNU_TIME);
        const t = performance.now();
        const r = spawnSync(viaTime ? GNU_TIME : cmd, viaTime ? ['-f', '%U %S', '-o', stats, cmd, ...args] : args, { encoding: 'utf8', maxBuffer: 16 << 20 });
        const ms = performance.now() - t;
        if (r.status !== 0) throw new Error(`versus: ${cmd} ${args.join(' ')} failed: ${(r.stderr || '').trim().split('\n').pop()}`);
        if (i === 0) continue;
        const [u, sys] = viaTime ? readFileSync(stats, 'utf8').trim().split('\n').pop()!.split(/\s+/).map(Number) : [NaN, NaN];
        const cpuMs = viaTime ? (u! + sys!) * 1000 : null;
        const b = best[name] ??= { wallMs: Infinity, cpuMs: viaTime ? Infinity : null };
        b.wallMs = Math.min(b.wallMs, r1(ms));
        if (cpuMs !== null) b.cpuMs = Math.min(b.cpuMs!, r1(cpuMs));
      }
    }
  } finally {
    rmSync(dirname(stats), { recursive: true, force: true });
  }
  return best;
}

/** The files `npm pack` ships (package.json "files"), copied into a temporary folder as `npm install` lays them out. */
function installedCopy(): { bin: string; remove(): void } {
  const dir = mkdtempSync(join(tmpdir(), 'fieldtally-installed-'));
  const pkg = JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')) as { files: string[] };
  cpSync(join(ROOT, 'package.json'), join(dir, 'package.json'));
  for (const f of pkg.files) {
    mkdirSync(dirname(join(dir, f)), { recursive: true });
    cpSync(join(ROOT, f), join(dir, f), { recursive: true });
  }
  return { bin: join(dir, 'bin', 'fieldtally.mjs'), remove: () => rmSync(dir, { recursive: true, force: true }) };
}

/** The one-shot rows: the whole `cut` command from the clone and as installed against the Python script. */
function oneShot(file: string, job: Job, installedBin: string | null, runs: number): Record<string, unknown> {
  const v = (p: V3) => `${p[0]},${p[1]},${p[2]}`;
  const cutArgs = ['cut', file, '--origin', v(job.planes[0]!.origin), '--normal', v(job.planes[0]!.normal)];
  const t = wholeProcesses({
    clone: [process.execPath, [join(ROOT, 'bin', 'fieldtally.mjs'), ...cutArgs]],
    ...(installedBin ? { installed: [process.execPath, [installedBin, ...cutArgs]] as [string, string[]] } : {}),
    python: [PYTHON, [join(ROOT, 'bench', 'vtk_stages.py'), 'cut', file, JSON.stringify(job)]],
  }, runs);
  const row = (w: Whole | undefined, note: string) => {
    const r = w ? ratio(w.wallMs, t.python!.wallMs) : NaN;
    return {
      ratio: r, goal: GOALS.oneShotCut, met: r < GOALS.oneShotCut, fieldtallyMs: w?.wallMs ?? NaN, vtkMs: t.python!.wallMs,
      cpuRatio: w?.cpuMs != null && t.python!.cpuMs ? ratio(w.cpuMs, t.python!.cpuMs) : null, fieldtallyCpuMs: w?.cpuMs ?? null, vtkCpuMs: t.python!.cpuMs, runs, note,
    };
  };
  return {
    oneShotCut: row(t.clone, 'from the clone: bin/fieldtally.mjs (the bundle it caches under a stamp of the sources)'),
    oneShotCutInstalled: row(t.installed, 'as installed: the files npm pack ships, run through their bin/fieldtally.mjs'),
  };
}

const wall = (o: unknown, s: string): number => ((o as Record<string, Timed | undefined>)[s]?.wallMs ?? NaN);
const cpu = (o: unknown, s: string): number => ((o as Record<string, Timed | undefined>)[s]?.cpuMs ?? NaN);
const ratio = (a: number, b: number) => Math.round((a / b) * 100) / 100;

async function oneFile(name: string, installedBin: string | null): Promise<Record<string, unknown>> {
  const file = join(ROOT, 'sample-fields', 'large', name);
  const core = runChild(file, 0);
  const pool1 = runChild(file, 1);
  const pool2 = runChild(file, 2);
  const probe = await loadDatasetFile(file, {});
  const job = jobFor(datasetBounds(probe));
  const vtk = runVtk('stages', file, job);
  const table: Record<string, unknown> = {};
  for (const s of STAGES) {
    const best = Math.min(wall(core, s), wall(pool2, s));
    const r = ratio(best, wall(vtk, s));
    table[s] = {
      ratio: r, goal: GOALS[s], met: r <= GOALS[s], fieldtallyMs: best, vtkMs: wall(vtk, s),
      coreRatio: ratio(wall(core, s), wall(vtk, s)), pool2Ratio: ratio(wall(pool2, s), wall(vtk, s)),
      coreCpuRatio: ratio(cpu(core, s), cpu(vtk, s)),
    };
  }
  Object.assign(table, oneShot(file, job, installedBin, ONE_SHOT_RUNS));
  const speedUp: Record<string, number> = {};
  for (const s of STAGES) speedUp[s] = ratio(wall(pool1, s), wall(pool2, s));
  return { file: relative(ROOT, file), fileBytes: statSync(file).size, ratios: table, speedUpOneToTwoWorkers: speedUp, job, fieldtally: { core, pool1, pool2 }, vtk };
}

/** `--one-shot-only`: only the whole-process rows, best of `ONE_SHOT_ONLY_RUNS`. */
async function oneShotFile(name: string, installedBin: string | null): Promise<Record<string, unknown>> {
  const file = join(ROOT, 'sample-fields', 'large', name);
  const job = jobFor(datasetBounds(await loadDatasetFile(file, {})));
  return { file: relative(ROOT, file), fileBytes: statSync(file).size, ratios: oneShot(file, job, installedBin, ONE_SHOT_ONLY_RUNS), job };
}

/** The ratios as a text table (stage × file), for stderr beside the JSON. */
export function ratioTable(files: Record<string, unknown>): string {
  const names = Object.keys(files).filter((f) => (files[f] as { ratios?: unknown }).ratios);
  if (names.length === 0) return '';
  const rows = Object.keys((files[names[0]!] as { ratios: Record<string, unknown> }).ratios);
  const cell = (f: string, r: string) => {
    const x = (files[f] as { ratios: Record<string, { ratio: number; met: boolean }> }).ratios[r];
    return x ? `${x.ratio.toFixed(2)}${x.met ? ' ok' : '   '}` : '';
  };
  const w = Math.max(...names.map((n) => n.length)) + 2;
  const label = (r: string) => `${r} (≤ ${GOALS[r as keyof typeof GOALS] ?? 1})`;
  const lw = Math.max(16, ...rows.map((r) => label(r).length)) + 1;
  const head = 'fieldtally / VTK'.padEnd(lw) + names.map((n) => n.padStart(w)).join('');
  const lines = rows.map((r) => label(r).padEnd(lw) + names.map((n) => cell(n, r).padStart(w)).join(''));
  return [head, ...lines, ''].join('\n');
}

export async function run(): Promise<Record<string, unknown>> {
  if (!existsSync(PYTHON)) return { error: `${PYTHON} not found: install Debian's python3-vtk9` };
  const oneShotOnly = process.argv.includes('--one-shot-only');
  // the installed form of the command, for the one-shot comparison
  execFileSync(process.execPath, [join(ROOT, 'bin', 'build-cli.mjs')], { cwd: ROOT, encoding: 'utf8' });
  const installed = existsSync(BUNDLE) ? installedCopy() : null;
  const loadBefore = loadavg().map(r1);
  const files: Record<string, unknown> = {};
  try {
    for (const f of FILES) {
      if (!existsSync(join(ROOT, 'sample-fields', 'large', f))) { files[f] = { error: 'missing: run `npm run make-fields -- --size 1M`' }; continue; }
      process.stderr.write(`versus: ${f} …\n`);
      files[f] = oneShotOnly ? await oneShotFile(f, installed?.bin ?? null) : await oneFile(f, installed?.bin ?? null);
    }
  } finally {
    installed?.remove();
  }
  process.stderr.write(ratioTable(files));
  return {
    benchmark: 'versus',
    ...(oneShotOnly ? { only: 'one-shot rows (--one-shot-only)' } : {}),
    note: 'fieldtally / VTK 9.1 wall time per stage, each tool in fresh processes one after the other on the same file; '
      + 'ratio = min(core, pool2) / VTK; goal: firstCut ≤ 0.5, others ≤ 1.0, oneShotCut (whole processes) < 1.0; '
      + 'coreCpuRatio = CPU time of the single-thread core / CPU time of VTK (all its threads): less sensitive to a busy machine; '
      + 'oneShotCut cpuRatio: the same for the whole processes; '
      + 'speedUp = wall(1 worker) / wall(2 workers); cpuMs counts every thread of a process. '
      + 'Load of the pool children: timed after their warmUp (workers started and their kernels warmed, this thread\'s pool kernels warmed; reported apart), '
      + 'as the core child\'s load is timed after its kernels\' warm-up (FIELDTALLY_BENCH_COLD_POOL=1: warm-up inside the load\'s clock). '
      + 'Boundary: files with 2D cells are reduced to their 3D cells for VTK before the clock starts (both tools then extract the same faces)',
    loadAverageBefore: loadBefore, loadAverageAfter: loadavg().map(r1), files,
  };
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) {
  const i = process.argv.indexOf('--child');
  const result = i > 0 ? await childStages(process.argv[i + 1]!, Number(process.argv[i + 2])) : await run();
  process.stdout.write(JSON.stringify(result, null, 2) + '\n');
}
