/**
 * Cut-plane benchmark: cut plus integrals on 1M hexahedra and on about 1M tetrahedra built in memory,
 * twelve planes each (see `src/cli/benchStages/cut.ts`); the first cut (linear scan, no tree) and the later
 * ones (tree query) reported apart. Fields: a velocity vector and a pressure scalar at the points.
 *
 * The first cut is measured cold (a fresh process: the engine has not optimised the kernels yet, as for a
 * one-shot `fieldtally cut`) and, in a second fresh process, after the kernel warm-up the app's worker runs
 * once the first picture shows (`src/cut/warmUp.ts`), which is what a user's first cut in the app costs.
 */
import { spawnSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { benchCuts, benchPlanes } from '../src/cli/benchStages/cut.ts';
import { integratePlane } from '../src/cut/planeIntegrals.ts';
import { warmUpCutKernels } from '../src/cut/warmUp.ts';
import { readDataset } from '../src/io/readDataset.ts';
import { writeVtu } from '../src/io/writeVtu.ts';
import { datasetOf, hexGrid, pointFieldFrom, tetGrid, withFields } from '../src/model/meshBuild.ts';
import type { Piece } from '../src/model/piece.ts';

function withFlow(p: Piece): Piece {
  return withFields(p, [
    pointFieldFrom(p, 'velocity', 3, (x, y, z, o) => { o[0] = 0.1 * y; o[1] = -0.1 * x; o[2] = 4 * x * (1 - x) * y * (1 - y) + 0.01 * z; }),
    pointFieldFrom(p, 'p', 1, (x, y, z, o) => { o[0] = 100 * (1 - z) + x * y; }),
  ]);
}

const hexCase = () => datasetOf([withFlow(hexGrid(100, 100, 100))], '1M hexahedra (100³ unit-cube lattice)');

/** In a fresh process: load 1M hexahedra, warm the kernels as the app's worker does, leave them a moment, then time the first cut. */
async function firstCutAfterWarmUp(): Promise<Record<string, unknown>> {
  // through the writer and reader, so the pieces have a loaded file's shape (as in the app)
  const hex = await readDataset('1M hexahedra', writeVtu(hexCase(), { encoding: 'appended-raw' }));
  let t = performance.now();
  await warmUpCutKernels();
  const warmUpMs = performance.now() - t;
  await new Promise((r) => setTimeout(r, 300)); // the engine finishes compiling in the background while the user looks
  t = performance.now();
  const r = integratePlane(hex, { ...benchPlanes(hex)[0]!, cut: { candidates: 'scan' } });
  const ms = performance.now() - t;
  return { warmUpMs: Math.round(warmUpMs * 100) / 100, ms: Math.round(ms * 100) / 100, cutOnlyMs: Math.round(r.cut.stats.ms * 100) / 100, source: 'scan' };
}

/** Runs `firstCutAfterWarmUp` in a child process (this process has already warmed its kernels). */
function inFreshProcess(): Record<string, unknown> {
  const here = dirname(fileURLToPath(import.meta.url));
  const r = spawnSync(process.execPath, [join(here, '..', 'bin', 'run-ts.mjs'), fileURLToPath(import.meta.url), '--first-cut-after-warm-up'], { encoding: 'utf8' });
  if (r.status !== 0) return { error: `child process failed: ${(r.stderr || '').trim().split('\n').pop()}` };
  return JSON.parse(r.stdout) as Record<string, unknown>;
}

export async function run(): Promise<Record<string, unknown>> {
  const out: Record<string, unknown> = {};
  let t = performance.now();
  const hex = hexCase();
  const hexBuildMs = performance.now() - t;
  out.hexahedra = { cells: 1_000_000, buildMs: Math.round(hexBuildMs), ...(await benchCuts(hex)), firstCutAfterWarmUp: inFreshProcess() };
  t = performance.now();
  const tet = datasetOf([withFlow(tetGrid(55, 55, 55))], '998,250 tetrahedra (55³ lattice, 6 tetrahedra per cube)');
  const tetBuildMs = performance.now() - t;
  out.tetrahedra = { cells: 6 * 55 ** 3, buildMs: Math.round(tetBuildMs), ...(await benchCuts(tet)) };
  return out;
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) console.log(JSON.stringify(process.argv.includes('--first-cut-after-warm-up') ? await firstCutAfterWarmUp() : await run(), null, 2));
